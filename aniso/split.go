package aniso

import (
	"fmt"
	"math"

	"github.com/weft-tools/weft/biaxial"
)

// StressSplit is how a fitted model's stress divides between its terms and
// between the matrix (isotropic terms) and each fibre family.
type StressSplit struct {
	// Terms are the term labels (Model.Terms order) and TermGroup each
	// term's group index into Groups ("matrix", "f1", "f2").
	Terms     []string
	TermGroup []int
	Groups    []string
	// Protocols holds one entry per protocol of the problem.
	Protocols []ProtocolSplit
}

// ProtocolSplit is the split of one protocol.
type ProtocolSplit struct {
	Protocol string
	// Components: the share of each term and group in the modelled stress
	// of one component, summed over the protocol's points: Σ|contribution|
	// / Σ|all contributions| (contributions can have either sign, e.g. the
	// plane-stress pressure makes a matrix term pull one axis down, so
	// magnitudes are shared); Signed gives Σ contribution per term in the
	// stress unit.
	Components []ComponentSplit
	// EnergyShare is each term's share of the strain energy at the
	// protocol's largest deformation (the point with the largest I1), and
	// GroupEnergyShare per group; AtF is that deformation.
	EnergyShare, GroupEnergyShare []float64
	AtF                           [4]float64
}

// ComponentSplit is the split of one stress component in one protocol.
type ComponentSplit struct {
	Component string
	// TermShare and GroupShare are NaN when NoShare says why there is no
	// share to give.
	TermShare, GroupShare []float64
	Signed                []float64
	// NetPeak is the largest |modelled stress| of the component over the
	// protocol's points and NormalPeak that of the protocol's normal
	// components (stress unit).
	NetPeak, NormalPeak float64
	// NoShare is empty, or says why the component has no share: its
	// modelled stress is negligible (NegligibleNet) while its terms carry
	// stress that cancels (CancelledNet), so a share of their magnitudes
	// would describe nothing the component carries, or no term carries
	// any stress in it.
	NoShare string
}

// NegligibleNet is the largest modelled stress of a component, as a
// fraction of the largest modelled normal stress of its protocol, below
// which the component is taken to carry no net load. On a specimen that
// shears freely on sutures the modelled shear stays near zero while matrix
// and fibre terms each carry a shear stress of either sign that cancels;
// splitting their magnitudes would read "50 % / 50 %" of nothing. The
// level matches the ±2 % span of the report's shear axes.
const NegligibleNet = 0.02

// NetNegligible reports whether a component whose largest |modelled
// stress| is netPeak carries no net load next to normal stresses of
// largest magnitude normalPeak (see NegligibleNet).
func NetNegligible(netPeak, normalPeak float64) bool {
	return normalPeak > 0 && netPeak < NegligibleNet*normalPeak || normalPeak == 0 && netPeak == 0
}

// CancelledNet is the largest ratio of the magnitude of the terms' summed
// contributions to the sum of their magnitudes at which the terms are taken
// to cancel. A small stress is not by itself a cancellation: on the axis
// that a fibre family along the other axis does not reach, or in the toe
// before the fibres are recruited, one group carries a small stress alone
// (ratio 1) and its share (100 %) is a fact worth reporting; on sutures the
// matrix's and the fibres' shear stresses cancel to a ratio of about 0.002
// (demo membrane-M3-sutured).
const CancelledNet = 0.5

// NoLoadToShare reports whether a component has no load to share: its
// largest |modelled stress| netPeak is negligible next to the normal
// stresses of largest magnitude normalPeak (NetNegligible), and its terms'
// contributions cancel, net < CancelledNet·gross, where net is the
// magnitude of their sum and gross the sum of their magnitudes (each may be
// summed over points); gross = 0 (no term carries anything) has nothing to
// share either.
func NoLoadToShare(netPeak, normalPeak, net, gross float64) bool {
	return NetNegligible(netPeak, normalPeak) && (gross == 0 || net < CancelledNet*gross)
}

// PointContributions returns each term's contribution to the model's stress
// on every row of p (unweighted, in the problem's stress measure):
// out[k][r] for term k and row r.
func PointContributions(p *Problem, m *Model) ([][]float64, error) {
	c, err := unweightedColumns(p, m)
	if err != nil {
		return nil, err
	}
	out := make([][]float64, len(m.Terms))
	for k, t := range m.Terms {
		out[k] = make([]float64, c.Rows)
		col := c.A[k*c.Rows : (k+1)*c.Rows]
		for r := range col {
			out[k][r] = mul0(t.Weight, col[r])
		}
	}
	return out, nil
}

