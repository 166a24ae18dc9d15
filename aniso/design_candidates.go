package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// inPlanePrincipal returns the principal stretches λ_small ≤ λ_large of
// the in-plane C = FᵀF of F = (F11, F12, F21, F22).
func inPlanePrincipal(F [4]float64) (float64, float64) {
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	c12 := F[0]*F[1] + F[2]*F[3]
	m, r := (c11+c22)/2, math.Hypot((c11-c22)/2, c12)
	return math.Sqrt(math.Max(m-r, 0)), math.Sqrt(m + r)
}

// testedRanges records the range of the principal stretches of the fitted
// data and of the fibre stretch √I4 of each of the fitted model's families,
// and the extrapolation tolerance. The ranges include the reference state
// (every stretch 1), where every fitted model is stress-free: a planned
// path starts there, and its first points, between the reference and the
// first kept point of the data, are not an extrapolation.
func (d *designer) testedRanges() {
	d.lamLo, d.lamHi = 1, 1
	d.fibre = make([][2]float64, len(d.r.Model.Families))
	for f := range d.fibre {
		d.fibre[f] = [2]float64{1, 1}
	}
	for i := 0; i < d.p.Data.Points(); i++ {
		k := d.p.Data.Kinematics(i)
		lo, hi := inPlanePrincipal(k.F)
		d.lamLo, d.lamHi = math.Min(d.lamLo, lo), math.Max(d.lamHi, hi)
		for f, fam := range d.r.Model.Families {
			s := math.Sqrt(k.Fibre(fam.Angle).I4)
			d.fibre[f] = [2]float64{math.Min(d.fibre[f][0], s), math.Max(d.fibre[f][1], s)}
		}
	}
	d.margin = ExtrapolationMargin * math.Max(d.lamHi-1, 0)
}

// runDirections returns the direction each fitted protocol tested, that of
// its largest Green strain (PeakGreenDirection), in degrees, read from its
// stretches F11 and F22 alone: the ratio a test runs is that of the
// stretches the tester imposes; on sutures the shear is the specimen's
// response, and a planned test's path carries none until it is scored
// (with the shear, a sutured 1:0.5 protocol of demo M3 read as another
// ratio, and the plan offered it again).
func (d *designer) runDirections() []float64 {
	var out []float64
	for _, pi := range d.p.Protocols {
		pr := &d.p.Specimen.Protocols[pi]
		path := make([][4]float64, len(pr.Points))
		for i, pt := range pr.Points {
			path[i] = [4]float64{pt.F[0], 0, 0, pt.F[3]}
		}
		if deg, ok := PeakGreenDirection(path); ok {
			out = append(out, deg)
		}
	}
	return out
}

// candidates lists the planned tests: in the current mounting every ratio
// not yet run, and on sutures with marker-tracked shear every ratio (or,
// when the data already carry shear information, the ratios not yet run,
// on sutures as the data are taken to be); off-axis mountings of every
// ratio. Tests whose scores could say nothing new are left out, with a note.
func (d *designer) candidates(set DesignSettings) ([]PlannedTest, []string) {
	var notes []string
	// Mountings and sutures matter as soon as one explanation has fibres,
	// even when the fitted model has none (an undecided verdict between an
	// isotropic model and one with fibres).
	iso := len(d.r.Model.Families) == 0
	for _, q := range d.qs {
		for _, e := range q.Explanations {
			if e.Model != nil && len(e.Model.Families) > 0 {
				iso = false
			}
		}
	}
	sutured := !set.NoSutured && !iso
	// With shear information the specimen is taken to be on sutures or
	// rakes already; a planned test in the same set-up keeps it.
	onSutures := d.p.HasShear && sutured
	runDirs := d.runDirections()
	var out []PlannedTest
	for _, ratio := range set.Ratios {
		ratio = normRatio(ratio)
		if ratio[0] < 0 || ratio[1] < 0 || ratio == [2]float64{} {
			continue
		}
		// The ratio's direction where its planned path peaks, measured as
		// the fitted protocols' are.
		e := d.lamHi - 1
		planned, size := GreenDirection([4]float64{1 + ratio[0]*e, 0, 0, 1 + ratio[1]*e})
		if !(size > 0) {
			planned = Deg(math.Atan2(ratio[1], ratio[0]))
		}
		run := false
		for _, dir := range runDirs {
			if math.Abs(planned-dir) < sameDirectionDeg {
				run = true
			}
		}
		if !run && !onSutures {
			out = append(out, d.plannedTest(ratio, 0, false))
		}
		if sutured && !(run && d.p.HasShear) {
			out = append(out, d.plannedTest(ratio, 0, true))
		}
	}
	switch {
	case iso && d.r.Model.HasGreenTerm():
		// A Fung-type term is not isotropic: it is orthotropic about the
		// tester's axes, so it predicts no shear on sutures either, and
		// turned axes would need coupling terms its form does not have.
		if greenCoupled(d.r.Model) {
			notes = append(notes, "the model has no fibre family and its Fung-type term, a full quadratic form of the Green strain, is tied to the tester's axes, as is every explanation a question weighs: off-axis mountings would turn its axes with the specimen, which the plan does not model, so only stretch ratios are planned, and no planned test is scored on a fibre question")
			break
		}
		notes = append(notes, "the model has no fibre family and its Fung-type term is orthotropic about the tester's axes, as is every explanation a question weighs: it predicts no shear on sutures, and off-axis mountings would need coupling terms its form does not have, so only stretch ratios are planned, and no planned test is scored on a fibre question")
	case iso:
		notes = append(notes, "the model is isotropic, as is every explanation a question weighs: its response does not depend on how the specimen is mounted and it predicts no shear on sutures, so only stretch ratios are planned, and no planned test is scored on a fibre question")
	case len(set.MountingsDeg) > 0 && d.r.Model.HasGreenTerm():
		if greenCoupled(d.r.Model) {
			notes = append(notes, "off-axis mountings are not planned: the Fung-type term is tied to the tester's axes, and the plan does not turn its quadratic form with the specimen")
			break
		}
		notes = append(notes, "off-axis mountings are not planned: the Fung-type term is tied to the tester's axes, and turned axes would need coupling terms its form does not have")
	default:
		for _, psi := range set.MountingsDeg {
			if math.Mod(psi, 180) == 0 {
				continue
			}
			for _, ratio := range set.Ratios {
				ratio = normRatio(ratio)
				if ratio[0] < 0 || ratio[1] < 0 || ratio == [2]float64{} {
					continue
				}
				out = append(out, d.plannedTest(ratio, psi, onSutures))
			}
		}
	}
	return out, notes
}

