package aniso

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// combination states what the data determine about a block of correlated
// quantities (indices into cols): the eigenvector of least variance of
// their correlation matrix, the combination of standardised quantities the
// data fix best, written as a weighted sum of the quantities in their own
// units (the linearisation the covariance itself describes; a product of
// powers would add a curvature error as large as the members' own
// spread). cov is in reported units.
func (r *Result) combination(cols []jcol, cov *mat.Dense, block []int) (Combination, bool) {
	m := len(block)
	sd := make([]float64, m)
	c := Combination{}
	for i, a := range block {
		sd[i] = math.Sqrt(cov.At(a, a))
		if !(sd[i] > 0) {
			return c, false
		}
		c.Names = append(c.Names, r.Estimates[cols[a].est].Name)
	}
	R := mat.NewSymDense(m, nil)
	for i, a := range block {
		for j := 0; j <= i; j++ {
			R.SetSym(i, j, r.Correlation[a][block[j]])
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(R, true) {
		return c, false
	}
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	least := 0
	for j := range vals {
		if vals[j] < vals[least] {
			least = j
		}
	}
	c.Coefficients = make([]float64, m)
	for i := range block {
		c.Coefficients[i] = vecs.At(i, least) / sd[i]
	}
	// The member with the largest coefficient is set to 1, and among the
	// members without the stress unit (angles, shape parameters) when the
	// block has any: a weight's coefficient is per stress unit, so with a
	// weight and an angle in one block the largest coefficient would
	// change with the unit, and the same test in Pa and in kPa would state
	// its combination with different members set to 1. Among weights alone
	// (one unit) or the others alone the choice does not depend on it.
	isWeight := func(i int) bool { return r.Estimates[cols[block[i]].est].Kind == "weight" }
	others := false
	for i := range block {
		others = others || !isWeight(i)
	}
	lead := -1
	for i := range block {
		if others && isWeight(i) {
			continue
		}
		if lead < 0 || math.Abs(c.Coefficients[i]) > math.Abs(c.Coefficients[lead]) {
			lead = i
		}
	}
	// The lead's coefficient is +1, which also fixes the eigenvector's
	// arbitrary sign.
	norm := c.Coefficients[lead]
	variance := 0.0
	for i := range block {
		c.Coefficients[i] /= norm
	}
	for i, a := range block {
		for j, b := range block {
			variance += c.Coefficients[i] * c.Coefficients[j] * cov.At(a, b)
		}
		c.Value += c.Coefficients[i] * r.Estimates[cols[a].est].Value
	}
	c.StdErr = math.Sqrt(math.Max(variance, 0))
	c.MemberStdErr = sd
	c.Text = r.combinationText(c, cols, block)
	return c, true
}

// combinationText writes a combination in words and numbers.
func (r *Result) combinationText(c Combination, cols []jcol, block []int) string {
	units := make([]string, len(block))
	same := true
	for i, a := range block {
		if u := r.Estimates[cols[a].est].Unit; u != "" {
			units[i] = " " + u
		}
		same = same && units[i] == units[0]
	}
	var parts, alone []string
	for i, x := range c.Coefficients {
		term := c.Names[i]
		if math.Abs(math.Abs(x)-1) >= 0.0005 {
			term = fmt.Sprintf("%.3g·%s", math.Abs(x), c.Names[i])
		}
		switch {
		case i == 0 && x < 0:
			parts = append(parts, "−"+term)
		case i == 0:
			parts = append(parts, term)
		case x < 0:
			parts = append(parts, "− "+term)
		default:
			parts = append(parts, "+ "+term)
		}
		alone = append(alone, fmt.Sprintf("%s %.3g%s", c.Names[i], c.MemberStdErr[i], units[i]))
	}
	unit := ""
	if same {
		unit = units[0]
	}
	return fmt.Sprintf("The data determine %s = %.4g%s (standard error %.3g%s), though not its terms separately (standard errors: %s).",
		strings.Join(parts, " "), c.Value, unit, c.StdErr, unit, strings.Join(alone, ", "))
}
