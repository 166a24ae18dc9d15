package card

import (
	"fmt"

	"github.com/weft-tools/weft/aniso"
)

// KeyAlternatives is the key of the section that lists the models the data
// cannot tell from the card's own.
const KeyAlternatives = "alternatives"

// Texts of the alternatives section: why the layouts cannot be told apart,
// what decides, and which to choose in an FE model.
const (
	AlternativesReason = "The data carry no shear information (pure biaxial stretch, no shear stress measured)." + alternativesWhy
	// AlternativesReasonScatter is the reason when F12 and F21 are
	// non-zero but within their scatter of zero (DataSection's
	// shear_within_scatter), where "pure biaxial stretch" would be false.
	AlternativesReasonScatter = "The data carry no shear information (F12 and F21 stay within their point-to-point scatter of zero and were fitted as zero; no shear stress measured)." + alternativesWhy
	alternativesWhy           = " Under such data a fibre family at +α and one at −α give the same normal stresses and opposite shear stresses, and one family at α with weight w gives the same normal stresses as a mirror pair at ±α with w/2 each. The models listed fit the data equally well; they are different materials wherever the sheet shears."
	AlternativesDecider       = "Shear information removes the doubt: markers that track F12 and F21 on a specimen free to shear (mounted on sutures or rakes), an off-axis protocol (the specimen cut or mounted at 45° to the current axes), or an independent measurement of the fibre directions (histology, polarised light, small-angle light scattering) with the specimen's orientation recorded."
	AlternativesChoosing      = "Where the loads and supports of an FE model keep the tester's axes 1 and 2 as axes of symmetry, so that the sheet does not shear, every alternative gives the same result. Where the sheet can shear (free or compliant edges, loads off the tester's axes, curved or pressurised structures) they differ: one family shears the sheet one way, its mirror image the other way, the mirror pair not at all. Choose by independent knowledge of the fibre directions in the structure modelled; without it, run every alternative and report the spread of the results."
)

// AlternativesSection lists the complete models that the card's data
// cannot tell from its own (key "alternatives"): one family at +|α|, one
// at −|α| and the mirror pair ±|α| with half the weights, and the like
// (aniso.MirrorAlternatives). The card's own model is one of them
// (as_card).
type AlternativesSection struct {
	// Reason says why they cannot be told apart, Decider what measurement
	// removes the doubt, Choosing which to take in an FE model.
	Reason   string `json:"reason"`
	Decider  string `json:"decider"`
	Choosing string `json:"choosing"`
	// Models are the alternatives.
	Models []AlternativeCard `json:"models"`
}

// AlternativeCard is one alternative: a complete model in the card's
// format and stress unit.
type AlternativeCard struct {
	// Name identifies it ("single-plus", "single-minus", "mirror-pair",
	// or "signs+-" and the like for several families).
	Name string `json:"name"`
	// Title says it in words.
	Title string `json:"title"`
	// AsCard is true for the card's own model.
	AsCard bool `json:"as_card"`
	// Energy is the energy written out with its numbers.
	Energy string `json:"energy"`
	// Families and Terms are read as the card's own.
	Families []Family `json:"families"`
	Terms    []Term   `json:"terms"`
}

// NewAlternativesSection returns the alternatives of m, whose families'
// angle signs are known where signKnown says so (nil: every sign known),
// with weights in unit; nil when nothing is undetermined.
func NewAlternativesSection(m *aniso.Model, unit string, signKnown []bool) *AlternativesSection {
	unknown := make([]bool, len(m.Families))
	for i := range unknown {
		unknown[i] = signKnown != nil && !signKnown[i]
	}
	alts := aniso.MirrorAlternatives(m, unknown)
	if alts == nil {
		return nil
	}
	s := &AlternativesSection{Reason: AlternativesReason, Decider: AlternativesDecider, Choosing: AlternativesChoosing}
	for _, a := range alts {
		fc := FromModel(a.Model, unit, nil)
		s.Models = append(s.Models, AlternativeCard{Name: a.Name, Title: a.Title, AsCard: a.Same, Energy: fc.Energy, Families: fc.Families, Terms: fc.Terms})
	}
	return s
}

// Alternative is one alternative model of a card, ready to evaluate.
type Alternative struct {
	// Name, Title and AsCard as in AlternativeCard.
	Name, Title string
	AsCard      bool
	// Model is the alternative model.
	Model *aniso.Model
}

// AlternativeModels returns the alternatives of a card whose model is m:
// those its alternatives section lists, each read and validated like the
// card's own model (an error names its JSON path), or, for a card
// without the section, those derived from the families whose
// angle_sign_known is false. nil when the card's layout is determined.
func (c *Card) AlternativeModels(m *aniso.Model) ([]Alternative, error) {
	if err := c.SectionError(KeyAlternatives); err != nil {
		return nil, errAt("$."+KeyAlternatives, "%v; expected reason, decider, choosing and models (each with name, title, as_card, families and terms)", err)
	}
	if c.Alternatives == nil {
		unknown := make([]bool, len(c.Families))
		for i, f := range c.Families {
			unknown[i] = f.AngleSignKnown != nil && !*f.AngleSignKnown
		}
		var out []Alternative
		for _, a := range aniso.MirrorAlternatives(m, unknown) {
			out = append(out, Alternative{Name: a.Name, Title: a.Title, AsCard: a.Same, Model: a.Model})
		}
		return out, nil
	}
	var out []Alternative
	seen := map[string]bool{}
	for i, a := range c.Alternatives.Models {
		path := fmt.Sprintf("$.%s.models[%d]", KeyAlternatives, i)
		if a.Name == "" || seen[a.Name] {
			return nil, errAt(path+".name", "%s: give each alternative a name of its own", quote(a.Name))
		}
		seen[a.Name] = true
		ac := &Card{Format: c.Format, StressUnit: c.StressUnit, Families: a.Families, Terms: a.Terms}
		am, err := ac.Model()
		if err != nil {
			if e, ok := err.(*Error); ok {
				e.Path = path + e.Path[1:]
				return nil, e
			}
			return nil, err
		}
		out = append(out, Alternative{Name: a.Name, Title: a.Title, AsCard: a.AsCard, Model: am})
	}
	return out, nil
}
