package cohortfiles

import (
	"errors"
	"os"
	"path"
	"path/filepath"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/cohortreport"
)

// The order of a cohort's files picks the scouts and orders the
// population fit's sums, so it must not depend on how a path is typed
// (README, "Same input, same output": the path as typed may change only
// the outputs that record it). Until 2026-12-05 the files were ordered by
// the path as typed: five synthetic specimens, one of them typed by its
// absolute path, gave other scouts (S4, S2, S5 instead of S1, S3, S5),
// parameters that moved by up to 1.2e-8 of themselves and a widest
// untested-strip spread of 0.7 % instead of 1.1 %. The order is now that
// of the resolved absolute path, the one name POSIX realpath() gives a
// file however it is reached. A file given twice under two spellings
// was refused as two specimens that "would both write" one folder, with
// the advice to change their metadata; it is now refused as given twice.
func TestCohortOrderIgnoresSpelling(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	real := filepath.Join(dir, "m")
	if err := os.Mkdir(real, 0o755); err != nil {
		t.Fatal(err)
	}
	a, b := filepath.Join(real, "a.csv"), filepath.Join(real, "b.csv")
	for _, f := range []string{a, b} {
		if err := os.WriteFile(f, []byte("stretch_1,stretch_2,cauchy_11,cauchy_22\n1,1,0,0\n"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	link := filepath.Join(dir, "z") // sorts after m, as typed
	if err := os.Symlink(real, link); err != nil {
		t.Skipf("no symbolic links here: %v", err)
	}
	wd, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	relB, err := filepath.Rel(wd, b) // "../…" sorts before "/…", as typed
	if err != nil {
		t.Skipf("no relative path to the temporary folder: %v", err)
	}
	viaLinkA := filepath.Join(link, "a.csv")
	order := func(ms []*Member) string {
		var names []string
		for _, m := range ms {
			names = append(names, path.Base(m.File))
		}
		return strings.Join(names, " ")
	}
	for _, files := range [][]string{{a, b}, {b, a}, {viaLinkA, b}, {a, relB}, {relB, viaLinkA}} {
		if got := order(Read(files, biaxial.Options{}, keep)); got != "a.csv b.csv" {
			t.Errorf("%q: read in the order %s, want a.csv b.csv", files, got)
		}
	}
	ms := Read([]string{viaLinkA, b, a}, biaxial.Options{}, keep)
	twice := 0
	for _, m := range ms {
		if m.Err != nil && strings.Contains(m.Err.Error(), "is given twice (also as ") {
			twice++
		}
	}
	if twice != 1 {
		for _, m := range ms {
			t.Logf("%s: %v", m.File, m.Err)
		}
		t.Errorf("%d files refused as given twice, want 1 (%s is %s)", twice, viaLinkA, a)
	}
}

// keep passes a read error on unchanged.
func keep(err error) error { return err }

// A weight whose label only an unreadable file has is refused with that
// file named: the refusal said no file of the cohort had the label, and
// the read error of the one that had it went unseen. Invented members.
func TestCohortWeightRefusalNamesUnreadFiles(t *testing.T) {
	ms := []*Member{
		{Member: cohortreport.Member{File: "a.csv", Err: errors.New("a.csv:3: unknown length unit")}},
		{Member: cohortreport.Member{File: "b.csv", Spec: &biaxial.Specimen{Protocols: []biaxial.Protocol{{Label: "1:1"}}}}},
	}
	err := CheckWeights(ms, map[string]float64{"0.5:1": 2})
	if err == nil || !strings.Contains(err.Error(), `no file of the cohort that could be read has a protocol "0.5:1" (1 file(s) could not be read and are not counted: a.csv); use one of "1:1"`) {
		t.Errorf("refusal %v", err)
	}
	if err := CheckWeights(ms, map[string]float64{"1:1": 2}); err != nil {
		t.Errorf("a label a read file has: %v", err)
	}
}
