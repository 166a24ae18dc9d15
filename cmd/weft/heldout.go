package main

import (
	"runtime"
	"sync"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
)

// heldoutPredictions refits the model form of r with each protocol left out in
// turn, warm-started from the full fit with no angle scan (as discovery's
// leave-one-protocol-out cross-validation does), and predicts the left-out
// protocol. Folds run in parallel and are returned in protocol order. With
// a single protocol there is nothing to hold out and it returns nil.
func heldoutPredictions(p *aniso.Problem, r *aniso.Result) []report.HeldoutFold {
	n := len(p.Protocols)
	if n < 2 {
		return nil
	}
	folds := make([]report.HeldoutFold, n)
	jobs := make(chan int)
	var wg sync.WaitGroup
	workers := min(runtime.NumCPU(), n)
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for f := range jobs {
				folds[f] = heldoutFoldFit(p, r, f)
			}
		}()
	}
	for f := 0; f < n; f++ {
		jobs <- f
	}
	close(jobs)
	wg.Wait()
	return folds
}

func heldoutFoldFit(p *aniso.Problem, r *aniso.Result, f int) report.HeldoutFold {
	out := report.HeldoutFold{Protocol: p.Protocols[f]}
	out.Pred, _, out.Err = aniso.HeldOut(p, r, f, aniso.Settings{})
	return out
}
