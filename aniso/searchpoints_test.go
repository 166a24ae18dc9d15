package aniso

import (
	"fmt"
	"strings"
	"testing"
)

// The same specimen given at 40 and at 4 000 points per protocol (200 and
// 20 000 points) leads to the same chosen model and verdict: discovery
// searches at most DefaultSearchPoints per protocol, spaced evenly in the
// driving stretch, and refits the pick on every point (issue target).
func TestDiscoverSameChoiceAtAnySampling(t *testing.T) {
	if testing.Short() {
		t.Skip("fits 20 000 points")
	}
	t.Parallel()
	mat := fibreMaterial(3, spreadFamily{35 * deg, -1, expSqFibre(30, 4)})
	var names, verdicts []string
	for _, n := range []int{40, 4000} {
		d, p := discoverSpecimen(t, synthFrom(t, mat, synthOptions{noise: 0.01, points: n}))
		if d.SearchPoints > 5*DefaultSearchPoints || d.Points != 5*n {
			t.Errorf("%d points per protocol: searched %d of %d", n, d.SearchPoints, d.Points)
		}
		// The search description says how many points were searched
		// whenever it was fewer than all.
		said := len(d.Search) > 0 && strings.HasPrefix(d.Search[0], fmt.Sprintf("points: the search, the cross-validation and the comparison of candidates used %d of the %d points", d.SearchPoints, d.Points))
		if thinned := d.SearchPoints < d.Points; said != thinned {
			t.Errorf("%d points per protocol: searched %d of %d, but the search description starts %q", n, d.SearchPoints, d.Points, d.Search[0])
		}
		if r := d.Best().Result; r.Rows != p.Rows() {
			t.Errorf("%d points per protocol: the pick was fitted on %d rows, not all %d", n, r.Rows, p.Rows())
		}
		// The comparison shows every candidate on the same (searched)
		// points, the chosen one included.
		for i := range d.Pareto {
			if r := d.Pareto[i].Compared(); r.Rows != d.Pareto[0].Compared().Rows {
				t.Errorf("%d points per protocol: candidate %s compared on %d rows, %s on %d", n, d.Pareto[i].Name, r.Rows, d.Pareto[0].Name, d.Pareto[0].Compared().Rows)
			}
		}
		names = append(names, d.Best().Name)
		verdicts = append(verdicts, d.Verdict.Families)
		t.Logf("%d points per protocol: %s, verdict %s, %v", n, d.Best().Name, d.Verdict.Families, d.Elapsed)
	}
	if names[0] != names[1] || verdicts[0] != verdicts[1] {
		t.Errorf("chosen %v, verdicts %v: they differ with the sampling", names, verdicts)
	}
}
