package aniso

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/terms"
)

// ParseLayout reads a layout name as Layout.String writes it: "none",
// "single", "mirror" or "free".
func ParseLayout(s string) (Layout, error) {
	for l := LayoutNone; l <= LayoutFree; l++ {
		if s == l.String() {
			return l, nil
		}
	}
	return LayoutNone, fmt.Errorf("layout %q is not one of none, single, mirror, free", s)
}

// ParseTermLabel reads a term label as TermSpec.Label writes it for layout
// l: a catalogue id for an isotropic term ("i1-lin"), the id and its family
// for a fibre-family term ("fib-expsq@f1", "fib-expsq@f2"), or "@pair" for
// the shared terms of a mirror pair.
func ParseTermLabel(label string, l Layout) (TermSpec, error) {
	id, fam, hasFam := strings.Cut(label, "@")
	sh := terms.Lookup(id)
	if sh == nil {
		return TermSpec{}, fmt.Errorf("term %q: %q is not a catalogue term", label, id)
	}
	if !sh.Arg.NeedsFamily() {
		if hasFam {
			return TermSpec{}, fmt.Errorf("term %q: %s is isotropic and takes no family", label, id)
		}
		return TermSpec{Shape: sh, Family: -1}, nil
	}
	switch {
	case !hasFam:
		return TermSpec{}, fmt.Errorf("term %q: %s is a fibre-family term and needs its family (@f1, @f2 or @pair)", label, id)
	case fam == "pair":
		if l != LayoutMirror {
			return TermSpec{}, fmt.Errorf("term %q: @pair belongs to a mirror layout, not %s", label, l)
		}
		return TermSpec{Shape: sh, Family: 0}, nil
	}
	n, err := strconv.Atoi(strings.TrimPrefix(fam, "f"))
	if err != nil || !strings.HasPrefix(fam, "f") || n < 1 || n > l.Families() || l == LayoutMirror {
		return TermSpec{}, fmt.Errorf("term %q: family %q does not exist in a %s layout", label, fam, l)
	}
	return TermSpec{Shape: sh, Family: n - 1}, nil
}

// StructureFromLabels rebuilds a model form from its term labels (as
// Result.Structure's terms are labelled in cards and tables), its layout,
// how its families spread (dispersion κ or in the plane) and, for a mirror
// pair, whether its axis was held on axis 1. The form is validated.
func StructureFromLabels(labels []string, l Layout, dispersion, planar, holdPairAxis bool) (Structure, error) {
	st := Structure{Layout: l, Dispersion: dispersion, Planar: planar, HoldPairAxis: holdPairAxis && l == LayoutMirror}
	for _, lab := range labels {
		t, err := ParseTermLabel(lab, l)
		if err != nil {
			return Structure{}, err
		}
		st.Terms = append(st.Terms, t)
	}
	if err := st.Validate(); err != nil {
		return Structure{}, err
	}
	return st, nil
}
