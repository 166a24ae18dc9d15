package biaxial

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
)

// All data in these tests are synthetic: an invented membrane specimen
// ("SYN" specimens) whose stress follows a made-up exponential curve. They
// test the reader, not any tissue.

// synthLoad is the invented loading curve of the synthetic specimen, in kPa.
func synthLoad(lam float64) float64 { return 3 * (math.Exp(12*(lam-1)) - 1) }

// synthRecord builds a synthetic record for one protocol with `cycles`
// cycles of `perBranch` steps up and down between a preload stretch lam0 and
// lamMax, with hysteresis (unloading stresses 80 % of loading ones, lower
// on each later cycle) and no cycle column. Axis 2 follows ratio·(λ1 − 1).
func synthRecord(label string, cycles, perBranch int, lam0, lamMax, ratio float64) *Record {
	rec := &Record{Name: "SYN-cycles", Meta: map[string]string{"specimen": "SYN-cycles", "notes": "synthetic"},
		MetaKeys: []string{"specimen", "notes"}, StressUnit: "kPa", Kind: Nominal,
		Measured: [NumComponents]bool{true, true, false, false}, Source: "synthetic.csv"}
	line := 2
	add := func(l1, soft, frac float64, cyc int) {
		l2 := 1 + ratio*(l1-1)
		rec.Rows = append(rec.Rows, Row{Protocol: label, Point: Point{
			F:      [4]float64{l1, 0, 0, l2},
			Stress: [NumComponents]float64{soft * frac * synthLoad(l1), soft * frac * synthLoad(l2)},
			Line:   line, Cycle: cyc, Time: math.NaN()}})
		line++
	}
	for c := 1; c <= cycles; c++ {
		soft := 1 - 0.05*float64(c-1)
		for i := 0; i < perBranch; i++ { // up, peak included
			add(lam0+(lamMax-lam0)*float64(i)/float64(perBranch-1), soft, 1, c)
		}
		for i := 1; i < perBranch-1; i++ { // down, valley excluded (next cycle starts there)
			add(lamMax-(lamMax-lam0)*float64(i)/float64(perBranch-1), soft, 0.8, c)
		}
	}
	add(lam0, 1-0.05*float64(cycles-1), 0.8, cycles) // back to the preload
	return rec
}

// wantParseError checks that err is a *ParseError of category cat at
// line and column, and that its text contains every fragment.
func wantParseError(t *testing.T, err error, cat error, line, col int, fragments ...string) *ParseError {
	t.Helper()
	if err == nil {
		t.Fatalf("no error; want %v at %d:%d", cat, line, col)
	}
	var pe *ParseError
	if !errors.As(err, &pe) {
		t.Fatalf("error %T %q is not a *ParseError", err, err)
	}
	if !errors.Is(err, cat) {
		t.Errorf("error %q: category %v, want %v", err, pe.Err, cat)
	}
	if pe.Line != line || pe.Column != col {
		t.Errorf("error %q at %d:%d, want %d:%d", err, pe.Line, pe.Column, line, col)
	}
	for _, f := range fragments {
		if !strings.Contains(err.Error(), f) {
			t.Errorf("error %q does not mention %q", err, f)
		}
	}
	if pe.Fix == "" && cat != ErrSyntax {
		t.Errorf("error %q says nothing about what to fix", err)
	}
	return pe
}

func near(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b)) || a == b
}

func writeFile(path string, data []byte) error { return os.WriteFile(path, data, 0o644) }
