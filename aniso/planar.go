package aniso

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/weft-tools/weft/terms"
)

// In-plane fibre dispersion by angular integration.
//
// A planar family spreads its fibres over the directions θ of the plane with
// a von Mises density in 2θ about its mean direction α,
//
//	ρ(θ) = exp(b cos 2(θ − α)) / (π I0(b)),   ∫ ρ dθ = 1 over one period,
//
// with concentration b ≥ 0 (b = 0: every in-plane direction alike; b → ∞:
// the ideal family). Each direction is an ideal fibre a0(θ) = (cos θ, sin θ, 0)
// with its own I4(θ) = a0(θ)·C a0(θ), and carries load only while I4(θ) > 1
// (Lanir 1983, J Biomech 16:1–12; the planar structural approach of Sacks
// 2003, J Biomech Eng 125:280–287). A fibre term's energy is
//
//	Ψ = w ∫ ρ(θ) f(I4(θ) − 1) dθ,
//
// its Cauchy stress w ∫ ρ f′ 2 a(θ)⊗a(θ) dθ, still linear in w.
//
// Quadrature. With a0 a0ᵀ = ½(1 + cos 2θ D_c + sin 2θ D_s),
// D_c = diag(1, −1) and D_s = [[0, 1], [1, 0]],
//
//	I4(θ) − 1 = A0 + R cos(2θ − φ),   A0 = ½(C11 + C22) − 1,
//	R cos φ = ½(C11 − C22),  R sin φ = C12,
//
// a trigonometric quadratic in 2θ: in u = 2θ − φ the stretched directions
// are the arc |u| < acos(−A0/R) (empty, or the whole circle, when |A0| ≥ R),
// known in closed form. The stress is F (M0 1 + Mc D_c + Ms D_s) Fᵀ with the
// three moments M = ∫ ρ f′ (1, cos 2θ, sin 2θ) dθ, so a point needs only
// three scalar integrals per term. They are computed by composite
// Gauss–Legendre quadrature on panels whose ends are the arc's ends (where
// the integrand has a kink), the arguments at which a shape is not smooth
// (terms.Shape.Kinks, e.g. the ends of a recruitment range), and, for a
// concentrated family, points at 1, 2, 4 and 8 standard deviations of the
// density about its mean; directions more than 12 standard deviations away
// carry less than e^−72 of the density and are left out. Because the arc
// does not depend on α or b, the derivatives with respect to them are the
// integrals of ∂ρ/∂α = 2b sin 2(θ − α) ρ and ∂ρ/∂b = (cos 2(θ − α) −
// I1(b)/I0(b)) ρ; at the arc's ends f′ = 0 (fibre shapes start with zero
// slope), so no boundary terms arise, and the tangent is the integral of
// the ideal family's tangent over the stretched directions.

// MaxConcentration is the largest concentration b a card may hold; beyond
// it a family is indistinguishable from an ideal one at any stretch a test
// reaches (the density's standard deviation is below 0.3°).
const MaxConcentration = 1e4

// FitMaxConcentration bounds b in fits: at b = 200 the density's standard
// deviation is 2°, within the resolution of a fitted angle, so larger values
// are reported as an ideal family instead.
const FitMaxConcentration = 200

// quadRule is a panel policy of the planar quadrature: Gauss–Legendre of
// a fixed order per panel; a peak of the integrand sharper than
// peakCurvature (in u) gets break points at peakBreaks standard deviations;
// no panel is wider than maxPanel or panelScale standard deviations of the
// sharper peak.
type quadRule struct {
	nodes, weights []float64
	peakCurvature  float64
	peakBreaks     []float64
	maxPanel       float64
	panelScale     float64
}

func newQuadRule(order int, peakCurvature float64, peakBreaks []float64, maxPanel, panelScale float64) *quadRule {
	q := &quadRule{nodes: make([]float64, order), weights: make([]float64, order),
		peakCurvature: peakCurvature, peakBreaks: peakBreaks, maxPanel: maxPanel, panelScale: panelScale}
	quad.Legendre{}.FixedLocations(q.nodes, q.weights, -1, 1)
	return q
}

