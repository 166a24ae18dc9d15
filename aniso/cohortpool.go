package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// pooledProblem puts the specimens of a cohort into one problem, so that a
// single model can be fitted to all of them at once: every protocol of every
// specimen, labelled "specimen: protocol", on the components every specimen
// measured. Package biaxial weights each protocol and axis so that it counts
// about equally; a specimen with more protocols would count more, so each
// specimen's weights are scaled by √(mean series / its series), a series
// being one protocol and component, which makes every specimen count the
// same. Only specimens in the stress measure and unit of most of them are
// pooled (ties: the first one's; the caller converts units); the others
// are returned as left out.
// The specimens' search subsets are pooled (at most searchPoints points per
// protocol, see searchpoints.go), so that the cost does not grow with the
// tester's sampling rate.
func pooledProblem(ps []*Problem, searchPoints int) (pooled *Problem, in, out []int, err error) {
	if len(ps) == 0 {
		return nil, nil, nil, fmt.Errorf("no specimens to pool")
	}
	kind, unit := majorityMeasure(ps)
	var measured [biaxial.NumComponents]bool
	for c := range measured {
		measured[c] = true
	}
	// The pool carries shear information only when every specimen does;
	// its shear is taken as zero only when none does and some specimen's
	// F12, F21 lie within their scatter of zero (Problem.ShearTakenAsZero),
	// so a specimen's real shear is never zeroed.
	hasShear, anyInfo, anyTakenAsZero := true, false, false
	var subs []*Problem
	for i, p := range ps {
		s := p.Specimen
		if s.Kind != kind || s.StressUnit != unit {
			out = append(out, i)
			continue
		}
		sub, err := searchSubset(p, searchPoints)
		if err != nil {
			return nil, nil, nil, err
		}
		in = append(in, i)
		subs = append(subs, sub)
		for c := range measured {
			measured[c] = measured[c] && s.Measured[c]
		}
		hasShear = hasShear && p.HasShear
		anyInfo = anyInfo || p.HasShear
		anyTakenAsZero = anyTakenAsZero || p.ShearTakenAsZero
	}
	series := make([]float64, len(subs))
	mean := 0.0
	for i, sub := range subs {
		n := 0
		for c := range measured {
			if measured[c] {
				n++
			}
		}
		series[i] = float64(len(sub.Protocols) * n)
		mean += series[i] / float64(len(subs))
	}
	spec := &biaxial.Specimen{Name: fmt.Sprintf("population of %d specimens", len(subs)), Kind: kind, StressUnit: unit,
		Measured: measured, HasShear: hasShear, ShearWithinScatter: !anyInfo && anyTakenAsZero, Meta: map[string]string{}, Reference: ps[in[0]].Specimen.Reference}
	for i, sub := range subs {
		k := math.Sqrt(mean / series[i])
		for _, pi := range sub.Protocols {
			pr := sub.Specimen.Protocols[pi]
			pr.Label = sub.Specimen.Name + ": " + pr.Label
			for c := range pr.Weight {
				pr.Weight[c] *= k
				if !measured[c] {
					pr.Weight[c] = 0
				}
			}
			spec.Protocols = append(spec.Protocols, pr)
		}
	}
	pooled, err = NewProblem(spec, nil)
	return pooled, in, out, err
}

// majorityMeasure is the stress measure and unit most problems share
// (ties: the earliest's).
func majorityMeasure(ps []*Problem) (biaxial.StressKind, string) {
	type measure struct {
		kind biaxial.StressKind
		unit string
	}
	count := map[measure]int{}
	var best measure
	n := 0
	for _, p := range ps {
		m := measure{p.Specimen.Kind, p.Specimen.StressUnit}
		count[m]++
		if count[m] > n {
			best, n = m, count[m]
		}
	}
	return best.kind, best.unit
}
