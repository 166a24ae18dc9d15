package fe

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// The UFL export: the card's strain energy Ψ(F) as a Python function of a
// three-dimensional deformation gradient in UFL (the form language of the
// FEniCS project), so that a finite-element code built on it can use the
// card with automatic differentiation.
//
// Conventions it keeps: the energy is the card's, term by term, with every
// number at full double precision; fibre and I5 terms switch on while
// I4 > 1 and cofactor terms while K > 1 (ufl.conditional, strict
// inequalities as in weft, so exactly at the switch a term is off); the
// dispersion κ enters E_f = κ(I1 − 3) + (1 − 3κ)(I4 − 1).
//
// In-plane dispersion. weft integrates over directions with panels whose
// ends depend on the deformation in ways UFL cannot follow (their number
// changes with the steepness of the integrand). The export uses a scheme of
// fixed structure with the same ingredients: in u = 2θ − φ, where
// I4(θ) − 1 = A0 + R cos u, the stretched arc is |u| < h with
// h = acos(−A0/R) in closed form; the arcs where the argument passes a
// kink of a shape (the ends of a recruitment range) split it further; and
// each piece is integrated by composite 16-point Gauss–Legendre with a
// number of panels fixed at export time from the concentration and the
// steepness of the card's shapes. Every end is a smooth function of C, so
// automatic differentiation differentiates through it; the terms from the
// moving ends vanish analytically (f(0) = f′(0) = 0) and numerically to
// the quadrature's accuracy. Where the arc is the whole circle less a
// sliver (A0 ≥ (1 − 10⁻⁶)R) the scheme takes the whole circle and zeroes
// the integrand where I4(θ) ≤ 1; where it is a sliver (A0 + R ≤ 10⁻⁶R) the
// family contributes nothing; both neglect at most (10⁻⁶R)² × 10⁻³ of the
// energy. The arc of a kink is treated alike (whole circle or none within
// 10⁻⁶R of those), since its end moves as 1/√(1 − v²) near them, which
// magnifies the quadrature error of the cancelling moving-end terms in the
// derivatives: a verification row whose largest fibre strain is a kink
// (a recruitment range ending at λ = 1.15) needs it. Near an equibiaxial state (R < 10⁻⁶, where φ is not defined)
// the family's energy is its expansion to second order in the deviation of
// C from an equibiaxial state, with the density's moments in closed form.
// The panels (16-point Gauss–Legendre, at most 5/√(b + steep + 1) wide over
// the whole circle) were chosen to meet 1e-13 of the energy at the
// verification rows; the tests compare the stresses with weft at every
// verification row to 1e-10 of the stress scale.
//
// Principal-stretch terms need the eigenvalues of C. The export takes
// those of the in-plane block C[0:2, 0:2] and C33, exact for
// F = [[F11, F12, 0], [F21, F22, 0], [0, 0, F33]] (a sheet in the 1–2
// plane, as in the card), and writes the sum over the in-plane pair as a
// symmetric function of m = (C11 + C22)/2 and q = ((C11 − C22)/2)² + C12²:
// (m + √q)^a + (m − √q)^a, replaced by its binomial series in q/m² below
// q/m² = 10⁻⁶, so that automatic differentiation stays finite where the
// two eigenvalues meet (every equibiaxial state).

// uflFormat is the version of the UFL export.
const uflFormat = "weft.ufl/1"

// uflPanels is the number of 16-point Gauss–Legendre panels over the whole
// circle of u of the in-plane quadrature, for a family of concentration b
// whose shapes have the scaled log-slope steep (x f″/f′) at the largest
// fibre strain of the verification table: panels at most 5/√(b + steep + 1)
// wide, the width that meets 1e-13 of the energy at the verification rows
// for concentrations from 3 to 200 (measured on the rows of a family at 35°
// with one exponential fibre shape), and at least 2.
func uflPanels(b, steep float64) int {
	return max(2, int(math.Ceil(2*math.Pi*math.Sqrt(math.Min(b, 1e6)+steep+1)/5)))
}

