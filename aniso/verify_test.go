package aniso

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/terms"
)

func neoHookean(w float64) *Model {
	return &Model{Terms: []Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: w}}}
}

// hgoMedia is the media parameter set of Holzapfel, Gasser & Ogden 2000
// (c = 3 kPa, so i1-lin w = c/2 = 1.5 kPa; k1 = 2.3632 kPa, k2 = 0.8393,
// β = ±29°; values from memory).
func hgoMedia() *Model {
	return &Model{Families: []Family{{Name: "f1", Angle: 29 * deg}, {Name: "f2", Angle: -29 * deg}}, Terms: []Term{
		{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 1.5},
		{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 2.3632, Params: []float64{0.8393}},
		{Shape: terms.Lookup("fib-expsq"), Family: 1, Weight: 2.3632, Params: []float64{0.8393}},
	}}
}

// Neo-Hookean verification points against closed forms (Ogden 1984,
// Non-linear Elastic Deformations): uniaxial σ = 2w(λ² − 1/λ) with free
// lateral stretch λ^(−1/2); equibiaxial σ = 2w(λ² − λ⁻⁴); strip-biaxial
// σ11 = 2w(λ² − λ⁻²), σ22 = 2w(1 − λ⁻²); simple shear in plane stress
// (B33 = 1, so p = 2w): σ12 = 2wγ, σ11 = 2wγ², σ22 = 0, P12 = P21 = 2wγ,
// P11 = P22 = 0. All are given in the load frame and rotated into the axes
// by σ = RσRᵀ for every direction (isotropy).
func TestVerificationNeoHookeanClosedForms(t *testing.T) {
	const w = 5.0
	m := neoHookean(w)
	s := DefaultVerificationSettings(m)
	s.DirectionsDeg = []float64{0, 90, 29, -62}
	s.ShearDirectionsDeg = s.DirectionsDeg
	pts, err := VerificationCases(m, s)
	if err != nil {
		t.Fatal(err)
	}
	if want := 8*4 + 8 + 8*4 + 6*4; len(pts) != want {
		t.Fatalf("%d points, want %d", len(pts), want)
	}
	for _, p := range pts {
		l := p.Amount
		var local Sym // (nn, tt, nt)
		var lat float64
		switch p.Case {
		case Uniaxial:
			local, lat = Sym{2 * w * (l*l - 1/l), 0, 0}, 1/math.Sqrt(l)
		case Equibiaxial:
			v := 2 * w * (l*l - math.Pow(l, -4))
			local, lat = Sym{v, v, 0}, l
		case StripBiaxial:
			local, lat = Sym{2 * w * (l*l - 1/(l*l)), 2 * w * (1 - 1/(l*l)), 0}, 1
		case SimpleShear:
			local, lat = Sym{2 * w * l * l, 0, 2 * w * l}, 1
		}
		if !near(p.LateralStretch, lat, 1e-14) {
			t.Errorf("%s θ=%g λ=%g: lateral stretch %.17g, closed form %.17g", p.Case, p.DirectionDeg, l, p.LateralStretch, lat)
		}
		sn, cs := math.Sincos(p.DirectionDeg * deg)
		// σ = R σ_local Rᵀ
		a, b, c := local[0], local[1], local[2]
		want := Sym{cs*cs*a - 2*cs*sn*c + sn*sn*b, sn*sn*a + 2*cs*sn*c + cs*cs*b, cs*sn*(a-b) + (cs*cs-sn*sn)*c}
		for j := range want {
			if math.Abs(p.Cauchy[j]-want[j]) > 1e-12*2*w*3 {
				t.Errorf("%s θ=%g λ=%g: σ[%d] = %.15g, closed form %.15g", p.Case, p.DirectionDeg, l, j, p.Cauchy[j], want[j])
			}
		}
		if p.Case == SimpleShear && p.DirectionDeg == 0 {
			P := p.Nominal // (11, 22, 12, 21)
			if math.Abs(P[0]) > 1e-13 || math.Abs(P[1]) > 1e-13 || !near(P[2], 2*w*l, 1e-14) || !near(P[3], 2*w*l, 1e-14) {
				t.Errorf("simple shear γ=%g: P = %v, closed form (0, 0, %g, %g)", l, P, 2*w*l, 2*w*l)
			}
		}
		if p.Case == Uniaxial && p.DirectionDeg == 0 && !near(p.Nominal[0], 2*w*(l*l-1/l)/l, 1e-14) {
			t.Errorf("uniaxial λ=%g: P11 = %.15g, closed form σ/λ = %.15g", l, p.Nominal[0], 2*w*(l*l-1/l)/l)
		}
		// W = w(I1 − 3) with I1 of F_local = diag(λ, λt) or the shear, and
		// along axis 1 the second Piola–Kirchhoff stress S11 = σ11/λ² (S =
		// F⁻¹σF⁻ᵀ of a diagonal F).
		I1 := map[LoadCase]float64{Uniaxial: l*l + 2/l, Equibiaxial: 2*l*l + math.Pow(l, -4), StripBiaxial: l*l + 1 + 1/(l*l), SimpleShear: 3 + l*l}[p.Case]
		if !near(p.Energy, w*(I1-3), 1e-13) {
			t.Errorf("%s θ=%g λ=%g: W = %.15g, closed form %.15g", p.Case, p.DirectionDeg, l, p.Energy, w*(I1-3))
		}
		if p.DirectionDeg == 0 && p.Case != SimpleShear {
			F11 := p.F[0]
			if !near(p.SecondPiola[0], p.Cauchy[0]/(F11*F11), 1e-14) || math.Abs(p.SecondPiola[2]) > 1e-14 {
				t.Errorf("%s λ=%g: S = %v, closed form S11 = %g", p.Case, l, p.SecondPiola, p.Cauchy[0]/(F11*F11))
			}
		}
		if p.Flagged() {
			t.Errorf("%s θ=%g λ=%g: an isotropic model has no switch and a unique lateral stretch, but the row is flagged: %+v", p.Case, p.DirectionDeg, l, p)
		}
	}
}

