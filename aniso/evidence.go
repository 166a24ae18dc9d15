package aniso

import (
	"fmt"
	"strings"

	"github.com/weft-tools/weft/biaxial"
)

// evidence is what the verdict walk and the one-standard-error rule
// (select.go, verdict.go, lookalikes.go, cautions.go) need to know about the data behind the
// candidates' losses and held-out errors: for one specimen its problem
// (problemEvidence), for a cohort the specimens pooled (cohort.go).
type evidence struct {
	// rows is the number of residuals behind each candidate's loss and
	// series the number of protocol-and-component series among them.
	rows, series int
	// hasShear is true when the data identify the sign of fibre angles.
	hasShear bool
	// oneProtocol is true when the data hold a single protocol (per
	// specimen), which cannot separate one family from two.
	oneProtocol bool
	// admissible returns "" when a candidate is admissible where it was
	// fitted, else what failed where (see admissibleOnData).
	admissible func(c *Candidate) string
	// preload names the first protocol whose data carry a preload that was
	// not tared (biaxial.Protocol.Preload) and its stress — for a cohort,
	// of the first specimen with one — or is empty.
	preload string
	// shearScatter names the protocol whose measured shear F12, F21
	// scatters most, when the data give shear stresses and that scatter
	// is above biaxial.ShearScatterLimit — for a cohort, of the first
	// specimen with one — or is empty.
	shearScatter string
	// idealOnly is true when no in-plane spread forms were searched
	// (DiscoverSettings.NoPlanar): two ideal families can then stand in
	// for one spread family (idealOnlyCaution).
	idealOnly bool
}

// problemEvidence is the evidence of a single specimen's problem.
func problemEvidence(p *Problem) evidence {
	return evidence{rows: p.Rows(), series: len(p.Protocols) * len(p.Output.Components), hasShear: p.HasShear,
		oneProtocol:  len(p.Protocols) == 1,
		admissible:   func(c *Candidate) string { return admissibleOnData(c.Result.Model, p) },
		preload:      preloadText(p),
		shearScatter: shearScatterText(p)}
}

// shearScatterText describes the protocol of p whose shear F12, F21, as
// the fit uses it, scatters most from point to point above
// biaxial.ShearScatterLimit (biaxial.Specimen.NoisiestShear); else it
// returns "".
func shearScatterText(p *Problem) string {
	s := p.Specimen
	worst, _ := s.NoisiestShear(p.Protocols)
	if worst < 0 {
		return ""
	}
	pr := &s.Protocols[worst]
	sc := pr.FittedStrainScatter()
	smoothed := ""
	if pr.SmoothWindow > 0 {
		smoothed = fmt.Sprintf(" after smoothing over %d points", pr.SmoothWindow)
	}
	return fmt.Sprintf("about %.2g in F12 and %.2g in F21 in protocol %s%s", sc[1], sc[2], pr.Label, smoothed)
}

// preloadText describes the first of p's protocols that carries a preload
// that was not tared, or returns "".
func preloadText(p *Problem) string {
	s := p.Specimen
	for _, i := range p.Protocols {
		pr := &s.Protocols[i]
		var parts []string
		for c, v := range pr.Preload {
			if v != 0 {
				parts = append(parts, fmt.Sprintf("%s stress %s %.4g %s", s.Kind, biaxial.Component(c), v, s.StressUnit))
			}
		}
		if len(parts) > 0 {
			return fmt.Sprintf("protocol %s: %s at the reference state", pr.Label, strings.Join(parts, ", "))
		}
	}
	return ""
}
