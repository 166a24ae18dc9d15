package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The order in which a file lists its protocols, and their labels, cannot
// change a fit: the demo patch P2 (synthetic) written with its protocol
// blocks in reverse order and relabelled gives the same model, bit for bit
// in every parameter, and the same verdict as the file as bundled. P2 is
// the demo whose verdict is undecided; written in reverse order it was
// once given another recruitment spread, other verdict numbers and other
// compared candidates (the same chosen form).
func TestProtocolOrderCannotChangeTheFit(t *testing.T) {
	if testing.Short() {
		t.Skip("a whole discovery")
	}
	t.Parallel()
	raw, err := os.ReadFile(demoFile("patch-P2.csv"))
	if err != nil {
		t.Fatal(err)
	}
	// Header and comment lines first, then each protocol's block of rows.
	var head []string
	var order []string
	blocks := map[string][]string{}
	for i, line := range strings.Split(strings.TrimRight(string(raw), "\n"), "\n") {
		if strings.HasPrefix(line, "#") || i == 0 || !strings.Contains(line, ",") || strings.HasPrefix(line, "protocol,") {
			head = append(head, line)
			continue
		}
		label := line[:strings.Index(line, ",")]
		if _, ok := blocks[label]; !ok {
			order = append(order, label)
		}
		blocks[label] = append(blocks[label], "run-"+label+line[len(label):])
	}
	if len(order) != 5 {
		t.Fatalf("the demo file has %d protocols, want 5", len(order))
	}
	out := append([]string(nil), head...)
	for i := len(order) - 1; i >= 0; i-- {
		out = append(out, blocks[order[i]]...)
	}
	file := writeTemp(t, "patch-P2-reordered.csv", strings.Join(out, "\n")+"\n")
	dir := fitPath(t, file)
	type card struct {
		Energy   string          `json:"energy"`
		Families json.RawMessage `json:"families"`
		Terms    json.RawMessage `json:"terms"`
		Verdict  json.RawMessage `json:"verdict"`
		Fit      struct {
			Loss float64 `json:"loss"`
			BIC  float64 `json:"bic"`
		} `json:"fit"`
	}
	read := func(path string) card {
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		var c card
		if err := json.Unmarshal(b, &c); err != nil {
			t.Fatal(err)
		}
		return c
	}
	want := read(filepath.Join(demoFits(t).dir, "patch-P2.weft", "model.json"))
	got := read(filepath.Join(dir, "model.json"))
	if got.Energy != want.Energy || string(got.Terms) != string(want.Terms) || string(got.Families) != string(want.Families) {
		t.Errorf("the reordered file gave another model:\n%s\nwant\n%s", got.Energy, want.Energy)
	}
	if got.Fit != want.Fit || string(got.Verdict) != string(want.Verdict) {
		t.Errorf("loss, BIC or verdict differ: %+v %v, want %+v %v", got.Fit, string(got.Verdict), want.Fit, string(want.Verdict))
	}
}
