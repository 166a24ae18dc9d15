package main

import (
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
)

// helpCautions is card.Cautions as one paragraph wrapped for --help: the
// help of weft and of every command whose output holds a model's numbers
// ends with it, so that the help repeats the outputs' wording instead of
// paraphrasing it.
var helpCautions = fe.WrapWords(strings.Join(card.Cautions, " "), 76)

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

` + helpCautions,
		SilenceUsage:  true,
		SilenceErrors: true,
		// The module version and version-control revision of this build
		// (Go build information), as the cards it writes record them.
		Version: versionText(),
	}
	root.SetVersionTemplate("weft {{.Version}}\n")
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return badInputf("%v (see '%s --help')", flagValueError(err), c.CommandPath())
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
	// After SetOut: cobra's completion scripts keep the writer they find.
	strictHelpAndCompletion(root)
	return root
}

// strictHelpAndCompletion makes cobra's generated help and completion
// commands treat an unknown topic or shell as bad input (exit 2). Left to
// cobra, 'weft completion tcsh' prints the completion help and 'weft help
// nosuch' an "Unknown help topic" line, both on standard output with exit
// 0, so a script could not tell that nothing it asked for was made.
func strictHelpAndCompletion(root *cobra.Command) {
	root.InitDefaultHelpCmd()
	root.InitDefaultCompletionCmd()
	for _, c := range root.Commands() {
		switch c.Name() {
		case "completion":
			var shells []string
			for _, sub := range c.Commands() {
				shells = append(shells, sub.Name())
			}
			c.Args = func(cmd *cobra.Command, args []string) error {
				if len(args) > 0 {
					return badInputf("completion: no shell %q; choose one of %s (see 'weft completion --help')", args[0], strings.Join(shells, ", "))
				}
				return nil
			}
			// A runnable command has its arguments checked; without
			// arguments it shows its help, as before.
			c.RunE = func(cmd *cobra.Command, args []string) error { return cmd.Help() }
		case "help":
			c.Args = func(cmd *cobra.Command, args []string) error {
				if len(args) == 0 {
					return nil
				}
				found, _, err := cmd.Root().Find(args)
				if err != nil || found == nil || found == cmd.Root() {
					return badInputf("help: no command %q; 'weft --help' lists the commands", strings.Join(args, " "))
				}
				return nil
			}
		}
	}
}
