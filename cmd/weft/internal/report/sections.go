package report

import (
	"fmt"
	"html/template"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/cmd/weft/internal/fe"
	"github.com/weft-tools/weft/terms"
)

// The report's sections on admissibility, the load split, and the methods
// and traceability of the fit.

// admissibleSection runs weft check's checks on the fitted range and on
// the default grid and tabulates them side by side.
func (in *Input) admissibleSection(v *reportView) {
	grids := []struct {
		name string
		g    aniso.StabilityGrid
	}{}
	if dr := in.dataRange; dr != nil {
		lo, hi := math.Min(dr.Stretch1[0], dr.Stretch2[0]), math.Max(dr.Stretch1[1], dr.Stretch2[1])
		shear := math.Max(math.Abs(dr.Shear[0]), math.Abs(dr.Shear[1]))
		g := aniso.StabilityGrid{StretchMin: lo, StretchMax: hi, Steps: 13, ShearMax: shear, Directions: 180}
		if g.Validate() == nil && hi > lo {
			grids = append(grids, struct {
				name string
				g    aniso.StabilityGrid
			}{fmt.Sprintf("fitted range: λ %s to %s, shear ±%s", fsig(lo, 3), fsig(hi, 3), fsig(shear, 2)), g})
		}
	}
	d := aniso.DefaultStabilityGrid()
	grids = append(grids, struct {
		name string
		g    aniso.StabilityGrid
	}{fmt.Sprintf("default grid: λ %s to %s, shear ±%s", fsig(d.StretchMin, 2), fsig(d.StretchMax, 2), fsig(d.ShearMax, 2)), d})
	v.Admissible = htmlTable{Head: []string{"check"}}
	var reps []*fe.CheckReport
	var short []string // each report's grid in a few words
	for _, g := range grids {
		rep, err := fe.CheckCard("model.json", in.card, in.model, g.g, in.dataRange)
		if err != nil {
			v.AdmissibleNote = append(v.AdmissibleNote, "The check could not run on the "+g.name+": "+err.Error())
			continue
		}
		reps = append(reps, rep)
		short = append(short, strings.SplitN(g.name, ":", 2)[0])
		v.Admissible.Head = append(v.Admissible.Head, g.name)
	}
	if len(reps) == 0 {
		return
	}
	row := func(name string, cell func(r *fe.CheckReport) string) {
		cells := []string{name}
		for _, r := range reps {
			cells = append(cells, cell(r))
		}
		v.Admissible.Rows = append(v.Admissible.Rows, htmlRow{Cells: cells})
	}
	row("stress-free reference", func(r *fe.CheckReport) string { return passWord(r.Reference.Passed) })
	// weft check counts a point whose eigenvalue of either criterion is
	// round-off once, under material stability (unresolved_points); both
	// criteria's cells say so, as neither passed nor failed it.
	row("material stability", func(r *fe.CheckReport) string {
		return checkCell(r.Stability.Passed, r.Stability.FailingPoints, r.Grid.Evaluated, r.Stability.Unresolved)
	})
	row("strong ellipticity", func(r *fe.CheckReport) string {
		return checkCell(r.Ellipticity.Passed, r.Ellipticity.FailingPoints, r.Grid.Evaluated, r.Stability.Unresolved)
	})
	row("polyconvexity of every term", func(r *fe.CheckReport) string {
		if r.Polyconvexity.AllTerms {
			return "yes"
		}
		return "no (reported, not failed)"
	})
	row("overall", func(r *fe.CheckReport) string { return passWord(r.Passed) })
	for i, r := range reps {
		if u := r.Stability.Unresolved; u > 0 {
			is, it := "points are", "them"
			if u == 1 {
				is, it = "point is", "it"
			}
			v.AdmissibleNote = append(v.AdmissibleNote, fmt.Sprintf("On the %s %d %s not resolved: an eigenvalue of the stability or the ellipticity criterion lies closer to zero than %s times the tangent's largest entry (round-off, where exponential terms make the tangent huge), so weft check neither passes nor fails %s (unresolved_points); the rows above count %s apart.",
				short[i], u, is, fsig(aniso.RelativeResolution, 1), it, it))
		}
	}
	// The default grid reaches beyond the data by design; its many
	// extrapolation warnings are one sentence here.
	seen := map[string]bool{}
	beyond := false
	for _, r := range reps {
		for _, s := range append(append([]string{}, r.Failures...), r.Warnings...) {
			if strings.Contains(s, "beyond the fitted data") {
				beyond = true
				continue
			}
			if !seen[s] {
				seen[s] = true
				v.AdmissibleNote = append(v.AdmissibleNote, capitalise(minusSigns(s)))
			}
		}
	}
	if beyond {
		v.AdmissibleNote = append(v.AdmissibleNote, "The default grid reaches beyond the fitted data (stretches, shear and fibre stretch): there the check tests the formula, not a model supported by data; weft check lists each quantity.")
	}
}

