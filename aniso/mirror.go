package aniso

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
)

// Equivalent fibre layouts under pure biaxial stretch (package
// documentation, Mirror symmetry).
//
// With F12 = F21 = 0 the in-plane C is diagonal, and every invariant of a
// family at α (I4 = C11 cos²α + C22 sin²α, I5, K, and the arc of an
// in-plane dispersed family, mirrored with its density) is unchanged when α
// becomes −α. So each family's normal stresses are unchanged when its own
// sign flips, and its shear stress changes sign; a family at α with weight
// w and a mirror pair at ±α with w/2 each therefore give the same normal
// stresses and, the pair, no shear stress. Data without shear information
// cannot tell these layouts apart, but an FE model that lets the sheet
// shear can: they are different materials.

// MirrorAlternative is one complete model that pure biaxial stretch cannot
// tell from another.
type MirrorAlternative struct {
	// Name identifies the alternative: "single-plus" and "single-minus"
	// (one family at +|α| or −|α|), "mirror-pair" (families at ±|α| with
	// half the weights each) or, for several families, the layout of each:
	// "signs" and one character a family whose sign is undetermined, "+"
	// at +|α|, "-" at −|α|, "m" a mirror pair at ±|α| with half of each of
	// its weights; e.g. "signs+-" for the first family at +|α1| and the
	// second at −|α2|, "signs+m" for the first at +|α1| and the second
	// split into a pair.
	Name string
	// Title says it in words, e.g. "one family at +30°".
	Title string
	// Model is the alternative model. Its families carry the original
	// dispersion κ or in-plane concentration b.
	Model *Model
	// Same is true for the alternative that is the model it was derived
	// from (up to the order of families and terms).
	Same bool
}

// mirrorTolerance decides that two angles (radians) are equal, or that an
// angle lies on an axis, where the sign makes no difference.
const mirrorTolerance = 1e-9

// selfMirror reports whether a family at alpha is its own mirror image (0° or
// 90°).
func selfMirror(alpha float64) bool { return math.Abs(math.Sin(2*alpha)) < mirrorTolerance }

// MirrorAlternatives returns the models that no pure biaxial stretch can
// tell from m, given which families' angle signs the data left
// undetermined (signUnknown[f]; nil means none): nil when nothing is
// undetermined (no such family, or each lies on an axis). For one family
// they are the family at +|α|, at −|α| and the mirror pair ±|α| with half
// of each weight; for a mirror pair (two families at ±α with the same
// terms, weights and spread) the pair and one family at +|α| or −|α| with
// twice each weight; otherwise, for one or two undetermined families,
// every combination of each at +|α|, at −|α| or split into a mirror pair
// at ±|α| with half of each of its weights (three families in a sheet read
// as two, for one); for three, every combination of signs; nil beyond.
func MirrorAlternatives(m *Model, signUnknown []bool) []MirrorAlternative {
	var free []int
	for f, fam := range m.Families {
		if f < len(signUnknown) && signUnknown[f] && !selfMirror(fam.Angle) {
			free = append(free, f)
		}
	}
	if len(free) == 0 {
		return nil
	}
	switch {
	case len(m.Families) == 1:
		a := math.Abs(WrapDeg(Deg(m.Families[0].Angle)))
		plus, minus := withAngle(m, 0, a), withAngle(m, 0, -a)
		pair := splitPair(m, a)
		return []MirrorAlternative{
			{Name: "single-plus", Title: fmt.Sprintf("one family at +%s°", fmtDeg(a)), Model: plus, Same: sameModel(plus, m)},
			{Name: "single-minus", Title: fmt.Sprintf("one family at −%s°", fmtDeg(a)), Model: minus, Same: sameModel(minus, m)},
			{Name: "mirror-pair", Title: fmt.Sprintf("a mirror pair at ±%s° with half of each weight per family", fmtDeg(a)), Model: pair},
		}
	case len(m.Families) == 2 && len(free) == 2 && isMirrorPair(m):
		a := math.Abs(WrapDeg(Deg(m.Families[0].Angle)))
		plus, minus := mergePair(m, a), mergePair(m, -a)
		return []MirrorAlternative{
			{Name: "mirror-pair", Title: fmt.Sprintf("a mirror pair at ±%s°", fmtDeg(a)), Model: m, Same: true},
			{Name: "single-plus", Title: fmt.Sprintf("one family at +%s° with twice each weight", fmtDeg(a)), Model: plus},
			{Name: "single-minus", Title: fmt.Sprintf("one family at −%s° with twice each weight", fmtDeg(a)), Model: minus},
		}
	case len(free) > 3:
		return nil
	}
	// Each undetermined family is at +|α|, at −|α| or, as the package
	// documentation says, a mirror pair at ±|α| with half of each of its
	// weights. Before the pairs were listed, a card with families at 0°
	// and ±61.1° fitted to three equal families at 0° and ±60° without
	// shear (synthetic, 2026-12-05) listed only f2 at +61.1° and at
	// −61.1°, and its alternatives did not hold the material. Three
	// undetermined families get their signs only (27 layouts would be too
	// many to run one by one).
	states := 3
	if len(free) > 2 {
		states = 2
	}
	n := 1
	for range free {
		n *= states
	}
	var out []MirrorAlternative
	for code := 0; code < n; code++ {
		alt := copyModel(m)
		name := "signs"
		var parts []string
		var split []int
		rest := code
		digits := make([]int, len(free))
		for k := len(free) - 1; k >= 0; k-- {
			digits[k] = rest % states
			rest /= states
		}
		for k, f := range free {
			a := math.Abs(WrapDeg(Deg(m.Families[f].Angle)))
			switch digits[k] {
			case 0:
				name += "+"
				parts = append(parts, fmt.Sprintf("%s at +%s°", familyLabel(m, f), fmtDeg(a)))
			case 1:
				a = -a
				name += "-"
				parts = append(parts, fmt.Sprintf("%s at −%s°", familyLabel(m, f), fmtDeg(-a)))
			case 2:
				name += "m"
				parts = append(parts, fmt.Sprintf("%s as a mirror pair at ±%s° with half of each of its weights", familyLabel(m, f), fmtDeg(a)))
				split = append(split, f)
			}
			alt.Families[f].Angle = Rad(a)
		}
		for _, f := range split {
			alt = splitFamily(alt, f, familyLabel(m, f))
		}
		dup := false
		for _, o := range out {
			dup = dup || sameModel(o.Model, alt)
		}
		if dup {
			continue
		}
		out = append(out, MirrorAlternative{Name: name, Title: strings.Join(parts, ", "), Model: alt, Same: sameModel(alt, m)})
	}
	return out
}

