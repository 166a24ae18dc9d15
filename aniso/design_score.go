package aniso

import (
	"fmt"
	"math"
)

// run is one model along one planned test: the model seen from the
// tester's axes of the mounting, the path it would take (on sutures its
// own shear), and the test's rows, weights and predicted stresses under
// it.
type run struct {
	m    *Model
	path [][4]float64
	q    *Problem
}

// runOf is model m (in the fit's axes) along planned test t.
func (d *designer) runOf(t *PlannedTest, m *Model) (*run, error) {
	u := turned(m, Rad(t.MountingDeg))
	path := t.Path
	if t.Sutured {
		var err error
		if path, err = suturedPath(u, t.Path); err != nil {
			return nil, err
		}
	}
	q, err := d.plannedProblem(path, u, d.measured(t))
	if err != nil {
		return nil, err
	}
	return &run{m: u, path: path, q: q}, nil
}

// distance is the discrimination of b from a along a's path: the summed
// squared difference of b's and a's predicted stresses on a's rows,
// weighted with a's weights, in units of the noise level.
func (d *designer) distance(a, b *run) (float64, error) {
	pb, err := Predict(a.q, b.m)
	if err != nil {
		return 0, err
	}
	s := 0.0
	for i, y := range a.q.Measured {
		x := a.q.RowWeight[i] * (pb[i] - y) / d.sigma
		s += x * x
	}
	if math.IsNaN(s) {
		return 0, fmt.Errorf("a prediction along the planned path is not finite")
	}
	return s, nil
}

// score computes a planned test's information gain, its discrimination of
// every question and whether it extrapolates.
func (d *designer) score(t PlannedTest) (TestScore, error) {
	t.Path = append([][4]float64(nil), t.Path...)
	if err := d.limitPeak(&t); err != nil {
		return TestScore{}, err
	}
	ts := TestScore{Test: t, InformationGain: math.Inf(1)}
	var paths [][][4]float64
	var turnedModels []*Model
	for v, m := range d.info {
		rn, err := d.runOf(&t, m)
		if err != nil {
			return ts, err
		}
		if v == 0 {
			// The target path is the one under the fitted model as reported.
			ts.Test.Path = rn.path
			ts.Test.SpecimenPath = specimenPath(rn.path, t.MountingDeg)
		}
		paths = append(paths, rn.path)
		turnedModels = append(turnedModels, rn.m)
		cols, err := d.r.jacobian(rn.q, rn.m, d.est)
		if err != nil {
			return ts, err
		}
		g, shrink, err := d.base[v].gain(cols)
		if err != nil {
			return ts, err
		}
		if g < ts.InformationGain {
			ts.InformationGain = g
			ts.Shrink = ts.Shrink[:0]
			for a, j := range d.est {
				ts.Shrink = append(ts.Shrink, Shrink{Name: d.r.Estimates[j].Name, Fraction: shrink[a]})
			}
		}
	}
	for i := range d.qs {
		qs, err := d.discriminate(&t, &d.qs[i])
		if err != nil {
			return ts, err
		}
		ts.Questions = append(ts.Questions, qs)
		if qs.Settled && qs.verdict {
			ts.SettlesVerdict = true
		}
	}
	ts.Outside = d.extrapolation(paths, turnedModels)
	ts.Extrapolates = len(ts.Outside) > 0
	return ts, nil
}

// discriminate scores one question along a planned test: for every pair of
// explanations the smaller of the two directed distances (each along the
// path the specimen would take under the one taken as true), and, without
// shear information, the smallest over the sign variants of both; the
// question's score is its weakest pair.
func (d *designer) discriminate(t *PlannedTest, q *Question) (QuestionScore, error) {
	runs := make([][]*run, len(q.Explanations))
	for i, e := range q.Explanations {
		ms := []*Model{e.Model}
		if q.SignUnknown {
			ms = SignVariants(e.Model)
		}
		for _, m := range ms {
			rn, err := d.runOf(t, m)
			if err != nil {
				return QuestionScore{}, err
			}
			runs[i] = append(runs[i], rn)
		}
	}
	qs := QuestionScore{Discrimination: math.Inf(1), verdict: q.Verdict}
	for i := range runs {
		for j := i + 1; j < len(runs); j++ {
			for _, a := range runs[i] {
				for _, b := range runs[j] {
					ab, err := d.distance(a, b)
					if err != nil {
						return qs, err
					}
					ba, err := d.distance(b, a)
					if err != nil {
						return qs, err
					}
					if x := math.Min(ab, ba); x < qs.Discrimination {
						qs.Discrimination, qs.Weakest = x, [2]int{i, j}
					}
				}
			}
		}
	}
	qs.Settled = qs.Discrimination >= SettleLevel
	return qs, nil
}

// Along is a model's predictions along a planned test.
type Along struct {
	// Path is the deformation in the tester's axes of the mounting (on
	// sutures with the shear this model predicts).
	Path [][4]float64
	// Components name the stress components of the planned data ("11",
	// "22", "12", "21"); Stress[i][j] is component j at point i in the
	// fitted data's measure and unit, and Noise[i][j] the noise standard
	// deviation the planning assumes for it (the fit's noise level over
	// the row's weight).
	Components    []string
	Stress, Noise [][]float64
}

// Along returns the stresses model m predicts along planned test t of
// this design, at the deformation the specimen takes if truth is the right
// explanation (nil: m itself) — on sutures the shear depends on it. Both
// models are in the fit's axes; the noise is that of the rows under truth.
func (g *Design) Along(t *PlannedTest, m, truth *Model) (*Along, error) {
	if g.d == nil {
		return nil, fmt.Errorf("the design holds no fit")
	}
	if truth == nil {
		truth = m
	}
	rn, err := g.d.runOf(t, truth)
	if err != nil {
		return nil, err
	}
	q := rn.q
	pred := q.Measured
	if m != truth {
		if pred, err = Predict(q, turned(m, Rad(t.MountingDeg))); err != nil {
			return nil, err
		}
	}
	out := &Along{Path: rn.path}
	for _, c := range q.Output.Components {
		out.Components = append(out.Components, [...]string{"11", "22", "12", "21"}[c])
	}
	nc := len(out.Components)
	for i := range rn.path {
		st, ns := make([]float64, nc), make([]float64, nc)
		for j := 0; j < nc; j++ {
			r := i*nc + j
			st[j] = pred[r]
			ns[j] = math.Inf(1)
			if w := q.RowWeight[r]; w > 0 {
				ns[j] = g.d.sigma / w
			}
		}
		out.Stress = append(out.Stress, st)
		out.Noise = append(out.Noise, ns)
	}
	return out, nil
}
