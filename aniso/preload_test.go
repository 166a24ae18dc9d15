package aniso

import (
	"fmt"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
)

// preStretched is m measured from a state pre-stretched by l1 along axis 1
// and l2 along axis 2 (stretches zeroed there, the preload not tared):
// the Cauchy stress at F is m's at diag(l1, l2)·F.
func preStretched(m material, l1, l2 float64) material {
	return func(F [4]float64) [3]float64 {
		return m([4]float64{l1 * F[0], l1 * F[1], l2 * F[2], l2 * F[3]})
	}
}

// specimenCSV writes s (nominal stress, no shear columns) as a CSV file in
// the gradient layout, each protocol preceded by its reference row at
// F = I with stress ref.
func specimenCSV(s *biaxial.Specimen, ref [4]float64) string {
	var b strings.Builder
	b.WriteString("protocol,F11,F12,F21,F22,nominal_11 [kPa],nominal_22 [kPa]\n")
	for _, pr := range s.Protocols {
		fmt.Fprintf(&b, "%s,1,0,0,1,%.17g,%.17g\n", pr.Label, ref[0], ref[1])
		for _, p := range pr.Points {
			fmt.Fprintf(&b, "%s,%.17g,%.17g,%.17g,%.17g,%.17g,%.17g\n", pr.Label, p.F[0], p.F[1], p.F[2], p.F[3], p.Stress[0], p.Stress[1])
		}
	}
	return b.String()
}

// An isotropic principal-stretch solid (Ogden 1972, α = 9; independent
// eigen-decomposition, independent_test.go) pre-stretched 1.02 × 1.005
// before the markers were zeroed, its preload not tared (about 15 % of
// the stress range at the reference state; 2 % noise, no shear): read through
// package biaxial, which records the preload, discovery finds a fibre
// family along axis 1 (the pre-stretch stiffens that axis's incremental
// response), and the verdict must say that the fibres may be the
// preload's.
func TestPreloadCautionOnAxisFibres(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	m := preStretched(ogdenMaterial(3, 9), 1.02, 1.005)
	s := synthFrom(t, m, synthOptions{noise: 0.02, points: 30, seed: 1})
	csv := specimenCSV(s, nominalOf(m, [4]float64{1, 0, 0, 1}))
	spec, err := biaxial.Read(strings.NewReader(csv), "preloaded.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	recorded := 0
	for _, pr := range spec.Protocols {
		if pr.Preload[biaxial.C11] > 0 || pr.Preload[biaxial.C22] > 0 {
			recorded++
		}
	}
	if recorded == 0 {
		t.Fatalf("the reader records no preload (warnings %v)", spec.Warnings)
	}
	d, _ := discoverSpecimen(t, spec)
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families == "0" {
		t.Fatalf("verdict 0: the fibre signature this test needs is gone (before the caution: 1-or-mirror-pair at 0°)")
	}
	if !strings.Contains(v.Reason, "may be the preload's") || !strings.Contains(v.Reason, "nominal stress 11") {
		t.Errorf("the verdict does not caution about the preload: %q", v.Reason)
	}
}

// preloadCaution and shearScatterCaution on hand-made results: each
// names its finding only for fibres within 10° of a test axis and only
// when the data carry it.
func TestAxisCautionsGeometry(t *testing.T) {
	cautions := []struct {
		word string
		add  func(note string, r *Result, v *Verdict)
	}{
		{"preload", func(note string, r *Result, v *Verdict) { preloadCaution(evidence{preload: note}, r, v) }},
		{"shear scatters", func(note string, r *Result, v *Verdict) { shearScatterCaution(evidence{shearScatter: note}, r, v) }},
	}
	for _, c := range []struct {
		layout Layout
		angles []float64
		note   string
		want   bool
	}{
		{LayoutSingle, []float64{2}, "protocol 1:1: …", true},
		{LayoutSingle, []float64{-86}, "protocol 1:1: …", true},
		{LayoutFree, []float64{30, 95}, "protocol 1:1: …", true},
		{LayoutSingle, []float64{30}, "protocol 1:1: …", false},
		{LayoutMirror, []float64{40, -40}, "protocol 1:1: …", false},
		{LayoutSingle, []float64{2}, "", false},
		{LayoutNone, nil, "protocol 1:1: …", false},
	} {
		m := &Model{}
		for _, a := range c.angles {
			m.Families = append(m.Families, Family{Angle: Rad(a)})
		}
		for _, k := range cautions {
			v := Verdict{Reason: "r"}
			k.add(c.note, &Result{Structure: Structure{Layout: c.layout}, Model: m}, &v)
			if got := strings.Contains(v.Reason, k.word); got != c.want {
				t.Errorf("%s: %v at %v° (note %q): caution %v, want %v", k.word, c.layout, c.angles, c.note, got, c.want)
			}
		}
	}
}

// A cohort's pooled evidence carries the first specimen's untared preload,
// named with the specimen, so that the cohort's verdict cautions as a
// specimen's does. The stresses are an incompressible neo-Hookean
// membrane's (μ = 10 kPa, P11 = μ(λ1 − 1/(λ1³λ2²)), a textbook closed
// form) pre-stretched 1.03 × 1.01 before the stretches were zeroed.
func TestCohortEvidenceCarriesPreload(t *testing.T) {
	read := func(name string, pre1, pre2 float64) *Problem {
		var b strings.Builder
		b.WriteString("protocol,stretch_1,stretch_2,nominal_11,nominal_22\n")
		for i := 0; i <= 10; i++ {
			l := 1 + 0.015*float64(i)
			l1, l2 := pre1*l, pre2*l
			fmt.Fprintf(&b, "1:1,%.6g,%.6g,%.6g,%.6g\n", l, l, 10*(l1-1/(l1*l1*l1*l2*l2)), 10*(l2-1/(l2*l2*l2*l1*l1)))
		}
		s, err := biaxial.Read(strings.NewReader(b.String()), name+".csv", biaxial.Options{})
		if err != nil {
			t.Fatal(err)
		}
		p, err := NewProblem(s, nil)
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	ps := []*Problem{read("tared", 1, 1), read("preloaded", 1.03, 1.01)}
	c := &cohortRun{ps: ps, sub: ps, out: &Cohort{Specimens: make([]CohortSpecimen, 2), Discovery: &Discovery{}}}
	if got := c.evidence().preload; !strings.HasPrefix(got, "preloaded, protocol 1:1: nominal stress 11 1.329 kPa") {
		t.Errorf("pooled preload %q, want the preloaded specimen's", got)
	}
	c.ps, c.sub = ps[:1], ps[:1]
	c.out.Specimens = c.out.Specimens[:1]
	if got := c.evidence().preload; got != "" {
		t.Errorf("pooled preload %q of a specimen without one", got)
	}
}
