package fe

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/terms"
)

// checkFormat is the version of check's JSON document.
const checkFormat = "weft.check/1"

const (
	stabilityCriterion = "the in-plane tangent A = d2W/dF^2 (symmetric, tested whole) restricted to the three in-plane increments " +
		"orthogonal to the rigid-rotation increment Omega F must be positive definite (smallest eigenvalue > tolerance); " +
		"the rotation direction itself carries sigma11 + sigma22 for every material and is left out"
	ellipticityCriterion = "Legendre-Hadamard: (a x b):A:(a x b) > tolerance for all in-plane unit vectors a, b; " +
		"exact in a (smallest eigenvalue of the 2x2 acoustic tensor), b sampled evenly over [0, 180) deg"
)

type checkTerm struct {
	Term       int    `json:"term"`
	ID         string `json:"id"`
	Family     string `json:"family,omitempty"`
	Polyconvex bool   `json:"polyconvex"`
	Note       string `json:"note"`
	// Convexity is the parameter-dependent convexity condition of a term
	// that has one (the Fung-type term), checked for the card's values.
	Convexity *checkConvexity `json:"convexity_condition,omitempty"`
}

// checkConvexity is a term's convexity condition and its outcome.
type checkConvexity struct {
	Condition string `json:"condition"`
	Holds     bool   `json:"holds"`
	Detail    string `json:"detail"`
}

type checkPoint struct {
	F      [4]float64 `json:"F"`
	Cauchy [3]float64 `json:"cauchy"`
	Value  card.Num   `json:"value"`
	// MinFull is the full 4×4 smallest eigenvalue (stability only).
	MinFull *card.Num `json:"min_full_eigenvalue,omitempty"`
	// A and B are the worst rank-one directions (ellipticity only).
	A *[2]float64 `json:"a,omitempty"`
	B *[2]float64 `json:"b,omitempty"`
	// InsideData says whether the point lies in the fitted data range
	// (absent when the card has none).
	InsideData *bool `json:"inside_data_range,omitempty"`
}

type checkModulus struct {
	Direction        string   `json:"direction"`
	AngleDeg         float64  `json:"angle_deg"`
	Tension          card.Num `json:"tension"`
	Compression      card.Num `json:"compression"`
	TensionTerms     []string `json:"terms_engaged_in_tension"`
	CompressionTerms []string `json:"terms_engaged_in_compression"`
}

// CheckReport is everything check reports.
type CheckReport struct {
	Format     string   `json:"format"`
	Model      string   `json:"model"`
	StressUnit string   `json:"stress_unit"`
	Passed     bool     `json:"passed"`
	Failures   []string `json:"failures"`
	Warnings   []string `json:"warnings"`
	Notices    []string `json:"notices"`
	Reference  struct {
		MaxAbsCauchy float64 `json:"max_abs_cauchy"`
		Tolerance    float64 `json:"tolerance"`
		Passed       bool    `json:"passed"`
	} `json:"stress_free_reference"`
	Polyconvexity struct {
		AllTerms bool        `json:"all_terms_polyconvex"`
		Terms    []checkTerm `json:"terms"`
	} `json:"polyconvexity"`
	Grid struct {
		StretchMin float64 `json:"stretch_min"`
		StretchMax float64 `json:"stretch_max"`
		Steps      int     `json:"steps_per_axis"`
		ShearMax   float64 `json:"shear_max"`
		Shears     string  `json:"shears"`
		Directions int     `json:"ellipticity_directions"`
		Points     int     `json:"points"`
		Evaluated  int     `json:"evaluated"`
		Tolerance  float64 `json:"tolerance"`
	} `json:"grid"`
	Stability struct {
		Criterion     string `json:"criterion"`
		Passed        bool   `json:"passed"`
		FailingPoints int    `json:"failing_points"`
		// Worst is null when no grid point was resolved; WorstReason
		// says so.
		Worst                 *checkPoint `json:"worst"`
		WorstReason           string      `json:"worst_reason,omitempty"`
		FullIndefinite        int         `json:"full_tangent_indefinite_points"`
		Unresolved            int         `json:"unresolved_points"`
		FullIndefiniteTensile int         `json:"full_tangent_indefinite_with_both_principal_stresses_tensile"`
		// NoStiffnessPoints have a zero tangent, or no resolvable
		// positive stiffness without a matrix term; they fail.
		NoStiffnessPoints int         `json:"no_stiffness_points"`
		FirstNoStiffness  *[4]float64 `json:"first_no_stiffness_F,omitempty"`
	} `json:"material_stability"`
	Ellipticity struct {
		Criterion     string      `json:"criterion"`
		Passed        bool        `json:"passed"`
		FailingPoints int         `json:"failing_points"`
		Worst         *checkPoint `json:"worst"`
		WorstReason   string      `json:"worst_reason,omitempty"`
	} `json:"strong_ellipticity"`
	Moduli struct {
		InitialShear  card.Num       `json:"initial_shear_modulus"`
		ShearPositive card.Num       `json:"shear_modulus_12_positive"`
		ShearNegative card.Num       `json:"shear_modulus_12_negative"`
		Young         []checkModulus `json:"uniaxial_moduli"`
		Note          string         `json:"note"`
	} `json:"small_strain_moduli"`
	// NoStiffness is true when the card fails for lack of stiffness (on
	// the grid or at small strain); MatrixWeight is the sum of the
	// weights of its terms without a fibre family.
	NoStiffness  bool     `json:"no_stiffness"`
	MatrixWeight card.Num `json:"matrix_weight"`
	// Alternatives are the models the card's data cannot tell from its
	// own, each scanned for stability and ellipticity on the same grid.
	Alternatives []checkAlternative `json:"alternatives,omitempty"`
	DataRange    *card.DataRange    `json:"data_range"`
	Cautions     []string           `json:"cautions"`
}

