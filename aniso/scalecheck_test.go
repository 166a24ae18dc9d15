package aniso

import "testing"

// An isotropic Mooney–Rivlin solid (closed form, Mooney 1940, Rivlin
// 1948; independent_test.go) without shear information: the verdict is 0,
// and the calibration check shows that it depends on the axes' calibration
// — with axis 1's stress scaled by 1.05 or 0.95 the solid reads as fibred
// (the README's exploration: `1-or-mirror-pair` near ±40° at 1.05).
func TestAxisScaleCheckShowsCalibrationDependence(t *testing.T) {
	if testing.Short() {
		t.Skip("three discoveries")
	}
	t.Parallel()
	s := synthFrom(t, mooneyRivlinMatrix(4, 1.5), synthOptions{noise: 0.02, points: 30, seed: 1})
	d, _ := discoverSpecimen(t, s)
	if d.Verdict.Families != "0" {
		t.Fatalf("verdict %s, want 0 for the isotropic solid (the battery's line)", d.Verdict.Families)
	}
	outs, err := AxisScaleCheck(s, 0.05, DiscoverSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if len(outs) != 2 || outs[0].Axis1Scale != 1.05 || outs[1].Axis1Scale != 0.95 {
		t.Fatalf("outcomes %+v, want axis 1 scaled by 1.05 then 0.95", outs)
	}
	changed := false
	for _, o := range outs {
		t.Logf("axis 1 ×%g: %s (%s at %s)", o.Axis1Scale, o.Families, o.Chosen, o.Angles)
		changed = changed || o.Families != "0"
	}
	if !changed {
		t.Errorf("the check shows no dependence on the calibration: %+v", outs)
	}
}
