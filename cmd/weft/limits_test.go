package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Findings 4 and 10 at the command line: every limit names itself and the
// option that raises it; raising it lets the same input through.
func TestLimitsAtTheCommandLine(t *testing.T) {
	dir := t.TempDir()
	data := quickData(t, dir, "x.csv")
	b, _ := os.ReadFile(data)
	far := filepath.Join(dir, "far.csv")
	os.WriteFile(far, []byte(strings.Replace(string(b), "1:1,1.175,1.175", "1:1,6,1.175", 1)), 0o644)
	var terms []string
	for i := 0; i < 65; i++ {
		terms = append(terms, `{"id": "i1-lin", "weight": 1}`)
	}
	big := writeTemp(t, "big.json", `{"format": "weft.model/1", "stress_unit": "kPa", "families": [], "terms": [`+strings.Join(terms, ",")+`]}`)
	for _, c := range []struct {
		args []string
		want []string
	}{
		{[]string{"inspect", far}, []string{"far.csv:11:2: stretch_1 is 6, outside the plausible range 0.2 to 5", "(to raise the limit: --limit stretch=MIN,MAX)"}},
		{[]string{"inspect", data, "--resample", "100000000"}, []string{"row limit of 1000000", "--limit rows=N"}},
		{[]string{"inspect", data, "--limit", "rows=10"}, []string{"more than 10 data rows", "--limit rows=N"}},
		{[]string{"inspect", data, "--limit", "file-mb=0.0001"}, []string{"larger than 104 bytes", "--limit file-mb=N"}},
		{[]string{"inspect", data, "--limit", "stress-kpa=1"}, []string{"stresses beyond ±1 kPa", "--limit stress-kpa=N"}},
		{[]string{"evaluate", big, "--stretch", "1.1,1.1"}, []string{"more than 64 terms", "--limit card-terms=N"}},
		{[]string{"evaluate", big, "--stretch", "1.1,1.1", "--limit", "card-mb=0.0001"}, []string{"larger than 104 bytes", "--limit card-mb=N"}},
		{[]string{"inspect", data, "--limit", "lines=3"}, []string{"NAME one of card-families, card-mb"}},
		{[]string{"inspect", data, "--limit", "rows=0x10"}, []string{"give a positive number"}},
		{[]string{"inspect", data, "--limit", "stretch=2,3"}, []string{"0 < MIN < 1 < MAX"}},
		{[]string{"inspect", data, "--weight", "1:1=1_0"}, []string{"finite decimal number"}},
		// README, Weighting: W > 0, a weight of 0 is refused. Until
		// 2026-12-05 a negative weight was told "≥ 0" and 0 then refused.
		{[]string{"inspect", data, "--protocol-weight", "1:1=-1"}, []string{"finite decimal number > 0", "left out of the data"}},
		{[]string{"inspect", data, "--protocol-weight", "1:1=0"}, []string{"finite decimal number > 0", "left out of the data"}},
		{[]string{"evaluate", big, "--stretch", "0x1p0,1"}, []string{"not a finite decimal number"}},
	} {
		_, errs, code := runWeft(t, c.args...)
		if code != exitBadInput {
			t.Errorf("%v: exit %d, %s", c.args, code, errs)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(errs, w) {
				t.Errorf("%v: %q lacks %q", c.args, errs, w)
			}
		}
	}
	for _, args := range [][]string{
		{"inspect", far, "--limit", "stretch=0.1,10"},
		{"evaluate", big, "--stretch", "1.1,1.1", "--limit", "card-terms=100"},
	} {
		if _, errs, code := runWeft(t, args...); code != 0 {
			t.Errorf("%v: exit %d, %s", args, code, errs)
		}
	}
	if _, err := os.Stat("/dev/zero"); err == nil {
		if _, errs, code := runWeft(t, "inspect", "/dev/zero", "--limit", "file-mb=1"); code != exitBadInput || !strings.Contains(errs, "larger than 1 MiB") {
			t.Errorf("inspect /dev/zero: exit %d, %s", code, errs)
		}
	}
}
