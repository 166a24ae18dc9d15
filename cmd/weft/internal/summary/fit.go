package summary

import (
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
)

// num formats x, or "-" where it is not a finite number.
func num(x float64, format string) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "-"
	}
	return fmt.Sprintf(format, x)
}

// ZeroMatrixWarning is what weft says when the fitted model's matrix
// weight is zero (a preset or chosen form whose matrix weight went to its
// bound, or a form without a matrix term).
const ZeroMatrixWarning = "the fitted model has zero matrix weight (no isotropic or Fung-type term carries load): it has no stiffness at rest or in compression, so an FE model of it is singular there"

// printModelLine prints the fitted energy, and a warning when it has no
// matrix weight.
func printModelLine(w io.Writer, f *Fit, how string) {
	fmt.Fprintf(w, "model:    %s, %s\n", how, strings.TrimPrefix(f.Card.Energy, "Psi = "))
	if f.Result.Model.MatrixWeight() == 0 {
		fmt.Fprintf(w, "warning:  %s\n", ZeroMatrixWarning)
	}
}

// Fit is one specimen's fit as its summary shows it.
type Fit struct {
	// Specimen is the test file as read.
	Specimen *biaxial.Specimen
	// Result is the fit of the chosen or discovered model form.
	Result *aniso.Result
	// Discovery is the discovery that chose the form; nil when the form
	// was given.
	Discovery *aniso.Discovery
	// Card is the model card written.
	Card *card.Card
	// Dir is the output folder and Files the files written into it, in
	// the order listed.
	Dir   string
	Files []string
	// Elapsed is the time the fit took.
	Elapsed time.Duration
}

// PrintFit prints the short human summary of one specimen's fit: the data,
// the model, the parameters with their intervals, the goodness of fit per
// protocol, who carries the load, the forms compared, the cautions and the
// files written.
func PrintFit(w io.Writer, f *Fit) {
	printFitHead(w, f)
	fmt.Fprintln(w)
	printParameters(w, f.Result)
	fmt.Fprintln(w)
	printMetrics(w, f.Specimen, f.Result)
	if sp := f.Card.Split; sp != nil {
		fmt.Fprintln(w)
		printSplit(w, f.Specimen.Kind, sp)
	}
	if d := f.Discovery; d != nil {
		fmt.Fprintln(w)
		printCompared(w, d)
	}
	for _, n := range f.Result.Notes {
		fmt.Fprintf(w, "note:     %s\n", n)
	}
	fmt.Fprintln(w)
	for _, c := range card.CautionsOf(f.Card) {
		fmt.Fprintf(w, "caution:  %s\n", c)
	}
	fmt.Fprintf(w, "wrote:    %s/ (%s) in %.2f s\n\n", f.Dir, strings.Join(f.Files, ", "), f.Elapsed.Seconds())
}

// printFitHead prints the specimen, its data, the model and the verdict
// on the fibre families.
func printFitHead(w io.Writer, f *Fit) {
	s := f.Specimen
	shear := "no shear information (angle signs unknown)"
	if s.HasShear {
		shear = "shear information present"
	}
	fmt.Fprintf(w, "== %s  (%s)\n", s.Name, s.Source)
	protocols := fmt.Sprintf("%d protocols", len(s.Protocols))
	if len(s.Protocols) == 1 {
		protocols = "1 protocol"
	}
	fmt.Fprintf(w, "data:     %s, %d points, %s stress in %s, %s\n", protocols, s.NumPoints(), s.Kind, s.StressUnit, shear)
	if s.Reference != "" {
		fmt.Fprintf(w, "          reference: %s\n", s.Reference)
	}
	for _, wn := range s.Warnings {
		fmt.Fprintf(w, "warning:  %s\n", wn.String())
	}
	how := "chosen form"
	if f.Discovery != nil {
		how = "discovered (" + f.Discovery.Best().Name + ")"
	}
	printModelLine(w, f, how)
	if pair := report.PairText(f.Card.Layout); pair != "" {
		fmt.Fprintf(w, "fibres:   %s\n", pair)
	}
	if d := f.Discovery; d != nil {
		fmt.Fprintf(w, "families: %s — %s\n", d.Verdict.Families, verdictReason(d.Verdict.Families, d.Verdict.Reason))
		if d.Verdict.Decider != "" {
			fmt.Fprintf(w, "          to decide: %s\n", d.Verdict.Decider)
		}
		if next := nextStep(f); next != "" {
			fmt.Fprintf(w, "          next:     %s\n", next)
		}
		if c := f.Card.CalibrationCheck; c != nil {
			fmt.Fprintf(w, "check:    %s\n", c.Summary)
		}
		fmt.Fprintf(w, "rule:     %s\n", d.Rule)
		for i, st := range f.Card.UntestedStrips {
			head := "untested: "
			if i > 0 {
				head = "          "
			}
			fmt.Fprintf(w, "%s%s\n", head, st.Summary)
		}
		if d.SearchPoints < d.Points {
			fmt.Fprintf(w, "points:   search, cross-validation and the comparison below on %d of the %d points (an even subset of each long protocol); the chosen model refitted on all %d\n", d.SearchPoints, d.Points, d.Points)
		}
	}
}

