package summary

import (
	"fmt"
	"io"
	"math"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// untestedDirectionDeg is how close (in the direction of the in-plane
// Green strain, degrees) a tested protocol must come to a strip for the
// strip to count as tested.
const untestedDirectionDeg = 5

// stripPoints is how many points stand for a strip's path.
const stripPoints = 40

// Strip is a protocol with one axis held at stretch 1 (Green strain ratio
// 1:0 or 0:1) that the data did not test, and how far the models the
// held-out protocols could not tell apart (card.NearEquivalents) part
// along it.
type Strip struct {
	// Label is "1:0" (axis 2 held) or "0:1" (axis 1 held); Stretch the
	// largest stretch of the driven axis, the data's largest along it.
	Label   string
	Stretch float64
	// Widest is the largest high − low of a normal stress (in the fitted
	// stress measure, stress unit) over the path, Largest the largest
	// |normal stress| of the card's model along it, and Models how many
	// near-equivalent models the band holds besides the card's.
	Widest, Largest float64
	Models          int
}

// UntestedStrips returns the strips the specimen's protocols did not test,
// each with the spread of the near-equivalent models along it up to the
// data's largest stretch on the driven axis; none when the card has no
// near-equivalent models. A strip is the classical complement of ratio
// protocols (common practice), and where it was not tested the tests may
// not settle it: 42 such strips of independent solids were missed by up
// to 20 % of their peak by the chosen model (README, weft predict).
func UntestedStrips(s *biaxial.Specimen, c *card.Card, m *aniso.Model) ([]Strip, error) {
	alike, err := c.AlikeModels()
	if err != nil || len(alike) == 0 {
		return nil, err
	}
	var dirs []float64
	var top [2]float64
	for i := range s.Protocols {
		far, at := -1.0, [4]float64{1, 0, 0, 1}
		for _, pt := range s.Protocols[i].Points {
			e11, e22 := (pt.F[0]*pt.F[0]-1)/2, (pt.F[3]*pt.F[3]-1)/2
			if n := math.Hypot(e11, e22); n > far {
				far, at = n, pt.F
			}
			top[0], top[1] = math.Max(top[0], pt.F[0]), math.Max(top[1], pt.F[3])
		}
		if far > 0 {
			dirs = append(dirs, aniso.Deg(math.Atan2((at[3]*at[3]-1)/2, (at[0]*at[0]-1)/2)))
		}
	}
	nominal := s.Kind == biaxial.Nominal
	var out []Strip
	for k, st := range []struct {
		label string
		deg   float64
	}{{"1:0", 0}, {"0:1", 90}} {
		tested := false
		for _, d := range dirs {
			if math.Abs(d-st.deg) < untestedDirectionDeg {
				tested = true
			}
		}
		if tested || top[k] <= 1 {
			continue
		}
		strip := Strip{Label: st.label, Stretch: top[k], Models: len(alike)}
		for i := range stripPoints {
			l := 1 + (top[k]-1)*float64(i+1)/stripPoints
			F := [4]float64{l, 0, 0, 1}
			if k == 1 {
				F = [4]float64{1, 0, 0, l}
			}
			b, err := card.AlikeBand(m, alike, F)
			if err != nil {
				break // beyond a limit of the card's own model: the strip stops here
			}
			for _, j := range normalColumns(nominal) {
				strip.Widest = math.Max(strip.Widest, b.High[j]-b.Low[j])
				strip.Largest = math.Max(strip.Largest, math.Abs(b.Own[j]))
			}
		}
		out = append(out, strip)
	}
	return out, nil
}

// normalColumns are the indices of the normal stresses in card.Band's
// arrays, in the fitted measure.
func normalColumns(nominal bool) []int {
	if nominal {
		return []int{3, 4}
	}
	return []int{0, 1}
}

// printUntested prints the strips the data did not test and how far the
// near-equivalent models part along them.
func printUntested(w io.Writer, f *Fit) {
	strips, err := UntestedStrips(f.Specimen, f.Card, f.Result.Model)
	if err != nil {
		fmt.Fprintf(w, "untested: the near-equivalent models could not be built (%v)\n", err)
		return
	}
	for i, st := range strips {
		head := "untested: "
		if i > 0 {
			head = "          "
		}
		axis := "axis 2 held at stretch 1"
		if st.Label == "0:1" {
			axis = "axis 1 held at stretch 1"
		}
		rel := 0.0
		if st.Largest > 0 {
			rel = 100 * st.Widest / st.Largest
		}
		fmt.Fprintf(w, "%sstrip %s (%s, to stretch %.3g): the chosen model and the %d the held-out protocols could not tell from it part by up to %.1f %% of its largest normal stress there\n",
			head, st.Label, axis, st.Stretch, st.Models, rel)
	}
}
