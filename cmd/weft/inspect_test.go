package main

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeSynthetic writes a synthetic two-protocol specimen file with loads,
// two cycles per protocol and a preload, and returns its path.
func writeSynthetic(t *testing.T, dir string) string {
	var b strings.Builder
	b.WriteString("# specimen = SYN-cmd (synthetic)\n# tissue = invented membrane\n# thickness = 0.5 mm\n# size_1 = 10 mm\n# size_2 = 10 mm\n")
	b.WriteString("protocol,stretch_1,stretch_2,load_1 [N],load_2 [N]\n")
	for _, p := range []struct {
		label string
		r     float64
	}{{"1:1", 1}, {"1:0.5", 0.5}} {
		for c := 0; c < 2; c++ {
			for i := 0; i <= 8; i++ { // up
				l := 1.01 + 0.01*float64(i)
				fmt.Fprintf(&b, "%s,%g,%g,%g,%g\n", p.label, l, 1+p.r*(l-1), 2*(l-1), 2*p.r*(l-1))
			}
			for i := 7; i >= 1; i-- { // down
				l := 1.01 + 0.01*float64(i)
				fmt.Fprintf(&b, "%s,%g,%g,%g,%g\n", p.label, l, 1+p.r*(l-1), 1.6*(l-1), 1.6*p.r*(l-1))
			}
		}
	}
	path := filepath.Join(dir, "syn-cmd.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestInspectTable(t *testing.T) {
	path := writeSynthetic(t, t.TempDir())
	out, errs, code := runWeft(t, "inspect", path)
	if code != exitOK || errs != "" {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	for _, want := range []string{"SYN-cmd (synthetic)", "nominal stress in kPa, from loads", "1:0.5", "cycle 2, loading", "cycle 2 of 2, loading branch, 9 of 32 rows"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

func TestInspectJSON(t *testing.T) {
	path := writeSynthetic(t, t.TempDir())
	out, errs, code := runWeft(t, "inspect", "--json", "--cycle", "1", "--branch", "unloading", "--protocol-weight", "1:0.5=2", path)
	if code != exitOK || errs != "" {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	var doc struct {
		Specimens []struct {
			Name       string `json:"name"`
			StressUnit string `json:"stress_unit"`
			Kind       string `json:"stress_kind"`
			FromLoads  bool   `json:"from_loads"`
			Protocols  []struct {
				Label      string                `json:"label"`
				Points     int                   `json:"points"`
				Cycles     int                   `json:"cycles"`
				KeptCycle  int                   `json:"kept_cycle"`
				KeptBranch string                `json:"kept_branch"`
				Stretch1   [2]float64            `json:"stretch_1"`
				Stress     map[string][2]float64 `json:"stress"`
				Weight     map[string]float64    `json:"weight"`
				UserWeight float64               `json:"user_weight"`
			} `json:"protocols"`
			Warnings []any    `json:"warnings"`
			Notices  []string `json:"notices"`
		} `json:"specimens"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if len(doc.Specimens) != 1 || len(doc.Specimens[0].Protocols) != 2 {
		t.Fatalf("shape: %+v", doc)
	}
	s := doc.Specimens[0]
	p := s.Protocols[1]
	// Cycle 1 unloading: the peak (λ1 = 1.09) down to the valley that starts
	// cycle 2 (λ1 = 1.01): 9 points.
	if s.Kind != "nominal" || !s.FromLoads || s.StressUnit != "kPa" || p.Label != "1:0.5" || p.Points != 9 ||
		p.Cycles != 2 || p.KeptCycle != 1 || p.KeptBranch != "unloading" || p.UserWeight != 2 ||
		p.Stretch1 != [2]float64{1.01, 1.09} || len(p.Stress) != 2 || p.Weight["11"] <= 0 {
		t.Errorf("protocol 1:0.5: %+v", p)
	}
	// Same input, same output.
	again, _, _ := runWeft(t, "inspect", "--json", "--cycle", "1", "--branch", "unloading", "--protocol-weight", "1:0.5=2", path)
	if again != out {
		t.Error("two runs gave different JSON")
	}
}

func TestInspectBadInput(t *testing.T) {
	dir := t.TempDir()
	good := writeSynthetic(t, dir)
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("protocol,stretch_1,stretch_2,cauchy_11,cauchy_22\n1:1,1,1,0,0\n1:1,-0.2,1,1,1\n"), 0o644)
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"inspect", good, bad}, "bad.csv:3:2: stretch_1 is -0.2"},
		{[]string{"inspect", filepath.Join(dir, "missing.csv")}, "missing.csv"},
		{[]string{"inspect"}, "at least one FILE"},
		{[]string{"inspect", "--cycle", "first", good}, "--cycle"},
		{[]string{"inspect", "--branch", "up", good}, "--branch"},
		{[]string{"inspect", "--resample", "2", good}, "--resample"},
		{[]string{"inspect", "--weight", "1:1", good}, "LABEL=W"},
		{[]string{"inspect", "--weight", "9:9=1", good}, `"9:9"`},
		{[]string{"inspect", "--cycle", "3", good}, "cycle 3 was asked for"},
		{[]string{"inspect", "--sheet", "x", good}, "not an xlsx"},
		{[]string{"inspect", "--no-such-flag", good}, "unknown flag"},
	}
	for _, c := range cases {
		out, errs, code := runWeft(t, c.args...)
		if code != exitBadInput {
			t.Errorf("%v: exit %d, want %d", c.args, code, exitBadInput)
		}
		if out != "" {
			t.Errorf("%v: printed %q on stdout", c.args, out)
		}
		if !strings.Contains(errs, c.want) {
			t.Errorf("%v: stderr %q lacks %q", c.args, errs, c.want)
		}
	}
}

func TestInspectHelp(t *testing.T) {
	out, _, code := runWeft(t, "inspect", "--help")
	if code != exitOK || !strings.Contains(out, "--rereference") || !strings.Contains(out, "Examples:") {
		t.Errorf("help (exit %d):\n%s", code, out)
	}
}

// weft inspect --json gives each protocol's untared preload and the
// point-to-point scatter of F that the reader estimated. The file: an
// incompressible neo-Hookean membrane on sutures (μ = 10 kPa, P11 =
// μ(λ1 − 1/(λ1³λ2²)), a textbook closed form) measured from a state
// pre-stretched 1.03 × 1.01, its first row at F = I with the preload's
// stress, and Gaussian noise of 0.001 added to the measured shear F12
// and F21 (whose stresses are given as zero).
func TestInspectJSONPreloadAndScatter(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 9))
	var b strings.Builder
	b.WriteString("# notes = synthetic\nprotocol,F11,F12,F21,F22,nominal_11 [kPa],nominal_22 [kPa],nominal_12 [kPa],nominal_21 [kPa]\n")
	for i := 0; i <= 200; i++ {
		l := 1 + 0.001*float64(i)
		l1, l2 := 1.03*l, 1.01*l
		f12, f21 := 0.0, 0.0
		if i > 0 {
			f12, f21 = 0.001*rng.NormFloat64(), 0.001*rng.NormFloat64()
		}
		fmt.Fprintf(&b, "1:1,%.8g,%.8g,%.8g,%.8g,%.8g,%.8g,0,0\n", l, f12, f21, l, 10*(l1-1/(l1*l1*l1*l2*l2)), 10*(l2-1/(l2*l2*l2*l1*l1)))
	}
	path := writeTemp(t, "tracked.csv", b.String())
	out, errs, code := runWeft(t, "inspect", "--json", path)
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	var doc struct {
		Specimens []struct {
			Protocols []struct {
				Preload       map[string]float64 `json:"preload"`
				StrainScatter [4]float64         `json:"strain_scatter"`
			} `json:"protocols"`
			Warnings []struct {
				Message string `json:"message"`
			} `json:"warnings"`
		} `json:"specimens"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	s := doc.Specimens[0]
	p := s.Protocols[0]
	if math.Abs(p.Preload["11"]-1.329) > 1e-3 || math.Abs(p.Preload["22"]-0.9513) > 1e-4 {
		t.Errorf("preload %v, want 1.329 and 0.9513 kPa on 11 and 22", p.Preload)
	}
	// One protocol of 201 points: the estimate lies within about ±20 % of
	// the noise at 95 % (simulated; biaxial's TestStrainScatter checks
	// that it has no bias); the bounds are ±35 %.
	for _, e := range []int{1, 2} {
		if p.StrainScatter[e] < 0.00065 || p.StrainScatter[e] > 0.00135 {
			t.Errorf("strain_scatter[%d] = %.3g, want about 0.001", e, p.StrainScatter[e])
		}
	}
	var named bool
	for _, w := range s.Warnings {
		named = named || strings.Contains(w.Message, "tracking noise of the markers?")
	}
	if !named {
		t.Errorf("no scatter warning in %+v", s.Warnings)
	}
}

// F12 and F21 that are only tracking noise about zero (a scatter of 0.004
// in every entry of F, no shear stress) are read as no shear information.
// inspect says so as the card does (data.shear_within_scatter): until
// 2026-12-05 its JSON had no such field and its table called the file "a
// pure stretch only", which its F12 and F21 columns contradict. The
// stresses are an incompressible neo-Hookean membrane in plane stress,
// σ = 2 c10 (B − λ3² I) with c10 = 10 kPa (Rivlin 1948, as in Holzapfel
// 2000, Nonlinear Solid Mechanics, §6.5).
func TestInspectSaysShearWithinScatter(t *testing.T) {
	path := writeTemp(t, "tracked.csv", trackedNeoHookeanCSV())
	out, errs, code := runWeft(t, "inspect", "--json", path)
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, errs)
	}
	var doc struct {
		Specimens []struct {
			HasShear           bool  `json:"has_shear"`
			ShearWithinScatter *bool `json:"shear_within_scatter"`
		} `json:"specimens"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	if s := doc.Specimens[0]; s.HasShear || s.ShearWithinScatter == nil || !*s.ShearWithinScatter {
		t.Errorf("has_shear %v, shear_within_scatter %v; want false, true", s.HasShear, s.ShearWithinScatter)
	}
	table, _, _ := runWeft(t, "inspect", path)
	if strings.Contains(table, "pure stretch only") || !strings.Contains(table, "F12 and F21 stay within their scatter of zero") {
		t.Errorf("inspect's shear line does not say F12 and F21 are noise taken as zero:\n%s", table)
	}
	// A pure stretch has no such field, and its line stays as it was.
	clean := writeTemp(t, "clean.csv", "# notes = synthetic\nprotocol,stretch_1,stretch_2,cauchy_11 [kPa],cauchy_22 [kPa]\n1:1,1,1,0,0\n1:1,1.03,1.03,2.2,2.2\n1:1,1.05,1.05,3.7,3.7\n1:1,1.08,1.08,6.1,6.1\n1:1,1.1,1.1,8.0,8.0\n1:1,1.15,1.15,12.9,12.9\n")
	out, _, _ = runWeft(t, "inspect", "--json", clean)
	if strings.Contains(out, "shear_within_scatter") {
		t.Errorf("a pure stretch is said to have shear within scatter:\n%s", out)
	}
	table, _, _ = runWeft(t, "inspect", clean)
	if !strings.Contains(table, "a pure stretch only") {
		t.Errorf("a pure stretch is not called one:\n%s", table)
	}
}

// trackedNeoHookeanCSV is a SYNTHETIC gradient file whose F12 and F21 are
// only tracking noise: protocols 1:1, 1:0.5 and 0.5:1 of 40 rows to a
// strain of 0.15, Gaussian scatter of 0.004 in every entry of F (seeded),
// no shear stress, and the Cauchy stresses of an incompressible
// neo-Hookean membrane in plane stress at the true F, σ = 2 c10 (B − λ3² I)
// with c10 = 10 kPa (Rivlin 1948, as in Holzapfel 2000, Nonlinear Solid
// Mechanics, §6.5).
func trackedNeoHookeanCSV() string {
	rng := rand.New(rand.NewPCG(5, 9))
	var b strings.Builder
	b.WriteString("# specimen = SYN-tracked (synthetic)\nprotocol,F11,F12,F21,F22,cauchy_11 [kPa],cauchy_22 [kPa]\n")
	for _, r := range [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}} {
		for i := 1; i <= 40; i++ {
			e := 0.15 * float64(i) / 40
			l1, l2 := 1+r[0]*e, 1+r[1]*e
			s3 := 1 / (l1 * l1 * l2 * l2)
			n := func() float64 { return 0.004 * rng.NormFloat64() }
			fmt.Fprintf(&b, "%g:%g,%.6f,%.6f,%.6f,%.6f,%.6g,%.6g\n", r[0], r[1], l1+n(), n(), n(), l2+n(), 20*(l1*l1-s3), 20*(l2*l2-s3))
		}
	}
	return b.String()
}
