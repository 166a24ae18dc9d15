package main

import (
	"github.com/spf13/cobra"
	"github.com/weft-tools/weft/cmd/weft/internal/catalogue"
)

// termsOptions are the options of weft terms.
type termsOptions struct {
	streams
	json bool
}

func newTermsCmd(s *streams) *cobra.Command {
	o := &termsOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "terms",
		Short: "List the catalogue of energy terms and the classical presets",
		Long: `terms lists every strain-energy shape weft can use: its id (as written in
model cards and --terms), the shifted invariant it acts on, its formula, its
non-linear parameters with bounds and defaults, what its weight means, and
whether it keeps the energy polyconvex. Then the classical models available
as presets (--preset), written with these terms.`,
		Example: `  weft terms
  weft terms --json | jq '.terms[] | select(.polyconvex | not) | .id'`,
		Args: exactArgs(0),
		RunE: func(cmd *cobra.Command, args []string) error { return runTerms(o) },
	}
	cmd.Flags().BoolVar(&o.json, "json", false, "print the catalogue as JSON")
	return cmd
}

// runTerms prints the catalogue and the presets.
func runTerms(o *termsOptions) error {
	c := catalogue.New()
	if o.json {
		return writeJSON(o.Out, c)
	}
	return c.Print(o.Out)
}
