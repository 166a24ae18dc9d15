package report

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/weft-tools/weft/aniso/card"
)

// The page's content, built section by section from the Input; each
// builder fills its part of the reportView.

// view formats the input for the template.
func (in *Input) view(figs []renderedFigure, strain bool) *reportView {
	c, d := in.card, in.data
	v := &reportView{Specimen: c.Specimen, Tissue: d.Tissue, DataNotes: sentence(d.Notes), Synthetic: in.isSynthetic(), Cautions: card.Cautions,
		Limits: "Planar biaxial data constrain the in-plane response only; the out-of-plane response and the response to I5 are not fully determined by them (Holzapfel & Ogden 2009, Math Mech Solids 14:474–489)."}
	if v.Specimen == "" {
		v.Specimen = d.Specimen
	}
	v.Abscissa = "stretch λ"
	if strain {
		v.Abscissa = "Green strain E = ½(λ² − 1)"
	}
	in.glance(v)
	in.dataSection(v)
	in.modelSection(v)
	placeFigures(v, figs)
	in.splitSection(v)
	in.verdictSection(v)
	in.selectionSection(v)
	in.conventionsSection(v)
	v.Files = in.folderFiles(len(figs))
	return v
}

// angle writes a family angle; without shear information its sign is
// unknown and it is written ±|α|.
func (in *Input) angle(a float64) string {
	if in.signUnknown() {
		return "±" + fmtDeg(math.Abs(a))
	}
	return fmtDeg(a)
}

// glance writes the facts of "At a glance": how the model was found, its energy, families, verdict, worst fit and data.
func (in *Input) glance(v *reportView) {
	c, d, fs := in.card, in.data, in.fit
	how := "chosen form: " + strings.Join(fs.Terms, " + ") + ", " + fs.Layout + " fibre layout (fitted as asked, not discovered)"
	if in.sel != nil {
		how = "discovered: " + in.sel.Chosen
	}
	v.HowFound = how
	minR2 := math.Inf(1)
	for _, m := range fs.Metrics {
		if r := float64(m.R2); !math.IsNaN(r) {
			minR2 = math.Min(minR2, r)
		}
	}
	var angles []string
	for _, f := range c.Families {
		if f.AngleDeg != nil {
			angles = append(angles, f.Name+" at "+in.angle(*f.AngleDeg))
		}
	}
	fams := "none (isotropic)"
	if len(angles) > 0 {
		fams = strings.Join(angles, ", ")
	}
	if pair := PairText(c.Layout); pair != "" {
		fams += "; " + pair
	}
	v.Summary = []htmlFact{{"Model", how}, {"Energy", strings.TrimPrefix(c.Energy, "Psi = ")}, {"Fibre families", fams}}
	if in.verdict != nil {
		v.Summary = append(v.Summary, htmlFact{"Family verdict", verdictText(in.verdict.Families)})
	}
	if !math.IsInf(minR2, 1) {
		v.Summary = append(v.Summary, htmlFact{"Lowest R² (any protocol and axis)", fmtR2(minR2)})
	}
	v.Summary = append(v.Summary, htmlFact{"Data", fmt.Sprintf("%d protocols, %s stress in %s", len(in.table.protocols), d.StressKind, d.StressUnit)})
}

