package planning

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// Format names the layout of weft plan --json.
const Format = "weft.plan/1"

// Report is what weft plan prints, as a table or as JSON.
type Report struct {
	Format     string `json:"format"`
	Specimen   string `json:"specimen"`
	Folder     string `json:"folder"`
	StressKind string `json:"stress_kind"`
	StressUnit string `json:"stress_unit"`
	Model      string `json:"model"`
	// Noise is the noise level of the fit's weighted residuals; NoiseText
	// says what it means.
	Noise     card.Num `json:"noise"`
	NoiseText string   `json:"noise_meaning"`
	// PeakStretch is the largest principal stretch tested; Points the
	// points per planned test.
	PeakStretch card.Num `json:"peak_stretch"`
	Points      int      `json:"points"`
	// Parameters are the estimated quantities whose information counts.
	Parameters []string `json:"parameters"`
	// Questions are what the data leave open.
	Questions []Question `json:"questions"`
	// SettleLevel, InformationMargin and ExtrapolationMargin are the
	// thresholds of the ranking.
	SettleLevel         float64 `json:"settle_level"`
	InformationMargin   float64 `json:"information_margin"`
	ExtrapolationMargin float64 `json:"extrapolation_margin"`
	// Candidates are ranked, best first.
	Candidates  []Candidate `json:"candidates"`
	Assumptions []string    `json:"assumptions"`
	Notes       []string    `json:"notes"`
	Cautions    []string    `json:"cautions"`
	// Wrote lists the files written (--write, --plot).
	Wrote []string `json:"wrote,omitempty"`
}

// Question is one open question.
type Question struct {
	ID      string `json:"id"`
	Topic   string `json:"topic"`
	Text    string `json:"text"`
	Verdict bool   `json:"verdict"`
	// Layout is true for the fibre-layout question of a fit without a
	// verdict (a chosen form): the data leave it open.
	Layout       bool     `json:"layout,omitempty"`
	SignUnknown  bool     `json:"sign_unknown"`
	Explanations []string `json:"explanations"`
}

// Candidate is one ranked test.
type Candidate struct {
	Rank        int     `json:"rank"`
	Test        string  `json:"test"`
	Protocol    string  `json:"protocol"`
	MountingDeg float64 `json:"mounting_deg"`
	Sutured     bool    `json:"sutured"`
	// ShearMeasured: shear stress components are part of the planned data.
	ShearMeasured bool `json:"shear_measured"`
	// Discrimination is D of the first question (null without questions),
	// Separation its square root in noise standard deviations.
	Discrimination card.Num `json:"discrimination"`
	Separation     card.Num `json:"separation"`
	// Questions score every open question in order.
	Questions []Score `json:"questions"`
	// InformationGain in nats; IntervalShrink per estimated quantity, the
	// fraction by which its 95 % interval narrows.
	InformationGain card.Num            `json:"information_gain"`
	IntervalShrink  map[string]card.Num `json:"interval_shrink"`
	// Decides lists the questions the test settles.
	Decides      []string `json:"decides"`
	Extrapolates bool     `json:"extrapolates"`
	// Outside says where the test leaves the fitted data range (empty,
	// and written as [], when it stays inside).
	Outside []string `json:"outside"`
	// PeakStretch1 and PeakStretch2 are the target stretches of the
	// tester's axes at the peak.
	PeakStretch1 card.Num `json:"peak_stretch_1"`
	PeakStretch2 card.Num `json:"peak_stretch_2"`
}

// Score is a test's score on one question.
type Score struct {
	ID             string   `json:"id"`
	Discrimination card.Num `json:"discrimination"`
	Separation     card.Num `json:"separation"`
	Settled        bool     `json:"settled"`
	// WeakestPair names the two explanations it tells apart least.
	WeakestPair [2]string `json:"weakest_pair"`
}

