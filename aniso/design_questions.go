package aniso

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// Explanation is one model that explains the fitted data as well as the
// fit does, named in words (e.g. "one family at −30.0°").
type Explanation struct {
	Name  string
	Model *Model
}

// Question is a choice between explanations that the current data cannot
// make, which a planned test may settle (see PlanTests).
type Question struct {
	// Topic names what is to be decided in a few words ("fibre layout");
	// Text says it in full, with the explanations.
	Topic, Text string
	// Verdict is true for what the fibre-family verdict left open: the
	// sign of a fibre angle, one family or a mirror pair (package
	// documentation, Mirror symmetry), or an undecided family count. False
	// for a choice among the model forms within the selection's
	// one-standard-error band.
	Verdict bool
	// Explanations are the competing models, at least two.
	Explanations []Explanation
	// SignUnknown is true when the data carry no shear information, so
	// that each explanation stands for every sign variant of its fibre
	// angles (SignVariants): two explanations count as told apart only
	// when every variant of one differs from every variant of the other.
	SignUnknown bool
}

// onAxisDeg is how close (degrees) a fibre direction must lie to a tester
// axis for its sign, and a mirror pair about it, not to arise as a
// question: within it, +α, −α and the pair are the same stresses to within
// what any test resolves.
const onAxisDeg = 1

// signedDeg writes an angle in radians as degrees with its sign, "+30.0°"
// or "−30.0°" (a typographic minus, as in the other texts).
func signedDeg(a float64) string {
	d := WrapDeg(Deg(a))
	if d < 0 {
		return fmt.Sprintf("−%.1f°", -d)
	}
	return fmt.Sprintf("+%.1f°", d)
}

// onAxis reports whether direction a (radians) lies within onAxisDeg of
// axis 1 or axis 2.
func onAxis(a float64) bool {
	d := math.Abs(WrapDeg(Deg(a)))
	return d < onAxisDeg || d > 90-onAxisDeg
}

// SignVariants returns m and every model that differs from it only in the
// signs of its fibre angles (each family at ±|α|), m first, without
// duplicates (a family on a tester axis has one sign). Under a pure biaxial
// stretch they all give the same normal stresses (package documentation,
// Mirror symmetry), so without shear information each is as good an
// explanation of the data as m.
func SignVariants(m *Model) []*Model {
	out := []*Model{m}
	nf := len(m.Families)
	for mask := 1; mask < 1<<nf; mask++ {
		v := cloneModelDeep(m)
		for f := 0; f < nf; f++ {
			if mask&(1<<f) != 0 {
				v.Families[f].Angle = -v.Families[f].Angle
			}
		}
		dup := false
		for _, u := range out {
			if sameDirections(u, v) {
				dup = true
				break
			}
		}
		if !dup {
			out = append(out, v)
		}
	}
	return out
}

// sameDirections reports whether two models of the same terms have their
// families at the same directions (modulo 180°, to round-off).
func sameDirections(a, b *Model) bool {
	for f := range a.Families {
		if math.Abs(WrapDeg(Deg(a.Families[f].Angle-b.Families[f].Angle))) > 1e-9 {
			return false
		}
	}
	return true
}

