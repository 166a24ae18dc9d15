package main

import (
	"bytes"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
)

// exportOptions are the options of weft export.
type exportOptions struct {
	streams
	// model is the card; format one of table, csv, json, latex; out the
	// output file ("" or "-": standard output); schema prints the card
	// schema instead.
	model, format, out string
	force, schema      bool
	// limits are the --limit values, read only when a card is read (nil:
	// the default limits), so that they cannot stop --schema.
	limits *limitFlags
}

func newExportCmd(s *streams) *cobra.Command {
	o := &exportOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "export MODEL.json [--format table|csv|json|latex] [-o FILE] | export --schema",
		Short: "Parameters, energy and a stress verification table of a model card for FE use",
		Long: `export writes what an FE analyst needs to re-implement a model card and
verify it point by point:

  - the parameter table: every term with its family, fibre angle, dispersion,
    weight (with its unit) and non-linear parameters;
  - the energy written out, in plain text and LaTeX, and the conventions;
  - a verification table: the Cauchy and nominal stress of the model under
    uniaxial tension (lateral edges free), equibiaxial stretch, strip-biaxial
    stretch (lateral stretch held at 1) and simple shear, at stretches 1.05 to
    1.30 (shear 0.05 to 0.30) in steps of 0.05, along axis 1, axis 2 and each
    fibre direction.

A load direction theta turns the load-frame gradient F_local into
F = R(theta) F_local R(theta)^T. In uniaxial rows the free lateral stretch is
solved (Newton's method on the analytic tangent, safeguarded by bisection) so
that the lateral Cauchy stress in the load frame is zero to round-off; the
load-frame shear stress is not imposed. sigma33 = 0 in every row. Equibiaxial
stretch is the same in every direction and is listed once.

--format csv and json carry every number at full double precision; table
and latex round to 6 significant digits. The CSV stress columns are named as
'weft predict' names them, with the card's stress unit.

export --schema prints the JSON Schema (draft 2020-12) of model cards.`,
		Example: `  weft export model.json
  weft export model.json --format csv -o verify.csv
  weft export model.json --format latex -o params.tex
  weft export --schema > model.schema.json`,
		Args: func(cmd *cobra.Command, args []string) error {
			if o.schema {
				return exactArgs(0)(cmd, args)
			}
			return exactArgs(1)(cmd, args)
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 1 {
				o.model = args[0]
			}
			return runExport(o)
		},
	}
	cmd.Flags().StringVar(&o.format, "format", "table", "output format: table, csv, json or latex")
	cmd.Flags().StringVarP(&o.out, "output", "o", "", "write to this file instead of standard output")
	cmd.Flags().BoolVar(&o.force, "force", false, "overwrite the output file if it exists")
	cmd.Flags().BoolVar(&o.schema, "schema", false, "print the JSON Schema of model cards instead")
	o.limits = addLimitFlag(cmd)
	return cmd
}

// runExport writes the parameter and verification tables of the card, or
// the card schema.
func runExport(o *exportOptions) error {
	switch o.format {
	case "table", "csv", "json", "latex":
	default:
		return badInputf("--format %q: use table, csv, json or latex", o.format)
	}
	res, err := openResult(o.Out, o.out, o.force)
	if err != nil {
		return err
	}
	defer res.close()
	if o.schema {
		return res.write(card.Schema())
	}
	var cl card.Limits
	if o.limits != nil {
		if _, cl, err = o.limits.parse(); err != nil {
			return err
		}
	}
	c, m, dr, err := readCardWithRange(o.model, cl)
	if err != nil {
		return err
	}
	doc, err := fe.BuildExport(o.model, c, m, dr)
	if err != nil {
		return cardError(err)
	}
	var buf bytes.Buffer
	switch o.format {
	case "table":
		fe.WriteExportTable(&buf, doc)
	case "csv":
		err = fe.WriteExportCSV(&buf, doc)
	case "json":
		err = writeJSON(&buf, doc)
	case "latex":
		fe.WriteExportLaTeX(&buf, doc)
	}
	if err != nil {
		return err
	}
	return res.write(buf.Bytes())
}
