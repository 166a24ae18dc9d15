package main

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// TestHeldoutTableIsTheSelectionsFolds: heldout.csv of a discovered model
// holds the predictions the selection scored. From the table alone, each
// left-out protocol's held-out error (√(weighted SSE / components), the
// cross-validation's definition) is recomputed and must equal the fold
// error the card's chosen candidate records.
func TestHeldoutTableIsTheSelectionsFolds(t *testing.T) {
	t.Parallel()
	dir := filepath.Join(demoFits(t).dir, "membrane-M1.weft")
	c, _ := readCardFile(t, filepath.Join(dir, "model.json"))
	var chosen *card.CandidateCard
	for i := range c.Selection.Pareto {
		if c.Selection.Pareto[i].Chosen {
			chosen = &c.Selection.Pareto[i]
		}
	}
	if chosen == nil || len(chosen.HeldoutFolds) != 5 {
		t.Fatalf("no chosen candidate with five held-out folds in the card")
	}
	spec, err := biaxial.ReadFile(demoFile("membrane-M1.csv"), biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(filepath.Join(dir, "heldout.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	pred := map[string][]float64{} // protocol → predictions, 11 then 22 per point
	for _, r := range rows[1:] {
		for _, s := range r[6:8] {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatal(err)
			}
			pred[r[0]] = append(pred[r[0]], v)
		}
	}
	for i, fold := range chosen.HeldoutFolds {
		test, err := aniso.NewProblem(spec, []int{i})
		if err != nil {
			t.Fatal(err)
		}
		p := pred[fold.Protocol]
		if len(p) != len(test.Measured) {
			t.Fatalf("protocol %s: %d held-out values for %d rows", fold.Protocol, len(p), len(test.Measured))
		}
		sse := 0.0
		for r, v := range p {
			d := test.RowWeight[r] * (v - test.Measured[r])
			sse += d * d
		}
		got := math.Sqrt(sse / float64(len(test.Output.Components)))
		if want := float64(fold.Error); math.Abs(got-want) > 1e-9*want {
			t.Errorf("protocol %s: held-out error from heldout.csv %.12g, the selection's %.12g", fold.Protocol, got, want)
		}
	}
}
