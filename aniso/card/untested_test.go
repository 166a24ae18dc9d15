package card

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// An untested strip that leaves the fitted data range says so: beyond it
// every model of the band extrapolates, and they can agree far from the
// material (audit 2026-12-05: a cubic-law fibre family on sutures, fibres
// stretched to 1.013 in the tests, strip band 5.5 % of the card's largest
// stress while the card's model was off by 78 % of the true peak). The
// strip 1:0 stretches a fibre at α to √I4 = √(λ² cos²α + sin²α) (I4 =
// a0·C a0, Spencer 1971), which passes 1.013 at λ = 1.0193 for α = 35°:
// the first of the strip's 40 points to stretch 1.14 beyond it is
// 1 + 0.14·6/40 = 1.021. A shear range that does not hold 0 (sutures) is
// not such a departure: the strip is a pure stretch.
func TestUntestedStripLeavesTheDataRange(t *testing.T) {
	fam := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(35)}},
		Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 2},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 40, Params: []float64{5}},
		},
	}
	other := &aniso.Model{Families: fam.Families, Terms: []aniso.Term{fam.Terms[0], {Shape: terms.Lookup("fib-quad"), Family: 0, Weight: 25}}}
	c := FromModel(fam, "kPa", nil)
	c.Fit = &FitSection{AngleSignKnown: true}
	c.Selection = &SelectionSection{Pareto: []CandidateCard{
		{Name: "chosen", Chosen: true, HeldoutError: 0.01, HeldoutStdErr: 0.001, Model: NewCandidateModel(fam)},
		{Name: "other", HeldoutError: 0.0105, Model: NewCandidateModel(other)},
	}}
	s12 := Interval{-0.15, -0.001}
	c.DataRange = &DataRange{Stretch1: Interval{1, 1.14}, Stretch2: Interval{1, 1.14}, Shear12: &s12, Shear21: &s12, FibreStretch: []Interval{{1, 1.013}}}
	eq := [][][4]float64{{{1.07, -0.05, -0.04, 1.07}, {1.14, -0.15, -0.12, 1.14}}}
	// 1:0, 0:1, and with fibres and the signs known the strips turned
	// 45° and −45°.
	strips, err := NewUntestedStrips(eq, true, c, fam)
	if err != nil || len(strips) != 4 || strips[3].Label != "1:0 turned −45°" {
		t.Fatalf("strips %+v, %v", strips, err)
	}
	if want := "from stretch 1.02 on the strip leaves the fitted data range (fibre stretch of f1"; !strings.Contains(strips[0].Summary, want) {
		t.Errorf("1:0 summary %q, want it to contain %q", strips[0].Summary, want)
	}
	if at := float64(strips[0].LeavesRangeAt); math.Abs(at-1.021) > 1e-12 {
		t.Errorf("1:0 leaves_range_at %v, want 1.021", at)
	}
	// The card validates against its JSON Schema (a general-purpose
	// validator, github.com/santhosh-tekuri/jsonschema); the test's bare
	// fit section, which has no estimates, is left out.
	fit := c.Fit
	c.UntestedStrips, c.Fit = strips, nil
	if b, err := c.Marshal(); err != nil {
		t.Fatal(err)
	} else if err := validate(t, compileSchema(t), b); err != nil {
		t.Errorf("a card with measured strips does not validate: %v", err)
	}
	c.Fit = fit
	c.DataRange.FibreStretch = []Interval{{1, 1.2}}
	strips, err = NewUntestedStrips(eq, true, c, fam)
	if err != nil || len(strips) != 4 || strings.Contains(strips[0].Summary+strips[1].Summary+strips[2].Summary+strips[3].Summary, "leaves") || !math.IsNaN(float64(strips[0].LeavesRangeAt)) {
		t.Errorf("strips inside the range (the shear range without 0 aside) say they leave it: %+v, %v", strips, err)
	}
}

