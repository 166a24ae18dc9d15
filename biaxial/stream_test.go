package biaxial

import (
	"bytes"
	"crypto/sha256"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"
)

// oneByteReader hands out its input a byte at a time, the worst case for
// a reader that refills its buffer.
type oneByteReader struct{ r io.Reader }

func (o oneByteReader) Read(p []byte) (int, error) {
	if len(p) == 0 {
		return 0, nil
	}
	return o.r.Read(p[:1])
}

// A file far larger than the reader's buffer, with metadata, a quoted
// header, labels that change, quoted fields spanning lines and doubled
// quotes, read line by line: what outlives a line (metadata, headers,
// labels) must survive the buffer being refilled, and reading into a
// Specimen directly must give what ReadRecord followed by Prepare gives.
func TestStreamingMatchesRecord(t *testing.T) {
	var b strings.Builder
	b.WriteString("# specimen = SYN-stream (synthetic)\n# notes = a \"quoted\" note\n# thickness = 0.5 mm\n# size_1 = 10 mm\n# size_2 = 8 mm\n")
	b.WriteString("\"protocol\",cycle,time [s],stretch_1,stretch_2,load_1 [mN],load_2 [mN],comment\n")
	labels := []string{"1:1", "\"1:0,5\"", "\"0.5:1\nsecond line\"", "\"say \"\"two\"\"\""}
	line := 7
	for k, l := range labels {
		for c := 1; c <= 3; c++ {
			for i := 0; i <= 400; i++ {
				up := 1 - math.Abs(float64(i)/200-1)
				l1 := 1 + 0.1*up
				l2 := 1 + 0.1*up*float64(k+1)/4
				fmt.Fprintf(&b, "%s,%d,%.2f,%.7g,%.7g,%.6g,%.6g,row %d\n", l, c, 0.01*float64(line), l1, l2, 3*(math.Exp(8*(l1-1))-1), 2*(math.Exp(8*(l2-1))-1), line)
				line += 1 + strings.Count(l, "\n")
			}
		}
	}
	data := b.String()
	if len(data) < 4*64<<10 {
		t.Fatalf("the file is only %d bytes; it must span several buffers", len(data))
	}
	for _, opt := range []Options{{}, {Cycle: CycleAll, Branch: BranchAll}, {Cycle: 2, Branch: BranchUnloading, Rereference: true}, {Resample: 20}} {
		rec, err := ReadRecord(strings.NewReader(data), "stream.csv", Options{})
		if err != nil {
			t.Fatal(err)
		}
		if rec.Meta["notes"] != "a \"quoted\" note" || rec.Name != "SYN-stream (synthetic)" || len(rec.Rows) != 4*3*401 {
			t.Fatalf("metadata or rows lost: %q %q, %d rows", rec.Meta["notes"], rec.Name, len(rec.Rows))
		}
		want, err := Prepare(rec, opt)
		if err != nil {
			t.Fatal(err)
		}
		got, err := Read(oneByteReader{strings.NewReader(data)}, "stream.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		t.Chdir(t.TempDir()) // the file's name is then the same in every message
		if err := writeFile("stream.csv", []byte(data)); err != nil {
			t.Fatal(err)
		}
		fromFile, err := ReadFile("stream.csv", opt)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range []*Specimen{want, got, fromFile} {
			for i := range s.Protocols {
				for j := range s.Protocols[i].Points {
					if math.IsNaN(s.Protocols[i].Points[j].Time) {
						t.Fatalf("time lost on line %d", s.Protocols[i].Points[j].Line)
					}
				}
			}
		}
		if !reflect.DeepEqual(got, want) || !reflect.DeepEqual(fromFile, want) {
			t.Fatalf("options %+v: reading straight into a Specimen differs from ReadRecord + Prepare", opt)
		}
		var gotLabels []string
		for _, p := range got.Protocols {
			gotLabels = append(gotLabels, p.Label)
		}
		sort.Strings(gotLabels) // Prepare orders protocols by their data (TestProtocolOrder)
		if want := []string{"0.5:1\nsecond line", "1:0,5", "1:1", "say \"two\""}; !reflect.DeepEqual(gotLabels, want) {
			t.Errorf("labels %q, want %q", gotLabels, want)
		}
		if !strings.Contains(strings.Join(got.Notices, "\n"), `column "comment" is not part of the weft layout`) {
			t.Errorf("the notice about the ignored column lost its name: %q", got.Notices)
		}
	}
}

// A stream larger than the limit stops at the limit, also when it arrives
// a byte at a time, and whatever precedes the limit is read.
func TestStreamingSizeLimit(t *testing.T) {
	in := goodHeader + goodRows
	_, err := ReadRecord(oneByteReader{strings.NewReader(in)}, "data.csv", Options{Limits: Limits{MaxBytes: int64(len(in) - 1)}})
	wantParseError(t, err, ErrFileSize, 0, 0, "larger than")
	if _, err := ReadRecord(oneByteReader{strings.NewReader(in)}, "data.csv", Options{Limits: Limits{MaxBytes: int64(len(in))}}); err != nil {
		t.Errorf("a stream of exactly the limit: %v", err)
	}
	// A workbook is read whole, within the same limit.
	wb := makeWorkbook(t, "")
	_, err = ReadRecord(bytes.NewReader(wb), "tests.xlsx", Options{Sheet: "SYN-3", Limits: Limits{MaxBytes: int64(len(wb) - 1)}})
	wantParseError(t, err, ErrFileSize, 0, 0, "larger than")
}

// A specimen's Digest is the number and SHA-256 of the bytes it was read
// from, computed while reading: checked against the standard library's
// SHA-256 of the same bytes (crypto/sha256, as a reference), for a CSV
// file spanning several read buffers with blank lines after its last row,
// read from its path and as a stream handed over one byte at a time, and
// for a workbook read from its path (through the file, by random access)
// and as a stream; FileDigest of the same files too.
func TestDigestIsTheBytesRead(t *testing.T) {
	var b strings.Builder
	b.WriteString("# specimen = SYN-digest (synthetic)\nprotocol,stretch_1,stretch_2,cauchy_11 [kPa],cauchy_22 [kPa]\n")
	for i := 0; i <= 6000; i++ {
		l := 1 + 0.1*float64(i)/6000
		fmt.Fprintf(&b, "1:1,%.7g,%.7g,%.6g,%.6g\n", l, l, 30*(l-1), 25*(l-1))
	}
	b.WriteString("\n\n")
	csv := []byte(b.String())
	book := makeWorkbook(t, "")
	dir := t.TempDir()
	for _, c := range []struct {
		name  string
		data  []byte
		sheet string
	}{{"digest.csv", csv, ""}, {"digest.xlsx", book, "SYN-3"}} {
		want := Digest{Bytes: int64(len(c.data)), SHA256: fmt.Sprintf("%x", sha256.Sum256(c.data))}
		path := filepath.Join(dir, c.name)
		if err := writeFile(path, c.data); err != nil {
			t.Fatal(err)
		}
		if dg, err := FileDigest(path); err != nil || dg != want {
			t.Errorf("%s: FileDigest %+v (%v), want %+v", c.name, dg, err, want)
		}
		s, err := ReadFile(path, Options{Sheet: c.sheet})
		if err != nil {
			t.Fatal(err)
		}
		if s.Digest != want {
			t.Errorf("%s from its path: digest %+v, want %+v", c.name, s.Digest, want)
		}
		s, err = Read(oneByteReader{bytes.NewReader(c.data)}, c.name, Options{Sheet: c.sheet})
		if err != nil {
			t.Fatal(err)
		}
		if s.Digest != want {
			t.Errorf("%s as a stream: digest %+v, want %+v", c.name, s.Digest, want)
		}
	}
}
