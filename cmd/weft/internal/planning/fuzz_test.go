package planning

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// seedCard reads the model card of the report package's seed fit folder
// (a synthetic fit, testdata/folder there), whose fit.csv the fuzz target
// starts from: a plan reads the same files as a report.
func seedCard(tb testing.TB) (*card.Card, []byte) {
	tb.Helper()
	dir := filepath.Join("..", "report", "testdata", "folder")
	mj, err := os.ReadFile(filepath.Join(dir, "model.json"))
	if err != nil {
		tb.Fatal(err)
	}
	fc, err := os.ReadFile(filepath.Join(dir, "fit.csv"))
	if err != nil {
		tb.Fatal(err)
	}
	c, _, err := card.Parse(bytes.NewReader(mj), "model.json")
	if err != nil {
		tb.Fatal(err)
	}
	return c, fc
}

// FuzzFitTable feeds arbitrary bytes (capped at 64 KiB) as fit.csv to the
// plan's reader, with the seed folder's card. It must never panic; every
// error must be an *InputError that names fit.csv (or model.json, whose
// data section the table must match); the same table must give the same
// result twice; and a specimen it accepts must make a fitting problem
// without panicking.
func FuzzFitTable(f *testing.F) {
	c, fc := seedCard(f)
	f.Add(fc)
	f.Add([]byte("protocol,line,cycle,F11,F12,F21,F22,measured_cauchy_11 [kPa],measured_cauchy_22 [kPa]\n1:1,5,1,1,0,0,1,0,0\n"))
	f.Add([]byte("protocol,line,cycle,F11,F12,F21,F22,measured_cauchy_11 [kPa],measured_cauchy_22 [kPa],measured_cauchy_12 [kPa]\n1:1,5,1,1,0.1,0,1,0,0,NaN\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 64<<10 {
			return
		}
		lim := biaxial.Limits{MaxRows: 1000}
		s, err := specimenFromTable(data, "fit.csv", c, lim)
		s2, err2 := specimenFromTable(data, "fit.csv", c, lim)
		if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
			t.Fatalf("the same table read twice: %v, then %v", err, err2)
		}
		if err != nil {
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error %T %v is not an *InputError", err, err)
			}
			if !strings.Contains(err.Error(), "fit.csv") && !strings.Contains(err.Error(), "model.json") {
				t.Fatalf("error names no file: %v", err)
			}
			return
		}
		if len(s.Protocols) != len(s2.Protocols) {
			t.Fatalf("the same table read twice: %d, then %d protocols", len(s.Protocols), len(s2.Protocols))
		}
		_, _ = aniso.NewProblem(s, nil)
	})
}
