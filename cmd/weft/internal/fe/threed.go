package fe

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// ThreeDBlock says how to use a card in a three-dimensional code with a
// volumetric–isochoric split (nearly incompressible), with the card's
// numbers.
type ThreeDBlock struct {
	// Lines are the block in words and formulas.
	Lines []string `json:"lines"`
	// MatrixTerms and FibreTerms list the card's terms by which
	// invariants they take: the isochoric ones (matrix) or those of the
	// full C (fibre families and the Fung-type term).
	MatrixTerms []string `json:"isochoric_terms"`
	FibreTerms  []string `json:"full_invariant_terms"`
	// SuggestedBulkModulus is 1e3 × the larger of the card's stress
	// scale (stress unit; aniso.Model.StressScale: the sum of the
	// weights, a Fung-type term counted by its small-strain modulus
	// c·max|b|) and the largest tangent entry |∂P_i/∂F_j| over the
	// verification rows of the terms whose energy depends on C33
	// (LargestTangent), with which the tests find the nearly
	// incompressible stresses within 1e-3 of the membrane's at every
	// verification row.
	SuggestedBulkModulus float64 `json:"suggested_bulk_modulus"`
	// StressScale and LargestTangent are the two numbers the suggestion
	// is 1e3 × the larger of (stress unit). LargestTangent counts the
	// I1, I2, principal-stretch and cofactor terms and the fibre terms of
	// families with dispersion κ > 0.
	StressScale    float64 `json:"stress_scale"`
	LargestTangent float64 `json:"largest_tangent"`
}

// BulkModulusFactor is the suggested bulk modulus as a multiple of the
// larger of a card's stress scale (aniso.Model.StressScale) and the
// largest tangent entry of its C33-dependent terms over the verification
// rows.
const BulkModulusFactor = 1e3

// threeDBlock writes the block for model m with weights in unit; stiffest
// is the largest |∂P_i/∂F_j| over the verification rows of m's terms that
// depend on C33. The bulk modulus follows their stiffest row, not the
// weights alone: the nearly incompressible form departs from the
// membrane by about that stiffness over the bulk modulus, and a matrix
// that stiffens strongly (an exponential or Gent matrix, a principal-
// stretch term with a large exponent, a cofactor term) is far stiffer at
// the table's largest stretches than its weights say — with 1e3 × the sum
// of the weights such cards were up to 7.5e-2 off, the bundled demo patch
// P2 9.2e-3.
func threeDBlock(m *aniso.Model, unit string, stiffest float64) ThreeDBlock {
	b := ThreeDBlock{MatrixTerms: []string{}, FibreTerms: []string{}}
	names := familyNames(m)
	for i, t := range m.Terms {
		label := fmt.Sprintf("%d:%s", i+1, t.Shape.ID)
		if t.Family >= 0 {
			label += "@" + names[t.Family]
		}
		switch t.Shape.Arg {
		case terms.I1, terms.I2, terms.Principal:
			b.MatrixTerms = append(b.MatrixTerms, label)
		default:
			b.FibreTerms = append(b.FibreTerms, label)
		}
	}
	b.StressScale, b.LargestTangent = m.StressScale(), stiffest
	b.SuggestedBulkModulus = BulkModulusFactor * math.Max(b.StressScale, b.LargestTangent)
	list := func(s []string) string {
		if len(s) == 0 {
			return "none in this card"
		}
		return strings.Join(s, ", ")
	}
	b.Lines = []string{
		"The card's energy Psi is that of an incompressible material (J = det F = 1, the plane-stress membrane eliminates F33 = 1/det F2). A mixed u-p code uses it as written, with a pressure p enforcing J = 1 (Psi - p (J - 1)).",
		"A code with a volumetric-isochoric split (nearly incompressible) uses Psi(F) = Psi_matrix(Ibar1, Ibar2, lambdabar_i) + Psi_fibres(C) + U(J), with J = det F, Ibar1 = J^(-2/3) I1, Ibar2 = J^(-4/3) I2, lambdabar_i = J^(-1/3) lambda_i and I1, I2 = (I1^2 - tr C^2)/2 of the full C = F^T F.",
		"Isochoric (matrix) terms: every I1, I2 and principal-stretch term, with its argument written in Ibar1, Ibar2 or lambdabar_i: " + list(b.MatrixTerms) + ".",
		"Terms in the invariants of the full C: every fibre, cofactor and I5 term, the dispersion kappa (E_f = kappa (I1 - 3) + (1 - 3 kappa)(I4 - 1) = H:C - 1 with H = kappa 1 + (1 - 3 kappa) a0 (x) a0), in-plane dispersion (I4(theta) = a0(theta).C a0(theta)), K = a0.cof(C) a0 = I5 - I1 I4 + I2 (true for any J) and the Fung-type term (the in-plane Green strain E = (C - 1)/2 in the tester's axes, which does not depend on J), with the switches as in the card (I4 > 1, K > 1): " + list(b.FibreTerms) + ".",
		fmt.Sprintf("U(J) = (kappa_b/2)(J - 1)^2 with a bulk modulus kappa_b of your choice; U(1) = U'(1) = 0 and every other term is stress-free at F = I, so the reference stays stress-free. kappa_b = %g x the larger of the card's stress scale (the sum of the weights, a Fung-type term counted by c max|b|; %.6g %s) and the largest tangent entry dP/dF over the verification rows of the terms that depend on C33 (I1, I2, principal-stretch and cofactor terms, fibre terms with kappa > 0; %.6g %s) = %.6g %s keeps the membrane stresses of the verification table within 1e-3 of the card's (tested; the difference is about the stiffness of those terms over kappa_b, so a matrix that stiffens strongly needs more than its weights say); a larger kappa_b comes closer to the incompressible card but stiffens the equations (common practice: kappa_b of 1e3 to 1e4 times the shear modulus, or a mixed u-p formulation).", BulkModulusFactor, b.StressScale, unit, b.LargestTangent, unit, b.SuggestedBulkModulus, unit),
		"Why the fibre terms keep the full invariants: with a finite bulk modulus, fibre terms in the isochoric Ibar4 = J^(-2/3) I4 cannot resist a change of volume along the fibres, so an anisotropic body under hydrostatic pressure deforms as if it were isotropic (Sansour 2008, Eur J Mech A/Solids 27:28-39; from memory). Both forms approach the incompressible card as kappa_b grows.",
		"Planar biaxial data do not constrain the out-of-plane or volumetric response (Holzapfel & Ogden 2009): the bulk modulus, and any out-of-plane behaviour of the terms, are assumptions of the FE model, not results of the fit.",
	}
	return b
}

// writeThreeD writes the block as indented text under a heading.
func writeThreeD(w io.Writer, b *ThreeDBlock, indent string) {
	fmt.Fprintln(w, indent+"THREE-DIMENSIONAL AND NEARLY INCOMPRESSIBLE USE")
	for _, l := range b.Lines {
		fmt.Fprintln(w, indent+"  - "+l)
	}
}