// scanRule places the directions of a coarse angle scan: fixed panels over
// the stretched arc, with no break points at kinks or peaks, so that they
// do not depend on the family's angle, spread or shapes and each shape's
// slope there is computed once per scan (see fillPlanarScan). A scan only
// ranks angles; every fit refines with searchRule or accurateRule.
var scanRule = newQuadRule(8, math.Inf(1), nil, math.Pi/2, math.Inf(1))

// pointRule evaluates a model at one deformation (Model.Evaluate and
// Model.Tangent): every stress, energy and tangent weft reports, predicts,
// checks or exports. With 16 directions per panel and panels at most π/2
// wide it meets 1e-12 relative to the stress scale against a brute-force
// reference (TestPlanarQuadratureAccuracy; about 1e-14 at the verification
// rows), so that an independent implementation can be compared with the
// verification table to 1e-10. accurateRule meets 1e-8 with two thirds of
// the directions and fills the columns of every fit; searchRule is about
// 1e-5 with half of those, for the many fits discovery only compares; the
// model it picks is refitted with accurateRule.
var (
	pointRule    = newQuadRule(16, 4, []float64{2}, math.Pi/2, 6)
	accurateRule = newQuadRule(12, 4, []float64{2}, math.Pi, 6)
	searchRule   = newQuadRule(8, 6, []float64{2}, math.Pi, 8)
)

// planarGeom is the fibre-stretch geometry of one deformation:
// I4(θ) − 1 = A0 + R cos(2θ − φ).
type planarGeom struct {
	A0, R, Phi, CosPhi, SinPhi float64
}

func newPlanarGeom(F *[4]float64) planarGeom {
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	c12 := F[0]*F[1] + F[2]*F[3]
	rc, rs := 0.5*(c11-c22), c12
	g := planarGeom{A0: 0.5*(c11+c22) - 1, R: math.Hypot(rc, rs)}
	g.Phi = math.Atan2(rs, rc)
	g.SinPhi, g.CosPhi = math.Sincos(g.Phi)
	return g
}

// halfWidth returns the half-width h of the arc |u| < h where
// I4(θ) − 1 > level, and whether the arc is empty or the whole circle.
func (g *planarGeom) halfWidth(level float64) (h float64, empty, full bool) {
	d := level - g.A0
	if d >= g.R {
		return 0, true, false
	}
	if -d >= g.R {
		return math.Pi, false, true
	}
	return math.Acos(d / g.R), false, false
}

// planarNode is one quadrature direction: Weight already holds ρ(θ)·dθ, X is
// I4(θ) − 1, Cos2 and Sin2 are cos 2θ and sin 2θ, DA and DB are
// (∂ρ/∂α)/ρ and (∂ρ/∂b)/ρ, and Theta the direction in radians.
type planarNode struct {
	Weight, X, Cos2, Sin2, DA, DB, Theta float64
}

// planarRule builds and holds the quadrature directions of one planar
// family at one deformation; its buffers are reused.
type planarRule struct {
	Nodes  []planarNode
	breaks []float64
	// The rule and density of the current build: cos 2α, sin 2α, b, the
	// scaled normalisation and I1(b)/I0(b).
	q                      *quadRule
	ca, sa, b, norm, ratio float64
	// alpha is the α of ca and sa; densOK says the density fields hold
	// the values for alpha and b.
	alpha  float64
	densOK bool
}

// density returns the normalisation and the mean resultant of a von Mises
// density in 2θ: 1/(π I0(b)) as a scaled factor for exp(b(cos − 1)), and
// I1(b)/I0(b).
func density(b float64) (scaledNorm, ratio float64) {
	i0e, i1e := besselI01e(b)
	return 1 / (math.Pi * i0e), i1e / i0e
}

