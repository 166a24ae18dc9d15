package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// readCardFile reads a model card written by weft.
func readCardFile(t *testing.T, path string) (*card.Card, []byte) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	c, _, err := card.Parse(bytes.NewReader(b), path)
	if err != nil {
		t.Fatal(err)
	}
	return c, b
}

// sha256Of is the SHA-256 of a file computed here by the standard library
// (FIPS 180-4), independently of weft's streaming hash.
func sha256Of(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return fmt.Sprintf("%x", sha256.Sum256(b))
}

// The options a card records are the resolved ones, defaults included,
// wherever they decide the result, in a fixed order: discovery's in-plane
// dispersion, a mirror pair's axis, a --terms form's number of families.
func TestFormOptionsResolved(t *testing.T) {
	cases := []struct {
		name string
		ff   fitOptions
		want []string
	}{
		{"discovery", fitOptions{maxTerms: 5, families: -1}, []string{"--max-terms=5", "--dispersion=in-plane"}},
		{"discovery, ideal families", fitOptions{maxTerms: 3, families: -1, dispersion: "none"}, []string{"--max-terms=3", "--dispersion=none"}},
		{"discovery, calibration check", fitOptions{maxTerms: 5, families: -1, calibration: 0.05}, []string{"--max-terms=5", "--dispersion=in-plane", "--calibration-check=0.05"}},
		{"hgo", fitOptions{preset: "hgo", families: -1}, []string{"--preset=hgo", "--pair-axis=axis-1"}},
		{"hgo, free axis", fitOptions{preset: "hgo", families: -1, pairAxis: "free"}, []string{"--preset=hgo", "--pair-axis=free"}},
		{"neo-hookean", fitOptions{preset: "neo-hookean", families: -1}, []string{"--preset=neo-hookean"}},
		{"terms, one family", fitOptions{termIDs: "i1-lin,fib-expsq", families: -1},
			[]string{"--terms=i1-lin,fib-expsq", "--families=1", "--dispersion=none"}},
		{"terms, mirror", fitOptions{termIDs: "i1-lin,fib-expsq", families: 2, layout: "mirror", dispersion: "in-plane"},
			[]string{"--terms=i1-lin,fib-expsq", "--families=2", "--layout=mirror", "--dispersion=in-plane", "--pair-axis=axis-1"}},
		{"terms, matrix only", fitOptions{termIDs: "i1-lin", families: -1}, []string{"--terms=i1-lin", "--families=0"}},
	}
	for _, c := range cases {
		st, chosen, err := structureFromFlags(&c.ff)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if got := formOptionList(&c.ff, st, chosen); !slices.Equal(got, c.want) {
			t.Errorf("%s: options %q, want %q", c.name, got, c.want)
		}
	}
}

// The reading options a card records follow the flags, smoothing
// included: the window as given, and 0 when F is as measured.
func TestReadOptionsRecordSmoothing(t *testing.T) {
	rf := &readFlags{cycle: "2", branch: "all", smooth: 9, limits: &limitFlags{}}
	o, err := rf.options()
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"--cycle=2", "--branch=all", "--rereference=false", "--resample=0", "--smooth-strain=9"}
	if got := readOptionList(o, ""); !slices.Equal(got, want) {
		t.Errorf("options %q, want %q", got, want)
	}
	rf.smooth = 6
	if _, err := rf.options(); err == nil || !strings.Contains(err.Error(), "--smooth-strain 6: use 0 (off) or an odd number") {
		t.Errorf("window 6: error %v", err)
	}
}

