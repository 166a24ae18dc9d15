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
	// points (dimensionless).
	Stretch1 Interval `json:"stretch_1"`
	Stretch2 Interval `json:"stretch_2"`
	// Shear is the [min, max] of F12 and F21 together (zero for pure
	// biaxial data).
	Shear Interval `json:"shear"`
	// FibreStretch is the [min, max] of the fibre stretch √I4 per family,
	// in families order.
	FibreStretch []Interval `json:"fibre_stretch,omitempty"`
	// StressKind is "cauchy" or "nominal", the measure the fit used.
	StressKind string `json:"stress_kind,omitempty"`
}

// NewDataRange is the span of the fitted data of p, with the fibre stretch
// of every family of m.
func NewDataRange(p *aniso.Problem, m *aniso.Model) *DataRange {
	dr := &DataRange{Stretch1: empty, Stretch2: empty, Shear: empty, StressKind: p.Specimen.Kind.String()}
	dr.FibreStretch = make([]Interval, len(m.Families))
	for i := range dr.FibreStretch {
		dr.FibreStretch[i] = empty
	}
	for i := 0; i < p.Data.Points(); i++ {
		k := p.Data.Kinematics(i)
		F := k.F
		dr.Stretch1.widen(F[0])
		dr.Stretch2.widen(F[3])
		dr.Shear.widen(F[1])
		dr.Shear.widen(F[2])
		for f, fam := range m.Families {
			dr.FibreStretch[f].widen(fibreStretch(k, fam))
		}
	}
	return dr
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
// range: F11, F22, the shears F12 and F21, and the fibre stretch √I4 of
// each family of m, e.g. "F11 = 1.3 outside [1, 1.2]". It is empty when F
// lies inside.
func (dr *DataRange) Outside(m *aniso.Model, F [4]float64) []string {
	var out []string
	check := func(name string, v float64, r Interval) {
		if r.Outside(v, v) {
			out = append(out, fmt.Sprintf("%s = %.6g outside [%.6g, %.6g]", name, v, r[0], r[1]))
		}
	}
	check("F11", F[0], dr.Stretch1)
	check("F22", F[3], dr.Stretch2)
	check("F12", F[1], dr.Shear)
	check("F21", F[2], dr.Shear)
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
	for _, p := range []struct {
		name string
		v    Interval
	}{{"stretch_1", dr.Stretch1}, {"stretch_2", dr.Stretch2}, {"shear", dr.Shear}} {
		if !(p.v[0] <= p.v[1]) {
			return errAt("$.data_range."+p.name, "[%g, %g] is not a [min, max] pair", p.v[0], p.v[1])
		}
	}
	return nil
}
