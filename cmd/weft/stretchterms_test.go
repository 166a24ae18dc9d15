package main

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"github.com/weft-tools/weft/cmd/weft/internal/catalogue"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// psCard writes a card with the given terms JSON (no families unless given).
func psCard(t *testing.T, name, families, termsJSON string) string {
	t.Helper()
	return writeTemp(t, name+".json", fmt.Sprintf(`{"format":"weft.model/1","stress_unit":"kPa","families":[%s],"terms":[%s]}`, families, termsJSON))
}

func checkJSON(t *testing.T, file string) (fe.CheckReport, int) {
	t.Helper()
	out, errs, code := runWeft(t, "check", file, "--json")
	var r fe.CheckReport
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatalf("%s: %v (exit %d) %s", file, err, code, errs)
	}
	return r, code
}

// weft terms lists the principal-stretch and recruitment shapes with their
// formulas, the argument of the principal-stretch shapes and their
// parameters.
func TestTermsListsNewShapes(t *testing.T) {
	out, _, code := runWeft(t, "terms")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	for _, want := range []string{"ps-pos", "ps-neg", "lambda_i", "w*(2/α^2)*(λ1^α + λ2^α + λ3^α - 3)", "exponent=α in [1, 30]", "exponent=α in [-30, -1]",
		"fib-recruit", "min(max(λ_f,λa),λa+Δ)", "onset=λa in [1, 1.5]", "spread=Δ in [0, 0.5]", "lambda_f = sqrt(1 + E_f)"} {
		if !strings.Contains(out, want) {
			t.Errorf("weft terms lacks %q", want)
		}
	}
	js, _, _ := runWeft(t, "terms", "--json")
	var doc struct {
		Terms []catalogue.Term `json:"terms"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil {
		t.Fatal(err)
	}
	seen := 0
	for _, ti := range doc.Terms {
		switch ti.ID {
		case "ps-pos", "ps-neg":
			seen++
			if ti.Argument != "lambda_i" || ti.Family || !ti.Polyconvex || len(ti.Params) != 1 || ti.LaTeX == "" {
				t.Errorf("%s: %+v", ti.ID, ti)
			}
		case "fib-recruit":
			seen++
			if ti.Argument != "E_f" || !ti.Family || !ti.Polyconvex || len(ti.Params) != 2 {
				t.Errorf("%s: %+v", ti.ID, ti)
			}
		}
	}
	if seen != 3 {
		t.Errorf("%d of the 3 new shapes in terms --json", seen)
	}
}

// The polyconvexity claim checked numerically with weft check (Ball 1977,
// from memory: w ≥ 0 with |α| ≥ 1 keeps the three-dimensional energy
// polyconvex). Positive exponents pass every check on the default grid,
// at the ends of their range too; so do a recruited mirror pair on a
// neo-Hookean matrix and a two-term principal-stretch matrix. A negative
// exponent dominating the matrix behaves as an I2 term does: the check
// finds the membrane's loss of stability under large equibiaxial stretch
// (Kearsley 1986), which polyconvexity of the three-dimensional energy does
// not prevent; at α = −2 the report equals that of (w/2)(I2 − 3) point for
// point, a cross-check of the principal-stretch tangent against the
// invariant one.
func TestCheckCardsWithNewShapes(t *testing.T) {
	for _, c := range []struct{ name, fam, terms string }{
		{"ps-pos-1", "", `{"id":"ps-pos","weight":2,"params":{"exponent":1}}`},
		{"ps-pos-9", "", `{"id":"ps-pos","weight":2,"params":{"exponent":9}}`},
		{"ps-pos-30", "", `{"id":"ps-pos","weight":2,"params":{"exponent":30}}`},
		{"ps-mix", "", `{"id":"ps-pos","weight":2,"params":{"exponent":9}},{"id":"ps-neg","weight":0.5,"params":{"exponent":-7}}`},
		{"recruit-pair", `{"name":"f1","angle_deg":30},{"name":"f2","angle_deg":-30}`,
			`{"id":"i1-lin","weight":2},{"id":"fib-recruit","weight":300,"params":{"onset":1.02,"spread":0.1},"family":"f1"},{"id":"fib-recruit","weight":300,"params":{"onset":1.02,"spread":0.1},"family":"f2"}`},
		{"recruit-linear", `{"name":"f1","angle_deg":30}`,
			`{"id":"i1-lin","weight":2},{"id":"fib-recruit","weight":300,"params":{"onset":1,"spread":0},"family":"f1"}`},
	} {
		r, code := checkJSON(t, psCard(t, c.name, c.fam, c.terms))
		if code != 0 || !r.Passed || !r.Polyconvexity.AllTerms || !r.Stability.Passed || !r.Ellipticity.Passed || !r.Reference.Passed {
			t.Errorf("%s: exit %d, %v", c.name, code, r.Failures)
		}
		if r.Stability.FullIndefiniteTensile != 0 {
			t.Errorf("%s: full tangent indefinite at %d points with tensile principal stresses", c.name, r.Stability.FullIndefiniteTensile)
		}
	}
	neg, code := checkJSON(t, psCard(t, "ps-neg-2", "", `{"id":"ps-neg","weight":2,"params":{"exponent":-2}}`))
	i2, _ := checkJSON(t, psCard(t, "i2", "", `{"id":"i2-lin","weight":1}`))
	if code != 1 || neg.Stability.Passed || !neg.Ellipticity.Passed || !neg.Polyconvexity.AllTerms {
		t.Errorf("ps-neg α=−2: exit %d, stability %v, ellipticity %v", code, neg.Stability.Passed, neg.Ellipticity.Passed)
	}
	if neg.Stability.FailingPoints == 0 || neg.Stability.FailingPoints != i2.Stability.FailingPoints ||
		neg.Stability.FullIndefinite != i2.Stability.FullIndefinite || neg.Stability.Worst.F != i2.Stability.Worst.F {
		t.Errorf("ps-neg α=−2: %d failing, %d indefinite, worst %v; (w/2)(I2−3): %d, %d, %v",
			neg.Stability.FailingPoints, neg.Stability.FullIndefinite, neg.Stability.Worst.F,
			i2.Stability.FailingPoints, i2.Stability.FullIndefinite, i2.Stability.Worst.F)
	}
	if !near(float64(neg.Moduli.InitialShear), 2, 1e-12) || !near(float64(i2.Moduli.InitialShear), 2, 1e-12) {
		t.Errorf("initial shear moduli %g and %g, want 2 (w of ps-neg, 2 C01 of i2-lin)", neg.Moduli.InitialShear, i2.Moduli.InitialShear)
	}
}