// checkCell writes a grid criterion's outcome over the evaluated points:
// the points that passed or failed and, apart, the unresolved ones, which
// weft check neither passes nor fails, so that a pass does not claim them.
func checkCell(passed bool, failing, evaluated, unresolved int) string {
	if unresolved > 0 {
		if passed {
			return fmt.Sprintf("passes on %d of %d points; %d unresolved", evaluated-unresolved, evaluated, unresolved)
		}
		return fmt.Sprintf("fails at %d of %d points; %d unresolved", failing, evaluated, unresolved)
	}
	if passed {
		return fmt.Sprintf("passes (%d points)", evaluated)
	}
	return fmt.Sprintf("fails at %d of %d points", failing, evaluated)
}

// passWord writes a check's outcome.
func passWord(ok bool) string {
	if ok {
		return "passes"
	}
	return "fails"
}

// splitSection writes the load-sharing figure and its tables: where the
// fibres take over half the load, each group's share per protocol and
// component (none where the component carries no net load), each term's
// share, and the energy split at each protocol's largest deformation.
func (in *Input) splitSection(v *reportView, strain bool) {
	v.SplitFigure = v.fig("load-share")
	in.takeoverTable(v, strain)
	v.TakeoverTitle = "Where the fibres take over half of the load, and the strain energy at each protocol's largest deformation"
	if len(v.Takeover.Rows) == 0 {
		// No take-over columns (a model without fibres): only the energy.
		v.TakeoverTitle = "The strain energy at each protocol's largest deformation"
	}
	sp := in.split
	if sp == nil {
		return
	}
	in.sharesTable(v)
	in.energyColumns(v)
}

// takeoverTable writes, per protocol and axis, where the fibres take over
// half of the load, in stretch or, with strain, in Green strain, as the
// load-sharing figure marks it.
func (in *Input) takeoverTable(v *reportView, strain bool) {
	t := in.table
	groups := t.groupsOf()
	if len(groups) >= 2 && t.hasNormal() {
		v.Takeover = htmlTable{Head: []string{"protocol"}, Num: []bool{false}}
		for _, ci := range t.componentsOf(false) {
			v.Takeover.Head = append(v.Takeover.Head, "fibres take over half, axis "+t.comps[ci][:1])
			v.Takeover.Num = append(v.Takeover.Num, false)
		}
		for _, pr := range t.protocols {
			cells := []string{pr.label}
			for _, ci := range t.componentsOf(false) {
				xs := xsOf(pr.F, t.comps[ci], strain)
				to, ok := takeoverOf(xs, fibreFraction(groups, t.groupShares(pr, ci, groups)))
				a := abscissaComp(pr.F, t.comps[ci])
				sym := "λ"
				switch {
				case strain:
					sym = "E" + a // E11 or E22, the other axis's when this one is held
				case a != t.comps[ci]:
					sym = "λ" + a[:1] // the axis is held: against the other's stretch
				}
				cells = append(cells, takeoverText(to, ok, sym))
			}
			v.Takeover.Rows = append(v.Takeover.Rows, htmlRow{Cells: cells})
		}
	}
}

