package aniso

import (
	"math"
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
	pts, err := VerificationCases(m, s)
	if err != nil {
		t.Fatal(err)
	}
	if want := 6*4 + 6 + 6*4 + 6*4; len(pts) != want {
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
// stress vanish to round-off at every direction, and the default
// directions are the axes and the fibre angles.
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
		if !(p.LoadFrame[0] > 0) || !(p.LateralStretch < 1) {
			t.Errorf("θ=%g λ=%g: load stress %g, lateral stretch %g", p.DirectionDeg, p.Amount, p.LoadFrame[0], p.LateralStretch)
		}
		// F is R diag(λ, λt) Rᵀ: its load-frame components are the imposed ones.
		th := p.DirectionDeg * deg
		back := rotateF(p.F, -th)
		if !near(back[0], p.Amount, 1e-14) || !near(back[3], p.LateralStretch, 1e-14) || math.Abs(back[1]) > 1e-15 || math.Abs(back[2]) > 1e-15 {
			t.Errorf("θ=%g λ=%g: F in the load frame %v", p.DirectionDeg, p.Amount, back)
		}
	}
	if n != 6*6 {
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
	if bad == 0 || good != 12 {
		t.Errorf("%d points beyond the limit, %d uniaxial points checked", bad, good)
	}
}
