package planning

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// A fit.csv row with two values that are not numbers is reported at the
// first of them in the row, the same column every run (determinism: same
// input, same output). Reporting the first bad field in reading order is
// common practice for readers of delimited text (Go's encoding/csv
// reports the line and column where parsing first fails). Until
// 2026-12-05 the measured columns were kept in a map, and Go's randomised
// map order made 'weft plan' name column 8 in 10 of 12 runs and column 11
// in the other 2.
func TestBadMeasuredValueReportedAtTheFirstColumn(t *testing.T) {
	table := "protocol,line,cycle,F11,F12,F21,F22,measured_nominal_11 [kPa],model_nominal_11 [kPa],residual_nominal_11 [kPa],measured_nominal_22 [kPa]\n" +
		"1:1,12,1,1.01,0,0,1.01,0.5,0.5,0,0.4\n" +
		"1:1,13,1,1.02,0,0,1.02,oops,1.1,0,bad\n"
	c := &card.Card{Data: &card.DataSection{Specimen: "synthetic", StressKind: "nominal", StressUnit: "kPa"}}
	const want = `fit.csv: line 3, column 8: "oops" is not a number`
	// Two map entries come out in the other order in about one run in
	// six (measured on the old code), so 200 runs all but never pass by
	// chance.
	for run := 0; run < 200; run++ {
		_, err := specimenFromTable([]byte(table), "fit.csv", c, biaxial.DefaultLimits)
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Fatalf("run %d: %v, want the error at column 8: %s", run, err, want)
		}
	}
}

// A fit.csv row whose F has det F ≤ 0 (an edited table) is refused with
// the table's line. det F > 0 for every deformation is common practice
// (continuum mechanics: F maps volume elements to positive volumes).
// Until 2026-12-05 the fitting problem refused it as "point 1" of its
// specimen, without the file or line (found by editing each value of a
// fit folder's fit.csv while fuzzing the plan's reader).
func TestFitTableNonPositiveDetFNamesTheLine(t *testing.T) {
	table := "protocol,line,cycle,F11,F12,F21,F22,measured_nominal_11 [kPa],measured_nominal_22 [kPa]\n" +
		"1:1,12,1,1.01,0,0,1.01,0.5,0.4\n" +
		"1:1,13,1,-1.02,0,0,1.02,1.0,0.9\n"
	c := &card.Card{Data: &card.DataSection{Specimen: "synthetic", StressKind: "nominal", StressUnit: "kPa"}}
	_, err := specimenFromTable([]byte(table), "fit.csv", c, biaxial.DefaultLimits)
	const want = "fit.csv: line 3: det F = F11·F22 − F12·F21 = -1.0404 ≤ 0"
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Fatalf("err = %v, want one containing %s", err, want)
	}
}
