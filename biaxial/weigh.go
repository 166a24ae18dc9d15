package biaxial

// Weigh sets the residual weight of every measured component of every
// protocol of s exactly as Prepare does (see Protocol.Weight: UserWeight /
// (stress range · √points), with the guards for shear components, narrow
// normal ranges and constant stress), from the points the protocols hold
// now. It is for specimens assembled in code — a fit's table read back, or
// a planned test with predicted stresses — that must be weighted as a
// file would be. A protocol's UserWeight must be set (0 gives weight 0);
// the warnings about narrow or constant ranges are appended to s.Warnings.
func (s *Specimen) Weigh() {
	for i := range s.Protocols {
		if len(s.Protocols[i].Points) == 0 {
			continue
		}
		weigh(s, &s.Protocols[i])
	}
}
