package main

import (
	"github.com/weft-tools/weft/cmd/weft/internal/fe"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
)

// evaluateOptions are the options of weft evaluate.
type evaluateOptions struct {
	streams
	// model is the card, evaluated at the in-plane deformation F; json
	// prints the result as JSON.
	model      string
	F          [4]float64
	json       bool
	cardLimits card.Limits
}

func newEvaluateCmd(s *streams) *cobra.Command {
	o := &evaluateOptions{streams: *s}
	var fFlag, oldF, stretchFlag string
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "evaluate MODEL.json (--deformation F11,F12,F21,F22 | --stretch L1,L2)",
		Short: "Energy, stresses and the analytic tangent of a model card at one deformation",
		Long: `evaluate prints, at one in-plane deformation gradient, the invariants, the
strain energy, the Cauchy and nominal stress and the analytic in-plane tangent
of the plane-stress membrane.

The tangent is A[i][j] = dP_i/dF_j, P the nominal (first Piola-Kirchhoff)
stress, with F33 = 1/det F eliminated so that sigma33 = 0 holds at every F;
rows and columns in the order 11, 12, 21, 22. It is the Hessian of the
membrane energy W(F11, F12, F21, F22), so it is symmetric. Fibre and I5 terms
contribute only while their family is stretched (I4 > 1); exactly at I4 = 1
the tangent without them is printed.

--stretch L1,L2 is short for --deformation L1,0,0,L2. (--F is the former
name of --deformation and still works.)

` + helpCautions,
		Example: `  weft evaluate model.json --stretch 1.2,1.1
  weft evaluate model.json --deformation 1.1,0.05,0,0.95 --json`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			var F [4]float64
			if oldF != "" {
				if fFlag != "" {
					return badInputf("give --deformation once (--F is its former name)")
				}
				fFlag = oldF
			}
			switch {
			case fFlag != "" && stretchFlag != "":
				return badInputf("give either --deformation or --stretch, not both")
			case fFlag != "":
				v, err := parseNumbers("deformation", fFlag, 4)
				if err != nil {
					return err
				}
				copy(F[:], v)
			case stretchFlag != "":
				v, err := parseNumbers("stretch", stretchFlag, 2)
				if err != nil {
					return err
				}
				F = [4]float64{v[0], 0, 0, v[1]}
			default:
				return badInputf("give the deformation with --deformation F11,F12,F21,F22 or --stretch L1,L2")
			}
			if det := F[0]*F[3] - F[1]*F[2]; !(det > 0) {
				return badInputf("det F = F11·F22 − F12·F21 = %g ≤ 0 would invert the material", det)
			}
			var err error
			if _, o.cardLimits, err = limits.parse(); err != nil {
				return err
			}
			o.model, o.F = args[0], F
			return runEvaluate(o)
		},
	}
	cmd.Flags().StringVar(&fFlag, "deformation", "", "in-plane deformation gradient F11,F12,F21,F22")
	// --F is the flag's former name, kept so that scripts still run.
	cmd.Flags().StringVar(&oldF, "F", "", "former name of --deformation")
	cmd.Flags().MarkHidden("F")
	cmd.Flags().StringVar(&stretchFlag, "stretch", "", "pure biaxial stretch L1,L2 (F12 = F21 = 0)")
	cmd.Flags().BoolVar(&o.json, "json", false, "print the result as JSON")
	limits = addLimitFlag(cmd)
	return cmd
}

// runEvaluate evaluates the card at o.F and prints the result.
func runEvaluate(o *evaluateOptions) error {
	c, m, dr, err := readCardWithRange(o.model, o.cardLimits)
	if err != nil {
		return err
	}
	res, err := fe.Evaluate(o.model, c, m, o.F, dr)
	if err != nil {
		return cardError(err)
	}
	if o.json {
		return writeJSON(o.Out, res)
	}
	fe.PrintEvaluation(o.Out, res)
	return nil
}