// checkAlternative is the stability scan of one alternative model.
type checkAlternative struct {
	Name              string `json:"name"`
	Title             string `json:"title"`
	AsCard            bool   `json:"as_card"`
	Passed            bool   `json:"passed"`
	UnstablePoints    int    `json:"unstable_points"`
	NonEllipticPoints int    `json:"non_elliptic_points"`
	NoStiffnessPoints int    `json:"no_stiffness_points"`
}

// CheckCard performs every check.
func CheckCard(file string, c *card.Card, m *aniso.Model, g aniso.StabilityGrid, dr *card.DataRange) (*CheckReport, error) {
	rep := &CheckReport{Format: checkFormat, Model: filepath.Base(file), StressUnit: c.StressUnit, Failures: []string{}, Warnings: []string{},
		Notices: []string{}, DataRange: dr, Cautions: card.CautionsOf(c), MatrixWeight: card.Num(m.MatrixWeight())}
	u := c.StressUnit
	names := familyNames(m)
	alts, err := c.AlternativeModels(m)
	if err != nil {
		return nil, cardErrorf("%s: %v", file, err)
	}

	// 1. Stress-free reference.
	mx, tol, err := m.ReferenceStress()
	if err != nil {
		return nil, cardErrorf("%s: at F = I: %v", file, err)
	}
	rep.Reference.MaxAbsCauchy, rep.Reference.Tolerance, rep.Reference.Passed = mx, tol, mx <= tol
	if !rep.Reference.Passed {
		rep.Failures = append(rep.Failures, fmt.Sprintf("stress-free reference: |sigma| = %.3g %s at F = I exceeds %.3g %s", mx, u, tol, u))
	}

	// 2. Polyconvexity.
	checkPolyconvexity(rep, m, g, names)

	// 3 and 4. Stability and ellipticity.
	sr, err := m.CheckStability(g)
	if err != nil {
		return nil, cardErrorf("%s: %v", file, err)
	}
	checkGrid(rep, m, g, &sr, dr)

	// 5. Small-strain moduli.
	if err := checkModuli(rep, m, names); err != nil {
		return nil, cardErrorf("%s: %v", file, err)
	}

	// 6. Data range.
	if dr == nil {
		rep.Notices = append(rep.Notices, noRangeNotice)
	} else {
		rep.Warnings = append(rep.Warnings, gridExtrapolation(dr, m, g, names)...)
	}

	// 7. The alternatives of an undetermined fibre layout.
	if err := checkAlternatives(rep, alts, g); err != nil {
		return nil, cardErrorf("%s: %v", file, err)
	}
	// A card edited to another convention is checked as weft reads it.
	rep.Warnings = append(rep.Warnings, c.EditedConventions()...)
	rep.Passed = len(rep.Failures) == 0
	return rep, nil
}

