package biaxial

import "fmt"

// InStressUnit returns a copy of s with every stress, tare and residual
// weight converted to the stress unit u (Pa, kPa or MPa), so that
// specimens tested in different units can be fitted and compared in one.
// s itself is left unchanged; when s is already in u it is returned as is.
func (s *Specimen) InStressUnit(u string) (*Specimen, error) {
	to, ok := CanonicalStressUnit(u)
	if !ok {
		return nil, fmt.Errorf("%q is not a stress unit; use Pa, kPa or MPa", u)
	}
	k, ok := StressFactor(s.StressUnit, to)
	if !ok {
		return nil, fmt.Errorf("%s: stress unit %q cannot be converted to %s", s.Name, s.StressUnit, to)
	}
	if s.StressUnit == to {
		return s, nil
	}
	c := *s
	c.StressUnit = to
	c.Protocols = make([]Protocol, len(s.Protocols))
	for i, pr := range s.Protocols {
		pr.Points = append([]Point(nil), pr.Points...)
		for j := range pr.Points {
			for k2 := range pr.Points[j].Stress {
				pr.Points[j].Stress[k2] *= k
			}
		}
		for k2 := range pr.Weight {
			// A weight is per stress unit: (w/k)·(k·σ) keeps every residual.
			pr.Weight[k2] /= k
			pr.Tare[k2] *= k
		}
		c.Protocols[i] = pr
	}
	c.Notices = append(append([]string(nil), s.Notices...), fmt.Sprintf("stresses converted from %s to %s", s.StressUnit, to))
	return &c, nil
}
