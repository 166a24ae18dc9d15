package aniso

// Discovery's last stage (see Discover): the chosen model refitted on
// every point, accurately, with its angle profiles.

// polish refits the chosen model on every point with the default
// tolerance and the accurate quadrature, with its angle profiles, and
// fills the one-protocol cross matrix.
func (s *search) polish() {
	best := s.d.Best()
	prof := s.set.Fit
	prof.Profile = true
	prof.Init = best.Result.Params()
	prof.NoScan = true
	if r, err := Fit(s.all, activeStructure(best.Result), prof); err == nil {
		// The polish fits more points and integrates dispersion accurately,
		// so the loss may move either way; a lower one always replaces.
		if activeTerms(r) == best.Terms && (r.Structure.Planar || s.p != s.all || r.Loss <= best.Result.Loss*(1+1e-9)) {
			best.Searched, best.Result = best.Result, r
		} else {
			best.Result.Profiles = r.Profiles
		}
	}
	s.d.CrossR2 = crossMatrix(s.p, best.Result, s.fitSet, s.pl)
}
