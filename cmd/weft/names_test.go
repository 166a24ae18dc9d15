package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// Renamed flags keep their former names as hidden aliases: --F for
// --deformation and --weight for --protocol-weight give the same output as
// the new names, and the help texts say what they mean.
func TestRenamedFlags(t *testing.T) {
	model := "../../testdata/example/hgo-media.json"
	a, _, c1 := runWeft(t, "evaluate", model, "--deformation", "1.2,0.05,0,1.1", "--json")
	b, _, c2 := runWeft(t, "evaluate", model, "--F", "1.2,0.05,0,1.1", "--json")
	if c1 != 0 || c2 != 0 || a != b {
		t.Errorf("--deformation and its former name --F differ (exit %d, %d)", c1, c2)
	}
	data := demoFile("membrane-M1.csv")
	a, _, c1 = runWeft(t, "inspect", "--json", "--protocol-weight", "1:0.5=2", data)
	b, _, c2 = runWeft(t, "inspect", "--json", "--weight", "1:0.5=2", data)
	if c1 != 0 || c2 != 0 || a != b || !strings.Contains(a, `"user_weight": 2`) {
		t.Errorf("--protocol-weight and its former name --weight differ (exit %d, %d)", c1, c2)
	}
	help, _, _ := runWeft(t, "evaluate", "--help")
	if !strings.Contains(help, "--deformation string") || regexp.MustCompile(`(?m)^\s+--F `).MatchString(help) {
		t.Errorf("evaluate --help does not list --deformation, or lists the hidden --F:\n%s", help)
	}
	help, _, _ = runWeft(t, "fit", "--help")
	if strings.Contains(help, "(default -1)") || !strings.Contains(help, "--protocol-weight") || regexp.MustCompile(`(?m)^\s+--weight `).MatchString(help) {
		t.Errorf("fit --help: --families shows its internal default, or --protocol-weight is missing:\n%s", help)
	}
	_, errs, code := runWeft(t, "--no-such-flag")
	if code != exitBadInput || !strings.Contains(errs, "see 'weft --help'") {
		t.Errorf("unknown flag of weft itself: exit %d, %q", code, errs)
	}
	_, errs, _ = runWeft(t, "fit", "--no-such-flag")
	if !strings.Contains(errs, "see 'weft fit --help'") {
		t.Errorf("unknown flag of weft fit: %q", errs)
	}
	// Every file an example of predict --help names exists in the source.
	help, _, _ = runWeft(t, "predict", "--help")
	for _, m := range regexp.MustCompile(`testdata/\S+`).FindAllString(help, -1) {
		if _, err := os.Stat(filepath.Join("..", "..", m)); err != nil {
			t.Errorf("predict --help names %s: %v", m, err)
		}
	}
}
