package aniso

import "testing"

func TestScratchBench(t *testing.T) {
	truth := &Model{Families: []Family{{Angle: 5 * deg}, {Angle: 80 * deg}}, Terms: []Term{
		{Shape: lookup("i1-exp"), Family: -1, Weight: 6, Params: []float64{2}},
		{Shape: lookup("fib-expsq"), Family: 0, Weight: 40, Params: []float64{5}},
		{Shape: lookup("fib-exp"), Family: 1, Weight: 15, Params: []float64{6}}}}
	p := benchProblem(t, truth)
	d, err := Discover(p, DiscoverSettings{Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	logCandidates(t, d)
	for _, c := range d.Verdict.Comparisons {
		t.Log(c)
	}
	t.Log(d.Verdict.Families, d.Verdict.Reason)
	t.Log(d.Rule)
}
