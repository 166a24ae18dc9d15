package main

import (
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
)

// chromiumCheck is appended to a copy of report.html for the test only
// (the report itself has no scripts). After layout it writes a marker into
// the DOM: how many plots there are, how many render with zero width or
// height, how many resources the page fetched (a self-contained page
// fetches none) and how many script errors occurred.
const chromiumCheck = `<script>
var weftErrors = 0;
window.addEventListener('error', function () { weftErrors++; });
(function () {
  var svgs = document.querySelectorAll('figure svg');
  var zero = 0, minW = 1e9;
  for (var i = 0; i < svgs.length; i++) {
    var r = svgs[i].getBoundingClientRect();
    if (!(r.width > 0 && r.height > 0)) { zero++; }
    minW = Math.min(minW, r.width);
  }
  var res = performance.getEntriesByType('resource').length;
  var d = document.createElement('div');
  d.id = 'weft-check';
  d.textContent = 'svgs=' + svgs.length + ';zero=' + zero + ';minwidth=' + Math.round(minW) +
    ';resources=' + res + ';errors=' + weftErrors + ';title=' + document.title;
  document.body.appendChild(d);
})();
</script>
`

// checkInChromium renders the report headless in Chromium, when it is on
// PATH, and checks the marker the inline check wrote into the DOM.
func checkInChromium(t *testing.T, dir string, labels []string) {
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Skip("chromium is not on PATH: skipping the headless rendering check of report.html (install chromium to run it)")
	}
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	page := strings.Replace(string(b), "</body>", chromiumCheck+"</body>", 1)
	tmp := t.TempDir()
	file := filepath.Join(tmp, "report-check.html")
	if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir="+filepath.Join(tmp, "profile"),
		"--window-size=1280,2000", "--virtual-time-budget=5000", "--dump-dom", "file://"+file)
	var stderr strings.Builder
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("chromium: %v\n%s", err, stderr.String())
	}
	dom := string(out)
	m := regexp.MustCompile(`svgs=(\d+);zero=(\d+);minwidth=(-?\d+);resources=(\d+);errors=(\d+);title=([^<]*)`).FindStringSubmatch(dom)
	if m == nil {
		t.Fatalf("chromium: the page did not run the check (no marker in the DOM); stderr:\n%s", stderr.String())
	}
	n := func(s string) int { v, _ := strconv.Atoi(s); return v }
	files, _ := filepath.Glob(filepath.Join(dir, "plots", "*.svg"))
	if n(m[1]) != len(files) {
		t.Errorf("chromium shows %d plots, plots/ has %d", n(m[1]), len(files))
	}
	if n(m[2]) != 0 || n(m[3]) < 200 {
		t.Errorf("chromium: %d plots render with zero size; the narrowest is %s px wide", n(m[2]), m[3])
	}
	if n(m[4]) != 0 {
		t.Errorf("chromium: the page fetched %d resources; a self-contained report fetches none", n(m[4]))
	}
	if n(m[5]) != 0 {
		t.Errorf("chromium: %d errors while loading", n(m[5]))
	}
	if !strings.Contains(m[6], "weft fit report") {
		t.Errorf("chromium: page title %q", m[6])
	}
	for _, l := range labels {
		if !strings.Contains(dom, "Protocol "+l) {
			t.Errorf("chromium: the rendered page does not name protocol %s", l)
		}
	}
	t.Logf("chromium rendered report.html: %s", m[0])
}
