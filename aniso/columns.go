package aniso

import (
	"fmt"
	"math"
	"sync"

	"github.com/weft-tools/weft/terms"
)

// Component indexes a stress component: 0 = 11, 1 = 22, 2 = 12, 3 = 21.
// For Cauchy output 21 equals 12 and is not offered.
type Component int

// Output chooses the stress measure and the components a Dataset's rows hold.
type Output struct {
	// Nominal selects nominal stress P = σ F⁻ᵀ; otherwise Cauchy stress.
	Nominal bool
	// Components lists the components per point, in row order.
	Components []Component
}

// Dataset is a fixed set of deformations with precomputed kinematics, the
// rows of a least-squares problem. It is read-only once made, so goroutines
// may share it. Row r = i·len(Components) + j holds
// component Components[j] of point i, multiplied by RowWeight[r].
type Dataset struct {
	kin       []Kinematics
	out       Output
	rowWeight []float64
	// b1, b2 are the isotropic stress bases G1, G2 of every row, already in
	// the output measure and weighted: they do not depend on the model.
	b1, b2 []float64
	// tmat maps a Cauchy tensor (11, 22, 12) to the weighted output
	// components of each point: nc×3 entries per point.
	tmat []float64
	// geom is each point's fibre-stretch geometry and pbase its planar
	// stress bases B, F D_c Fᵀ, F D_s Fᵀ in the output measure, weighted:
	// 3·nc entries per point (see planar.go).
	geom  []planarGeom
	pbase []float64
	// pp are the principal stretches and stress bases of every point.
	pp []principalPoint
	// green is what Green-strain terms need of every point (fung.go).
	green []greenPoint
	// geom and pbase, pp, and green are computed on the first fill that
	// needs them (planarData, principalData, greenData), once, whichever
	// goroutine asks first: most models have no spread family,
	// principal-stretch or Green-strain term, and a prediction on every
	// point of a long record builds a dataset of its own.
	planarOnce, ppOnce, greenOnce sync.Once
}

// planarData returns geom and pbase, computing them on first use.
func (d *Dataset) planarData() ([]planarGeom, []float64) {
	d.planarOnce.Do(func() {
		nc := len(d.out.Components)
		d.geom = make([]planarGeom, len(d.kin))
		d.pbase = make([]float64, 3*d.Rows())
		for i := range d.kin {
			k := &d.kin[i]
			d.geom[i] = newPlanarGeom(&k.F)
			b0, bc, bs := planarBases(&k.F)
			for q, s := range [3]Sym{b0, bc, bs} {
				v := d.convert(k, s, i*nc)
				copy(d.pbase[3*i*nc+q*nc:], v[:nc])
			}
		}
	})
	return d.geom, d.pbase
}

// principalData returns pp, computing it on first use.
func (d *Dataset) principalData() []principalPoint {
	d.ppOnce.Do(func() { d.pp = d.principalPoints() })
	return d.pp
}

// greenData returns green, computing it on first use.
func (d *Dataset) greenData() []greenPoint {
	d.greenOnce.Do(func() { d.green = d.greenPoints() })
	return d.green
}

// famBases are one family's stress bases G4, G5 and their angle
// derivatives at one point, in the output measure and weighted.
type famBases struct {
	g4, g5, dg4, dg5 [4]float64
}