// uflSteepStrain is the largest fibre strain I4 − 1 of the verification
// table (a uniaxial or strip stretch of 1.3): the steepness of the shapes
// there sets the panels of the in-plane quadrature.
const uflSteepStrain = 0.7

// pyNum writes a number for Python at full double precision.
func pyNum(v float64) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	if !strings.ContainsAny(s, ".eEn") { // an integer: keep it a float
		s += ".0"
	}
	return s
}

// pyIdent turns an alternative's name into a Python identifier part.
func pyIdent(s string) string {
	r := strings.NewReplacer("-", "_", "+", "p", " ", "_")
	return r.Replace(s)
}

// uflModel is one model to write: its name in MODELS and the model.
type uflModel struct {
	name, title string
	model       *aniso.Model
}

// WriteExportUFL writes the card's energy as a self-contained Python module
// for UFL: psi(F, bulk_modulus=None, model=...) and the models of the
// card's alternatives, with the cautions, conventions and the notes of d.
func WriteExportUFL(w io.Writer, d *ExportDoc, m *aniso.Model) error {
	var b bytes.Buffer
	models := []uflModel{{name: "card", title: "the card's own model", model: m}}
	if a := d.Alternatives; a != nil {
		models = nil
		for _, am := range a.Models {
			if am.Shown {
				models = append(models, uflModel{name: am.Name, title: am.Title, model: am.model})
			}
		}
	}
	writeUFLHeader(&b, d, models)
	b.WriteString(uflHelpers)
	for _, um := range models {
		if err := writeUFLModel(&b, um, d.StressUnit); err != nil {
			return err
		}
	}
	writeUFLEntry(&b, d, models)
	_, err := w.Write(b.Bytes())
	return err
}

// writeUFLHeader writes the module's comments and docstring.
func writeUFLHeader(b *bytes.Buffer, d *ExportDoc, models []uflModel) {
	fmt.Fprintf(b, "# weft export of %s (%s): the strain energy of the card in UFL.\n", d.Model, uflFormat)
	for _, c := range d.Cautions {
		fmt.Fprintf(b, "# CAUTION: %s\n", c)
	}
	for _, s := range d.Warnings {
		fmt.Fprintf(b, "# WARNING: %s\n", s)
	}
	fmt.Fprintf(b, "# Energy: %s\n", d.Energy)
	cv := d.Conventions
	for _, s := range []string{cv.Angle, cv.Kinematics, cv.Invariants, cv.FibreSwitch, cv.Dispersion, cv.InPlane, cv.GreenStrain} {
		fmt.Fprintf(b, "# Convention: %s\n", s)
	}
	b.WriteString(`"""Strain energy of a weft model card for FEniCS (UFL).

psi(F, bulk_modulus=None, model=DEFAULT_MODEL) returns the strain energy per
unit reference volume, in ` + d.StressUnit + ` (the card's stress unit), as a UFL
expression of a 3x3 deformation gradient F (e.g. ufl.variable(ufl.Identity(3)
+ ufl.grad(u))). Axes 1, 2 are the tester's axes of the card, 3 the thickness.

bulk_modulus=None gives the card's energy, that of an incompressible material
(J = det F = 1): use it in a mixed u-p formulation (psi(F) - p*(J - 1)), or in
a plane-stress membrane with F = [[F11, F12, 0], [F21, F22, 0], [0, 0,
1/(F11*F22 - F12*F21)]], where d psi / d F2 of the in-plane block is the
membrane's nominal stress. A number gives the nearly incompressible form of a
volumetric-isochoric split: matrix terms in Ibar1 = J^(-2/3) I1, Ibar2 =
J^(-4/3) I2 and lambdabar_i = J^(-1/3) lambda_i, fibre, cofactor, I5, in-plane
dispersed and Fung-type terms in the invariants of the full C, plus
bulk_modulus/2 (J - 1)^2; SUGGESTED_BULK_MODULUS is 1e3 times the larger
of the card's stress scale (the sum of the weights with a Fung-type term
counted by its small-strain modulus c max|b|) and the largest tangent entry
dP/dF over the verification rows of the terms that depend on C33 (see the
three-dimensional block of 'weft export').

Fibre and I5 terms carry energy only while I4 > 1, cofactor terms while
K > 1 (ufl.conditional; exactly at the switch a term is off, as in weft).
Principal-stretch terms take the eigenvalues of the in-plane block of C and
C33: exact for F = [[F11, F12, 0], [F21, F22, 0], [0, 0, F33]] (the sheet in
the 1-2 plane), not for a general 3-D F; where the two in-plane eigenvalues
meet they are summed through a series, so automatic differentiation stays
finite. In-plane dispersed families are integrated over directions by
composite 16-point Gauss-Legendre between the closed-form ends of the
stretched arc (see the comments of _planar).
`)
	if len(models) > 1 || models[0].name != "card" {
		b.WriteString("\nThe data of this card do not determine its fibre layout; MODELS holds the\nalternatives, which fit the data equally and differ wherever the sheet shears:\n")
		for _, um := range models {
			fmt.Fprintf(b, "  %q: %s\n", um.name, um.title)
		}
	}
	// The docstring, which help(module) shows without the comments above,
	// ends with the same cautions, one paragraph each.
	for _, c := range d.Cautions {
		b.WriteString("\n" + WrapWords(c, 76) + "\n")
	}
	b.WriteString(`"""

import math

import ufl

`)
	fmt.Fprintf(b, "STRESS_UNIT = %q\n", d.StressUnit)
	fmt.Fprintf(b, "SUGGESTED_BULK_MODULUS = %s\n\n", pyNum(d.ThreeD.SuggestedBulkModulus))
}