// worstPoint turns a scan's worst point into the report's, or nil with a
// reason when no point was resolved (its value is then +Inf).
func worstPoint(p aniso.PointStability, value float64, inside func([4]float64) *bool) (*checkPoint, string) {
	if math.IsInf(value, 1) {
		return nil, "no grid point was resolved: every point either could not be evaluated or has no stiffness"
	}
	return &checkPoint{F: p.F, Cauchy: p.Cauchy, Value: card.Num(value), InsideData: inside(p.F)}, ""
}

// checkGrid reports the stability and ellipticity scan sr on grid g.
func checkGrid(rep *CheckReport, m *aniso.Model, g aniso.StabilityGrid, sr *aniso.StabilityReport, dr *card.DataRange) {
	u := rep.StressUnit
	rep.Grid.StretchMin, rep.Grid.StretchMax, rep.Grid.Steps = g.StretchMin, g.StretchMax, g.Steps
	rep.Grid.ShearMax, rep.Grid.Directions = g.ShearMax, g.Directions
	rep.Grid.Shears = "none"
	if g.ShearMax > 0 {
		rep.Grid.Shears = fmt.Sprintf("each stretch also with F12 or F21 = %g, %g, %g, %g", -g.ShearMax, -g.ShearMax/2, g.ShearMax/2, g.ShearMax)
	}
	rep.Grid.Points, rep.Grid.Evaluated, rep.Grid.Tolerance = sr.Points, sr.Evaluated, sr.Tolerance
	if sr.NotEvaluable > 0 {
		rep.Warnings = append(rep.Warnings, fmt.Sprintf("%d of %d grid points could not be evaluated and were not tested (first at F = %s: %s)",
			sr.NotEvaluable, sr.Points, fmtF(sr.FirstNotEvaluable), sr.NotEvaluableReason))
	}
	inside := func(F [4]float64) *bool {
		if dr == nil {
			return nil
		}
		b := len(outsideRange(dr, m, F)) == 0
		return &b
	}
	where := func(p *checkPoint) string {
		switch {
		case p == nil || p.InsideData == nil:
			return ""
		case *p.InsideData:
			return " (inside the fitted data range)"
		}
		return " (outside the fitted data range)"
	}
	ws := sr.WorstStability
	rep.Stability.Criterion = stabilityCriterion
	rep.Stability.Passed = sr.UnstablePoints == 0 && sr.NoStiffness == 0
	rep.Stability.FailingPoints = sr.UnstablePoints
	rep.Stability.Worst, rep.Stability.WorstReason = worstPoint(ws, ws.MinModuloRotation, inside)
	if rep.Stability.Worst != nil {
		mf := card.Num(ws.MinFull)
		rep.Stability.Worst.MinFull = &mf
	}
	rep.Stability.FullIndefinite, rep.Stability.FullIndefiniteTensile = sr.FullIndefinite, sr.FullIndefiniteTensile
	rep.Stability.Unresolved = sr.Unresolved
	rep.Stability.NoStiffnessPoints = sr.NoStiffness
	if sr.NoStiffness > 0 {
		f := sr.FirstNoStiffness
		rep.Stability.FirstNoStiffness = &f
		rep.NoStiffness = true
		rep.Failures = append(rep.Failures, fmt.Sprintf("no stiffness at %d of %d grid points (first at F = %s): the in-plane tangent is zero there or has no resolvable positive stiffness, so an FE solve of such a state is singular; likely cause: %s",
			sr.NoStiffness, sr.Evaluated, fmtF(f), stiffnessCause(m, nil, false)))
	}
	if sr.UnstablePoints > 0 {
		rep.Failures = append(rep.Failures, fmt.Sprintf("material stability fails at %d of %d grid points; worst at F = %s%s: "+
			"smallest eigenvalue of the tangent modulo rigid rotation %.4g %s <= %.3g %s",
			sr.UnstablePoints, sr.Evaluated, fmtF(ws.F), where(rep.Stability.Worst), ws.MinModuloRotation, u, sr.Tolerance, u))
	}
	we := sr.WorstEllipticity
	a, b := we.EllipticityA, we.EllipticityB
	rep.Ellipticity.Criterion = ellipticityCriterion
	rep.Ellipticity.FailingPoints = sr.NonEllipticPoints
	rep.Ellipticity.Worst, rep.Ellipticity.WorstReason = worstPoint(we, we.MinEllipticity, inside)
	// A scan that resolved no point tested nothing: that is no pass
	// (audit 2026-12-05, a fib-quad-only card read "4. Strong
	// ellipticity pass" with no stiffness at any of its 3249 points).
	rep.Ellipticity.Passed = sr.NonEllipticPoints == 0 && rep.Ellipticity.Worst != nil
	if rep.Ellipticity.Worst != nil {
		rep.Ellipticity.Worst.A, rep.Ellipticity.Worst.B = &a, &b
	}
	if sr.NonEllipticPoints > 0 {
		rep.Failures = append(rep.Failures, fmt.Sprintf("strong ellipticity fails at %d of %d grid points; worst at F = %s%s: "+
			"(a x b):A:(a x b) = %.4g %s with a = (%.4f, %.4f), b = (%.4f, %.4f)",
			sr.NonEllipticPoints, sr.Evaluated, fmtF(we.F), where(rep.Ellipticity.Worst), we.MinEllipticity, u, a[0], a[1], b[0], b[1]))
	}
}

