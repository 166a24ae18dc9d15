package main

import (
	"fmt"
	"strings"

	"github.com/weft-tools/weft/cmd/weft/internal/fe"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// checkOptions are the options of weft check.
type checkOptions struct {
	streams
	// model is the card, checked on grid; json prints the report as JSON.
	model      string
	grid       aniso.StabilityGrid
	json       bool
	cardLimits card.Limits
}

func newCheckCmd(s *streams) *cobra.Command {
	o := &checkOptions{streams: *s}
	var rangeFlag string
	var steps, directions int
	var shear float64
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "check MODEL.json [--range 0.7,1.6] [--shear 0.3] [--json]",
		Short: "Check that a model card is admissible: stress-free reference, stability, ellipticity, moduli",
		Long: `check tests a model card for use in finite-element analysis:

  1. stress-free reference: |sigma| at F = I at most 1e-9 times the sum of the
     weights (a Fung-type term counted with its modulus c max(b), not c; the
     eigenvalue tolerance below is 1e-10 times the same sum);
  2. polyconvexity: which terms keep the energy polyconvex and which do not
     (reported, not failed); for the Fung-type term (Tong & Fung 1976) its
     convexity condition b1 > 0, b2 > 0, b1 b2 > b3^2 and, when the grid
     shears (--shear > 0), b4 > 0 (reported, not failed);
  3. material stability on a grid: every pure stretch (lambda1, lambda2) with
     both stretches in --range (default 0.7 to 1.6, --steps per axis), each
     also with a simple shear F12 or F21 of +-shear and +-shear/2. Criterion:
     the in-plane tangent of the plane-stress membrane, A = dP/dF with F33
     eliminated (a symmetric 4x4 matrix, tested whole), must be positive
     definite on the increments orthogonal to a rigid rotation. Along the
     rotation itself the tangent carries sigma11 + sigma22 for every material,
     so it is indefinite wherever the membrane is compressed enough; that
     count is reported separately and does not fail;
  4. strong ellipticity (Legendre-Hadamard) on the same grid, b sampled over
     --directions directions, a exact;
  5. small-strain moduli at F = I: the initial shear modulus, the in-plane
     shear modulus and uniaxial moduli along the axes and each fibre, in
     tension and compression (fibre terms engage on one side only);
  6. the fitted data range (card key data_range), with a warning where the
     grid extrapolates beyond it.

Exit code 1 when a check fails, naming the failing point; 0 when all pass;
2 on bad input. Grid points where the energy is not finite (beyond a limiting
extensibility, or an exponential overflow) are counted and warned about.

` + helpCautions,
		Example: `  weft check model.json
  weft check model.json --range 0.9,1.3 --json`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			r, err := parseNumbers("range", rangeFlag, 2)
			if err != nil {
				return err
			}
			g := aniso.StabilityGrid{StretchMin: r[0], StretchMax: r[1], Steps: steps, ShearMax: shear, Directions: directions}
			if err := g.Validate(); err != nil {
				return badInputf("%v", err)
			}
			if _, o.cardLimits, err = limits.parse(); err != nil {
				return err
			}
			o.model, o.grid = args[0], g
			return runCheck(o)
		},
	}
	d := aniso.DefaultStabilityGrid()
	cmd.Flags().StringVar(&rangeFlag, "range", fmt.Sprintf("%g,%g", d.StretchMin, d.StretchMax), "stretch range MIN,MAX of both axes")
	cmd.Flags().IntVar(&steps, "steps", d.Steps, "stretches per axis, ends included")
	cmd.Flags().Float64Var(&shear, "shear", d.ShearMax, "largest simple shear added to each stretch (0: none)")
	cmd.Flags().IntVar(&directions, "directions", d.Directions, "directions sampled for strong ellipticity")
	cmd.Flags().BoolVar(&o.json, "json", false, "print the report as JSON")
	limits = addLimitFlag(cmd)
	return cmd
}

// runCheck checks the card and prints the report; a failed check is an
// error (exit code 1) after the report is printed.
func runCheck(o *checkOptions) error {
	c, m, dr, err := readCardWithRange(o.model, o.cardLimits)
	if err != nil {
		return err
	}
	rep, err := fe.CheckCard(o.model, c, m, o.grid, dr)
	if err != nil {
		return cardError(err)
	}
	if o.json {
		if err := writeJSON(o.Out, rep); err != nil {
			return err
		}
	} else {
		fe.PrintCheck(o.Out, rep)
	}
	if !rep.Passed {
		return checkFailed{msg: "check failed: " + strings.Join(rep.Failures, "; ")}
	}
	return nil
}
