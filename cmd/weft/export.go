package main

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
)

// exportOptions are the options of weft export.
type exportOptions struct {
	streams
	// model is the card; format one of table, csv, json, latex, ufl; out
	// the output file ("" or "-": standard output); schema prints the card
	// schema instead; alternative chooses one of the card's alternatives
	// (name or number; "" for all).
	model, format, out, alternative string
	force, schema                   bool
	// limits are the --limit values, read only when a card is read (nil:
	// the default limits), so that they cannot stop --schema.
	limits *limitFlags
}

func newExportCmd(s *streams) *cobra.Command {
	o := &exportOptions{streams: *s}
	cmd := &cobra.Command{
		Use:   "export MODEL.json [--format table|csv|json|latex|ufl] [--alternative NAME] [-o FILE] | export --schema",
		Short: "Parameters, energy, a stress verification table and a UFL energy of a model card for FE use",
		Long: `export writes what an FE analyst needs to re-implement a model card and
verify it point by point:

  - the parameter table: every term with its family, fibre angle, dispersion,
    weight (with its unit) and non-linear parameters;
  - the energy written out, in plain text and LaTeX, and the conventions;
  - a verification table: the energy, the Cauchy, nominal and second
    Piola-Kirchhoff stress of the model under uniaxial loading (lateral edges
    free), equibiaxial stretch, strip-biaxial stretch (lateral stretch held
    at 1) at stretches 0.90 and 0.95 (compression) and 1.05 to 1.30, and
    simple shear 0.05 to 0.30, in steps of 0.05: along axis 1, axis 2 and
    each fibre direction (simple shear along the axes and 45 deg either side
    of each fibre, never along one);
  - how to use the card in a three-dimensional, nearly incompressible code
    (a volumetric-isochoric split with a bulk modulus you choose).

A load direction theta turns the load-frame gradient F_local into
F = R(theta) F_local R(theta)^T. In uniaxial rows the free lateral stretch
is the one connected continuously to the unloaded state (continuation from
lambda = 1, Newton's method on the analytic tangent safeguarded by
bisection), so that the lateral Cauchy stress in the load frame is zero to
round-off; the load-frame shear stress is not imposed. sigma33 = 0 in every
row. Rows an independent implementation may reproduce differently are
flagged: a fibre family on its switch (|I4 - 1| or |K - 1| below 1e-6), or a
lateral stretch that is not unique (no lateral stiffness).

When the data do not determine the fibre layout (no shear information), the
card lists its alternatives (one family at +alpha, one at -alpha, a mirror
pair at +-alpha with half the weights, ...): export shows the parameters and
the verification rows of every one, or of the one --alternative names.

--format csv and json carry every number at full double precision; table
and latex round to 6 significant digits. The CSV stress columns are named as
'weft predict' names them, with the card's stress unit. --format ufl writes a
Python module for FEniCS: psi(F, bulk_modulus=None, model=...) returns the
card's strain energy as a UFL expression of a 3x3 F, with the switches,
dispersion and every number of the card, for automatic differentiation.

export --schema prints the JSON Schema (draft 2020-12) of model cards.

` + helpCautions,
		Example: `  weft export model.json
  weft export model.json --format csv -o verify.csv
  weft export model.json --format latex -o params.tex
  weft export model.json --format ufl -o model_energy.py
  weft export model.json --alternative mirror-pair --format csv
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
	cmd.Flags().StringVar(&o.format, "format", "table", "output format: table, csv, json, latex or ufl (a Python module for FEniCS)")
	cmd.Flags().StringVar(&o.alternative, "alternative", "", "show only this one of the card's alternative fibre layouts (its name, e.g. mirror-pair, or number); default all")
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
	case "table", "csv", "json", "latex", "ufl":
	default:
		return badInputf("--format %q: use table, csv, json, latex or ufl", o.format)
	}
	if o.schema && o.alternative != "" {
		return badInputf("--alternative applies to a card, not to --schema")
	}
	var inputs []string
	if !o.schema {
		inputs = append(inputs, o.model)
	}
	res, err := safeout.OpenResult(o.Out, o.out, o.force, inputs...)
	if err != nil {
		return outputError(err)
	}
	defer res.Close()
	if o.schema {
		return outputError(res.Write(card.Schema()))
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
	doc, err := fe.BuildExport(o.model, c, m, dr, fe.ExportOptions{Alternative: o.alternative})
	if err != nil {
		if o.alternative != "" {
			err = fmt.Errorf("--alternative: %w", err)
		}
		return cardError(err)
	}
	for _, wn := range doc.Warnings {
		if strings.HasPrefix(wn, "the model has no matrix term") {
			fmt.Fprintf(o.ErrOut, "weft: warning: %s: %s; 'weft check' fails such a card; refit with a matrix term (e.g. 'weft fit DATA --terms i1-lin,fib-expsq')\n", o.model, wn)
		}
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
	case "ufl":
		err = fe.WriteExportUFL(&buf, doc, m)
	}
	if err != nil {
		return err
	}
	return outputError(res.Write(buf.Bytes()))
}
