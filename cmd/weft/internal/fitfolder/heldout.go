package fitfolder

import (
	"runtime"
	"sync"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
)

// HeldoutPredictions predicts each protocol of p from the model form of r
// fitted without it. When cv holds the cross-validation of r's form
// (discovery's, for the chosen candidate), its folds' models are used, so
// that heldout.csv shows the predictions the selection scored (on every
// point of the left-out protocol); otherwise, and for a fold whose refit
// failed there, the form is refitted with the protocol left out,
// warm-started from the full fit with no angle scan (as the
// cross-validation does). Folds run in parallel and are returned in
// protocol order. With a single protocol there is nothing to hold out and
// it returns nil.
func HeldoutPredictions(p *aniso.Problem, r *aniso.Result, cv *aniso.CVScore) []report.HeldoutFold {
	n := len(p.Protocols)
	if n < 2 {
		return nil
	}
	if cv != nil && len(cv.Folds) != n {
		cv = nil
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
				folds[f] = heldoutFold(p, r, cv, f)
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

// heldoutFold predicts the f-th protocol of p from the cross-validation's
// fold model when there is one, else from a refit without it.
func heldoutFold(p *aniso.Problem, r *aniso.Result, cv *aniso.CVScore, f int) report.HeldoutFold {
	out := report.HeldoutFold{Protocol: p.Protocols[f]}
	if cv != nil && cv.Folds[f].Model != nil {
		test, err := aniso.NewProblem(p.Specimen, []int{p.Protocols[f]})
		if err == nil {
			out.Pred, out.Err = aniso.Predict(test, cv.Folds[f].Model)
			return out
		}
	}
	out.Pred, _, out.Err = aniso.HeldOut(p, r, f, aniso.Settings{})
	return out
}
