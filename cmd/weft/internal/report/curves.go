package report

import (
	"math"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// metric returns the card's metric of one protocol and component.
func (in *Input) metric(protocol, comp string) (card.MetricCard, bool) {
	for _, m := range in.fit.Metrics {
		if m.Protocol == protocol && m.Component == comp {
			return m, true
		}
	}
	return card.MetricCard{}, false
}

// rSquared is the coefficient of determination 1 − SS_res/SS_tot of
// predictions against measurements (common practice); NaN when the
// measurement is constant or a prediction is missing.
func rSquared(meas, pred []float64) float64 {
	if len(meas) == 0 || len(meas) != len(pred) {
		return math.NaN()
	}
	mean := 0.0
	for _, v := range meas {
		mean += v
	}
	mean /= float64(len(meas))
	ssr, sst := 0.0, 0.0
	for i, v := range meas {
		if math.IsNaN(pred[i]) {
			return math.NaN()
		}
		ssr += (pred[i] - v) * (pred[i] - v)
		sst += (v - mean) * (v - mean)
	}
	if sst == 0 {
		return math.NaN()
	}
	return 1 - ssr/sst
}

// axisCoordinate is the abscissa of a point for a stress component: for
// the normal components the stretch of a material line along that axis,
// λ = √C_ii (F11 when there is no shear), or the Green strain
// E_ii = ½(C_ii − 1) = ½(λ² − 1); for the shear components the Green shear
// strain E12 = ½ C12.
func axisCoordinate(F [4]float64, comp string, strain bool) float64 {
	c11 := F[0]*F[0] + F[2]*F[2]
	c22 := F[1]*F[1] + F[3]*F[3]
	switch comp {
	case "11":
		if strain {
			return 0.5 * (c11 - 1)
		}
		return math.Sqrt(c11)
	case "22":
		if strain {
			return 0.5 * (c22 - 1)
		}
		return math.Sqrt(c22)
	default:
		return 0.5 * (F[0]*F[1] + F[2]*F[3])
	}
}

// stressComponent picks component comp ("11", "22", "12", "21") of kind
// ("cauchy" or "nominal") from a model response. The Cauchy stress is
// symmetric, so its "21" is its "12".
func stressComponent(r *aniso.Response, kind, comp string) float64 {
	if kind == "cauchy" {
		switch comp {
		case "11":
			return r.Cauchy[0]
		case "22":
			return r.Cauchy[1]
		default:
			return r.Cauchy[2]
		}
	}
	switch comp {
	case "11":
		return r.Nominal[0]
	case "22":
		return r.Nominal[1]
	case "12":
		return r.Nominal[2]
	default:
		return r.Nominal[3]
	}
}

// modelCurve evaluates the model card along a protocol's CurvePath and
// returns x and stress per component (NaN where the model cannot be
// evaluated, which breaks the curve); it draws the curve of a folder
// without curves.csv.
func modelCurve(m *aniso.Model, pr *protocolRows, kind string, comps []string, strain bool) (xs, ys [][]float64) {
	xs, ys = make([][]float64, len(comps)), make([][]float64, len(comps))
	axes := make([]string, len(comps))
	for c, comp := range comps {
		axes[c] = abscissaComp(pr.F, comp)
	}
	for _, F := range CurvePath(pr.F) {
		r, err := m.Evaluate(F)
		for c, comp := range comps {
			xs[c] = append(xs[c], axisCoordinate(F, axes[c], strain))
			if err != nil {
				ys[c] = append(ys[c], math.NaN())
				continue
			}
			ys[c] = append(ys[c], stressComponent(&r, kind, comp))
		}
	}
	return xs, ys
}
