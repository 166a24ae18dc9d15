package aniso

import (
	"math"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
)

// scaleSpecimen returns a copy of s with every stress multiplied by f and
// the residual weights divided by f, as reading the same data in another
// unit (or scaled) gives.
func scaleSpecimen(s *biaxial.Specimen, f float64, unit string) *biaxial.Specimen {
	c := *s
	c.StressUnit = unit
	c.Protocols = make([]biaxial.Protocol, len(s.Protocols))
	for i, pr := range s.Protocols {
		q := pr
		q.Points = append([]biaxial.Point(nil), pr.Points...)
		for j := range q.Points {
			for k := range q.Points[j].Stress {
				q.Points[j].Stress[k] *= f
			}
		}
		for k := range q.Weight {
			q.Weight[k] /= f
		}
		c.Protocols[i] = q
	}
	return &c
}

// outcome is what must not depend on the stress unit: the chosen form, its
// angles to 0.1° and the verdict.
type outcome struct {
	name, families string
	angles         []float64
}

func outcomeOf(t *testing.T, s *biaxial.Specimen) outcome {
	t.Helper()
	p, err := NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	d, err := Discover(p, DiscoverSettings{MaxTerms: 3})
	if err != nil {
		t.Fatal(err)
	}
	return outcomeFrom(d)
}

// outcomeFrom reads the outcome of a discovery.
func outcomeFrom(d *Discovery) outcome {
	o := outcome{name: d.Best().Name, families: d.Verdict.Families}
	for _, f := range d.Best().Result.Model.Families {
		o.angles = append(o.angles, math.Round(10*f.Angle/deg)/10)
	}
	return o
}

// equal reports the same form and verdict and angles within 0.1°.
func (o outcome) equal(p outcome) bool {
	if o.name != p.name || o.families != p.families || len(o.angles) != len(p.angles) {
		return false
	}
	for i := range o.angles {
		if math.Abs(o.angles[i]-p.angles[i]) > 0.1+1e-9 {
			return false
		}
	}
	return true
}

// The chosen form, its angles (to 0.1°) and the verdict are the same for
// the same data in Pa, kPa and MPa, scaled by factors over [1e-6, 1e6], and
// nudged by (1 ± 1e-9) (issue: unit and scale invariance).
func TestDiscoverUnitInvariance(t *testing.T) {
	if testing.Short() {
		t.Skip("runs discovery 9 times per specimen")
	}
	specimens := map[string]*biaxial.Specimen{
		"one family, no shear": synthSpecimen(t, oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 30, Params: []float64{4}}, 38),
			synthOptions{noise: 0.02, points: 20}),
		"two families, sutured": synthFrom(t, fibreMaterial(2, spreadFamily{10 * deg, -1, expSqFibre(20, 3)}, spreadFamily{65 * deg, -1, expSqFibre(10, 2)}),
			synthOptions{noise: 0.02, points: 20, sutured: true, maxStrain: 0.2}),
	}
	scales := []struct {
		f    float64
		unit string
	}{{1e3, "Pa"}, {1e-3, "MPa"}, {1e-6, "kPa"}, {1e6, "kPa"}, {37.5, "kPa"}, {1 - 1e-9, "kPa"}, {1 + 1e-9, "kPa"}}
	for name, s := range specimens {
		t.Run(name, func(t *testing.T) {
			t.Parallel()
			ref := outcomeOf(t, s)
			t.Logf("kPa: %+v", ref)
			for _, sc := range scales {
				got := outcomeOf(t, scaleSpecimen(s, sc.f, sc.unit))
				if got.name != ref.name || got.families != ref.families || len(got.angles) != len(ref.angles) {
					t.Errorf("×%g (%s): %+v, kPa gave %+v", sc.f, sc.unit, got, ref)
					continue
				}
				for i := range got.angles {
					if math.Abs(got.angles[i]-ref.angles[i]) > 0.1+1e-9 {
						t.Errorf("×%g (%s): angles %v, kPa gave %v", sc.f, sc.unit, got.angles, ref.angles)
					}
				}
			}
		})
	}
}

