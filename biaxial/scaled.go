package biaxial

// WithStressScaled returns a copy of s whose stress component c is scaled
// by f at every point of every protocol, and in each protocol's Preload
// and Tare (read by the same load cell), weighted again as Prepare weighs
// a file (Weigh): the data a per-axis error of the conversion from load to
// stress would have given — a load cell's calibration, or an effective
// loaded width other than the one measured. s is not modified; the copy
// has no warnings or notices of its own beyond those of weighing.
func (s *Specimen) WithStressScaled(c Component, f float64) *Specimen {
	out := *s
	out.Warnings, out.Notices = nil, nil
	out.Protocols = make([]Protocol, len(s.Protocols))
	for i := range s.Protocols {
		pr := s.Protocols[i]
		pr.Points = append([]Point(nil), pr.Points...)
		for k := range pr.Points {
			pr.Points[k].Stress[c] *= f
		}
		pr.Preload[c] *= f
		pr.Tare[c] *= f
		out.Protocols[i] = pr
	}
	out.Weigh()
	return &out
}