// sharesTable writes each group's and term's share per protocol and
// component, none where the component carries no net load.
func (in *Input) sharesTable(v *reportView) {
	t, sp := in.table, in.split
	v.SplitMeasure = sp.Measure
	v.Shares = htmlTable{Head: []string{"protocol", "component"}, Num: []bool{false, false}}
	for _, g := range sp.Groups {
		v.Shares.Head = append(v.Shares.Head, groupName(g))
		v.Shares.Num = append(v.Shares.Num, true)
	}
	if len(sp.Terms) > 1 {
		for _, term := range sp.Terms {
			v.Shares.Head = append(v.Shares.Head, term)
			v.Shares.Num = append(v.Shares.Num, true)
		}
	}
	v.Shares.Head = append(v.Shares.Head, "note")
	v.Shares.Num = append(v.Shares.Num, false)
	// A component without a share in every protocol is named once in the
	// note instead of a row of dashes per protocol.
	noShare := -1.0
	everywhere := map[string]bool{}
	for _, c := range t.comps {
		everywhere[c] = true
	}
	notes := map[[2]string]string{}
	for _, pp := range sp.Protocols {
		for _, cc := range pp.Components {
			n := in.noShare(pp.Protocol, cc)
			notes[[2]string{pp.Protocol, cc.Component}] = n
			everywhere[cc.Component] = everywhere[cc.Component] && n != ""
			if n != "" {
				noShare = math.Max(noShare, in.netPeak(pp.Protocol, cc.Component))
			}
		}
	}
	var omitted []string
	for _, c := range t.comps {
		if everywhere[c] {
			omitted = append(omitted, compSymbol(t.kind, c))
		}
	}
	for _, pp := range sp.Protocols {
		for _, cc := range pp.Components {
			if everywhere[cc.Component] {
				continue
			}
			note := notes[[2]string{pp.Protocol, cc.Component}]
			row := []string{pp.Protocol, compSymbol(t.kind, cc.Component)}
			for _, g := range sp.Groups {
				x := float64(cc.GroupShare[g])
				if note != "" {
					x = math.NaN()
				}
				row = append(row, pct(x))
			}
			if len(sp.Terms) > 1 {
				for _, x := range cc.TermShare {
					if note != "" {
						x = card.Num(math.NaN())
					}
					row = append(row, pct(float64(x)))
				}
			}
			short := ""
			if note != "" {
				short = "net ≈ 0: no share"
			}
			v.Shares.Rows = append(v.Shares.Rows, htmlRow{Cells: append(row, short)})
		}
	}
	if noShare >= 0 {
		which := "A component marked “net ≈ 0” has no share"
		if len(omitted) > 0 {
			which = strings.Join(omitted, " and ") + " have no share in any protocol (no rows above)"
		}
		v.SharesNote = fmt.Sprintf("%s: the modelled stress stays under %.0f %% of the protocol's largest normal stress (here at most %s %s) while the terms carry stresses that cancel, so a share of their magnitudes would describe nothing the component carries.",
			which, 100*aniso.NegligibleNet, fsig(noShare, 2), t.unit)
	}
}

// energyColumns adds the energy split at each protocol's largest
// deformation to the take-over table, one row per protocol.
func (in *Input) energyColumns(v *reportView) {
	sp := in.split
	if len(v.Takeover.Rows) != len(sp.Protocols) {
		v.Takeover = htmlTable{Head: []string{"protocol"}, Num: []bool{false}}
		for _, pp := range sp.Protocols {
			v.Takeover.Rows = append(v.Takeover.Rows, htmlRow{Cells: []string{pp.Protocol}})
		}
	}
	v.Takeover.Head = append(v.Takeover.Head, "largest F11, F22")
	v.Takeover.Num = append(v.Takeover.Num, true)
	for _, g := range sp.Groups {
		v.Takeover.Head = append(v.Takeover.Head, "energy: "+groupName(g))
		v.Takeover.Num = append(v.Takeover.Num, true)
	}
	for i, pp := range sp.Protocols {
		row := append(v.Takeover.Rows[i].Cells, fsig(pp.AtF[0], 4)+", "+fsig(pp.AtF[3], 4))
		for _, g := range sp.Groups {
			row = append(row, pct(float64(pp.GroupEnergyShare[g])))
		}
		v.Takeover.Rows[i].Cells = row
	}
}

// netPeak is the largest |modelled stress| of a component of a protocol in
// fit.csv.
func (in *Input) netPeak(protocol, comp string) float64 {
	t := in.table
	ci := componentIndex(t.comps, comp)
	peak := 0.0
	for _, pr := range t.protocols {
		if pr.label == protocol && ci >= 0 {
			for _, v := range pr.model[ci] {
				if !bad(v) {
					peak = math.Max(peak, math.Abs(v))
				}
			}
		}
	}
	return peak
}