// dataSection writes the specimen, its protocols, warnings and notices, and the range of the fitted data.
func (in *Input) dataSection(v *reportView) {
	c, d := in.card, in.data
	shear := "none: pure biaxial stretch; the sign of a fibre angle cannot be determined"
	if d.HasShear {
		shear = "present (F12, F21 or shear stress measured)"
	}
	v.Data = []htmlFact{{"Specimen", d.Specimen}, {"Source file", d.Source}}
	if d.Sheet != "" {
		v.Data = append(v.Data, htmlFact{"Sheet", d.Sheet})
	}
	if d.Tissue != "" {
		v.Data = append(v.Data, htmlFact{"Tissue", d.Tissue})
	}
	if d.Notes != "" {
		v.Data = append(v.Data, htmlFact{"Notes", d.Notes})
	}
	if d.Axis1 != "" {
		v.Data = append(v.Data, htmlFact{"Axis 1", d.Axis1})
	}
	v.Data = append(v.Data, htmlFact{"Stress", d.StressKind + " stress in " + d.StressUnit}, htmlFact{"Reference state", d.Reference},
		htmlFact{"Shear information", shear})
	v.Protocols.Head = []string{"protocol", "points fitted", "kept branch", "cycles", "weight"}
	for _, p := range d.Protocols {
		v.Protocols.Rows = append(v.Protocols.Rows, htmlRow{Cells: []string{p.Label, fmt.Sprint(p.Points), p.Kept, fmt.Sprint(p.Cycles), fnum(p.Weight, 4)}})
	}
	v.Warnings, v.Notices = d.Warnings, d.Notices
	if dr := in.dataRange; dr != nil {
		rng := func(r [2]float64) string { return fnum(r[0], 5) + " to " + fnum(r[1], 5) }
		v.Range = []htmlFact{{"Stretch λ1 (F11)", rng(dr.Stretch1)}, {"Stretch λ2 (F22)", rng(dr.Stretch2)}, {"Shear F12, F21", rng(dr.Shear)}}
		for i, r := range dr.FibreStretch {
			name := fmt.Sprintf("family %d", i+1)
			if i < len(c.Families) {
				name = c.Families[i].Name
			}
			v.Range = append(v.Range, htmlFact{"Fibre stretch √I4 of " + name, rng(r)})
		}
	}
}

// modelSection writes the energy, the term, family and parameter tables, the angle profiles and the fit quality.
func (in *Input) modelSection(v *reportView) {
	c := in.card
	v.Energy = c.Energy
	v.EnergyLaTeX = c.EnergyLaTeX
	v.Terms.Head = []string{"term", "family", "weight [" + c.StressUnit + "]", "parameters", "term w·f(x)"}
	for _, t := range c.Terms {
		w := math.NaN()
		if t.Weight != nil {
			w = *t.Weight
		}
		var ps []string
		var names []string
		for k := range t.Params {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			ps = append(ps, k+" = "+fnum(t.Params[k], 6))
		}
		fam := t.Family
		if fam == "" {
			fam = "matrix"
		}
		v.Terms.Rows = append(v.Terms.Rows, htmlRow{Cells: []string{t.ID, fam, fnum(w, 6), strings.Join(ps, ", "), t.Formula}})
	}
	v.Families.Head = []string{"family", "angle α", "sign known", "spread"}
	for _, f := range c.Families {
		a, k := math.NaN(), "ideal (aligned)"
		if f.AngleDeg != nil {
			a = *f.AngleDeg
		}
		switch {
		case f.Concentration != nil:
			k = "in the plane, concentration b = " + fnum(*f.Concentration, 4)
		case f.Dispersion != nil && *f.Dispersion != 0:
			k = "dispersion κ = " + fnum(*f.Dispersion, 4)
		}
		known := "not stated"
		if f.AngleSignKnown != nil {
			known = map[bool]string{true: "yes", false: "no: ±α"}[*f.AngleSignKnown]
		}
		v.Families.Rows = append(v.Families.Rows, htmlRow{Cells: []string{f.Name, in.angle(a), known, k}})
	}
	in.parameterSection(v)
	in.qualitySection(v)
}

