package report

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
)

// editColumns rewrites a CSV table: keep says, for each column index of
// the header, how many times the column is written (0 drops it, 2 writes
// it twice).
func editColumns(t *testing.T, b []byte, keep map[int]int) []byte {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	w := csv.NewWriter(&out)
	for _, r := range rows {
		var nr []string
		for j, c := range r {
			n, ok := keep[j]
			if !ok {
				n = 1
			}
			for ; n > 0; n-- {
				nr = append(nr, c)
			}
		}
		w.Write(nr)
	}
	w.Flush()
	return out.Bytes()
}

// A fit folder's tables that lack a column the report draws, or repeat
// one, are refused when read, with the file, line and column, instead of
// failing while the figures are drawn. Until 2026-12-05 such tables were
// accepted and the report stopped with "plot load-share: runtime error:
// index out of range [0] with length 0" (a term's column of fit.csv
// deleted) or "plot fit-all: ..." (a model's column of curves.csv deleted
// or repeated). Found by deleting and repeating each column of the seed
// folder's tables and drawing every report the reader accepted.
func TestFolderTablesMissingOrRepeatedColumns(t *testing.T) {
	seed := seedFolder(t)
	// Columns of the seed: fit.csv 13 is i1-lin:cauchy_11 [kPa]; curves.csv
	// 5 is model_cauchy_11 [kPa], 6 its ci95 band.
	cases := []struct {
		name string
		edit func(f *Folder)
		want string
	}{
		{"fit.csv without a term's column", func(f *Folder) { f.FitCSV = editColumns(t, f.FitCSV, map[int]int{13: 0}) },
			"fit.csv: line 1: term i1-lin has no column for component 11"},
		{"fit.csv with a measured column twice", func(f *Folder) { f.FitCSV = editColumns(t, f.FitCSV, map[int]int{7: 2}) },
			`fit.csv: line 1, column 9: "measured_cauchy_11 [kPa]" repeats column 8`},
		{"curves.csv without a model's column", func(f *Folder) { f.CurvesCSV = editColumns(t, f.CurvesCSV, map[int]int{5: 0}) },
			"curves.csv: line 1: model model has no stress column for component 11"},
		{"curves.csv with a model's column twice", func(f *Folder) { f.CurvesCSV = editColumns(t, f.CurvesCSV, map[int]int{5: 2}) },
			`curves.csv: line 1, column 7: "model_cauchy_11 [kPa]" repeats column 6`},
		{"heldout.csv with a column twice", func(f *Folder) { f.HeldoutCSV = editColumns(t, f.HeldoutCSV, map[int]int{6: 2}) },
			`heldout.csv: line 1, column 8: "heldout_cauchy_11 [kPa]" repeats column 7`},
		{"raw.csv with a column twice", func(f *Folder) { f.RawCSV = editColumns(t, f.RawCSV, map[int]int{8: 2}) },
			`raw.csv: line 1, column 10: "cauchy_11 [kPa]" repeats column 9`},
	}
	for _, c := range cases {
		f := seed
		c.edit(&f)
		_, err := Parse(f, card.Limits{})
		var ie *InputError
		if !errors.As(err, &ie) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want an input error containing %s", c.name, err, c.want)
		}
	}
	// The band column alone may be absent (a preset's curve has none).
	f := seed
	f.CurvesCSV = editColumns(t, f.CurvesCSV, map[int]int{6: 0})
	in, err := Parse(f, card.Limits{})
	if err != nil {
		t.Fatalf("curves.csv without a band column: %v", err)
	}
	if _, err := Build(in, Options{}); err != nil {
		t.Fatalf("curves.csv without a band column draws no report: %v", err)
	}
}

// A fit.csv column of a stress component other than 11, 22, 12 or 21 is
// refused, naming the column: weft writes no other, and the readers look
// components up by a linear search that a header of tens of thousands of
// made-up components would have made quadratic. Until 2026-12-05 any
// suffix was taken as a component.
func TestFitTableUnknownComponent(t *testing.T) {
	table := "protocol,line,cycle,F11,F12,F21,F22,measured_cauchy_13 [kPa],model_cauchy_13 [kPa],residual_cauchy_13 [kPa]\n" +
		"1:1,5,1,1,0,0,1,0,0,0\n"
	_, err := readFitTable(strings.NewReader(table), "fit.csv")
	want := `fit.csv: line 1, column 8: "measured_cauchy_13 [kPa]": stress component "13" is not 11, 22, 12 or 21`
	if err == nil || err.Error() != want {
		t.Fatalf("err = %v, want %s", err, want)
	}
}

// BenchmarkCurveTableManyModels reads a curves.csv header of about 60 000
// made-up model names (1 MB). Models were once found by searching the
// list of those already seen, which took 17 s on this header; they are
// now found in a map.
func BenchmarkCurveTableManyModels(b *testing.B) {
	seed := seedFolder(b)
	ft, err := readFitTable(bytes.NewReader(seed.FitCSV), "fit.csv")
	if err != nil {
		b.Fatal(err)
	}
	var h strings.Builder
	h.WriteString("protocol,F11,F12,F21,F22")
	for i := 0; h.Len() < 1<<20; i++ {
		fmt.Fprintf(&h, ",m%d_cauchy_11", i)
	}
	h.WriteString("\n")
	in := []byte(h.String())
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := readCurveTable(bytes.NewReader(in), "curves.csv", ft); err != nil {
			b.Fatal(err)
		}
	}
}
