package aniso

import (
	"fmt"
	"math"
	"strings"
)

// CVFold is one leave-one-protocol-out fold.
type CVFold struct {
	// Protocol is the held-out protocol's label.
	Protocol string
	// Error is the held-out normalised RMSE: √(weighted SSE / components),
	// with the rows weighted as package biaxial delivers them (each
	// protocol-axis by 1/(range·√points)), so 0.01 is about 1 % of range.
	Error float64
	// Metrics of the held-out prediction per component.
	Metrics []Metric
	// Model is the form refitted without the protocol, whose prediction
	// Error scores (nil when the refit failed).
	Model *Model
}

// CVScore summarises leave-one-protocol-out cross-validation.
type CVScore struct {
	Folds []CVFold
	// Mean and StdErr (standard deviation / √folds) of the fold errors.
	Mean, StdErr float64
}

// cvBICWindow is how far above its form's best BIC a candidate may lie and
// still be cross-validated ("very strong" evidence against it beyond that;
// Kass & Raftery 1995).
const cvBICWindow = 10

// crossValidate fits every candidate's form with one protocol left out,
// warm-started from its full-data fit, and scores the held-out prediction.
func crossValidate(p *Problem, cands []*Candidate, set Settings, pl *pool) {
	nf := len(p.Protocols)
	folds := make([][]CVFold, len(cands))
	for i := range folds {
		folds[i] = make([]CVFold, nf)
	}
	var jobs []func()
	var cost []float64
	for ci, c := range cands {
		for f := 0; f < nf; f++ {
			jobs = append(jobs, func() { folds[ci][f] = cvFold(p, c.Result, f, set) })
			cost = append(cost, fitCost(c.Result.Structure))
		}
	}
	pl.runDearFirst(jobs, cost)
	for ci, c := range cands {
		sc := &CVScore{Folds: folds[ci]}
		for _, f := range sc.Folds {
			sc.Mean += f.Error
		}
		sc.Mean /= float64(nf)
		v := 0.0
		for _, f := range sc.Folds {
			v += (f.Error - sc.Mean) * (f.Error - sc.Mean)
		}
		if nf > 1 {
			sc.StdErr = math.Sqrt(v/float64(nf-1)) / math.Sqrt(float64(nf))
		}
		c.CV = sc
	}
}

// HeldOut refits r's model form to every protocol of p but the f-th
// (index into p.Protocols), warm-started from r's parameters without an
// angle scan, and predicts the left-out protocol: the prediction on the
// rows of test, a Problem holding that protocol alone.
func HeldOut(p *Problem, r *Result, f int, set Settings) (pred []float64, test *Problem, err error) {
	pred, test, _, err = heldOut(p, r, f, set)
	return pred, test, err
}

// heldOut is HeldOut that also returns the refitted model.
func heldOut(p *Problem, r *Result, f int, set Settings) (pred []float64, test *Problem, m *Model, err error) {
	held := p.Protocols[f]
	var keep []int
	for i, pi := range p.Protocols {
		if i != f {
			keep = append(keep, pi)
		}
	}
	train, err := NewProblem(p.Specimen, keep)
	if err != nil {
		return nil, nil, nil, err
	}
	s := set
	s.Init = r.Params()
	s.NoScan = true
	s.Profile = false
	fit, err := Fit(train, r.Structure, s)
	if err != nil {
		return nil, nil, nil, err
	}
	if test, err = NewProblem(p.Specimen, []int{held}); err != nil {
		return nil, nil, nil, err
	}
	pred, err = Predict(test, fit.Model)
	return pred, test, fit.Model, err
}

// cvFold scores r's form on the f-th protocol left out.
func cvFold(p *Problem, r *Result, f int, set Settings) CVFold {
	fold := CVFold{Protocol: p.Specimen.Protocols[p.Protocols[f]].Label, Error: math.Inf(1)}
	pred, test, m, err := heldOut(p, r, f, set)
	if err != nil {
		return fold
	}
	fold.Model = m
	sse := 0.0
	for i, v := range pred {
		d := test.RowWeight[i] * (v - test.Measured[i])
		sse += d * d
	}
	fold.Error = math.Sqrt(sse / float64(len(test.Output.Components)))
	fold.Metrics = Metrics(test, pred)
	return fold
}