// stiffnessCause names the likely cause of missing stiffness from what the
// card holds, so that it never blames a kind of term the card lacks. mod,
// when not nil, holds the card's small-strain moduli, and shear says
// whether in-plane shear is among the modes without stiffness; the grid
// scan passes nil.
func stiffnessCause(m *aniso.Model, mod *aniso.Moduli, shear bool) string {
	oneSided := hasOneSidedTerm(m)
	if m.MatrixWeight() == 0 {
		s := "the card has no matrix term with a positive weight (no isotropic I1, I2 or principal-stretch term, no Fung-type term)"
		if oneSided {
			s += "; its fibre terms carry load only while their family is stretched"
		}
		return s
	}
	var causes []string
	// Only where the isotropic terms give no shear modulus can a
	// Fung-type term's own form decide; mu0 > 0 stiffens every mode.
	if mod != nil && mod.InitialShear <= 0 {
		for i, t := range m.Terms {
			if t.Shape.Arg != terms.Green || t.Weight <= 0 || len(t.Params) < 4 {
				continue
			}
			b1, b2, b3, b4 := t.Params[0], t.Params[1], t.Params[2], t.Params[3]
			id := t.Shape.ID
			if shear && b4 <= 0 {
				causes = append(causes, fmt.Sprintf("term %d (%s) has b4 = %g, so it resists no in-plane shear (planar biaxial data without shear do not determine b4), "+
					"and no isotropic term adds shear stiffness (mu0 = 0)", i+1, id, b4))
			}
			normal := b1 <= 0 || b2 <= 0 || b1*b2 <= b3*b3
			if normal {
				causes = append(causes, fmt.Sprintf("term %d (%s) has b1 = %g, b2 = %g, b1 b2 - b3² = %g: its quadratic form is not positive definite in the normal strains, "+
					"and no isotropic term adds stiffness (mu0 = 0)", i+1, id, b1, b2, b1*b2-b3*b3))
			}
			// The generalised form's couplings of normal and shear strain
			// can make the whole form indefinite on their own.
			if c, ok := t.Shape.ConvexityCondition(t.Params, shear); ok && len(t.Params) == 6 && shear && b4 > 0 && !normal && !c.Holds {
				causes = append(causes, fmt.Sprintf("term %d (%s): %s, so its quadratic form is not positive definite once shear couples to the normal strains, "+
					"and no isotropic term adds stiffness (mu0 = 0)", i+1, id, c.Detail))
			}
		}
		if !m.HasGreenTerm() {
			s := "the matrix terms have no initial shear modulus (mu0 = 0), so at F = I "
			if oneSided {
				s += "only fibre terms, on their tension side, give stiffness"
			} else {
				s += "the card has no stiffness"
			}
			causes = append(causes, s)
		}
	}
	switch {
	case len(causes) > 0:
		return strings.Join(causes, "; ")
	case oneSided:
		return "the matrix terms are too soft to be resolved next to the fibre terms"
	}
	return "the small-strain stiffness of the card's terms, all acting on both sides of F = I, has a zero or negative eigenvalue in that mode"
}

