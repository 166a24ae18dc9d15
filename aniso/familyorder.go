package aniso

import "math"

// Family order.
//
// A model with two free families is the same model with their labels
// swapped, and which family a fit calls f1 depends on its path: two
// specimens of one tissue could report f1 at 10° and f2 at 65°, and f1 at
// 65° and f2 at 10°, and a table of their parameters would then pair the
// wrong families. A reported model (discovery's chosen model, and a
// fixed form through InFamilyOrder) therefore lists its free families in
// the family order: by the magnitude of the angle in (−90°, 90°], the
// family nearer axis 1 first; two whose magnitudes lie within
// familyTieDeg of each other (a pair near ±α) by sign, the positive
// angle first, where shear information identifies signs. The magnitude
// does not jump where an angle passes ±90° (a family at −89.99° and one
// at 89.99° are one direction): ordered by the signed angle, families at
// 0° and about 90° (valve-like specimens, made by independent
// integration) came out f1 at 0° or at −90° as the last digits of the
// fitted angle fell. Mirror pairs (f2 at −f1 by construction) and single
// families have one labelling only.

// familyTieDeg is how close (degrees) the magnitudes of two families'
// angles must be for the sign to order them.
const familyTieDeg = 5

// familyOrderAngle is a family's angle in (−π/2, π/2] (radians), or its
// magnitude where its sign is not identified.
func familyOrderAngle(angle float64, signKnown bool) float64 {
	a := wrapAngle(angle)
	if !signKnown {
		a = math.Abs(a)
	}
	return a
}

// familiesOutOfOrder reports whether r has two free families that are not
// in the family order.
func familiesOutOfOrder(r *Result) bool {
	if r.Structure.Layout != LayoutFree || r.Model == nil || len(r.Model.Families) != 2 {
		return false
	}
	a0, a1 := wrapAngle(r.Model.Families[0].Angle), wrapAngle(r.Model.Families[1].Angle)
	m0, m1 := math.Abs(a0), math.Abs(a1)
	if math.Abs(m0-m1) > Rad(familyTieDeg) || !r.SignKnown {
		return m1 < m0
	}
	return a1 > a0
}

// swapFamilies returns a free two-family structure with its families'
// labels swapped, and the parameters init (by name, as Result.Params gives
// them) renamed to match: the same model, labelled the other way.
func swapFamilies(st Structure, init map[string]float64) (Structure, map[string]float64) {
	out := st.withTerms(nil)
	rename := map[string]string{
		"angle_1": "angle_2", "angle_2": "angle_1",
		"concentration_1": "concentration_2", "concentration_2": "concentration_1",
		"dispersion_1": "dispersion_2", "dispersion_2": "dispersion_1",
	}
	for _, t := range st.Terms {
		s := t
		if s.Family >= 0 {
			s.Family = 1 - s.Family
		}
		out.Terms = append(out.Terms, s)
		for _, q := range t.Shape.Params {
			rename[shapeParamName(q.Name, t, st.Layout)] = shapeParamName(q.Name, s, st.Layout)
		}
	}
	renamed := make(map[string]float64, len(init))
	for k, v := range init {
		if n, ok := rename[k]; ok {
			k = n
		}
		renamed[k] = v
	}
	return canonical(out), renamed
}

// InFamilyOrder returns r with its families in the family order (see
// Family order in this file): r itself when they are already, or when r
// has no free pair of families; otherwise the same form with its families
// relabelled, refitted on p from r's optimum with set (its Init and
// NoScan replaced), so that estimates, intervals and profiles follow the
// new labels. If that refit fails or ends worse than r (noWorseRelabelled),
// r is returned unchanged.
func InFamilyOrder(p *Problem, r *Result, set Settings) *Result {
	if !familiesOutOfOrder(r) {
		return r
	}
	st, init := swapFamilies(activeStructure(r), r.Params())
	set.Init, set.NoScan = init, true
	q, err := Fit(p, st, set)
	if err != nil || activeTerms(q) != activeTerms(r) || !noWorseRelabelled(q, r) {
		return r
	}
	return q
}

// noWorseRelabelled reports whether q, a relabelled refit of r from r's
// optimum, ends no worse than r: within 1e-9 relative, or within 1e-14 of
// the canonical loss (rows weighted to about unit size, so about 1e-15 of
// the data's own scale), where a fit of data without noise ends within
// round-off of zero and a relative test would refuse a tie.
func noWorseRelabelled(q, r *Result) bool {
	return q.Loss <= r.Loss*(1+1e-9)+1e-14
}