// writeUFLEntry writes MODELS, DEFAULT_MODEL and psi.
func writeUFLEntry(b *bytes.Buffer, d *ExportDoc, models []uflModel) {
	b.WriteString("\nMODELS = {\n")
	def := models[0].name
	for _, um := range models {
		fmt.Fprintf(b, "    %q: _energy_%s,\n", um.name, pyIdent(um.name))
	}
	if a := d.Alternatives; a != nil {
		for _, am := range a.Models {
			if am.AsCard && am.Shown {
				def = am.Name
			}
		}
	}
	b.WriteString("}\n")
	fmt.Fprintf(b, "DEFAULT_MODEL = %q\n\n\n", def)
	b.WriteString(`def psi(F, bulk_modulus=None, model=DEFAULT_MODEL):
    """Strain energy per unit reference volume (` + d.StressUnit + `) of a 3x3 UFL F; see the module's docstring."""
    if ufl.shape(F) != (3, 3):
        raise ValueError("psi takes a 3x3 deformation gradient, got shape %s" % (ufl.shape(F),))
    return MODELS[model](F, bulk_modulus)
`)
}

// writeUFLModel writes the energy function of one model.
func writeUFLModel(b *bytes.Buffer, um uflModel, unit string) error {
	m := um.model
	fmt.Fprintf(b, "\ndef _energy_%s(F, bulk_modulus):\n", pyIdent(um.name))
	fmt.Fprintf(b, "    %q\n", "Energy of "+um.title+" ("+unit+").")
	b.WriteString(`    # Scalar components: UFL and FFCx handle sums of scalar products far
    # faster than tensor algebra once the energy is differentiated.
    f = [[F[i, j] for j in range(3)] for i in range(3)]
    C = [[f[0][i] * f[0][j] + f[1][i] * f[1][j] + f[2][i] * f[2][j] for j in range(3)] for i in range(3)]
    J = (f[0][0] * (f[1][1] * f[2][2] - f[1][2] * f[2][1]) - f[0][1] * (f[1][0] * f[2][2] - f[1][2] * f[2][0])
         + f[0][2] * (f[1][0] * f[2][1] - f[1][1] * f[2][0]))
    I1 = C[0][0] + C[1][1] + C[2][2]
    I2 = 0.5 * (I1 * I1 - sum(C[i][j] * C[j][i] for i in range(3) for j in range(3)))
    if bulk_modulus is None:
        iso = 1.0
    else:
        iso = J ** (-2.0 / 3.0)
    I1m, I2m = iso * I1, iso * iso * I2
    W = 0.0
`)
	names := familyNames(m)
	for f, fam := range m.Families {
		if fam.Planar {
			continue
		}
		s, c := math.Sincos(fam.Angle)
		fmt.Fprintf(b, "    # family %s at %s deg: a0 = (cos, sin, 0), Ca = C a0\n", names[f], pyNum(aniso.WrapDeg(aniso.Deg(fam.Angle))))
		fmt.Fprintf(b, "    Ca_%d = [C[i][0] * %s + C[i][1] * %s for i in range(3)]\n", f, pyNum(c), pyNum(s))
		fmt.Fprintf(b, "    I4_%d = %s * Ca_%d[0] + %s * Ca_%d[1]\n", f, pyNum(c), f, pyNum(s), f)
		fmt.Fprintf(b, "    I5_%d = Ca_%d[0] * Ca_%d[0] + Ca_%d[1] * Ca_%d[1] + Ca_%d[2] * Ca_%d[2]\n", f, f, f, f, f, f, f)
		fmt.Fprintf(b, "    K_%d = I5_%d - I1 * I4_%d + I2\n", f, f, f)
	}
	for i, t := range m.Terms {
		if t.Family >= 0 && m.Families[t.Family].Planar {
			continue // with its family below
		}
		line, err := uflTerm(i, t, m)
		if err != nil {
			return err
		}
		b.WriteString(line)
	}
	for f, fam := range m.Families {
		if fam.Planar {
			writeUFLPlanar(b, m, f, names[f])
		}
	}
	b.WriteString("    if bulk_modulus is not None:\n        W = W + 0.5 * bulk_modulus * (J - 1.0) ** 2\n    return W\n\n")
	return nil
}