// noShare says why a component has no share, or is empty: the card's
// reason, or, for a card written before it gave one, the same test on
// fit.csv's modelled stress and term contributions (aniso.NoLoadToShare).
func (in *Input) noShare(protocol string, cc card.SplitCompCard) string {
	t := in.table
	ci := componentIndex(t.comps, cc.Component)
	for _, pr := range t.protocols {
		if pr.label != protocol || ci < 0 {
			continue
		}
		net, normal := 0.0, 0.0
		for _, v := range pr.model[ci] {
			if !bad(v) {
				net = math.Max(net, math.Abs(v))
			}
		}
		// The terms cancel when the magnitude of their sum is a small part
		// of the sum of their magnitudes, both summed over the points.
		sum, gross := 0.0, 0.0
		for i := range pr.F {
			s := 0.0
			for k := range t.terms {
				if c := pr.contrib[k][ci]; i < len(c) && !bad(c[i]) {
					s += c[i]
					gross += math.Abs(c[i])
				}
			}
			sum += math.Abs(s)
		}
		for _, cj := range t.componentsOf(false) {
			for _, v := range pr.model[cj] {
				if !bad(v) {
					normal = math.Max(normal, math.Abs(v))
				}
			}
		}
		if cc.NoShare != "" || aniso.NoLoadToShare(net, normal, sum, gross) {
			return fmt.Sprintf("no share: net ≈ 0 (|%s| ≤ %s %s, under %.0f %% of %s %s); its terms cancel", compSymbol(t.kind, cc.Component), fsig(net, 2), t.unit, 100*aniso.NegligibleNet, fsig(normal, 3), t.unit)
		}
	}
	if cc.NoShare != "" {
		return "no share: net ≈ 0; its terms cancel"
	}
	return ""
}

// takeoverText writes where the fibres take over half of an axis's load,
// at the stretch sym ("λ", the axis's own, or "λ1"/"λ2" for a held axis
// read against the other's).
func takeoverText(to takeover, ok bool, sym string) string {
	switch {
	case !ok:
		return "—"
	case to.from:
		return "fibres > ½ from the start (" + sym + " = " + fsig(to.first, 4) + ")"
	case to.never:
		return "matrix > ½ throughout (to " + sym + " = " + fsig(to.last, 4) + ")"
	}
	return sym + " = " + fsig(to.at, 4)
}

// presetTitle is pr's title for a sentence that cites pr.Source: a title
// naming the authors its source cites first ("two-family fibre model of
// Holzapfel, Gasser & Ogden") drops them, since the citation names them.
func presetTitle(pr *terms.Preset) string {
	title := pr.Title
	if i := strings.LastIndex(title, " of "); i > 0 && strings.HasPrefix(pr.Source, title[i+len(" of "):]) {
		title = title[:i]
	}
	return title
}