// printMetrics prints the goodness of fit per protocol and component.
func printMetrics(w io.Writer, s *biaxial.Specimen, r *aniso.Result) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "protocol\tcomponent\tR²\tNRMSE\tRMSE ["+s.StressUnit+"]")
	for _, m := range r.Metrics {
		r2 := "-"
		if m.R2Defined {
			r2 = fmt.Sprintf("%.4f", m.R2)
		}
		nr := "-"
		if m.NRMSEDefined {
			nr = fmt.Sprintf("%.2f%%", 100*m.NRMSE)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%.3g\n", m.Protocol, s.Kind.Symbol(m.Component), r2, nr, m.RMSE)
	}
	tw.Flush()
}

// printSplit prints who carries the load: each term group's share of every
// stress component and of the energy at the largest stretch.
func printSplit(w io.Writer, kind biaxial.StressKind, sp *card.SplitSection) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	head := "split\tcomponent"
	for _, g := range sp.Groups {
		head += "\t" + g
	}
	fmt.Fprintln(tw, head+"\tenergy at largest stretch")
	noShare := false
	for _, pp := range sp.Protocols {
		for ci, c := range pp.Components {
			line := pp.Protocol + "\t" + kind.Symbol(c.Component)
			for _, g := range sp.Groups {
				line += "\t" + num(float64(c.GroupShare[g])*100, "%.0f%%")
			}
			noShare = noShare || c.NoShare != ""
			if ci == 0 {
				var es []string
				for _, g := range sp.Groups {
					es = append(es, g+" "+num(float64(pp.GroupEnergyShare[g])*100, "%.0f%%"))
				}
				line += "\t" + strings.Join(es, ", ")
			}
			fmt.Fprintln(tw, line)
		}
	}
	tw.Flush()
	if noShare {
		fmt.Fprintf(w, "          -: no share where the modelled component stays under %.0f %% of the protocol's largest normal stress and its terms' contributions cancel\n", 100*aniso.NegligibleNet)
	}
}

// printCompared prints the forms discovery compared (the chosen one
// starred) and the classical presets.
func printCompared(w io.Writer, d *aniso.Discovery) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "compared\tparameters\tloss\tBIC\theld-out error\tlowest R²")
	row := func(c *aniso.Candidate, mark string) {
		cv := "-"
		switch {
		case c.CV != nil && !math.IsInf(c.CV.Mean, 0) && !math.IsNaN(c.CV.Mean):
			cv = fmt.Sprintf("%.4f ± %.4f", c.CV.Mean, c.CV.StdErr)
		case c.CV != nil:
			cv = "a fold failed"
		}
		cr := c.Compared()
		minR2 := card.LowestR2(cr.Metrics)
		fmt.Fprintf(tw, "%s%s\t%d\t%.4g\t%.1f\t%s\t%s\n", c.Name, mark, cr.Complexity, cr.Loss, cr.BIC, cv, num(minR2, "%.4f"))
	}
	for i := range d.Pareto {
		mark := ""
		if i == d.Chosen {
			mark = " *"
		}
		row(&d.Pareto[i], mark)
	}
	for i := range d.Presets {
		row(&d.Presets[i], "")
	}
	tw.Flush()
}