// Mooney–Rivlin simple shear: σ12 = 2(C10 + C01)γ (Ogden 1984; with B33 = 1
// the plane-stress pressure is 2ψ1 + 4ψ2, and the I2 term gives
// 2ψ2(I1 B − B²)12 = 2ψ2 γ).
func TestVerificationMooneyRivlinShear(t *testing.T) {
	m := &Model{Terms: []Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 4}, {Shape: terms.Lookup("i2-lin"), Family: -1, Weight: 1}}}
	pts, err := VerificationCases(m, VerificationSettings{Cases: []LoadCase{SimpleShear}, DirectionsDeg: []float64{0}})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range pts {
		if !near(p.Cauchy[2], 2*5*p.Amount, 1e-14) {
			t.Errorf("γ=%g: σ12 = %.15g, closed form %.15g", p.Amount, p.Cauchy[2], 10*p.Amount)
		}
	}
}

// For an anisotropic model the uniaxial solve makes the load-frame lateral
// stress vanish to round-off at every direction, in tension and in
// compression, and the default directions are the axes and the fibre
// angles.
func TestVerificationUniaxialLateralFree(t *testing.T) {
	m := hgoMedia()
	s := DefaultVerificationSettings(m)
	if len(s.DirectionsDeg) != 4 || s.DirectionsDeg[2] != 29 || math.Abs(s.DirectionsDeg[3]+29) > 1e-12 {
		t.Fatalf("directions %v, want 0, 90, 29, -29", s.DirectionsDeg)
	}
	s.DirectionsDeg = append(s.DirectionsDeg, 45, 10)
	pts, err := VerificationCases(m, s)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, p := range pts {
		if p.Case != Uniaxial {
			continue
		}
		n++
		if math.Abs(p.LoadFrame[1]) > 1e-12*math.Abs(p.LoadFrame[0]) {
			t.Errorf("θ=%g λ=%g: lateral stress %g with load stress %g", p.DirectionDeg, p.Amount, p.LoadFrame[1], p.LoadFrame[0])
		}
		if sign := p.Amount - 1; !(p.LoadFrame[0]*sign > 0) || !((p.LateralStretch-1)*sign < 0) {
			t.Errorf("θ=%g λ=%g: load stress %g, lateral stretch %g", p.DirectionDeg, p.Amount, p.LoadFrame[0], p.LateralStretch)
		}
		// F is R diag(λ, λt) Rᵀ: its load-frame components are the imposed ones.
		th := p.DirectionDeg * deg
		back := rotateF(p.F, -th)
		if !near(back[0], p.Amount, 1e-14) || !near(back[3], p.LateralStretch, 1e-14) || math.Abs(back[1]) > 1e-15 || math.Abs(back[2]) > 1e-15 {
			t.Errorf("θ=%g λ=%g: F in the load frame %v", p.DirectionDeg, p.Amount, back)
		}
	}
	if n != 6*8 {
		t.Fatalf("%d uniaxial points", n)
	}
}

