package aniso

import (
	"math"
	"strings"
	"testing"
)

// The hgo preset is the published form of Holzapfel, Gasser & Ogden 2000
// (J Elasticity 61:1–48): two families at ±β, symmetric about the loading
// axis. Fitted to data generated from such a pair (the media set of that
// paper, values from memory; 1 % noise), it recovers β within 0.5°, and its
// families are reported at +β and −β with no mean-angle parameter.
func TestPresetPairSymmetricAboutAxis1(t *testing.T) {
	for _, c := range []struct {
		name    string
		sutured bool
	}{{"pure biaxial", false}, {"sutured", true}} {
		t.Run(c.name, func(t *testing.T) {
			const beta = 29.0
			truth := hgoModel(3, 2.3632, 0.8393, beta)
			spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, maxStrain: 0.3, sutured: c.sutured})
			p, err := NewProblem(spec, nil)
			if err != nil {
				t.Fatal(err)
			}
			st, err := PresetStructure("hgo")
			if err != nil {
				t.Fatal(err)
			}
			if !st.HoldPairAxis {
				t.Fatal("the hgo preset learns its pair's axis; the published form holds it on axis 1")
			}
			res, err := Fit(p, st, Settings{Profile: true})
			if err != nil {
				t.Fatal(err)
			}
			a0, a1 := res.Model.Families[0].Angle/deg, res.Model.Families[1].Angle/deg
			if math.Abs(a0+a1) > 1e-9 {
				t.Errorf("families at %.4f° and %.4f°: not symmetric about axis 1", a0, a1)
			}
			if e := math.Abs(math.Abs(a0) - beta); e > 0.5 {
				t.Errorf("β = %.3f°, true %.1f° (off by %.3f°)", math.Abs(a0), beta, e)
			}
			for _, e := range res.Estimates {
				if e.Name == "mean_angle" {
					t.Errorf("a held pair axis reports a mean angle %+v", e)
				}
			}
			if len(res.Profiles) != 1 || res.Profiles[0].Name != "half_angle" {
				t.Errorf("profiles %+v: want the half angle only", res.Profiles)
			}
			t.Logf("%s: β = %.3f°, %s", c.name, math.Abs(a0), res.Summary())
		})
	}
}

// One family at α without shear information gives the same normal stresses
// as a mirror pair at ±α with half the weight each (physics: the mirror
// symmetry of a pure biaxial stretch, Holzapfel, Gasser & Ogden 2000), so
// the hgo preset fitted to an invented one-family specimen finds β = α
// within 0.5°, where a learned pair axis wandered off.
func TestPresetPairOnOneFamilySpecimen(t *testing.T) {
	truth := oneFamily(Term{Shape: lookup("i1-lin"), Weight: 2}, Term{Shape: lookup("fib-expsq"), Weight: 12, Params: []float64{3}}, 35)
	spec := synthSpecimen(t, truth, synthOptions{noise: 0.01, maxStrain: 0.25})
	p, err := NewProblem(spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	st, _ := PresetStructure("hgo")
	res, err := Fit(p, st, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	got := math.Abs(res.Model.Families[0].Angle / deg)
	if math.Abs(got-35) > 0.5 {
		t.Errorf("β = %.3f°, the one family is at 35°", got)
	}
	within(t, "fibre weight per family", res.Weights[1], 6, 0.05)
	free := st
	free.HoldPairAxis = false
	rf, err := Fit(p, free, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("held axis: β = %.3f°, loss %.6g; learned axis: families %.3f°/%.3f°, loss %.6g", got, res.Loss, rf.Model.Families[0].Angle/deg, rf.Model.Families[1].Angle/deg, rf.Loss)
}

// The preset caution says what a preset holds: fibre angles, or for the
// Fung-type preset (Tong & Fung 1976) that its anisotropy is orthotropy
// about the tester's axes without fibres (it read "preset:fung ()").
// Both presets are fitted to a Mooney–Rivlin solid (closed form,
// independent_test.go); only the wording is tested.
func TestPresetCautionSaysWhatThePresetHolds(t *testing.T) {
	t.Parallel()
	p, err := NewProblem(synthFrom(t, mooneyRivlinMatrix(4, 1.5), synthOptions{noise: 0.01, points: 15, seed: 4}), nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]string{
		"fung": "a Fung-type term orthotropic about the tester's axes, no fibre family",
		"hgo":  "°",
	} {
		st, err := PresetStructure(name)
		if err != nil {
			t.Fatal(err)
		}
		r, err := Fit(p, st, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if got := presetWhat(r); !strings.Contains(got, want) || got == "" {
			t.Errorf("preset %s: %q, want it to contain %q", name, got, want)
		}
	}
}

// A Fung-type orthotropic solid has no fibre family. Written out in closed
// form (fungLaw, Tong & Fung 1976, fung_test.go; c = 4 kPa, b1 = 30,
// b2 = 10, b3 = 4, the tester's axes, no shear information, 1 % noise),
// discovery's fibre models stand in for its orthotropy; the verdict must
// not claim fibre families where the Fung-type preset, which has none,
// fits better in sample and predicts no worse (orthotropyRule). Synthetic
// solids of this kind made by independent code were a confident 2 in 3
// of 3 seeds, with angles that moved from seed to seed.
func TestFibrelessOrthotropyIsUndecided(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	d, _ := discoverSpecimen(t, fungSpecimen(fungLaw{c: 4, b1: 30, b2: 10, b3: 4}, false))
	v := d.Verdict
	t.Logf("verdict %s: %s", v.Families, v.Reason)
	if v.Families != "undecided" || v.InSampleBest != "preset:fung" || v.Decider != fungDecider {
		t.Fatalf("Fung-type solid: verdict %s (in-sample best %q), want undecided by the Fung-type preset", v.Families, v.InSampleBest)
	}
	if !strings.Contains(v.Reason, "do not show that their anisotropy comes from fibre families") || strings.Contains(v.Reason, "caution: the classical preset fung") {
		t.Errorf("reason %q", v.Reason)
	}
}
