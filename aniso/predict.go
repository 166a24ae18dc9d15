package aniso

import (
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// Predict returns the model's stress on every row of p, unweighted, in the
// problem's stress measure and unit (for metrics, held-out protocols and
// fit tables).
func Predict(p *Problem, m *Model) ([]float64, error) {
	c, err := unweightedColumns(p, m)
	if err != nil {
		return nil, err
	}
	out := make([]float64, c.Rows)
	for k, t := range m.Terms {
		if t.Weight == 0 {
			continue
		}
		col := c.A[k*c.Rows : (k+1)*c.Rows]
		for r := range out {
			out[r] += mul0(t.Weight, col[r])
		}
	}
	return out, nil
}

// unweightedColumns fills m's stress columns on p's points without the
// residual weights: each term's stress per unit weight in the problem's
// measure and unit.
func unweightedColumns(p *Problem, m *Model) (*Columns, error) {
	F := make([][4]float64, p.Data.Points())
	for i := range F {
		F[i] = p.Data.Kinematics(i).F
	}
	d, err := NewDataset(F, p.Output, nil)
	if err != nil {
		return nil, err
	}
	c := &Columns{}
	d.Fill(m, c, false)
	return c, nil
}

// Metrics returns R², RMSE and normalised RMSE per protocol and component
// of model predictions pred on p's rows.
func Metrics(p *Problem, pred []float64) []Metric {
	var out []Metric
	for _, pi := range p.Protocols {
		for _, c := range p.Output.Components {
			var meas, mod []float64
			for r := range p.Measured {
				if p.RowProtocol[r] == pi && p.RowComponent[r] == c {
					meas = append(meas, p.Measured[r])
					mod = append(mod, pred[r])
				}
			}
			out = append(out, metric(p.Specimen.Protocols[pi].Label, biaxial.Component(c).String(), meas, mod))
		}
	}
	return out
}

func metric(label, comp string, meas, mod []float64) Metric {
	m := Metric{Protocol: label, Component: comp, Points: len(meas)}
	if len(meas) == 0 {
		return m
	}
	// Work in units of the largest measured magnitude so that squares of
	// extreme stresses cannot overflow.
	sc := 0.0
	for _, v := range meas {
		sc = math.Max(sc, math.Abs(v))
	}
	if sc == 0 || math.IsInf(sc, 0) {
		sc = 1
	}
	mean, lo, hi := 0.0, math.Inf(1), math.Inf(-1)
	for _, v := range meas {
		mean += v / sc
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	mean /= float64(len(meas))
	ssr, sst := 0.0, 0.0
	for i, v := range meas {
		d := (mod[i] - v) / sc
		ssr += d * d
		sst += (v/sc - mean) * (v/sc - mean)
	}
	m.Range = hi - lo
	m.RMSE = math.Sqrt(ssr/float64(len(meas))) * sc
	if sst > 0 && !math.IsInf(ssr, 0) {
		m.R2, m.R2Defined = 1-ssr/sst, true
	}
	if m.Range > 0 {
		m.NRMSE, m.NRMSEDefined = m.RMSE/m.Range, true
	}
	return m
}

func (r *Result) metrics(p *Problem) {
	pred, err := Predict(p, r.Model)
	if err != nil {
		return
	}
	r.Metrics = Metrics(p, pred)
}
