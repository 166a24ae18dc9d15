package card

import (
	"fmt"
	"math"
	"strings"

	"github.com/weft-tools/weft/aniso"
)

// KeyUntestedStrips is the key of the section on the strips the data did
// not test.
const KeyUntestedStrips = "untested_strips"

// UntestedStrip is a protocol with one axis held at stretch 1 (Green
// strain ratio 1:0 or 0:1) that the fitted data did not test, and how far
// the card's model and its near-equivalent models (NearEquivalents) part
// along it. A strip is the classical complement of ratio protocols
// (common practice); where none was tested the tests may not settle it:
// 42 such strips of independent solids were missed by up to 20 % of their
// peak by the chosen model (README, the prediction band).
type UntestedStrip struct {
	// Label is "1:0" (axis 2 held at stretch 1) or "0:1" (axis 1 held).
	Label string `json:"label"`
	// Stretch is the largest stretch of the driven axis along the strip:
	// the data's largest along that axis (dimensionless).
	Stretch Num `json:"stretch"`
	// Models is how many near-equivalent models the band holds besides
	// the card's own; 0 when there are none, and then the numbers below
	// are null (NaN): nothing measures the strip.
	Models int `json:"models"`
	// Widest is the largest high − low of a normal stress over the strip,
	// in the fitted measure (data_range.stress_kind) and the card's
	// stress unit; Largest the largest |normal stress| of the card's
	// model along it; Percent is 100 Widest/Largest.
	Widest  Num `json:"widest"`
	Largest Num `json:"largest"`
	Percent Num `json:"percent"`
	// WidestShear is the largest high − low of a shear stress (σ12, or
	// P12 and P21) over the strip, which the grips that hold a strip
	// carry; ShearPercent is 100 WidestShear/Largest. Data without shear
	// information cannot tell a fibre angle's sign, and the shear is where
	// the two signs part.
	WidestShear  Num `json:"widest_shear"`
	ShearPercent Num `json:"shear_percent"`
	// LeavesRangeAt is the stretch from which the strip leaves the
	// fitted data range (a stretch or a fibre stretch beyond the tested
	// ones), where every model of the band extrapolates and a spread,
	// narrow or wide, settles nothing; null (NaN) when it stays inside.
	// It depends on the card's model and data alone, so an unmeasured
	// strip (Models 0) gives it too.
	LeavesRangeAt Num `json:"leaves_range_at"`
	// Summary says it in words.
	Summary string `json:"summary"`
}

// untestedDirectionDeg is how close (in the direction of the in-plane
// Green strain, degrees) a tested protocol's largest strain must come to a
// strip for the strip to count as tested.
const untestedDirectionDeg = 5

// ShearPercentShown is the smallest spread of a strip's shear stress, in
// per cent of its largest normal stress, that its summary mentions: below
// it the models agree that a gripped strip carries no shear worth naming.
const ShearPercentShown = 0.1

// PercentText writes a strip's spread in per cent: one decimal, or three
// significant digits from 1000 % on, where a model of the band runs away
// beyond the tested range (a recruited family stretched past its tested
// fibre stretch read 2.9e22 %, which one decimal wrote with 23 digits).
func PercentText(p float64) string {
	if math.Abs(p) >= 1000 {
		return fmt.Sprintf("%.3g", p)
	}
	return fmt.Sprintf("%.1f", p)
}

// stripPoints is how many points stand for a strip's path.
const stripPoints = 40

// NewUntestedStrips returns the strips none of the fitted protocols
// tested (protocols holds each protocol's deformation gradients, F11,
// F12, F21, F22), each with the spread of c's near-equivalent models and
// m along it, up to the data's largest stretch of the driven axis; the
// spread is of the normal nominal stresses when nominal, else of the
// Cauchy stresses. When c has no near-equivalent model the strips are
// listed all the same, with Models 0, no spread (null numbers) and a
// summary that says nothing measures them: one candidate alone is not a
// settled prediction.
func NewUntestedStrips(protocols [][][4]float64, nominal bool, c *Card, m *aniso.Model) ([]UntestedStrip, error) {
	return newUntestedStrips(protocols, nominal, c, m, 0, nil)
}

// NewCohortUntestedStrips is NewUntestedStrips for a specimen of a cohort
// of specimens (at least 1) whose form was discovered: c's selection holds
// the cohort's candidates, each fitted to this specimen, with the held-out
// errors pooled over the cohort's specimens (aniso.Cohort.SpecimenEvidence).
// The summaries say that the evidence is pooled, not this specimen's own.
func NewCohortUntestedStrips(protocols [][][4]float64, nominal bool, c *Card, m *aniso.Model, specimens int) ([]UntestedStrip, error) {
	return newUntestedStrips(protocols, nominal, c, m, max(specimens, 1), nil)
}

// ChosenFormWhy is why nothing measures a strip of a card whose form was
// chosen rather than discovered, as a reason for NewUnmeasuredStrips.
func ChosenFormWhy(string) string {
	return "the form was chosen, not discovered: no other candidate form was fitted to compare with it"
}

