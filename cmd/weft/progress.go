package main

import (
	"fmt"
	"io"
	"strings"
	"sync"
	"time"
)

// progress draws a bar on stderr for long work: only when stderr is a
// terminal, only after the work has run for a second, never with --quiet.
type progress struct {
	mu    sync.Mutex
	w     io.Writer
	label string
	on    bool
	start time.Time
	drawn bool
	done  int
	total int
}

// newProgress returns a bar labelled label on w, drawn only when w is a
// terminal and not quiet.
func newProgress(w io.Writer, terminal bool, label string, quiet bool) *progress {
	return &progress{w: w, label: label, on: !quiet && terminal, start: time.Now()}
}

// set records progress (done of total jobs) and redraws when due.
func (p *progress) set(done, total int) {
	if !p.on {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	// Workers report concurrently and may arrive out of order; a report
	// older than the one drawn (same total, fewer done) would move the
	// count backwards on the screen, so it is dropped.
	if total == p.total && done < p.done {
		return
	}
	p.done, p.total = done, total
	if time.Since(p.start) < time.Second || total == 0 {
		return
	}
	const width = 30
	n := width * done / total
	fmt.Fprintf(p.w, "\r%s [%s%s] %d/%d", p.label, strings.Repeat("#", n), strings.Repeat(".", width-n), done, total)
	p.drawn = true
}

// finish clears the bar.
func (p *progress) finish() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.drawn {
		fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", len(p.label)+50))
	}
}
