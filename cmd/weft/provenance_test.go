package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/weft-tools/weft/aniso/card"
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

// The options a card records are the resolved ones, defaults included,
// wherever they decide the result, in a fixed order: discovery's in-plane
// dispersion, a mirror pair's axis, a --terms form's number of families.
func TestFormOptionsResolved(t *testing.T) {
	cases := []struct {
		name string
		ff   fitOptions
		want []string
	}{
		{"discovery", fitOptions{maxTerms: 5, families: -1, layout: "free"}, []string{"--max-terms=5", "--dispersion=in-plane"}},
		{"discovery, ideal families", fitOptions{maxTerms: 3, families: -1, layout: "free", dispersion: "none"}, []string{"--max-terms=3", "--dispersion=none"}},
		{"hgo", fitOptions{preset: "hgo", families: -1, layout: "free"}, []string{"--preset=hgo", "--pair-axis=axis-1"}},
		{"hgo, free axis", fitOptions{preset: "hgo", families: -1, layout: "free", pairAxis: "free"}, []string{"--preset=hgo", "--pair-axis=free"}},
		{"neo-hookean", fitOptions{preset: "neo-hookean", families: -1, layout: "free"}, []string{"--preset=neo-hookean"}},
		{"terms, one family", fitOptions{termIDs: "i1-lin,fib-expsq", families: -1, layout: "free"},
			[]string{"--terms=i1-lin,fib-expsq", "--families=1", "--dispersion=none"}},
		{"terms, mirror", fitOptions{termIDs: "i1-lin,fib-expsq", families: 2, layout: "mirror", dispersion: "in-plane"},
			[]string{"--terms=i1-lin,fib-expsq", "--families=2", "--layout=mirror", "--dispersion=in-plane", "--pair-axis=axis-1"}},
		{"terms, matrix only", fitOptions{termIDs: "i1-lin", families: -1, layout: "free"}, []string{"--terms=i1-lin", "--families=0"}},
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

// A default discovery card records every default that decides its result,
// the in-plane dispersion discovery tries among them, and M1's verdict,
// which rules nothing out, writes verdict.ruled_out as [].
func TestDiscoveryCardRecordsDefaults(t *testing.T) {
	t.Parallel()
	c, raw := readCardFile(t, filepath.Join(demoFits(t).dir, "membrane-M1.weft", "model.json"))
	want := []string{"--cycle=last", "--branch=loading", "--rereference=false", "--resample=0", "--max-terms=5", "--dispersion=in-plane"}
	if c.Provenance == nil || !slices.Equal(c.Provenance.Options, want) {
		t.Fatalf("provenance %+v, want options %q", c.Provenance, want)
	}
	var keys struct {
		Verdict map[string]json.RawMessage `json:"verdict"`
	}
	if err := json.Unmarshal(raw, &keys); err != nil {
		t.Fatal(err)
	}
	if got := string(keys.Verdict["ruled_out"]); got != "[]" {
		t.Errorf("verdict.ruled_out is %q, want []", got)
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