// NewDataset precomputes the kinematics of every deformation. rowWeight, if
// non-nil, must have one entry per row and scales that row of every column
// (a fitter's residual weights); nil means 1.
func NewDataset(F [][4]float64, out Output, rowWeight []float64) (*Dataset, error) {
	d := &Dataset{kin: make([]Kinematics, len(F)), out: out}
	if len(out.Components) == 0 || len(out.Components) > 4 {
		return nil, fmt.Errorf("%d output components; give 1 to 4", len(out.Components))
	}
	for _, c := range out.Components {
		if c < 0 || c > 3 || (c == 3 && !out.Nominal) {
			return nil, fmt.Errorf("component %d is not available for this stress measure", c)
		}
	}
	for i, f := range F {
		k, err := NewKinematics(f)
		if err != nil {
			return nil, fmt.Errorf("point %d: %w", i, err)
		}
		d.kin[i] = k
	}
	if rowWeight != nil && len(rowWeight) != d.Rows() {
		return nil, fmt.Errorf("%d row weights for %d rows", len(rowWeight), d.Rows())
	}
	d.rowWeight = rowWeight
	nc := len(out.Components)
	d.tmat = make([]float64, len(F)*nc*3)
	for i := range d.kin {
		for e := 0; e < 3; e++ {
			var unit Sym
			unit[e] = 1
			v := d.convertSlow(&d.kin[i], unit, i*nc)
			for j := 0; j < nc; j++ {
				d.tmat[(i*nc+j)*3+e] = v[j]
			}
		}
	}
	d.b1 = make([]float64, d.Rows())
	d.b2 = make([]float64, d.Rows())
	for i := range d.kin {
		k := &d.kin[i]
		v1, v2 := d.convert(k, k.G1, i*nc), d.convert(k, k.G2, i*nc)
		copy(d.b1[i*nc:], v1[:nc])
		copy(d.b2[i*nc:], v2[:nc])
	}
	return d, nil
}

// Rows returns the number of rows: points × components.
func (d *Dataset) Rows() int { return len(d.kin) * len(d.out.Components) }

// Points returns the number of deformations.
func (d *Dataset) Points() int { return len(d.kin) }

// Kinematics returns the kinematics of point i.
func (d *Dataset) Kinematics(i int) *Kinematics { return &d.kin[i] }

// Columns holds the stress columns of a model over a Dataset. Column k is
// term k's stress per unit weight (times the row weights), so that the
// model's stress is Σ_k w_k · column_k. Storage is column-major: entry (r, k)
// is at k·Rows + r.
type Columns struct {
	Rows, Cols int
	// A holds the columns.
	A []float64
	// DAngle holds ∂column_k/∂α of term k's family angle (per radian; zero
	// for isotropic terms); DKappa ∂column_k/∂κ of its family's dispersion;
	// DParam[j] ∂column_k/∂θ_j of the term's j-th shape parameter, for
	// j < len(term's Params) only (other entries are left as they were).
	// They are filled only when derivatives are asked for.
	DAngle, DKappa []float64
	DParam         [terms.MaxParams][]float64
	// Skip, when non-nil, marks terms whose columns Fill leaves as they are
	// (a caller that knows they have not changed).
	Skip []bool
	// valuesOnly, when non-nil, marks fibre terms whose derivative columns
	// a fill with derivatives leaves as they are (a fitter needs the
	// derivatives of the terms with a positive weight only); isotropic,
	// principal-stretch and Green-strain terms are always filled whole.
	valuesOnly []bool

	// fk, fb are scratch: fibre kinematics and bases per point and family.
	// They live here, not in the Dataset, so that several goroutines can
	// fill their own Columns from one Dataset.
	fk []FibreKinematics
	fb []famBases
	// Search integrates planar families with the cheaper search rule
	// (about 1e-5 relative instead of 1e-8; see planar.go), for fits that
	// are only compared with each other.
	Search bool

	// famData, famFamilies, famAngle, famDerivs and famValid say for which
	// dataset and family angles fk and fb were last computed, and whether
	// with derivatives.
	famData     *Dataset
	famFamilies int
	famAngle    []float64
	famDerivs   []bool
	famValid    []bool
	// famFifth says whether fk and fb hold a family's quantities of I5 and
	// K, computed only for a family with a term in them (see
	// usesFifth).
	famFifth []bool

	// scan, when set, caches planar directions and slopes for a coarse
	// angle scan, whose fills change the families' angles and spreads only
	// (see fillPlanarScan).
	scan *planarScan

	// rule, kinks and famTerms are scratch of planar families.
	rule     planarRule
	kinks    []float64
	famTerms []int
}

