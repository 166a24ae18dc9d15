package summary

import (
	"strings"
	"testing"
	"time"

	"github.com/weft-tools/weft/cmd/weft/internal/cohortreport"
)

// The terminal summary says which specimens the population fit left out
// and when it failed, as cohort.json and report.html do; before, it
// listed population.json among the files written with no word that two of
// five specimens were not in it.
func TestCohortSummaryNamesSpecimensLeftOutOfThePopulation(t *testing.T) {
	s := &cohortreport.Summary{Population: &cohortreport.PopulationInfo{
		Card: cohortreport.PopulationCard, Specimens: []string{"A", "B", "C"}, LeftOut: []string{"N1", "N2"}}}
	var b strings.Builder
	PrintCohort(&b, s, "out", time.Second)
	if !strings.Contains(b.String(), "left out of the population fit") || !strings.Contains(b.String(), "N1, N2") {
		t.Errorf("summary does not name the specimens left out of the population fit:\n%s", b.String())
	}
	s.Population = &cohortreport.PopulationInfo{Specimens: []string{"A"}, Error: "no data"}
	b.Reset()
	PrintCohort(&b, s, "out", time.Second)
	if !strings.Contains(b.String(), "population model could not be fitted: no data") {
		t.Errorf("summary does not say the population fit failed:\n%s", b.String())
	}
	s.Population = &cohortreport.PopulationInfo{Card: cohortreport.PopulationCard, Specimens: []string{"A"}}
	b.Reset()
	PrintCohort(&b, s, "out", time.Second)
	if strings.Contains(b.String(), "left out of the population") || strings.Contains(b.String(), "could not be fitted") {
		t.Errorf("summary of a whole population speaks of a gap:\n%s", b.String())
	}
}