// uflTerm writes one term that is not on an in-plane dispersed family.
func uflTerm(i int, t aniso.Term, m *aniso.Model) (string, error) {
	p := t.Params
	w := pyNum(t.Weight)
	head := fmt.Sprintf("    # term %d: %s, weight %s\n", i+1, t.Shape.ID, w)
	switch t.Shape.Arg {
	case terms.I1, terms.I2:
		x := "(I1m - 3.0)"
		if t.Shape.Arg == terms.I2 {
			x = "(I2m - 3.0)"
		}
		f, err := uflShape(t.Shape, x, p)
		if err != nil {
			return "", err
		}
		return head + fmt.Sprintf("    W = W + %s * %s\n", w, f), nil
	case terms.Principal:
		a := p[0] / 2
		c := binomialSeries(a)
		return head + fmt.Sprintf("    W = W + %s * (2.0 / (%s) ** 2) * (_pair_power_sum(iso * 0.5 * (C[0][0] + C[1][1]), iso * iso * ((0.5 * (C[0][0] - C[1][1])) ** 2 + C[0][1] ** 2), %s, (%s, %s, %s)) + (iso * C[2][2]) ** %s - 3.0)\n",
			w, pyNum(p[0]), pyNum(a), pyNum(c[0]), pyNum(c[1]), pyNum(c[2]), pyNum(a)), nil
	case terms.Green:
		coupling := ""
		if len(p) == 6 {
			coupling = fmt.Sprintf(", %s, %s", pyNum(p[4]), pyNum(p[5]))
		}
		return head + fmt.Sprintf("    W = W + %s * _fung(0.5 * (C[0][0] - 1.0), 0.5 * (C[1][1] - 1.0), 0.5 * C[0][1], %s, %s, %s, %s%s)\n",
			w, pyNum(p[0]), pyNum(p[1]), pyNum(p[2]), pyNum(p[3]), coupling), nil
	case terms.Fibre:
		k := m.Families[t.Family].Dispersion
		x := fmt.Sprintf("(%s * (I1 - 3.0) + %s * (I4_%d - 1.0))", pyNum(k), pyNum(1-3*k), t.Family)
		if k == 0 {
			x = fmt.Sprintf("(I4_%d - 1.0)", t.Family)
		}
		f, err := uflShape(t.Shape, x, p)
		if err != nil {
			return "", err
		}
		return head + fmt.Sprintf("    W = W + ufl.conditional(ufl.gt(I4_%d, 1.0), %s * %s, 0.0)\n", t.Family, w, f), nil
	case terms.Fifth:
		f, err := uflShape(t.Shape, fmt.Sprintf("(I5_%d - 1.0)", t.Family), p)
		if err != nil {
			return "", err
		}
		return head + fmt.Sprintf("    W = W + ufl.conditional(ufl.gt(I4_%d, 1.0), %s * %s, 0.0)\n", t.Family, w, f), nil
	case terms.Cofactor:
		f, err := uflShape(t.Shape, fmt.Sprintf("(K_%d - 1.0)", t.Family), p)
		if err != nil {
			return "", err
		}
		return head + fmt.Sprintf("    W = W + ufl.conditional(ufl.gt(K_%d, 1.0), %s * %s, 0.0)\n", t.Family, w, f), nil
	}
	return "", fmt.Errorf("term %d (%s): no UFL form for its argument %s", i+1, t.Shape.ID, t.Shape.Arg)
}