// build fills r.Nodes for a family with mean direction alpha (radians) and
// concentration b at geometry g. kinks are the arguments x > 0 at which a
// term's shape is not smooth; steep is the largest log-slope f″/f′ of the
// family's shapes at the most stretched direction (0 if unknown), which
// sets how finely the stretch peak is resolved. Nodes outside the
// stretched arc are never produced.
func (r *planarRule) build(q *quadRule, g *planarGeom, alpha, b float64, kinks []float64, steep float64) {
	r.Nodes = r.Nodes[:0]
	r.q = q
	h0, empty, full := g.halfWidth(0)
	if empty {
		return
	}
	// A fill builds every point's rule for one α and b: their density
	// factors are computed once.
	if !r.densOK || math.Float64bits(b) != math.Float64bits(r.b) || math.Float64bits(alpha) != math.Float64bits(r.alpha) {
		r.norm, r.ratio = density(b)
		r.ca, r.sa, r.b, r.alpha, r.densOK = math.Cos(2*alpha), math.Sin(2*alpha), b, alpha, true
	}
	delta := wrapPi(2*alpha - g.Phi) // the density's peak in u
	// The window of u that carries density: all of it for a spread family,
	// ±12 standard deviations (1/√b each, in u) for a concentrated one.
	win := math.Pi
	if b > 0 {
		win = math.Min(math.Pi, 12/math.Sqrt(b))
	}
	// Pieces of the stretched arc inside the window, in u.
	type piece struct{ lo, hi float64 }
	var pieces [3]piece
	np := 0
	if full {
		pieces[0] = piece{delta - win, delta + win}
		np = 1
	} else {
		for k := -1; k <= 1; k++ {
			lo := math.Max(-h0+2*math.Pi*float64(k), delta-win)
			hi := math.Min(h0+2*math.Pi*float64(k), delta+win)
			if hi > lo {
				pieces[np] = piece{lo, hi}
				np++
			}
		}
	}
	// Break points: the ends of the arcs where a shape has a kink, and
	// points about the two peaks of the integrand: the density's at δ
	// (curvature b in u) and the stretch's at u = 0 (curvature about
	// steep·R), in every period that can meet a piece.
	r.breaks = r.breaks[:0]
	for _, lv := range kinks {
		h, e, f := g.halfWidth(lv)
		if e || f {
			continue
		}
		for k := -2; k <= 2; k++ {
			r.breaks = append(r.breaks, -h+2*math.Pi*float64(k), h+2*math.Pi*float64(k))
		}
	}
	// Curvatures are capped: a shape whose slope starts from zero inside
	// the arc (a recruitment onset) has an unbounded log-slope there, and
	// its kinks already split the panels at that point.
	steepR := math.Min(math.Max(steep, 0)*g.R, maxCurvature)
	curv := math.Min(b, maxCurvature) + steepR
	peak := func(centre, c float64) {
		if c <= q.peakCurvature {
			return
		}
		sd := 1 / math.Sqrt(c)
		for _, m := range q.peakBreaks {
			for k := -1; k <= 1; k++ {
				c0 := centre + 2*math.Pi*float64(k)
				r.breaks = append(r.breaks, c0-m*sd, c0+m*sd)
			}
		}
	}
	peak(delta, math.Min(b, maxCurvature))
	peak(0, steepR)
	maxPanel := math.Min(q.maxPanel, q.panelScale/math.Sqrt(curv+1))
	sort.Float64s(r.breaks)
	for _, pc := range pieces[:np] {
		lo := pc.lo
		for _, bk := range r.breaks {
			if bk <= lo || bk >= pc.hi {
				continue
			}
			r.panels(g, lo, bk, maxPanel)
			lo = bk
		}
		r.panels(g, lo, pc.hi, maxPanel)
	}
}

// maxCurvature caps the curvature (in u) that sets panel widths: a peak
// narrower than 1e-3 rad is resolved by its break points alone; maxPanels
// caps the panels of one piece.
const (
	maxCurvature = 1e6
	maxPanels    = 64
)