// Two fibre families at 10° and 70° without shear information, made by
// independent numerical integration (independent_test.go): the walk
// compares each form by its best held-out model, here two families near
// 0° and 90°, which does not beat one family. The verdict's ruled-out note
// on the two-free-families form must still name the form's lowest-BIC
// model, whose families lie near the true 10° and 70°, with its ΔBIC and
// held-out error, so that no evidence for two families is hidden. A form
// that only ties the winner (a mirror pair of one angle: the same loss
// and held-out error) is not said to fit better.
func TestRuledOutNamesTheFormsLowestBIC(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	spec := synthFrom(t, fibreMaterial(3, spreadFamily{10 * deg, -1, expSqFibre(30, 4)}, spreadFamily{70 * deg, -1, expSqFibre(25, 3)}),
		synthOptions{noise: 0.02, points: 30, seed: 1})
	d, _ := discoverSpecimen(t, spec)
	t.Logf("verdict %s: %s", d.Verdict.Families, d.Verdict.Reason)
	var free string
	for _, n := range d.Verdict.RuledOut {
		t.Logf("ruled out: %s", n)
		if strings.HasPrefix(n, "ruled out 2-free ") {
			free = n
		}
	}
	if d.Verdict.Families == "2" {
		// Nothing is hidden when two families win, so the specimen no
		// longer exercises the note: say so rather than pass silently.
		t.Skipf("verdict 2: two families won, and the note this test checks is not written")
	}
	_, rest, ok := strings.Cut(free, "the form's lowest BIC is ")
	if !ok {
		t.Fatalf("the 2-free note does not name the form's lowest-BIC model: %q", free)
	}
	var low *Candidate
	for i := range d.Pareto {
		if strings.HasPrefix(rest, d.Pareto[i].Name+"'s") {
			low = &d.Pareto[i]
		}
	}
	if low == nil || FormKey(low.Result.Structure) != "2-free" {
		t.Fatalf("the note names no 2-free candidate: %q", rest)
	}
	for _, c := range d.Pareto {
		if FormKey(c.Result.Structure) == "2-free" && c.Result.BIC < low.Result.BIC {
			t.Errorf("%s has a lower BIC (%.2f) than the named %s (%.2f)", c.Name, c.Result.BIC, low.Name, low.Result.BIC)
		}
	}
	for _, want := range []float64{10, 70} {
		best := math.Inf(1)
		for _, f := range low.Result.Model.Families {
			best = math.Min(best, math.Abs(math.Abs(WrapDeg(f.Angle/deg))-want))
		}
		if best > 3 {
			t.Errorf("the lowest-BIC 2-free model %s has no family within 3° of %g° (%s)", low.Name, want, anglesText(low.Result))
		}
	}
	if !strings.Contains(rest, "ΔBIC") || !strings.Contains(rest, "held-out error") {
		t.Errorf("the note lacks the ΔBIC or the held-out errors: %q", rest)
	}
	for _, lc := range d.Verdict.Comparisons {
		if lc.RelativeGain <= TieTolerance && lc.DeltaBIC <= 0 {
			for _, n := range d.Verdict.RuledOut {
				if strings.HasPrefix(n, "ruled out "+lc.Richer+" (") {
					t.Errorf("%s ties %s but is ruled out as fitting better: %q", lc.Richer, lc.Simpler, n)
				}
			}
		}
	}
}

// A pick that is not admissible where it was fitted is replaced by the
// next admissible candidate of its form, and the rule says why (the
// criteria of admissible.go: stability modulo rotation and strong
// ellipticity; an I5 term is not polyconvex and can lose stability).
func TestEnsureAdmissible(t *testing.T) {
	bad := &Model{Families: []Family{{Angle: 0.6}}, Terms: []Term{
		{Shape: lookup("i1-lin"), Family: -1, Weight: 0.1},
		{Shape: lookup("i5-quad"), Family: 0, Weight: 100},
	}}
	good := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 3}, Term{Shape: lookup("fib-expsq"), Weight: 30, Params: []float64{4}}, 35)
	spec := synthSpecimen(t, bad, synthOptions{points: 10})
	p, _ := NewProblem(spec, nil)
	st := Structure{Layout: LayoutSingle}
	d := &Discovery{Pareto: []Candidate{
		{Name: "bad", Layout: LayoutSingle, Result: &Result{Structure: st, Model: bad, Complexity: 3}},
		{Name: "good", Layout: LayoutSingle, Result: &Result{Structure: st, Model: good, Complexity: 4}},
	}}
	d.ensureAdmissible(problemEvidence(p))
	if d.Chosen != 1 || !strings.Contains(d.Rule, "bad was set aside because it is unstable") {
		t.Errorf("chosen %d, rule %q", d.Chosen, d.Rule)
	}
}