// normRatio scales a ratio so that its larger entry is 1.
func normRatio(r [2]float64) [2]float64 {
	m := math.Max(r[0], r[1])
	if !(m > 0) {
		return r
	}
	return [2]float64{r[0] / m, r[1] / m}
}

// plannedTest is a test of ratio at mounting psi (degrees): its pure
// stretch path, peaking at the largest principal stretch tested (the
// sutured shear is added when it is scored).
func (d *designer) plannedTest(ratio [2]float64, psi float64, sutured bool) PlannedTest {
	t := PlannedTest{Label: ratioLabel(ratio), Ratio: ratio, MountingDeg: psi, Sutured: sutured,
		ShearMeasured: sutured || d.p.Specimen.Measured[biaxial.C12]}
	e := d.lamHi - 1
	n := d.points
	for i := 1; i <= n; i++ {
		s := e * float64(i) / float64(n)
		t.Path = append(t.Path, [4]float64{1 + ratio[0]*s, 0, 0, 1 + ratio[1]*s})
	}
	t.SpecimenPath = specimenPath(t.Path, psi)
	return t
}

// specimenPath turns tester-axis deformations of a mounting at psi
// (degrees) into the fit's axes: R(ψ) F R(ψ)ᵀ.
func specimenPath(path [][4]float64, psi float64) [][4]float64 {
	out := make([][4]float64, len(path))
	for i, F := range path {
		out[i] = rotateF(F, Rad(psi))
	}
	return out
}

// suturedPath is path with the shear a specimen on sutures takes under m
// (m seen from the tester's axes): at every stretch pair the shears at
// which both nominal shear tractions vanish (Model.SuturedShear), each
// point starting from the previous one's.
func suturedPath(m *Model, path [][4]float64) ([][4]float64, error) {
	out := make([][4]float64, len(path))
	var x [2]float64
	for i, F := range path {
		var err error
		x, err = m.SuturedShear(F[0], F[3], x)
		if err != nil {
			return nil, err
		}
		out[i] = [4]float64{F[0], x[0], x[1], F[3]}
	}
	return out, nil
}

// limitPeak scales the targets of a planned test so that its peak stays
// within the tested range: its largest principal stretch, and the stretch
// of every fibre family under each sign variant scored, reach at most the
// largest tested (the binding one exactly). On sutures the shear the
// fitted model predicts adds to the stretch the targets impose; as it is
// nearly proportional to the strain, a few rescalings settle the peak.
// They run both ways: the stretch grows faster than the targets, so
// dividing them by the peak ratio brings the peak below the tested
// stretch, and a rescaling that only ever shrank them left sutured peaks
// short (by 1 % of the strain on the demo membrane).
func (d *designer) limitPeak(t *PlannedTest) error {
	ms := make([]*Model, len(d.info))
	for v, m := range d.info {
		ms[v] = turned(m, Rad(t.MountingDeg))
	}
	for iter := 0; iter < 12; iter++ {
		rho := 0.0
		for _, m := range ms {
			path := t.Path
			if t.Sutured {
				var err error
				if path, err = suturedPath(m, t.Path); err != nil {
					return err
				}
			}
			rho = math.Max(rho, d.peakRatio(path, m))
		}
		if math.Abs(rho-1) <= 1e-4 || !(rho > 0) {
			return nil
		}
		for i, F := range t.Path {
			t.Path[i] = [4]float64{1 + (F[0]-1)/rho, 0, 0, 1 + (F[3]-1)/rho}
		}
	}
	return nil
}