// panels splits [lo, hi] (in u) into equal panels no wider than maxPanel
// and appends their Gauss–Legendre directions.
func (r *planarRule) panels(g *planarGeom, lo, hi, maxPanel float64) {
	n := 1
	if w := (hi - lo) / maxPanel; w > 1 {
		n = int(min(math.Ceil(w), maxPanels))
	}
	step := (hi - lo) / float64(n)
	for p := 0; p < n; p++ {
		a := lo + float64(p)*step
		half := step / 2
		mid := a + half
		for k, t := range r.q.nodes {
			u := mid + half*t
			su, cu := math.Sincos(u)
			// θ = (u + φ)/2; cos 2θ = cos(u + φ), sin 2θ = sin(u + φ).
			c2 := cu*g.CosPhi - su*g.SinPhi
			s2 := su*g.CosPhi + cu*g.SinPhi
			x := g.A0 + g.R*cu
			if !(x > 0) {
				continue // round-off at the arc's ends
			}
			// cos 2(θ − α) = cos(u − δ) with δ = 2α − φ.
			cd := c2*r.ca + s2*r.sa
			sd := s2*r.ca - c2*r.sa
			rho := r.norm * math.Exp(r.b*(cd-1))
			// dθ = du/2.
			w := rho * r.q.weights[k] * half / 2
			r.Nodes = append(r.Nodes, planarNode{Weight: w, X: x, Cos2: c2, Sin2: s2,
				DA: 2 * r.b * sd, DB: cd - r.ratio, Theta: (u + g.Phi) / 2})
		}
	}
}

// besselI01e returns e^−b I0(b) and e^−b I1(b) for b ≥ 0: the power series
// below b = 30 and the asymptotic expansion above it (Abramowitz & Stegun
// 1964, 9.6.10 and 9.7.1), both to about 1e-15 relative.
func besselI01e(b float64) (i0e, i1e float64) {
	if b < 30 {
		// I0 = Σ (b²/4)^k/(k!)², I1 = (b/2) Σ (b²/4)^k/(k!(k+1)!).
		q := b * b / 4
		t0, t1 := 1.0, 1.0
		s0, s1 := 1.0, 1.0
		for k := 1; k < 200; k++ {
			fk := float64(k)
			t0 *= q / (fk * fk)
			t1 *= q / (fk * (fk + 1))
			s0 += t0
			s1 += t1
			if t0 < 1e-17*s0 && t1 < 1e-17*s1 {
				break
			}
		}
		e := math.Exp(-b)
		return s0 * e, b / 2 * s1 * e
	}
	// I_ν(b) e^−b ~ (2πb)^−½ Σ_k (−1)^k a_k(ν)/b^k with
	// a_k(ν) = (4ν² − 1)(4ν² − 9)…(4ν² − (2k−1)²)/(k! 8^k).
	pre := 1 / math.Sqrt(2*math.Pi*b)
	asym := func(mu float64) float64 {
		s, t := 1.0, 1.0
		for k := 1; k < 30; k++ {
			odd := float64(2*k - 1)
			next := -t * (mu - odd*odd) / (float64(k) * 8 * b)
			if math.Abs(next) > math.Abs(t) {
				break // the series has started to diverge
			}
			t = next
			s += t
			if math.Abs(t) < 1e-17*math.Abs(s) {
				break
			}
		}
		return s
	}
	return pre * asym(0), pre * asym(4)
}

