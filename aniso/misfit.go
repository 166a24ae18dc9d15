package aniso

import (
	"fmt"
	"math"
	"sort"
)

// MisfitFlagRatio is the ratio of a fit's residuals to the data's own
// point-to-point scatter (MisfitScatterRatio) above which FlagMisfit
// flags the fit: 2, twice the noise. Measured once (2026-12-05, an audit
// with independent synthetic specimens of 40 points a protocol): chosen
// models that follow the data to their noise gave 0.96–1.40, also with
// noise proportional to the stress (1.05–1.25 in 20 draws); a pair coupled
// through I8 on sutures, which no catalogue model follows, gave 2.2–3.4,
// and a matrix softened after the first protocol 1.8–2.0 without and
// 7.5–8.2 with sutures.
const MisfitFlagRatio = 2.0

// MisfitScatterRatio compares r's residuals on p with the noise the data
// show by themselves: √(Σ mean(e²) / Σ s²) over the normal stress series
// (each protocol's 11 and 22 components, at least 7 points), e the
// measured minus the model stress and s² = mean((Δ³y)²)/20 the variance
// of the measured stress y estimated from its third differences along the
// protocol (independent noise of variance s² gives third differences of
// variance 20 s², while a smooth stress–stretch curve gives almost none;
// the mean square rather than a median, so that noise that grows with the
// stress is weighed as the residuals weigh it). About 1 when the model
// follows the data to their noise; larger when the data hold a systematic
// feature the model lacks. ok is false when no series qualifies. The
// shear components are left out: on sutures they are zero by construction.
func MisfitScatterRatio(p *Problem, r *Result) (ratio float64, ok bool, err error) {
	pred, err := Predict(p, r.Model)
	if err != nil {
		return 0, false, err
	}
	type row struct {
		point int
		y, e  float64
	}
	type key struct {
		protocol int
		comp     Component
	}
	series := map[key][]row{}
	var keys []key
	for i := range p.Measured {
		c := p.RowComponent[i]
		if c != 0 && c != 1 {
			continue
		}
		k := key{p.RowProtocol[i], c}
		if _, seen := series[k]; !seen {
			keys = append(keys, k)
		}
		series[k] = append(series[k], row{p.RowPoint[i], p.Measured[i], p.Measured[i] - pred[i]})
	}
	// A fixed order of the sums, so that the ratio is the same bit for bit.
	sort.Slice(keys, func(a, b int) bool {
		if keys[a].protocol != keys[b].protocol {
			return keys[a].protocol < keys[b].protocol
		}
		return keys[a].comp < keys[b].comp
	})
	var num, den float64
	for _, k := range keys {
		rs := series[k]
		if len(rs) < 7 {
			continue
		}
		sort.Slice(rs, func(a, b int) bool { return rs[a].point < rs[b].point })
		var e2, d2 float64
		for _, x := range rs {
			e2 += x.e * x.e
		}
		for i := 0; i+3 < len(rs); i++ {
			d := rs[i+3].y - 3*rs[i+2].y + 3*rs[i+1].y - rs[i].y
			d2 += d * d
		}
		num += e2 / float64(len(rs))
		den += d2 / float64(len(rs)-3) / 20
	}
	if den <= 0 || num < 0 {
		return 0, false, nil
	}
	return math.Sqrt(num / den), true, nil
}

// FlagMisfit adds a flag to r when its residuals on p exceed the data's
// point-to-point scatter by MisfitFlagRatio or more (MisfitScatterRatio),
// and returns the ratio (0 when it cannot be estimated). The flag says
// what such a misfit can mean for the verdict and for predictions: the
// noise the verdict's margins are scaled by is estimated from the best
// model's own residuals, so it grows with the misfit.
func FlagMisfit(p *Problem, r *Result) (float64, error) {
	ratio, ok, err := MisfitScatterRatio(p, r)
	if err != nil || !ok {
		return 0, err
	}
	if ratio >= MisfitFlagRatio {
		r.Flags = append(r.Flags, fmt.Sprintf("the model misfits the data: its residuals are %.1f times the data's own point-to-point scatter (normal stresses, from third differences along each protocol; about 1 where a model follows the data to their noise), so the data hold a systematic feature the model lacks — a law or fibre structure the catalogue cannot write (a third fibre family, families coupled to each other, a softening that differs from protocol to protocol), a rate effect or a tester artefact. The fibre verdict's margins are scaled by a noise estimate that includes this misfit, and loadings other than those tested can be predicted far worse than the held-out error", ratio))
	}
	return ratio, nil
}

// NoteMisfit adds a caution to a verdict with fibre families when the
// chosen model's residuals are MisfitFlagRatio or more times the data's
// own scatter (ratio from MisfitScatterRatio or FlagMisfit): the walk's
// margins are scaled by a noise estimate taken from the best model's own
// residuals (noiseLevel), so a misfit widens the noise and the verdict
// can stay confident on a model the data do not support. Measured once
// (2026-12-05, independent synthetic specimens): a pair of families
// coupled through I8 on sutures was a confident 2 with its second family
// at 76.9° (true 70°) and residuals 2.2–3.4 times the scatter, and missed
// an off-axis loading by 27–32 % against a held-out error of 8.5 %.
func (d *Discovery) NoteMisfit(ratio float64) {
	v := &d.Verdict
	if ratio < MisfitFlagRatio || (v.Families != "1" && v.Families != "2" && v.Families != "1-or-mirror-pair") {
		return
	}
	v.Reason += fmt.Sprintf("; caution: the chosen model's residuals are %.1f times the data's own scatter, and the margins of this verdict are scaled by a noise estimate that includes that misfit, so the data hold a feature no candidate writes (a third family, families coupled to each other, a softening): the number of families is what the tested protocols need of the catalogue's forms, not necessarily the tissue's, and a loading off the tested axes should be tested before the families are relied on", ratio)
}

// NoteCohortMisfit adds to a cohort's verdict with fibre families the
// caution NoteMisfit adds to one specimen's, when the shared form's
// residuals are MisfitFlagRatio or more times the specimens' own scatter
// at the median specimen: the pooled walk's margins then rest on a noise
// estimate that includes the misfit of most specimens. ratios are the
// fitted specimens' MisfitScatterRatio (NaN where none was estimated,
// left out).
func (d *Discovery) NoteCohortMisfit(ratios []float64) {
	var rs []float64
	flagged := 0
	for _, r := range ratios {
		if !math.IsNaN(r) {
			rs = append(rs, r)
			if r >= MisfitFlagRatio {
				flagged++
			}
		}
	}
	v := &d.Verdict
	if len(rs) == 0 || (v.Families != "1" && v.Families != "2" && v.Families != "1-or-mirror-pair") {
		return
	}
	sort.Float64s(rs)
	n := len(rs)
	median := (rs[(n-1)/2] + rs[n/2]) / 2
	if median < MisfitFlagRatio {
		return
	}
	v.Reason += fmt.Sprintf("; caution: the shared form misfits %d of the %d specimens fitted, its residuals %.1f times their own scatter at the median specimen, and the margins of this verdict are scaled by a noise estimate that includes that misfit: the number of families is what the tested protocols need of the catalogue's forms, not necessarily the tissue's, and a loading off the tested axes should be tested before the families are relied on", flagged, n, median)
}
