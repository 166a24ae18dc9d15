package aniso

// Discovery's fifth stage (see Discover): the best ideal two-family models
// refitted with their families spread in the plane, and how a spread or
// coincident model reduces to a simpler searched form.

import (
	"fmt"
	"math"
)

// planarVariants refits, with the families spread in the plane, the best
// model of every size of each ideal two-family layout whose BIC is within
// cvBICWindow of that layout's best, warm-started from the ideal fit; not
// one whose families coincide (one family: the one-family spread form is
// searched on its own).
func (s *search) planarVariants() {
	bm := s.bestBySize()
	var round []*refit
	for i, f := range s.forms {
		base, ok := s.variantOf[i]
		if !ok {
			continue
		}
		minBIC := math.Inf(1)
		for size := 1; size <= s.set.MaxTerms; size++ {
			if r, ok := bm[sizeKey{base, size}]; ok {
				minBIC = math.Min(minBIC, r.BIC)
			}
		}
		n, same := 0, 0
		for size := 1; size <= s.set.MaxTerms; size++ {
			r, ok := bm[sizeKey{base, size}]
			if !ok || r.BIC-minBIC > cvBICWindow {
				continue
			}
			if coincident(r) && s.hasForm(Structure{Layout: LayoutSingle, Planar: true}) {
				// Two families that point the same way are one family, and
				// so is their spread variant: the one-family spread form
				// is searched on its own.
				same++
				continue
			}
			st, ok := planarVariant(activeStructure(r))
			if !ok {
				continue
			}
			round = append(round, &refit{form: i, st: st, init: r.Params()})
			n++
		}
		note := fmt.Sprintf("%s: the best model of each size of the %s layout within ΔBIC 10 of its best (%d) refitted with its families spread in the plane (concentration learned)", formName(f), f.Layout, n)
		if same > 0 {
			note += fmt.Sprintf("; %d more left out because their two families point the same way (within 2°), which is one family", same)
		}
		s.d.Search = append(s.d.Search, note)
	}
	s.runRefits(round)
}

// hasForm reports whether st's form (layout, spread, dispersion) is
// searched.
func (s *search) hasForm(st Structure) bool {
	for _, f := range s.forms {
		if f.Layout == st.Layout && f.Planar == st.Planar && f.Dispersion == st.Dispersion {
			return true
		}
	}
	return false
}

// simplerForm returns the searched form whose model r is with parameters
// more, if there is one: a spread model with every family at the
// concentration bound is its ideal layout's (spreadAtBound), two families
// within 2° are one family's, spread or not as r is (coincident). Such a
// model is neither cross-validated nor grown: the simpler form speaks for
// it.
func (s *search) simplerForm(r *Result) (Structure, bool) {
	var f Structure
	switch {
	case spreadAtBound(r):
		f = Structure{Layout: r.Structure.Layout}
	case coincident(r):
		f = Structure{Layout: LayoutSingle, Planar: r.Structure.Planar, Dispersion: r.Structure.Dispersion}
	default:
		return Structure{}, false
	}
	return f, s.hasForm(f)
}

// spreadAtBound reports whether r spreads its families in the plane with
// every concentration at FitMaxConcentration: a spread form's model that
// the data drove back to the ideal family.
func spreadAtBound(r *Result) bool {
	if !r.Structure.Planar || len(r.Model.Families) == 0 {
		return false
	}
	for _, f := range r.Model.Families {
		if f.Concentration < FitMaxConcentration {
			return false
		}
	}
	return true
}