// hasOneSidedTerm reports whether m has an active fibre, I5 or cofactor
// term, the kinds that stiffen one side of F = I only.
func hasOneSidedTerm(m *aniso.Model) bool {
	for _, t := range m.Terms {
		switch t.Shape.Arg {
		case terms.Fibre, terms.Fifth, terms.Cofactor:
			if t.Weight > 0 {
				return true
			}
		}
	}
	return false
}

// checkAlternatives warns that the card's fibre layout is undetermined,
// naming the alternatives, and scans each one that is not the card's own
// model on the same grid: a failure of any of them fails the check, as an
// FE analyst may choose it.
func checkAlternatives(rep *CheckReport, alts []card.Alternative, g aniso.StabilityGrid) error {
	if len(alts) == 0 {
		return nil
	}
	var parts []string
	for _, a := range alts {
		ca := checkAlternative{Name: a.Name, Title: a.Title, AsCard: a.AsCard, Passed: true}
		t := a.Name + " (" + a.Title
		if a.AsCard {
			ca.Passed = rep.Stability.Passed && rep.Ellipticity.Passed
			ca.UnstablePoints, ca.NonEllipticPoints, ca.NoStiffnessPoints = rep.Stability.FailingPoints, rep.Ellipticity.FailingPoints, rep.Stability.NoStiffnessPoints
			t += ", as the card"
		} else {
			sr, err := a.Model.CheckStability(g)
			if err != nil {
				return fmt.Errorf("alternative %s: %v", a.Name, err)
			}
			ca.Passed = sr.Stable()
			ca.UnstablePoints, ca.NonEllipticPoints, ca.NoStiffnessPoints = sr.UnstablePoints, sr.NonEllipticPoints, sr.NoStiffness
			if !ca.Passed {
				rep.Failures = append(rep.Failures, fmt.Sprintf("alternative %s (%s) fails on the grid: %d points unstable, %d not strongly elliptic, %d without stiffness",
					a.Name, a.Title, sr.UnstablePoints, sr.NonEllipticPoints, sr.NoStiffness))
			}
		}
		rep.Alternatives = append(rep.Alternatives, ca)
		parts = append(parts, t+")")
	}
	rep.Warnings = append(rep.Warnings, "the data do not determine the fibre layout; these models fit them equally and differ wherever the sheet shears: "+
		strings.Join(parts, "; ")+". The checks above are of the card's own model; each alternative was also scanned for stability and ellipticity (alternatives). Choose by independent knowledge of the fibre directions, or run every one (see the card's alternatives section)")
	return nil
}

// checkPolyconvexity reports which terms keep the energy polyconvex, the
// convexity condition of a term that has one, and the jump of a dispersed
// family's fibre terms at the I4 > 1 switch.
func checkPolyconvexity(rep *CheckReport, m *aniso.Model, g aniso.StabilityGrid, names []string) {
	rep.Polyconvexity.AllTerms = true
	rep.Polyconvexity.Terms = []checkTerm{}
	dispersedWarned := map[int]bool{}
	for i, t := range m.Terms {
		ct := checkTerm{Term: i + 1, ID: t.Shape.ID, Polyconvex: m.TermPolyconvex(i), Note: t.Shape.PolyconvexNote}
		if t.Family >= 0 {
			ct.Family = names[t.Family]
		}
		if t.Shape.Polyconvex && !ct.Polyconvex {
			// A fibre term on a dispersed family: the family's warning
			// below says why.
			ct.Note = fmt.Sprintf("not polyconvex on family %s, whose dispersion kappa = %g makes the I4 > 1 switch a jump", ct.Family, m.Families[t.Family].Dispersion)
			if t.Weight > 0 {
				rep.Polyconvexity.AllTerms = false
			}
		}
		cc, hasCondition := t.Shape.ConvexityCondition(t.Params, g.ShearMax > 0)
		if hasCondition {
			ct.Convexity = &checkConvexity{Condition: cc.Condition, Holds: cc.Holds, Detail: cc.Detail}
		}
		rep.Polyconvexity.Terms = append(rep.Polyconvexity.Terms, ct)
		if !t.Shape.Polyconvex && t.Weight > 0 {
			rep.Polyconvexity.AllTerms = false
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("term %d (%s): %s", i+1, t.Shape.ID, t.Shape.PolyconvexNote))
		}
		if hasCondition && !cc.Holds && t.Weight > 0 {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("term %d (%s): its convexity condition does not hold: %s (%s)", i+1, t.Shape.ID, cc.Condition, cc.Detail))
		}
		if t.Shape.Arg == terms.Fibre && t.Weight > 0 && t.Family >= 0 {
			if k := m.Families[t.Family].Dispersion; k > 0 && !dispersedWarned[t.Family] {
				dispersedWarned[t.Family] = true
				rep.Warnings = append(rep.Warnings, fmt.Sprintf("family %s has dispersion kappa = %g with the I4 > 1 switch: where I4 crosses 1 while I1 > 3, "+
					"E_f = kappa (I1 - 3) > 0 and the energy and stress of its fibre terms jump; polyconvexity does not hold across the switch "+
					"(the tangent on either side is what the grid tests)", names[t.Family], k))
			}
		}
	}
}