// NewUnmeasuredStrips lists the strips none of protocols tested as
// NewUntestedStrips does, but measures none of them: each has Models 0,
// null numbers and a summary whose reason is why(label), a clause saying
// why nothing measures the strip on this card. A cohort's population card
// uses it: no candidate form but the chosen one is fitted to the pooled
// data (each such fit costs about as much as the population fit), and the
// reason points at the specimens' own strips.
func NewUnmeasuredStrips(protocols [][][4]float64, nominal bool, c *Card, m *aniso.Model, why func(label string) string) ([]UntestedStrip, error) {
	return newUntestedStrips(protocols, nominal, c, m, 0, why)
}

// newUntestedStrips is NewUntestedStrips; pooled is the number of a
// cohort's specimens whose held-out errors the selection pools, 0 for a
// single specimen's own; unmeasured, when set, leaves every strip
// unmeasured with its reason (NewUnmeasuredStrips).
func newUntestedStrips(protocols [][][4]float64, nominal bool, c *Card, m *aniso.Model, pooled int, unmeasured func(label string) string) ([]UntestedStrip, error) {
	var alike []AlikeModel
	if unmeasured == nil {
		var err error
		if alike, err = c.AlikeModels(); err != nil {
			return nil, err
		}
	}
	n := Candidates(alike)
	var dirs []float64
	var top [2]float64
	for _, pts := range protocols {
		for _, F := range pts {
			top[0], top[1] = math.Max(top[0], F[0]), math.Max(top[1], F[3])
		}
		if d, ok := aniso.PeakGreenDirection(pts); ok {
			dirs = append(dirs, d)
		}
	}
	cols, shearCols := []int{0, 1}, []int{2}
	if nominal {
		cols, shearCols = []int{3, 4}, []int{5, 6}
	}
	type strip struct {
		label, held string
		deg         float64 // its direction's reading (PeakGreenDirection) when a protocol ran it
		turn        float64 // the strip's axes turned from the tester's, degrees
		axis        int     // the driven axis in the strip's own axes
		top         float64 // the stretch it is taken to
	}
	strips := []strip{{"1:0", "axis 2 held at stretch 1", 0, 0, 0, top[0]}, {"0:1", "axis 1 held at stretch 1", 90, 0, 1, top[1]}}
	if turnedMatters(m, alike) {
		// No file of the tester's axes holds a turned strip: a specimen
		// cut or mounted at 45° is another file, in its own axes.
		far := math.Max(top[0], top[1])
		strips = append(strips, strip{"1:0 turned 45°", "the specimen cut or mounted at 45° to axis 1, its lateral stretch held at 1", math.NaN(), 45, 0, far})
		if c.Fit != nil && c.Fit.AngleSignKnown {
			// Without shear information the band holds every model's
			// reflection, which turns −45° into +45°.
			strips = append(strips, strip{"1:0 turned −45°", "the specimen cut or mounted at −45° to axis 1, its lateral stretch held at 1", math.NaN(), -45, 0, far})
		}
	}
	why := "the fit has no cross-validated candidates to compare (one protocol)"
	judged := "the held-out protocols could not tell from it"
	if pooled > 0 {
		forms := "forms"
		if n == 1 {
			forms = "form"
		}
		judged = fmt.Sprintf("%s the held-out protocols pooled over %s could not tell from its form (each fitted to this specimen)", forms, cohortSpecimens(pooled))
	}
	if c.AloneInSelection() {
		why = "no other candidate predicted the held-out protocols as well as the chosen model"
		if pooled > 0 {
			why = fmt.Sprintf("no other candidate predicted the held-out protocols, pooled over %s, as well as the chosen model", cohortSpecimens(pooled))
		}
	}
	var out []UntestedStrip
	for _, st := range strips {
		tested := false
		for _, d := range dirs {
			if math.Abs(d-st.deg) < untestedDirectionDeg {
				tested = true
			}
		}
		if tested || st.top <= 1 {
			continue
		}
		leaves, outside := leavesRange(c, m, st.turn, st.axis, st.top)
		if len(alike) == 0 {
			nan := Num(math.NaN())
			reason, so := why, "nothing measures"
			if unmeasured != nil {
				reason, so = unmeasured(st.label), "this card does not measure"
			}
			summary := fmt.Sprintf("strip %s (%s, to stretch %.3g): %s, so %s how far the tests settle it; that is not a settled prediction", st.label, st.held, st.top, reason, so)
			if leaves > 0 {
				// Where the strip leaves the tested range depends on
				// the card's model and data alone, not on a band (until
				// 2026-12-05 an unmeasured strip did not say it: four
				// synthetic sutured specimens, fibres near 33°, whose
				// strips leave their range from stretch 1.02–1.09 on),
				// so leaves_range_at is given as on a measured strip.
				summary += fmt.Sprintf("; from stretch %.3g on the strip leaves the fitted data range (%s), where the model extrapolates", leaves, outside)
			}
			at := nan
			if leaves > 0 {
				at = Num(leaves)
			}
			out = append(out, UntestedStrip{Label: st.label, Stretch: Num(st.top), Widest: nan, Largest: nan, Percent: nan, WidestShear: nan, ShearPercent: nan, LeavesRangeAt: at, Summary: summary})
			continue
		}
		out = append(out, untestedStrip(c, m, alike, n, judged, st.label, st.held, st.turn, st.axis, st.top, leaves, outside, cols, shearCols))
	}
	return out, nil
}