// A default discovery card records every default that decides its result,
// the in-plane dispersion discovery tries among them, and M1's verdict
// names the spread forms it did not consider: M1's fibres are ideal
// (synthetic, testdata/demo/README.md), so every spread model goes to the
// concentration bound. (An empty list is written as [], not null:
// aniso/card's TestVerdictListsAlwaysWritten.)
func TestDiscoveryCardRecordsDefaults(t *testing.T) {
	t.Parallel()
	c, raw := readCardFile(t, filepath.Join(demoFits(t).dir, "membrane-M1.weft", "model.json"))
	want := []string{"--cycle=last", "--branch=loading", "--rereference=false", "--resample=0", "--smooth-strain=0", "--max-terms=5", "--dispersion=in-plane"}
	if c.Provenance == nil || !slices.Equal(c.Provenance.Options, want) {
		t.Fatalf("provenance %+v, want options %q", c.Provenance, want)
	}
	var keys struct {
		Verdict map[string]json.RawMessage `json:"verdict"`
	}
	if err := json.Unmarshal(raw, &keys); err != nil {
		t.Fatal(err)
	}
	var ruled []string
	if err := json.Unmarshal(keys.Verdict["ruled_out"], &ruled); err != nil {
		t.Fatalf("verdict.ruled_out %s: %v", keys.Verdict["ruled_out"], err)
	}
	for _, form := range []string{"1+dispersed", "2-mirror+dispersed", "2-free+dispersed"} {
		found := false
		for _, r := range ruled {
			found = found || strings.HasPrefix(r, form+" was not considered: every family of its models is spread at the fit's bound")
		}
		if !found {
			t.Errorf("verdict.ruled_out %q does not say why %s was not considered", ruled, form)
		}
	}
}

// A --preset hgo card records the pair's axis it held, though not typed.
func TestPresetCardRecordsPairAxis(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	data := quickData(t, dir, "s.csv")
	out := filepath.Join(dir, "s.weft")
	if _, stderr, code := runWeft(t, "fit", data, "--preset", "hgo", "-o", out, "--quiet"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	c, _ := readCardFile(t, filepath.Join(out, "model.json"))
	if c.Provenance == nil || !slices.Contains(c.Provenance.Options, "--pair-axis=axis-1") || !slices.Contains(c.Provenance.Options, "--preset=hgo") {
		t.Errorf("provenance %+v, want --preset=hgo and --pair-axis=axis-1", c.Provenance)
	}
}

// Every card a cohort writes and cohort.json record the version, the
// options and the SHA-256 of their inputs: each specimen's card its own
// file, as weft fit records it, population.json the files pooled,
// cohort.json every file read; the cohort report shows the version.
func TestCohortProvenance(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	sp := writePlantedCohort(t, dir, 2, 10, 5, cohortPopulation{"A", 25, 30}, cohortPopulation{"B", 25, 45})
	out := filepath.Join(dir, "cohort")
	args := []string{"cohort", "-o", out, "--quiet", "--group-by", "group", "--preset", "hgo", "--no-specimen-reports"}
	var files []string
	for _, s := range sp {
		args = append(args, s.file)
		files = append(files, s.file)
	}
	slices.Sort(files)
	if _, stderr, code := runWeft(t, args...); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	options := []string{"--cycle=last", "--branch=loading", "--rereference=false", "--resample=0", "--smooth-strain=0", "--preset=hgo", "--pair-axis=axis-1"}
	check := func(what string, p *card.Provenance, opts []string, inputs []string) {
		t.Helper()
		if p == nil {
			t.Fatalf("%s records no provenance", what)
		}
		if p.Software != "weft" || p.VersionText() != versionText() || p.Command != "weft cohort" || !slices.Equal(p.Options, opts) {
			t.Errorf("%s: provenance %s %s, %s %q", what, p.Software, p.VersionText(), p.Command, p.Options)
		}
		if len(p.Inputs) != len(inputs) {
			t.Fatalf("%s: %d inputs, want %d", what, len(p.Inputs), len(inputs))
		}
		for i, f := range inputs {
			if in := p.Inputs[i]; in.File != filepath.Base(f) || in.SHA256 != sha256Of(t, f) {
				t.Errorf("%s: input %d is %+v, want %s with SHA-256 %s", what, i, in, filepath.Base(f), sha256Of(t, f))
			}
		}
	}
	for _, f := range files {
		name := strings.TrimSuffix(filepath.Base(f), ".csv")
		c, _ := readCardFile(t, filepath.Join(out, name+".weft", "model.json"))
		check(name+".weft/model.json", c.Provenance, options, []string{f})
	}
	for _, name := range []string{"population.json", "mean-parameters.json"} {
		c, _ := readCardFile(t, filepath.Join(out, name))
		check(name, c.Provenance, options, files)
	}
	s := readCohortJSON(t, out)
	check("cohort.json", s.Provenance, append(slices.Clone(options), "--group-by=group"), files)
	html, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"written by weft " + htmlText(versionText()), sha256Of(t, files[0]), "weft cohort --cycle=last"} {
		if !strings.Contains(string(html), want) {
			t.Errorf("the cohort report lacks %q", want)
		}
	}
}