// checkModuli reports the small-strain moduli at F = I along the axes and
// each fibre, with the one-sided terms engaged in tension and compression.
func checkModuli(rep *CheckReport, m *aniso.Model, names []string) error {
	dirs := []float64{0, 90}
	labels := []string{"axis 1", "axis 2"}
	for i, f := range m.Families {
		dirs = append(dirs, aniso.WrapDeg(aniso.Deg(f.Angle)))
		labels = append(labels, "fibre "+names[i])
	}
	mod, err := m.SmallStrainModuli(dirs)
	if err != nil {
		return err
	}
	rep.Moduli.InitialShear, rep.Moduli.ShearPositive, rep.Moduli.ShearNegative = card.Num(mod.InitialShear), card.Num(mod.ShearPositive), card.Num(mod.ShearNegative)
	termNames := func(idx []int) []string {
		out := []string{}
		for _, i := range idx {
			s := fmt.Sprintf("%d:%s", i+1, m.Terms[i].Shape.ID)
			if f := m.Terms[i].Family; f >= 0 {
				s += "@" + names[f]
			}
			out = append(out, s)
		}
		return out
	}
	// A zero (or undefined) modulus means no small-strain stiffness in
	// that mode: an FE model at rest or slightly loaded that way is
	// singular. A negative one (a form that is not positive definite) is
	// no stiffness either, and its value is given.
	var zero []string
	positive := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	mode := func(name string, v float64) string {
		if v < 0 {
			return fmt.Sprintf("%s (modulus %.4g)", name, v)
		}
		return name + " (modulus 0)"
	}
	shear := !positive(mod.ShearPositive) || !positive(mod.ShearNegative)
	if shear {
		zero = append(zero, mode("in-plane shear", math.Min(mod.ShearPositive, mod.ShearNegative)))
	}
	for i, y := range mod.Young {
		rep.Moduli.Young = append(rep.Moduli.Young, checkModulus{Direction: labels[i], AngleDeg: y.AngleDeg, Tension: card.Num(y.Tension), Compression: card.Num(y.Compression),
			TensionTerms: termNames(y.TensionTerms), CompressionTerms: termNames(y.CompressionTerms)})
		if !positive(y.Tension) {
			zero = append(zero, mode("tension along "+labels[i], y.Tension))
		}
		if !positive(y.Compression) {
			zero = append(zero, mode("compression along "+labels[i], y.Compression))
		}
	}
	if len(zero) > 0 {
		rep.NoStiffness = true
		rep.Failures = append(rep.Failures, fmt.Sprintf("no small-strain stiffness at F = I in %s: likely cause: %s", strings.Join(zero, ", "), stiffnessCause(m, &mod, shear)))
	}
	rep.Moduli.Note = "linearised plane-stress response at F = I in " + rep.StressUnit + ": uniaxial moduli for a small uniaxial stress along the direction " +
		"with the other in-plane stresses zero; fibre and I5 terms engage only while their family stretches (I4 > 1) and cofactor terms " +
		"only while K > 1, each adding its stiffness w f''(0) grad x (x) grad x on one side only, so tension and compression differ; the engaged terms are listed; " +
		"0 means no small-strain stiffness"
	if mod.InitialShear <= 0 && !m.HasGreenTerm() {
		rep.Warnings = append(rep.Warnings, "the isotropic terms give no initial shear modulus: at small strain the membrane relies on fibres alone or has no stiffness")
	}
	if m.HasGreenTerm() {
		rep.Moduli.Note += "; a Fung-type term (Tong & Fung 1976) acts on both sides and is anisotropic in the tester's axes: it adds to every modulus but not to the isotropic initial shear modulus mu0"
	}
	return nil
}