// planarBases returns F 1 Fᵀ = B, F D_c Fᵀ and F D_s Fᵀ (in-plane, as
// (11, 22, 12)): a planar family's Cauchy stress per unit weight is
// M0·B + Mc·F D_c Fᵀ + Ms·F D_s Fᵀ.
func planarBases(F *[4]float64) (b0, bc, bs Sym) {
	f11, f12, f21, f22 := F[0], F[1], F[2], F[3]
	b0 = Sym{f11*f11 + f12*f12, f21*f21 + f22*f22, f11*f21 + f12*f22}
	bc = Sym{f11*f11 - f12*f12, f21*f21 - f22*f22, f11*f21 - f12*f22}
	bs = Sym{2 * f11 * f12, 2 * f21 * f22, f11*f22 + f12*f21}
	return
}

// familyKinks appends the kinks of every term on family f of m to buf.
func familyKinks(m *Model, f int, buf []float64) []float64 {
	for i := range m.Terms {
		t := &m.Terms[i]
		if t.Family != f {
			continue
		}
		k, n := t.Shape.Kinks(t.Params)
		buf = append(buf, k[:n]...)
	}
	return buf
}

// planarMoments integrates a fibre shape's f′ (and f, for the energy) over
// the directions of a built rule: M = ∫ ρ f′ (1, cos 2θ, sin 2θ) dθ and
// E = ∫ ρ f dθ. An overflowing shape gives +Inf moments.
func planarMoments(r *planarRule, t *Term) (m [3]float64, energy float64) {
	for _, nd := range r.Nodes {
		v := t.Shape.Eval(nd.X, t.Params)
		w := nd.Weight
		d := mul0(v.D1, w)
		m[0] += d
		m[1] += mul0(d, nd.Cos2)
		m[2] += mul0(d, nd.Sin2)
		energy += mul0(v.F, w)
	}
	return
}

// planarStress returns a fibre term's Cauchy stress and energy per unit
// weight on a planar family whose rule is built at kinematics k.
func planarStress(r *planarRule, t *Term, k *Kinematics) (Sym, float64) {
	m, e := planarMoments(r, t)
	b0, bc, bs := planarBases(&k.F)
	var s Sym
	for j := range s {
		s[j] = mul0(m[0], b0[j]) + mul0(m[1], bc[j]) + mul0(m[2], bs[j])
	}
	return s, e
}

// fillPlanar fills the columns of every term on planar family f, and their
// derivatives with respect to the family's angle (DAngle), concentration
// (DKappa) and the terms' shape parameters.
func (d *Dataset) fillPlanar(m *Model, f int, c *Columns, derivs bool) {
	if c.scan != nil && !derivs {
		d.fillPlanarScan(m, f, c)
		return
	}
	rows, nc := d.Rows(), len(d.out.Components)
	fam := &m.Families[f]
	c.kinks = familyKinks(m, f, c.kinks[:0])
	c.famTerms = c.famTerms[:0]
	for t := range m.Terms {
		if m.Terms[t].Family == f && (c.Skip == nil || !c.Skip[t]) {
			c.famTerms = append(c.famTerms, t)
		}
	}
	if len(c.famTerms) == 0 {
		return
	}
	geom, pbase := d.planarData()
	for i := range d.kin {
		r0 := i * nc
		c.rule.build(c.quadrature(), &geom[i], fam.Angle, fam.Concentration, c.kinks, familySteepness(m, f, &geom[i]))
		pb := pbase[3*r0 : 3*(r0+nc)]
		b0, bc, bs := pb[:nc], pb[nc:2*nc], pb[2*nc:]
		for _, t := range c.famTerms {
			term := &m.Terms[t]
			own := derivs && c.wantsDerivs(t)
			base := t*rows + r0
			a := c.A[base : base+nc]
			np := len(term.Shape.Params)
			// Moments of f′ and of its derivatives: [0] value, [1] angle,
			// [2] concentration, [3+j] shape parameter j.
			var mom [3 + terms.MaxParams][3]float64
			over := false
			for _, nd := range c.rule.Nodes {
				var d1 float64
				var g [terms.MaxParams]float64
				if derivs {
					// In a fill with derivatives a term's column is
					// formed as its derivatives' fill forms it, whether or
					// not its own derivatives are asked for, so that the
					// column does not depend on it.
					d1, g = term.Shape.SlopeGrad(nd.X, term.Params)
				} else {
					d1 = term.Shape.Slope(nd.X, term.Params)
				}
				if math.IsInf(d1, 0) || math.IsNaN(d1) {
					over = true
					break
				}
				w := nd.Weight * d1
				mom[0][0] += w
				mom[0][1] += w * nd.Cos2
				mom[0][2] += w * nd.Sin2
				if !own {
					continue
				}
				wa, wb := w*nd.DA, w*nd.DB
				mom[1][0] += wa
				mom[1][1] += wa * nd.Cos2
				mom[1][2] += wa * nd.Sin2
				mom[2][0] += wb
				mom[2][1] += wb * nd.Cos2
				mom[2][2] += wb * nd.Sin2
				for j := 0; j < np; j++ {
					wg := nd.Weight * g[j]
					mom[3+j][0] += wg
					mom[3+j][1] += wg * nd.Cos2
					mom[3+j][2] += wg * nd.Sin2
				}
			}
			if over {
				// The column overflows; a fitter treats it as infeasible.
				for j := range a {
					a[j] = mul0(math.Inf(1), b0[j]+bc[j]+bs[j])
				}
				if own {
					c.clearDerivs(base, nc, np)
				}
				continue
			}
			comb := func(mm *[3]float64, dst []float64) {
				for j := range dst {
					dst[j] = mm[0]*b0[j] + mm[1]*bc[j] + mm[2]*bs[j]
				}
			}
			comb(&mom[0], a)
			if !own {
				continue
			}
			comb(&mom[1], c.DAngle[base:base+nc])
			comb(&mom[2], c.DKappa[base:base+nc])
			for j := 0; j < np; j++ {
				comb(&mom[3+j], c.DParam[j][base:base+nc])
			}
		}
	}
}

