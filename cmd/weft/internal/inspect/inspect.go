// Package inspect summarises test files as weft reads them: per specimen
// and protocol the points kept, the stretch and stress ranges, the cycles
// and branch kept, the weights, warnings and notices, as a table or JSON.
package inspect

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// Document is the JSON summary of a set of specimens.
type Document struct {
	Specimens []specimenJSON `json:"specimens"`
}

type specimenJSON struct {
	Name       string   `json:"name"`
	File       string   `json:"file"`
	Sheet      string   `json:"sheet,omitempty"`
	Kind       string   `json:"stress_kind"`
	StressUnit string   `json:"stress_unit"`
	FromLoads  bool     `json:"from_loads"`
	Kinematics string   `json:"kinematics"`
	Measured   []string `json:"measured"`
	HasShear   bool     `json:"has_shear"`
	// ShearWithinScatter is set when F12 and F21 are non-zero but stay
	// within their scatter of zero with no shear stress given: read as no
	// shear information, as the card's data.shear_within_scatter says.
	ShearWithinScatter bool              `json:"shear_within_scatter,omitempty"`
	Reference          string            `json:"reference"`
	Geometry           *geometryJSON     `json:"geometry_mm,omitempty"`
	Meta               map[string]string `json:"meta"`
	Protocols          []protocolJSON    `json:"protocols"`
	Warnings           []warningJSON     `json:"warnings"`
	Notices            []string          `json:"notices"`
}

type geometryJSON struct {
	Thickness float64 `json:"thickness"`
	Size1     float64 `json:"size_1"`
	Size2     float64 `json:"size_2"`
}

type protocolJSON struct {
	Label          string                `json:"label"`
	Points         int                   `json:"points"`
	RawRows        int                   `json:"raw_rows"`
	SelectedPoints int                   `json:"selected_points"`
	Cycles         int                   `json:"cycles"`
	KeptCycle      int                   `json:"kept_cycle"`
	KeptBranch     string                `json:"kept_branch"`
	Kept           string                `json:"kept"`
	Stretch1       [2]float64            `json:"stretch_1"`
	Stretch2       [2]float64            `json:"stretch_2"`
	Stress         map[string][2]float64 `json:"stress"`
	Weight         map[string]float64    `json:"weight"`
	UserWeight     float64               `json:"user_weight"`
	RefF           [4]float64            `json:"reference_F"`
	Tare           map[string]float64    `json:"tare"`
	// Preload is the untared normal stress at the reference state
	// (biaxial.Protocol.Preload); StrainScatter the point-to-point scatter
	// of F11, F12, F21, F22 (biaxial.Protocol.StrainScatter).
	Preload       map[string]float64 `json:"preload"`
	StrainScatter [4]float64         `json:"strain_scatter"`
	Data          []pointJSON        `json:"data,omitempty"`
}

type pointJSON struct {
	Line   int                `json:"line"`
	Cycle  int                `json:"cycle"`
	Time   *float64           `json:"time_s,omitempty"`
	F      [4]float64         `json:"F"`
	Stress map[string]float64 `json:"stress"`
}

type warningJSON struct {
	Location string `json:"location"`
	Protocol string `json:"protocol,omitempty"`
	Message  string `json:"message"`
}

// protocolRanges returns the min/max of the axis stretches and of each
// measured stress component.
func protocolRanges(s *biaxial.Specimen, p *biaxial.Protocol) (l1, l2 [2]float64, st [biaxial.NumComponents][2]float64) {
	l1 = [2]float64{math.Inf(1), math.Inf(-1)}
	l2 = l1
	for c := range st {
		st[c] = l1
	}
	for i := range p.Points {
		pt := &p.Points[i]
		a, b := pt.Stretch1(), pt.Stretch2()
		l1 = [2]float64{math.Min(l1[0], a), math.Max(l1[1], a)}
		l2 = [2]float64{math.Min(l2[0], b), math.Max(l2[1], b)}
		for c := range st {
			v := pt.Stress[c]
			st[c] = [2]float64{math.Min(st[c][0], v), math.Max(st[c][1], v)}
		}
	}
	return
}

func measured(s *biaxial.Specimen) []biaxial.Component {
	var cs []biaxial.Component
	for c := biaxial.C11; c < biaxial.NumComponents; c++ {
		if s.Measured[c] {
			cs = append(cs, c)
		}
	}
	return cs
}

