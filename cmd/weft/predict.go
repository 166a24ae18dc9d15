package main

import (
	"bytes"
	"errors"
	"fmt"
	"path/filepath"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
	"github.com/weft-tools/weft/cmd/weft/internal/prediction"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// predictOptions are the options of weft predict.
type predictOptions struct {
	streams
	// model is the card, kinematics the CSV of deformations; out is the
	// output file ("" or "-": standard output).
	model, kinematics, out string
	force                  bool
	dataLimits             biaxial.Limits
	cardLimits             card.Limits
}

func newPredictCmd(s *streams) *cobra.Command {
	o := &predictOptions{streams: *s}
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "predict MODEL.json KINEMATICS.csv",
		Short: "Evaluate a model card on a path of stretches or deformation gradients",
		Long: `predict reads a model card and a CSV of in-plane deformations and writes the
same rows with the Cauchy and nominal stresses of the model appended.

The CSV needs either the columns stretch_1, stretch_2 (pure biaxial stretch)
or F11, F12, F21, F22 (any in-plane deformation gradient). Header names are
case-insensitive; a unit in square brackets after a name is allowed. Every
other column (protocol, time, ...) passes through unchanged. Lines starting
with '#' are comments.

Appended columns, each with the card's stress unit in brackets:
  cauchy_11, cauchy_22, cauchy_12, nominal_11, nominal_22, nominal_12, nominal_21
Nominal stress is first Piola-Kirchhoff, P = sigma F^-T, so nominal_12 is the
force along axis 1 per reference area normal to axis 2. The output starts
with '#' lines: the card's cautions and how many rows leave its fitted data
range.

For a card written by discovery, alike_low_<column> and alike_high_<column>
follow: the lowest and highest stress of the card's model and of every
other candidate that predicted the held-out protocols as well (held-out
error within one standard error of the chosen model's). Where they part,
the tested protocols do not settle the prediction.

` + helpCautions,
		Example: `  weft predict model.json path.csv
  weft predict skin-A-hgo/model.json testdata/example/stretch-path.csv -o stresses.csv`,
		Args: exactArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			var err error
			if o.dataLimits, o.cardLimits, err = limits.parse(); err != nil {
				return err
			}
			o.model, o.kinematics = args[0], args[1]
			return runPredict(o)
		},
	}
	cmd.Flags().StringVarP(&o.out, "output", "o", "", "write the CSV to this file instead of standard output")
	cmd.Flags().BoolVar(&o.force, "force", false, "overwrite the output file if it exists")
	limits = addLimitFlag(cmd)
	return cmd
}

// runPredict evaluates the card on every row of the kinematics file and
// writes the rows with the stresses appended.
func runPredict(o *predictOptions) error {
	res, err := safeout.OpenResult(o.Out, o.out, o.force, o.model, o.kinematics)
	if err != nil {
		return outputError(err)
	}
	defer res.Close()
	c, m, dr, err := readCardWithRange(o.model, o.cardLimits)
	if err != nil {
		return err
	}
	data, err := readKinematics(o.kinematics, o.dataLimits)
	if err != nil {
		return err
	}
	// The rows hold the card's own model; where the layout is
	// undetermined the alternatives would give other shear stresses. The
	// CSV says so in its comment lines too, so that a copy passed on keeps
	// it.
	lw, err := fe.LayoutWarning(c, m)
	if err != nil {
		return badInputf("%s: %v", o.model, err)
	}
	var warnings []string
	if lw != "" {
		warnings = append(warnings, fmt.Sprintf("the stresses are the card's own model's; %s ('weft export %s' lists every alternative's stresses at its verification rows)", lw, filepath.Base(o.model)))
	}
	alike, err := c.AlikeModels()
	if err != nil {
		return badInputf("%s: %v", o.model, err)
	}
	var buf bytes.Buffer
	outside, rows, err := prediction.Write(bytes.NewReader(data), o.kinematics, c, m, dr, warnings, alike, &buf)
	var ie *prediction.InputError
	if errors.As(err, &ie) {
		return badInput(err)
	}
	if err != nil {
		return err
	}
	if outside > 0 {
		fmt.Fprintf(o.ErrOut, "weft: warning: %s: %s\n", o.model, prediction.OutsideRowsText(outside, rows))
	}
	if lw != "" {
		fmt.Fprintf(o.ErrOut, "weft: warning: %s: the stresses are the card's own model's; %s ('weft export %s' lists every alternative's stresses at its verification rows)\n", o.model, lw, o.model)
	}
	return outputError(res.Write(buf.Bytes()))
}

// readKinematics reads predict's CSV whole, within the file size limit.
func readKinematics(path string, lim biaxial.Limits) ([]byte, error) {
	max := lim.MaxBytes
	if max <= 0 {
		max = biaxial.DefaultLimits.MaxBytes
	}
	b, err := readAtMost(path, max)
	if errors.Is(err, errTooLarge) {
		return nil, tooLargeError(path, max, biaxial.ErrFileSize)
	}
	if err != nil {
		return nil, badInputf("%s: cannot read the file (%s) — check the path and permissions", path, safeout.Reason(err))
	}
	return b, nil
}
