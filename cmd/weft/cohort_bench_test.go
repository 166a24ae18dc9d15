package main

import (
	"path/filepath"
	"syscall"
	"testing"
	"time"
)

// cpuTime is the CPU time (user + system) this process has used.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// BenchmarkCohort runs the whole 'weft cohort' (discovery of the shared
// form, every specimen's fit, folder and report, the statistics, the
// population fit and the cohort's report) on 50 SYNTHETIC specimens of 200
// points (five protocols of 40), two groups of 25 (writePlantedCohort).
// Target: ≤ 30 s wall on 2 cores. The machine is shared, so it also
// reports the CPU time per run (cpu-s/op), which other jobs do not inflate
// as much; on 2 idle cores the wall time is about half of it.
//
// Sub-benchmarks: "all" writes every specimen's fit report as well (16
// figures as SVG and PNG each, which cost more than the fitting);
// "no-specimen-reports" leaves them out (--no-specimen-reports).
func BenchmarkCohort(b *testing.B) {
	dir := b.TempDir()
	sp := writePlantedCohort(b, dir, 25, 40, 50, cohortPopulation{"A", 30, 30}, cohortPopulation{"B", 30, 45})
	args := []string{"cohort", "--quiet", "--group-by", "group", "--force", "-o", filepath.Join(dir, "cohort")}
	for _, s := range sp {
		args = append(args, s.file)
	}
	b.Run("all", func(b *testing.B) { benchCohort(b, args) })
	b.Run("no-specimen-reports", func(b *testing.B) { benchCohort(b, append(args, "--no-specimen-reports")) })
}

func benchCohort(b *testing.B, args []string) {
	b.ResetTimer()
	c0 := cpuTime()
	for i := 0; i < b.N; i++ {
		if _, stderr, code := runWeft(b, args...); code != 0 {
			b.Fatalf("exit %d: %s", code, stderr)
		}
	}
	b.ReportMetric((cpuTime()-c0).Seconds()/float64(b.N), "cpu-s/op")
}
