package aniso

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"github.com/weft-tools/weft/terms"
)

// errVariant marks a form that discovery derives from another instead of
// searching it.
var errVariant = errors.New("derived from its ideal layout")

// planarVariant returns a form with its families spread in the plane;
// ok is false when a term cannot sit on such a family (cofactor and I5
// terms).
func planarVariant(st Structure) (Structure, bool) {
	for _, t := range st.Terms {
		if t.Family >= 0 && t.Shape.Arg != terms.Fibre {
			return st, false
		}
	}
	st.Planar = true
	return st, true
}

// formName names a model form for results: the layout, then "+dispersed"
// when the families spread in the plane with a learned concentration, or
// "+kappa" when they have a learned three-dimensional dispersion κ.
func formName(f Structure) string {
	switch {
	case f.Planar:
		return f.Layout.String() + "+dispersed"
	case f.Dispersion:
		return f.Layout.String() + "+kappa"
	}
	return f.Layout.String()
}

// PresetStructure returns the model form of a named preset. A preset's
// mirror pair is held symmetric about axis 1 (Structure.HoldPairAxis), as
// published; clear HoldPairAxis to learn the pair's axis as well.
func PresetStructure(name string) (Structure, error) {
	pr := terms.LookupPreset(name)
	if pr == nil {
		var names []string
		for _, p := range terms.Presets() {
			names = append(names, p.Name)
		}
		return Structure{}, fmt.Errorf("no preset %q; choose one of %s", name, strings.Join(names, ", "))
	}
	// A preset's pair is symmetric about axis 1, as published.
	st := Structure{Dispersion: pr.Dispersion, HoldPairAxis: pr.Mirror}
	switch {
	case pr.Families == 0:
		st.Layout = LayoutNone
	case pr.Families == 1:
		st.Layout = LayoutSingle
	case pr.Mirror:
		st.Layout = LayoutMirror
	default:
		st.Layout = LayoutFree
	}
	for _, t := range pr.Terms {
		sh := terms.Lookup(t.ID)
		if t.Family == 0 {
			st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: -1})
			continue
		}
		if st.Layout == LayoutMirror && t.Family == 2 {
			continue // the mirror pair shares the first family's terms
		}
		st.Terms = append(st.Terms, TermSpec{Shape: sh, Family: t.Family - 1})
	}
	return st, nil
}

func hasTerm(st Structure, t TermSpec) bool {
	for _, u := range st.Terms {
		if u.Shape == t.Shape && u.Family == t.Family {
			return true
		}
	}
	return false
}

// activeStructure is r's form without its inactive terms.
func activeStructure(r *Result) Structure {
	st := r.Structure.withTerms(nil)
	for i, t := range r.Structure.Terms {
		if r.Weights[i] > 0 {
			st.Terms = append(st.Terms, t)
		}
	}
	return st
}

func activeTerms(r *Result) int {
	n := 0
	for _, w := range r.Weights {
		if w > 0 {
			n++
		}
	}
	return n
}

// layoutSatisfied reports whether every family of the layout still has an
// active fibre term (otherwise the fit is really a smaller layout).
func layoutSatisfied(r *Result) bool {
	nf := r.Structure.Layout.Families()
	if r.Structure.Layout == LayoutMirror {
		nf = 1
	}
	for f := 0; f < nf; f++ {
		ok := false
		for i, t := range r.Structure.Terms {
			if t.Family == f && r.Weights[i] > 0 {
				ok = true
			}
		}
		if !ok {
			return false
		}
	}
	return true
}

// Layout is how fibre families are arranged in a model form.
type Layout int

const (
	// LayoutNone has no fibre family: an isotropic model.
	LayoutNone Layout = iota
	// LayoutSingle has one family at a learned angle α.
	LayoutSingle
	// LayoutMirror has two families at θ + β and θ − β sharing every fibre
	// term's weight and parameters (Holzapfel, Gasser & Ogden 2000).
	LayoutMirror
	// LayoutFree has two families at independent angles α1, α2, each with
	// its own fibre terms.
	LayoutFree
)

// String returns "none", "single", "mirror" or "free".
func (l Layout) String() string {
	return [...]string{"none", "single", "mirror", "free"}[l]
}

// Families returns the number of fibre families of the layout.
func (l Layout) Families() int {
	switch l {
	case LayoutNone:
		return 0
	case LayoutSingle:
		return 1
	}
	return 2
}

// TermSpec is one term of a model form: a catalogue shape and, for fibre
// shapes, its family.
type TermSpec struct {
	Shape *terms.Shape
	// Family is −1 for isotropic shapes and 0 or 1 for fibre shapes. In a
	// mirror layout fibre terms use Family 0 and act on both members.
	Family int
}

// Label names the term as in results, e.g. "fib-expsq@f1".
func (t TermSpec) Label(l Layout) string {
	if t.Family < 0 {
		return t.Shape.ID
	}
	if l == LayoutMirror {
		return t.Shape.ID + "@pair"
	}
	return fmt.Sprintf("%s@f%d", t.Shape.ID, t.Family+1)
}

