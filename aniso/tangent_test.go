package aniso

import (
	"math"
	"testing"

	"github.com/weft-tools/weft/terms"
)

// tangentPoints are in-plane deformations with stretch, compression and
// shear, none of them on a fibre switch of the families used below.
var tangentPoints = [][4]float64{
	{1.2, 0, 0, 1.1},
	{1.15, 0.12, -0.05, 0.97},
	{0.9, 0.2, 0.1, 1.25},
	{1.05, -0.15, 0.08, 1.3},
	{1, 0.25, 0, 1},
	{0.8, 0, 0.1, 1.35},
}

// singleTermModels returns, for every catalogue shape, small models with the
// shape alone on a family at several angles and dispersions (fibre shapes)
// or alone (isotropic shapes), with non-default parameters.
func singleTermModels() []*Model {
	var out []*Model
	for _, sh := range terms.Catalogue() {
		p := sh.DefaultParams()
		for i, q := range sh.Params {
			if q.Name == "stiffening" {
				p[i] = 1.7
			}
			if q.Name == "limit" {
				p[i] = 4
			}
			if q.Name == "exponent" {
				p[i] *= 3.5 // 7 and −7: away from the I1/I2 special cases
			}
			if q.Name == "onset" {
				p[i] = 1.03
			}
		}
		if !sh.Arg.NeedsFamily() {
			out = append(out, &Model{Terms: []Term{{Shape: sh, Family: -1, Weight: 1.3, Params: p}}})
			continue
		}
		for _, fam := range []Family{{Name: "a", Angle: 20 * deg}, {Name: "b", Angle: 75 * deg, Dispersion: 0.15}, {Name: "c", Angle: -40 * deg, Dispersion: MaxDispersion}} {
			out = append(out, &Model{Families: []Family{fam}, Terms: []Term{{Shape: sh, Family: 0, Weight: 2.1, Params: p}}})
		}
	}
	return out
}

// onSwitch reports whether F lies within h of a fibre switch (I4 = 1) or of
// the cofactor switch (K = 1) of any family, where finite differences
// straddle a kink.
func onSwitch(m *Model, F [4]float64) bool {
	k, _ := NewKinematics(F)
	for _, f := range m.Families {
		fk := k.Fibre(f.Angle)
		if math.Abs(fk.I4-1) < 1e-3 || math.Abs(fk.K-1) < 1e-3 {
			return true
		}
	}
	return false
}

// The analytic tangent against central finite differences of Evaluate's
// nominal stress (common practice), for every catalogue shape at several
// F including shear; and the gradient P of the membrane energy against
// Evaluate's nominal stress, which Evaluate computes by a different route
// (the Cauchy stress formula of Holzapfel 2000, §6.6, then P = σF⁻ᵀ).
func TestTangentFiniteDifference(t *testing.T) {
	active := map[string]int{} // points where the term carries energy
	for _, m := range singleTermModels() {
		id := m.Terms[0].Shape.ID
		for _, F := range tangentPoints {
			if onSwitch(m, F) {
				continue
			}
			tg, err := m.Tangent(F)
			if err != nil {
				t.Fatalf("%s at %v: %v", id, F, err)
			}
			if tg.Energy != 0 {
				active[id]++
			}
			r, err := m.Evaluate(F)
			if err != nil {
				t.Fatal(err)
			}
			pe := NominalFOrder(r.Nominal)
			scale := 0.0
			for i := range pe {
				scale = math.Max(scale, math.Abs(pe[i]))
			}
			for i := range pe {
				if math.Abs(tg.P[i]-pe[i]) > 1e-11*math.Max(1, scale) {
					t.Errorf("%s at %v: P[%d] = %.15g from ∂W/∂F, Evaluate gives %.15g", id, F, i, tg.P[i], pe[i])
				}
			}
			if math.Abs(tg.Energy-r.Energy) > 1e-12*math.Max(1, math.Abs(r.Energy)) {
				t.Errorf("%s at %v: energy %.15g vs Evaluate %.15g", id, F, tg.Energy, r.Energy)
			}
			amax := largestEntry(tg.A)
			fdA := fdTangent(t, m, F, 1e-6)
			for j := 0; j < 4; j++ {
				for i := 0; i < 4; i++ {
					fd := fdA[i][j]
					if math.Abs(fd-tg.A[i][j]) > 1e-6*math.Max(1, amax) {
						t.Errorf("%s (κ=%v) at F=%v: A[%d][%d] = %.10g, finite difference %.10g", id, famKappa(m), F, i, j, tg.A[i][j], fd)
					}
				}
			}
		}
	}
	// Every shape must have been checked where it is switched on.
	for _, sh := range terms.Catalogue() {
		if active[sh.ID] < 3 {
			t.Errorf("%s was active at only %d test points", sh.ID, active[sh.ID])
		}
	}
}

func famKappa(m *Model) any {
	if len(m.Families) == 0 {
		return "-"
	}
	return m.Families[0].Dispersion
}