// Gent uniaxial tension (Gent 1996): σ = 2wJ(λ² − 1/λ)/(J − (λ² + 2/λ − 3))
// with the lateral stretch λ^(−1/2) of isotropy. With a small limit J the
// table reaches the limit: those points carry Err and no stress, the rest
// are exact.
func TestVerificationGentLimit(t *testing.T) {
	const w, J = 5.0, 0.3
	m := &Model{Terms: []Term{{Shape: terms.Lookup("i1-gent"), Family: -1, Weight: w, Params: []float64{J}}}}
	pts, err := VerificationCases(m, VerificationSettings{})
	if err != nil {
		t.Fatal(err)
	}
	bad, good := 0, 0
	for _, p := range pts {
		if p.Err != "" {
			bad++
			continue
		}
		if p.Case != Uniaxial {
			continue
		}
		l := p.Amount
		x := l*l + 2/l - 3
		want := 2 * w * J * (l*l - 1/l) / (J - x)
		if !near(p.LoadFrame[0], want, 1e-12) || !near(p.LateralStretch, 1/math.Sqrt(l), 1e-14) {
			t.Errorf("θ=%g λ=%g: σ = %.15g, closed form %.15g", p.DirectionDeg, l, p.LoadFrame[0], want)
		}
		good++
	}
	if bad == 0 || good != 16 {
		t.Errorf("%d points beyond the limit, %d uniaxial points checked", bad, good)
	}
}

// The default directions: uniaxial and strip-biaxial along the axes and
// each fibre; simple shear along the axes and at 45° either side of each
// fibre, never along a fibre (there I4 = 1 for every γ).
func TestVerificationShearDirections(t *testing.T) {
	s := DefaultVerificationSettings(hgoMedia())
	want := []float64{0, 90, -16, 74, -74, 16}
	if len(s.ShearDirectionsDeg) != len(want) {
		t.Fatalf("shear directions %v, want %v", s.ShearDirectionsDeg, want)
	}
	for i := range want {
		if math.Abs(s.ShearDirectionsDeg[i]-want[i]) > 1e-12 {
			t.Fatalf("shear directions %v, want %v", s.ShearDirectionsDeg, want)
		}
	}
	// A family on axis 1 would put the shear along axis 1 on its switch.
	m := &Model{Families: []Family{{Angle: 0}}, Terms: []Term{{Shape: terms.Lookup("fib-quad"), Family: 0, Weight: 1}}}
	for _, d := range DefaultVerificationSettings(m).ShearDirectionsDeg {
		if math.Abs(WrapDeg(d)) < 1e-9 {
			t.Errorf("simple shear along the family at 0°: %v", DefaultVerificationSettings(m).ShearDirectionsDeg)
		}
	}
}

// switchCards are models whose default tables meet switches: families on
// the axes (strip-biaxial across a fibre leaves it at I4 = 1 exactly),
// a dispersed family, cofactor and I5 terms, two families 90° apart and an
// in-plane dispersed family.
func switchCards() map[string]*Model {
	fib := func(id string, f int, w float64, p ...float64) Term {
		return Term{Shape: terms.Lookup(id), Family: f, Weight: w, Params: p}
	}
	iso := Term{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 1}
	return map[string]*Model{
		"axes": {Families: []Family{{Angle: 0, Dispersion: 0.1}, {Angle: math.Pi / 2}}, Terms: []Term{iso,
			fib("fib-expsq", 0, 5, 2), fib("cof-quad", 0, 1), fib("fib-quad", 1, 3), fib("i5-quad", 1, 0.5)}},
		"oblique": {Families: []Family{{Angle: 20 * deg}, {Angle: 110 * deg}}, Terms: []Term{iso, fib("fib-exp", 0, 4, 3), fib("cof-quad", 1, 2)}},
		"hgo":     hgoMedia(),
		"planar":  {Families: []Family{{Angle: 0, Planar: true, Concentration: 3}}, Terms: []Term{iso, fib("fib-expsq", 0, 5, 2)}},
	}
}