// parameterSection writes the parameter table with its statuses and the
// angle profiles' intervals.
func (in *Input) parameterSection(v *reportView) {
	fs := in.fit
	v.Params.Head = []string{"parameter", "value", "95 % interval", "std. error", "unit", "status"}
	var statuses []string
	for _, e := range fs.Estimates {
		if e.Status == "inactive" && e.Kind != "weight" {
			continue
		}
		val := fnum(float64(e.Value), 5)
		if e.Kind == "angle" && in.signUnknown() && (e.Name == "angle" || strings.HasPrefix(e.Name, "angle_")) {
			val = "±" + fnum(math.Abs(float64(e.Value)), 5)
		}
		iv := "—"
		if lo, hi := float64(e.CI95[0]), float64(e.CI95[1]); !math.IsNaN(lo) && !math.IsNaN(hi) {
			iv = "[" + fnum(lo, 4) + ", " + fnum(hi, 4) + "]"
		}
		unit := e.Unit
		if unit == "" {
			unit = "–"
		}
		v.Params.Rows = append(v.Params.Rows, htmlRow{Cells: []string{e.Name, val, iv, fnum(float64(e.StdErr), 3), unit, e.Status}})
		statuses = append(statuses, e.Status)
	}
	v.Statuses = StatusLegend(statuses)
	for _, p := range fs.Profiles {
		s := fmt.Sprintf("%s: profile-likelihood 95 %% interval %s to %s", p.Name, fmtDeg(float64(p.IntervalDeg[0])), fmtDeg(float64(p.IntervalDeg[1])))
		if p.NotDetermined {
			s = fmt.Sprintf("%s: not determined: the loss profile stays below the 95 %% threshold over the angle's whole range", p.Name)
		} else if !p.Closed {
			s += " (not bounded by the data at one end)"
		}
		if p.Mirrored && !p.NotDetermined {
			s += "; sign not determined, the mirror image is equally good"
		}
		v.Profiles = append(v.Profiles, s)
	}
}

// qualitySection writes the flags, the notes on what the data determine
// and the fit-quality table.
func (in *Input) qualitySection(v *reportView) {
	fs := in.fit
	v.Flags, v.Notes = fs.Flags, fs.Notes
	v.Metrics.Head = []string{"protocol", "component", "points", "R²", "RMSE [" + fs.StressUnit + "]", "NRMSE"}
	if in.heldout != nil {
		v.Metrics.Head = append(v.Metrics.Head, "held-out R²")
	}
	for _, m := range fs.Metrics {
		nr := "—"
		if x := float64(m.NRMSE); !math.IsNaN(x) {
			nr = fmt.Sprintf("%.2f %%", 100*x)
		}
		row := []string{m.Protocol, compSymbol(fs.StressKind, m.Component), fmt.Sprint(m.Points), fmtR2(float64(m.R2)), fnum(float64(m.RMSE), 3), nr}
		if in.heldout != nil {
			row = append(row, in.heldoutR2(m.Protocol, m.Component))
		}
		v.Metrics.Rows = append(v.Metrics.Rows, htmlRow{Cells: row})
	}
}

// placeFigures sorts the rendered figures into the page's sections by their names.
func placeFigures(v *reportView, figs []renderedFigure) {
	for _, f := range figs {
		hf := toHTMLFigure(f)
		switch {
		case f.name == "fit-all" || strings.HasPrefix(f.name, "fit-"):
			v.FitFigures = append(v.FitFigures, hf)
		case strings.HasPrefix(f.name, "residuals"):
			v.ResidualFigures = append(v.ResidualFigures, hf)
		case f.name == "split-shares":
			v.ShareFigure = &hf
		case strings.HasPrefix(f.name, "split-"):
			v.SplitFigures = append(v.SplitFigures, hf)
		case f.name == "angle-profile":
			v.ProfileFigure = &hf
		case f.name == "pareto":
			v.ParetoFigure = &hf
		case f.name == "cross-r2":
			v.CrossFigure = &hf
		}
	}
}