// gridExtrapolation warns where the grid extends beyond the data range.
func gridExtrapolation(dr *card.DataRange, m *aniso.Model, g aniso.StabilityGrid, names []string) []string {
	var out []string
	beyond := func(name string, lo, hi float64, r card.Interval) {
		if r.Outside(lo, hi) {
			out = append(out, fmt.Sprintf("the grid's %s [%.4g, %.4g] extends beyond the fitted data's [%.4g, %.4g]: there the checks test the formula, not a model supported by data", name, lo, hi, r[0], r[1]))
		}
	}
	beyond("stretch 1 (F11)", g.StretchMin, g.StretchMax, dr.Stretch1)
	beyond("stretch 2 (F22)", g.StretchMin, g.StretchMax, dr.Stretch2)
	f12, f21 := dr.ShearRanges()
	beyond("shear F12", -g.ShearMax, g.ShearMax, f12)
	beyond("shear F21", -g.ShearMax, g.ShearMax, f21)
	if dr.HasFibreStretch(m) && len(m.Families) > 0 {
		for i, span := range card.FibreStretchSpans(m, g.Points()) {
			beyond("fibre stretch of "+names[i], span[0], span[1], dr.FibreStretch[i])
		}
	}
	return out
}

func passText(ok bool) string {
	if ok {
		return "pass"
	}
	return "FAIL"
}

// PrintCheck writes the check report r as text, one numbered check a
// line with its criterion, then the warnings, notices and the result.
func PrintCheck(w io.Writer, r *CheckReport) {
	u := r.StressUnit
	fmt.Fprintf(w, "weft check of %s (stresses and moduli in %s)\n\n", r.Model, u)
	printCautions(w, r.Cautions)
	fmt.Fprintln(w)
	fmt.Fprintf(w, "1. Stress-free reference          %s  max |sigma(I)| = %.3g %s (tolerance %.3g %s)\n", passText(r.Reference.Passed), r.Reference.MaxAbsCauchy, u, r.Reference.Tolerance, u)
	poly := "all terms polyconvex"
	if !r.Polyconvexity.AllTerms {
		poly = "NOT all terms polyconvex (warning)"
	}
	fmt.Fprintf(w, "2. Polyconvexity of the terms     %s\n", poly)
	for _, t := range r.Polyconvexity.Terms {
		fam := ""
		if t.Family != "" {
			fam = "@" + t.Family
		}
		yes := "yes"
		if !t.Polyconvex {
			yes = "NO "
		}
		fmt.Fprintf(w, "     %2d %-14s %s  %s\n", t.Term, t.ID+fam, yes, t.Note)
		if c := t.Convexity; c != nil {
			verdict := "holds"
			if !c.Holds {
				verdict = "DOES NOT HOLD (warning)"
			}
			fmt.Fprintf(w, "        convexity condition %s: %s; %s\n", verdict, c.Condition, c.Detail)
		}
	}
	g := r.Grid
	fmt.Fprintf(w, "   Grid: lambda1, lambda2 in [%g, %g], %d per axis; shear: %s; %d points, %d evaluated; tolerance %.3g %s\n",
		g.StretchMin, g.StretchMax, g.Steps, g.Shears, g.Points, g.Evaluated, g.Tolerance, u)
	s := r.Stability
	fmt.Fprintf(w, "3. Material stability             %s  %d failing points; %s\n", passText(s.Passed), s.FailingPoints, worstText(s.Worst, s.WorstReason, "smallest eigenvalue", u))
	fmt.Fprintf(w, "     criterion: %s\n", s.Criterion)
	if s.NoStiffnessPoints > 0 {
		fmt.Fprintf(w, "     %d points WITHOUT STIFFNESS (first at F = %s): the tangent is zero there or has no resolvable positive stiffness\n", s.NoStiffnessPoints, fmtF(*s.FirstNoStiffness))
	}
	fmt.Fprintf(w, "     the full 4x4 tangent is not positive definite (indefinite or singular) at %d points (%d of them resolved with both principal stresses > 0)\n", s.FullIndefinite, s.FullIndefiniteTensile)
	if s.Unresolved > 0 {
		fmt.Fprintf(w, "     %d points not resolved: an eigenvalue lies within %g of the tangent's largest entry of zero (round-off, where exponential terms make the tangent huge); they are neither passed nor failed\n", s.Unresolved, aniso.RelativeResolution)
	}
	e := r.Ellipticity
	fmt.Fprintf(w, "4. Strong ellipticity             %s  %d failing points; %s\n", passText(e.Passed), e.FailingPoints, worstText(e.Worst, e.WorstReason, "smallest (a x b):A:(a x b)", u))
	fmt.Fprintf(w, "     criterion: %s\n", e.Criterion)
	mo := r.Moduli
	fmt.Fprintf(w, "5. Small-strain moduli [%s]      initial shear modulus mu0 = %.6g; in-plane shear modulus G12 = %.6g (positive shear), %.6g (negative)\n",
		u, mo.InitialShear, mo.ShearPositive, mo.ShearNegative)
	fmt.Fprintf(w, "     %-12s %10s %12s %14s  %s\n", "direction", "angle", "E tension", "E compression", "one-sided terms engaged (tension | compression)")
	for _, y := range mo.Young {
		fmt.Fprintf(w, "     %-12s %10.6g %12.6g %14.6g  %s | %s\n", y.Direction, y.AngleDeg, float64(y.Tension), float64(y.Compression), listOrDash(y.TensionTerms), listOrDash(y.CompressionTerms))
	}
	fmt.Fprintf(w, "     %s\n", mo.Note)
	if r.DataRange != nil {
		d := r.DataRange
		f12, f21 := d.ShearRanges()
		fmt.Fprintf(w, "6. Fitted data range              stretch 1 [%g, %g], stretch 2 [%g, %g], F12 [%g, %g], F21 [%g, %g]\n", d.Stretch1[0], d.Stretch1[1], d.Stretch2[0], d.Stretch2[1], f12[0], f12[1], f21[0], f21[1])
	} else {
		fmt.Fprintln(w, "6. Fitted data range              not in the card")
	}
	if len(r.Alternatives) > 0 {
		fmt.Fprintln(w, "7. Alternatives (the data do not determine the fibre layout; each scanned on the grid)")
		for _, a := range r.Alternatives {
			card := ""
			if a.AsCard {
				card = ", the card's own model"
			}
			fmt.Fprintf(w, "     %-14s %s  %s%s: %d unstable, %d not elliptic, %d without stiffness\n", a.Name, passText(a.Passed), a.Title, card, a.UnstablePoints, a.NonEllipticPoints, a.NoStiffnessPoints)
		}
	}
	for _, s := range r.Warnings {
		fmt.Fprintln(w, "\nWARNING: "+s)
	}
	for _, s := range r.Notices {
		fmt.Fprintln(w, "\nNotice: "+s)
	}
	fmt.Fprintln(w)
	if r.Passed {
		fmt.Fprintln(w, passedResult(r))
	} else {
		fmt.Fprintln(w, "Result: FAILED")
		for _, f := range r.Failures {
			fmt.Fprintln(w, "  - "+f)
		}
	}
}

