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
	// Data holds the kinematics; its rows are weighted with RowWeight.
	Data *Dataset
	// Target is the weighted measured stress of every row (RowWeight ×
	// measured); Measured the unweighted value in the specimen's stress unit.
	Target, Measured, RowWeight []float64
	// RowProtocol and RowComponent give each row's protocol (index into
	// Specimen.Protocols) and component; RowPoint the point within it.
	RowProtocol, RowPoint []int
	RowComponent          []Component
	// HasShear is true when the data carry shear information, so that a
	// fibre angle's sign is identifiable (package documentation, Mirror
	// symmetry).
	HasShear bool
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
	p := &Problem{Specimen: s, Protocols: protocols, HasShear: s.HasShear}
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
			F = append(F, pt.F)
			for _, c := range p.Output.Components {
				w := pr.Weight[c]
				v := pt.Stress[c]
				if math.IsNaN(v) || math.IsInf(v, 0) || math.IsNaN(w) || math.IsInf(w, 0) || w < 0 {
					return nil, fmt.Errorf("%s, protocol %s, line %d: stress %g or weight %g is not usable", s.Name, pr.Label, pt.Line, v, w)
				}
				p.RowWeight = append(p.RowWeight, w)
				p.Measured = append(p.Measured, v)
				p.Target = append(p.Target, w*v)
				p.RowProtocol = append(p.RowProtocol, pi)
				p.RowPoint = append(p.RowPoint, j)
				p.RowComponent = append(p.RowComponent, c)
			}
		}
	}
	d, err := NewDataset(F, p.Output, p.RowWeight)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", s.Name, err)
	}
	p.Data = d
	return p, nil
}

// Rows returns the number of residual rows.
func (p *Problem) Rows() int { return len(p.Target) }