// methodsSection writes a paragraph a paper can quote, its references and
// the traceability of the fit.
func (in *Input) methodsSection(v *reportView, o Options) {
	c, d, fs := in.card, in.data, in.fit
	var b strings.Builder
	version := "weft"
	if p := c.Provenance; p != nil {
		version = "weft " + p.VersionText()
	}
	points := in.pointCount()
	fmt.Fprintf(&b, "Planar biaxial data of specimen %s (%s, %d points of %s stress; %s) were fitted with %s, an open-source tool for planar soft tissue. ",
		d.Specimen, protocolCount(len(d.Protocols)), points, kindName(d.StressKind), keptWords(d), version)
	pre, smoothed := preprocessingWords(c, d)
	b.WriteString(pre)
	b.WriteString("Each protocol and stress component was weighted by the inverse of its stress range and the square root of its number of points" + protocolWeightWords(d.Protocols) + ". ")
	if in.sel != nil {
		b.WriteString("The strain energy was discovered from a catalogue of isotropic terms (in I1, I2 and the principal stretches) and fibre-family terms (in the fibre invariant I4, optionally dispersed), with none, one or two fibre families, by variable projection: " +
			"term weights by non-negative least squares (Lawson & Hanson 1974) and fibre angles, dispersion and shape parameters by bounded Levenberg–Marquardt (Golub & Pereyra 1973; Kaufman 1975) from a global scan of the angles. ")
		if in.crossValidated() {
			b.WriteString("Model forms were compared by leave-one-protocol-out cross-validation, and the smallest model whose held-out error lay within one standard error of the best was chosen (Hastie, Tibshirani & Friedman 2009). ")
		} else if len(d.Protocols) == 1 {
			// Discovery's rule for one protocol (selection.rule): no
			// cross-validation, the lowest BIC inside the verdict's form.
			b.WriteString("With one protocol there is none to leave out, so no model form was cross-validated: the fibre layouts were compared by the Bayesian information criterion (BIC; Schwarz 1978), and the model of lowest BIC in the supported layout was chosen. ")
		} else {
			b.WriteString("No model form has a held-out error, so none was compared by cross-validation; the selection rule: " + sentence(minusSigns(in.sel.Rule)) + ". ")
		}
	} else {
		form := ""
		if pr := in.presetFitted(); pr != nil {
			// A published model keeps its name and citation (the
			// catalogue's preset title and source).
			form = ", the " + presetTitle(pr) + " (" + pr.Source + ") as weft's " + pr.Name + " preset,"
		}
		if in.cohortDiscovered() {
			form = ", the one form weft cohort discovered for all specimens of its cohort from their pooled evidence (the cohort's report gives it),"
		}
		fmt.Fprintf(&b, "The model form %s with a %s fibre layout"+form+" was fitted by variable projection: term weights by non-negative least squares (Lawson & Hanson 1974) and fibre angles and shape parameters by bounded Levenberg–Marquardt (Golub & Pereyra 1973; Kaufman 1975) from a global scan of the angles. ", strings.Join(fs.Terms, " + "), fs.Layout)
	}
	// A folder written before curves.csv has no confidence band to speak
	// of: its figures draw none.
	band := ", and the confidence band of the model curves from the same covariance by the delta method"
	if in.curves == nil {
		band = ""
	}
	// A model without fibre angles has no profile intervals.
	profile := ", fibre-angle intervals from the profile likelihood (Venzon & Moolgavkar 1988)"
	if len(fs.Profiles) == 0 {
		profile = ""
	}
	b.WriteString("Standard errors and 95 % intervals come from the Gauss–Newton covariance (Bates & Watts 1988)" + profile + band + ". ")
	b.WriteString(in.verdictWords())
	b.WriteString("The resulting model is " + energyMark)
	if fams := in.familyWords(); fams != "" {
		b.WriteString(" with " + fams)
	} else if in.verdict != nil {
		b.WriteString(" with no fibre family")
	}
	b.WriteString(" (stresses in " + c.StressUnit + ")")
	if low := lowestR2(fs.Metrics); !math.IsInf(low, 1) {
		fmt.Fprintf(&b, "; its lowest R² over protocols and components is %s", fmtR2(low))
	}
	if in.sel != nil {
		for _, cc := range in.sel.Pareto {
			if cc.Chosen && !bad(float64(cc.HeldoutError)) {
				fmt.Fprintf(&b, " and its held-out error %s", heldoutText(cc))
			}
		}
		var ps []string
		chosenBIC := math.NaN()
		for _, cc := range in.sel.Pareto {
			if cc.Chosen {
				chosenBIC = float64(cc.BIC)
			}
		}
		for _, cc := range in.sel.Presets {
			v := heldoutText(cc)
			if !in.crossValidated() {
				// Without held-out errors the presets are compared as the
				// chosen model was: by BIC.
				v = fixed(float64(cc.BIC)-chosenBIC, 1)
			}
			ps = append(ps, presetCitation(strings.TrimPrefix(cc.Name, "preset:"))+" "+v)
		}
		if len(ps) > 0 && in.crossValidated() {
			b.WriteString("; classical models fitted to the same data gave held-out errors of " + strings.Join(ps, ", "))
		} else if len(ps) > 0 && !bad(chosenBIC) {
			b.WriteString("; classical models fitted to the same data gave ΔBIC against it of " + strings.Join(ps, ", "))
		}
	}
	b.WriteString(". The parameters are specimen-specific and valid within the tested range only.")
	energy := template.HTML(template.HTMLEscapeString(c.Energy))
	if m, err := energyMathML(c.EnergyLaTeX, c.Energy, false); err == nil && c.EnergyLaTeX != "" {
		energy = m
	}
	v.Methods = template.HTML(strings.Replace(template.HTMLEscapeString(b.String()), energyMark, string(energy), 1))
	v.References = methodReferences(in.sel != nil)
	if in.sel != nil && !in.crossValidated() {
		v.References = append(v.References, schwarz1978)
	}
	if smoothed {
		v.References = append(v.References, savitzkyGolay1964)
	}
	if len(fs.Profiles) == 0 {
		v.References = slices.DeleteFunc(v.References, func(r string) bool { return strings.HasPrefix(r, "Venzon ") })
	}
	if pr := in.presetFitted(); pr != nil && in.sel == nil {
		if ref, ok := presetReferences[pr.Name]; ok {
			v.References = append(v.References, ref)
		}
	}
	sort.Strings(v.References)
	in.traceability(v, o)
}

