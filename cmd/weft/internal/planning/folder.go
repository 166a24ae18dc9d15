package planning

import (
	"bytes"
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// A plan is drawn from an output folder alone: the card (the model, its
// form, the verdict and the selection evidence) and fit.csv (every fitted
// point's F and measured stress). The data are rebuilt from fit.csv and
// weighted as package biaxial weights a file, the card's form is refitted
// from its own estimates (which only polishes the optimum), and the fit's
// loss must come out as the card states it, so that the plan rests on
// exactly the fit the folder holds.

// Folder is what a plan reads from an output folder.
type Folder struct {
	dir  string
	card *card.Card
	spec *biaxial.Specimen
	// Problem and Result are the rebuilt data and fit.
	Problem *aniso.Problem
	Result  *aniso.Result
}

// planLossTolerance is how far (relative) the rebuilt fit's loss may lie
// from the card's before the folder is taken not to hold one fit.
const planLossTolerance = 1e-6

// Rebuild parses an output folder's model.json and fit.csv (their bytes,
// read by the caller within its limits; dir names the folder in messages)
// and rebuilds the fit. Errors about the files are *InputError; a fit that
// cannot be rebuilt, or whose loss is not the card's, is a *RebuildError.
func Rebuild(dir string, mj, fc []byte, dl biaxial.Limits, cl card.Limits) (*Folder, error) {
	if dl.MaxRows <= 0 {
		dl.MaxRows = biaxial.DefaultLimits.MaxRows
	}
	c, _, err := card.ParseLimits(bytes.NewReader(mj), filepath.Join(dir, "model.json"), cl)
	if err != nil {
		return nil, inputError(err)
	}
	for _, key := range []string{card.KeyFit, card.KeyData, card.KeyVerdict, card.KeySelection} {
		if err := c.SectionError(key); err != nil {
			return nil, inputErrorf("%s: $.%s: %v", filepath.Join(dir, "model.json"), key, err)
		}
	}
	if c.Fit == nil || c.Data == nil {
		return nil, inputErrorf("%s has no 'fit' or 'data' section: a plan needs a card that 'weft fit' wrote", filepath.Join(dir, "model.json"))
	}
	f := &Folder{dir: dir, card: c}
	if f.spec, err = specimenFromTable(fc, filepath.Join(dir, "fit.csv"), c, dl); err != nil {
		return nil, err
	}
	if f.Problem, err = aniso.NewProblem(f.spec, nil); err != nil {
		return nil, inputError(err)
	}
	if err := f.refit(); err != nil {
		return nil, err
	}
	return f, nil
}

// specimenFromTable rebuilds the fitted specimen from fit.csv: its
// protocols in order of first appearance, every point's F and measured
// stress, the relative weights the card's data section records, weighted
// as package biaxial weights a file.
func specimenFromTable(b []byte, file string, c *card.Card, dl biaxial.Limits) (*biaxial.Specimen, error) {
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		return nil, inputErrorf("%s: %v", file, err)
	}
	if len(rows) < 2 {
		return nil, inputErrorf("%s: no data rows", file)
	}
	if len(rows)-1 > dl.MaxRows {
		return nil, &InputError{Err: limitError{fmt.Sprintf("%s holds more than %d rows, the limit for it", file, dl.MaxRows), biaxial.ErrRowCount}}
	}
	fixed := []string{"protocol", "line", "cycle", "F11", "F12", "F21", "F22"}
	h := rows[0]
	for i, n := range fixed {
		if i >= len(h) || h[i] != n {
			return nil, inputErrorf("%s: line 1: expected the columns %s first, as 'weft fit' writes them", file, strings.Join(fixed, ","))
		}
	}
	s := &biaxial.Specimen{Name: c.Data.Specimen, Source: c.Data.Source, StressUnit: c.Data.StressUnit, Meta: map[string]string{}}
	switch c.Data.StressKind {
	case "nominal":
		s.Kind = biaxial.Nominal
	case "cauchy":
		s.Kind = biaxial.Cauchy
	default:
		return nil, inputErrorf("model.json: $.data.stress_kind %q is neither nominal nor cauchy", c.Data.StressKind)
	}
	// The measured columns in the table's order, so that a row with two
	// bad values is reported at the first, the same one every run (a map
	// would hand them out in Go's randomised iteration order).
	type measured struct {
		col  int
		comp biaxial.Component
	}
	var measuredCols []measured
	for j := len(fixed); j < len(h); j++ {
		name, unit, _ := strings.Cut(h[j], " [")
		kc, ok := strings.CutPrefix(name, "measured_"+c.Data.StressKind+"_")
		if !ok {
			continue
		}
		comp := map[string]biaxial.Component{"11": biaxial.C11, "22": biaxial.C22, "12": biaxial.C12, "21": biaxial.C21}
		cc, ok := comp[kc]
		if !ok || strings.TrimSuffix(unit, "]") != c.Data.StressUnit {
			return nil, inputErrorf("%s: line 1, column %d: %q is not a measured %s stress in %s, as model.json says the fit used", file, j+1, h[j], c.Data.StressKind, c.Data.StressUnit)
		}
		measuredCols = append(measuredCols, measured{j, cc})
		s.Measured[cc] = true
	}
	if !s.Measured[biaxial.C11] || !s.Measured[biaxial.C22] {
		return nil, inputErrorf("%s: line 1: no measured_%s_11 and _22 columns; the table does not belong to model.json", file, c.Data.StressKind)
	}
	index := map[string]int{}
	for i, row := range rows[1:] {
		ln := i + 2
		if len(row) != len(h) {
			return nil, inputErrorf("%s: line %d: %d fields, the header has %d", file, ln, len(row), len(h))
		}
		num := func(j int) (float64, error) {
			v, err := strconv.ParseFloat(row[j], 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return 0, inputErrorf("%s: line %d, column %d: %q is not a number", file, ln, j+1, row[j])
			}
			return v, nil
		}
		pt := biaxial.Point{Time: math.NaN()}
		var err error
		if pt.Line, err = strconv.Atoi(row[1]); err != nil {
			return nil, inputErrorf("%s: line %d, column 2: %q is not a line number", file, ln, row[1])
		}
		if pt.Cycle, err = strconv.Atoi(row[2]); err != nil {
			return nil, inputErrorf("%s: line %d, column 3: %q is not a cycle number", file, ln, row[2])
		}
		for k := 0; k < 4; k++ {
			if pt.F[k], err = num(3 + k); err != nil {
				return nil, err
			}
		}
		// Checked here so that the message names the table's line; the
		// fitting problem would name only the point's place in its
		// protocol.
		if det := pt.F[0]*pt.F[3] - pt.F[1]*pt.F[2]; !(det > 0) {
			return nil, inputErrorf("%s: line %d: det F = F11·F22 − F12·F21 = %g ≤ 0, which no deformation has; the table is not as the fit wrote it", file, ln, det)
		}
		for _, m := range measuredCols {
			if pt.Stress[m.comp], err = num(m.col); err != nil {
				return nil, err
			}
		}
		pi, ok := index[row[0]]
		if !ok {
			pi = len(s.Protocols)
			index[row[0]] = pi
			s.Protocols = append(s.Protocols, biaxial.Protocol{Label: row[0], UserWeight: 1})
		}
		s.Protocols[pi].Points = append(s.Protocols[pi].Points, pt)
	}
	return s, finishSpecimen(s, c, file)
}

