package aniso

import (
	"math"
	"strings"
	"testing"
)

// Two equal-order families without shear information, made by independent
// numerical integration (30 points a protocol, 2 % noise, noise seed 1)
// and weighted as a file read by package biaxial is. The term-subset
// search, ranking subsets where the full two-family fit put its families,
// missed the plain two-family form in both: at 0°/60° the best
// two-direction model it found beat one family by only ΔBIC 4.5, at
// 10°/70° by 0.6, and both verdicts were a confident 1-or-mirror-pair. The
// second-family refits find a model with families near both true
// directions whose BIC is more than DisagreeDeltaBIC below every
// one-direction model's (11.1 and 8.9), so both verdicts are undecided.
// At 10°/70° it takes the growth step (without it the verdict stays
// 1-or-mirror-pair): the model found, near the true angles, has the true
// form's three terms and seven parameters.
func TestSecondFamilyRefitsFindTheTwoFamilyForm(t *testing.T) {
	if testing.Short() {
		t.Skip("two discoveries")
	}
	t.Parallel()
	for _, a := range [][2]float64{{0, 60}, {10, 70}} {
		spec := synthFrom(t, fibreMaterial(3, spreadFamily{a[0] * deg, -1, expSqFibre(30, 4)}, spreadFamily{a[1] * deg, -1, expSqFibre(25, 3)}),
			synthOptions{noise: 0.02, points: 30, seed: 1})
		spec.Weigh()
		d, p := discoverSpecimen(t, spec)
		t.Logf("%g°/%g°: verdict %s: %s", a[0], a[1], d.Verdict.Families, d.Verdict.Reason)
		noted := false
		for _, n := range d.Search {
			noted = noted || strings.Contains(n, "second family carrying copies of its fibre terms")
		}
		if !noted {
			t.Errorf("%g°/%g°: no search note on the second-family refits: %q", a[0], a[1], d.Search)
		}
		two, _, gap := d.inSampleDisagreement(problemEvidence(p))
		if two == nil {
			t.Errorf("%g°/%g°: no two-direction model beats every one-direction model by ΔBIC %g; verdict %s", a[0], a[1], DisagreeDeltaBIC, d.Verdict.Families)
			continue
		}
		t.Logf("%g°/%g°: in sample %s (%s), ΔBIC %.1f", a[0], a[1], two.Name, anglesText(two.Result), gap)
		for _, want := range a {
			best := nearestFamilyDeg(two.Result, want)
			if best > 8 {
				t.Errorf("%g°/%g°: the two-direction model %s has no family within 8° of %g° (%s)", a[0], a[1], two.Name, want, anglesText(two.Result))
			}
		}
		if d.Verdict.Families != "undecided" {
			t.Errorf("%g°/%g°: verdict %s, want undecided", a[0], a[1], d.Verdict.Families)
		}
	}
}

// A Demiray matrix (Demiray 1972; written out in independent_test.go)
// with spread families at 0° and 90° (concentration 5, the 90° one half
// as stiff), made by independent integration, on sutures (30 points, 2 %
// noise): the full two-family fit put both families near 0°, the subsets
// searched there missed the families at right angles, and the verdict was
// a confident 1 at 0°. With the refit of the full fit turned to 90°
// (perpendicularFull) as an extra anchor, the search finds a model with
// families near 0° and 90° whose BIC is more than DisagreeDeltaBIC below
// every one-direction model's (ΔBIC 9.1), so the verdict is undecided.
func TestPerpendicularAnchorFindsFamiliesAtRightAngles(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	m := plus(demirayMatrix(2, 3), fibreMaterial(0, spreadFamily{0, 5, expSqFibre(30, 3)}, spreadFamily{90 * deg, 5, expSqFibre(15, 2)}))
	d, _ := discoverSpecimen(t, synthFrom(t, m, synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2}))
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families != "undecided" {
		t.Fatalf("Demiray matrix with families at 0° and 90°, sutured: verdict %s, want undecided", v.Families)
	}
	if lo, hi := twoFamilyMagnitudes(t, d, v.InSampleBest); lo > 5 || hi < 85 {
		t.Errorf("%s has families at ±%.1f° and ±%.1f°, want near 0° and 90°", v.InSampleBest, lo, hi)
	}
	if !strings.Contains(strings.Join(d.Search, "\n"), "turned to 90° from the first") {
		t.Errorf("the search notes do not name the perpendicular anchor: %q", d.Search)
	}
}

// Two families spread about ±40° (concentration 4) on an Ogden α = 20
// matrix, sutured (30 points a protocol, 2 % noise, strains to 0.2, noise
// seed 1), made by independent numerical integration of the fibre stress
// over directions and a principal-stretch matrix evaluated on its own
// (independent_test.go; the verdict battery's specimen). The one-family
// answer at 0° carries five terms; the mirror form's term subsets, ranked
// where its full fit put the pair, had both families at 0° in every model
// from two terms up (the best pair off the axis fitted worse by ΔBIC
// 24.7), and the verdict was a confident 1. The mirror refits fit the
// one-family models' own terms on a pair and find one at about ±32°
// within ΔBIC 7 of the one family, predicting the left-out protocols a
// little better; the verdict is undecided by the architecture tie
// (tieBICBound) and names that pair.
func TestMirrorRefitsFindThePair(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	law := expSqFibre(30, 3)
	m := plus(ogdenMaterial(1, 20), fibreMaterial(0, spreadFamily{40 * deg, 4, law}, spreadFamily{-40 * deg, 4, law}))
	o := synthOptions{noise: 0.02, points: 30, seed: 1, sutured: true, maxStrain: 0.2}
	d, _ := discoverSpecimen(t, synthFrom(t, m, o))
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	one := d.lowestBICCandidate(func(r *Result) bool { return r.Structure.Layout == LayoutSingle })
	pair := d.lowestBICCandidate(func(r *Result) bool {
		return r.Structure.Layout == LayoutMirror && !r.Structure.Planar && !coincident(r)
	})
	if one == nil || pair == nil {
		t.Fatalf("no one-family model (%v) or no ideal mirror pair with distinct families (%v) on the front", one, pair)
	}
	// The generator's families lie at ±40°; the pair must sit off the
	// axis, 20° or more, and fit within very strong evidence (ΔBIC 10,
	// Kass & Raftery 1995) of one family.
	half := math.Abs(Deg(pair.Compared().Model.Families[0].Angle))
	gap := pair.Compared().BIC - one.Compared().BIC
	t.Logf("best pair %s at %s (ΔBIC %.1f against %s)", pair.Name, anglesText(pair.Compared()), gap, one.Name)
	if half < 20 || half > 60 || gap >= MinDeltaBIC {
		t.Errorf("best ideal mirror pair %s at %s, ΔBIC %.1f against one family: want a pair 20°–60° off the axis within ΔBIC %g", pair.Name, anglesText(pair.Compared()), gap, float64(MinDeltaBIC))
	}
	if d.Verdict.Families != "undecided" {
		t.Errorf("spread pair at ±40° on an Ogden α = 20 matrix, sutured: verdict %s, want undecided (it was a confident 1 at 0°)", d.Verdict.Families)
	}
	if c := candidateNamed(d, d.Verdict.TiesWith); c == nil || c.Result.Structure.Layout != LayoutMirror {
		t.Errorf("TiesWith %q does not name a mirror pair", d.Verdict.TiesWith)
	}
}
