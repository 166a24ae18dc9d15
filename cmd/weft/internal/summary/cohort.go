package summary

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/weft-tools/weft/cmd/weft/internal/cohortreport"
)

// PrintCohort prints the short human summary of a cohort whose files were
// written into the folder dir in the time elapsed.
func PrintCohort(w io.Writer, s *cohortreport.Summary, dir string, elapsed time.Duration) {
	ok := 0
	for _, r := range s.Specimens {
		if r.Status == cohortreport.StatusOK {
			ok++
		}
	}
	fmt.Fprintf(w, "== cohort of %d files: %d fitted, %d failed\n", len(s.Specimens), ok, len(s.Specimens)-ok)
	fmt.Fprintf(w, "form:     %s (%s), %s\n", strings.Join(s.Form.Terms, " + "), s.Form.Key, s.Form.How)
	if v := s.Verdict; v != nil {
		fmt.Fprintf(w, "families: %s — %s\n", v.Families, verdictReason(v.Families, v.Reason))
		fmt.Fprintf(w, "rule:     %s\n", v.Rule)
		su := v.Support
		fmt.Fprintf(w, "support:  %d of %d specimens reach the same verdict on their own evidence, %d of them with their fibre directions within %g° of the cohort's\n",
			su.SameVerdict, su.Specimens, su.SameDirection, su.ToleranceDeg)
		for _, p := range v.Presets {
			fmt.Fprintf(w, "compared: %s, pooled BIC %s, held-out error %s ± %s\n", p.Name, num(float64(p.BIC), "%.7g"), num(float64(p.HeldoutError), "%.3g"), num(float64(p.HeldoutStdErr), "%.2g"))
		}
	}
	fmt.Fprintln(w)
	printCohortStats(w, s)
	for _, r := range s.Specimens {
		if r.Status == cohortreport.StatusFailed {
			fmt.Fprintf(w, "failed:   %s: %s\n", r.File, r.Error)
		}
	}
	for _, n := range s.Notes {
		fmt.Fprintf(w, "note:     %s\n", n)
	}
	printPopulationGaps(w, s.Population)
	fmt.Fprintln(w)
	for _, cn := range s.Cautions {
		fmt.Fprintf(w, "caution:  %s\n", cn)
	}
	fmt.Fprintf(w, "wrote:    %s/ (cohort.csv, cohort.json, %s, report.html, plots/, one folder per specimen) in %.1f s\n", dir, strings.Join(populationFiles(s), ", "), elapsed.Seconds())
}

// printPopulationGaps says when the population model is missing or leaves
// specimens out. Until 2026-12-05 only cohort.json and report.html said
// so, and the terminal's population files read as covering every
// specimen.
func printPopulationGaps(w io.Writer, p *cohortreport.PopulationInfo) {
	if p == nil {
		return
	}
	if p.Error != "" {
		fmt.Fprintf(w, "note:     the population model could not be fitted: %s\n", p.Error)
	}
	if len(p.LeftOut) > 0 {
		fmt.Fprintf(w, "note:     left out of the population fit, in another stress measure or unit than the pooled specimens: %s; the population models do not describe them\n", strings.Join(p.LeftOut, ", "))
	}
}

// populationFiles lists the population cards the cohort folder holds.
func populationFiles(s *cohortreport.Summary) []string {
	var out []string
	if p := s.Population; p != nil && p.Card != "" {
		out = append(out, p.Card)
		if p.MeanCard != "" {
			out = append(out, p.MeanCard)
		}
	}
	return out
}

// printCohortStats prints the statistics over all specimens and the group
// comparisons.
func printCohortStats(w io.Writer, s *cohortreport.Summary) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "parameter\tgroup\tn\tmean\tsd\tmedian\t95% CI of the mean\tunit")
	for _, st := range s.Stats {
		name := st.Parameter
		if st.Note != "" {
			name = st.Note + " " + name
		}
		fmt.Fprintf(tw, "%s\t%s\t%d\t%s\t%s\t%s\t[%s, %s]\t%s\n", name, st.Group, st.N, num(float64(st.Mean), "%.4g"), num(float64(st.SD), "%.3g"),
			num(float64(st.Median), "%.4g"), num(float64(st.CI95[0]), "%.4g"), num(float64(st.CI95[1]), "%.4g"), st.Unit)
	}
	tw.Flush()
	if len(s.Comparisons) == 0 {
		return
	}
	fmt.Fprintln(w)
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "parameter\tgroups\ttest\tstatistic\tp\tp (Holm)\tHedges' g")
	for _, c := range s.Comparisons {
		groups := strings.Join(c.Groups, " vs ")
		if c.Welch != nil {
			fmt.Fprintf(tw, "%s\t%s\tWelch t\t%s\t%s\t%s\t%s\n", c.Label(), groups, num(float64(c.Welch.Statistic), "%.3f"), num(float64(c.Welch.P), "%.3g"),
				num(float64(c.Welch.PHolm), "%.3g"), num(float64(*c.HedgesG), "%.2f"))
			fmt.Fprintf(tw, "\t\tMann–Whitney U\t%s\t%s\t%s\t\n", num(float64(c.MannWhitney.Statistic), "%.1f"), num(float64(c.MannWhitney.P), "%.3g"),
				num(float64(c.MannWhitney.PHolm), "%.3g"))
		}
		if c.KruskalWallis != nil {
			fmt.Fprintf(tw, "%s\t%s\tKruskal–Wallis H\t%s\t%s\t%s\t\n", c.Label(), groups, num(float64(c.KruskalWallis.Statistic), "%.3f"),
				num(float64(c.KruskalWallis.P), "%.3g"), num(float64(c.KruskalWallis.PHolm), "%.3g"))
		}
	}
	tw.Flush()
	fmt.Fprintln(w)
}