// finishSpecimen checks the rebuilt specimen against the card's data
// section, takes its relative weights and shear information, and weighs it.
func finishSpecimen(s *biaxial.Specimen, c *card.Card, file string) error {
	if len(c.Data.Protocols) != len(s.Protocols) {
		return inputErrorf("%s holds %d protocols but model.json's data section lists %d; the files are not from the same fit", file, len(s.Protocols), len(c.Data.Protocols))
	}
	shear := s.Measured[biaxial.C12] || s.Measured[biaxial.C21]
	for i, dp := range c.Data.Protocols {
		pr := &s.Protocols[i]
		if dp.Label != pr.Label || dp.Points != len(pr.Points) {
			return inputErrorf("%s: protocol %q with %d points, but model.json lists %q with %d; the files are not from the same fit", file, pr.Label, len(pr.Points), dp.Label, dp.Points)
		}
		pr.UserWeight = dp.Weight
		// The tracking noise of the fitted F, as weft inspect estimates
		// it from a file (the plan's note on sutured tests reads it).
		pr.StrainScatter = biaxial.StrainScatterOf(pr.Points)
		for _, pt := range pr.Points {
			shear = shear || pt.F[1] != 0 || pt.F[2] != 0
		}
	}
	// Shear of F within its scatter counts as none (biaxial.Specimen.
	// ShearWithinScatter), as the fit took it.
	within := shear && c.Data.ShearWithinScatter && !s.Measured[biaxial.C12] && !s.Measured[biaxial.C21]
	if within {
		shear = false
	}
	if shear != c.Data.HasShear {
		return inputErrorf("%s and model.json disagree on whether the data carry shear information; the files are not from the same fit", file)
	}
	s.HasShear, s.ShearWithinScatter = shear, within
	s.Weigh()
	return nil
}