// resize makes c hold rows×cols entries, reusing its buffers; with derivs
// it sizes the first nparams parameter-derivative buffers.
func (c *Columns) resize(rows, cols, nparams int, derivs bool) {
	n := rows * cols
	c.Rows, c.Cols = rows, cols
	grow := func(b []float64) []float64 {
		if cap(b) < n {
			return make([]float64, n)
		}
		return b[:n]
	}
	c.A = grow(c.A)
	if derivs {
		c.DAngle = grow(c.DAngle)
		c.DKappa = grow(c.DKappa)
		for j := range nparams {
			c.DParam[j] = grow(c.DParam[j])
		}
	}
}

// wantsDerivs reports whether a fill with derivatives fills term t's.
func (c *Columns) wantsDerivs(t int) bool {
	return c.valuesOnly == nil || !c.valuesOnly[t]
}

// familyBases brings the fibre kinematics and stress bases of every ideal
// family at every point up to date in c (c.fk, c.fb, indexed point × family)
// and returns the kinematics. A family whose angle has not moved since the
// last fill of these columns on this dataset keeps them (a profile
// re-optimises everything but the angle). The quantities of I5 and K are
// computed only for a family with a filled term in them (usesFifth; most
// of a search's refits have none), zero otherwise.
func (d *Dataset) familyBases(m *Model, c *Columns, derivs bool) []FibreKinematics {
	nc, np, nf := len(d.out.Components), len(d.kin), len(m.Families)
	if cap(c.fk) < np*nf {
		c.fk = make([]FibreKinematics, np*nf)
		c.fb = make([]famBases, np*nf)
	}
	fk, fb := c.fk[:np*nf], c.fb[:np*nf]
	fresh := c.famData != d || c.famFamilies != nf
	if fresh {
		c.famData, c.famFamilies = d, nf
		c.famAngle = append(c.famAngle[:0], make([]float64, nf)...)
		c.famDerivs = append(c.famDerivs[:0], make([]bool, nf)...)
		c.famValid = append(c.famValid[:0], make([]bool, nf)...)
		c.famFifth = append(c.famFifth[:0], make([]bool, nf)...)
	}
	var sc [2][2]float64
	var redo, fifth [8]bool
	anyRedo := false
	for f := 0; f < nf; f++ {
		fam := &m.Families[f]
		// Only the first two families take the sin-cos path, with or
		// without the quantities of I5 and K.
		need5 := f >= 2 || usesFifth(m, c, f)
		valid := f < len(redo) && c.famValid[f] && c.famAngle[f] == fam.Angle && (c.famDerivs[f] || !derivs) && (c.famFifth[f] || !need5)
		if f < len(redo) {
			redo[f] = !fam.Planar && !valid
			fifth[f] = need5
		}
		if f < 2 {
			sc[f][0], sc[f][1] = math.Sincos(fam.Angle)
		}
		c.famAngle[f], c.famValid[f] = fam.Angle, !fam.Planar
		if f >= len(redo) || redo[f] {
			c.famDerivs[f], c.famFifth[f] = derivs, need5
			anyRedo = true
		}
	}
	if !anyRedo {
		// Every family keeps its quantities: no pass over the points.
		return fk
	}
	for i := range d.kin {
		k := &d.kin[i]
		for f := 0; f < nf; f++ {
			if f < len(redo) && !redo[f] {
				continue
			}
			q := i*nf + f
			five := f >= len(fifth) || fifth[f]
			switch {
			case f >= 2:
				fk[q] = k.Fibre(m.Families[f].Angle)
			case five:
				fk[q] = k.fibreSC(sc[f][0], sc[f][1])
			default:
				k.fibreSC4(&fk[q], sc[f][0], sc[f][1])
			}
			fb[q].g4 = d.convert(k, fk[q].G4, i*nc)
			fb[q].g5 = [4]float64{}
			if five {
				fb[q].g5 = d.convert(k, fk[q].G5, i*nc)
			}
			if derivs {
				fb[q].dg4 = d.convert(k, fk[q].DG4, i*nc)
				fb[q].dg5 = [4]float64{}
				if five {
					fb[q].dg5 = d.convert(k, fk[q].DG5, i*nc)
				}
			}
		}
	}
	return fk
}

