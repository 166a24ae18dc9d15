package aniso

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/weft-tools/weft/biaxial"
)

// A one-family specimen at +30° under pure biaxial stretch (independent
// integration of the fibre stress, independent_test.go), recorded through
// markers whose tracking noise puts a scatter of 0.004 into every entry of
// F, F12 and F21 included, and no shear stress: the shear the file shows
// is noise, and under a pure stretch a family at +α and one at −α carry
// the same normal stresses (Holzapfel, Gasser & Ogden 2000: I4 = a·Ca
// depends on the sign of α only through C12). Counted as shear
// information, that noise decided the sign (fitted at −29.3° and −24.6°
// in 2 of 7 seeds, each with an interval excluding +30°, sign called
// identified); read as no shear information but fitted with the noise in
// F, the angle's profile folded as if F12 = F21 = 0 and its interval
// collapsed to [29.29°, 29.29°]. Package biaxial now takes such shear as
// none (Specimen.ShearWithinScatter) and the fit takes F12 = F21 = 0.
func TestShearWithinScatterLeavesTheSignOpen(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	m := fibreMaterial(5, spreadFamily{30 * deg, -1, expSqFibre(40, 2)})
	s := synthFrom(t, m, synthOptions{noise: 0.01, points: 100, seed: 3, maxStrain: 0.15,
		ratios: [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}}})
	spec, err := biaxial.Read(strings.NewReader(trackedCSV(s, 3, 0.004, 0)), "tracked.csv", biaxial.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if spec.HasShear || !spec.ShearWithinScatter {
		t.Fatalf("shear information %v, shear within scatter %v; want false, true", spec.HasShear, spec.ShearWithinScatter)
	}
	d, p := discoverSpecimen(t, spec)
	if !p.ShearTakenAsZero {
		t.Fatalf("the problem keeps the noise in F12 and F21")
	}
	r := d.Best().Result
	t.Logf("verdict %s, chosen %s (%s): %s", d.Verdict.Families, d.Best().Name, anglesText(r), d.Verdict.Reason)
	if d.Verdict.Families != "1-or-mirror-pair" && d.Verdict.Families != "undecided" {
		t.Errorf("verdict %s, want 1-or-mirror-pair or undecided: without shear information one family at α is not told from a mirror pair at ±α", d.Verdict.Families)
	}
	if r.SignKnown {
		t.Errorf("the chosen model reports the sign of its fibre angle as identified")
	}
	for f, fam := range r.Model.Families {
		if a := math.Abs(Deg(wrapAngle(fam.Angle))); math.Abs(a-30) > 3 {
			t.Errorf("family %d at ±%.2f°, want within 3° of the true ±30°", f+1, a)
		}
	}
	// Every angle estimate that is a fibre direction (a mirror pair's
	// mean, near 0°, is not) has an interval with a width that holds 30°.
	directions := 0
	for _, e := range r.Estimates {
		if e.Kind != "angle" || math.Abs(e.Value-30) > 3 {
			continue
		}
		directions++
		t.Logf("%s = %.3f°, 95 %% interval [%.3f°, %.3f°]", e.Name, e.Value, e.Lo, e.Hi)
		if !(e.Hi-e.Lo > 0.05) || e.Lo > 30 || e.Hi < 30 {
			t.Errorf("%s: interval [%.3f°, %.3f°] should have a width and hold the true 30°", e.Name, e.Lo, e.Hi)
		}
	}
	if directions == 0 {
		t.Errorf("no angle estimate within 3° of the true 30°")
	}
}

// trackedCSV writes s (nominal normal stresses) as a file in the gradient
// layout whose F carries the shear F12 = shear·(F11 − 1) and Gaussian
// tracking noise of standard deviation sd in every entry (seeded), with no
// shear stress columns.
func trackedCSV(s *biaxial.Specimen, seed uint64, sd, shear float64) string {
	rng := rand.New(rand.NewPCG(seed, 7))
	var b strings.Builder
	b.WriteString("# specimen = SYN-tracked (synthetic)\nprotocol,F11,F12,F21,F22,nominal_11 [kPa],nominal_22 [kPa]\n")
	for _, pr := range s.Protocols {
		for _, p := range pr.Points {
			F := p.F
			F[1] += shear * (F[0] - 1)
			for e := range F {
				F[e] += sd * rng.NormFloat64()
			}
			fmt.Fprintf(&b, "%s,%.6f,%.6f,%.6f,%.6f,%.6g,%.6g\n", pr.Label, F[0], F[1], F[2], F[3], p.Stress[biaxial.C11], p.Stress[biaxial.C22])
		}
	}
	return b.String()
}

// A cohort pools shear as zero only when no specimen carries shear
// information and some specimen's shear lies within its scatter: a real
// shear of another specimen is never zeroed (Mooney–Rivlin solid, closed
// form, independent_test.go; the stresses do not depend on the written
// shear, only the reading of it is tested).
func TestPooledShearTakenAsZero(t *testing.T) {
	s := synthFrom(t, mooneyRivlinMatrix(4, 1.5), synthOptions{noise: 0.01, points: 60, seed: 2, ratios: [][2]float64{{1, 1}, {1, 0.5}, {0.5, 1}}})
	read := func(name string, sd, shear float64) *Problem {
		spec, err := biaxial.Read(strings.NewReader(trackedCSV(s, 2, sd, shear)), name+".csv", biaxial.Options{})
		if err != nil {
			t.Fatal(err)
		}
		spec.Name = name
		p, err := NewProblem(spec, nil)
		if err != nil {
			t.Fatal(err)
		}
		return p
	}
	noisy, sheared, clean := read("noisy", 0.004, 0), read("sheared", 0, 0.3), read("clean", 0, 0)
	if !noisy.ShearTakenAsZero || noisy.HasShear || !sheared.HasShear || sheared.ShearTakenAsZero || clean.HasShear || clean.ShearTakenAsZero {
		t.Fatalf("specimens read wrongly: noisy %v/%v, sheared %v/%v, clean %v/%v (shear information/taken as zero)",
			noisy.HasShear, noisy.ShearTakenAsZero, sheared.HasShear, sheared.ShearTakenAsZero, clean.HasShear, clean.ShearTakenAsZero)
	}
	for _, c := range []struct {
		name       string
		ps         []*Problem
		info, zero bool
	}{
		{"noisy and clean", []*Problem{noisy, clean}, false, true},
		{"noisy and sheared", []*Problem{noisy, sheared}, false, false},
		{"sheared and clean", []*Problem{sheared, clean}, false, false},
		{"sheared alone", []*Problem{sheared}, true, false},
	} {
		pooled, _, _, err := pooledProblem(c.ps, 1000)
		if err != nil {
			t.Fatal(err)
		}
		if pooled.HasShear != c.info || pooled.ShearTakenAsZero != c.zero {
			t.Errorf("%s: pooled shear information %v, taken as zero %v; want %v, %v", c.name, pooled.HasShear, pooled.ShearTakenAsZero, c.info, c.zero)
		}
		if c.zero {
			for i := 0; i < pooled.Data.Points(); i++ {
				if F := pooled.Data.Kinematics(i).F; F[1] != 0 || F[2] != 0 {
					t.Fatalf("%s: pooled point %d keeps the shear F12 %g, F21 %g", c.name, i, F[1], F[2])
				}
			}
		}
	}
}
