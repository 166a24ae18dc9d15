package report

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
)

// seedFolder reads the fit folder in testdata/folder: a chosen-form fit
// (i1-lin plus one exponential fibre family) of 15 synthetic points in
// three protocols, written by the fit command, so that the fuzz targets
// start from the files exactly as weft writes them.
func seedFolder(tb testing.TB) Folder {
	tb.Helper()
	read := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join("testdata", "folder", name))
		if err != nil {
			tb.Fatal(err)
		}
		return b
	}
	return Folder{
		Files:     []string{"model.json", "fit.csv", "heldout.csv", "curves.csv", "raw.csv"},
		ModelJSON: read("model.json"), FitCSV: read("fit.csv"), HeldoutCSV: read("heldout.csv"),
		CurvesCSV: read("curves.csv"), RawCSV: read("raw.csv"),
	}
}

// tableFiles are the CSV files of a fit folder, in the order their errors
// are reported.
var tableFiles = []string{"fit.csv", "heldout.csv", "curves.csv", "raw.csv"}

// FuzzFolderTables feeds arbitrary fit.csv, heldout.csv, curves.csv and
// raw.csv (each capped at 64 KiB) to the report's table readers, as
// Input.parse calls them once model.json is read (the card is left out:
// FuzzCard in aniso/card fuzzes its reader, and parsing it every time
// would slow this target tenfold). A folder's CSV files are often opened
// and saved by hand, so the readers must never panic; every error must
// name the file it is about; the same tables must read the same, or fail
// the same, twice; and accepted tables must hold every series the report
// draws, one value a point. (Drawing the report of each accepted folder
// would make the target too slow to fuzz; TestFolderTablesSeedReads draws
// the seed's.)
func FuzzFolderTables(f *testing.F) {
	seed := seedFolder(f)
	f.Add(seed.FitCSV, seed.HeldoutCSV, seed.CurvesCSV, seed.RawCSV)
	f.Add(seed.FitCSV, []byte(nil), []byte(nil), []byte(nil))
	f.Add(seed.FitCSV, []byte("protocol,line\n"), []byte("protocol,F11,F12,F21,F22\n"), []byte("protocol,line,cycle,kept,F11,F12,F21,F22\n"))
	f.Add([]byte("protocol,line,cycle,F11,F12,F21,F22,measured_cauchy_11 [kPa],model_cauchy_11 [kPa],residual_cauchy_11 [kPa]\n1:1,5,1,1,0,0,1,0,0,0\n"), []byte(nil), []byte(nil), []byte(nil))
	f.Fuzz(func(t *testing.T, fit, heldout, curves, raw []byte) {
		for _, b := range [][]byte{fit, heldout, curves, raw} {
			if len(b) > 64<<10 {
				return
			}
		}
		in, err := readTables(fit, heldout, curves, raw)
		in2, err2 := readTables(fit, heldout, curves, raw)
		if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
			t.Fatalf("the same tables read twice: %v, then %v", err, err2)
		}
		if err != nil {
			if !namesAFile(err.Error()) {
				t.Fatalf("error names no file: %v", err)
			}
			return
		}
		if !sameTables(in, in2) {
			t.Fatal("the same tables read twice gave different tables")
		}
		if msg := incomplete(in); msg != "" {
			t.Fatalf("accepted tables the report cannot draw: %s", msg)
		}
	})
}

// readTables reads a folder's tables as Input.parse does, an empty table
// standing for an absent file (folders of older versions have no
// curves.csv or raw.csv).
func readTables(fit, heldout, curves, raw []byte) (*Input, error) {
	in := &Input{}
	var err error
	if in.table, err = readFitTable(bytes.NewReader(fit), "fit.csv"); err != nil {
		return nil, err
	}
	if len(heldout) > 0 {
		if in.heldout, err = readHeldoutTable(bytes.NewReader(heldout), "heldout.csv", in.table); err != nil {
			return nil, err
		}
	}
	if len(curves) > 0 {
		if in.curves, err = readCurveTable(bytes.NewReader(curves), "curves.csv", in.table); err != nil {
			return nil, err
		}
	}
	if len(raw) > 0 {
		if in.raw, err = readRawTable(bytes.NewReader(raw), "raw.csv", in.table); err != nil {
			return nil, err
		}
	}
	return in, nil
}

// namesAFile reports whether a report error names the folder file it is
// about.
func namesAFile(msg string) bool {
	for _, name := range append([]string{"model.json"}, tableFiles...) {
		if strings.Contains(msg, name) {
			return true
		}
	}
	return false
}

// TestFolderTablesSeedReads checks the seed folder itself reads and draws:
// otherwise the fuzz target would only ever explore its error paths.
func TestFolderTablesSeedReads(t *testing.T) {
	in, err := Parse(seedFolder(t), card.Limits{})
	if err != nil {
		t.Fatal(err)
	}
	files, err := Build(in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 2 || !bytes.Contains(files[0].Data, []byte("<html")) {
		t.Fatalf("seed folder drew %d files", len(files))
	}
}

// sameTables reports whether two reads of a folder gave the same tables
// (their shapes: protocols, points and columns).
func sameTables(a, b *Input) bool {
	if len(a.table.protocols) != len(b.table.protocols) || len(a.table.comps) != len(b.table.comps) || len(a.table.terms) != len(b.table.terms) {
		return false
	}
	for i, p := range a.table.protocols {
		q := b.table.protocols[i]
		if p.label != q.label || len(p.F) != len(q.F) {
			return false
		}
	}
	return (a.heldout == nil) == (b.heldout == nil) && (a.curves == nil) == (b.curves == nil) && (a.raw == nil) == (b.raw == nil)
}

// incomplete says which series of accepted tables lacks values the report
// draws for every point ("" when none): every component's measured, model
// and residual values and every term's contribution in fit.csv, and every
// model's stress (and band, when it has one) in curves.csv.
func incomplete(in *Input) string {
	t := in.table
	for _, pr := range t.protocols {
		n := len(pr.F)
		for c, comp := range t.comps {
			if len(pr.measured[c]) != n || len(pr.model[c]) != n || len(pr.residual[c]) != n {
				return "fit.csv: protocol " + pr.label + ", component " + comp
			}
			for k, term := range t.terms {
				if len(pr.contrib[k][c]) != n {
					return "fit.csv: term " + term + ", component " + comp
				}
			}
		}
	}
	if in.curves == nil {
		return ""
	}
	for label, cr := range in.curves.protos {
		for m, model := range in.curves.models {
			for c := range t.comps {
				if h := len(cr.half[m][c]); len(cr.stress[m][c]) != len(cr.F) || (h != 0 && h != len(cr.F)) {
					return "curves.csv: protocol " + label + ", model " + model
				}
			}
		}
	}
	return ""
}
