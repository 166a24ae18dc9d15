package main

import (
	"github.com/weft-tools/weft/cmd/weft/internal/inspect"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/biaxial"
)

// inspectOptions are the options of weft inspect.
type inspectOptions struct {
	streams
	// files are read as read says; json prints JSON, with every kept point
	// when points is set.
	files        []string
	read         biaxial.Options
	json, points bool
}

func newInspectCmd(s *streams) *cobra.Command {
	o := &inspectOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "inspect FILE...",
		Short: "Read biaxial test files and summarise what weft will fit",
		Long: `inspect reads one or more planar biaxial test files (CSV or xlsx, one
specimen per file) exactly as 'weft fit' would, and prints for every
specimen and protocol: the points kept, the stretch range on both axes, the
stress measure, unit and range, the cycles found and the branch kept, the
weights, and any warnings and notices.

Nothing is printed unless every file reads cleanly: a file that cannot be
used stops the command with exit code 2 and a message naming the file, line
and column (sheet and cell for xlsx) and what to fix.`,
		Example: `  # summarise two specimens
  weft inspect synthetic-a.csv synthetic-b.csv

  # the unloading branch of the second cycle, as JSON
  weft inspect --cycle 2 --branch unloading --json synthetic-a.csv

  # a workbook sheet, re-referenced to the preload, 50 points per protocol
  weft inspect --sheet specimen-3 --rereference --resample 50 tests.xlsx`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return badInputf("inspect needs at least one FILE (see 'weft inspect --help')")
			}
			return nil
		},
	}
	rf := addReadFlags(cmd)
	cmd.Flags().BoolVar(&o.json, "json", false, "print the summary as JSON instead of a table")
	cmd.Flags().BoolVar(&o.points, "points", false, "with --json, include every kept point")
	cmd.RunE = func(cmd *cobra.Command, args []string) error {
		var err error
		if o.read, err = rf.options(); err != nil {
			return err
		}
		o.files = args
		return runInspect(o)
	}
	return cmd
}

// runInspect reads every file and prints the summary; nothing is printed
// unless every file reads cleanly.
func runInspect(o *inspectOptions) error {
	specs := make([]*biaxial.Specimen, 0, len(o.files))
	for _, path := range o.files {
		s, err := readSpecimen(path, o.read)
		if err != nil {
			return err
		}
		specs = append(specs, s)
	}
	if o.json {
		return writeJSON(o.Out, inspect.NewDocument(specs, o.points))
	}
	return inspect.WriteText(o.Out, specs)
}
