package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/weft-tools/weft/cmd/weft/internal/demo"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"

	"github.com/spf13/cobra"
)

// demoOptions are the options of weft demo: the folder to write into and
// whether existing files may be replaced.
type demoOptions struct {
	streams
	dir   string
	force bool
}

func newDemoCmd(s *streams) *cobra.Command {
	o := &demoOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "demo [DIR]",
		Short: "Write the bundled synthetic demo specimens",
		Long: `demo writes three SYNTHETIC specimen files from an invented bench study of
engineered tissue constructs (a collagen membrane tested in the load layout,
the same membrane on sutures with marker-tracked shear, and a skin-substitute
patch in the stress layout), generated from known parameters with noise,
three cycles with hysteresis and a preload, plus a README listing the true
parameters. Every weft command can be tried on them. DIR defaults to
weft-demo. Existing files are not overwritten without --force.`,
		Example: `  weft demo
  weft fit weft-demo/membrane-M1.csv
  weft inspect weft-demo/*.csv`,
		Args: func(cmd *cobra.Command, args []string) error {
			if len(args) > 1 {
				return badInputf("demo takes at most one DIR, got %d; see 'weft demo --help'", len(args))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			o.dir = "weft-demo"
			if len(args) == 1 {
				o.dir = args[0]
			}
			return runDemo(o)
		},
	}
	cmd.Flags().BoolVar(&o.force, "force", false, "overwrite existing demo files")
	return cmd
}

// runDemo writes the demo files into o.dir, checking every output before
// it writes any.
func runDemo(o *demoOptions) error {
	dir := o.dir
	files, names, err := demo.Files()
	if err != nil {
		return err
	}
	if err := safeout.EnsureFolder(dir); err != nil {
		return outputError(err)
	}
	outs := make([]*safeout.File, len(names))
	defer func() {
		for _, f := range outs {
			f.Close()
		}
	}()
	for i, n := range names {
		p := filepath.Join(dir, n)
		if outs[i], err = safeout.PrepareFile(p, o.force, false); err != nil {
			return outputError(err)
		}
		if err := demoFileOrAbsent(p, files[n]); err != nil {
			return err
		}
	}
	for i, n := range names {
		if err := outs[i].Commit(files[n]); err != nil {
			return outputError(err)
		}
		fmt.Fprintf(o.Out, "wrote %s\n", filepath.Join(dir, n))
	}
	return nil
}

// demoFileOrAbsent refuses to let --force replace a file at path that no
// 'weft demo' wrote: one whose first line is not the first line of the
// demo file data ("# specimen = NAME" of a specimen, "# weft demo data
// (SYNTHETIC)" of the README, the same in every version so far). Without
// it, 'weft demo . --force' in a project replaced the project's own
// README.md.
func demoFileOrAbsent(path string, data []byte) error {
	f, err := os.Open(path)
	if err != nil {
		return nil // absent; PrepareFile has examined what is there
	}
	defer f.Close()
	want, _, _ := bytes.Cut(data, []byte("\n"))
	got := make([]byte, len(want)+1)
	n, _ := io.ReadFull(f, got)
	if n == len(got) && bytes.Equal(got[:len(want)], want) && (got[len(want)] == '\n' || got[len(want)] == '\r') {
		return nil
	}
	return badInputf("%s exists and was not written by 'weft demo' (its first line is not %q); --force replaces only demo files — move it or write the demo into another folder: weft demo DIR", path, want)
}