// peakRatio is the largest strain along path (model m seen from the same
// axes) relative to the largest tested: of the larger principal stretch
// and of every family's fibre stretch whose tested maximum exceeds 1,
// (λ − 1)/(λ_tested − 1).
func (d *designer) peakRatio(path [][4]float64, m *Model) float64 {
	rho := 0.0
	for _, F := range path {
		_, hi := inPlanePrincipal(F)
		if d.lamHi > 1 {
			rho = math.Max(rho, (hi-1)/(d.lamHi-1))
		}
		k, err := NewKinematics(F)
		if err != nil {
			continue
		}
		for f, fam := range m.Families {
			if f < len(d.fibre) && d.fibre[f][1] > 1 {
				rho = math.Max(rho, (math.Sqrt(k.Fibre(fam.Angle).I4)-1)/(d.fibre[f][1]-1))
			}
		}
	}
	return rho
}

// measured is which stress components a planned test's data hold: the
// fitted data's, and on sutures the shear tractions too.
func (d *designer) measured(t *PlannedTest) [biaxial.NumComponents]bool {
	m := d.p.Specimen.Measured
	if t.Sutured {
		m[biaxial.C12] = true
		m[biaxial.C21] = d.p.Specimen.Kind == biaxial.Nominal
	}
	return m
}

// plannedProblem is a planned test's data as a fit would see them: the
// path, the stresses m predicts there as the measured values, weighted as
// package biaxial weights a protocol read from a file.
func (d *designer) plannedProblem(path [][4]float64, m *Model, measured [biaxial.NumComponents]bool) (*Problem, error) {
	s := &biaxial.Specimen{Name: "planned", StressUnit: d.p.Specimen.StressUnit, Kind: d.p.Specimen.Kind, Measured: measured}
	pr := biaxial.Protocol{Label: "planned", UserWeight: 1}
	for i, F := range path {
		res, err := m.Evaluate(F)
		if err != nil {
			return nil, err
		}
		pt := biaxial.Point{F: F, Line: i + 1, Cycle: 1, Time: math.NaN()}
		if s.Kind == biaxial.Nominal {
			pt.Stress = res.Nominal
		} else {
			pt.Stress = [biaxial.NumComponents]float64{res.Cauchy[0], res.Cauchy[1], res.Cauchy[2], 0}
		}
		pr.Points = append(pr.Points, pt)
	}
	s.Protocols = []biaxial.Protocol{pr}
	s.Weigh()
	return NewProblem(s, nil)
}

// extrapolation lists where a planned test (its path under each model of
// ms, in the tester's axes of the mounting, with the models turned to
// them) leaves the tested range of the principal stretches and of the
// fibre stretch of each family by more than the margin.
func (d *designer) extrapolation(paths [][][4]float64, ms []*Model) []string {
	lo, hi := math.Inf(1), math.Inf(-1)
	fib := make([][2]float64, len(d.fibre))
	for f := range fib {
		fib[f] = [2]float64{math.Inf(1), math.Inf(-1)}
	}
	for v, path := range paths {
		for _, F := range path {
			a, b := inPlanePrincipal(F)
			lo, hi = math.Min(lo, a), math.Max(hi, b)
			k, err := NewKinematics(F)
			if err != nil {
				continue
			}
			for f, fam := range ms[v].Families {
				if f < len(fib) {
					s := math.Sqrt(k.Fibre(fam.Angle).I4)
					fib[f] = [2]float64{math.Min(fib[f][0], s), math.Max(fib[f][1], s)}
				}
			}
		}
	}
	var out []string
	if hi > d.lamHi+d.margin {
		out = append(out, fmt.Sprintf("largest principal stretch %.4g beyond the tested %.4g", hi, d.lamHi))
	}
	if lo < d.lamLo-d.margin {
		out = append(out, fmt.Sprintf("smallest principal stretch %.4g below the tested %.4g", lo, d.lamLo))
	}
	for f, r := range d.fibre {
		name := d.r.Model.Families[f].Name
		if fib[f][1] > r[1]+d.margin {
			out = append(out, fmt.Sprintf("fibre stretch of %s up to %.4g beyond the tested %.4g", name, fib[f][1], r[1]))
		}
		if fib[f][0] < r[0]-d.margin {
			out = append(out, fmt.Sprintf("fibre stretch of %s down to %.4g below the tested %.4g", name, fib[f][0], r[0]))
		}
	}
	return out
}
