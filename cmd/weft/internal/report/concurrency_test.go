package report

import (
	"bytes"
	"fmt"
	"runtime"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// settledGoroutines returns the number of goroutines once it has come
// down to at most want, or what is left after a bounded number of yields
// (a worker that has signalled its WaitGroup may still be returning). It
// counts yields, not time, so no result depends on the machine's speed.
func settledGoroutines(want int) int {
	n := runtime.NumGoroutine()
	for i := 0; i < 2000 && n > want; i++ {
		runtime.Gosched()
		time.Sleep(time.Millisecond)
		n = runtime.NumGoroutine()
	}
	return n
}

// numberedFigures returns n small figures, each drawing a panel titled
// with its index and a line of 50 points (figure heavy: 20000 points, so
// that with several workers the figures after it finish before it);
// those listed in failing return an error naming themselves.
func numberedFigures(n, heavy int, failing ...int) []*figure {
	figs := make([]*figure, n)
	for i := range figs {
		fails := false
		for _, f := range failing {
			fails = fails || f == i
		}
		figs[i] = &figure{name: fmt.Sprintf("fig%d", i), w: 2 * vg.Inch, h: 1.5 * vg.Inch, draw: func(dc draw.Canvas) error {
			p := newPanel(fmt.Sprintf("figure %d", i), "x", "y", 4, 4)
			xy := make(plotter.XYs, 50)
			if i == heavy {
				xy = make(plotter.XYs, 20000)
			}
			for k := range xy {
				xy[k].X, xy[k].Y = float64(k), float64(k*k%17)
			}
			l, err := plotter.NewLine(xy)
			if err != nil {
				return err
			}
			p.Add(l)
			p.Draw(dc)
			if fails {
				return fmt.Errorf("figure %d failed", i)
			}
			return nil
		}}
	}
	return figs
}

// The figures are rendered on several workers, but the files come back in
// the figures' order, each the same as when drawn alone, and of several
// failures the first in that order is the one returned, whichever worker
// failed first (with two or more cores figure 7 fails long before the
// heavy figure 2; returning the first error to happen returned figure 7's).
// No worker is left running after an error. Run with -race to check that
// the workers share no unguarded state (the plotting library's font cache
// among them).
func TestRenderAllOrderAndFirstError(t *testing.T) {
	const n = 9
	figs := numberedFigures(n, 2)
	alone := make([][]byte, n)
	for i, f := range figs {
		r, err := f.render(false)
		if err != nil {
			t.Fatal(err)
		}
		alone[i] = r.svg
	}
	before := runtime.NumGoroutine()
	for round := 0; round < 5; round++ {
		out, err := renderAll(figs, false)
		if err != nil {
			t.Fatal(err)
		}
		for i, r := range out {
			if r.name != figs[i].name || !bytes.Equal(r.svg, alone[i]) {
				t.Fatalf("round %d: place %d holds %s, not the figure drawn alone", round, i, r.name)
			}
		}
		_, err = renderAll(numberedFigures(n, 2, 2, 7), false)
		if err == nil || !strings.Contains(err.Error(), "figure 2 failed") {
			t.Fatalf("round %d: error %v, want figure 2's (the first failing one in order)", round, err)
		}
	}
	if _, err := renderAll(nil, false); err != nil {
		t.Errorf("no figures: %v", err)
	}
	if after := settledGoroutines(before); after > before {
		t.Errorf("%d goroutines before rendering, %d after", before, after)
	}
}