// Structure is a model form to fit: its terms, fibre layout and how the
// families spread about their mean direction.
type Structure struct {
	Terms  []TermSpec
	Layout Layout
	// Dispersion gives each family a learned three-dimensional dispersion
	// κ (Gasser, Ogden & Holzapfel 2006).
	Dispersion bool
	// Planar spreads each family's fibres in the plane with a learned von
	// Mises concentration b (angular integration, see planar.go; a mirror
	// pair shares one b). Only fibre-stretch terms (argument E_f) sit on
	// such families. Dispersion and Planar exclude each other.
	Planar bool
	// HoldPairAxis holds a mirror pair's mean direction θ at 0, so that the
	// families sit at ±β, symmetric about axis 1: the published form of
	// Holzapfel, Gasser & Ogden 2000 and Gasser, Ogden & Holzapfel 2006.
	// Since β ranges over [0°, 90°], a pair symmetric about axis 2 is the
	// same form (θ = 90°, β' = 90° − β). False (the default) learns θ.
	// Only a mirror layout uses it.
	HoldPairAxis bool
}

// withTerms returns the same form (layout and spread) with other terms.
func (s Structure) withTerms(ts []TermSpec) Structure {
	s.Terms = ts
	return s
}

// planarStartConcentration is where a learned concentration b starts: the
// density's standard deviation is then about 14°, between a wide spread
// and an ideal family.
const planarStartConcentration = 4

// Validate checks that the terms fit the layout.
func (s Structure) Validate() error {
	if len(s.Terms) == 0 {
		return errors.New("no terms: give at least one energy term")
	}
	nf := s.Layout.Families()
	fibre := false
	for _, t := range s.Terms {
		if t.Shape == nil {
			return errors.New("a term has no shape")
		}
		if !t.Shape.Arg.NeedsFamily() {
			if t.Family != -1 {
				return fmt.Errorf("%s is isotropic and takes no family", t.Shape.ID)
			}
			continue
		}
		fibre = true
		if nf == 0 {
			return fmt.Errorf("%s is a fibre-family term but the model has no fibre family; ask for 1 or 2 families", t.Shape.ID)
		}
		if t.Family < 0 || t.Family >= nf || (s.Layout == LayoutMirror && t.Family != 0) {
			return fmt.Errorf("%s: family %d does not exist in a %s layout", t.Shape.ID, t.Family, s.Layout)
		}
	}
	if nf > 0 && !fibre {
		fams := "one fibre family"
		if nf > 1 {
			fams = fmt.Sprintf("%d fibre families", nf)
		}
		return fmt.Errorf("%s but no fibre term; add one such as fib-expsq", fams)
	}
	if (s.Dispersion || s.Planar) && nf == 0 {
		return errors.New("dispersion needs a fibre family")
	}
	if s.Dispersion && s.Planar {
		return errors.New("a family spreads either in the plane (concentration b) or in three dimensions (κ), not both")
	}
	if s.Planar {
		for _, t := range s.Terms {
			if t.Family >= 0 && t.Shape.Arg != terms.Fibre {
				return fmt.Errorf("%s: a family spread in the plane takes fibre-stretch terms only (argument E_f)", t.Shape.ID)
			}
		}
	}
	if s.HoldPairAxis && s.Layout != LayoutMirror {
		return fmt.Errorf("a held pair axis needs a mirror pair, not a %s layout", s.Layout)
	}
	return nil
}

// canonical orders a structure's terms as the catalogue lists them,
// isotropic terms first and then each family's, so that the same form gives
// the same card however it was assembled.
func canonical(st Structure) Structure {
	rank := map[*terms.Shape]int{}
	for i, sh := range terms.Catalogue() {
		rank[sh] = i
	}
	out := st
	out.Terms = append([]TermSpec(nil), st.Terms...)
	sort.SliceStable(out.Terms, func(a, b int) bool {
		ta, tb := out.Terms[a], out.Terms[b]
		if ta.Family != tb.Family {
			return ta.Family < tb.Family
		}
		return rank[ta.Shape] < rank[tb.Shape]
	})
	return out
}

// FormKey names a model form for the verdict's evidence: "0" (isotropic),
// "1", "2-mirror" or "2-free", followed by "+dispersed" for families spread
// in the plane or "+kappa" for a three-dimensional dispersion.
func FormKey(st Structure) string {
	k := map[Layout]string{LayoutNone: "0", LayoutSingle: "1", LayoutMirror: "2-mirror", LayoutFree: "2-free"}[st.Layout]
	switch {
	case st.Planar:
		k += "+dispersed"
	case st.Dispersion:
		k += "+kappa"
	}
	return k
}

// formRank orders forms from simplest to richest (see the package note).
func formRank(st Structure) int {
	r := map[Layout]int{LayoutNone: 0, LayoutSingle: 10, LayoutMirror: 20, LayoutFree: 30}[st.Layout]
	switch {
	case st.Planar:
		r += 1
	case st.Dispersion:
		r += 2
	}
	return r
}