// printParameters prints the parameter table with intervals and statuses,
// the angle profiles' intervals, what the statuses shown mean, and the
// flags.
func printParameters(w io.Writer, r *aniso.Result) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "parameter\tvalue\t95% interval\tunit\tstatus")
	// One interval per quantity: an angle's profile-likelihood interval
	// where it has a profile (the card keeps the Wald interval too).
	profiles := map[string]aniso.AngleProfile{}
	for _, p := range r.Profiles {
		profiles[p.Name] = p
	}
	for _, e := range r.Estimates {
		if e.Status == "inactive" && e.Kind != "weight" {
			continue
		}
		iv := "-"
		if !math.IsNaN(e.Lo) {
			iv = fmt.Sprintf("[%.4g, %.4g]", e.Lo, e.Hi)
		}
		status := e.Status
		// A degenerate angle (of a family made only of terms the data do
		// not support) has no interval, as its status says, though its
		// profile may cross the threshold: the unsupported family fits a
		// sliver of the points, and an interval would read as a direction
		// the data determine.
		if p, ok := profiles[e.Name]; ok && e.Kind == "angle" && e.Status != aniso.StatusDegenerate {
			switch {
			case p.NotDetermined:
				iv, status = "-", e.Status+" (the profile excludes no angle)"
			default:
				iv = fmt.Sprintf("[%.2f, %.2f]", p.LoDeg, p.HiDeg)
				status += " (profile interval"
				if !p.Closed {
					status += ", open at one end"
				}
				status += ")"
			}
		}
		val := num(e.Value, "%.5g")
		if e.Kind == "angle" {
			// An angle on a symmetry line comes out within round-off
			// of it (1e-14°); degrees to 1e-4 are all a fit resolves.
			val = num(math.Round(e.Value*1e4)/1e4+0, "%.5g")
		}
		if e.Kind == "angle" && !r.SignKnown && (e.Name == "angle" || strings.HasPrefix(e.Name, "angle_")) {
			val = "±" + val
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", e.Name, val, iv, e.Unit, status)
	}
	tw.Flush()
	var statuses []string
	for _, e := range r.Estimates {
		if e.Status != aniso.StatusInactive || e.Kind == "weight" {
			statuses = append(statuses, e.Status)
		}
	}
	for _, l := range report.StatusLegend(statuses) {
		fmt.Fprintf(w, "status:   %s\n", l)
	}
	for _, f := range r.Flags {
		fmt.Fprintf(w, "flag:     %s\n", f)
	}
}

// nextStep says, for a verdict the data leave undecided, which command
// ranks the tests that would settle it; for a verdict with fibres found
// without the calibration check, which option would tell whether they
// depend on the calibration of the test's axes; "" otherwise.
func nextStep(f *Fit) string {
	if f.Discovery == nil {
		return ""
	}
	switch f.Discovery.Verdict.Families {
	case "undecided":
		if f.Dir == "" {
			return ""
		}
		return "weft plan " + shellWord(f.Dir) + " ranks the tests that would settle it, by how far they would set the rival models apart"
	case "1", "1-or-mirror-pair", "2":
		// A per-axis error of the load-to-stress conversion is a material
		// stiffer along that axis, which no data show: synthetic isotropic
		// Demiray solids with one axis's stress ×0.95, ×1.02 or ×1.05 (1 %
		// noise, no shear) were decided as one family at ±29.7°, ±59.3°
		// and ±60.3°, and the summary did not mention the check.
		if f.Card != nil && f.Card.CalibrationCheck != nil {
			return ""
		}
		return "fit again with --calibration-check 0.05 to see whether these fibres survive a 5 % error in one axis's load-to-stress conversion (a load cell's calibration, an effective loaded width), which no data show and which makes even an isotropic material read as fibred"
	}
	return ""
}

// shellWord quotes s for a POSIX shell when it holds anything but letters,
// digits and . _ - / + , : @ %, so that the printed command can be pasted.
func shellWord(s string) string {
	if s == "" {
		return "''"
	}
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune("._-/+,:@%", r)) {
			return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
		}
	}
	return s
}

// verdictReason is a verdict's reason as the summary prints it after the
// verdict itself: an undecided verdict's reason starts with "undecided: ",
// which the line would otherwise say twice ("families: undecided —
// undecided: ...").
func verdictReason(families, reason string) string {
	return strings.TrimPrefix(reason, families+": ")
}