// uflShape writes f(x) of a catalogue shape with parameters p, x a Python
// expression.
func uflShape(sh *terms.Shape, x string, p []float64) (string, error) {
	switch sh.ID {
	case "i1-lin", "i2-lin":
		return x, nil
	case "i1-quad", "i2-quad", "fib-quad", "i5-quad":
		return x + " ** 2", nil
	case "i1-cube", "i2-cube":
		return x + " ** 3", nil
	case "cof-quad":
		return "_positive_square(" + x + ")", nil
	case "i1-exp", "i2-exp":
		return fmt.Sprintf("_exp(%s, %s)", x, pyNum(p[0])), nil
	case "i1-expsq", "fib-expsq":
		return fmt.Sprintf("_expsq(%s, %s)", x, pyNum(p[0])), nil
	case "fib-exp":
		return fmt.Sprintf("_expzero(%s, %s)", x, pyNum(p[0])), nil
	case "i1-gent", "i2-gent":
		return fmt.Sprintf("_gent(%s, %s)", x, pyNum(p[0])), nil
	case "fib-recruit":
		return fmt.Sprintf("_recruit(%s, %s, %s)", x, pyNum(p[0]), pyNum(p[1])), nil
	}
	return "", fmt.Errorf("term %s: no UFL form", sh.ID)
}

// binomialSeries returns the binomial coefficients C(a, 2), C(a, 4) and
// C(a, 6) of (m + √q)^a + (m − √q)^a = 2 m^a Σ_k C(a, 2k) (q/m²)^k.
func binomialSeries(a float64) [3]float64 {
	var out [3]float64
	c := 1.0
	for n := 1; n <= 6; n++ {
		c *= (a - float64(n-1)) / float64(n)
		if n%2 == 0 {
			out[n/2-1] = c
		}
	}
	return out
}

