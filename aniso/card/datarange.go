package card

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/aniso"
)

// RangeTolerance absorbs round-off when a deformation is compared with a
// data range (dimensionless).
const RangeTolerance = 1e-9

// Interval is the closed range [min, max] of one quantity.
type Interval [2]float64

// Outside reports whether the span [lo, hi] reaches beyond iv by more than
// RangeTolerance; a single value is the span [v, v].
func (iv Interval) Outside(lo, hi float64) bool {
	return lo < iv[0]-RangeTolerance || hi > iv[1]+RangeTolerance
}

// widen stretches iv to include v.
func (iv *Interval) widen(v float64) { iv[0], iv[1] = math.Min(iv[0], v), math.Max(iv[1], v) }

// empty is the interval that widen fills.
var empty = Interval{math.Inf(1), math.Inf(-1)}

// DataRange is the span of the data a model was fitted to, stored in a
// fitted card under the key "data_range". Queries outside it extrapolate.
type DataRange struct {
	// Stretch1 and Stretch2 are the [min, max] of F11 and F22 over the kept
	// points and the reference state (1) (dimensionless).
	Stretch1 Interval `json:"stretch_1"`
	Stretch2 Interval `json:"stretch_2"`
	// Shear is the [min, max] of F12 and F21 together (zero for pure
	// biaxial data). Cards of this version also give each component apart
	// (Shear12, Shear21), which is what Outside tests.
	Shear Interval `json:"shear"`
	// Shear12 and Shear21 are the [min, max] of F12 and of F21 apart,
	// each including 0 when the fitted data hold an unsheared point
	// (|F12| and |F21| at most UnshearedTolerance); nil in cards written
	// before they were added, which then use Shear for both (ShearRanges).
	Shear12 *Interval `json:"shear_12,omitempty"`
	Shear21 *Interval `json:"shear_21,omitempty"`
	// FibreStretch is the [min, max] of the fibre stretch √I4 per family,
	// in families order, over the kept points and the reference state (1).
	FibreStretch []Interval `json:"fibre_stretch,omitempty"`
	// StressKind is "cauchy" or "nominal", the measure the fit used.
	StressKind string `json:"stress_kind,omitempty"`
}

// UnshearedTolerance is the largest |F12| and |F21| of a point counted as
// unsheared (dimensionless): round-off, far below what markers resolve.
const UnshearedTolerance = 1e-6

// NewDataRange is the span of the fitted data of p, with the fibre stretch
// of every family of m.
func NewDataRange(p *aniso.Problem, m *aniso.Model) *DataRange {
	dr := &DataRange{Stretch1: empty, Stretch2: empty, Shear: empty, StressKind: p.Specimen.Kind.String()}
	s12, s21 := empty, empty
	dr.FibreStretch = make([]Interval, len(m.Families))
	for i := range dr.FibreStretch {
		dr.FibreStretch[i] = empty
	}
	for i := 0; i < p.Data.Points(); i++ {
		k := p.Data.Kinematics(i)
		F := k.F
		dr.Stretch1.widen(F[0])
		dr.Stretch2.widen(F[3])
		s12.widen(F[1])
		s21.widen(F[2])
		if math.Abs(F[1]) <= UnshearedTolerance && math.Abs(F[2]) <= UnshearedTolerance {
			s12.widen(0)
			s21.widen(0)
		}
		for f, fam := range m.Families {
			dr.FibreStretch[f].widen(fibreStretch(k, fam))
		}
	}
	// The reference state F = I, where every model's stress is zero by
	// construction, bounds the tested span: a test runs from it to its
	// peak, and the first kept point (1.005, say) lies just above it. Left
	// out, a strip row with F22 = 1 read as outside a fitted F22 range of
	// [1.005, 1.15] (18 of demo M1's verification rows, inside otherwise).
	dr.Stretch1.widen(1)
	dr.Stretch2.widen(1)
	for f := range dr.FibreStretch {
		dr.FibreStretch[f].widen(1)
	}
	dr.Shear12, dr.Shear21 = &s12, &s21
	dr.Shear = s12
	dr.Shear.widen(s21[0])
	dr.Shear.widen(s21[1])
	return dr
}