// passedResult is the result line of a check that passed. Grid points
// that could not be evaluated and points whose eigenvalue is round-off
// (Unresolved: neither passed nor failed) are named, so that the line
// does not claim a pass the scan could not decide; the fit report counts
// them apart the same way ("passes on 3248 of 3249 points; 1 unresolved").
func passedResult(r *CheckReport) string {
	g, u := r.Grid, r.Stability.Unresolved
	switch {
	case u > 0:
		s := fmt.Sprintf("Result: every check passed on %d of %d grid points; %d not resolved (round-off, neither passed nor failed)", g.Evaluated-u, g.Points, u)
		if g.Evaluated < g.Points {
			s += fmt.Sprintf(", %d could not be evaluated", g.Points-g.Evaluated)
		}
		return s + "."
	case g.Evaluated < g.Points:
		return fmt.Sprintf("Result: every check passed on the %d of %d grid points that could be evaluated.", g.Evaluated, g.Points)
	}
	return "Result: every check passed."
}

// worstText describes a criterion's worst point, or why there is none.
func worstText(p *checkPoint, reason, what, u string) string {
	if p == nil {
		return reason
	}
	return fmt.Sprintf("%s %.4g %s at F = %s", what, float64(p.Value), u, fmtF(p.F))
}

func listOrDash(s []string) string {
	if len(s) == 0 {
		return "-"
	}
	return strings.Join(s, ", ")
}