// writeUFLPlanar writes the terms of in-plane dispersed family f.
func writeUFLPlanar(b *bytes.Buffer, m *aniso.Model, f int, name string) {
	fam := m.Families[f]
	var kinks []float64
	steep := 0.0
	fmt.Fprintf(b, "    # family %s: in-plane dispersion about %s deg, concentration b = %s\n", name, pyNum(aniso.WrapDeg(aniso.Deg(fam.Angle))), pyNum(fam.Concentration))
	fmt.Fprintf(b, "    def shapes_%d(x):\n        s = 0.0\n", f)
	for i, t := range m.Terms {
		if t.Family != f {
			continue
		}
		fx, _ := uflShape(t.Shape, "x", t.Params)
		fmt.Fprintf(b, "        s = s + %s * %s  # term %d: %s\n", pyNum(t.Weight), fx, i+1, t.Shape.ID)
		k, n := t.Shape.Kinks(t.Params)
		kinks = append(kinks, k[:n]...)
		if v := t.Shape.Eval(uflSteepStrain, t.Params); v.D1 > 0 && !math.IsInf(v.D2, 0) {
			steep = math.Max(steep, v.D2/v.D1*uflSteepStrain)
		}
	}
	b.WriteString("        return s\n")
	panels := uflPanels(fam.Concentration, steep)
	var ks []string
	for _, k := range sortedUnique(kinks) {
		ks = append(ks, pyNum(k))
	}
	factor, r := aniso.PlanarDensity(fam.Concentration)
	fmt.Fprintf(b, "    W = W + _planar(C, %s, %s, %s, %s, shapes_%d, (%s), %d)\n", pyNum(fam.Angle), pyNum(fam.Concentration),
		pyNum(factor), pyNum(r), f, strings.Join(append(ks, ""), ", "), panels)
}

// sortedUnique returns the values in increasing order without repeats.
func sortedUnique(v []float64) []float64 {
	out := append([]float64(nil), v...)
	sort.Float64s(out)
	k := 0
	for i, x := range out {
		if i == 0 || x != out[k-1] {
			out[k] = x
			k++
		}
	}
	return out[:k]
}

// gaussLegendre16 returns the 16-point Gauss–Legendre nodes and weights on
// [−1, 1] (gonum).
func gaussLegendre16() (x, w []float64) {
	x, w = make([]float64, 16), make([]float64, 16)
	quad.Legendre{}.FixedLocations(x, w, -1, 1)
	return x, w
}