// planAssumptions state what the scores rest on.
func planAssumptions(d *aniso.Design) []string {
	return []string{
		"Every score uses the fitted model's own predictions: the ranking holds if the model's family (its terms and fibre layout) is right. A test that settles a question under this model need not settle it if the tissue is outside that family.",
		"A planned test is assumed measured as precisely, relative to its own stress range, as the tests fitted: its rows are weighted as weft weights a protocol, and its weighted residuals share the fit's noise level.",
		"Information gain: the D-optimal criterion log det(J'J + Jc'Jc) - log det(J'J) from the fit's Gauss-Newton Jacobian (Atkinson & Donev 1992), in nats; interval shrinks are those of the linearised 95 % intervals. Without shear information the smaller gain over the signs the data cannot tell is given.",
		fmt.Sprintf("Discrimination: the summed squared difference of two explanations' predicted stresses over the test's points, in units of the noise (Hunter & Reiner 1965), for the pair told apart least; D >= %g (%g noise standard deviations) settles a question. Explanations keep their current parameters: refitted to the new data one may move towards another, so treat values near the settle level with care.", aniso.SettleLevel, math.Sqrt(aniso.SettleLevel)),
		"On sutures the edges are free to shear (no shear traction) and markers track F12 and F21; the shear is what each explanation predicts, so it differs between them. Off-axis: the same specimen cut or mounted with the tester's axis 1 at the stated angle from the current axis 1 (towards axis 2), its material taken to be uniform.",
		fmt.Sprintf("Every test peaks where its largest principal stretch or a fibre family's stretch first reaches the largest tested (principal stretch %.4g); 'extrapolates' marks a test that leaves the tested range of the principal stretches or of a fibre stretch by more than %g %% of the largest tested strain.", d.PeakStretch, 100*aniso.ExtrapolationMargin),
		fmt.Sprintf("Ranking: tests that settle a question the verdict left open come first, those that settle more of its questions before fewer, those within the tested range before those that extrapolate, then by information gain; another test ranks above them only when its gain is larger by more than ln 10 = %.3g nats.", aniso.InformationMargin),
	}
}

// questionID names question i: A, B, ...
func questionID(i int) string { return string(rune('A' + i)) }

// NewReport collects the plan of fit f.
func NewReport(f *Folder, d *aniso.Design, notes []string) *Report {
	c, r := f.card, f.Result
	pl := &Report{Format: Format, Specimen: c.Data.Specimen, Folder: f.dir, StressKind: c.Data.StressKind, StressUnit: c.Data.StressUnit,
		Model: modelText(r), Noise: card.Num(d.Noise), PeakStretch: card.Num(d.PeakStretch), Points: d.Points, Parameters: d.Parameters,
		SettleLevel: aniso.SettleLevel, InformationMargin: aniso.InformationMargin, ExtrapolationMargin: aniso.ExtrapolationMargin,
		Assumptions: planAssumptions(d), Notes: append([]string{}, notes...), Cautions: card.CautionsOf(c), Questions: []Question{}}
	pl.NoiseText = fmt.Sprintf("standard deviation of the weighted residuals, sqrt(loss / (rows - %d)); about %.3g %% of a protocol's stress range per point at %d points", r.FreeParams, 100*d.Noise*math.Sqrt(float64(d.Points)), d.Points)
	for i, q := range d.Questions {
		// A fit of a chosen form has no verdict: a layout question is then
		// the data's, not a verdict's.
		pq := Question{ID: questionID(i), Topic: q.Topic, Text: q.Text, Verdict: q.Verdict && c.Verdict != nil, Layout: q.Verdict && c.Verdict == nil, SignUnknown: q.SignUnknown}
		for _, e := range q.Explanations {
			pq.Explanations = append(pq.Explanations, e.Name)
		}
		pl.Questions = append(pl.Questions, pq)
	}
	for k, ts := range d.Tests {
		pl.Candidates = append(pl.Candidates, newPlanCandidate(k+1, &ts, d))
	}
	if n := trackingNote(f, d); n != "" {
		pl.Notes = append(pl.Notes, n)
	}
	return pl
}