// energyMark stands for the typeset energy in the methods text until the
// text is escaped.
const energyMark = "⟦energy⟧"

// keptWords says which part of the record was fitted, from the
// protocols' descriptions.
func keptWords(d card.DataSection) string {
	if len(d.Protocols) == 0 {
		return "as recorded"
	}
	// Protocols may keep different cycles (--cycle=last on a file whose
	// protocols ran 3 and 2 cycles): each distinct description is named
	// with its protocols, so that none is said to be what it is not.
	var kinds []string
	of := map[string][]string{}
	for _, p := range d.Protocols {
		k := keptPrefix(p.Kept)
		if _, ok := of[k]; !ok {
			kinds = append(kinds, k)
		}
		of[k] = append(of[k], p.Label)
	}
	if len(kinds) == 1 {
		return kinds[0]
	}
	var parts []string
	for _, k := range kinds {
		parts = append(parts, k+" for "+strings.Join(of[k], ", "))
	}
	return strings.Join(parts, "; ")
}

// keptPrefix is a protocol's kept description without its row count
// ("cycle 3 of 3, loading branch").
func keptPrefix(k string) string {
	if i := strings.Index(k, ", "); i >= 0 {
		if j := strings.Index(k[i+2:], ", "); j >= 0 {
			return k[:i+2+j]
		}
	}
	return k
}

// verdictWords states the family verdict as discovery gave it, as the
// sentence before the chosen model in the methods paragraph, or is empty
// without a verdict (a form fitted as asked). The chosen model's families
// are not the verdict: an undecided verdict or one that cannot tell one
// family from a mirror pair still picks a model with some families, and a
// paper quoting the paragraph must not report them as settled.
func (in *Input) verdictWords() string {
	vd := in.verdict
	if vd == nil {
		return ""
	}
	const lead = "The comparison of the fibre layouts "
	switch vd.Families {
	case "0":
		return lead + "supported no fibre family (an isotropic material). "
	case "1":
		return lead + "supported one fibre family. "
	case "2":
		return lead + "supported two fibre families. "
	case "1-or-mirror-pair":
		dir := "one fibre direction"
		if a, ok := in.oneDirection(); ok {
			dir += " at " + a
		}
		return lead + "supported " + dir + ", which may be one family or a mirror pair: the data carry no shear information, so they cannot tell the two apart. "
	case "undecided":
		if w, ok := in.fibrelessRivalWords(); ok {
			return lead + w
		}
		s := lead + "left the number of fibre families undecided, as the data do not settle it"
		if in.chosenInVerdictForm() {
			s += "; the chosen model is of the form best supported so far, not a settled answer"
		}
		return s + ". "
	}
	return lead + "gave the family verdict " + vd.Families + ". "
}

// fibrelessRivalWords states an undecided verdict whose in-sample best
// (verdict.in_sample_best) is a classical preset without fibre families,
// the Fung-type preset (Tong & Fung 1976): the data then leave open
// whether the anisotropy comes from fibres at all, not how many families
// there are, and a paper quoting the paragraph must not say the latter.
// ok is false for every other verdict.
func (in *Input) fibrelessRivalWords() (string, bool) {
	vd := in.verdict
	if vd == nil || in.sel == nil || !strings.HasPrefix(vd.InSampleBest, "preset:") {
		return "", false
	}
	var rival, chosen *card.CandidateCard
	for i := range in.sel.Presets {
		if in.sel.Presets[i].Name == vd.InSampleBest {
			rival = &in.sel.Presets[i]
		}
	}
	for i := range in.sel.Pareto {
		if in.sel.Pareto[i].Chosen {
			chosen = &in.sel.Pareto[i]
		}
	}
	if rival == nil || rival.Layout != "none" {
		return "", false
	}
	name := strings.TrimPrefix(rival.Name, "preset:")
	switch name {
	case "fung":
		name = "the Fung-type preset fung (Tong & Fung 1976), orthotropic about the tester's axes"
	case "fung-general":
		name = "the generalised Fung-type preset fung-general (a full quadratic form of the Green strain, which holds an orthotropic Fung-type law with its axes turned from the tester's)"
	default:
		name = "the preset " + name
	}
	dbic := ""
	if chosen != nil && !math.IsNaN(float64(chosen.BIC)) && !math.IsNaN(float64(rival.BIC)) {
		dbic = fmt.Sprintf(" (ΔBIC %.1f)", float64(chosen.BIC)-float64(rival.BIC))
	}
	return "left undecided whether the anisotropy comes from fibre families: " + name +
		", with no fibre family, fitted the data better in sample" + dbic +
		" and predicted the held-out protocols no worse; the chosen model is the best supported with fibres, not a settled answer. ", true
}

