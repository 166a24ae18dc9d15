package aniso

// Discovery's first stage (see Discover): every searched form fitted with
// the whole candidate set, the classical presets beside them.

// fitFullForms fits the whole candidate set of every searched form, and
// the classical presets beside them: the presets do not depend on the
// search, and in a round of their own they would leave a worker idle
// while the dearest one finished (comparePresets records them).
func (s *search) fitFullForms() {
	s.full = make([]*Result, len(s.forms))
	s.fullErr = make([]error, len(s.forms))
	var jobs []func()
	var cost []float64
	for i, f := range s.forms {
		if _, ok := s.variantOf[i]; ok {
			s.fullErr[i] = errVariant
			continue
		}
		st := fullStructure(s.set.Shapes, f)
		jobs = append(jobs, func() {
			s.full[i], s.fullErr[i] = Fit(s.p, st, s.fitSet)
		})
		cost = append(cost, fitCost(st))
	}
	s.presets = make([]*Result, len(s.set.Presets))
	for i, name := range s.set.Presets {
		st, err := PresetStructure(name)
		if err != nil {
			continue
		}
		jobs = append(jobs, func() {
			if r, err := Fit(s.p, st, s.fitSet); err == nil {
				s.presets[i] = r
			}
		})
		cost = append(cost, fitCost(st))
	}
	s.pl.runDearFirst(jobs, cost)
}

// fitCost estimates the relative cost of fitting st, for scheduling
// only: a column per term and point, a spread family's about twenty
// quadrature directions per point, two families' angles doubling the
// iterations and scans.
func fitCost(st Structure) float64 {
	c := 1.0
	for _, t := range st.Terms {
		c++
		if t.Family >= 0 && st.Planar {
			c += 20
		}
	}
	if st.Layout.Families() == 2 {
		c *= 2
	}
	return c
}

// runRefits fits each refit's form, warm-started, drops the terms the
// data do not support (withoutDegenerate) and records the refits.
func (s *search) runRefits(rs []*refit) {
	var jobs []func()
	var cost []float64
	for _, rf := range rs {
		jobs = append(jobs, func() {
			set := s.fitSet
			set.Init, set.NoScan = rf.init, !rf.scan
			if r, err := Fit(s.p, rf.st, set); err == nil {
				rf.res = withoutDegenerate(s.p, r, set)
			}
		})
		cost = append(cost, fitCost(rf.st))
	}
	s.pl.runDearFirst(jobs, cost)
	s.refits = append(s.refits, rs...)
}