// trackingNote warns, when the plan scores tests on sutures, that the
// fitted points' marker-tracked shear scatters from point to point by more
// than biaxial.ShearScatterLimit: the scores take a planned test's shear as
// tracked without scatter, while a sutured test tracked as noisily compares
// each model's shear stress with the zero shear tractions at noisy shear,
// which penalises fibres that resist shear. On a SYNTHETIC mirror pair at
// 38.3° and −35.5° (von Mises spread, concentration 3; audit data made by
// independent code) tested without shear stresses, the plan ranked "1:1 on
// sutures, shear from markers" first, separating the layouts by 178 noise
// standard deviations; the same specimen run so, its shear tracked with the
// scatter of 0.001 to 0.003 its file already showed, was fitted as one
// family at 0.3° (verdict undecided), and with a scatter of 0.0001 to
// 0.0003 as the pair at 38.3°, −35.4°. It returns "" otherwise.
func trackingNote(f *Folder, d *aniso.Design) string {
	sutured := false
	for _, ts := range d.Tests {
		sutured = sutured || ts.Test.Sutured
	}
	if !sutured || f.spec == nil {
		return ""
	}
	worst, big := -1, biaxial.ShearScatterLimit
	for i := range f.spec.Protocols {
		sc := f.spec.Protocols[i].StrainScatter
		if v := math.Max(sc[1], sc[2]); v > big {
			worst, big = i, v
		}
	}
	if worst < 0 {
		return ""
	}
	pr := &f.spec.Protocols[worst]
	return fmt.Sprintf("The fitted points' shear scatters from point to point by about %.2g in F12 and %.2g in F21 (protocol %s; estimated from fit.csv as weft inspect estimates it from a file), above %g: tracking noise of the markers? The tests on sutures are scored as if their shear were tracked without scatter. Tracked as noisily, a sutured test's zero shear stresses are compared with each model's shear stress at noisy shear, which penalises fibres that resist shear and can leave the layout open or put the fibres on a test axis, whatever its separation says: track the shear more steadily (a scatter below %g) or prefer a test mounted off-axis.",
		pr.StrainScatter[1], pr.StrainScatter[2], pr.Label, biaxial.ShearScatterLimit, biaxial.ShearScatterLimit)
}

// newPlanCandidate describes one scored test.
func newPlanCandidate(rank int, ts *aniso.TestScore, d *aniso.Design) Candidate {
	t := &ts.Test
	peak := t.Path[len(t.Path)-1]
	pc := Candidate{Rank: rank, Test: t.Describe(), Protocol: t.Label, MountingDeg: t.MountingDeg, Sutured: t.Sutured, ShearMeasured: t.ShearMeasured,
		Discrimination: card.Num(math.NaN()), Separation: card.Num(math.NaN()), Questions: []Score{}, Decides: []string{},
		InformationGain: card.Num(ts.InformationGain), IntervalShrink: map[string]card.Num{}, Extrapolates: ts.Extrapolates, Outside: append([]string{}, ts.Outside...),
		PeakStretch1: card.Num(peak[0]), PeakStretch2: card.Num(peak[3])}
	for _, s := range ts.Shrink {
		pc.IntervalShrink[s.Name] = card.Num(s.Fraction)
	}
	for i, qs := range ts.Questions {
		q := &d.Questions[i]
		ps := Score{ID: questionID(i), Discrimination: card.Num(qs.Discrimination), Separation: card.Num(math.Sqrt(qs.Discrimination)), Settled: qs.Settled,
			WeakestPair: [2]string{q.Explanations[qs.Weakest[0]].Name, q.Explanations[qs.Weakest[1]].Name}}
		pc.Questions = append(pc.Questions, ps)
		if i == 0 {
			pc.Discrimination, pc.Separation = ps.Discrimination, ps.Separation
		}
		if qs.Settled {
			pc.Decides = append(pc.Decides, q.Text)
		}
	}
	return pc
}

// modelText says which model the plan rests on.
func modelText(r *aniso.Result) string {
	var fams []string
	for _, f := range r.Model.Families {
		a := aniso.Deg(f.Angle)
		if r.SignKnown {
			fams = append(fams, fmt.Sprintf("%s at %.1f°", f.Name, a))
		} else {
			fams = append(fams, fmt.Sprintf("%s at ±%.1f°", f.Name, math.Abs(a)))
		}
	}
	s := r.Summary()
	if i := strings.Index(s, ", loss"); i > 0 {
		s = s[:i]
	}
	if len(fams) > 0 {
		s += "; " + strings.Join(fams, ", ")
	}
	return s
}

// percent writes a fraction as a whole percentage.
func percent(x float64) string {
	if math.IsNaN(x) {
		return "-"
	}
	return fmt.Sprintf("%.0f%%", 100*x)
}

// separationText writes √D in noise standard deviations, with a mark when
// the question is settled.
func separationText(s Score) string {
	v := float64(s.Separation)
	var t string
	switch {
	case math.IsNaN(v):
		return "-"
	case v < 0.05:
		t = "0"
	case v < 10:
		t = fmt.Sprintf("%.1f", v)
	default:
		t = fmt.Sprintf("%.0f", v)
	}
	if s.Settled {
		t += " settles"
	}
	return t
}

