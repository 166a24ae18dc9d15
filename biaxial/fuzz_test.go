package biaxial

import (
	"bytes"
	"fmt"
	"strings"
	"testing"
)

// FuzzParse feeds arbitrary bytes to the CSV reader. It must never panic;
// every failure must be a *ParseError; the same bytes must read the same,
// or fail the same, twice; and whatever reads cleanly must survive the
// preparation options and a write/read round trip.
func FuzzParse(f *testing.F) {
	f.Add([]byte(goodHeader + goodRows))
	f.Add([]byte("# thickness = 0,5 mm\n# size_1 = 10 mm\n# size_2 = 8 mm\nprotocol;load_1 [gf];load_2 [gf];stretch_1;stretch_2\n1:1;0;0;1;1\n1:1;1,5;1;1,01;1,01\n"))
	f.Add([]byte("protocol,cycle,time [s],F11,F12,F21,F22,nominal_11,nominal_22,nominal_12,nominal_21\n\"a\"\"b\",1,0,1,0,0,1,0,0,0,0\n"))
	f.Add([]byte("\xef\xbb\xbfstretch_1,stretch_2,cauchy_11 [MPa],cauchy_22 [MPa]\n1,1,0,0\n1.1,1.05,0.1,0.05\n"))
	f.Add([]byte("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n\"unclosed,1,1,0,0\n"))
	var buf bytes.Buffer
	_ = WriteRecord(&buf, synthRecord("1:1", 2, 6, 1.01, 1.1, 0.5), Layout{})
	f.Add(buf.Bytes())

	f.Fuzz(func(t *testing.T, data []byte) {
		rec, err := ReadRecord(bytes.NewReader(data), "fuzz.csv", Options{})
		sameTwice(t, data, "fuzz.csv", Options{}, rec, err)
		if err != nil {
			if _, ok := err.(*ParseError); !ok {
				t.Fatalf("error %T %v is not a *ParseError", err, err)
			}
			return
		}
		for _, o := range []Options{{}, {Cycle: CycleAll, Branch: BranchAll}, {Branch: BranchUnloading, Rereference: true}, {Resample: 7, Rereference: true}} {
			s, err := Prepare(rec, o)
			if err != nil {
				continue
			}
			var out bytes.Buffer
			if err := WriteCSV(&out, s, Layout{}); err != nil {
				t.Fatalf("options %+v: writing a prepared specimen: %v", o, err)
			}
		}
		var out bytes.Buffer
		if err := WriteRecord(&out, rec, Layout{}); err != nil {
			t.Fatalf("writing a record that was read: %v", err)
		}
		back, err := ReadRecord(bytes.NewReader(out.Bytes()), "back.csv", Options{})
		if err != nil {
			t.Fatalf("reading back what was written: %v\n%s", err, out.String())
		}
		if len(back.Rows) != len(rec.Rows) {
			t.Fatalf("round trip: %d rows, want %d", len(back.Rows), len(rec.Rows))
		}
		for i := range rec.Rows {
			a, b := rec.Rows[i], back.Rows[i]
			if a.Protocol != b.Protocol || a.F != b.F || a.Stress != b.Stress || a.Cycle != b.Cycle {
				t.Fatalf("round trip row %d: %+v became %+v", i, a, b)
			}
		}
	})
}

// FuzzWorkbook feeds arbitrary bytes to the workbook reader, capped at
// 256 KiB of input and 4 MiB of unpacked workbook. It must never panic or
// fail with anything but a *ParseError; the same bytes must read the same,
// or fail the same, twice; and whatever reads cleanly must survive a
// write/read round trip through CSV.
func FuzzWorkbook(f *testing.F) {
	f.Add(makeWorkbook(f, ""))
	f.Add(makeWorkbook(f, "n/a"))
	f.Add(makeWorkbook(f, "1,5"))
	f.Add([]byte("PK\x03\x04broken"))
	lim := Limits{MaxBytes: 256 << 10, MaxWorkbookBytes: 4 << 20}
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 256<<10 {
			return
		}
		for _, sheet := range []string{"", "SYN-3"} {
			rec, err := ReadRecord(bytes.NewReader(data), "fuzz.xlsx", Options{Sheet: sheet, Limits: lim})
			sameTwice(t, data, "fuzz.xlsx", Options{Sheet: sheet, Limits: lim}, rec, err)
			if err != nil {
				if _, ok := err.(*ParseError); !ok {
					t.Fatalf("error %T %v is not a *ParseError", err, err)
				}
				continue
			}
			var out bytes.Buffer
			if err := WriteRecord(&out, rec, Layout{}); err != nil {
				t.Fatalf("writing a record that was read: %v", err)
			}
			back, err := ReadRecord(bytes.NewReader(out.Bytes()), "back.csv", Options{})
			if err != nil {
				t.Fatalf("reading back what was written: %v\n%s", err, out.String())
			}
			if len(back.Rows) != len(rec.Rows) {
				t.Fatalf("round trip: %d rows, want %d", len(back.Rows), len(rec.Rows))
			}
		}
	})
}