// Every row of the default table is either at least SwitchTolerance away
// from every switch of the model, or flagged with the family and the
// invariant that sit on it. I4 and K are computed here from their
// definitions (I4 = |F a0|², K = |cof(F) a0|² with cof F = J F⁻ᵀ, J = 1
// in three dimensions; Schröder & Neff 2003), not through the package's
// kinematics.
func TestVerificationRowsOffSwitches(t *testing.T) {
	for name, m := range switchCards() {
		pts, err := VerificationCases(m, VerificationSettings{})
		if err != nil {
			t.Fatal(err)
		}
		flagged := 0
		for _, p := range pts {
			F := p.F
			J := F[0]*F[3] - F[1]*F[2]
			for f, fam := range m.Families {
				if fam.Planar {
					continue // never on a switch at a row (Model.Switches)
				}
				c, s := math.Cos(fam.Angle), math.Sin(fam.Angle)
				a := [2]float64{F[0]*c + F[1]*s, F[2]*c + F[3]*s}
				I4 := a[0]*a[0] + a[1]*a[1]
				// In-plane cof(F) a0 = J F⁻ᵀ a0 with the 3-D J = 1: F⁻ᵀ of
				// the in-plane F is [[F22, −F21], [−F12, F11]]/J2.
				ca := [2]float64{(F[3]*c - F[2]*s) / J, (-F[1]*c + F[0]*s) / J}
				K := ca[0]*ca[0] + ca[1]*ca[1]
				var fibre, cof bool
				for _, term := range m.Terms {
					if term.Family == f {
						fibre = fibre || term.Shape.Arg == terms.Fibre || term.Shape.Arg == terms.Fifth
						cof = cof || term.Shape.Arg == terms.Cofactor
					}
				}
				onI4 := fibre && math.Abs(I4-1) < SwitchTolerance
				onK := cof && math.Abs(K-1) < SwitchTolerance
				var hasI4, hasK bool
				for _, n := range p.Switches {
					hasI4 = hasI4 || n.Family == f && n.Invariant == "I4"
					hasK = hasK || n.Family == f && n.Invariant == "K"
				}
				if onI4 != hasI4 || onK != hasK {
					t.Errorf("%s: %s θ=%g %g: family %d I4 = %.17g, K = %.17g; switches flagged %+v", name, p.Case, p.DirectionDeg, p.Amount, f, I4, K, p.Switches)
				}
			}
			if len(p.Switches) > 0 {
				flagged++
			}
		}
		// Strip-biaxial stretch across a fibre leaves it at I4 = 1
		// exactly: families on the axes, or two families 90° apart, meet
		// their switches there; the hgo and planar cards nowhere.
		if (name == "axes" || name == "oblique") != (flagged > 0) {
			t.Errorf("%s: %d rows flagged", name, flagged)
		}
	}
}

// A card without a matrix term has no lateral stiffness wherever its
// fibres are slack: uniaxial rows then have many lateral stretches that
// free the lateral edges, and they are flagged, not silently picked; along
// axis 1, beyond λ = 1/cos 30°, the family at 30° is stretched whatever
// the lateral stretch and pulls the lateral edges (σ_tt = 2ψ4 (a·t)² > 0),
// so no lateral stretch exists and the rows say so. With a matrix term
// every row is unique and equals the root a plain bisection of σ_tt over
// [0.05, 3] finds (σ_tt increases with λt for this stable material).
func TestVerificationUniaxialNonUnique(t *testing.T) {
	fibreOnly := &Model{Families: []Family{{Angle: 30 * deg}}, Terms: []Term{{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 10, Params: []float64{2}}}}
	withMatrix := &Model{Families: fibreOnly.Families, Terms: append([]Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 1}}, fibreOnly.Terms...)}
	for name, m := range map[string]*Model{"fibre only": fibreOnly, "with matrix": withMatrix} {
		pts, err := VerificationCases(m, VerificationSettings{Cases: []LoadCase{Uniaxial}})
		if err != nil {
			t.Fatal(err)
		}
		nonUnique, none := 0, 0
		for _, p := range pts {
			if p.Err != "" {
				none++
				if name != "fibre only" || p.DirectionDeg != 0 || !(p.Amount*math.Cos(30*deg) > 1) {
					t.Errorf("%s θ=%g λ=%g: %s", name, p.DirectionDeg, p.Amount, p.Err)
				}
				continue
			}
			if p.NonUnique != "" {
				nonUnique++
			}
			if math.Abs(p.LoadFrame[1]) > 1e-9 {
				t.Errorf("%s θ=%g λ=%g: lateral stress %g", name, p.DirectionDeg, p.Amount, p.LoadFrame[1])
			}
			if name != "with matrix" {
				continue
			}
			th := p.DirectionDeg * deg
			stt := func(mu float64) float64 {
				r, err := m.Evaluate(LoadGradient(Uniaxial, th, p.Amount, mu))
				if err != nil {
					t.Fatal(err)
				}
				return loadFrame(r.Cauchy, th)[1]
			}
			lo, hi := 0.05, 3.0
			for i := 0; i < 200; i++ {
				if mid := (lo + hi) / 2; stt(mid) > 0 {
					hi = mid
				} else {
					lo = mid
				}
			}
			if !near(p.LateralStretch, lo, 1e-12) {
				t.Errorf("θ=%g λ=%g: lateral stretch %.15g, bisection %.15g", p.DirectionDeg, p.Amount, p.LateralStretch, lo)
			}
		}
		if name == "fibre only" && (nonUnique == 0 || none != 3) || name == "with matrix" && nonUnique != 0 {
			t.Errorf("%s: %d of %d uniaxial rows flagged non-unique, %d without a lateral stretch", name, nonUnique, len(pts), none)
		}
	}
}