// refit rebuilds the card's fitted form and polishes it from the card's
// estimates (the optimum, so the refinement only confirms it), then checks
// that it reproduces the card's loss.
func (f *Folder) refit() error {
	fs, c := f.card.Fit, f.card
	l, err := aniso.ParseLayout(fs.Layout)
	if err != nil {
		return inputErrorf("model.json: $.fit.layout: %v", err)
	}
	hold := c.Layout != nil && c.Layout.PairAxis == "axis-1"
	st, err := aniso.StructureFromLabels(fs.Terms, l, fs.Dispersion, fs.InPlane, hold)
	if err != nil {
		return inputErrorf("model.json: $.fit.terms: %v", err)
	}
	init := map[string]float64{}
	for _, e := range fs.Estimates {
		v := float64(e.Value)
		if e.Kind == "weight" || math.IsNaN(v) {
			continue
		}
		if e.Kind == "angle" {
			v = aniso.Rad(v)
		}
		init[e.Name] = v
	}
	r, err := aniso.Fit(f.Problem, st, aniso.Settings{Init: init, NoScan: true})
	if err != nil {
		return &RebuildError{Msg: fmt.Sprintf("%s: the fit could not be rebuilt: %v", f.dir, err)}
	}
	want := float64(fs.Loss)
	if math.Abs(r.Loss-want) > planLossTolerance*math.Max(want, 1e-300) {
		return &RebuildError{Msg: fmt.Sprintf("%s: the rebuilt fit's loss %.10g differs from the card's %.10g; model.json and fit.csv are not from the same fit (or were edited) — fit the data again", f.dir, r.Loss, want)}
	}
	if err := f.sameModel(r); err != nil {
		return err
	}
	f.Result = r
	return nil
}

// planModelTolerance is how far (relative to the largest measured stress)
// the card's own model (terms, families) may predict the fitted points
// apart from the rebuilt fit: the fit's last digits, not an edit.
const planModelTolerance = 1e-4

// sameModel checks that the card's own model, the one predict, export and
// evaluate use, is the fit the plan rebuilt from the card's fit section:
// a card whose terms or families were edited after the fit would be
// planned for a model it no longer holds.
func (f *Folder) sameModel(r *aniso.Result) error {
	m, err := f.card.Model()
	if err != nil {
		return inputErrorf("model.json: %v", err)
	}
	got, err1 := aniso.Predict(f.Problem, m)
	ref, err2 := aniso.Predict(f.Problem, r.Model)
	if err1 != nil || err2 != nil {
		return &RebuildError{Msg: fmt.Sprintf("%s: the card's model cannot be evaluated on the fitted points: %v", f.dir, errors.Join(err1, err2))}
	}
	scale, worst := 0.0, 0.0
	for i := range ref {
		scale = math.Max(scale, math.Abs(f.Problem.Measured[i]))
		worst = math.Max(worst, math.Abs(got[i]-ref[i]))
	}
	if worst > planModelTolerance*scale {
		return &RebuildError{Msg: fmt.Sprintf("%s: the card's model (terms, families) predicts the fitted points up to %.4g %s away from its fit section's; the card was edited after the fit — plan from the folder as weft fit wrote it, or fit the data again", f.dir, worst, f.card.StressUnit)}
	}
	return nil
}