// usesFifth reports whether a term of family f that the fill computes
// (not skipped) is in I5 or K, and so needs the family's quantities of
// them.
func usesFifth(m *Model, c *Columns, f int) bool {
	for t := range m.Terms {
		term := &m.Terms[t]
		if term.Family != f || c.Skip != nil && c.Skip[t] {
			continue
		}
		if term.Shape.Arg.InFifth() {
			return true
		}
	}
	return false
}

// Fill computes the columns of every term of m (weights are ignored) over the
// dataset, and their derivatives when derivs is true. It reuses c's buffers
// and does not allocate once they are large enough. Columns of terms whose
// shape overflows hold ±Inf in the components they drive, never NaN, and
// their derivative columns are zero.
func (d *Dataset) Fill(m *Model, c *Columns, derivs bool) {
	rows, nc, nf := d.Rows(), len(d.out.Components), len(m.Families)
	c.resize(rows, len(m.Terms), maxShapeParams(m), derivs)
	fk := d.familyBases(m, c, derivs)
	for f := range m.Families {
		if m.Families[f].Planar {
			d.fillPlanar(m, f, c, derivs)
		}
	}
	for t := range m.Terms {
		if c.Skip != nil && c.Skip[t] {
			continue
		}
		term := &m.Terms[t]
		if term.Family >= 0 && m.Families[term.Family].Planar {
			continue
		}
		own := derivs && c.wantsDerivs(t)
		col := c.A[t*rows : (t+1)*rows]
		if term.Shape.Arg == terms.Green {
			d.fillGreen(term, col, c, t*rows, derivs)
			continue
		}
		if term.Shape.Arg == terms.Principal {
			d.fillPrincipal(term, col, c, t*rows, derivs)
			continue
		}
		if !term.Shape.Arg.NeedsFamily() {
			d.fillIsotropic(term, col, c, t*rows, derivs)
			continue
		}
		kappa := m.Families[term.Family].Dispersion
		for i := range d.kin {
			k := &d.kin[i]
			q := i*nf + term.Family
			r0 := i * nc
			a := col[r0 : r0+nc]
			s := argument(term.Shape.Arg, kappa, k, &fk[q])
			if !s.Active {
				clear(a)
				if own {
					c.clearDerivs(t*rows+r0, nc, len(term.Params))
				}
				continue
			}
			b1, b2, bases := d.b1[r0:r0+nc], d.b2[r0:r0+nc], &c.fb[q]
			var h [4]float64
			for j := range a {
				h[j] = s.C[0]*b1[j] + s.C[1]*b2[j] + s.C[2]*bases.g4[j] + s.C[3]*bases.g5[j]
			}
			if !own {
				// Without its own derivatives, a term's column in a fill
				// with derivatives is still formed from Eval's f′, as
				// with them, so that it does not depend on which terms'
				// derivatives were asked for.
				var d1 float64
				if derivs {
					d1 = term.Shape.Eval(s.X, term.Params).D1
				} else {
					d1 = term.Shape.Slope(s.X, term.Params)
				}
				for j := range a {
					a[j] = mul0(d1, h[j])
				}
				continue
			}
			d1, d2, g := term.Shape.SlopeCurvGrad(s.X, term.Params)
			for j := range a {
				a[j] = mul0(d1, h[j])
			}
			base := t*rows + r0
			if math.IsInf(d1, 0) || math.IsInf(d2, 0) {
				// The column overflows; a fitter treats it as infeasible.
				c.clearDerivs(base, nc, len(term.Params))
				continue
			}
			sl := slopes(term.Shape.Arg, kappa, k, &fk[q])
			da, dk := d2*sl.DxA, d2*sl.DxK
			for j := range a {
				for p := range term.Params {
					c.DParam[p][base+j] = mul0(g[p], h[j])
				}
				c.DAngle[base+j] = da*h[j] + d1*(sl.DCA[0]*b1[j]+s.C[2]*bases.dg4[j]+s.C[3]*bases.dg5[j])
				c.DKappa[base+j] = dk*h[j] + d1*(sl.DCK[0]*b1[j]+sl.DCK[2]*bases.g4[j])
			}
		}
	}
}