// A card of fibres only (two families at 11.375° and 76.015°, no matrix
// term, as a fit drove the matrix weight to zero) loaded uniaxially at
// −76.015°: the lateral stress stays positive for every lateral stretch
// and falls to zero only as λt² (an independent implementation from the
// README's conventions gave σ_tt = 8.364 λt² kPa at λ = 1.3), so the row
// has no lateral stretch and is left out. The search once followed it
// down to λt ≈ 4e-9, where round-off changes sign, and reported that
// "root" with F33 ≈ 2e8 and a second Piola–Kirchhoff stress of
// round-off.
func TestUniaxialRowWithoutLateralRoot(t *testing.T) {
	m := &Model{Families: []Family{{Name: "f1", Angle: Rad(11.375)}, {Name: "f2", Angle: Rad(76.015)}},
		Terms: []Term{{Shape: lookup("fib-expsq"), Family: 0, Weight: 55.4, Params: []float64{4.15}},
			{Shape: lookup("fib-expsq"), Family: 1, Weight: 36.3, Params: []float64{4.9}}}}
	for _, l := range []float64{1.15, 1.3} {
		mu, err := lateralRoot(m, Rad(-76.015), l, 1/l)
		if err == nil {
			t.Errorf("λ = %g: lateral stretch %g, want no root (the row left out)", l, mu)
		}
	}
}

// A row the continuation cannot reach is reported at its own stretch.
// Fibres only at ±30° loaded along axis 1: for λ > 2/√3 both families
// are stretched whatever λt is (I4 = ¾λ² + ¼λt² > 1, from the README's
// I4 = a0·C a0), so the lateral stress reaches zero only as λt → 0 and the
// path stops between 1.15 and 1.2. The reasons of the rows at 1.2 and 1.3
// once both began "uniaxial stretch 1.15983 at 0°" (the failed
// intermediate step), which read as a wrong stretch in export's
// verification_absent.
func TestUniaxialPathStopNamesTheRow(t *testing.T) {
	m := &Model{Families: []Family{{Name: "f1", Angle: Rad(30)}, {Name: "f2", Angle: Rad(-30)}},
		Terms: []Term{{Shape: lookup("fib-expsq"), Family: 0, Weight: 3, Params: []float64{1}},
			{Shape: lookup("fib-expsq"), Family: 1, Weight: 3, Params: []float64{1}}}}
	sols := SolveUniaxialPath(m, 0, []float64{1.15, 1.2, 1.3})
	if sols[0].Err != nil {
		t.Fatalf("λ = 1.15 (below 2/√3 = %.6f): %v", 2/math.Sqrt(3), sols[0].Err)
	}
	for i, l := range []float64{1.2, 1.3} {
		err := sols[i+1].Err
		if err == nil {
			t.Fatalf("λ = %g: lateral stretch %g, want none", l, sols[i+1].Lateral)
		}
		if want := fmt.Sprintf("uniaxial stretch %g at 0°: the path from λ = 1 stops after λ = 1.15 (", l); !strings.HasPrefix(err.Error(), want) {
			t.Errorf("λ = %g: %q, want it to begin %q", l, err, want)
		}
	}
}
