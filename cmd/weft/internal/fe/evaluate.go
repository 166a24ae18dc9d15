package fe

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// TangentOrder is the component order of the tangent's rows (nominal
// stress) and columns (deformation gradient).
var TangentOrder = []string{"11", "12", "21", "22"}

// EvalFamily is one family's fibre quantities in evaluate's JSON.
type EvalFamily struct {
	Name         string  `json:"name"`
	AngleDeg     float64 `json:"angle_deg"`
	I4           float64 `json:"I4"`
	I5           float64 `json:"I5"`
	K            float64 `json:"K"`
	FibreStretch float64 `json:"fibre_stretch"`
	Engaged      bool    `json:"fibre_terms_engaged"`
}

// Evaluation is evaluate's JSON output.
type Evaluation struct {
	Model      string             `json:"model"`
	StressUnit string             `json:"stress_unit"`
	F          map[string]float64 `json:"F"`
	F33        float64            `json:"F33"`
	I1         float64            `json:"I1"`
	I2         float64            `json:"I2"`
	Families   []EvalFamily       `json:"families"`
	Energy     float64            `json:"energy"`
	EnergyNote string             `json:"energy_unit"`
	Cauchy     map[string]float64 `json:"cauchy"`
	Nominal    map[string]float64 `json:"nominal"`
	Tangent    struct {
		Order   []string `json:"order"`
		Meaning string   `json:"meaning"`
		// Matrix entries that overflow are null, with a warning.
		Matrix [4][4]card.Num `json:"matrix"`
		Unit   string         `json:"unit"`
	} `json:"tangent"`
	// Alternatives are the models the card's data cannot tell from its
	// own, evaluated at the same F.
	Alternatives []EvalAlternative `json:"alternatives,omitempty"`
	Warnings     []string          `json:"warnings"`
	Notices      []string          `json:"notices"`
	Cautions     []string          `json:"cautions"`
}

// EvalAlternative is one alternative model at the deformation evaluated.
type EvalAlternative struct {
	// Name and Title name the alternative (as in the card's alternatives
	// section); AsCard is true for the card's own model.
	Name   string `json:"name"`
	Title  string `json:"title"`
	AsCard bool   `json:"as_card"`
	// Energy is W per unit reference volume, Cauchy (11, 22, 12) and
	// Nominal (11, 22, 12, 21) the stresses, all in the card's stress unit.
	Energy  float64            `json:"energy"`
	Cauchy  map[string]float64 `json:"cauchy"`
	Nominal map[string]float64 `json:"nominal"`
}

// Evaluate computes everything evaluate reports.
func Evaluate(file string, c *card.Card, m *aniso.Model, F [4]float64, dr *card.DataRange) (*Evaluation, error) {
	r, err := m.Evaluate(F)
	if err != nil {
		return nil, cardErrorf("%s at F = %s: %v", file, fmtF(F), err)
	}
	tg, err := m.Tangent(F)
	if err != nil {
		return nil, cardErrorf("%s at F = %s: %v", file, fmtF(F), err)
	}
	k, _ := aniso.NewKinematics(F)
	res := &Evaluation{Model: filepath.Base(file), StressUnit: c.StressUnit, F33: 1 / k.J2, I1: k.I1, I2: k.I2,
		Energy: r.Energy, EnergyNote: c.StressUnit + " (energy per unit reference volume)",
		F:        map[string]float64{"11": F[0], "12": F[1], "21": F[2], "22": F[3]},
		Cauchy:   map[string]float64{"11": r.Cauchy[0], "22": r.Cauchy[1], "12": r.Cauchy[2]},
		Nominal:  map[string]float64{"11": r.Nominal[0], "22": r.Nominal[1], "12": r.Nominal[2], "21": r.Nominal[3]},
		Families: []EvalFamily{}, Warnings: []string{}, Notices: []string{}, Cautions: card.CautionsOf(c)}
	names := familyNames(m)
	for i, f := range m.Families {
		fk := k.Fibre(f.Angle)
		res.Families = append(res.Families, EvalFamily{Name: names[i], AngleDeg: aniso.WrapDeg(aniso.Deg(f.Angle)),
			I4: fk.I4, I5: fk.I5, K: fk.K, FibreStretch: math.Sqrt(fk.I4), Engaged: fk.I4 > 1})
	}
	res.Tangent.Order = TangentOrder
	res.Tangent.Meaning = "matrix[i][j] = d nominal_i / d F_j with F33 = 1/det F eliminated (plane stress); symmetric"
	overflow := false
	for i := range tg.A {
		for j, v := range tg.A[i] {
			res.Tangent.Matrix[i][j] = card.Num(v)
			overflow = overflow || math.IsInf(v, 0) || math.IsNaN(v)
		}
	}
	if overflow {
		res.Warnings = append(res.Warnings, "some tangent entries overflow at this deformation and are given as null (not a number): the model is far beyond the range it was fitted in")
	}
	res.Tangent.Unit = c.StressUnit
	if m.MatrixWeight() == 0 {
		res.Warnings = append(res.Warnings, noMatrixWarning)
	}
	if err := evaluateAlternatives(res, file, c, m, F); err != nil {
		return nil, err
	}
	if dr == nil {
		res.Notices = append(res.Notices, noRangeNotice)
	} else if out := outsideRange(dr, m, F); len(out) > 0 {
		res.Warnings = append(res.Warnings, "this deformation extrapolates beyond the fitted data range: "+joinSemi(out))
	}
	return res, nil
}