// A card whose choice no other candidate came near still lists the strips
// the data did not test, with no spread and a summary that says nothing
// measures them (until 2026-12-05 it listed none, which read as settled):
// an isotropic neo-Hookean card fitted to equibiaxial data, no strip
// turned (an isotropic model is the same along every direction).
func TestUntestedStripsWithoutNearEquivalents(t *testing.T) {
	iso := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 5}}}
	c := FromModel(iso, "kPa", nil)
	c.Fit = &FitSection{AngleSignKnown: true}
	c.Selection = &SelectionSection{Pareto: []CandidateCard{
		{Name: "chosen", Chosen: true, HeldoutError: 0.01, HeldoutStdErr: 0.001, Model: NewCandidateModel(iso)},
		{Name: "far", HeldoutError: 0.05, Model: NewCandidateModel(iso)},
	}}
	strips, err := NewUntestedStrips([][][4]float64{{{1.05, 0, 0, 1.05}, {1.1, 0, 0, 1.1}}}, false, c, iso)
	if err != nil || len(strips) != 2 {
		t.Fatalf("strips %+v, %v; want 1:0 and 0:1", strips, err)
	}
	for _, st := range strips {
		if st.Models != 0 || !math.IsNaN(float64(st.Percent)) || !strings.Contains(st.Summary, "nothing measures how far the tests settle it") {
			t.Errorf("strip %s: models %d, percent %v, summary %q", st.Label, st.Models, float64(st.Percent), st.Summary)
		}
	}
	// Written and read back: the null numbers stay null (the test's bare
	// fit section, which has no estimates, left out).
	c.UntestedStrips, c.Fit = strips, nil
	b, err := c.Marshal()
	if err != nil {
		t.Fatal(err)
	}
	if err := validate(t, compileSchema(t), b); err != nil {
		t.Errorf("a card with unmeasured strips does not validate: %v", err)
	}
	back, _, err := Parse(bytes.NewReader(b), "model.json")
	if err != nil || len(back.UntestedStrips) != 2 || !math.IsNaN(float64(back.UntestedStrips[0].Widest)) {
		t.Errorf("read back: %+v, %v", back.UntestedStrips, err)
	}
}

// A strip turned 45° is measured when a model of the band responds to the
// direction of loading: a Green-strain (Fung-type) term of positive
// weight does (Tong & Fung 1976: its Q is written in the tester's axes,
// so b1 ≠ b2 makes the strip 1:0 differ from the strip at 45°); the same
// term at weight zero leaves an isotropic neo-Hookean solid, the same
// along every direction (until 2026-12-05 the zero-weight term added a
// turned strip that read like the others).
func TestTurnedStripNeedsAWeightedFungTerm(t *testing.T) {
	fung := func(w float64) *aniso.Model {
		return &aniso.Model{Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 5},
			{Shape: terms.Lookup("fung"), Family: -1, Weight: w, Params: []float64{20, 5, 0, 10}},
		}}
	}
	eq := [][][4]float64{{{1.05, 0, 0, 1.05}, {1.1, 0, 0, 1.1}}}
	for _, tc := range []struct {
		weight float64
		want   int
	}{{0, 2}, {3, 3}} {
		m := fung(tc.weight)
		c := FromModel(m, "kPa", nil)
		c.Fit = &FitSection{}
		c.Selection = &SelectionSection{Pareto: []CandidateCard{{Name: "chosen", Chosen: true, HeldoutError: 0.01, HeldoutStdErr: 0.001, Model: NewCandidateModel(m)}}}
		strips, err := NewUntestedStrips(eq, false, c, m)
		if err != nil || len(strips) != tc.want {
			t.Errorf("Fung-type weight %g: %d strips (%+v), %v; want %d", tc.weight, len(strips), strips, err, tc.want)
		}
	}
}

// A runaway spread is written short: a recruited family stretched past
// its tested fibre stretch on a cohort of the demos read 2.9e22 %, which
// one decimal wrote with 23 digits.
func TestPercentTextOfARunaway(t *testing.T) {
	for _, c := range []struct {
		p    float64
		want string
	}{{88.72, "88.7"}, {999.94, "999.9"}, {2.9144966433547988e22, "2.91e+22"}} {
		if got := PercentText(c.p); got != c.want {
			t.Errorf("PercentText(%g) = %q, want %q", c.p, got, c.want)
		}
	}
}