// crossMatrix fits the chosen form to each protocol alone and predicts
// every protocol, returning the mean R² over components.
func crossMatrix(p *Problem, r *Result, set Settings, pl *pool) [][]float64 {
	n := len(p.Protocols)
	out := make([][]float64, n)
	var jobs []func()
	for i := 0; i < n; i++ {
		i := i
		out[i] = make([]float64, n)
		jobs = append(jobs, func() {
			for j := range out[i] {
				out[i][j] = math.NaN()
			}
			train, err := NewProblem(p.Specimen, []int{p.Protocols[i]})
			if err != nil {
				return
			}
			s := set
			s.Init = r.Params()
			s.NoScan = true
			fit, err := Fit(train, r.Structure, s)
			if err != nil {
				return
			}
			for j := 0; j < n; j++ {
				test, err := NewProblem(p.Specimen, []int{p.Protocols[j]})
				if err != nil {
					continue
				}
				pred, err := Predict(test, fit.Model)
				if err != nil {
					continue
				}
				sum, cnt := 0.0, 0
				for _, m := range Metrics(test, pred) {
					if m.R2Defined {
						sum += m.R2
						cnt++
					}
				}
				if cnt > 0 {
					out[i][j] = sum / float64(cnt)
				}
			}
		})
	}
	pl.run(jobs)
	return out
}

// crossValidate leaves one protocol out for every candidate that could
// speak for its form. Left out, and named in the search notes: one whose
// BIC is more than cvBICWindow above its form's best (worse in-sample even
// after the penalty for its size); a spread model with every family at the
// fit's concentration bound (the ideal form's model with a parameter
// more); and two families within 2° (one family, which the verdict would
// not consider; see coincident), when the forms they reduce to are
// searched. Presets are cross-validated for comparison.
func (s *search) crossValidate() {
	if len(s.p.Protocols) < 2 {
		return
	}
	d := s.d
	d.hasCV = true
	var cands []*Candidate
	minBIC := map[string]float64{}
	for i := range d.Pareto {
		k := FormKey(d.Pareto[i].Result.Structure)
		if v, ok := minBIC[k]; !ok || d.Pareto[i].Result.BIC < v {
			minBIC[k] = d.Pareto[i].Result.BIC
		}
	}
	far := 0
	var bound, one []string
	why := map[*Candidate]string{} // why a model reduces to a simpler form's
	for i := range d.Pareto {
		c := &d.Pareto[i]
		f, reduces := s.simplerForm(c.Result)
		switch {
		case c.Result.BIC-minBIC[FormKey(c.Result.Structure)] > cvBICWindow:
			far++
			c.NotCrossValidated = NotValidatedBIC
		case reduces && spreadAtBound(c.Result):
			bound = append(bound, c.Name)
			c.NotCrossValidated = NotValidatedAtBound
			why[c] = fmt.Sprintf("every family of its models is spread at the fit's bound on the concentration (b = %d), an ideal family, which makes them %s's models with a parameter more", FitMaxConcentration, FormKey(f))
		case reduces:
			one = append(one, c.Name)
			c.NotCrossValidated = NotValidatedCoincident
			why[c] = fmt.Sprintf("its two families point the same way (%s), which is one family", anglesText(c.Result))
		default:
			cands = append(cands, c)
		}
	}
	d.noteUnvalidated(cands, why)
	for i := range d.Presets {
		cands = append(cands, &d.Presets[i])
	}
	note := fmt.Sprintf("cross-validation: %d of the %d candidates cross-validated; %d left out because their BIC is more than %d above their form's best", len(d.Pareto)-far-len(bound)-len(one), len(d.Pareto), far, cvBICWindow)
	if len(bound) > 0 {
		note += fmt.Sprintf("; %s left out because every family of theirs is spread at the fit's bound on the concentration (b = %d, an ideal family within the resolution of a fitted angle), which makes them their ideal form's model with a parameter more", strings.Join(bound, ", "), FitMaxConcentration)
	}
	if len(one) > 0 {
		note += fmt.Sprintf("; %s left out because their two families point the same way (within 2°), which makes them a one-family model with parameters more", strings.Join(one, ", "))
	}
	d.Search = append(d.Search, note)
	crossValidate(s.p, cands, s.fitSet, s.pl)
}

// noteUnvalidated records every form of the front none of whose models is
// among cands (the front models to be cross-validated) and that has a
// model reducing to a simpler form's (why, keyed by candidate, says how),
// with its lowest-BIC such model and the reason.
func (d *Discovery) noteUnvalidated(cands []*Candidate, why map[*Candidate]string) {
	has := map[string]bool{}
	for _, c := range cands {
		has[FormKey(c.Result.Structure)] = true
	}
	for i := range d.Pareto {
		c := &d.Pareto[i]
		k := FormKey(c.Result.Structure)
		w, reduces := why[c]
		if has[k] || !reduces {
			continue
		}
		if old, ok := d.unvalidated[k]; ok && old.c.Result.BIC <= c.Result.BIC {
			continue
		}
		if d.unvalidated == nil {
			d.unvalidated = map[string]formLeftOut{}
		}
		d.unvalidated[k] = formLeftOut{c: c, why: w}
	}
}