// addPlanar adds a fibre term on a planar family to the tangent: the
// integral over the stretched directions of the ideal family's energy,
// stress and tangent (no boundary terms: f and f′ vanish at the arc's ends).
func (t *Tangent) addPlanar(r *planarRule, term *Term, q *invariantJets) error {
	for _, nd := range r.Nodes {
		I4, I5, K := q.fibreJets(nd.Theta)
		x, on := argJet(terms.Fibre, 0, q, &I4, &I5, &K)
		if !on {
			continue
		}
		v := term.Shape.Eval(x.v, term.Params)
		if math.IsInf(v.F, 0) || math.IsInf(v.D1, 0) || math.IsInf(v.D2, 0) || math.IsNaN(v.D2) {
			return fmt.Errorf("not finite at F = %v: overflowing far beyond the fitted range", q.u)
		}
		w := term.Weight * nd.Weight
		t.Energy += w * v.F
		for a := range t.P {
			t.P[a] += w * v.D1 * x.g[a]
			for b := range t.A[a] {
				t.A[a][b] += w * (v.D2*x.g[a]*x.g[b] + v.D1*x.h[a][b])
			}
		}
	}
	return nil
}

// familySteepness returns the largest log-slope f″/f′ of the fibre terms of
// family f at the most stretched direction of geometry g, where the
// integrand peaks: it sets how finely the quadrature resolves that peak.
func familySteepness(m *Model, f int, g *planarGeom) float64 {
	x := g.A0 + g.R
	if !(x > 0) {
		return 0
	}
	s := 0.0
	for i := range m.Terms {
		t := &m.Terms[i]
		if t.Family != f {
			continue
		}
		v := t.Shape.Eval(x, t.Params)
		if v.D1 > 0 && !math.IsInf(v.D2, 0) {
			s = math.Max(s, v.D2/v.D1)
		}
	}
	return s
}

// quadrature returns the planar rule the columns are filled with.
func (c *Columns) quadrature() *quadRule {
	if c.Search {
		return searchRule
	}
	return accurateRule
}

