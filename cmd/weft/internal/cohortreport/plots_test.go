package cohortreport

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
	"github.com/weft-tools/weft/terms"
)

// renderOne draws a cohort figure as SVG text.
func renderOne(t *testing.T, f *report.Figure) string {
	t.Helper()
	if f == nil {
		t.Fatal("no figure")
	}
	rs, err := report.Render([]report.Figure{*f})
	if err != nil {
		t.Fatal(err)
	}
	return string(rs[0].SVG)
}

// The cohort's figures say in the picture what their lines and markers
// are. Until 2026-12-05 neither had a legend: pale and heavy lines, dots
// and bars were explained only in the HTML caption, so a PNG on a slide
// could not be read; and the curves figure counted "2 specimens" in a
// cohort of three without saying which one was left out. Invented
// specimens: S pooled, T (another measure) left out.
func TestCohortFiguresHaveLegends(t *testing.T) {
	model := &aniso.Model{Terms: []aniso.Term{{Shape: terms.Lookup("i1-lin"), Family: -1, Weight: 3}}}
	spec := &biaxial.Specimen{Name: "S", Protocols: []biaxial.Protocol{{Label: "1:1",
		Points: []biaxial.Point{{F: [4]float64{1.1, 0, 0, 1.1}, Stress: [4]float64{1, 1}}, {F: [4]float64{1.2, 0, 0, 1.2}, Stress: [4]float64{4, 4}}}}}}
	in := &Input{Cohort: &aniso.Cohort{InPopulation: []int{0}, LeftOut: []int{1}}, Population: model, MeanParameters: model,
		StressUnit: "kPa", StressKind: "nominal",
		Specimens: []Specimen{{File: "s.csv", Name: "S", Problem: &aniso.Problem{Specimen: spec}},
			{File: "t.csv", Name: "T", Problem: &aniso.Problem{Specimen: spec}}}}
	s := &Summary{StressUnit: "kPa", StressKind: "nominal",
		Parameters: []ParamInfo{{Name: "weight[i1-lin]", Unit: "kPa"}},
		Specimens:  []SpecimenRow{{Specimen: "S", Parameters: map[string]card.Num{"weight[i1-lin]": 3}}, {Specimen: "T", Parameters: map[string]card.Num{"weight[i1-lin]": 4}}},
		Stats:      []StatRow{{Parameter: "weight[i1-lin]", Group: "all", N: 2, Mean: 3.5, CI95: [2]card.Num{-2.85, 9.85}}}}
	cf := s.curveFigure(in)
	curves := renderOne(t, cf)
	for _, want := range []string{"P11 measured, each pooled specimen", "P22 measured, each pooled specimen", "P11 population model", "P22 population model", "nominal P [kPa]"} {
		if !strings.Contains(curves, ">"+want+"<") {
			t.Errorf("curves figure: no %q", want)
		}
	}
	if !strings.Contains(cf.Caption, "Drawn: S.") || !strings.Contains(cf.Caption, "left out of the population fit (another stress measure or unit): T.") {
		t.Errorf("curves caption does not name the drawn and the left-out specimens: %q", cf.Caption)
	}
	params := renderOne(t, s.parameterFigure(in))
	for _, want := range []string{"one specimen", "group mean (short bar)", "95 % interval of the mean (line)"} {
		if !strings.Contains(params, ">"+want+"<") {
			t.Errorf("parameters figure: no %q", want)
		}
	}
}