// Questions are the choices the plan scores: what the verdict left open
// (the sign of an angle, one family or a mirror pair, an undecided family
// count) and the model forms within the selection's one-standard-error
// band; notes say what was left out and why.
func (f *Folder) Questions() ([]aniso.Question, []string) {
	r := f.Result
	var qs []aniso.Question
	var notes []string
	if q, ok := aniso.LayoutQuestion(r.Model, r.SignKnown); ok {
		qs = append(qs, q)
	}
	if v := f.card.Verdict; v != nil && v.Families == "undecided" {
		// An isotropic chosen model is weighed against the model with
		// fibres too: the question is whether fibres are needed.
		if q, ok := f.undecidedQuestion(); ok {
			qs = append(qs, q)
		}
	} else if v != nil && v.Families == "0" && v.LookAlike != "" {
		// An isotropic verdict that cannot rule out fibres placed
		// symmetrically about the 45° line is weighed against them.
		if q, ok := f.namedQuestion(v.LookAlike, "fibres symmetric about the 45° line (look-alike of the isotropic verdict)"); ok {
			qs = append(qs, q)
		}
	}
	if q, note, ok := f.bandQuestion(); ok {
		qs = append(qs, q)
	} else if note != "" {
		notes = append(notes, note)
	}
	return qs, notes
}

// candidateForm is a selection candidate's form key (aniso.FormKey).
func candidateForm(cc *card.CandidateCard) string {
	l, err := aniso.ParseLayout(cc.Layout)
	if err != nil {
		return ""
	}
	return aniso.FormKey(aniso.Structure{Layout: l, Dispersion: cc.Dispersion, Planar: cc.InPlane})
}

// undecidedQuestion pits the chosen model against the best model of the
// richer form the undecided verdict points towards, or against the model
// that fits better in sample (two fibre directions against one, or fibres
// against none), ties with it with fibres placed elsewhere, or is its
// look-alike, when that is why the verdict is undecided (in_sample_best,
// ties_with, look_alike).
func (f *Folder) undecidedQuestion() (aniso.Question, bool) {
	v, sel := f.card.Verdict, f.card.Selection
	if sel == nil {
		return aniso.Question{}, false
	}
	named := cmp.Or(v.InSampleBest, v.TiesWith, v.LookAlike)
	// The form the verdict points towards: of the suggestive steps to
	// another number of families, the one that gains most on held-out
	// error (as the verdict names it).
	var toward string
	gain := math.Inf(-1)
	for _, lc := range v.Comparisons {
		// A form key starts with its number of families (aniso.FormKey).
		sameCount := v.Form != "" && strings.HasPrefix(lc.Richer, v.Form[:1])
		if lc.Suggestive && !lc.Decisive && !sameCount && float64(lc.Gain) > gain {
			toward, gain = lc.Richer, float64(lc.Gain)
		}
	}
	var best *card.CandidateCard
	for i := range sel.Pareto {
		cc := &sel.Pareto[i]
		switch {
		case cc.Model == nil:
		case toward == "" && named != "":
			if cc.Name == named {
				best = cc
			}
		case candidateForm(cc) == toward && !math.IsNaN(float64(cc.HeldoutError)):
			if best == nil || cc.HeldoutError < best.HeldoutError {
				best = cc
			}
		}
	}
	// A classical preset named as the better explanation (the Fung-type
	// preset, which has no fibre family) is among the presets.
	for i := range sel.Presets {
		if cc := &sel.Presets[i]; best == nil && toward == "" && named != "" && cc.Name == named && cc.Model != nil {
			best = cc
		}
	}
	if best != nil && toward == "" {
		toward = candidateForm(best)
	}
	if best == nil {
		return aniso.Question{}, false
	}
	return f.pitAgainst(best, toward, "fibre families (undecided verdict)")
}

// namedQuestion pits the chosen model against the selection candidate
// named, under topic; false when there is no such candidate with a model.
func (f *Folder) namedQuestion(name, topic string) (aniso.Question, bool) {
	sel := f.card.Selection
	if sel == nil {
		return aniso.Question{}, false
	}
	for i := range sel.Pareto {
		if cc := &sel.Pareto[i]; cc.Name == name && cc.Model != nil {
			return f.pitAgainst(cc, candidateForm(cc), topic)
		}
	}
	return aniso.Question{}, false
}

