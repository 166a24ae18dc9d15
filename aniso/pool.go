package aniso

import "sync"

// pool runs jobs on n workers and keeps results in job order, so that the
// outcome does not depend on scheduling.
type pool struct {
	n        int
	progress func(done, total int)
	mu       sync.Mutex
	done     int
	total    int
}

func (p *pool) run(jobs []func()) {
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
	for i := range jobs {
		ch <- i
	}
	close(ch)
	wg.Wait()
}