// Print writes the plan as text: the fit, the open questions, the
// ranked table (top rows; 0 all), the interval shrinks of the first tests,
// notes, assumptions and cautions.
func Print(w io.Writer, pl *Report, top int) {
	fmt.Fprintf(w, "plan:     %s (%s), %s stress in %s\n", pl.Specimen, pl.Folder, pl.StressKind, pl.StressUnit)
	fmt.Fprintf(w, "model:    %s\n", pl.Model)
	fmt.Fprintf(w, "noise:    %.3g (%s)\n", float64(pl.Noise), pl.NoiseText)
	if len(pl.Questions) == 0 {
		fmt.Fprintf(w, "open:     nothing the verdict or the selection left open; tests are ranked by information alone\n")
	}
	for i, q := range pl.Questions {
		head := "open:    "
		if i > 0 {
			head = "         "
		}
		kind := "model selection"
		switch {
		case q.Verdict:
			kind = "left open by the verdict"
		case q.Layout:
			kind = "left open by the data"
		}
		fmt.Fprintf(w, "%s [%s] %s (%s)\n", head, q.ID, q.Text, kind)
	}
	fmt.Fprintf(w, "tests:    %d candidates, %d points each, peaking at the largest stretch tested (principal stretch %.4g)\n\n", len(pl.Candidates), pl.Points, float64(pl.PeakStretch))
	n := len(pl.Candidates)
	if top > 0 && top < n {
		n = top
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	h := []string{"rank", "test", "decides"}
	for _, q := range pl.Questions {
		h = append(h, "["+q.ID+"] separation")
	}
	h = append(h, "gain", "largest shrink", "range")
	fmt.Fprintln(tw, strings.Join(h, "\t"))
	for _, c := range pl.Candidates[:n] {
		var dec []string
		for i, s := range c.Questions {
			if s.Settled {
				dec = append(dec, pl.Questions[i].Topic)
			}
		}
		row := []string{strconv.Itoa(c.Rank), c.Test, orDash(strings.Join(dec, ", "))}
		for _, s := range c.Questions {
			row = append(row, separationText(s))
		}
		name, best := largestShrink(c, pl.Parameters)
		rng := "tested"
		if c.Extrapolates {
			rng = "extrapolates"
		}
		row = append(row, fmt.Sprintf("%.2f", float64(c.InformationGain)), name+" "+percent(best), rng)
		fmt.Fprintln(tw, strings.Join(row, "\t"))
	}
	tw.Flush()
	if n < len(pl.Candidates) {
		fmt.Fprintf(w, "(%d more; --top 0 lists all, --json gives every score)\n", len(pl.Candidates)-n)
	}
	fmt.Fprintln(w)
	printShrinks(w, pl)
	fmt.Fprintf(w, "separation: √D, in noise standard deviations, of the two explanations a test tells apart least; it settles a question at %g\n", math.Sqrt(pl.SettleLevel))
	fmt.Fprintf(w, "gain:       D-optimal information gain in nats; shrink: how much narrower a 95 %% interval becomes\n")
	for _, c := range pl.Candidates[:min(n, 3)] {
		if c.Extrapolates {
			fmt.Fprintf(w, "range:      %d. %s: %s\n", c.Rank, c.Test, strings.Join(c.Outside, "; "))
		}
	}
	for _, note := range pl.Notes {
		fmt.Fprintf(w, "note:       %s\n", note)
	}
	for _, a := range pl.Assumptions {
		fmt.Fprintf(w, "assumes:    %s\n", a)
	}
	for _, c := range pl.Cautions {
		fmt.Fprintf(w, "caution:    %s\n", c)
	}
	for _, f := range pl.Wrote {
		fmt.Fprintf(w, "wrote:      %s\n", f)
	}
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// largestShrink is the quantity whose interval narrows most.
func largestShrink(c Candidate, names []string) (string, float64) {
	best, at := math.Inf(-1), ""
	for _, n := range names {
		if v := float64(c.IntervalShrink[n]); v > best {
			best, at = v, n
		}
	}
	return at, best
}

// printShrinks tabulates the interval shrink of every estimated quantity
// for the first five tests.
func printShrinks(w io.Writer, pl *Report) {
	k := min(5, len(pl.Candidates))
	if k == 0 {
		return
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	h := []string{"interval shrink"}
	for _, c := range pl.Candidates[:k] {
		h = append(h, "#"+strconv.Itoa(c.Rank))
	}
	fmt.Fprintln(tw, strings.Join(h, "\t"))
	for _, n := range pl.Parameters {
		row := []string{n}
		for _, c := range pl.Candidates[:k] {
			row = append(row, percent(float64(c.IntervalShrink[n])))
		}
		fmt.Fprintln(tw, strings.Join(row, "\t"))
	}
	tw.Flush()
	fmt.Fprintln(w)
}

// PathCSV writes a planned test's target path in weft's input
// layout without stress columns: stretches in the tester's axes of the
// mounting (F with the predicted shear on sutures) and, for an off-axis
// mounting, F in the fit's axes as extra columns weft ignores on reading.
func PathCSV(f *Folder, t *aniso.PlannedTest) ([]byte, error) {
	var b bytes.Buffer
	meta := func(k, v string) { fmt.Fprintf(&b, "# %s = %s\n", k, strings.Join(strings.Fields(v), " ")) }
	meta("specimen", f.card.Data.Specimen)
	note := "planned next test from weft plan: target path only, no stresses; predicted by the fitted model, which holds if its family is right"
	if t.Sutured {
		note += "; on sutures the shear F12, F21 is what the model predicts (markers measure the real one)"
		if !f.Result.SignKnown && len(f.Result.Model.Families) > 0 {
			// Under −α the sheet shears the other way, a mirror pair not
			// at all: the sign is what the test is to find out.
			note += "; the fit does not know the sign of its fibre angles, so the sign of this shear is not known either (a family at the opposite angle shears the other way)"
		}
	}
	if f.card.Synthetic() {
		// The file's notes replace the specimen's, which may have been
		// the only place its data said they were synthetic.
		note += "; planned from a model fitted to SYNTHETIC data (invented, not measured)"
	}
	meta("notes", note)
	if tissue := f.card.Data.Tissue; tissue != "" {
		meta("tissue", tissue)
	}
	axis := f.card.Data.Axis1
	if axis == "" {
		axis = "the current axis 1"
	}
	if t.MountingDeg != 0 {
		meta("axis_1", fmt.Sprintf("%s turned by %g degrees towards axis 2", axis, t.MountingDeg))
		meta("mounting_deg", strconv.FormatFloat(t.MountingDeg, 'g', -1, 64))
	} else if f.card.Data.Axis1 != "" {
		meta("axis_1", axis)
	}
	num := func(v float64) string { return strconv.FormatFloat(v, 'g', 8, 64) }
	cols := []string{"protocol", "stretch_1", "stretch_2"}
	if t.Sutured {
		cols = []string{"protocol", "F11", "F12", "F21", "F22"}
	}
	if t.MountingDeg != 0 {
		cols = append(cols, "specimen_F11", "specimen_F12", "specimen_F21", "specimen_F22")
	}
	b.WriteString(strings.Join(cols, ",") + "\n")
	label := t.Label
	for i, F := range t.Path {
		row := []string{label}
		if t.Sutured {
			row = append(row, num(F[0]), num(F[1]), num(F[2]), num(F[3]))
		} else {
			row = append(row, num(F[0]), num(F[3]))
		}
		if t.MountingDeg != 0 {
			G := t.SpecimenPath[i]
			row = append(row, num(G[0]), num(G[1]), num(G[2]), num(G[3]))
		}
		b.WriteString(strings.Join(row, ",") + "\n")
	}
	return b.Bytes(), nil
}

// SameFile reports whether two paths name the same file, however
// spelled: by name, as one existing file (device and inode), or as one
// name in one folder reached by different paths (a symbolic link to the
// folder), which the system resolves as ParentDir does.
func SameFile(a, b string) bool {
	x, err1 := filepath.Abs(a)
	y, err2 := filepath.Abs(b)
	if err1 == nil && err2 == nil && x == y {
		return true
	}
	if sa, err := os.Stat(a); err == nil {
		sb, err := os.Stat(b)
		return err == nil && os.SameFile(sa, sb)
	}
	if filepath.Base(a) != filepath.Base(b) {
		return false
	}
	da, err1 := os.Stat(ParentDir(a))
	db, err2 := os.Stat(ParentDir(b))
	return err1 == nil && err2 == nil && os.SameFile(da, db)
}

// ParentDir is the folder the system opens path in: the text before its
// last separator as typed, not filepath.Dir, which cleans "link/.." away
// by name where the system follows the link first.
func ParentDir(path string) string {
	i := strings.LastIndex(path, string(filepath.Separator))
	switch {
	case i == 0:
		return string(filepath.Separator)
	case i > 0:
		return path[:i]
	}
	return "."
}
