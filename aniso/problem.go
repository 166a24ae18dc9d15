package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// Problem is a specimen's data prepared for fitting: the deformations, the
// measured stress components in the measure the file gave, and the residual
// weight of every row, all taken from package biaxial.
type Problem struct {
	// Specimen is the source data; Protocols are the indices of the
	// protocols of Specimen used here (all of them unless a subset was asked
	// for, e.g. for leave-one-protocol-out cross-validation).
	Specimen  *biaxial.Specimen
	Protocols []int
	// Output says which stress measure and components each point's rows hold.
	Output Output
	// Data holds the kinematics; its rows are weighted with the canonical
	// row weights RowWeight × Scale (dimensionless, see below).
	Data *Dataset
	// Target is the weighted measured stress of every row (RowWeight ×
	// measured, dimensionless); Measured the unweighted value in the
	// specimen's stress unit; RowWeight the residual weight in 1/stress
	// unit, as package biaxial gives it.
	Target, Measured, RowWeight []float64
	// Scale (stress unit) is 1 / the largest row weight: the fitter works
	// in a canonical form that does not depend on the stress unit, with
	// row weights RowWeight × Scale in (0, 1] and targets, both rounded to
	// canonicalBits significant bits, and its weights come out divided by
	// Scale. The same data in Pa, kPa or MPa, or scaled by any factor, then
	// give the fitter the same numbers bit for bit (but where a value lies
	// within rounding of a bit boundary, about one value in 10⁶), so that
	// the same model is chosen whatever the unit.
	Scale float64
	// RowProtocol and RowComponent give each row's protocol (index into
	// Specimen.Protocols) and component; RowPoint the point within it.
	RowProtocol, RowPoint []int
	RowComponent          []Component
	// HasShear is true when the data carry shear information, so that a
	// fibre angle's sign is identifiable (package documentation, Mirror
	// symmetry).
	HasShear bool
	// ShearTakenAsZero is true when the specimen's F12 and F21 lie within
	// their scatter of zero (biaxial.Specimen.ShearWithinScatter): the
	// fit's kinematics then use F12 = F21 = 0, so that every stress is
	// even in a fibre angle's sign as the symmetry without shear
	// information assumes.
	ShearTakenAsZero bool
}

// NewProblem prepares a specimen for fitting. protocols selects the
// protocols to use by index; nil means all.
func NewProblem(s *biaxial.Specimen, protocols []int) (*Problem, error) {
	if protocols == nil {
		for i := range s.Protocols {
			protocols = append(protocols, i)
		}
	}
	if len(protocols) == 0 {
		return nil, fmt.Errorf("%s: no protocols to fit", s.Name)
	}
	p := &Problem{Specimen: s, Protocols: protocols, HasShear: s.HasShear, ShearTakenAsZero: s.ShearWithinScatter && !s.HasShear}
	p.Output.Nominal = s.Kind == biaxial.Nominal
	for c := biaxial.C11; c < biaxial.NumComponents; c++ {
		if s.Measured[c] {
			if c == biaxial.C21 && !p.Output.Nominal {
				continue
			}
			p.Output.Components = append(p.Output.Components, Component(c))
		}
	}
	if len(p.Output.Components) == 0 {
		return nil, fmt.Errorf("%s: no measured stress components", s.Name)
	}
	var F [][4]float64
	for _, pi := range protocols {
		if pi < 0 || pi >= len(s.Protocols) {
			return nil, fmt.Errorf("protocol index %d out of range", pi)
		}
		pr := &s.Protocols[pi]
		for j, pt := range pr.Points {
			if p.ShearTakenAsZero {
				pt.F[1], pt.F[2] = 0, 0
			}
			F = append(F, pt.F)
			for _, c := range p.Output.Components {
				w := pr.Weight[c]
				v := pt.Stress[c]
				if math.IsNaN(v) || math.IsInf(v, 0) || math.IsNaN(w) || math.IsInf(w, 0) || w < 0 {
					return nil, fmt.Errorf("%s, protocol %s, line %d: stress %g or weight %g is not usable", s.Name, pr.Label, pt.Line, v, w)
				}
				p.RowWeight = append(p.RowWeight, w)
				p.Measured = append(p.Measured, v)
				p.Target = append(p.Target, roundBits(w*v))
				p.RowProtocol = append(p.RowProtocol, pi)
				p.RowPoint = append(p.RowPoint, j)
				p.RowComponent = append(p.RowComponent, c)
			}
		}
	}
	maxW := 0.0
	for _, w := range p.RowWeight {
		maxW = math.Max(maxW, w)
	}
	if !(maxW > 0) {
		return nil, fmt.Errorf("%s: every residual weight is zero", s.Name)
	}
	p.Scale = 1 / maxW
	rw := make([]float64, len(p.RowWeight))
	for r, w := range p.RowWeight {
		rw[r] = roundBits(w * p.Scale)
	}
	d, err := NewDataset(F, p.Output, rw)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", s.Name, err)
	}
	p.Data = d
	return p, nil
}

// canonicalBits is how many significant bits the fitter's canonical row
// weights and targets keep (see Problem.Scale): about 1e-10 relative, far
// below any measurement's precision.
const canonicalBits = 33

// roundBits rounds x to canonicalBits significant bits.
func roundBits(x float64) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	frac, exp := math.Frexp(x)
	return math.Ldexp(math.Round(math.Ldexp(frac, canonicalBits)), exp-canonicalBits)
}

// Rows returns the number of residual rows.
func (p *Problem) Rows() int { return len(p.Target) }
