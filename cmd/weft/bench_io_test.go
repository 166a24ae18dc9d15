//go:build linux

package main

import (
	"bufio"
	"bytes"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/demo"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// The peak memory of a weft process is read from /proc/self/status
// (VmHWM, the high-water mark of its resident memory) as it ends. The
// resource usage its parent gets (ru_maxrss) would not do: Linux starts a
// child from the parent's memory and counts the parent's high-water mark
// in the child's when it executes the new program.
func init() {
	recordPeak = func(path string) int {
		stop := safeout.HandleSignals(interrupted)
		code := run(os.Args[1:], os.Stdout, os.Stderr)
		stop()
		status, err := os.ReadFile("/proc/self/status")
		if err == nil {
			for _, ln := range strings.Split(string(status), "\n") {
				if f := strings.Fields(ln); len(f) == 3 && f[0] == "VmHWM:" && f[2] == "kB" {
					err = os.WriteFile(path, []byte(f[1]), 0o644)
				}
			}
		}
		if err != nil {
			os.Stderr.WriteString("weft: cannot record the peak memory: " + err.Error() + "\n")
			return 1
		}
		return code
	}
}

// writeTesterFile writes the synthetic demo specimen membrane-M1 (loads in
// N with geometry, time and cycle columns, as 'weft demo' writes it) as a
// tester sampling faster would record it: per protocol `cycles` cycles of
// n points up and n − 1 down, so the default selection keeps n points per
// protocol. It returns the number of data rows.
func writeTesterFile(tb testing.TB, path string, n, cycles int) int {
	tb.Helper()
	rec, err := demo.SizedRecord(n, cycles)
	if err != nil {
		tb.Fatal(err)
	}
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriterSize(f, 1<<20)
	if err := biaxial.WriteRecord(w, rec, biaxial.Layout{Loads: true, Digits: 8}); err != nil {
		tb.Fatal(err)
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	if err := f.Close(); err != nil {
		tb.Fatal(err)
	}
	return len(rec.Rows)
}

// measureWeft runs weft as a separate process b.N times and reports the
// whole process: wall and CPU (user + system) seconds per run, as the
// operating system counts them, and the largest peak resident memory of
// the runs in MB.
func measureWeft(b *testing.B, args ...string) {
	b.Helper()
	peakFile := filepath.Join(b.TempDir(), "peak")
	var wall, cpu time.Duration
	var peak int64
	for i := 0; i < b.N; i++ {
		cmd := weftProcess(args...)
		cmd.Env = append(cmd.Env, "WEFT_PEAK_FILE="+peakFile)
		var out bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &out
		start := time.Now()
		err := cmd.Run()
		wall += time.Since(start)
		if err != nil {
			b.Fatalf("weft %v: %v\n%s", args, err, out.String())
		}
		if ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage); ok {
			cpu += time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
		}
		kb, err := os.ReadFile(peakFile)
		if err != nil {
			b.Fatal(err)
		}
		v, err := strconv.ParseInt(string(kb), 10, 64)
		if err != nil {
			b.Fatal(err)
		}
		peak = max(peak, v*1024)
	}
	b.ReportMetric(wall.Seconds()/float64(b.N), "wall-s/op")
	b.ReportMetric(cpu.Seconds()/float64(b.N), "cpu-s/op")
	b.ReportMetric(float64(peak)/1e6, "peak-MB")
}

// BenchmarkInspectTesterFile is 'weft inspect' of a raw tester file of
// 2 000 050 rows (about 120 MB: 5 protocols × 10 cycles × 40 001 rows),
// generated into a temporary folder, as a separate process. The rows
// exceed the default row limit, which --limit rows raises. Targets:
// ≤ 2 s wall on 2 cores and ≤ 300 MB peak memory.
func BenchmarkInspectTesterFile(b *testing.B) {
	path := filepath.Join(b.TempDir(), "tester.csv")
	rows := writeTesterFile(b, path, 20001, 10)
	b.ResetTimer()
	measureWeft(b, "inspect", "--limit", "rows="+strconv.Itoa(rows), path)
}

// BenchmarkReadKeptPoints is 'weft inspect' (the reading stage of a fit)
// and the whole 'weft fit' of specimens that keep 1 000 and 5 000 points
// per protocol (5 protocols, 3 cycles each), as separate processes.
func BenchmarkReadKeptPoints(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		path := filepath.Join(b.TempDir(), "kept"+strconv.Itoa(n)+".csv")
		writeTesterFile(b, path, n, 3)
		b.Run("inspect-"+strconv.Itoa(n), func(b *testing.B) { measureWeft(b, "inspect", path) })
		b.Run("fit-"+strconv.Itoa(n), func(b *testing.B) {
			out := filepath.Join(b.TempDir(), "out")
			measureWeft(b, "fit", path, "-o", out, "--quiet", "--force")
		})
	}
}