func joinSemi(s []string) string { return strings.Join(s, "; ") }

// evaluateAlternatives evaluates the alternatives of the card at F and
// warns, naming them.
func evaluateAlternatives(res *Evaluation, file string, c *card.Card, m *aniso.Model, F [4]float64) error {
	alts, err := c.AlternativeModels(m)
	if err != nil {
		return cardErrorf("%s: %v", file, err)
	}
	if len(alts) == 0 {
		return nil
	}
	var models []ExportModel
	for _, a := range alts {
		r, err := a.Model.Evaluate(F)
		if err != nil {
			return cardErrorf("%s: alternative %s at F = %s: %v", file, a.Name, fmtF(F), err)
		}
		res.Alternatives = append(res.Alternatives, EvalAlternative{Name: a.Name, Title: a.Title, AsCard: a.AsCard, Energy: r.Energy,
			Cauchy:  map[string]float64{"11": r.Cauchy[0], "22": r.Cauchy[1], "12": r.Cauchy[2]},
			Nominal: map[string]float64{"11": r.Nominal[0], "22": r.Nominal[1], "12": r.Nominal[2], "21": r.Nominal[3]}})
		models = append(models, ExportModel{Name: a.Name, Title: a.Title, AsCard: a.AsCard})
	}
	res.Warnings = append(res.Warnings, alternativesWarning(models))
	return nil
}

// PrintEvaluation writes the evaluation r as text: F, the invariants, the
// energy, the stresses and the tangent, then warnings, notices and the
// cautions.
func PrintEvaluation(w io.Writer, r *Evaluation) {
	u := r.StressUnit
	fmt.Fprintf(w, "Model %s, stresses in %s\n\n", r.Model, u)
	fmt.Fprintf(w, "F   = [[%.10g, %.10g], [%.10g, %.10g]], F33 = %.10g (incompressible)\n", r.F["11"], r.F["12"], r.F["21"], r.F["22"], r.F33)
	fmt.Fprintf(w, "I1  = %.10g, I2 = %.10g\n", r.I1, r.I2)
	for _, f := range r.Families {
		state := "slack (I4 <= 1: fibre and I5 terms off)"
		if f.Engaged {
			state = "stretched"
		}
		fmt.Fprintf(w, "family %s at %g deg: I4 = %.10g, I5 = %.10g, K = %.10g, fibre stretch %.10g, %s\n", f.Name, f.AngleDeg, f.I4, f.I5, f.K, f.FibreStretch, state)
	}
	fmt.Fprintf(w, "\nenergy W = %.10g %s (per unit reference volume)\n\n", r.Energy, u)
	fmt.Fprintf(w, "Cauchy stress [%s]:  sigma11 = %.10g  sigma22 = %.10g  sigma12 = %.10g  (sigma33 = 0)\n", u, r.Cauchy["11"], r.Cauchy["22"], r.Cauchy["12"])
	fmt.Fprintf(w, "Nominal stress P = sigma F^-T [%s]:  P11 = %.10g  P12 = %.10g  P21 = %.10g  P22 = %.10g\n\n", u, r.Nominal["11"], r.Nominal["12"], r.Nominal["21"], r.Nominal["22"])
	fmt.Fprintf(w, "Tangent dP/dF [%s], plane stress, F33 eliminated (symmetric):\n", u)
	fmt.Fprintf(w, "  %-8s %16s %16s %16s %16s\n", "", "dF11", "dF12", "dF21", "dF22")
	for i, row := range r.Tangent.Matrix {
		fmt.Fprintf(w, "  %-8s %16.10g %16.10g %16.10g %16.10g\n", "dP"+TangentOrder[i], float64(row[0]), float64(row[1]), float64(row[2]), float64(row[3]))
	}
	if len(r.Alternatives) > 0 {
		fmt.Fprintf(w, "\nAlternatives the data cannot tell apart, at this F [%s]:\n", u)
		for _, a := range r.Alternatives {
			card := ""
			if a.AsCard {
				card = " (the card)"
			}
			fmt.Fprintf(w, "  %-14s W = %.10g  sigma11 = %.10g  sigma22 = %.10g  sigma12 = %.10g  %s%s\n", a.Name, a.Energy, a.Cauchy["11"], a.Cauchy["22"], a.Cauchy["12"], a.Title, card)
		}
	}
	for _, s := range r.Warnings {
		fmt.Fprintln(w, "\nWARNING: "+s)
	}
	for _, s := range r.Notices {
		fmt.Fprintln(w, "\nNotice: "+s)
	}
	fmt.Fprintln(w)
	printCautions(w, r.Cautions)
}