// splitFamily turns family f of m (at +|α|) into a mirror pair: f stays
// at +|α| named label_plus, a new last family at −|α| named label_minus,
// and each term of f becomes two, one on each, at half its weight.
func splitFamily(m *Model, f int, label string) *Model {
	c := copyModel(m)
	neg := c.Families[f]
	neg.Angle = -neg.Angle
	neg.Name = label + "_minus"
	c.Families[f].Name = label + "_plus"
	c.Families = append(c.Families, neg)
	g := len(c.Families) - 1
	var add []Term
	for i, t := range c.Terms {
		if t.Family == f {
			c.Terms[i].Weight = t.Weight / 2
			add = append(add, Term{Shape: t.Shape, Family: g, Weight: t.Weight / 2, Params: append([]float64(nil), t.Params...)})
		}
	}
	c.Terms = append(c.Terms, add...)
	return c
}

// fmtDeg writes an angle in degrees with up to 6 significant digits.
func fmtDeg(a float64) string { return fmt.Sprintf("%.6g", a) }

// familyLabel is a family's name, or f1, f2, … when it has none.
func familyLabel(m *Model, f int) string {
	if n := m.Families[f].Name; n != "" {
		return n
	}
	return fmt.Sprintf("f%d", f+1)
}

// copyModel copies a model deeply enough to change its families and
// terms.
func copyModel(m *Model) *Model {
	c := &Model{Families: append([]Family(nil), m.Families...)}
	for _, t := range m.Terms {
		t.Params = append([]float64(nil), t.Params...)
		c.Terms = append(c.Terms, t)
	}
	return c
}

// Reflected returns m reflected about axis 1, Q = diag(1, −1): every
// fibre angle negated, and every parameter odd in the shear strain
// (terms.Param.OddInShear, such as fung-general's couplings b5 and b6)
// negated, so that its energy at C is m's at Q C Qᵀ (material symmetry,
// e.g. Holzapfel 2000, §6.7). Pure biaxial stretch cannot tell the two
// apart (package documentation, Mirror symmetry). changed is false when
// the reflection is m itself: every family on an axis and no such
// parameter away from 0.
func Reflected(m *Model) (r *Model, changed bool) {
	r = copyModel(m)
	for f := range r.Families {
		if !selfMirror(r.Families[f].Angle) {
			changed = true
		}
		r.Families[f].Angle = -r.Families[f].Angle
	}
	for i := range r.Terms {
		for k, p := range r.Terms[i].Shape.Params {
			if p.OddInShear && k < len(r.Terms[i].Params) && r.Terms[i].Params[k] != 0 {
				r.Terms[i].Params[k] = -r.Terms[i].Params[k]
				changed = true
			}
		}
	}
	return r, changed
}

