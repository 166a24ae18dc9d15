package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/weft-tools/weft/aniso"
)

func ftoa(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

var componentNames = [...]string{"11", "22", "12", "21"}

// writeFitCSV writes one row per data point: protocol, source line,
// kinematics, and per measured component the measured and modelled stress,
// the residual and each term's contribution.
func writeFitCSV(w io.Writer, o *fitOutcome) error {
	p, m := o.prob, o.result.Model
	pred, err := aniso.Predict(p, m)
	if err != nil {
		return err
	}
	contrib, err := aniso.PointContributions(p, m)
	if err != nil {
		return err
	}
	kind, unit := o.spec.Kind.String(), o.spec.StressUnit
	labels := make([]string, len(m.Terms))
	for k, t := range m.Terms {
		labels[k] = t.Shape.ID
		if t.Family >= 0 {
			labels[k] += "@" + m.Families[t.Family].Name
		}
	}
	cw := csv.NewWriter(w)
	h := []string{"protocol", "line", "cycle", "F11", "F12", "F21", "F22"}
	for _, c := range p.Output.Components {
		n := kind + "_" + componentNames[c]
		h = append(h, fmt.Sprintf("measured_%s [%s]", n, unit), fmt.Sprintf("model_%s [%s]", n, unit), fmt.Sprintf("residual_%s [%s]", n, unit))
	}
	for _, c := range p.Output.Components {
		for k := range m.Terms {
			h = append(h, fmt.Sprintf("%s:%s_%s [%s]", labels[k], kind, componentNames[c], unit))
		}
	}
	cw.Write(h)
	nc := len(p.Output.Components)
	for i := 0; i < p.Data.Points(); i++ {
		r0 := i * nc
		pi := p.RowProtocol[r0]
		pt := o.spec.Protocols[pi].Points[p.RowPoint[r0]]
		F := pt.F
		row := []string{o.spec.Protocols[pi].Label, strconv.Itoa(pt.Line), strconv.Itoa(pt.Cycle), ftoa(F[0]), ftoa(F[1]), ftoa(F[2]), ftoa(F[3])}
		for j := range p.Output.Components {
			r := r0 + j
			row = append(row, ftoa(p.Measured[r]), ftoa(pred[r]), ftoa(pred[r]-p.Measured[r]))
		}
		for j := range p.Output.Components {
			for k := range m.Terms {
				row = append(row, ftoa(contrib[k][r0+j]))
			}
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

// writeSelectionCSV writes the Pareto front and the classical presets with
// their selection numbers and per-fold held-out errors.
func writeSelectionCSV(w io.Writer, o *fitOutcome) {
	d := o.disc
	cw := csv.NewWriter(w)
	h := []string{"set", "name", "layout", "spread", "terms", "size", "parameters", "loss", "aicc", "bic", "min_r2", "cv_error", "cv_stderr", "chosen"}
	for _, pi := range o.prob.Protocols {
		h = append(h, "cv_error_without_"+o.spec.Protocols[pi].Label)
	}
	cw.Write(h)
	emit := func(set string, c *aniso.Candidate, chosen bool) {
		r := c.Result
		var ts string
		for i, t := range r.Structure.Terms {
			if r.Weights[i] > 0 {
				if ts != "" {
					ts += " + "
				}
				ts += t.Label(r.Structure.Layout)
			}
		}
		minR2 := math.Inf(1)
		for _, m := range r.Metrics {
			if m.R2Defined {
				minR2 = math.Min(minR2, m.R2)
			}
		}
		row := []string{set, c.Name, c.Layout.String(), spreadName(r.Structure), ts, strconv.Itoa(c.Terms),
			strconv.Itoa(r.Complexity), ftoa(r.Loss), ftoa(r.AICc), ftoa(r.BIC), ftoa(minR2)}
		if c.CV != nil {
			row = append(row, ftoa(c.CV.Mean), ftoa(c.CV.StdErr))
		} else {
			row = append(row, "", "")
		}
		row = append(row, strconv.FormatBool(chosen))
		for f := range o.prob.Protocols {
			if c.CV != nil {
				row = append(row, ftoa(c.CV.Folds[f].Error))
			} else {
				row = append(row, "")
			}
		}
		cw.Write(row)
	}
	for i := range d.Pareto {
		emit("pareto", &d.Pareto[i], i == d.Chosen)
	}
	for i := range d.Presets {
		emit("preset", &d.Presets[i], false)
	}
	cw.Flush()
}

// spreadName says how a form's families spread: "in-plane" (a learned
// concentration), "kappa" (a learned dispersion κ) or "none".
func spreadName(st aniso.Structure) string {
	switch {
	case st.Planar:
		return "in-plane"
	case st.Dispersion:
		return "kappa"
	}
	return "none"
}
