package grouptable

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

// FuzzGroupTable feeds arbitrary bytes (capped at 64 KiB) to the cohort's
// group table reader (a two-column CSV of file and group). It must never
// panic; every error must be a bad-input error naming the table; the same
// table must give the same groups, or the same error, twice; and every
// accepted row's line must be a line of the table.
func FuzzGroupTable(f *testing.F) {
	f.Add([]byte("file,group\nskin-A.csv,young\nskin-B.csv,old\n"))
	f.Add([]byte("\ufeff# synthetic grouping\nfile,group\n\"a,b.csv\",x\n\n./c.csv,y\nc.csv,y\n"))
	f.Add([]byte("a.csv,x\na.csv,y\n"))
	f.Add([]byte("a.csv\n\"unclosed,x\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		if len(data) > 64<<10 {
			return
		}
		const path = "groups.csv"
		tab, err := Parse(data, path)
		tab2, err2 := Parse(data, path)
		if (err == nil) != (err2 == nil) || (err != nil && err.Error() != err2.Error()) {
			t.Fatalf("the same table read twice: %v, then %v", err, err2)
		}
		if err != nil {
			var ge *Error
			if !errors.As(err, &ge) || !strings.HasPrefix(err.Error(), path) {
				t.Fatalf("error is not a table error naming the table: %v", err)
			}
			return
		}
		lines := bytes.Count(data, []byte("\n")) + 1
		for k, r := range tab {
			if tab2[k] != r {
				t.Fatalf("the same table read twice: %q is %+v, then %+v", k, r, tab2[k])
			}
			if r.Line < 1 || r.Line > lines {
				t.Fatalf("%q at line %d of a %d-line table", k, r.Line, lines)
			}
		}
	})
}

// TestGroupTableErrorsNameTheLine checks the group table's errors give the
// line of the file, not the count of rows: a comment line, a blank line
// and a quoted line break each put the two apart. Counting lines from 1,
// comments and blank lines included, is common practice for readers of
// delimited text (Go's encoding/csv reports positions so). Until
// 2026-12-05 the errors gave the row count, so this table's clash (on
// line 7) was reported at line 4, against line 2 (really line 3).
func TestGroupTableErrorsNameTheLine(t *testing.T) {
	table := "# synthetic grouping\n" +
		"file,group\n" +
		"a.csv,young\n" +
		"\n" +
		"\"b\nc.csv\",old\n" +
		"a.csv,old\n"
	_, err := Parse([]byte(table), "groups.csv")
	want := `groups.csv:7: a.csv has the group "old" here and "young" at line 3`
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Fatalf("error %v, want one containing %s", err, want)
	}
	_, err = Parse([]byte("# synthetic\n\na.csv,x,extra\n"), "groups.csv")
	if want := "groups.csv:3: want two columns"; err == nil || !strings.Contains(err.Error(), want) {
		t.Fatalf("error %v, want one containing %s", err, want)
	}
}
