package card

// The models the held-out protocols could not tell from a card's own and
// the band of their stresses: a prediction's alike_low_ and alike_high_
// columns and the untested strips (untested.go) are built from them.

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/aniso"
)

// NearEquivalents returns the selection's other candidates — discovered
// forms and classical presets — that predicted the held-out protocols as
// well as the chosen one: their mean held-out error is not above the
// chosen candidate's by more than its standard error, floored at the
// verdict's stderr_floor as the selection rule floors it (the yardstick
// of the one-standard-error rule, Hastie, Tibshirani & Friedman 2009,
// §7.10), and each carries its model. The tested protocols do not tell these
// models from the chosen one, so where their predictions part, a protocol
// that was not tested is not settled by the data. nil when the card has no
// selection or its chosen candidate was not cross-validated.
func (c *Card) NearEquivalents() []*CandidateCard {
	sel := c.Selection
	if sel == nil {
		return nil
	}
	var chosen *CandidateCard
	for i := range sel.Pareto {
		if sel.Pareto[i].Chosen {
			chosen = &sel.Pareto[i]
		}
	}
	if chosen == nil || !finite(float64(chosen.HeldoutError)) {
		return nil
	}
	// The standard error is floored as the selection rule floors it
	// (verdict.stderr_floor): a chosen model whose folds happen to agree
	// closely must not narrow the yardstick below the noise.
	se := 0.0
	if v := float64(chosen.HeldoutStdErr); finite(v) {
		se = v
	}
	if c.Verdict != nil {
		if f := float64(c.Verdict.StdErrFloor); finite(f) {
			se = math.Max(se, f)
		}
	}
	limit := float64(chosen.HeldoutError) + se
	var out []*CandidateCard
	for _, group := range [][]CandidateCard{sel.Pareto, sel.Presets} {
		for i := range group {
			cc := &group[i]
			if cc == chosen || cc.Model == nil || !finite(float64(cc.HeldoutError)) || float64(cc.HeldoutError) > limit {
				continue
			}
			out = append(out, cc)
		}
	}
	return out
}

// AloneInSelection reports whether the card has a selection whose chosen
// candidate was cross-validated and no other candidate came within its
// standard error (NearEquivalents is empty): a card without an alike band
// for that reason, not for want of a selection.
func (c *Card) AloneInSelection() bool {
	if c.Selection == nil || len(c.NearEquivalents()) > 0 {
		return false
	}
	for _, cc := range c.Selection.Pareto {
		if cc.Chosen && finite(float64(cc.HeldoutError)) {
			return true
		}
	}
	return false
}

// AlikeModel is a near-equivalent candidate's model (NearEquivalents) with
// its name, or the reflection of one of them or of the card's own model.
type AlikeModel struct {
	Name  string
	Model *aniso.Model
	// Reflection is true for the reflection about axis 1 (every fibre
	// angle negated, the shear couplings of fung-general too) of the
	// card's model or of a near-equivalent one, which AlikeModels adds
	// when the data carried no shear information: such data cannot tell a
	// model from its reflection (the normal stresses of a pure biaxial
	// stretch are the same, the shear stresses opposite).
	Reflection bool
}

// AlikeModels builds the models of the card's near-equivalent candidates
// (NearEquivalents), in their order. When the card's fit had no shear
// information (fit.angle_sign_known false) and there are near-equivalent
// candidates, it adds after them the reflection about axis 1 of the
// card's own model and of each of them (AlikeModel.Reflection), so that a
// band spans the sign of the fibre angles that the data left open. The
// reflection of a model that does not change under it (no fibres, no
// coupling) is not added.
func (c *Card) AlikeModels() ([]AlikeModel, error) {
	var out []AlikeModel
	near := c.NearEquivalents()
	for _, cc := range near {
		m, err := c.CandidateModelOf(cc)
		if err != nil {
			return nil, fmt.Errorf("selection candidate %s: %v", cc.Name, err)
		}
		out = append(out, AlikeModel{Name: cc.Name, Model: m})
	}
	if len(near) == 0 || c.Fit == nil || c.Fit.AngleSignKnown {
		return out, nil
	}
	own, err := c.Model()
	if err != nil {
		return nil, err
	}
	models := []*aniso.Model{own}
	names := []string{"the card's model reflected"}
	for _, a := range out {
		models = append(models, a.Model)
		names = append(names, a.Name+" reflected")
	}
	for i, m := range models {
		if r, changed := aniso.Reflected(m); changed {
			out = append(out, AlikeModel{Name: names[i], Model: r, Reflection: true})
		}
	}
	return out, nil
}

// Candidates counts the models of alike that are selection candidates,
// not reflections.
func Candidates(alike []AlikeModel) int {
	n := 0
	for _, a := range alike {
		if !a.Reflection {
			n++
		}
	}
	return n
}

// Band is the range of the stresses of a model and of its near-equivalent
// models at one deformation, each array in the order Cauchy σ11, σ22,
// σ12, nominal P11, P22, P12, P21 (stress unit).
type Band struct {
	// Own is the model's own stress; Low and High the lowest and highest
	// of it and of every near-equivalent model that could be evaluated.
	Own, Low, High [7]float64
	// Missing names the near-equivalent models that could not be
	// evaluated at this deformation (beyond a limit of their terms).
	Missing []string
}

// AlikeBand evaluates m and each near-equivalent model at F. The error is
// m's own: a near-equivalent model that fails is named in Band.Missing.
func AlikeBand(m *aniso.Model, alike []AlikeModel, F [4]float64) (Band, error) {
	return AlikeBandTurned(m, alike, F, 0)
}

// AlikeBandTurned is AlikeBand with each model's stresses read in axes
// turned by psiDeg degrees from the tester's (σ' = Rᵀ σ R, P' = Rᵀ P R)
// before the band is taken: the band of a specimen cut or mounted at psiDeg,
// in its own axes. F is in the tester's axes.
func AlikeBandTurned(m *aniso.Model, alike []AlikeModel, F [4]float64, psiDeg float64) (Band, error) {
	r, err := m.Evaluate(F)
	if err != nil {
		return Band{}, err
	}
	b := Band{Own: stresses(r, psiDeg)}
	b.Low, b.High = b.Own, b.Own
	for _, a := range alike {
		ra, err := a.Model.Evaluate(F)
		if err != nil {
			b.Missing = append(b.Missing, a.Name)
			continue
		}
		for j, x := range stresses(ra, psiDeg) {
			b.Low[j], b.High[j] = math.Min(b.Low[j], x), math.Max(b.High[j], x)
		}
	}
	return b, nil
}

// stresses lists a response's stresses in Band's order, read in axes
// turned by psiDeg degrees from the tester's.
func stresses(r aniso.Response, psiDeg float64) [7]float64 {
	s, p := r.Cauchy, r.Nominal
	if psiDeg != 0 {
		c := aniso.Turned([4]float64{s[0], s[2], s[2], s[1]}, -psiDeg)
		n := aniso.Turned([4]float64{p[0], p[2], p[3], p[1]}, -psiDeg)
		s = aniso.Sym{c[0], c[3], c[1]}
		p = [4]float64{n[0], n[3], n[1], n[2]}
	}
	return [7]float64{s[0], s[1], s[2], p[0], p[1], p[2], p[3]}
}