// oneDirection is the chosen model's single fibre direction written ±|α|,
// when its families all lie at one |α| (one family, or a mirror pair the
// data cannot tell from one; within the 2° of discovery's coincidence
// rule).
func (in *Input) oneDirection() (string, bool) {
	var abs []float64
	for _, f := range in.card.Families {
		if f.AngleDeg != nil {
			abs = append(abs, math.Abs(*f.AngleDeg))
		}
	}
	if len(abs) == 0 {
		return "", false
	}
	for _, a := range abs[1:] {
		if math.Abs(a-abs[0]) >= 2 {
			return "", false
		}
	}
	return "±" + fmtDeg(abs[0]), true
}

// chosenInVerdictForm reports whether the chosen model belongs to the form
// the verdict rests on.
func (in *Input) chosenInVerdictForm() bool {
	if in.sel == nil || in.verdict == nil {
		return false
	}
	for _, c := range in.sel.Pareto {
		if c.Chosen {
			return verdictKey(c) == in.verdict.Form
		}
	}
	return false
}

// familyWords describes the fitted families, e.g. "one fibre family at
// ±30.0°".
func (in *Input) familyWords() string {
	var s []string
	for _, f := range in.card.Families {
		if f.AngleDeg != nil {
			s = append(s, in.angle(*f.AngleDeg))
		}
	}
	switch len(s) {
	case 0:
		return ""
	case 1:
		return "one fibre family at " + s[0]
	}
	return "fibre families at " + strings.Join(s, " and ")
}

// presetCitation names a classical preset with its source.
func presetCitation(name string) string {
	switch name {
	case "neo-hookean":
		return "neo-Hookean"
	case "hgo":
		return "HGO (Holzapfel, Gasser & Ogden 2000)"
	case "goh":
		return "GOH (Gasser, Ogden & Holzapfel 2006)"
	case "fung":
		return "Fung-type (Tong & Fung 1976)"
	case "fung-general":
		return "generalised Fung-type (the full quadratic form, e.g. Sun & Sacks 2005)"
	}
	return name
}

// protocolWeightWords names the relative protocol weights a fit was given
// (--protocol-weight), "" when every protocol counts 1: they change the
// fit, so a methods paragraph that left them out would misstate it. A
// weight of 0 is a card written before the weights were recorded.
func protocolWeightWords(ps []card.DataProtocolCard) string {
	var set []string
	for _, p := range ps {
		if p.Weight != 0 && p.Weight != 1 {
			set = append(set, fsig(p.Weight, 3)+" for "+p.Label)
		}
	}
	if len(set) == 0 {
		return ""
	}
	others := "; 1 for the others"
	if len(set) == len(ps) {
		// Every protocol was given one (a one-protocol fit with a
		// weight read "2.00 for 1:1; 1 for the others" until
		// 2026-12-05): there are no others.
		others = ""
	}
	return ", times the relative weight given to each protocol (" + strings.Join(set, ", ") + others + ")"
}

// presetFitted is the catalogue's preset a chosen form was fitted as
// (the card's provenance option --preset=NAME), nil for any other fit.
func (in *Input) presetFitted() *terms.Preset {
	p := in.card.Provenance
	if p == nil {
		return nil
	}
	for _, o := range p.Options {
		if n, ok := strings.CutPrefix(o, "--preset="); ok {
			return terms.LookupPreset(n)
		}
	}
	return nil
}

// presetReferences are the full references of the presets the methods
// paragraph of a discovery already lists; the others are cited by author
// and year in the text.
var presetReferences = map[string]string{
	"hgo":  "Holzapfel GA, Gasser TC, Ogden RW (2000) A new constitutive framework for arterial wall mechanics and a comparative study of material models. J Elasticity 61:1–48.",
	"goh":  "Gasser TC, Ogden RW, Holzapfel GA (2006) Hyperelastic modelling of arterial layers with distributed collagen fibre orientations. J R Soc Interface 3:15–35.",
	"fung": "Tong P, Fung YC (1976) The stress-strain relationship for the skin. J Biomech 9:649–657.",
}