// LayoutQuestion returns the question that data without shear information
// leave open about m's fibre families, and false when there is none (the
// sign is known, m has no family, or every family lies on a tester axis):
//
//   - one family at α: one family at +|α|, one at −|α|, or a mirror pair at
//     ±|α| with half of each fibre term's weight on each member;
//   - a mirror pair at ±β (two families at the same |angle| carrying the
//     same terms): the pair, or one family at +β or at −β with the pair's
//     weights summed;
//   - two other families: every choice of the signs of their angles.
//
// All of them give the same normal stresses under a pure biaxial stretch
// (package documentation, Mirror symmetry).
func LayoutQuestion(m *Model, signKnown bool) (Question, bool) {
	if signKnown || len(m.Families) == 0 {
		return Question{}, false
	}
	q := Question{Verdict: true}
	switch {
	case len(m.Families) == 1:
		a := math.Abs(wrapAngle(m.Families[0].Angle))
		if onAxis(a) {
			return Question{}, false
		}
		plus, minus := cloneModelDeep(m), cloneModelDeep(m)
		plus.Families[0].Angle, minus.Families[0].Angle = a, -a
		q.Explanations = []Explanation{
			{Name: "one family at " + signedDeg(a), Model: plus},
			{Name: "one family at " + signedDeg(-a), Model: minus},
			{Name: fmt.Sprintf("a mirror pair at ±%.1f° (half the weight on each)", Deg(a)), Model: mirrorPairOf(m, a)},
		}
		q.Topic = "fibre layout"
	case mirrorLike(m):
		b := math.Abs(wrapAngle(m.Families[0].Angle))
		if onAxis(b) {
			return Question{}, false
		}
		plus, minus := singleOf(m, b), singleOf(m, -b)
		q.Explanations = []Explanation{
			{Name: fmt.Sprintf("a mirror pair at ±%.1f°", Deg(b)), Model: m},
			{Name: "one family at " + signedDeg(b) + " (the pair's weight)", Model: plus},
			{Name: "one family at " + signedDeg(-b) + " (the pair's weight)", Model: minus},
		}
		q.Topic = "fibre layout"
	default:
		for _, v := range SignVariants(m) {
			var at []string
			for _, f := range v.Families {
				at = append(at, f.Name+" at "+signedDeg(f.Angle))
			}
			q.Explanations = append(q.Explanations, Explanation{Name: strings.Join(at, ", "), Model: v})
		}
		if len(q.Explanations) < 2 {
			return Question{}, false
		}
		q.Topic = "signs of the fibre angles"
	}
	q.Text = q.Topic + ": " + ExplanationList(q.Explanations)
	return q, true
}

// ExplanationList joins the explanations' names: "a, b or c".
func ExplanationList(es []Explanation) string {
	var names []string
	for _, e := range es {
		names = append(names, e.Name)
	}
	if len(names) < 2 {
		return strings.Join(names, "")
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

// mirrorPairOf is a one-family model m as a mirror pair at ±a: every term
// of the family on both members with half its weight.
func mirrorPairOf(m *Model, a float64) *Model {
	p := &Model{}
	f := m.Families[0]
	f1, f2 := f, f
	f1.Name, f1.Angle = "f1", a
	f2.Name, f2.Angle = "f2", -a
	p.Families = []Family{f1, f2}
	for _, t := range m.Terms {
		t.Params = append([]float64(nil), t.Params...)
		if t.Family < 0 {
			p.Terms = append(p.Terms, t)
			continue
		}
		t.Weight /= 2
		u := t
		u.Params = append([]float64(nil), t.Params...)
		t.Family, u.Family = 0, 1
		p.Terms = append(p.Terms, t, u)
	}
	return p
}

// mirrorLike reports whether m's two families sit at the same |angle| and
// carry the same terms (shapes, weights, parameters) and spread: a mirror
// pair, whose members a pure stretch cannot tell from one family.
func mirrorLike(m *Model) bool {
	if len(m.Families) != 2 {
		return false
	}
	f1, f2 := m.Families[0], m.Families[1]
	if math.Abs(math.Abs(WrapDeg(Deg(f1.Angle)))-math.Abs(WrapDeg(Deg(f2.Angle)))) > 1e-6 ||
		f1.Dispersion != f2.Dispersion || f1.Planar != f2.Planar || f1.Concentration != f2.Concentration {
		return false
	}
	key := func(f int) []string {
		var ks []string
		for _, t := range m.Terms {
			if t.Family == f {
				ks = append(ks, fmt.Sprintf("%s %x %v", t.Shape.ID, math.Float64bits(t.Weight), t.Params))
			}
		}
		return ks
	}
	return slices.Equal(key(0), key(1))
}

// singleOf is a mirror-pair model m as one family at a carrying the pair's
// summed weights.
func singleOf(m *Model, a float64) *Model {
	s := &Model{}
	f := m.Families[0]
	f.Name, f.Angle = "f1", a
	s.Families = []Family{f}
	for _, t := range m.Terms {
		t.Params = append([]float64(nil), t.Params...)
		switch t.Family {
		case 1:
			continue
		case 0:
			t.Weight *= 2
		}
		s.Terms = append(s.Terms, t)
	}
	return s
}

// turned is m seen from tester axes turned by psi (radians) from m's axis 1
// towards its axis 2: every family's angle less psi. Only invariant terms
// follow a turn this way (a Green-strain term is tied to the tester's axes;
// see Model.HasGreenTerm).
func turned(m *Model, psi float64) *Model {
	if psi == 0 {
		return m
	}
	t := cloneModelDeep(m)
	for f := range t.Families {
		t.Families[f].Angle -= psi
	}
	return t
}
