package main

import (
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/cohortfiles"
)

// A group table is refused when a row cannot say which file it means: a
// base name that two of the cohort's files share (before, both got its
// group without a word), or one file given two groups (before, the later
// row won without a word). Rows by path, cleaned, still match.
func TestGroupTableAmbiguous(t *testing.T) {
	dir := t.TempDir()
	members := func() []*cohortfiles.Member {
		return []*cohortfiles.Member{member("a/s00.csv", nil), member("a/s01.csv", nil), member("b/s00.csv", nil), member("b/s01.csv", nil)}
	}
	table := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	ok := table("ok.csv", "file,group\ns00.csv,X\nb/s00.csv,Y\n./a/s01.csv,X\nb//s01.csv,Y\n")
	ms := members()
	if _, err := assignGroups(ms, ok, io.Discard); err != nil {
		t.Fatalf("unambiguous table refused: %v", err)
	}
	for i, want := range []string{"X", "X", "Y", "Y"} {
		if ms[i].Group != want {
			t.Errorf("%s: group %q, want %q", ms[i].File, ms[i].Group, want)
		}
	}
	for name, body := range map[string]string{
		"shared.csv": "file,group\ns01.csv,X\na/s00.csv,X\nb/s00.csv,Y\n",
		"twice.csv":  "a/s00.csv,X\n./a/s00.csv,Y\n",
	} {
		_, err := assignGroups(members(), table(name, body), io.Discard)
		if err == nil || !strings.Contains(err.Error(), name+":") || !strings.HasPrefix(err.Error(), "--group-by ") || exitCode(err) != exitBadInput {
			t.Errorf("%s: error %v, want bad input (exit 2) naming the flag and the table's line", name, err)
		}
	}
}

// A group table saved as "CSV UTF-8" by a spreadsheet starts with a
// byte-order mark (U+FEFF; common practice of spreadsheet exports); without a
// header row it was read into the first file's name, and that file lost
// its group.
func TestGroupTableByteOrderMark(t *testing.T) {
	p := filepath.Join(t.TempDir(), "groups.csv")
	if err := os.WriteFile(p, []byte("\ufeffa/s00.csv,X\na/s01.csv,Y\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	ms := []*cohortfiles.Member{member("a/s00.csv", nil), member("a/s01.csv", nil)}
	if _, err := assignGroups(ms, p, io.Discard); err != nil {
		t.Fatal(err)
	}
	if ms[0].Group != "X" || ms[1].Group != "Y" {
		t.Errorf("groups %q, %q; want X, Y", ms[0].Group, ms[1].Group)
	}
}

// A --group-by value that names a file which is not there (a typo, the
// table left in another folder) is bad input, exit 2, before any fit: it
// was read as a metadata key that no file has, so every specimen was left
// out of the group comparisons and the run succeeded (exit 0). A real
// metadata key still groups, and a key with a dot that a file has is
// still a key (biaxial keys may hold '.', see README, Comments and
// metadata).
func TestGroupByMissingTableIsBadInput(t *testing.T) {
	dir := t.TempDir()
	spec := func(meta map[string]string) *biaxial.Specimen { return &biaxial.Specimen{Meta: meta} }
	members := func() []*cohortfiles.Member {
		return []*cohortfiles.Member{
			member("s00.csv", spec(map[string]string{"donor": "A", "site.code": "x"})),
			member("s01.csv", spec(map[string]string{"donor": "B", "site.code": "y"})),
		}
	}
	for _, by := range []string{filepath.Join(dir, "groups.csv"), "groups.csv", "tables/groups", "groups.TXT", dir} {
		_, err := assignGroups(members(), by, io.Discard)
		if exitCode(err) != exitBadInput || !strings.Contains(err.Error(), "--group-by "+by+": ") {
			t.Errorf("--group-by %s: exit %d, %v; want exit 2 naming the missing table", by, exitCode(err), err)
		}
	}
	for _, c := range []struct{ by, want string }{{"donor", "A"}, {"site.code", "x"}, {"age", ""}} {
		ms := members()
		if _, err := assignGroups(ms, c.by, io.Discard); err != nil || ms[0].Group != c.want {
			t.Errorf("--group-by %s: %v, group %q; want %q", c.by, err, ms[0].Group, c.want)
		}
	}
}

// member is a cohort member of the file, read as spec (nil: not read).
func member(file string, spec *biaxial.Specimen) *cohortfiles.Member {
	m := &cohortfiles.Member{}
	m.File, m.Spec, m.At = file, spec, -1
	return m
}