// pitAgainst is the verdict's question between the chosen model and the
// selection candidate best, of form form, under topic.
func (f *Folder) pitAgainst(best *card.CandidateCard, form, topic string) (aniso.Question, bool) {
	m, err := f.card.CandidateModelOf(best)
	if err != nil {
		return aniso.Question{}, false
	}
	rival := "form " + form + " (" + best.Name + ": " + strings.Join(best.Terms, " + ") + ")"
	if strings.HasPrefix(best.Name, "preset:") {
		// A preset is no discovered form: the Fung-type one has no fibre
		// family but is not isotropic (form 0).
		what := strings.Join(best.Terms, " + ")
		if len(m.Families) == 0 {
			what += ", no fibre family"
		}
		rival = "the classical preset " + strings.TrimPrefix(best.Name, "preset:") + " (" + what + ")"
	}
	q := aniso.Question{Verdict: true, SignUnknown: !f.Result.SignKnown, Explanations: []aniso.Explanation{
		{Name: "form " + f.card.Verdict.Form + " as chosen (" + activeTerms(f.Result) + ")", Model: f.Result.Model},
		{Name: rival, Model: m},
	}}
	q.Topic = topic
	q.Text = q.Topic + ": " + aniso.ExplanationList(q.Explanations)
	return q, true
}

// activeTerms lists the labels of r's terms with a positive weight.
func activeTerms(r *aniso.Result) string {
	var ls []string
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			ls = append(ls, t.Label(r.Structure.Layout))
		}
	}
	return strings.Join(ls, " + ")
}

// maxBandForms bounds the forms of the band question, the closest to the
// best held-out error first.
const maxBandForms = 6

// bandQuestion is the choice among the discovered models of the verdict's
// form whose held-out error lies within one standard error of the form's
// best (the band the selection rule picks from), or a note why there is
// none to ask.
func (f *Folder) bandQuestion() (aniso.Question, string, bool) {
	v, sel := f.card.Verdict, f.card.Selection
	if v == nil || sel == nil {
		return aniso.Question{}, "", false
	}
	var in []*card.CandidateCard
	var best *card.CandidateCard
	for i := range sel.Pareto {
		cc := &sel.Pareto[i]
		if candidateForm(cc) != v.Form || math.IsNaN(float64(cc.HeldoutError)) {
			continue
		}
		in = append(in, cc)
		if best == nil || cc.HeldoutError < best.HeldoutError {
			best = cc
		}
	}
	if best == nil {
		return aniso.Question{}, "", false
	}
	se := math.Max(float64(best.HeldoutStdErr), float64(v.StdErrFloor))
	thr := float64(best.HeldoutError) + se
	var band []*card.CandidateCard
	for _, cc := range in {
		if float64(cc.HeldoutError) <= thr {
			band = append(band, cc)
		}
	}
	sort.SliceStable(band, func(a, b int) bool {
		if band[a].Chosen != band[b].Chosen {
			return band[a].Chosen
		}
		return band[a].HeldoutError < band[b].HeldoutError
	})
	if len(band) > maxBandForms {
		band = band[:maxBandForms]
	}
	if len(band) < 2 {
		return aniso.Question{}, "", false
	}
	q := aniso.Question{SignUnknown: !f.Result.SignKnown}
	for _, cc := range band {
		m := f.Result.Model
		if !cc.Chosen {
			var err error
			if m, err = f.card.CandidateModelOf(cc); err != nil {
				return aniso.Question{}, "the model forms within the selection's one-standard-error band are not compared: " + err.Error() + "; fit the data again to record them", false
			}
		}
		q.Explanations = append(q.Explanations, aniso.Explanation{Name: cc.Name + " (" + strings.Join(cc.Terms, " + ") + ")", Model: m})
	}
	q.Topic = "model form"
	q.Text = "model form (held-out error within one standard error of the best): " + aniso.ExplanationList(q.Explanations)
	return q, "", true
}