// The report's view of the whole record is read again after the fit; if
// the file's bytes are no longer those the fit read (a tester still
// writing, a file replaced), the view is left out rather than shown beside
// a fit of other data.
func TestRecordViewOfChangedFileLeftOut(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "demo", "membrane-M1.csv"))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "m1.csv")
	if err := os.WriteFile(path, src, 0o644); err != nil {
		t.Fatal(err)
	}
	spec, err := readSpecimen(path, biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if spec.Digest.SHA256 != sha256Of(t, path) || spec.Digest.Bytes != int64(len(src)) {
		t.Fatalf("digest %+v, file %s of %d bytes", spec.Digest, sha256Of(t, path), len(src))
	}
	if view, changed := readRecordView(path, biaxial.Options{}, spec.Digest); view == nil || changed {
		t.Fatalf("unchanged file: view %v, changed %v", view != nil, changed)
	}
	if err := os.WriteFile(path, append(src, []byte("\n")...), 0o644); err != nil {
		t.Fatal(err)
	}
	if view, changed := readRecordView(path, biaxial.Options{}, spec.Digest); view != nil || !changed {
		t.Errorf("changed file: view %v, changed %v; want no view", view != nil, changed)
	}
}

// A second file whose specimen name gives an existing member's folder is
// refused (exit 1), and it leaves no trace in the kept member's card: the
// card's provenance named the refused file, and the mean card listed it,
// until 2026-12-04.
func TestCohortProvenanceWithARefusedDuplicate(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	sp := writePlantedCohort(t, dir, 3, 10, 5, cohortPopulation{"A", 25, 30})
	b, err := os.ReadFile(sp[1].file)
	if err != nil {
		t.Fatal(err)
	}
	first := strings.TrimSuffix(filepath.Base(sp[0].file), ".csv")
	second := strings.TrimSuffix(filepath.Base(sp[1].file), ".csv")
	dup := filepath.Join(dir, "zz-dup.csv")
	if err := os.WriteFile(dup, []byte(strings.Replace(string(b), "# specimen = "+second, "# specimen = "+first, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "cohort")
	args := []string{"cohort", "-o", out, "--quiet", "--preset", "hgo", "--no-specimen-reports"}
	var kept []string
	for _, s := range sp {
		args = append(args, s.file)
		kept = append(kept, s.file)
	}
	if _, stderr, code := runWeft(t, append(args, dup)...); code != 1 || !strings.Contains(stderr, "zz-dup.csv") {
		t.Fatalf("exit %d, want 1 naming the duplicate: %s", code, stderr)
	}
	c, _ := readCardFile(t, filepath.Join(out, first+".weft", "model.json"))
	if p := c.Provenance; p == nil || len(p.Inputs) != 1 || p.Inputs[0].File != filepath.Base(sp[0].file) || p.Inputs[0].SHA256 != sha256Of(t, sp[0].file) {
		t.Errorf("%s.weft/model.json: provenance %+v, want %s alone", first, c.Provenance, filepath.Base(sp[0].file))
	}
	m, _ := readCardFile(t, filepath.Join(out, "mean-parameters.json"))
	if m.Provenance == nil || len(m.Provenance.Inputs) != len(kept) {
		t.Errorf("mean-parameters.json: provenance %+v, want the %d fitted files", m.Provenance, len(kept))
	}
}
