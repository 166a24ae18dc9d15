package main

import (
	"bytes"
	"encoding/json"
	"math"
	"testing"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// The commands run without cobra from their options: the output of
// runTerms and runEvaluate is what the command line prints, and evaluate
// gives the closed form of an incompressible neo-Hookean membrane in plane
// stress, σ11 = 2 C10 (λ1² − 1/(λ1 λ2)²) (Holzapfel 2000, Nonlinear Solid
// Mechanics, §6.6 with σ33 = 0; Ogden 1984, §4.3).
func TestCommandsRunWithoutCobra(t *testing.T) {
	var out bytes.Buffer
	if err := runTerms(&termsOptions{streams: streams{Out: &out}}); err != nil {
		t.Fatal(err)
	}
	cli, _, code := runWeft(t, "terms")
	if code != 0 || out.String() != cli {
		t.Errorf("runTerms printed what 'weft terms' does not (exit %d)", code)
	}

	model := writeTemp(t, "nh.json", neoHookeanCard)
	out.Reset()
	o := &evaluateOptions{streams: streams{Out: &out}, model: model, F: [4]float64{1.2, 0, 0, 1.1}, json: true}
	if err := runEvaluate(o); err != nil {
		t.Fatal(err)
	}
	cli, _, code = runWeft(t, "evaluate", model, "--stretch", "1.2,1.1", "--json")
	if code != 0 || out.String() != cli {
		t.Errorf("runEvaluate printed what 'weft evaluate' does not (exit %d)", code)
	}
	var r fe.Evaluation
	if err := json.Unmarshal(out.Bytes(), &r); err != nil {
		t.Fatal(err)
	}
	const c10 = 5 // the card's i1-lin weight
	l1, l2 := 1.2, 1.1
	want := 2 * c10 * (l1*l1 - 1/(l1*l1*l2*l2))
	if got := r.Cauchy["11"]; math.Abs(got-want) > 1e-9*want {
		t.Errorf("σ11 = %.12g, closed form %.12g", got, want)
	}
}