// splitSection writes the matrix/fibre split table.
func (in *Input) splitSection(v *reportView) {
	fs := in.fit
	if sp := in.split; sp != nil {
		v.SplitMeasure = sp.Measure
		v.SplitTable.Head = []string{"protocol", "component"}
		for _, g := range sp.Groups {
			v.SplitTable.Head = append(v.SplitTable.Head, g)
		}
		v.SplitTable.Head = append(v.SplitTable.Head, "energy at the largest deformation")
		for _, pp := range sp.Protocols {
			for ci, cc := range pp.Components {
				row := []string{pp.Protocol, compSymbol(fs.StressKind, cc.Component)}
				for _, g := range sp.Groups {
					row = append(row, pct(float64(cc.GroupShare[g])))
				}
				e := ""
				if ci == 0 {
					var es []string
					for _, g := range sp.Groups {
						es = append(es, g+" "+pct(float64(pp.GroupEnergyShare[g])))
					}
					e = strings.Join(es, ", ")
				}
				v.SplitTable.Rows = append(v.SplitTable.Rows, htmlRow{Cells: append(row, e)})
			}
		}
	}
}

// verdictSection writes the family verdict and its table of fibre layouts.
func (in *Input) verdictSection(v *reportView) {

	if vd := in.verdict; vd != nil {
		v.HasVerdict = true
		v.Verdict, v.Reason, v.Decider = verdictText(vd.Families), vd.Reason, vd.Decider
		v.VerdictTable.Head = []string{"fibre layout (best model of each)", "ΔBIC", "held-out error"}
		for _, k := range formKeysInOrder(vd.DeltaBIC) {
			b, okb := vd.DeltaBIC[k]
			e, oke := vd.HeldoutError[k]
			if !okb && !oke {
				continue
			}
			bs, es := "—", "—"
			if okb {
				bs = fnum(float64(b), 4)
			}
			if oke {
				es = fnum(float64(e), 4)
			}
			v.VerdictTable.Rows = append(v.VerdictTable.Rows, htmlRow{Cells: []string{layoutKeyText(k), bs, es}, Mark: k == vd.Form})
		}
	}
}

// selectionSection writes the selection rule and the tables of the model forms kept and of the presets.
func (in *Input) selectionSection(v *reportView) {

	if sel := in.sel; sel != nil {
		v.HasSelection = true
		v.Rule, v.CVMetric, v.Search = sel.Rule, sel.HeldoutMetric, sel.Search
		head := []string{"model form", "terms", "parameters", "loss", "BIC", "held-out error", "lowest R²"}
		v.Pareto.Head = append(head, "")
		chosenBIC := math.NaN()
		for _, cc := range sel.Pareto {
			if cc.Chosen {
				chosenBIC = float64(cc.BIC)
			}
		}
		for _, cc := range sel.Pareto {
			mark := ""
			if cc.Chosen {
				mark = "chosen"
			}
			v.Pareto.Rows = append(v.Pareto.Rows, htmlRow{Cells: append(candidateCells(cc), mark), Mark: cc.Chosen})
		}
		v.Presets.Head = append(head, "ΔBIC vs chosen")
		for _, cc := range sel.Presets {
			v.Presets.Rows = append(v.Presets.Rows, htmlRow{Cells: append(candidateCells(cc), fnum(float64(cc.BIC)-chosenBIC, 4))})
		}
	}
}

// conventionsSection writes the card's conventions.
func (in *Input) conventionsSection(v *reportView) {
	c := in.card
	if cv := c.Conventions; cv != nil {
		v.Conventions = []htmlFact{{"Angle", cv.Angle}, {"Kinematics", cv.Kinematics}, {"Invariants", cv.Invariants}, {"Energy", cv.Energy},
			{"Fibre switch", cv.FibreSwitch}, {"Dispersion", cv.Dispersion}, {"Stress", cv.Stress}, {"Normalisations", cv.Normalisations}}
		if cv.InPlane != "" { // cards written before in-plane dispersion lack it
			v.Conventions = append(v.Conventions, htmlFact{"In-plane dispersion", cv.InPlane})
		}
		if cv.GreenStrain != "" { // cards written before the Fung-type term lack it
			v.Conventions = append(v.Conventions, htmlFact{"Green strain (fung)", cv.GreenStrain})
		}
	}
}
