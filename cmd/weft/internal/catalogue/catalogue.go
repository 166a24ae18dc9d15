// Package catalogue lists the energy shapes and classical presets of
// package terms for the terms command: as JSON (Catalogue) and as text
// (Catalogue.Print).
package catalogue

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/weft-tools/weft/terms"
)

// Term is the listing of one catalogue shape (terms.Shape).
type Term struct {
	ID         string  `json:"id"`
	Argument   string  `json:"argument"`
	Family     bool    `json:"fibre_family"`
	Title      string  `json:"title"`
	Formula    string  `json:"formula"`
	LaTeX      string  `json:"latex"`
	Weight     string  `json:"weight_meaning"`
	Params     []Param `json:"params"`
	Polyconvex bool    `json:"polyconvex"`
	Note       string  `json:"polyconvexity_note"`
	Source     string  `json:"source,omitempty"`
}

// Param is the listing of one non-linear parameter of a shape (terms.Param).
type Param struct {
	Name    string  `json:"name"`
	Symbol  string  `json:"symbol"`
	Default float64 `json:"default"`
	Min     float64 `json:"min"`
	Max     float64 `json:"max"`
	Doc     string  `json:"doc"`
}

// Preset is the listing of one classical model written with catalogue
// terms (terms.Preset); a term of family k is written ID@fk.
type Preset struct {
	Name       string   `json:"name"`
	Title      string   `json:"title"`
	Source     string   `json:"source"`
	Families   int      `json:"families"`
	Mirror     bool     `json:"mirror_pair"`
	Dispersion bool     `json:"dispersion"`
	Terms      []string `json:"terms"`
	Example    string   `json:"example_values"`
}

// Catalogue is the whole listing: every shape and every preset, in the
// terms package's order, as weft terms prints it (JSON keys "terms" and
// "presets"; presets first, in the order the JSON output has always had).
type Catalogue struct {
	Presets []Preset `json:"presets"`
	Terms   []Term   `json:"terms"`
}

// New lists the terms package's catalogue and presets.
func New() *Catalogue {
	var ts []Term
	for _, s := range terms.Catalogue() {
		ti := Term{ID: s.ID, Argument: s.Arg.String(), Family: s.Arg.NeedsFamily(), Title: s.Title,
			Formula: s.Formula, LaTeX: s.LaTeX, Weight: s.Weight, Polyconvex: s.Polyconvex,
			Note: s.PolyconvexNote, Source: s.Source, Params: []Param{}}
		for _, p := range s.Params {
			ti.Params = append(ti.Params, Param{p.Name, p.Symbol, p.Default, p.Min, p.Max, p.Doc})
		}
		ts = append(ts, ti)
	}
	var ps []Preset
	for _, p := range terms.Presets() {
		pi := Preset{Name: p.Name, Title: p.Title, Source: p.Source, Families: p.Families, Mirror: p.Mirror, Dispersion: p.Dispersion, Example: p.Example}
		for _, t := range p.Terms {
			id := t.ID
			if t.Family > 0 {
				id = fmt.Sprintf("%s@f%d", t.ID, t.Family)
			}
			pi.Terms = append(pi.Terms, id)
		}
		ps = append(ps, pi)
	}
	return &Catalogue{Terms: ts, Presets: ps}
}

// Print writes the listing as text: a table of the shapes, what each
// weight means, the shapes that are not polyconvex, the presets and the
// arguments' definitions.
func (c *Catalogue) Print(w io.Writer) error {
	ts, ps := c.Terms, c.Presets
	fmt.Fprintln(w, "Energy terms (weights w carry the stress unit; Psi is the sum of the terms)")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "id\targument\tterm\tparameters\tpolyconvex")
	for _, t := range ts {
		var ps []string
		for _, p := range t.Params {
			ps = append(ps, fmt.Sprintf("%s=%s in [%g, %g], default %g", p.Name, p.Symbol, p.Min, p.Max, p.Default))
		}
		poly := "yes"
		if !t.Polyconvex {
			poly = "NO"
		}
		param := strings.Join(ps, "; ")
		if param == "" {
			param = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", t.ID, t.Argument, t.Formula, param, poly)
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintln(w, "What each weight means")
	for _, t := range ts {
		fmt.Fprintf(w, "  %-12s %s\n", t.ID, t.Weight)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Not polyconvex")
	for _, t := range ts {
		if !t.Polyconvex {
			fmt.Fprintf(w, "  %-12s %s\n", t.ID, t.Note)
		}
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Presets (classical models written with catalogue terms; @f1/@f2 marks a fibre family)")
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "name\tmodel\tterms\tfamilies")
	for _, p := range ps {
		fam := fmt.Sprint(p.Families)
		if p.Mirror {
			fam += " (mirror pair)"
		}
		if p.Dispersion {
			fam += ", dispersion"
		}
		fmt.Fprintf(tw, "%s\t%s (%s)\t%s\t%s\n", p.Name, p.Title, p.Source, strings.Join(p.Terms, " + "), fam)
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Arguments: I1-3, I2-3; E_f = kappa(I1-3) + (1-3 kappa)(I4-1), zero while I4 <= 1, with the fibre")
	fmt.Fprintln(w, "stretch lambda_f = sqrt(1 + E_f); K-1 with K = I5 - I1 I4 + I2; I5-1, zero while I4 <= 1;")
	fmt.Fprintln(w, "lambda_i: the principal stretches lambda1, lambda2 of the in-plane C and lambda3 = 1/(lambda1 lambda2),")
	fmt.Fprintln(w, "the term summing g(lambda_i) over all three;")
	fmt.Fprintln(w, "Q(E) = b1 E11^2 + b2 E22^2 + 2 b3 E11 E22 + b4 (E12^2 + E21^2) of the Green strain E = (C - 1)/2")
	fmt.Fprintln(w, "in the tester's axes (fung: a classical comparison, fitted as a preset, not a discovery candidate);")
	fmt.Fprintln(w, "fung-general adds 2 b5 E11 (E12 + E21) + 2 b6 E22 (E12 + E21), shear coupled to the normal strains.")
	fmt.Fprintln(w, "A family with a concentration b spreads its fibre terms over the plane (angular integration).")
	fmt.Fprintln(w, "Switches: the polyconvex 'yes' of the E_f terms holds on an aligned family (kappa = 0) and on a")
	fmt.Fprintln(w, "family spread in the plane; with kappa > 0 their energy and stress jump where I4 crosses 1 while")
	fmt.Fprintln(w, "I1 > 3, and i5-quad jumps where I4 crosses 1 on a sheared fibre (I5 > 1). cof-quad switches on K.")
	fmt.Fprintln(w, "See the README for conventions.")
	return nil
}
