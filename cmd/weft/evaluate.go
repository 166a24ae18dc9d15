package main

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// tangentOrder is the component order of the tangent's rows (nominal
// stress) and columns (deformation gradient).
var tangentOrder = []string{"11", "12", "21", "22"}

// evalFamily is one family's fibre quantities in evaluate's JSON.
type evalFamily struct {
	Name         string  `json:"name"`
	AngleDeg     float64 `json:"angle_deg"`
	I4           float64 `json:"I4"`
	I5           float64 `json:"I5"`
	K            float64 `json:"K"`
	FibreStretch float64 `json:"fibre_stretch"`
	Engaged      bool    `json:"fibre_terms_engaged"`
}

// evalResult is evaluate's JSON output.
type evalResult struct {
	Model      string             `json:"model"`
	StressUnit string             `json:"stress_unit"`
	F          map[string]float64 `json:"F"`
	F33        float64            `json:"F33"`
	I1         float64            `json:"I1"`
	I2         float64            `json:"I2"`
	Families   []evalFamily       `json:"families"`
	Energy     float64            `json:"energy"`
	EnergyNote string             `json:"energy_unit"`
	Cauchy     map[string]float64 `json:"cauchy"`
	Nominal    map[string]float64 `json:"nominal"`
	Tangent    struct {
		Order   []string      `json:"order"`
		Meaning string        `json:"meaning"`
		Matrix  [4][4]float64 `json:"matrix"`
		Unit    string        `json:"unit"`
	} `json:"tangent"`
	Warnings []string `json:"warnings"`
	Notices  []string `json:"notices"`
	Cautions []string `json:"cautions"`
}

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
	var fFlag, stretchFlag string
	var limits *limitFlags
	cmd := &cobra.Command{
		Use:   "evaluate MODEL.json (--F F11,F12,F21,F22 | --stretch L1,L2)",
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

--stretch L1,L2 is short for --F L1,0,0,L2.`,
		Example: `  weft evaluate model.json --stretch 1.2,1.1
  weft evaluate model.json --F 1.1,0.05,0,0.95 --json`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			var F [4]float64
			switch {
			case fFlag != "" && stretchFlag != "":
				return badInputf("give either --F or --stretch, not both")
			case fFlag != "":
				v, err := parseNumbers("F", fFlag, 4)
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
				return badInputf("give the deformation with --F F11,F12,F21,F22 or --stretch L1,L2")
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
	cmd.Flags().StringVar(&fFlag, "F", "", "in-plane deformation gradient F11,F12,F21,F22")
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
	res, err := evaluateAt(o.model, c, m, o.F, dr)
	if err != nil {
		return err
	}
	if o.json {
		return writeJSON(o.Out, res)
	}
	printEvaluation(o.Out, res)
	return nil
}

// evaluateAt computes everything evaluate reports.
func evaluateAt(file string, c *card.Card, m *aniso.Model, F [4]float64, dr *card.DataRange) (*evalResult, error) {
	r, err := m.Evaluate(F)
	if err != nil {
		return nil, badInputf("%s at F = %s: %v", file, fmtF(F), err)
	}
	tg, err := m.Tangent(F)
	if err != nil {
		return nil, badInputf("%s at F = %s: %v", file, fmtF(F), err)
	}
	k, _ := aniso.NewKinematics(F)
	res := &evalResult{Model: filepath.Base(file), StressUnit: c.StressUnit, F33: 1 / k.J2, I1: k.I1, I2: k.I2,
		Energy: r.Energy, EnergyNote: c.StressUnit + " (energy per unit reference volume)",
		F:        map[string]float64{"11": F[0], "12": F[1], "21": F[2], "22": F[3]},
		Cauchy:   map[string]float64{"11": r.Cauchy[0], "22": r.Cauchy[1], "12": r.Cauchy[2]},
		Nominal:  map[string]float64{"11": r.Nominal[0], "22": r.Nominal[1], "12": r.Nominal[2], "21": r.Nominal[3]},
		Families: []evalFamily{}, Warnings: []string{}, Notices: []string{}, Cautions: card.Cautions}
	names := familyNames(m)
	for i, f := range m.Families {
		fk := k.Fibre(f.Angle)
		res.Families = append(res.Families, evalFamily{Name: names[i], AngleDeg: aniso.WrapDeg(aniso.Deg(f.Angle)),
			I4: fk.I4, I5: fk.I5, K: fk.K, FibreStretch: math.Sqrt(fk.I4), Engaged: fk.I4 > 1})
	}
	res.Tangent.Order = tangentOrder
	res.Tangent.Meaning = "matrix[i][j] = d nominal_i / d F_j with F33 = 1/det F eliminated (plane stress); symmetric"
	res.Tangent.Matrix = tg.A
	res.Tangent.Unit = c.StressUnit
	if dr == nil {
		res.Notices = append(res.Notices, noRangeNotice)
	} else if out := outsideRange(dr, m, F); len(out) > 0 {
		res.Warnings = append(res.Warnings, "this deformation extrapolates beyond the fitted data range: "+joinSemi(out))
	}
	return res, nil
}

func joinSemi(s []string) string { return strings.Join(s, "; ") }

func printEvaluation(w io.Writer, r *evalResult) {
	u := r.StressUnit
	fmt.Fprintf(w, "Model %s, stresses in %s\n\n", r.Model, u)
	fmt.Fprintf(w, "F   = [[%.10g, %.10g], [%.10g, %.10g]], F33 = %.10g (incompressible)\n", r.F["11"], r.F["12"], r.F["21"], r.F["22"], r.F33)
	fmt.Fprintf(w, "I1  = %.10g, I2 = %.10g\n", r.I1, r.I2)
	for _, f := range r.Families {
		state := "slack (I4 <= 1: fibre and I5 terms off)"
		if f.Engaged {
			state = "stretched"
		}
		fmt.Fprintf(w, "family %s at %g deg: I4 = %.10g, I5 = %.10g, K = %.10g, fibre stretch %.10g, %s\n", f.Name, f.AngleDeg, f.I4, f.I5, f.K, f.FibreStretch, state)
	}
	fmt.Fprintf(w, "\nenergy W = %.10g %s (per unit reference volume)\n\n", r.Energy, u)
	fmt.Fprintf(w, "Cauchy stress [%s]:  sigma11 = %.10g  sigma22 = %.10g  sigma12 = %.10g  (sigma33 = 0)\n", u, r.Cauchy["11"], r.Cauchy["22"], r.Cauchy["12"])
	fmt.Fprintf(w, "Nominal stress P = sigma F^-T [%s]:  P11 = %.10g  P12 = %.10g  P21 = %.10g  P22 = %.10g\n\n", u, r.Nominal["11"], r.Nominal["12"], r.Nominal["21"], r.Nominal["22"])
	fmt.Fprintf(w, "Tangent dP/dF [%s], plane stress, F33 eliminated (symmetric):\n", u)
	fmt.Fprintf(w, "  %-8s %16s %16s %16s %16s\n", "", "dF11", "dF12", "dF21", "dF22")
	for i, row := range r.Tangent.Matrix {
		fmt.Fprintf(w, "  %-8s %16.10g %16.10g %16.10g %16.10g\n", "dP"+tangentOrder[i], row[0], row[1], row[2], row[3])
	}
	for _, s := range r.Warnings {
		fmt.Fprintln(w, "\nWARNING: "+s)
	}
	for _, s := range r.Notices {
		fmt.Fprintln(w, "\nNotice: "+s)
	}
	fmt.Fprintln(w)
	printCautions(w)
}