// cohortSpecimens writes "the cohort's n specimens", or "the cohort's 1
// specimen" (a cohort of one, or of one specimen with two protocols or
// more: until 2026-12-05 it read "the cohort's 1 specimens").
func cohortSpecimens(n int) string {
	if n == 1 {
		return "the cohort's 1 specimen"
	}
	return fmt.Sprintf("the cohort's %d specimens", n)
}

// stripF is the deformation (tester's axes) of the strip driven along
// axis of axes turned by turn degrees to stretch l.
func stripF(turn float64, axis int, l float64) [4]float64 {
	F := [4]float64{l, 0, 0, 1}
	if axis == 1 {
		F = [4]float64{1, 0, 0, l}
	}
	return aniso.Turned(F, turn)
}

// leavesRange returns the first of the strip's points (stripF, up to top)
// that lies outside c's data range for m, and what lies outside; 0 when
// every point lies inside or c has no data range.
func leavesRange(c *Card, m *aniso.Model, turn float64, axis int, top float64) (float64, string) {
	if c.DataRange == nil {
		return 0, ""
	}
	for i := range stripPoints {
		l := 1 + (top-1)*float64(i+1)/stripPoints
		// A strip in the tester's axes holds no shear, a turned one the
		// shear of its turn; a sutured specimen's shear range need not
		// hold either, and that alone is no stretch beyond the tests:
		// the stretches and fibre stretches are.
		var o []string
		for _, q := range c.DataRange.Outside(m, stripF(turn, axis, l)) {
			if !strings.HasPrefix(q, "F12 ") && !strings.HasPrefix(q, "F21 ") {
				o = append(o, q)
			}
		}
		if len(o) > 0 {
			return l, strings.Join(o, ", ")
		}
	}
	return 0, ""
}

// untestedStrip measures one strip: driven along axis (0 or 1) of axes
// turned by turn degrees from the tester's, to stretch top, with the other
// stretch held at 1 and no shear in those axes; the band is read in them.
// judged names the near-equivalent models (after their count); leaves and
// why are leavesRange's.
func untestedStrip(c *Card, m *aniso.Model, alike []AlikeModel, n int, judged, label, held string, turn float64, axis int, top, leaves float64, why string, cols, shearCols []int) UntestedStrip {
	var widest, largest, widestShear float64
	for i := range stripPoints {
		l := 1 + (top-1)*float64(i+1)/stripPoints
		F := stripF(turn, axis, l)
		b, err := AlikeBandTurned(m, alike, F, turn)
		if err != nil {
			break // beyond a limit of the card's own model: the strip stops here
		}
		for _, j := range cols {
			widest = math.Max(widest, b.High[j]-b.Low[j])
			largest = math.Max(largest, math.Abs(b.Own[j]))
		}
		for _, j := range shearCols {
			widestShear = math.Max(widestShear, b.High[j]-b.Low[j])
		}
	}
	pct, shearPct := 0.0, 0.0
	if largest > 0 {
		pct, shearPct = 100*widest/largest, 100*widestShear/largest
	}
	summary := fmt.Sprintf("strip %s (%s, to stretch %.3g): the chosen model and the %d %s part by up to %s %% of its largest normal stress there", label, held, top, n, judged, PercentText(pct))
	if shearPct >= ShearPercentShown {
		summary += fmt.Sprintf(", and by up to %s %% of it in the shear stress the grips would carry", PercentText(shearPct))
	}
	if leaves > 0 {
		// Beyond the tested range every model of the band
		// extrapolates, and they can agree far from the material.
		summary += fmt.Sprintf("; from stretch %.3g on the strip leaves the fitted data range (%s), where they all extrapolate and the spread settles nothing", leaves, why)
	}
	at := math.NaN()
	if leaves > 0 {
		at = leaves
	}
	return UntestedStrip{Label: label, Stretch: Num(top), Models: n, Widest: Num(widest), Largest: Num(largest), Percent: Num(pct),
		WidestShear: Num(widestShear), ShearPercent: Num(shearPct), LeavesRangeAt: Num(at), Summary: summary}
}

// turnedMatters reports whether a turned strip can part the models from
// the strips in the tester's axes: whether m or a near-equivalent model has
// a fibre family or a Green-strain (Fung-type) term of positive weight
// (Model.HasGreenTerm), whose response depends on the direction of
// loading. An isotropic band is the same along every direction; a
// zero-weight term adds nothing to it.
func turnedMatters(m *aniso.Model, alike []AlikeModel) bool {
	models := []*aniso.Model{m}
	for _, a := range alike {
		models = append(models, a.Model)
	}
	for _, x := range models {
		if len(x.Families) > 0 || x.HasGreenTerm() {
			return true
		}
	}
	return false
}
