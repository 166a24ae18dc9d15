package aniso

import (
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
	"testing"
	"time"
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

// settledGoroutines returns the number of goroutines once it has come
// down to at most want, or what is left after a bounded number of yields:
// a worker that has signalled its WaitGroup may still be returning. The
// loop counts yields, not time, so the test does not depend on the speed
// of the machine.
func settledGoroutines(want int) int {
	n := runtime.NumGoroutine()
	for i := 0; i < 2000 && n > want; i++ {
		runtime.Gosched()
		time.Sleep(time.Millisecond)
		n = runtime.NumGoroutine()
	}
	return n
}

// The pool's workers are gone when run returns, whatever the number of
// workers and jobs (none, fewer jobs than workers, more); every job runs
// exactly once; the progress callback, called from the workers at once
// (run the test with -race to check that they share nothing unguarded),
// ends on done = total for each run, since counts are handed out under
// the pool's lock.
func TestPoolLeavesNoGoroutines(t *testing.T) {
	before := runtime.NumGoroutine()
	for _, workers := range []int{1, 3, 8} {
		var mu sync.Mutex
		maxDone, lastTotal := 0, 0
		p := &pool{n: workers, progress: func(done, total int) {
			mu.Lock()
			maxDone, lastTotal = max(maxDone, done), total
			mu.Unlock()
		}}
		total := 0
		for _, nJobs := range []int{0, 1, 5, 40} {
			ran := make([]int32, nJobs)
			jobs := make([]func(), nJobs)
			for i := range jobs {
				jobs[i] = func() { atomic.AddInt32(&ran[i], 1) }
			}
			p.run(jobs)
			total += nJobs
			for i, r := range ran {
				if r != 1 {
					t.Errorf("%d workers, %d jobs: job %d ran %d times", workers, nJobs, i, r)
				}
			}
			if nJobs > 0 && (maxDone != total || lastTotal != total) {
				t.Errorf("%d workers, %d jobs: progress reached %d of %d, want %d of %d", workers, nJobs, maxDone, lastTotal, total, total)
			}
		}
	}
	if after := settledGoroutines(before); after > before {
		t.Errorf("%d goroutines before the pools ran, %d after", before, after)
	}
}