// uflHelpers are the shapes and the quadrature, the same in every export.
var uflHelpers = func() string {
	x, w := gaussLegendre16()
	var xs, ws []string
	for i := range x {
		xs = append(xs, pyNum(x[i]))
		ws = append(ws, pyNum(w[i]))
	}
	return `
# 16-point Gauss-Legendre nodes and weights on [-1, 1].
_GL_X = (` + strings.Join(xs, ", ") + `)
_GL_W = (` + strings.Join(ws, ", ") + `)


def _positive_square(x):
    """<x>^2: zero while x <= 0."""
    return ufl.conditional(ufl.gt(x, 0.0), x * x, 0.0)


def _exp(x, b):
    """(exp(b x) - 1)/b, its series where |b x| < 1e-4 (no cancellation); x at b = 0."""
    if b == 0.0:
        return x
    bx = b * x
    series = x * (1.0 + bx / 2.0 + bx * bx / 6.0 + bx * bx * bx / 24.0)
    return ufl.conditional(ufl.lt(abs(bx), 1e-4), series, (ufl.exp(bx) - 1.0) / b)


def _expsq(x, b):
    """(exp(b x^2) - 1)/(2 b), its series where b x^2 < 1e-4; x^2/2 at b = 0."""
    x2 = x * x
    if b == 0.0:
        return x2 / 2.0
    bx2 = b * x2
    series = x2 / 2.0 * (1.0 + bx2 / 2.0 + bx2 * bx2 / 6.0 + bx2 * bx2 * bx2 / 24.0)
    return ufl.conditional(ufl.lt(bx2, 1e-4), series, (ufl.exp(bx2) - 1.0) / (2.0 * b))


def _expzero(x, b):
    """(exp(b x) - 1 - b x)/b^2, its series where |b x| < 1e-4; x^2/2 at b = 0."""
    x2 = x * x
    if b == 0.0:
        return x2 / 2.0
    bx = b * x
    series = x2 / 2.0 + b * x2 * x / 6.0 + b * b * x2 * x2 / 24.0 + b * b * b * x2 * x2 * x / 120.0
    return ufl.conditional(ufl.lt(abs(bx), 1e-4), series, (ufl.exp(bx) - 1.0 - bx) / (b * b))


def _gent(x, J):
    """-J ln(1 - x/J) (Gent 1996)."""
    return -J * ufl.ln(1.0 - x / J)


def _recruit(x, la, d):
    """Uniform recruitment of straight fibres (Lanir 1983) per unit fibre modulus,
    in the fibre stretch l = sqrt(1 + x): (1/d) int from la to min(max(l, la), la + d)
    of (l - s)^2/(2 s) ds; d = 0: <l - la>^2/(2 la)."""
    l = ufl.sqrt(1.0 + x)
    if d == 0.0:
        return ufl.conditional(ufl.gt(l, la), (l - la) ** 2 / (2.0 * la), 0.0)
    u = ufl.min_value(ufl.max_value(l, la), la + d)
    return (l * l * ufl.ln(u / la) - 2.0 * l * (u - la) + (u * u - la * la) / 2.0) / (2.0 * d)


def _fung(E11, E22, E12, b1, b2, b3, b4, b5=0.0, b6=0.0):
    """(exp(Q) - 1)/2 of the Green strain in the tester's axes (Tong & Fung 1976;
    b5, b6 couple the normal strains to the shear, as in fung-general),
    its series where |Q| < 1e-4."""
    Q = b1 * E11 * E11 + b2 * E22 * E22 + 2.0 * b3 * E11 * E22 + 2.0 * b4 * E12 * E12 + 4.0 * E12 * (b5 * E11 + b6 * E22)
    series = Q / 2.0 + Q * Q / 4.0 + Q * Q * Q / 12.0 + Q * Q * Q * Q / 48.0
    return ufl.conditional(ufl.lt(abs(Q), 1e-4), series, (ufl.exp(Q) - 1.0) / 2.0)


def _pair_power_sum(m, q, a, coef):
    """(m + sqrt(q))^a + (m - sqrt(q))^a, the sum over the two in-plane
    eigenvalues m +- sqrt(q) of C raised to a = alpha/2. Below q/m^2 = 1e-6
    it is the binomial series 2 m^a (1 + C(a,2) z + C(a,4) z^2 + C(a,6) z^3),
    z = q/m^2 (error below 1e-24), so that its derivatives stay finite where
    the eigenvalues meet."""
    z = q / (m * m)
    near = ufl.le(z, 1e-6)
    series = 2.0 * m ** a * (1.0 + coef[0] * z + coef[1] * z * z + coef[2] * z * z * z)
    r = ufl.sqrt(ufl.conditional(near, 1.0, q))
    return ufl.conditional(near, series, (m + r) ** a + (m - r) ** a)


def _gauss(lo, hi, panels, g):
    """Composite 16-point Gauss-Legendre of g over [lo, hi] in equal panels."""
    total = 0.0
    width = (hi - lo) / panels
    for p in range(panels):
        a = lo + p * width
        for x, w in zip(_GL_X, _GL_W):
            total = total + 0.5 * width * w * g(a + 0.5 * width * (1.0 + x))
    return total


def _planar(C, alpha, b, factor, r1, shapes, kinks, panels):
    """Energy of an in-plane dispersed family: the integral over the stretched
    directions theta of rho(theta) shapes(I4(theta) - 1), rho = factor *
    exp(b (cos 2(theta - alpha) - 1)), a0(theta) = (cos theta, sin theta, 0);
    r1 = I1(b)/I0(b) is the density's mean of cos 2(theta - alpha).

    I4(theta) - 1 = A0 + Rc cos 2theta + Rs sin 2theta = A0 + R cos u with
    u = 2 theta - phi: the stretched arc is |u| < h, h = acos(-A0/R), and the
    kinks of the shapes (levels x = k) bound the inner arcs |u| < acos((k -
    A0)/R); each piece is integrated by composite 16-point Gauss-Legendre
    (d theta = du/2), the innermost with "panels" panels, the others (at
    most half the circle each) with half as many. Where A0 >= (1 - 1e-6) R
    the arc is the whole circle (less a sliver where the integrand is
    zeroed), where A0 + R <= 1e-6 R it is empty. Where R < 1e-6 (an
    equibiaxial state or next to one; phi is undefined there) the integral
    is its expansion to second order in (Rc, Rs) about A0, f(A0) + f'(A0)
    <Rc cos 2theta + Rs sin 2theta> + f''(A0)/2 <(Rc cos 2theta + Rs sin
    2theta)^2>, with the density's moments in closed form (I2/I0 = 1 - 2
    r1/b), when A0 > 0, and zero otherwise: exact to O(R^3) where every
    direction is stretched, and off by at most the energy of a strain of
    1e-6 where only some are."""
    A0 = 0.5 * (C[0][0] + C[1][1]) - 1.0
    Rc = 0.5 * (C[0][0] - C[1][1])
    Rs = C[0][1]
    R2 = Rc * Rc + Rs * Rs
    ca, sa = math.cos(2.0 * alpha), math.sin(2.0 * alpha)

    def stretched(x):
        return ufl.conditional(ufl.gt(x, 0.0), shapes(x), 0.0)

    # Second-order expansion about an equibiaxial state.
    r2 = 1.0 - 2.0 * r1 / b if b > 0.0 else 0.0
    c4, s4 = math.cos(4.0 * alpha), math.sin(4.0 * alpha)
    v = ufl.variable(A0)
    f0 = shapes(v)
    f1 = ufl.diff(f0, v)
    f2 = ufl.diff(f1, v)
    mean1 = r1 * (ca * Rc + sa * Rs)
    mean2 = 0.5 * (Rc * Rc * (1.0 + c4 * r2) + 2.0 * Rc * Rs * s4 * r2 + Rs * Rs * (1.0 - c4 * r2))
    near = ufl.conditional(ufl.gt(A0, 0.0), f0 + f1 * mean1 + 0.5 * f2 * mean2, 0.0)

    big = ufl.gt(R2, 1e-12)
    R = ufl.sqrt(ufl.conditional(big, R2, 1.0))
    cphi, sphi = Rc / R, Rs / R

    def by_u(u):
        cu, su = ufl.cos(u), ufl.sin(u)
        c2 = cu * cphi - su * sphi
        s2 = su * cphi + cu * sphi
        rho = factor * ufl.exp(b * (ca * c2 + sa * s2 - 1.0))
        return 0.5 * rho * stretched(A0 + R * cu)

    def half_width(level, eta):
        v = (level - A0) / R
        return ufl.conditional(ufl.le(v, -1.0 + eta), math.pi,
                               ufl.conditional(ufl.ge(v, 1.0 - eta), 0.0,
                                               ufl.acos(ufl.max_value(ufl.min_value(v, 1.0), -1.0))))

    # A kink arc within 1e-6 of the whole circle or of a point is taken as
    # one: its end moves as 1/sqrt(1 - v^2) there, which would magnify the
    # quadrature's error in the cancelling moving-end terms.
    ends = [half_width(0.0, 1e-6)] + [half_width(k, 1e-6) for k in kinks]
    side = max(1, (panels + 1) // 2)
    arc = 0.0
    for i, h in enumerate(ends):
        if i + 1 < len(ends):
            inner = ends[i + 1]
            arc = arc + _gauss(-h, -inner, side, by_u) + _gauss(inner, h, side, by_u)
        else:
            arc = arc + _gauss(-h, h, panels, by_u)
    return ufl.conditional(big, arc, near)
`
}()

// WrapWords breaks s at spaces into lines of at most width runes; a longer
// word stands on its own line. The UFL docstring and the command-line help
// wrap the cautions with it.
func WrapWords(s string, width int) string {
	var b strings.Builder
	n := 0
	for _, w := range strings.Fields(s) {
		l := len([]rune(w))
		if n > 0 && n+1+l > width {
			b.WriteByte('\n')
			n = 0
		} else if n > 0 {
			b.WriteByte(' ')
			n++
		}
		b.WriteString(w)
		n += l
	}
	return b.String()
}
