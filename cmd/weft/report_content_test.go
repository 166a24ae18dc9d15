package main

import (
	"encoding/json"
	"fmt"
	"html"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
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
	dir := sharedFitCopy(t, filepath.Join("testdata", "orthogonal-fibres-load-controlled.csv"))
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

// On every demo specimen the caption of the table of model forms gives
// the reasons the card's cross-validation note gives: as many candidates
// beyond the BIC window as the note counts, and each candidate the note
// names as spread at the concentration bound or as two families pointing
// the same way, by name (membrane-M1: 3 of 17 at the bound;
// membrane-M3-sutured: 4 of 10; patch-P2: 2 of 28).
func TestReportNotCrossValidatedReasonsOnDemos(t *testing.T) {
	t.Parallel()
	far := regexp.MustCompile(`; (\d+) left out because their BIC is more than 10 above`)
	named := regexp.MustCompile(`; ([^;]+?) left out because (every family of theirs is spread|their two families point the same way)`)
	for name, rare := range map[string]int{"membrane-M1": 3, "membrane-M3-sutured": 4, "patch-P2": 2} {
		dir := filepath.Join(demoFits(t).dir, name+".weft")
		c, _ := readCardFile(t, filepath.Join(dir, "model.json"))
		note := crossValidationNote(c)
		m := far.FindStringSubmatch(note)
		if m == nil {
			t.Fatalf("%s: no cross-validation note with a count: %q", name, c.Selection.Search)
		}
		page := readReport(t, dir)
		caption := regexp.MustCompile(`The \d+ cross-validated forms of the \d+ the search kept\.[^<]*`).FindString(page)
		caption = html.UnescapeString(caption)
		if want := m[1] + " with a BIC more than 10 above their form's best"; !strings.Contains(caption, want) {
			t.Errorf("%s: caption lacks %q:\n%s", name, want, caption)
		}
		n := 0
		for _, g := range named.FindAllStringSubmatch(note, -1) {
			for _, cand := range strings.Split(g[1], ", ") {
				n++
				if !strings.Contains(caption, cand) {
					t.Errorf("%s: caption does not name %s (%s):\n%s", name, cand, g[2], caption)
				}
			}
		}
		if n != rare {
			t.Errorf("%s: the note names %d candidates at the bound or pointing the same way, want %d", name, n, rare)
		}
		if strings.Contains(caption, "ΔBIC 10 from the best of their layout") {
			t.Errorf("%s: caption still gives the BIC window as the only reason:\n%s", name, caption)
		}
	}
}

// The admissibility table's default-grid column says what 'weft check
// --json' says of the same card on the same grid: the points evaluated,
// those failing and, apart, those unresolved, which the check neither
// passes nor fails (demo membrane-M1: 1 of 3249, which the table wrote as
// "passes (3249 points)").
func TestReportAdmissibilityAsCheck(t *testing.T) {
	t.Parallel()
	for _, name := range []string{"membrane-M1", "membrane-M3-sutured", "patch-P2"} {
		dir := filepath.Join(demoFits(t).dir, name+".weft")
		out, errs, code := runWeft(t, "check", filepath.Join(dir, "model.json"), "--json")
		if code != 0 {
			t.Fatalf("%s: weft check: exit %d: %s", name, code, errs)
		}
		var rep struct {
			Grid struct {
				Evaluated int `json:"evaluated"`
			} `json:"grid"`
			Stability struct {
				Passed     bool `json:"passed"`
				Failing    int  `json:"failing_points"`
				Unresolved int  `json:"unresolved_points"`
			} `json:"material_stability"`
		}
		if err := json.Unmarshal([]byte(out), &rep); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		rows := reportTable(readReport(t, dir), "check")
		if len(rows) < 3 || !strings.HasPrefix(rows[0][len(rows[0])-1], "default grid") {
			t.Fatalf("%s: no admissibility table with a default-grid column: %q", name, rows)
		}
		var got string
		for _, r := range rows {
			if r[0] == "material stability" {
				got = r[len(r)-1]
			}
		}
		s, n := rep.Stability, rep.Grid.Evaluated
		want := fmt.Sprintf("passes (%d points)", n)
		switch {
		case !s.Passed && s.Unresolved > 0:
			want = fmt.Sprintf("fails at %d of %d points; %d unresolved", s.Failing, n, s.Unresolved)
		case !s.Passed:
			want = fmt.Sprintf("fails at %d of %d points", s.Failing, n)
		case s.Unresolved > 0:
			want = fmt.Sprintf("passes on %d of %d points; %d unresolved", n-s.Unresolved, n, s.Unresolved)
		}
		if got != want {
			t.Errorf("%s: material stability on the default grid %q; weft check says %q", name, got, want)
		}
	}
}

// The methods paragraph of each demo report states its card's family
// verdict before the chosen model: undecided (patch-P2), one family or a
// mirror pair (membrane-M1), one family (membrane-M3-sutured).
func TestReportMethodsStateTheVerdictOnDemos(t *testing.T) {
	t.Parallel()
	methods := regexp.MustCompile(`(?s)<p class="methods">(.*?)</p>`)
	for name, want := range map[string]string{
		"patch-P2":            "The comparison of the fibre layouts left the number of fibre families undecided",
		"membrane-M1":         "The comparison of the fibre layouts supported one fibre direction at ±29.98°, which may be one family or a mirror pair",
		"membrane-M3-sutured": "The comparison of the fibre layouts supported one fibre family. The resulting model is",
	} {
		dir := filepath.Join(demoFits(t).dir, name+".weft")
		c, _ := readCardFile(t, filepath.Join(dir, "model.json"))
		m := methods.FindStringSubmatch(readReport(t, dir))
		if m == nil {
			t.Fatalf("%s: no methods paragraph", name)
		}
		if text := html.UnescapeString(m[1]); !strings.Contains(text, want) {
			t.Errorf("%s (verdict %s): methods lack %q", name, c.Verdict.Families, want)
		}
	}
}

// Each candidate the search did not cross-validate carries its reason in
// the card (selection.pareto[].not_cross_validated), and the reasons agree
// with the cross-validation note discovery writes in words: the count of
// candidates beyond the BIC window, and the candidates it names at the
// concentration bound and with coincident families (demo specimens,
// synthetic).
func TestCardRecordsWhyNotCrossValidated(t *testing.T) {
	t.Parallel()
	count := regexp.MustCompile(`; (\d+) left out because their BIC is more than`)
	for _, name := range []string{"membrane-M1", "membrane-M3-sutured", "patch-P2"} {
		c, _ := readCardFile(t, filepath.Join(demoFits(t).dir, name+".weft", "model.json"))
		note := crossValidationNote(c)
		m := count.FindStringSubmatch(note)
		if m == nil {
			t.Fatalf("%s: no cross-validation note with a count: %q", name, note)
		}
		far := 0
		for _, cc := range c.Selection.Pareto {
			switch cc.NotCrossValidated {
			case "":
			case aniso.NotValidatedBIC:
				far++
			case aniso.NotValidatedAtBound, aniso.NotValidatedCoincident:
				if !strings.Contains(note, cc.Name) {
					t.Errorf("%s: %s is %s, but the note does not name it: %s", name, cc.Name, cc.NotCrossValidated, note)
				}
			default:
				t.Errorf("%s: %s: unknown reason %q", name, cc.Name, cc.NotCrossValidated)
			}
			if cc.NotCrossValidated != "" && !math.IsNaN(float64(cc.HeldoutError)) {
				t.Errorf("%s: %s has a reason not to be cross-validated and a held-out error", name, cc.Name)
			}
		}
		if strconv.Itoa(far) != m[1] {
			t.Errorf("%s: %d candidates marked beyond the BIC window, the note says %s", name, far, m[1])
		}
	}
}

// crossValidationNote is the cross-validation note of a card's search
// notes, or "".
func crossValidationNote(c *card.Card) string {
	note := ""
	for _, s := range c.Selection.Search {
		if strings.HasPrefix(s, "cross-validation:") {
			note = s
		}
	}
	return note
}