// sameTwice reads data again with opt and fails t unless the second read
// gives what the first did (rec, err): the same error text, or records
// with the same rows, notices and digest.
func sameTwice(t *testing.T, data []byte, name string, opt Options, rec *Record, err error) {
	t.Helper()
	rec2, err2 := ReadRecord(bytes.NewReader(data), name, opt)
	if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
		t.Fatalf("the same input read twice: %v, then %v", err, err2)
	}
	if err != nil {
		return
	}
	if len(rec.Rows) != len(rec2.Rows) || rec.Digest != rec2.Digest || strings.Join(rec.Notices, "\n") != strings.Join(rec2.Notices, "\n") {
		t.Fatalf("the same input read twice gave different records: %d and %d rows", len(rec.Rows), len(rec2.Rows))
	}
	for i := range rec.Rows {
		a, b := rec.Rows[i], rec2.Rows[i]
		if a.Protocol != b.Protocol || a.F != b.F || a.Stress != b.Stress || a.Cycle != b.Cycle || a.Line != b.Line {
			t.Fatalf("the same input read twice: row %d %+v, then %+v", i, a, b)
		}
	}
}

// FuzzHeader fuzzes the metadata lines and the header of a test file
// (each capped at 4 KiB), under six synthetic rows of plausible numbers
// with as many comma-separated fields as the header, so that the header
// parser (column names, units, stress kinds, geometry) sees mutations
// FuzzParse rarely reaches past. It must never panic; every failure must
// be a *ParseError whose line, if any, is a line of the file; and the same
// file must read the same, or fail the same, twice.
func FuzzHeader(f *testing.F) {
	f.Add([]byte("# specimen = fuzz (synthetic)"), []byte("protocol,stretch_1,stretch_2,cauchy_11 [kPa],cauchy_22 [kPa]"))
	f.Add([]byte("# thickness = 0.5 mm\n# size_1 = 10 mm\n# size_2 = 8 mm"), []byte("protocol,stretch_1,stretch_2,load_1 [N],load_2 [N]"))
	f.Add([]byte("# stress_unit = MPa"), []byte("cycle,time [min],F11,F12,F21,F22,nominal_11,nominal_22,nominal_12,nominal_21"))
	f.Add([]byte(""), []byte("protocol,stretch_1,stretch_2,cauchy_11 [kPa],cauchy_22 [MPa],cauchy_12 [Pa],comment"))
	f.Add([]byte("# size_1 = 10 mm"), []byte("protocol,stretch_1,stretch_2,load_1 [gf],tension_2 [N/mm]"))
	f.Fuzz(func(t *testing.T, meta, header []byte) {
		if len(meta) > 4<<10 || len(header) > 4<<10 {
			return
		}
		fields := bytes.Count(header, []byte(",")) + 1
		var b bytes.Buffer
		if len(meta) > 0 {
			b.Write(meta)
			b.WriteByte('\n')
		}
		b.Write(header)
		b.WriteByte('\n')
		for k := 0; k < 6; k++ {
			b.WriteString("1:1")
			for j := 1; j < fields; j++ {
				fmt.Fprintf(&b, ",%g", 1+0.01*float64(k+j%3))
			}
			b.WriteByte('\n')
		}
		data := b.Bytes()
		rec, err := ReadRecord(bytes.NewReader(data), "fuzz.csv", Options{})
		sameTwice(t, data, "fuzz.csv", Options{}, rec, err)
		if err == nil {
			return
		}
		pe, ok := err.(*ParseError)
		if !ok {
			t.Fatalf("error %T %v is not a *ParseError", err, err)
		}
		if lines := bytes.Count(data, []byte("\n")) + 1; pe.Line < 0 || pe.Line > lines || pe.Column < 0 {
			t.Fatalf("error at line %d, column %d of a %d-line file: %v", pe.Line, pe.Column, lines, err)
		}
	})
}