// fillIsotropic fills the column of a term in I1 or I2, whose stress basis is
// precomputed (argument's C is a unit vector on G1 or G2) and which has no
// angle or dispersion derivatives.
func (d *Dataset) fillIsotropic(term *Term, col []float64, c *Columns, off int, derivs bool) {
	nc := len(d.out.Components)
	b := d.b1
	if term.Shape.Arg == terms.I2 {
		b = d.b2
	}
	if derivs {
		clear(c.DAngle[off : off+len(col)])
		clear(c.DKappa[off : off+len(col)])
	}
	for i := range d.kin {
		x := d.kin[i].I1 - 3
		if term.Shape.Arg == terms.I2 {
			x = d.kin[i].I2 - 3
		}
		r0 := i * nc
		h := b[r0 : r0+nc]
		a := col[r0 : r0+nc]
		if !derivs {
			d1 := term.Shape.Slope(x, term.Params)
			for j := range a {
				a[j] = mul0(d1, h[j])
			}
			continue
		}
		d1, _, g := term.Shape.SlopeCurvGrad(x, term.Params)
		if math.IsInf(d1, 0) {
			g = [terms.MaxParams]float64{}
		}
		for j := range a {
			a[j] = mul0(d1, h[j])
			for p := range term.Params {
				c.DParam[p][off+r0+j] = mul0(g[p], h[j])
			}
		}
	}
}

// clearDerivs zeroes n rows from base of the derivative columns, the
// parameter derivatives of the term's nparams parameters included.
func (c *Columns) clearDerivs(base, n, nparams int) {
	clear(c.DAngle[base : base+n])
	clear(c.DKappa[base : base+n])
	for p := range nparams {
		clear(c.DParam[p][base : base+n])
	}
}

// maxShapeParams is the largest number of shape parameters of m's terms.
func maxShapeParams(m *Model) int {
	n := 0
	for i := range m.Terms {
		n = max(n, len(m.Terms[i].Params))
	}
	return n
}

// convert returns the requested components of a finite Cauchy tensor s (as
// nominal stress if asked), scaled by the row weights from row r0, through
// the point's precomputed linear map.
func (d *Dataset) convert(_ *Kinematics, s Sym, r0 int) [4]float64 {
	var out [4]float64
	t := d.tmat[r0*3 : (r0+len(d.out.Components))*3]
	for j := range d.out.Components {
		out[j] = t[3*j]*s[0] + t[3*j+1]*s[1] + t[3*j+2]*s[2]
	}
	return out
}

// convertSlow is convert from first principles (P = σ F⁻ᵀ, then the row
// weights); it builds the linear maps.
func (d *Dataset) convertSlow(k *Kinematics, s Sym, r0 int) [4]float64 {
	var v, out [4]float64
	if d.out.Nominal {
		v = k.Nominal(s)
	} else {
		v = [4]float64{s[0], s[1], s[2], s[2]}
	}
	for j, comp := range d.out.Components {
		x := v[comp]
		if d.rowWeight != nil {
			x *= d.rowWeight[r0+j]
		}
		out[j] = x
	}
	return out
}
