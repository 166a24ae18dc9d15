package fe

import (
	"strings"
	"testing"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/terms"
)

// Every catalogue shape can be exported: it has a UFL form (an ideal or
// κ-dispersed family, and the in-plane dispersed family's integrand for
// fibre shapes), and the normalisations every card carries state it (its
// id, or a pattern *-suffix that names it). Both are written by id, apart
// from the catalogue, and a new shape without them would make
// weft export --format ufl fail and leave a card's weight unexplained
// (DEVELOPERS.md, How to add an energy term).
func TestEveryShapeIsExported(t *testing.T) {
	norms := card.StandardConventions.Normalisations
	for _, sh := range terms.Catalogue() {
		p := make([]float64, len(sh.Params))
		for i, q := range sh.Params {
			p[i] = q.Default
		}
		m := &aniso.Model{Families: []aniso.Family{{Name: "f1", Angle: aniso.Rad(30)}}}
		tm := aniso.Term{Shape: sh, Family: -1, Weight: 1, Params: p}
		if sh.Arg == terms.Fibre || sh.Arg == terms.Fifth || sh.Arg == terms.Cofactor {
			tm.Family = 0
		}
		m.Terms = []aniso.Term{tm}
		if _, err := uflTerm(0, tm, m); err != nil {
			t.Errorf("%s: %v", sh.ID, err)
		}
		if sh.Arg == terms.Fibre {
			if _, err := uflShape(sh, "x", p); err != nil {
				t.Errorf("%s on an in-plane dispersed family: %v", sh.ID, err)
			}
		}
		_, suffix, _ := strings.Cut(sh.ID, "-")
		if !strings.Contains(norms, sh.ID) && !strings.Contains(norms, "*-"+suffix) {
			t.Errorf("%s: the card's normalisations do not state it", sh.ID)
		}
	}
}
