package main

import (
	"html"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// What report.html says about real fits, read back from the page: its
// tables, captions and paragraphs against the card and the other commands.

var (
	tableBlock = regexp.MustCompile(`(?s)<table[^>]*>.*?</table>`)
	rowBlock   = regexp.MustCompile(`(?s)<tr[^>]*>(.*?)</tr>`)
	cellBlock  = regexp.MustCompile(`(?s)<t[dh][^>]*>(.*?)</t[dh]>`)
)

// reportTable returns the rows of the table of page whose first header
// cell is head, header row first, each cell as plain text; nil when the
// page has no such table.
func reportTable(page, head string) [][]string {
	for _, tb := range tableBlock.FindAllString(page, -1) {
		var rows [][]string
		for _, r := range rowBlock.FindAllStringSubmatch(tb, -1) {
			var cells []string
			for _, c := range cellBlock.FindAllStringSubmatch(r[1], -1) {
				cells = append(cells, html.UnescapeString(c[1]))
			}
			rows = append(rows, cells)
		}
		if len(rows) > 0 && len(rows[0]) > 0 && rows[0][0] == head {
			return rows
		}
	}
	return nil
}

// readReport reads the report.html of an output folder.
func readReport(t *testing.T, dir string) string {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// Without shear information the sign of every fibre angle is unknown,
// whatever model was chosen: on testdata/orthogonal-fibres-load-controlled.csv
// (SYNTHETIC, pure biaxial stretch, no shear) the pick is isotropic, and
// the table of fibre layouts still writes each layout's angles as ±|α|,
// never with a sign (it wrote "83.94°, −5.03°").
func TestReportLayoutAnglesWithoutShear(t *testing.T) {
	if testing.Short() {
		t.Skip("one discovery")
	}
	t.Parallel()
	dir := filepath.Join(t.TempDir(), "fit.weft")
	if _, errs, code := runWeft(t, "fit", filepath.Join("testdata", "orthogonal-fibres-load-controlled.csv"), "-o", dir, "--quiet"); code != 0 {
		t.Fatalf("fit: exit %d: %s", code, errs)
	}
	c, _ := readCardFile(t, filepath.Join(dir, "model.json"))
	if c.Data.HasShear || c.Fit.AngleSignKnown || len(c.Families) != 0 {
		t.Fatalf("has_shear %v, angle_sign_known %v, %d families: want an isotropic pick on data without shear", c.Data.HasShear, c.Fit.AngleSignKnown, len(c.Families))
	}
	rows := reportTable(readReport(t, dir), "fibre layout (best model of each)")
	if len(rows) < 3 {
		t.Fatalf("no table of fibre layouts: %q", rows)
	}
	signed := 0
	for _, r := range rows[1:] {
		if r[2] == "—" {
			continue
		}
		for _, a := range strings.Split(strings.SplitN(r[2], " (", 2)[0], ", ") {
			if !strings.HasPrefix(a, "±") || strings.Contains(a, "−") {
				t.Errorf("%s (%s): angle %q, want ±|α| without shear information", r[0], r[1], a)
			}
			signed++
		}
	}
	if signed == 0 {
		t.Errorf("no angles in the table of fibre layouts: %q", rows)
	}
}
