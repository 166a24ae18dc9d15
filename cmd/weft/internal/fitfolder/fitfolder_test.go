package fitfolder

import (
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// recorder is a sink that keeps what is written and fails on one name.
type recorder struct {
	names  []string
	files  map[string][]byte
	failOn string
}

var errFull = errors.New("disk full")

func (r *recorder) Write(rel string, data []byte) error {
	if rel == r.failOn {
		return errFull
	}
	r.names = append(r.names, rel)
	r.files[rel] = data
	return nil
}

func (r *recorder) Dirs() (string, string) { return "", "" }

// nhCauchy is the in-plane Cauchy stress of an incompressible neo-Hookean
// membrane, μ = 10 kPa, stretched by λ1 and λ2 in plane stress:
// σ_ii = μ(λ_i² − 1/(λ1²λ2²)), the classical closed form (e.g. Ogden 1984,
// from memory).
func nhCauchy(l1, l2 float64) (s11, s22 float64) {
	s33 := 1 / (l1 * l1 * l2 * l2)
	return 10 * (l1*l1 - s33), 10 * (l2*l2 - s33)
}

// neoHookean fits the neo-Hookean preset to an equibiaxial and a 1:0.5
// protocol of nhCauchy's membrane, eight points each.
func neoHookean(t *testing.T) *Outcome {
	t.Helper()
	var b strings.Builder
	b.WriteString("# specimen = nh\n# notes = synthetic\nprotocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for k := 0; k < 16; k++ {
		ratio, e := 1-0.5*float64(k/8), 0.025*float64(k%8)
		s11, s22 := nhCauchy(1+e, 1+ratio*e)
		fmt.Fprintf(&b, "1:%g,%g,%g,%.12g,%.12g\n", ratio, 1+e, 1+ratio*e, s11, s22)
	}
	s, err := biaxial.Read(strings.NewReader(b.String()), "nh.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := aniso.NewProblem(s, nil)
	if err != nil {
		t.Fatal(err)
	}
	st, err := aniso.PresetStructure("neo-hookean")
	if err != nil {
		t.Fatal(err)
	}
	r, err := aniso.Fit(p, st, aniso.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	return &Outcome{Specimen: s, Problem: p, Result: r, Card: card.FromFit(p, r, nil)}
}

// WriteData writes the data files of a fit of a given form in their
// order; Files names them and the report; the held-out predictions of the
// exact form reproduce the closed form's stress; and a file that cannot be
// written stops the writing with its error.
func TestWriteData(t *testing.T) {
	o := neoHookean(t)
	rec := &recorder{files: map[string][]byte{}}
	if err := WriteData(o, rec); err != nil {
		t.Fatal(err)
	}
	want := []string{"model.json", "fit.csv", "heldout.csv", "curves.csv"}
	if !slices.Equal(rec.names, want) {
		t.Errorf("wrote %v, want %v in that order", rec.names, want)
	}
	listed := Files(o)
	for _, n := range append(want, "report.html", "plots/") {
		if !slices.Contains(listed, n) {
			t.Errorf("Files %v does not name %s", listed, n)
		}
	}
	if len(listed) != len(want)+2 {
		t.Errorf("Files %v names more than was written and the report", listed)
	}
	rows, err := csv.NewReader(strings.NewReader(string(rec.files["heldout.csv"]))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for j, h := range rows[0] {
		col[strings.Fields(h)[0]] = j
	}
	checked := 0
	for _, r := range rows[1:] {
		l1, _ := strconv.ParseFloat(r[col["F11"]], 64)
		l2, _ := strconv.ParseFloat(r[col["F22"]], 64)
		s11, s22 := nhCauchy(l1, l2)
		for _, c := range []struct {
			name  string
			exact float64
		}{{"heldout_cauchy_11", s11}, {"heldout_cauchy_22", s22}} {
			j, ok := col[c.name]
			if !ok {
				t.Fatalf("heldout.csv has no column %s: %v", c.name, rows[0])
			}
			got, _ := strconv.ParseFloat(r[j], 64)
			exact := c.exact
			if math.Abs(got-exact) > 1e-6*10 {
				t.Errorf("held-out %s at λ = (%g, %g): %g, the closed form %g", c.name, l1, l2, got, exact)
			}
			checked++
		}
	}
	if checked != 32 {
		t.Errorf("%d held-out predictions checked, want 32", checked)
	}
	stop := &recorder{files: map[string][]byte{}, failOn: "fit.csv"}
	if err := WriteData(o, stop); !errors.Is(err, errFull) {
		t.Errorf("a failing write: %v, want %v", err, errFull)
	}
	if !slices.Equal(stop.names, []string{"model.json"}) {
		t.Errorf("after fit.csv failed, wrote %v", stop.names)
	}
}
