package aniso

import "testing"

// A candidate form whose fit failed on one specimen (screenOn keeps the
// specimen while any candidate fits it) is left out of that specimen's
// evidence; the others, and the choice, stay. Until 2026-12-05 such a
// specimen's evidence was nil and its card carried no untested strips at
// all, though its tests left them out. Invented results; the check is
// bookkeeping, no outside reference applies.
func TestSpecimenEvidenceSkipsAFormNotFittedToTheSpecimen(t *testing.T) {
	own := []*Result{{}, {}, {}}
	c := &Cohort{
		Discovery: &Discovery{Pareto: []Candidate{{Name: "a"}, {Name: "b"}, {Name: "c"}}, Chosen: 2},
		Specimens: []CohortSpecimen{{candidateFits: []*Result{own[0], nil, own[2]}, presetFits: []*Result{}}},
	}
	d := c.SpecimenEvidence(0)
	if d == nil {
		t.Fatal("no evidence for a specimen one candidate could not be fitted to")
	}
	if len(d.Pareto) != 2 || d.Pareto[0].Name != "a" || d.Pareto[1].Name != "c" || d.Best().Name != "c" || d.Best().Result != own[2] || d.Pareto[0].Result != own[0] {
		t.Errorf("evidence %+v, chosen %d", d.Pareto, d.Chosen)
	}
	if len(c.Discovery.Pareto) != 3 || c.Discovery.Chosen != 2 {
		t.Error("the cohort's own discovery was changed")
	}
	// Without a fit of the chosen form there is no card to lend a band.
	c.Specimens[0].candidateFits[2] = nil
	if c.SpecimenEvidence(0) != nil {
		t.Error("evidence without the chosen form's fit")
	}
}
