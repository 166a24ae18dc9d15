package main

import (
	"bytes"
	"fmt"
	"os"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"
)

// The bar's count never moves backwards when concurrent workers report
// out of order (seen on a terminal as "58/95" followed by "57/95"); a new
// total (the next stage of the work) starts its own count.
func TestProgressCountNeverGoesBack(t *testing.T) {
	var b bytes.Buffer
	p := newProgress(&b, true, "fitting x", false)
	p.start = time.Now().Add(-2 * time.Second) // past the one-second delay
	for _, r := range [][2]int{{56, 95}, {58, 95}, {57, 95}, {59, 95}, {3, 120}} {
		p.set(r[0], r[1])
	}
	var counts []string
	for _, frame := range strings.Split(b.String(), "\r")[1:] {
		f := strings.Fields(frame)
		counts = append(counts, f[len(f)-1])
	}
	if got, want := strings.Join(counts, " "), "56/95 58/95 59/95 3/120"; got != want {
		t.Errorf("drawn counts %q, want %q", got, want)
	}
}

// A progress bar is drawn only on a terminal: /dev/null is a character
// device but no terminal ('weft fit … 2>/dev/null' drew bars into it),
// while a pseudo-terminal is one (Linux: the master side of /dev/ptmx
// answers the TCGETS request of ioctl(2), as every terminal does).
func TestIsTerminalNotEveryCharacterDevice(t *testing.T) {
	null, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	if err != nil {
		t.Skip(err)
	}
	defer null.Close()
	if isTerminal(null) {
		t.Errorf("%s counts as a terminal", os.DevNull)
	}
	if runtime.GOOS != "linux" {
		return
	}
	pty, err := os.OpenFile("/dev/ptmx", os.O_RDWR, 0)
	if err != nil {
		t.Skip(err)
	}
	defer pty.Close()
	if !isTerminal(pty) {
		t.Error("a pseudo-terminal does not count as a terminal")
	}
}

// Workers report at once, as the discovery's pool does (counts handed out
// under the pool's lock, reports sent after it is released): on a
// terminal the drawn count never goes back and ends on the last job. Run
// with -race to check the bar's own state is guarded.
func TestProgressConcurrentReports(t *testing.T) {
	var b bytes.Buffer
	p := newProgress(&b, true, "fitting x", false)
	p.start = time.Now().Add(-2 * time.Second) // past the one-second delay
	const workers, total = 8, 400
	var mu sync.Mutex
	done := 0
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				mu.Lock()
				if done == total {
					mu.Unlock()
					return
				}
				done++
				d := done
				mu.Unlock()
				p.set(d, total)
			}
		}()
	}
	wg.Wait()
	p.finish()
	last := 0
	frames := strings.Split(b.String(), "\r")
	for _, frame := range frames[1 : len(frames)-2] { // the last two clear the bar
		f := strings.Fields(frame)
		var d, n int
		if _, err := fmt.Sscanf(f[len(f)-1], "%d/%d", &d, &n); err != nil || n != total {
			t.Fatalf("frame %q: %v", frame, err)
		}
		if d < last {
			t.Fatalf("drawn %d after %d", d, last)
		}
		last = d
	}
	if last != total {
		t.Errorf("the bar ended on %d of %d", last, total)
	}
}