// Include widens dr to span o as well: the range of two data sets fitted
// by one model (a cohort's mean card spans every specimen it averages).
// Both must have been made by NewDataRange for models with as many
// families.
func (dr *DataRange) Include(o *DataRange) {
	span := func(a *Interval, b Interval) { a.widen(b[0]); a.widen(b[1]) }
	span(&dr.Stretch1, o.Stretch1)
	span(&dr.Stretch2, o.Stretch2)
	span(&dr.Shear, o.Shear)
	if dr.Shear12 != nil && o.Shear12 != nil {
		span(dr.Shear12, *o.Shear12)
	}
	if dr.Shear21 != nil && o.Shear21 != nil {
		span(dr.Shear21, *o.Shear21)
	}
	for f := range dr.FibreStretch {
		if f < len(o.FibreStretch) {
			span(&dr.FibreStretch[f], o.FibreStretch[f])
		}
	}
}

// ShearRanges returns the ranges of F12 and F21: Shear12 and Shear21, or
// for a card without them the pooled Shear for both.
func (dr *DataRange) ShearRanges() (f12, f21 Interval) {
	f12, f21 = dr.Shear, dr.Shear
	if dr.Shear12 != nil {
		f12 = *dr.Shear12
	}
	if dr.Shear21 != nil {
		f21 = *dr.Shear21
	}
	return f12, f21
}

// fibreStretch is the stretch √I4 of family f under the kinematics k.
func fibreStretch(k *aniso.Kinematics, f aniso.Family) float64 { return math.Sqrt(k.Fibre(f.Angle).I4) }

// FibreStretchSpans returns, for each family of m, the [min, max] of its
// fibre stretch over the deformations Fs; deformations whose kinematics
// cannot be formed are passed over.
func FibreStretchSpans(m *aniso.Model, Fs [][4]float64) []Interval {
	out := make([]Interval, len(m.Families))
	for i := range out {
		out[i] = empty
	}
	for _, F := range Fs {
		k, err := aniso.NewKinematics(F)
		if err != nil {
			continue
		}
		for i, f := range m.Families {
			out[i].widen(fibreStretch(&k, f))
		}
	}
	return out
}

// HasFibreStretch reports whether the range bounds the fibre stretch of
// every family of m (a hand-written card may have none).
func (dr *DataRange) HasFibreStretch(m *aniso.Model) bool {
	return len(dr.FibreStretch) == len(m.Families)
}

// Outside lists every quantity of the deformation F that lies outside the
// range: F11, F22, the shears F12 and F21 (each against its own range,
// ShearRanges), and the fibre stretch √I4 of each family of m, e.g.
// "F11 = 1.3 outside [1, 1.2]". It is empty when F lies inside. It is the
// one test of "inside the fitted data range" of a deformation that every
// command uses; planning judges a planned test's whole path against the
// tested stretches with a margin instead (aniso.ExtrapolationMargin).
func (dr *DataRange) Outside(m *aniso.Model, F [4]float64) []string {
	var out []string
	check := func(name string, v float64, r Interval) {
		if r.Outside(v, v) {
			out = append(out, fmt.Sprintf("%s = %.6g outside [%.6g, %.6g]", name, v, r[0], r[1]))
		}
	}
	f12, f21 := dr.ShearRanges()
	check("F11", F[0], dr.Stretch1)
	check("F22", F[3], dr.Stretch2)
	check("F12", F[1], f12)
	check("F21", F[2], f21)
	if dr.HasFibreStretch(m) {
		k, err := aniso.NewKinematics(F)
		if err == nil {
			for i, f := range m.Families {
				check("fibre stretch of "+f.Name, fibreStretch(&k, f), dr.FibreStretch[i])
			}
		}
	}
	return out
}

// Validate checks that every interval is a [min, max] pair; the error's
// path names the first that is not.
func (dr *DataRange) Validate() error {
	f12, f21 := dr.ShearRanges()
	for _, p := range []struct {
		name string
		v    Interval
	}{{"stretch_1", dr.Stretch1}, {"stretch_2", dr.Stretch2}, {"shear", dr.Shear}, {"shear_12", f12}, {"shear_21", f21}} {
		if !(p.v[0] <= p.v[1]) {
			return errAt("$.data_range."+p.name, "[%g, %g] is not a [min, max] pair", p.v[0], p.v[1])
		}
	}
	return nil
}