// planarScan caches, for a coarse angle scan, each point's directions
// (from scanRule, independent of the model) and each term's slope at
// them: during a scan only the families' angles change.
type planarScan struct {
	rules  []planarRule // per point
	slopes [][]float64  // per term: per point, per direction
	start  [][]int      // per term: offset of each point's slopes
	ready  []bool       // per term
	// weight is scratch: one point's direction weights times the density.
	weight []float64
}

// fillPlanarScan is fillPlanar for a scan (no derivatives): the density
// re-weights cached directions and slopes, once per point for all of the
// family's terms.
func (d *Dataset) fillPlanarScan(m *Model, f int, c *Columns) {
	rows, nc := d.Rows(), len(d.out.Components)
	sc := c.scan
	geom, pbase := d.planarData()
	if sc.rules == nil {
		sc.rules = make([]planarRule, len(d.kin))
		for i := range d.kin {
			sc.rules[i].build(scanRule, &geom[i], 0, 0, nil, 0)
		}
	}
	if len(sc.slopes) < len(m.Terms) {
		sc.slopes = make([][]float64, len(m.Terms))
		sc.start = make([][]int, len(m.Terms))
		sc.ready = make([]bool, len(m.Terms))
	}
	c.famTerms = c.famTerms[:0]
	for t := range m.Terms {
		term := &m.Terms[t]
		if term.Family != f || (c.Skip != nil && c.Skip[t]) {
			continue
		}
		c.famTerms = append(c.famTerms, t)
		if !sc.ready[t] {
			sc.start[t] = make([]int, len(d.kin)+1)
			for i := range d.kin {
				sc.start[t][i+1] = sc.start[t][i] + len(sc.rules[i].Nodes)
			}
			sc.slopes[t] = make([]float64, sc.start[t][len(d.kin)])
			for i := range d.kin {
				for k, nd := range sc.rules[i].Nodes {
					sc.slopes[t][sc.start[t][i]+k] = term.Shape.Slope(nd.X, term.Params)
				}
			}
			sc.ready[t] = true
		}
	}
	if len(c.famTerms) == 0 {
		return
	}
	fam := &m.Families[f]
	norm, _ := density(fam.Concentration)
	ca, sa := math.Cos(2*fam.Angle), math.Sin(2*fam.Angle)
	b := fam.Concentration
	for i := range d.kin {
		r0 := i * nc
		pb := pbase[3*r0 : 3*(r0+nc)]
		b0, bc, bs := pb[:nc], pb[nc:2*nc], pb[2*nc:]
		nodes := sc.rules[i].Nodes
		sc.weight = sc.weight[:0]
		for _, nd := range nodes {
			// The rule was built for b = 0: its weights hold 1/π.
			rho := norm * math.Exp(b*(nd.Cos2*ca+nd.Sin2*sa-1)) * math.Pi
			sc.weight = append(sc.weight, nd.Weight*rho)
		}
		for _, t := range c.famTerms {
			var mom [3]float64
			sl := sc.slopes[t][sc.start[t][i]:sc.start[t][i+1]]
			for k, nd := range nodes {
				w := mul0(sc.weight[k], sl[k])
				mom[0] += w
				mom[1] += w * nd.Cos2
				mom[2] += w * nd.Sin2
			}
			a := c.A[t*rows+r0 : t*rows+r0+nc]
			for j := range a {
				a[j] = mul0(mom[0], b0[j]) + mul0(mom[1], bc[j]) + mul0(mom[2], bs[j])
			}
		}
	}
}

// PlanarDensity returns the factor c of the in-plane density of
// concentration b ≥ 0 written as ρ(θ) = c·exp(b(cos 2(θ − α) − 1)),
// c = e^b/(π I0(b)) (finite for every b: I0 is scaled by e^−b), and its
// mean resultant r = ∫ρ cos 2(θ − α) dθ = I1(b)/I0(b). An independent
// implementation of the density can use them.
func PlanarDensity(b float64) (factor, r float64) { return density(b) }