// withAngle is m with family f at angleDeg degrees.
func withAngle(m *Model, f int, angleDeg float64) *Model {
	c := copyModel(m)
	c.Families[f].Angle = Rad(angleDeg)
	return c
}

// splitPair turns the one family of m into a mirror pair at ±aDeg, each
// family with every term of the original at half its weight.
func splitPair(m *Model, aDeg float64) *Model {
	name := familyLabel(m, 0)
	c := &Model{}
	for k, sign := range []float64{1, -1} {
		f := m.Families[0]
		f.Name = name + []string{"_plus", "_minus"}[k]
		f.Angle = Rad(sign * aDeg)
		c.Families = append(c.Families, f)
	}
	for _, t := range m.Terms {
		if t.Family < 0 {
			c.Terms = append(c.Terms, Term{Shape: t.Shape, Family: -1, Weight: t.Weight, Params: append([]float64(nil), t.Params...)})
		}
	}
	for k := 0; k < 2; k++ {
		for _, t := range m.Terms {
			if t.Family == 0 {
				c.Terms = append(c.Terms, Term{Shape: t.Shape, Family: k, Weight: t.Weight / 2, Params: append([]float64(nil), t.Params...)})
			}
		}
	}
	return c
}

// isMirrorPair reports whether m's two families sit at ±α (symmetric about
// axis 1, or equally about axis 2) with the same spread and the same
// terms, weights and parameters, in the same order.
func isMirrorPair(m *Model) bool {
	f0, f1 := m.Families[0], m.Families[1]
	if math.Abs(WrapDeg(Deg(f0.Angle+f1.Angle))) > mirrorTolerance || f0.Dispersion != f1.Dispersion ||
		f0.Planar != f1.Planar || f0.Concentration != f1.Concentration {
		return false
	}
	var t0, t1 []Term
	for _, t := range m.Terms {
		switch t.Family {
		case 0:
			t0 = append(t0, t)
		case 1:
			t1 = append(t1, t)
		}
	}
	if len(t0) != len(t1) {
		return false
	}
	for i := range t0 {
		if t0[i].Shape != t1[i].Shape || t0[i].Weight != t1[i].Weight || !slices.Equal(t0[i].Params, t1[i].Params) {
			return false
		}
	}
	return true
}

// mergePair turns the mirror pair of m into one family at aDeg carrying
// the first family's terms at twice their weight.
func mergePair(m *Model, aDeg float64) *Model {
	f := m.Families[0]
	f.Angle = Rad(aDeg)
	c := &Model{Families: []Family{f}}
	for _, t := range m.Terms {
		switch t.Family {
		case -1:
			c.Terms = append(c.Terms, Term{Shape: t.Shape, Family: -1, Weight: t.Weight, Params: append([]float64(nil), t.Params...)})
		case 0:
			c.Terms = append(c.Terms, Term{Shape: t.Shape, Family: 0, Weight: 2 * t.Weight, Params: append([]float64(nil), t.Params...)})
		}
	}
	return c
}

// sameModel reports whether a and b are the same material: the same
// families (angles modulo 180°, spreads) carrying the same terms, in any
// order of families.
func sameModel(a, b *Model) bool { return modelKey(a) == modelKey(b) }

// modelKey describes a model independently of the order of its families.
func modelKey(m *Model) string {
	termKey := func(t Term) string { return fmt.Sprintf("%s|%.17g|%v", t.Shape.ID, t.Weight, t.Params) }
	var iso []string
	fams := make([][]string, len(m.Families))
	for _, t := range m.Terms {
		if t.Family < 0 {
			iso = append(iso, termKey(t))
		} else {
			fams[t.Family] = append(fams[t.Family], termKey(t))
		}
	}
	sort.Strings(iso)
	var famKeys []string
	for f, fam := range m.Families {
		sort.Strings(fams[f])
		famKeys = append(famKeys, fmt.Sprintf("%.9f|%g|%v|%g|%s", WrapDeg(Deg(fam.Angle)), fam.Dispersion, fam.Planar, fam.Concentration, strings.Join(fams[f], ";")))
	}
	sort.Strings(famKeys)
	return strings.Join(iso, ";") + "#" + strings.Join(famKeys, "#")
}
