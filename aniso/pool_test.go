package aniso

import (
	"slices"
	"testing"
)

// The pool runs every job once; with one worker, dearest first, ties in
// job order.
func TestPoolRunsDearestFirst(t *testing.T) {
	var ran []int
	jobs := make([]func(), 5)
	for i := range jobs {
		jobs[i] = func() { ran = append(ran, i) }
	}
	(&pool{n: 1}).runDearFirst(jobs, []float64{1, 5, 2, 5, 0})
	if want := []int{1, 3, 2, 0, 4}; !slices.Equal(ran, want) {
		t.Errorf("ran %v, want %v", ran, want)
	}
	ran = nil
	(&pool{n: 1}).run(jobs)
	if want := []int{0, 1, 2, 3, 4}; !slices.Equal(ran, want) {
		t.Errorf("without costs ran %v, want %v", ran, want)
	}
}