// A whole model with every shape on two families, and the presets: the
// tangent against finite differences and its symmetry (a Hessian).
func TestTangentWholeModels(t *testing.T) {
	models := []*Model{allTermsModel()}
	for _, p := range terms.Presets() {
		models = append(models, presetModel(t, p))
	}
	for mi, m := range models {
		for _, F := range tangentPoints {
			if onSwitch(m, F) {
				continue
			}
			tg, err := m.Tangent(F)
			if err != nil {
				continue // beyond a Gent limit: no tangent, as Evaluate
			}
			amax := largestEntry(tg.A)
			for i := range tg.A {
				for j := range tg.A[i] {
					if math.Abs(tg.A[i][j]-tg.A[j][i]) > 1e-13*amax {
						t.Errorf("model %d at %v: A not symmetric at %d,%d", mi, F, i, j)
					}
				}
			}
			fdA := fdTangent(t, m, F, 1e-6)
			for j := 0; j < 4; j++ {
				for i := 0; i < 4; i++ {
					fd := fdA[i][j]
					if math.Abs(fd-tg.A[i][j]) > 1e-6*math.Max(1, amax) {
						t.Errorf("model %d at %v: A[%d][%d] = %.10g, finite difference %.10g", mi, F, i, j, tg.A[i][j], fd)
					}
				}
			}
		}
	}
}

// Rigid-rotation identity: W(R(θ)F) = W(F) for every θ; differentiating
// twice at θ = 0 gives (ΩF):A:(ΩF) = −P:(Ω²F) = P:F = σ11 + σ22 with
// Ω = [[0, −1], [1, 0]] (a consequence of objectivity; derived here, common
// practice in stability analysis). It checks the tangent against the stress
// without finite differences.
func TestTangentRotationMode(t *testing.T) {
	m := allTermsModel()
	for _, F := range tangentPoints {
		tg, err := m.Tangent(F)
		if err != nil {
			t.Fatal(err)
		}
		r, _ := m.Evaluate(F)
		om := rotationMode(F)
		q := quadForm(&tg.A, om, om)
		want := r.Cauchy[0] + r.Cauchy[1]
		if math.Abs(q-want) > 1e-10*math.Max(1, math.Abs(want)) {
			t.Errorf("F=%v: (ΩF):A:(ΩF) = %.12g, σ11 + σ22 = %.12g", F, q, want)
		}
	}
}

// BenchmarkTangent times one analytic tangent of the two-family model of
// Holzapfel, Gasser & Ogden 2000 at a sheared state.
func BenchmarkTangent(b *testing.B) {
	m := &Model{Families: []Family{{Angle: 29 * deg}, {Angle: -29 * deg}}, Terms: []Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 1.5},
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 2.3632, Params: []float64{0.8393}},
		{Shape: terms.Lookup("fib-expsq"), Family: 1, Weight: 2.3632, Params: []float64{0.8393}},
	}}
	F := [4]float64{1.2, 0.1, -0.05, 1.1}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := m.Tangent(F); err != nil {
			b.Fatal(err)
		}
	}
}

// fdTangent is the central finite difference of m's nominal stress with
// respect to F at F (both in the order 11, 12, 21, 22), step h:
// A[i][j] ≈ ∂P_i/∂F_j. An evaluation error fails the test.
func fdTangent(t *testing.T, m *Model, F [4]float64, h float64) (A [4][4]float64) {
	t.Helper()
	for j := 0; j < 4; j++ {
		Fp, Fm := F, F
		Fp[j] += h
		Fm[j] -= h
		rp, err1 := m.Evaluate(Fp)
		rm, err2 := m.Evaluate(Fm)
		if err1 != nil || err2 != nil {
			t.Fatalf("F=%v: %v %v", F, err1, err2)
		}
		pp, pm := NominalFOrder(rp.Nominal), NominalFOrder(rm.Nominal)
		for i := 0; i < 4; i++ {
			A[i][j] = (pp[i] - pm[i]) / (2 * h)
		}
	}
	return A
}

// At the reference state no family is stretched: cofactor terms (on
// while K > 1) and fibre terms (while I4 > 1) are off, so the tangent at
// F = I is the matrix's alone, whatever the families' angles. K and I4
// come out within a few units in the last place of 1 there; at 35° K − 1
// was +4.4e-16 and switched a cofactor term on, adding 2w∇K⊗∇K (18 kPa
// on a tangent of 24) to the tangent an FE analyst reads at rest (found
// by an independent implementation, 2026-12-04).
func TestTangentAtRestIsTheMatrixAlone(t *testing.T) {
	matrix := Term{Shape: lookup("i1-lin"), Family: -1, Weight: 2}
	ref, err := (&Model{Terms: []Term{matrix}}).Tangent([4]float64{1, 0, 0, 1})
	if err != nil {
		t.Fatal(err)
	}
	for _, a := range []float64{35, -50, 15, 30, 60, 75, 120} {
		for _, id := range []string{"cof-quad", "fib-quad", "i5-quad"} {
			m := &Model{Families: []Family{{Name: "f1", Angle: Rad(a)}},
				Terms: []Term{matrix, {Shape: lookup(id), Family: 0, Weight: 5, Params: lookup(id).DefaultParams()}}}
			got, err := m.Tangent([4]float64{1, 0, 0, 1})
			if err != nil {
				t.Fatal(err)
			}
			if got.Energy != 0 || got.A != ref.A {
				t.Errorf("%s at %g°: energy %g, tangent %v; the matrix alone gives %v", id, a, got.Energy, got.A, ref.A)
			}
		}
	}
}

// largestEntry is the largest |A[i][j]| of a tangent: the scale its
// entries are compared at.
func largestEntry(A [4][4]float64) float64 {
	m := 0.0
	for i := range A {
		for j := range A[i] {
			m = math.Max(m, math.Abs(A[i][j]))
		}
	}
	return m
}