// Split computes the stress and energy split of model m on problem p.
func Split(p *Problem, m *Model) (*StressSplit, error) {
	s := &StressSplit{Groups: []string{"matrix"}}
	for _, f := range m.Families {
		s.Groups = append(s.Groups, f.Name)
	}
	for _, t := range m.Terms {
		label := t.Shape.ID
		if t.Family >= 0 {
			label += "@" + m.Families[t.Family].Name
		}
		s.Terms = append(s.Terms, label)
		s.TermGroup = append(s.TermGroup, t.Family+1)
	}
	contrib, err := PointContributions(p, m)
	if err != nil {
		return nil, err
	}
	ng := len(s.Groups)
	group := make([]float64, ng) // one point's summed contribution per group
	for _, pi := range p.Protocols {
		pr := &p.Specimen.Protocols[pi]
		ps := ProtocolSplit{Protocol: pr.Label}
		netPeak := map[Component]float64{}
		normalPeak := 0.0
		for r := range p.Target {
			if p.RowProtocol[r] != pi {
				continue
			}
			net := 0.0
			for k := range m.Terms {
				net += contrib[k][r]
			}
			comp := p.RowComponent[r]
			netPeak[comp] = math.Max(netPeak[comp], math.Abs(net))
			if c := biaxial.Component(comp); c == biaxial.C11 || c == biaxial.C22 {
				normalPeak = math.Max(normalPeak, math.Abs(net))
			}
		}
		for _, comp := range p.Output.Components {
			ps.Components = append(ps.Components, s.componentSplit(p, m, contrib, group, pi, comp, netPeak[comp], normalPeak))
		}
		// Energy at the protocol's largest deformation, as the fit saw it:
		// F12 and F21 within their scatter of zero were fitted as zero
		// (Problem.ShearTakenAsZero), and the noise left in would make the
		// energy of a family at +α differ from that at −α, a sign the data
		// cannot tell (by 10 points of energy share on a synthetic membrane
		// with a scatter of 0.004 in F, TestSplitAtTheFittedDeformation).
		maxI1, at := -1.0, [4]float64{1, 0, 0, 1}
		for _, pt := range pr.Points {
			F := pt.F
			if p.ShearTakenAsZero {
				F[1], F[2] = 0, 0
			}
			k, err := NewKinematics(F)
			if err == nil && k.I1 > maxI1 {
				maxI1, at = k.I1, F
			}
		}
		ps.AtF = at
		resp, err := m.Evaluate(at)
		if err != nil {
			return nil, fmt.Errorf("protocol %s: %w", pr.Label, err)
		}
		ps.EnergyShare = make([]float64, len(m.Terms))
		ps.GroupEnergyShare = make([]float64, ng)
		for k, e := range resp.TermEnergy {
			if resp.Energy > 0 {
				ps.EnergyShare[k] = e / resp.Energy
			}
			ps.GroupEnergyShare[s.TermGroup[k]] += ps.EnergyShare[k]
		}
		s.Protocols = append(s.Protocols, ps)
	}
	return s, nil
}

// componentSplit shares component comp of protocol pi (netPeak its largest
// |modelled stress|, normalPeak the protocol's normal components') between
// m's terms and s's groups; contrib are the terms' contributions per row
// (PointContributions) and group a scratch buffer of one value per group.
func (s *StressSplit) componentSplit(p *Problem, m *Model, contrib [][]float64, group []float64, pi int, comp Component, netPeak, normalPeak float64) ComponentSplit {
	cs := ComponentSplit{Component: biaxial.Component(comp).String(), TermShare: make([]float64, len(m.Terms)),
		GroupShare: make([]float64, len(s.Groups)), Signed: make([]float64, len(m.Terms))}
	total, netSum, groupTotal := 0.0, 0.0, 0.0
	for r := range p.Target {
		if p.RowProtocol[r] != pi || p.RowComponent[r] != comp {
			continue
		}
		net := 0.0
		clear(group)
		for k := range m.Terms {
			v := contrib[k][r]
			cs.Signed[k] += v
			cs.TermShare[k] += math.Abs(v)
			total += math.Abs(v)
			net += v
			group[s.TermGroup[k]] += v
		}
		netSum += math.Abs(net)
		// A group's share is of its own summed contribution, as
		// the load-share figure draws it: two of its terms that
		// pull opposite ways carry their net, not both
		// magnitudes (until 2026-12-05 the card added its terms'
		// shares, up to 0.08 percentage points apart).
		for g, v := range group {
			cs.GroupShare[g] += math.Abs(v)
			groupTotal += math.Abs(v)
		}
	}
	for k := range m.Terms {
		if total > 0 {
			cs.TermShare[k] /= total
		}
	}
	for g := range cs.GroupShare {
		if groupTotal > 0 {
			cs.GroupShare[g] /= groupTotal
		}
	}
	cs.NetPeak, cs.NormalPeak = netPeak, normalPeak
	if NoLoadToShare(cs.NetPeak, cs.NormalPeak, netSum, total) {
		cs.NoShare = fmt.Sprintf("no share: the modelled %s stays within ±%.2g %s, under %.0f %% of the protocol's largest normal stress (%.3g %s), while its terms carry stresses that cancel",
			cs.Component, cs.NetPeak, p.Specimen.StressUnit, 100*NegligibleNet, cs.NormalPeak, p.Specimen.StressUnit)
		if total == 0 {
			cs.NoShare = fmt.Sprintf("no share: no term carries any %s stress in this protocol", cs.Component)
		}
		for k := range cs.TermShare {
			cs.TermShare[k] = math.NaN()
		}
		for g := range cs.GroupShare {
			cs.GroupShare[g] = math.NaN()
		}
	}
	return cs
}