// NewDocument is the JSON summary of specs, with every kept point when
// withPoints is set.
func NewDocument(specs []*biaxial.Specimen, withPoints bool) *Document {
	doc := &Document{Specimens: []specimenJSON{}}
	for _, s := range specs {
		sj := specimenJSON{
			Name: s.Name, File: s.Source, Sheet: s.Sheet, Kind: s.Kind.String(), StressUnit: s.StressUnit,
			FromLoads: s.FromLoads, Kinematics: s.Kinematics.String(), HasShear: s.HasShear,
			ShearWithinScatter: s.ShearWithinScatter,
			Reference:          s.Reference, Meta: s.Meta, Measured: []string{},
			Protocols: []protocolJSON{}, Warnings: []warningJSON{}, Notices: append([]string{}, s.Notices...),
		}
		if sj.Meta == nil {
			sj.Meta = map[string]string{}
		}
		if g := s.Geometry; g != nil {
			sj.Geometry = &geometryJSON{g.Thickness, g.Size1, g.Size2}
		}
		cs := measured(s)
		for _, c := range cs {
			sj.Measured = append(sj.Measured, c.String())
		}
		for i := range s.Protocols {
			p := &s.Protocols[i]
			l1, l2, st := protocolRanges(s, p)
			pj := protocolJSON{
				Label: p.Label, Points: len(p.Points), RawRows: p.RawRows, SelectedPoints: p.SelectedPoints,
				Cycles: p.Cycles, KeptCycle: p.KeptCycle, KeptBranch: p.KeptBranch.String(), Kept: p.Kept,
				Stretch1: l1, Stretch2: l2, UserWeight: p.UserWeight, RefF: p.RefF,
				Stress: map[string][2]float64{}, Weight: map[string]float64{}, Tare: map[string]float64{},
				Preload: map[string]float64{}, StrainScatter: p.StrainScatter,
			}
			for _, c := range cs {
				pj.Stress[c.String()] = st[c]
				pj.Weight[c.String()] = p.Weight[c]
				pj.Tare[c.String()] = p.Tare[c]
				pj.Preload[c.String()] = p.Preload[c]
			}
			if withPoints {
				for _, pt := range p.Points {
					q := pointJSON{Line: pt.Line, Cycle: pt.Cycle, F: pt.F, Stress: map[string]float64{}}
					if !math.IsNaN(pt.Time) {
						t := pt.Time
						q.Time = &t
					}
					for _, c := range cs {
						q.Stress[c.String()] = pt.Stress[c]
					}
					pj.Data = append(pj.Data, q)
				}
			}
			sj.Protocols = append(sj.Protocols, pj)
		}
		for _, wn := range s.Warnings {
			sj.Warnings = append(sj.Warnings, warningJSON{Location: wn.Location(), Protocol: wn.Protocol, Message: wn.Message})
		}
		doc.Specimens = append(doc.Specimens, sj)
	}
	return doc
}

func rangeText(r [2]float64) string {
	return fmt.Sprintf("%.4g … %.4g", r[0], r[1])
}

// WriteText writes the summary of specs as a table per specimen.
func WriteText(w io.Writer, specs []*biaxial.Specimen) error {
	var b strings.Builder
	for k, s := range specs {
		if k > 0 {
			b.WriteString("\n")
		}
		src := s.Source
		if s.Sheet != "" {
			src += " [sheet " + s.Sheet + "]"
		}
		fmt.Fprintf(&b, "%s — %s\n", s.Name, src)
		if card.SaysSynthetic(s.Name, filepath.Base(s.Source), s.Meta["tissue"], s.Meta["notes"]) {
			// As the card and the report of a fit to these data say it.
			b.WriteString("  label:      SYNTHETIC: the file says its data are synthetic (invented, not measured)\n")
		}
		stress := fmt.Sprintf("%s stress in %s", s.Kind, s.StressUnit)
		if s.FromLoads && s.Geometry != nil {
			stress += fmt.Sprintf(", from loads (thickness %.4g mm, size_1 %.4g mm, size_2 %.4g mm)",
				s.Geometry.Thickness, s.Geometry.Size1, s.Geometry.Size2)
		}
		fmt.Fprintf(&b, "  stress:     %s\n", stress)
		shear := "none (normal stresses and a pure stretch only: a fibre angle's sign cannot be told)"
		if s.ShearWithinScatter {
			// F12 and F21 are not zero here, so "a pure stretch only" would
			// be false; they are noise the fit takes as zero.
			shear = "none (F12 and F21 stay within their scatter of zero, taken as zero; no shear stress: a fibre angle's sign cannot be told)"
		} else if s.HasShear {
			shear = "present"
		}
		fmt.Fprintf(&b, "  kinematics: %s; shear information: %s\n", s.Kinematics, shear)
		fmt.Fprintf(&b, "  reference:  %s\n", s.Reference)
		cs := measured(s)
		tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
		hdr := []string{"  protocol", "points", "cycles", "kept", "stretch 1", "stretch 2"}
		for _, c := range cs {
			hdr = append(hdr, "stress "+c.String())
		}
		for _, c := range cs {
			hdr = append(hdr, "weight "+c.String())
		}
		fmt.Fprintln(tw, strings.Join(hdr, "\t"))
		for i := range s.Protocols {
			p := &s.Protocols[i]
			l1, l2, st := protocolRanges(s, p)
			kept := p.KeptBranch.String()
			if p.KeptCycle > 0 {
				kept = fmt.Sprintf("cycle %d, %s", p.KeptCycle, kept)
			} else {
				kept = "all cycles, " + kept
			}
			row := []string{"  " + p.Label, fmt.Sprint(len(p.Points)), fmt.Sprint(p.Cycles), kept, rangeText(l1), rangeText(l2)}
			for _, c := range cs {
				row = append(row, rangeText(st[c]))
			}
			for _, c := range cs {
				row = append(row, fmt.Sprintf("%.4g", p.Weight[c]))
			}
			fmt.Fprintln(tw, strings.Join(row, "\t"))
		}
		tw.Flush()
		fmt.Fprintf(&b, "  (stresses in %s, weights in 1/%s; %d points in all)\n", s.StressUnit, s.StressUnit, s.NumPoints())
		for i := range s.Protocols {
			fmt.Fprintf(&b, "  %s: %s\n", s.Protocols[i].Label, s.Protocols[i].Kept)
		}
		if len(s.Warnings) > 0 {
			fmt.Fprintf(&b, "  warnings (%d):\n", len(s.Warnings))
			for _, wn := range s.Warnings {
				fmt.Fprintf(&b, "    %s: %s\n", wn.Location(), wn.Message)
			}
		}
		if len(s.Notices) > 0 {
			fmt.Fprintf(&b, "  notices (%d):\n", len(s.Notices))
			for _, n := range s.Notices {
				fmt.Fprintf(&b, "    %s\n", n)
			}
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}
