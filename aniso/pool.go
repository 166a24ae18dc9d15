package aniso

import (
	"sort"
	"sync"
)

// pool runs jobs on n workers and keeps results in job order, so that the
// outcome does not depend on scheduling.
type pool struct {
	n        int
	progress func(done, total int)
	mu       sync.Mutex
	done     int
	total    int
}

func (p *pool) run(jobs []func()) { p.runDearFirst(jobs, nil) }

// runDearFirst runs jobs as run does, handing them out in decreasing order
// of their estimated cost (ties in job order; cost nil or short: job
// order), so that the dearest do not start last and leave the other
// workers idle at the end (longest-processing-time-first scheduling).
// The order changes when a job runs, not what it computes.
func (p *pool) runDearFirst(jobs []func(), cost []float64) {
	order := make([]int, len(jobs))
	for i := range order {
		order[i] = i
	}
	if len(cost) == len(jobs) {
		sort.SliceStable(order, func(a, b int) bool { return cost[order[a]] > cost[order[b]] })
	}
	p.mu.Lock()
	p.total += len(jobs)
	p.mu.Unlock()
	ch := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < p.n; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range ch {
				jobs[i]()
				p.mu.Lock()
				p.done++
				d, t := p.done, p.total
				p.mu.Unlock()
				if p.progress != nil {
					p.progress(d, t)
				}
			}
		}()
	}
	for _, i := range order {
		ch <- i
	}
	close(ch)
	wg.Wait()
}