// savitzkyGolay1964 is cited where F was smoothed before the fit.
const savitzkyGolay1964 = "Savitzky A, Golay MJE (1964) Smoothing and differentiation of data by simplified least squares procedures. Anal Chem 36:1627–1639."

// preprocessingWords says how the kept data were changed before the fit
// (re-referencing, smoothing of F, resampling), from the card's
// data.reference, data.protocols[].kept and provenance options; "" when
// they were fitted as measured. Each changes what was fitted, so a
// methods paragraph that left it out would misstate the data. smoothed
// says whether F was smoothed (Savitzky & Golay 1964 is then cited).
func preprocessingWords(c *card.Card, d card.DataSection) (string, bool) {
	var parts []string
	if strings.HasPrefix(d.Reference, "re-referenced") {
		parts = append(parts, "the data were "+d.Reference)
	}
	smoothed := false
	for _, p := range d.Protocols {
		if i := strings.Index(p.Kept, "F smoothed over "); i >= 0 {
			w := strings.TrimSuffix(p.Kept[i:], ")")
			w = strings.Replace(w, "(quadratic Savitzky–Golay", "with a quadratic Savitzky–Golay filter (Savitzky & Golay 1964", 1)
			if strings.HasSuffix(w, "1964") {
				w += ")"
			}
			parts = append(parts, "the deformation gradient was "+strings.TrimPrefix(w, "F ")+", within each kept branch")
			smoothed = true
			break
		}
	}
	if p := c.Provenance; p != nil {
		for _, o := range p.Options {
			if n, ok := strings.CutPrefix(o, "--resample="); ok && n != "0" {
				parts = append(parts, "each kept branch was resampled to "+n+" points evenly spaced in the driving stretch (linear interpolation)")
			}
		}
	}
	if len(parts) == 0 {
		return "", false
	}
	return capitalise("before the fit, "+strings.Join(parts, "; ")) + ". ", smoothed
}

// schwarz1978 is cited where model forms were compared by BIC alone (one
// protocol, nothing to leave out).
const schwarz1978 = "Schwarz G (1978) Estimating the dimension of a model. Ann Stat 6:461–464."

// protocolCount writes a number of protocols, "1 protocol" or "5 protocols".
func protocolCount(n int) string {
	if n == 1 {
		return "1 protocol"
	}
	return fmt.Sprintf("%d protocols", n)
}

// methodReferences lists the works the methods paragraph cites.
func methodReferences(discovered bool) []string {
	refs := []string{
		"Bates DM, Watts DG (1988) Nonlinear Regression Analysis and Its Applications. Wiley, New York.",
		"Golub GH, Pereyra V (1973) The differentiation of pseudo-inverses and nonlinear least squares problems whose variables separate. SIAM J Numer Anal 10:413–432.",
		"Kaufman L (1975) A variable projection method for solving separable nonlinear least squares problems. BIT 15:49–57.",
		"Lawson CL, Hanson RJ (1974) Solving Least Squares Problems. Prentice-Hall, Englewood Cliffs.",
		"Venzon DJ, Moolgavkar SH (1988) A method for computing profile-likelihood-based confidence intervals. Appl Stat 37:87–94.",
	}
	if discovered {
		refs = append(refs,
			"Gasser TC, Ogden RW, Holzapfel GA (2006) Hyperelastic modelling of arterial layers with distributed collagen fibre orientations. J R Soc Interface 3:15–35.",
			"Hastie T, Tibshirani R, Friedman J (2009) The Elements of Statistical Learning, 2nd ed. Springer, New York, §7.10.",
			"Holzapfel GA, Gasser TC, Ogden RW (2000) A new constitutive framework for arterial wall mechanics and a comparative study of material models. J Elasticity 61:1–48.",
			"Tong P, Fung YC (1976) The stress-strain relationship for the skin. J Biomech 9:649–657.")
	}
	sort.Strings(refs)
	return refs
}

// traceability writes what made the card and the report.
func (in *Input) traceability(v *reportView, o Options) {
	v.Trace = append(v.Trace, TraceFacts(in.card.Provenance, o.Software)...)
}
