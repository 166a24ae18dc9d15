package main

import (
	"context"
	"fmt"
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
// fetches none), how many script errors occurred, and how far the page
// reaches beyond the window's width (the page is laid out with its print
// rules at the text width of A4, where anything wider would make the
// browser shrink the whole page, and its text, to fit).
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
  var over = document.documentElement.scrollWidth - window.innerWidth;
  var d = document.createElement('div');
  d.id = 'weft-check';
  d.textContent = 'svgs=' + svgs.length + ';zero=' + zero + ';minwidth=' + Math.round(minW) +
    ';resources=' + res + ';errors=' + weftErrors + ';overflow=' + over + ';title=' + document.title;
  document.body.appendChild(d);
})();
</script>
`

// a4TextWidth is the text width of an A4 page with the report's 14 mm
// margins in CSS pixels (96 per inch): (210 − 2·14) mm = 687.9 px.
const a4TextWidth = 688

// checkInChromium renders the report headless in Chromium, when it is on
// PATH, and checks the marker the inline check wrote into the DOM; then it
// prints the report to PDF (A4, as a user would) and checks that it takes
// at most protocols/2 + 8 pages.
func checkInChromium(t *testing.T, dir string, labels []string) {
	bin, err := exec.LookPath("chromium")
	if err != nil {
		t.Skip("chromium is not on PATH: skipping the headless rendering check of report.html (install chromium to run it)")
	}
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	// The print rules apply on screen too, so that the window is laid out
	// as the printed page is.
	page := strings.Replace(string(b), "</body>", chromiumCheck+"</body>", 1)
	page = strings.Replace(page, "@media print {", "@media all {", 1)
	tmp := t.TempDir()
	file := filepath.Join(tmp, "report-check.html")
	if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir="+filepath.Join(tmp, "profile"),
		fmt.Sprintf("--window-size=%d,2000", a4TextWidth), "--virtual-time-budget=5000", "--dump-dom", "file://"+file)
	var stderr strings.Builder
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("chromium: %v\n%s", err, stderr.String())
	}
	dom := string(out)
	m := regexp.MustCompile(`svgs=(\d+);zero=(\d+);minwidth=(-?\d+);resources=(\d+);errors=(\d+);overflow=(-?\d+);title=([^<]*)`).FindStringSubmatch(dom)
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
	if n(m[6]) > 0 {
		t.Errorf("chromium: at the A4 text width (%d px) the page is %s px wider; printing would shrink its text", a4TextWidth, m[6])
	}
	if !strings.Contains(m[7], "weft fit report") {
		t.Errorf("chromium: page title %q", m[7])
	}
	for _, l := range labels {
		if !strings.Contains(dom, "<td>"+l+"</td>") {
			t.Errorf("chromium: the rendered page does not name protocol %s", l)
		}
	}
	t.Logf("chromium rendered report.html: %s", m[0])
	pages := printedPages(t, bin, filepath.Join(dir, "report.html"), tmp)
	if max := len(labels)/2 + 8; pages > max {
		t.Errorf("chromium prints report.html on %d A4 pages; at most %d for %d protocols", pages, max, len(labels))
	}
	t.Logf("chromium prints report.html on %d A4 pages", pages)
}

// printedPages prints a page to PDF with Chromium (A4 from the page's own
// @page rule) and counts the PDF's page objects (ISO 32000-1, §7.7.3.3:
// each page is a dictionary of /Type /Page).
func printedPages(t *testing.T, bin, file, tmp string) int {
	t.Helper()
	pdf := filepath.Join(tmp, "report.pdf")
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir="+filepath.Join(tmp, "profile-pdf"),
		"--no-pdf-header-footer", "--print-to-pdf="+pdf, "file://"+file)
	var stderr strings.Builder
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium --print-to-pdf: %v\n%s", err, stderr.String())
	}
	b, err := os.ReadFile(pdf)
	if err != nil {
		t.Fatal(err)
	}
	n := len(regexp.MustCompile(`/Type\s*/Page[^s]`).FindAll(b, -1))
	if n == 0 {
		t.Fatalf("chromium wrote a PDF without pages (%d bytes)", len(b))
	}
	return n
}
