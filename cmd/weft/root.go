package main

import (
	"github.com/spf13/cobra"
)

// newRootCmd builds the command tree; every subcommand writes to s.
func newRootCmd(s *streams) *cobra.Command {
	root := &cobra.Command{
		Use:   "weft",
		Short: "Discover fibre-reinforced hyperelastic models from planar biaxial tests",
		Long: `weft reads planar biaxial test files of thin soft tissue, finds which
strain-energy terms and how many fibre families the data support, learns the
fibre angles, and writes a model card with parameters an FE analyst can verify.

Exit codes: 0 success; 1 the run failed (a check failed, a fit did not
succeed, an output could not be written, or the run was interrupted); 2 bad
input (nothing written).

Parameters are research-grade and specimen-specific, valid only within the
tested range, and not for clinical decisions; follow the regulations,
standards and licensed professional practice that apply.`,
		SilenceUsage:  true,
		SilenceErrors: true,
		// The module version and version-control revision of this build
		// (Go build information), as the cards it writes record them.
		Version: versionText(),
	}
	root.SetVersionTemplate("weft {{.Version}}\n")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return badInputf("%v (see '%s --help')", err, c.CommandPath())
	})
	root.AddCommand(
		newFitCmd(s),
		newCohortCmd(s),
		newReportCmd(s),
		newInspectCmd(s),
		newDemoCmd(s),
		newPredictCmd(s),
		newExportCmd(s),
		newCheckCmd(s),
		newEvaluateCmd(s),
		newTermsCmd(s),
		newPlanCmd(s),
	)
	root.SetIn(s.In)
	root.SetOut(s.Out)
	root.SetErr(s.ErrOut)
	return root
}
