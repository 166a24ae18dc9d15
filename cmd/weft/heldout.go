package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"runtime"
	"strconv"
	"sync"

	"github.com/weft-tools/weft/aniso"
)

// heldoutFold is the prediction of one protocol by the fitted form refitted
// to every other protocol.
type heldoutFold struct {
	protocol int // index into Specimen.Protocols
	pred     []float64
	err      error
}

// heldoutPredictions refits o's model form with each protocol left out in
// turn, warm-started from the full fit with no angle scan (as discovery's
// leave-one-protocol-out cross-validation does), and predicts the left-out
// protocol. Folds run in parallel and are returned in protocol order. With
// a single protocol there is nothing to hold out and it returns nil.
func heldoutPredictions(o *fitOutcome) []heldoutFold {
	p, r := o.prob, o.result
	n := len(p.Protocols)
	if n < 2 {
		return nil
	}
	folds := make([]heldoutFold, n)
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

func heldoutFoldFit(p *aniso.Problem, r *aniso.Result, f int) heldoutFold {
	out := heldoutFold{protocol: p.Protocols[f]}
	out.pred, _, out.err = aniso.HeldOut(p, r, f, aniso.Settings{})
	return out
}

// writeHeldoutCSV writes heldout.csv: for every point of every protocol
// whose fold succeeded, its protocol, source line and F, and per measured
// component the stress predicted by the model form refitted without that
// protocol. Rows follow fit.csv's order.
func writeHeldoutCSV(w io.Writer, o *fitOutcome, folds []heldoutFold) error {
	p := o.prob
	kind, unit := o.spec.Kind.String(), o.spec.StressUnit
	cw := csv.NewWriter(w)
	h := []string{"protocol", "line", "F11", "F12", "F21", "F22"}
	for _, c := range p.Output.Components {
		h = append(h, fmt.Sprintf("heldout_%s_%s [%s]", kind, componentNames[c], unit))
	}
	cw.Write(h)
	nc := len(p.Output.Components)
	for _, fd := range folds {
		if fd.err != nil {
			continue
		}
		pr := &o.spec.Protocols[fd.protocol]
		for j, pt := range pr.Points {
			F := pt.F
			row := []string{pr.Label, strconv.Itoa(pt.Line), ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
			for c := 0; c < nc; c++ {
				row = append(row, ftoa(fd.pred[j*nc+c]))
			}
			cw.Write(row)
		}
	}
	cw.Flush()
	return cw.Error()
}
