package aniso

// Discovery's last stage (see Discover): the chosen model refitted on
// every point, accurately, with its angle profiles.

// polish refits the chosen model on every point with the default
// tolerance and the accurate quadrature, with its angle profiles, and
// fills the one-protocol cross matrix. A free pair of families is
// relabelled into the family order first (familyorder.go), so that the
// polished estimates and profiles carry the reported labels.
func (s *search) polish() {
	best := s.d.Best()
	prof := s.set.Fit
	prof.Profile = true
	prof.NoScan = true
	fit := func(swap bool) (*Result, error) {
		st, init := activeStructure(best.Result), best.Result.Params()
		if swap {
			st, init = swapFamilies(st, init)
		}
		prof.Init = init
		return Fit(s.all, st, prof)
	}
	// The polish fits more points and integrates dispersion accurately,
	// so the loss may move either way; a lower one always replaces.
	swap := familiesOutOfOrder(best.Result)
	better := func(r *Result) bool {
		noWorse := r.Loss <= best.Result.Loss*(1+1e-9) || swap && noWorseRelabelled(r, best.Result)
		return activeTerms(r) == best.Terms && (r.Structure.Planar || s.p != s.all || noWorse)
	}
	r, err := fit(swap)
	if swap && (err != nil || !better(r)) {
		// Relabelled, the polish did not replace the searched model; its
		// profiles would carry the other labels, so polish as labelled.
		swap = false
		r, err = fit(false)
	}
	if err == nil {
		if better(r) {
			best.Searched, best.Result = best.Result, r
			s.d.noteRefittedAnswer(best)
		} else {
			best.Result.Profiles = r.Profiles
		}
	}
	s.d.formAngleFlag(s.p.HasShear)
	s.d.CrossR2 = crossMatrix(s.p, best.Result, s.fitSet, s.pl)
}