// A cohort specimen's strips say that the held-out evidence is the
// cohort's, pooled over its specimens, and not the specimen's own (audit
// 2026-12-05: the words read as the specimen's own held-out protocols). A
// single fit's card keeps its words. Invented models; candidates without
// a held-out error are not compared, as in a single fit.
func TestCohortStripsSayTheEvidenceIsPooled(t *testing.T) {
	iso := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 5}}}
	stiffer := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 5.1}}}
	nan := Num(math.NaN())
	eq := [][][4]float64{{{1.05, 0, 0, 1.05}, {1.1, 0, 0, 1.1}}}
	c := FromModel(iso, "kPa", nil)
	c.Fit = &FitSection{AngleSignKnown: true}
	c.Selection = &SelectionSection{Pareto: []CandidateCard{
		{Name: "chosen", Chosen: true, HeldoutError: 0.01, HeldoutStdErr: 0.001, Model: NewCandidateModel(iso)},
		{Name: "far", HeldoutError: 0.05, Model: NewCandidateModel(iso)},
		{Name: "richer", HeldoutError: nan, HeldoutStdErr: nan, Model: NewCandidateModel(stiffer)},
		{Name: "richer still", HeldoutError: nan, HeldoutStdErr: nan, Model: NewCandidateModel(stiffer)},
	}}
	strips, err := NewCohortUntestedStrips(eq, false, c, iso, 5)
	if err != nil || len(strips) != 2 {
		t.Fatalf("strips %+v, %v", strips, err)
	}
	want := "no other candidate predicted the held-out protocols, pooled over the cohort's 5 specimens, as well as the chosen model, so"
	if !strings.Contains(strips[0].Summary, want) || strips[0].Models != 0 {
		t.Errorf("summary %q, models %d; want it to contain %q", strips[0].Summary, strips[0].Models, want)
	}
	if single, _ := NewUntestedStrips(eq, false, c, iso); !strings.Contains(single[0].Summary, "no other candidate predicted the held-out protocols as well as the chosen model, so") {
		t.Errorf("a single fit's summary %q", single[0].Summary)
	}
	// With a near-equivalent form the band's words name the pooled
	// evidence too.
	c.Selection.Pareto[2].HeldoutError = 0.0105
	strips, err = NewCohortUntestedStrips(eq, false, c, iso, 5)
	want = "the chosen model and the 1 form the held-out protocols pooled over the cohort's 5 specimens could not tell from its form (each fitted to this specimen) part by"
	if err != nil || !strings.Contains(strips[0].Summary, want) {
		t.Errorf("summary %q, %v; want it to contain %q", strips[0].Summary, err, want)
	}
	// A cohort of one (or of one specimen with a second protocol) pools
	// one specimen: English number agreement, common practice.
	strips, err = NewCohortUntestedStrips(eq, false, c, iso, 1)
	if err != nil || !strings.Contains(strips[0].Summary, "pooled over the cohort's 1 specimen could not tell") {
		t.Errorf("cohort of one: summary %q, %v", strips[0].Summary, err)
	}
}

// A strip that nothing measures still says where it leaves the fitted
// data range: that depends on the card's model and data, not on a band
// (audit 2026-12-05: four SYNTHETIC sutured one-family specimens of a
// cohort, fibres near 33°, whose cards said nothing of it while their
// strips left the range from stretch 1.02–1.09 on). The geometry of
// TestUntestedStripLeavesTheDataRange: a fibre at 35° on the strip 1:0
// has √I4 = √(λ² cos²35° + sin²35°) (Spencer 1971), past 1.013 first at
// the strip's point 1.021. leaves_range_at stays null with the other
// numbers of an unmeasured strip.
func TestUnmeasuredStripSaysWhereItLeavesTheRange(t *testing.T) {
	fam := &aniso.Model{
		Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(35)}},
		Terms: []aniso.Term{
			{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 2},
			{Shape: terms.Lookup("fib-expsq"), Family: 0, Weight: 40, Params: []float64{5}},
		},
	}
	c := FromModel(fam, "kPa", nil)
	c.Fit = &FitSection{AngleSignKnown: true}
	c.Selection = &SelectionSection{Pareto: []CandidateCard{
		{Name: "chosen", Chosen: true, HeldoutError: 0.01, HeldoutStdErr: 0.001, Model: NewCandidateModel(fam)},
		{Name: "far", HeldoutError: 0.05, Model: NewCandidateModel(fam)},
	}}
	s12 := Interval{-0.15, -0.001}
	c.DataRange = &DataRange{Stretch1: Interval{1, 1.14}, Stretch2: Interval{1, 1.14}, Shear12: &s12, Shear21: &s12, FibreStretch: []Interval{{1, 1.013}}}
	eq := [][][4]float64{{{1.07, -0.05, -0.04, 1.07}, {1.14, -0.15, -0.12, 1.14}}}
	strips, err := NewUntestedStrips(eq, true, c, fam)
	if err != nil || len(strips) != 4 || strips[0].Models != 0 {
		t.Fatalf("strips %+v, %v", strips, err)
	}
	if want := "from stretch 1.02 on the strip leaves the fitted data range (fibre stretch of f1"; !strings.Contains(strips[0].Summary, want) {
		t.Errorf("1:0 summary %q, want it to contain %q", strips[0].Summary, want)
	}
	// The number is given too: it depends on the model and data alone
	// (1 + 0.14·6/40 = 1.021, as in TestUntestedStripLeavesTheDataRange).
	if at := float64(strips[0].LeavesRangeAt); math.Abs(at-1.021) > 1e-12 {
		t.Errorf("leaves_range_at %v of an unmeasured strip, want 1.021", at)
	}
}
