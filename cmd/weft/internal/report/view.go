package report

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// The page's content, built section by section from the Input; each
// builder fills its part of the reportView.

// view formats the input for the template.
func (in *Input) view(figs []renderedFigure, o Options) *reportView {
	c, d := in.card, in.data
	v := &reportView{Specimen: c.Specimen, Tissue: d.Tissue, DataNotes: sentence(d.Notes), Synthetic: in.isSynthetic(), Cautions: card.Cautions,
		Limits: "Planar biaxial data constrain the in-plane response only; the out-of-plane response and the response to I5 are not fully determined by them (Holzapfel & Ogden 2009, Math Mech Solids 14:474–489)."}
	if v.Specimen == "" {
		v.Specimen = d.Specimen
	}
	v.Abscissa = "stretch λ"
	if o.Strain {
		v.Abscissa = "Green strain E = ½(λ² − 1)"
	}
	v.figs = map[string]*htmlFigure{}
	for _, f := range figs {
		hf := toHTMLFigure(f, o.PNG)
		v.figs[f.name] = &hf
	}
	in.glance(v)
	in.dataSection(v)
	in.modelSection(v)
	in.fitSection(v)
	in.admissibleSection(v)
	in.splitSection(v, o.Strain)
	in.verdictSection(v)
	in.selectionSection(v)
	in.methodsSection(v, o)
	in.conventionsSection(v)
	v.Files = in.folderFiles(len(figs), o.PNG)
	return v
}

// fig returns the rendered figure of that name, or nil.
func (v *reportView) fig(name string) *htmlFigure { return v.figs[name] }

// angle writes a family angle; without shear information its sign is
// unknown and it is written ±|α|.
func (in *Input) angle(a float64) string {
	if in.signUnknown() {
		return "±" + fmtDeg(math.Abs(a))
	}
	return fmtDeg(a)
}

// cohortDiscovered says whether the card is a cohort specimen's whose form
// weft cohort discovered from the pooled evidence of all its specimens
// (the card's provenance: written by weft cohort, with neither --preset nor
// --terms). Such a card has no selection of its own, but its form was not
// "fitted as asked" either.
func (in *Input) cohortDiscovered() bool {
	p := in.card.Provenance
	if in.sel != nil || p == nil || p.Command != "weft cohort" {
		return false
	}
	for _, o := range p.Options {
		if strings.HasPrefix(o, "--preset") || strings.HasPrefix(o, "--terms") {
			return false
		}
	}
	return true
}

// glance writes the facts of "At a glance": how the model was found, its energy, families, verdict, worst fit and data.
func (in *Input) glance(v *reportView) {
	c, d, fs := in.card, in.data, in.fit
	how := "chosen form: " + strings.Join(fs.Terms, " + ") + ", " + fs.Layout + " fibre layout (fitted as asked, not discovered)"
	if in.cohortDiscovered() {
		how = "the cohort's shared form: " + strings.Join(fs.Terms, " + ") + ", " + fs.Layout + " fibre layout (discovered by weft cohort for all its specimens; the cohort's report holds the evidence)"
	}
	if in.sel != nil {
		how = "discovered: " + in.sel.Chosen + " (" + formCodeText(in.sel.Chosen) + ")"
	}
	v.HowFound = how
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
	v.Summary = []Fact{{Name: "Model", Value: how}}
	v.Summary = append(v.Summary, Fact{Name: "Fibre families", Value: fams})
	if in.verdict != nil {
		v.Summary = append(v.Summary, Fact{Name: "Family verdict", Value: verdictText(in.verdict.Families)})
	}
	if low := lowestR2(fs.Metrics); !math.IsInf(low, 1) {
		v.Summary = append(v.Summary, Fact{Name: "Lowest R² (any protocol and component)", Value: fmtR2(low)})
	}
	if in.sel != nil {
		for _, cc := range in.sel.Pareto {
			if cc.Chosen {
				if !in.crossValidated() {
					v.Summary = append(v.Summary, Fact{Name: "Held-out error", Value: "none: " + notCrossValidatedWhy(len(d.Protocols))})
					continue
				}
				v.Summary = append(v.Summary, Fact{Name: "Held-out error", Value: heldoutText(cc) + " (leave one protocol out; 0.01 ≈ 1 % of a protocol-axis stress range)"})
			}
		}
	}
	v.Summary = append(v.Summary, Fact{Name: "Data", Value: fmt.Sprintf("%s, %d points fitted, %s stress in %s", protocolCount(len(in.table.protocols)), in.pointCount(), kindName(d.StressKind), d.StressUnit)})
	if p := c.Provenance; p != nil {
		v.Summary = append(v.Summary, Fact{Name: "Fitted by", Value: "weft " + p.VersionText()})
	}
	// The energy heads the page when it is short; a long one is in "Model
	// and parameters".
	if _, terms := energyTerms(c.EnergyLaTeX); len(terms) <= 3 && len(c.EnergyLaTeX) < 3*longTerm {
		if m, err := energyMathML(c.EnergyLaTeX, c.Energy, true); err == nil && c.EnergyLaTeX != "" {
			v.GlanceEnergy = m
		}
	}
	v.GlanceFigure = v.fig("fit-all")
}

// pointCount is the number of points in fit.csv.
func (in *Input) pointCount() int {
	n := 0
	for _, pr := range in.table.protocols {
		n += len(pr.F)
	}
	return n
}

// lowestR2 is the lowest defined R² of the metrics, +Inf when none is.
func lowestR2(ms []card.MetricCard) float64 {
	low := math.Inf(1)
	for _, m := range ms {
		if r := float64(m.R2); !math.IsNaN(r) {
			low = math.Min(low, r)
		}
	}
	return low
}

// formCode reads a discovered model form's name: layout, the number of
// terms (t) and of parameters (p).
var formCode = regexp.MustCompile(`^(none|single|mirror|free)(\+dispersed|\+kappa)?-t(\d+)-p(\d+)$`)

// formCodeText explains a model form's name in words, or "" for another
// name.
func formCodeText(name string) string {
	m := formCode.FindStringSubmatch(name)
	if m == nil {
		return ""
	}
	lay := map[string]string{"none": "no fibre family", "single": "one fibre family", "mirror": "a mirror pair", "free": "two free families"}[m[1]]
	switch m[2] {
	case "+dispersed":
		lay += " spread in the plane"
	case "+kappa":
		lay += " with dispersion κ"
	}
	return fmt.Sprintf("%s, %s terms, %s parameters", lay, m[3], m[4])
}

// dataSection writes the specimen, its set-up, its protocols, warnings and
// notices, and the range of the fitted data.
func (in *Input) dataSection(v *reportView) {
	c, d := in.card, in.data
	shear := "none: pure biaxial stretch; the sign of a fibre angle cannot be determined"
	if d.HasShear {
		shear = "present (F12, F21 or shear stress measured)"
	}
	v.Data = []Fact{{Name: "Specimen", Value: d.Specimen}, {Name: "Source file", Value: d.Source}}
	if p := c.Provenance; p != nil {
		for _, f := range p.Inputs {
			if f.File == d.Source {
				v.Data = append(v.Data, Fact{Name: "SHA-256 of the source", Value: f.SHA256, Mono: true}, Fact{Name: "Size", Value: fmt.Sprintf("%d bytes", f.Bytes)})
			}
		}
	}
	if d.Sheet != "" {
		v.Data = append(v.Data, Fact{Name: "Sheet", Value: d.Sheet})
	}
	if d.Tissue != "" {
		v.Data = append(v.Data, Fact{Name: "Tissue", Value: d.Tissue})
	}
	if d.Notes != "" {
		v.Data = append(v.Data, Fact{Name: "Notes", Value: d.Notes})
	}
	if d.Axis1 != "" {
		v.Data = append(v.Data, Fact{Name: "Axis 1", Value: d.Axis1})
	}
	in.setupFacts(v)
	v.Data = append(v.Data, Fact{Name: "Stress", Value: kindName(d.StressKind) + " stress in " + d.StressUnit}, Fact{Name: "Reference state", Value: d.Reference},
		Fact{Name: "Shear information", Value: shear})
	v.Protocols = htmlTable{Head: []string{"protocol", "points fitted", "kept", "cycles", "protocol weight"}, Num: []bool{false, true, false, true, true}}
	if in.raw != nil {
		v.Protocols.Head = append(v.Protocols.Head, "preload (first row)")
		v.Protocols.Num = append(v.Protocols.Num, true)
	}
	for _, p := range d.Protocols {
		row := []string{p.Label, fmt.Sprint(p.Points), p.Kept, fmt.Sprint(p.Cycles), fsig(p.Weight, 3)}
		if in.raw != nil {
			row = append(row, in.preloadText(p.Label))
		}
		v.Protocols.Rows = append(v.Protocols.Rows, htmlRow{Cells: row})
	}
	v.Warnings, v.Notices = d.Warnings, d.Notices
	if dr := in.dataRange; dr != nil {
		rng := func(r [2]float64) string { return fsig(r[0], 4) + " to " + fsig(r[1], 4) }
		v.Range = []Fact{{Name: "Stretch λ1 (F11)", Value: rng(dr.Stretch1)}, {Name: "Stretch λ2 (F22)", Value: rng(dr.Stretch2)}, {Name: "Shear F12, F21", Value: rng(dr.Shear)}}
		for i, r := range dr.FibreStretch {
			name := fmt.Sprintf("family %d", i+1)
			if i < len(c.Families) {
				name = c.Families[i].Name
			}
			v.Range = append(v.Range, Fact{Name: "Fibre stretch √I4 of " + name, Value: rng(r)})
		}
	}
	v.RawFigure = v.fig("raw")
}

// setupFacts writes the specimen's geometry and how it was tested.
func (in *Input) setupFacts(v *reportView) {
	st := in.card.Setup
	if st == nil {
		return
	}
	if st.ThicknessMM != nil && st.Size1MM != nil && st.Size2MM != nil {
		v.Data = append(v.Data, Fact{Name: "Geometry", Value: fmt.Sprintf("thickness H = %s mm; loaded region W1 = %s mm along axis 1, W2 = %s mm along axis 2",
			fsig(*st.ThicknessMM, 3), fsig(*st.Size1MM, 3), fsig(*st.Size2MM, 3))})
	} else {
		v.Data = append(v.Data, Fact{Name: "Geometry", Value: "not given in the file (thickness, size_1, size_2)"})
	}
	how := "stress columns of the file"
	if st.StressFrom == "loads and geometry" {
		how = "loads of the file turned into nominal stress, P11 = load_1/(W2·H), P22 = load_2/(W1·H)"
	}
	kin := "stretches (pure biaxial stretch, no shear measured)"
	if st.Kinematics == "deformation gradient" {
		kin = "deformation gradient F11, F12, F21, F22 (e.g. from tracked markers)"
	}
	control := st.Control
	if control == "" {
		control = "not stated in the file (metadata 'control')"
	}
	v.Data = append(v.Data, Fact{Name: "Stress from", Value: how}, Fact{Name: "Deformation from", Value: kin}, Fact{Name: "Control", Value: control})
	for _, m := range st.Metadata {
		v.Data = append(v.Data, Fact{Name: m.Key, Value: m.Value})
	}
}

// preloadText is the stress of a protocol's first row in raw.csv.
func (in *Input) preloadText(label string) string {
	rr := in.raw.protos[label]
	if rr == nil || len(rr.F) == 0 {
		return "—"
	}
	t := in.table
	var parts []string
	for _, ci := range t.componentsOf(false) {
		parts = append(parts, compSymbol(t.kind, t.comps[ci])+" "+fsig(rr.stress[ci][0], 3))
	}
	return strings.Join(parts, ", ") + " " + t.unit
}

// modelSection writes the energy, the term, family and parameter tables and the fit quality.
func (in *Input) modelSection(v *reportView) {
	c := in.card
	v.EnergyPlain = c.Energy
	if m, err := energyMathML(c.EnergyLaTeX, c.Energy, true); err == nil && c.EnergyLaTeX != "" {
		v.EnergyMath = m
	}
	v.Terms = htmlTable{Head: []string{"term", "family", "weight [" + c.StressUnit + "]", "parameters", "term w·f(x)"}, Num: []bool{false, false, true, false, false}}
	for _, t := range c.Terms {
		w := math.NaN()
		if t.Weight != nil {
			w = *t.Weight
		}
		var names []string
		for k := range t.Params {
			names = append(names, k)
		}
		sort.Strings(names)
		var ps []string
		for _, k := range names {
			ps = append(ps, k+" = "+fsig(t.Params[k], 4))
		}
		fam := t.Family
		if fam == "" {
			fam = "matrix"
		}
		v.Terms.Rows = append(v.Terms.Rows, htmlRow{Cells: []string{t.ID, fam, fsig(w, 4), strings.Join(ps, ", "), t.Formula}})
	}
	v.Families = htmlTable{Head: []string{"family", "angle α", "sign known", "spread"}, Num: []bool{false, true, false, false}}
	for _, f := range c.Families {
		a, k := math.NaN(), "ideal (aligned)"
		if f.AngleDeg != nil {
			a = *f.AngleDeg
		}
		switch {
		case f.Concentration != nil:
			k = "in the plane, concentration b = " + fsig(*f.Concentration, 3)
		case f.Dispersion != nil && *f.Dispersion != 0:
			k = "dispersion κ = " + fsig(*f.Dispersion, 3)
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

// profileOf returns the angle profile of an estimate, if there is one.
func (in *Input) profileOf(name string) (card.ProfileCard, bool) {
	for _, p := range in.fit.Profiles {
		if p.Name == name {
			return p, true
		}
	}
	return card.ProfileCard{}, false
}

// parameterSection writes the parameter table with its statuses: one 95 %
// interval per quantity, the profile-likelihood interval for an angle that
// has a profile and the Gauss–Newton (Wald) interval otherwise.
func (in *Input) parameterSection(v *reportView) {
	fs := in.fit
	v.Params = htmlTable{Head: []string{"parameter", "value", "95 % interval", "from", "std. error", "unit", "status"}, Num: []bool{false, true, true, false, true, false, false}}
	var statuses []string
	for _, e := range fs.Estimates {
		if e.Status == "inactive" && e.Kind != "weight" {
			continue
		}
		// Angles in degrees take fixed decimals, as everywhere in the
		// report: a fitted 1e-19° is 0.00, not a power of ten.
		num := func(x float64, n int) string { return fsig(x, n) }
		if e.Kind == "angle" {
			num = func(x float64, _ int) string { return fixed(x, 2) }
		}
		val := num(float64(e.Value), 4)
		if e.Kind == "angle" && in.signUnknown() && (e.Name == "angle" || strings.HasPrefix(e.Name, "angle_")) {
			val = "±" + num(math.Abs(float64(e.Value)), 4)
		}
		iv, from := "—", ""
		if lo, hi := float64(e.CI95[0]), float64(e.CI95[1]); !math.IsNaN(lo) && !math.IsNaN(hi) {
			iv, from = "["+num(lo, 3)+", "+num(hi, 3)+"]", "Wald"
		}
		// A degenerate angle has no interval, as its status says, even
		// where its profile crosses the threshold (summary.printParameters).
		if p, ok := in.profileOf(e.Name); ok && e.Kind == "angle" && e.Status != aniso.StatusDegenerate {
			switch {
			case p.NotDetermined:
				iv, from = "none excluded", "profile"
			default:
				iv, from = "["+num(float64(p.IntervalDeg[0]), 4)+", "+num(float64(p.IntervalDeg[1]), 4)+"]", "profile"
				if !p.Closed {
					from = "profile (open)"
				}
			}
		}
		unit := e.Unit
		if unit == "" {
			unit = "–"
		}
		v.Params.Rows = append(v.Params.Rows, htmlRow{Cells: []string{e.Name, val, iv, from, fsig(float64(e.StdErr), 2), unit, e.Status}})
		statuses = append(statuses, e.Status)
	}
	v.Statuses = StatusLegend(statuses)
	if len(fs.Profiles) > 0 {
		v.ParamNote = "An angle's interval is its profile-likelihood interval (Venzon & Moolgavkar 1988): it follows the loss itself and stays inside the angle's period. The other intervals are Wald intervals from the Gauss–Newton covariance (Bates & Watts 1988); model.json holds both for every angle. An open profile interval is not bounded by the data at one end."
	} else {
		v.ParamNote = "Intervals are Wald intervals from the Gauss–Newton covariance (Bates & Watts 1988), kept inside each quantity's domain."
	}
	v.Combinations = nil
	for _, cc := range fs.Combinations {
		v.Combinations = append(v.Combinations, cc.Text)
	}
}

// qualitySection writes the flags, the notes on what the data determine
// and the fit-quality table.
func (in *Input) qualitySection(v *reportView) {
	fs := in.fit
	v.Flags, v.Notes = fs.Flags, fs.Notes
	// A card with untested strips but no verdict (a cohort specimen's,
	// whose band is the cohort's near-equivalent forms) has no verdict
	// paragraph to carry them; they are what the data do not determine.
	if in.verdict == nil {
		if s := strings.TrimSpace(in.stripsText("the forms the held-out protocols pooled over the cohort could not tell from this one, each fitted to this specimen")); s != "" {
			v.Notes = append(append([]string{}, fs.Notes...), s)
		}
	}
	// One row per protocol, a column group per measure and component.
	comps := in.table.comps
	var r2Comps []string // components with an R² somewhere
	for _, c := range comps {
		for _, m := range fs.Metrics {
			if m.Component == c && !math.IsNaN(float64(m.R2)) {
				r2Comps = append(r2Comps, c)
				break
			}
		}
	}
	v.Metrics = htmlTable{Head: []string{"protocol", "points"}, Num: []bool{false, true}}
	col := func(h string) { v.Metrics.Head, v.Metrics.Num = append(v.Metrics.Head, h), append(v.Metrics.Num, true) }
	for _, c := range r2Comps {
		col("R² " + compSymbol(fs.StressKind, c))
	}
	for _, c := range comps {
		col("RMSE " + compSymbol(fs.StressKind, c))
	}
	for _, c := range r2Comps {
		col("NRMSE " + compSymbol(fs.StressKind, c))
	}
	if in.heldout != nil {
		for _, c := range r2Comps {
			col("held-out R² " + compSymbol(fs.StressKind, c))
		}
	}
	for _, pr := range in.table.protocols {
		row := []string{pr.label, fmt.Sprint(len(pr.F))}
		for _, c := range r2Comps {
			m, _ := in.metric(pr.label, c)
			row = append(row, fmtR2(float64(m.R2)))
		}
		for _, c := range comps {
			m, ok := in.metric(pr.label, c)
			x := math.NaN()
			if ok {
				x = float64(m.RMSE)
			}
			row = append(row, fsig(x, 3))
		}
		for _, c := range r2Comps {
			nr := "—"
			if m, ok := in.metric(pr.label, c); ok && !math.IsNaN(float64(m.NRMSE)) {
				nr = fmt.Sprintf("%.2f %%", 100*float64(m.NRMSE))
			}
			row = append(row, nr)
		}
		if in.heldout != nil {
			for _, c := range r2Comps {
				row = append(row, in.heldoutR2(pr.label, c))
			}
		}
		v.Metrics.Rows = append(v.Metrics.Rows, htmlRow{Cells: row})
	}
	v.MetricsNote = "RMSE in " + fs.StressUnit + "; NRMSE = RMSE / the component's stress range in the protocol."
}

// fitSection places the figures of measured and modelled stress.
func (in *Input) fitSection(v *reportView) {
	for _, n := range []string{"fit-shear", "presets", "residuals", "residuals-shear"} {
		if f := v.fig(n); f != nil {
			v.FitFigures = append(v.FitFigures, *f)
		}
	}
}

// stripsText writes the card's untested strips in one sentence (with a
// leading space), "" without any: per strip the spread of the models the
// held-out protocols could not tell apart, in normal and shear stress, and
// where the strip leaves the fitted data. Part of the verdict's paragraph,
// kept short: a report at its page budget (demo M3, four strips) keeps it;
// a card without a verdict (a cohort specimen's) has it among what the
// data cannot determine.
//
// band names the models whose spread is given: those the held-out
// protocols could not tell apart (a fit's), or the cohort's near-equivalent
// forms fitted to this specimen (a cohort specimen's card).
func (in *Input) stripsText(band string) string {
	var strips []string
	measured := false
	for _, st := range in.untested {
		measured = measured || st.Models > 0
	}
	for _, st := range in.untested {
		// Where a strip leaves the fitted data every model extrapolates
		// and the spread settles nothing (card: leaves_range_at); the
		// paragraph says from which stretch on, as the card's summary does.
		beyond := ""
		if at := float64(st.LeavesRangeAt); !bad(at) {
			beyond = fmt.Sprintf(", data to %.3g", at)
		}
		switch {
		case !measured:
			strips = append(strips, fmt.Sprintf("%s to %.3g%s", strings.TrimPrefix(st.Label, "1:0 "), float64(st.Stretch), beyond))
			continue
		case st.Models == 0:
			strips = append(strips, fmt.Sprintf("%s to %.3g: no other candidate to measure it%s", strings.TrimPrefix(st.Label, "1:0 "), float64(st.Stretch), beyond))
			continue
		}
		strips = append(strips, fmt.Sprintf("%s to %.3g: %s/%s%s", strings.TrimPrefix(st.Label, "1:0 "), float64(st.Stretch), card.PercentText(float64(st.Percent)), card.PercentText(float64(st.ShearPercent)), beyond))
	}
	if len(strips) == 0 {
		return ""
	}
	// "data to" needs its key only where a strip leaves the data.
	key := ""
	if strings.Contains(strings.Join(strips, ""), ", data to ") {
		key = " (data to: past it every model extrapolates)"
	}
	if !measured {
		// A chosen form (or a discovery no other candidate came near)
		// has no band: the strips are named, not measured, and what
		// the card's summaries say of them is theirs.
		return " Strips not tested (one axis held at stretch 1; turned: cut or mounted so), which no other candidate model measures here (see the card's untested_strips)" + key + ": " + strings.Join(strips, "; ") + "."
	}
	return " Strips not tested (one axis held at stretch 1; turned: cut or mounted so), the spread of " + band + ", normal/shear stress in % of the chosen model's largest normal stress" + key + ": " + strings.Join(strips, "; ") + "."
}

// verdictSection writes the family verdict and its table of fibre
// layouts: each layout's best model with its angles, ΔBIC and held-out
// error, the verdict's row marked.
func (in *Input) verdictSection(v *reportView) {
	vd := in.verdict
	v.ProfileFigure = v.fig("angle-profile")
	if vd == nil {
		return
	}
	v.HasVerdict = true
	v.Verdict = capitalise(verdictText(vd.Families))
	v.Reason, v.Decider = capitalise(minusSigns(vd.Reason)), capitalise(minusSigns(vd.Decider))
	v.PlanNext = vd.Families == "undecided"
	if c := in.calibration; c != nil {
		v.Calibration = minusSigns(c.Summary)
	}
	v.Reason += in.stripsText("the models the held-out protocols could not tell apart")
	for _, r := range vd.RuledOut {
		v.RuledOut = append(v.RuledOut, capitalise(minusSigns(r)))
	}
	v.VerdictTable = htmlTable{Head: []string{"fibre layout (best model of each)", "model", "angles", "ΔBIC", "held-out error", "verdict"},
		Num: []bool{false, false, true, true, true, false}}
	keys := map[string]card.Num{}
	for k, x := range vd.DeltaBIC {
		keys[k] = x
	}
	for k := range vd.HeldoutError {
		if _, ok := keys[k]; !ok {
			keys[k] = card.Num(math.NaN())
		}
	}
	for _, k := range formKeysInOrder(keys) {
		b, okb := vd.DeltaBIC[k]
		e, oke := vd.HeldoutError[k]
		bs, es := "—", "—"
		if okb {
			bs = fixed(float64(b), 1)
		}
		if oke {
			es = fsig(float64(e), 3)
		}
		name, angles := "—", "—"
		if best, ok := in.formBest(k); ok {
			name, angles = best.Name, in.anglesOf(best)
		}
		mark := ""
		if k == vd.Form {
			mark = "◀ verdict"
		}
		v.VerdictTable.Rows = append(v.VerdictTable.Rows, htmlRow{Cells: []string{layoutKeyText(k), name, angles, bs, es, mark}, Mark: k == vd.Form})
	}
}

// formBest is the best cross-validated model of a form of the selection
// (lowest held-out error, fewer parameters on a tie), or the lowest BIC
// when none of the form was cross-validated — the model the verdict's
// numbers for that form come from.
func (in *Input) formBest(key string) (card.CandidateCard, bool) {
	if in.sel == nil {
		return card.CandidateCard{}, false
	}
	best, bestCV := -1, false
	for i, c := range in.sel.Pareto {
		if verdictKey(c) != key {
			continue
		}
		cv := !bad(float64(c.HeldoutError))
		switch {
		case best < 0, cv && !bestCV:
			best, bestCV = i, cv
		case cv && bestCV:
			b := in.sel.Pareto[best]
			if c.HeldoutError < b.HeldoutError || c.HeldoutError == b.HeldoutError && c.Parameters < b.Parameters {
				best = i
			}
		case !cv && !bestCV && c.BIC < in.sel.Pareto[best].BIC:
			best = i
		}
	}
	if best < 0 {
		return card.CandidateCard{}, false
	}
	return in.sel.Pareto[best], true
}

// anglesOf writes a candidate's family angles, ±|α| without shear
// information, noting two families that point the same way. The note
// follows the rule discovery applies to the fitted angles (aniso's
// coincident: within 2°), with or without shear information, so that a
// pair the search treated as one family (e.g. at ±0.00°, ±0.00°) is
// marked as such.
func (in *Input) anglesOf(c card.CandidateCard) string {
	if len(c.AnglesDeg) == 0 {
		return "—"
	}
	var s []string
	for _, a := range c.AnglesDeg {
		s = append(s, in.angle(float64(a)))
	}
	out := strings.Join(s, ", ")
	if len(c.AnglesDeg) == 2 {
		if d := math.Abs(aniso.WrapDeg(float64(c.AnglesDeg[0] - c.AnglesDeg[1]))); d < 2 {
			out += " (coincident: one direction)"
		}
	}
	return out
}

// selectionSection writes the selection rule and the tables of the model
// forms kept, the presets and the cross-protocol prediction.
func (in *Input) selectionSection(v *reportView) {
	sel := in.sel
	v.ParetoFigure = v.fig("pareto")
	if sel == nil {
		return
	}
	v.HasSelection = true
	v.Rule, v.Metric = capitalise(minusSigns(sel.Rule)), sel.HeldoutMetric
	// Every search note whole: a note's clauses are separate facts (which
	// candidates were left out and why, the optima a search started
	// from), so a cut note would drop some of them.
	for _, s := range sel.Search {
		v.Search = append(v.Search, capitalise(sentence(minusSigns(s))))
	}
	head := []string{"model form", "terms", "parameters", "BIC", "held-out error", "lowest R²"}
	num := []bool{false, false, true, true, true, true}
	v.Pareto = htmlTable{Head: append(append([]string{}, head...), "pick"), Num: append(append([]bool{}, num...), false), Wide: 1, Class: "long"}
	chosenBIC := math.NaN()
	for _, cc := range sel.Pareto {
		if cc.Chosen {
			chosenBIC = float64(cc.BIC)
		}
	}
	// The forms that were cross-validated compete for the pick; the others
	// are counted by why they were left out (leftOutOf), and listed in
	// selection.csv and model.json.
	// Without cross-validation (one protocol) the rule picks by BIC among
	// every form the search kept, so the table lists them all.
	cv := in.crossValidated()
	for _, cc := range sel.Pareto {
		if cv && bad(float64(cc.HeldoutError)) && !cc.Chosen {
			continue
		}
		mark := ""
		if cc.Chosen {
			mark = "chosen"
		}
		v.Pareto.Rows = append(v.Pareto.Rows, htmlRow{Cells: append(candidateCells(cc), mark), Mark: cc.Chosen})
	}
	if !cv {
		v.ParetoNote = fmt.Sprintf("No form was cross-validated (%s): the rule above picked by BIC among the %d forms the search kept, all listed here.", notCrossValidatedWhy(len(in.data.Protocols)), len(sel.Pareto))
	} else if lo := leftOutOf(sel); lo.total() > 0 {
		v.ParetoNote = fmt.Sprintf("The %d cross-validated forms of the %d the search kept. The other %d were not cross-validated: %s. selection.csv and model.json list them with their loss, AICc and BIC.",
			len(sel.Pareto)-lo.total(), len(sel.Pareto), lo.total(), strings.Join(lo.reasons(true), "; "))
	}
	v.Presets = htmlTable{Head: append(append([]string{}, head...), "ΔBIC vs chosen"), Num: append(append([]bool{}, num...), true), Wide: 1}
	for _, cc := range sel.Presets {
		v.Presets.Rows = append(v.Presets.Rows, htmlRow{Cells: append(candidateCells(cc), fixed(float64(cc.BIC)-chosenBIC, 1))})
	}
	if n := len(sel.Protocols); n > 0 && len(sel.CrossR2) == n {
		v.Cross = htmlTable{Head: append([]string{"fitted to ↓ / predicts →"}, sel.Protocols...), Num: []bool{false}}
		for range sel.Protocols {
			v.Cross.Num = append(v.Cross.Num, true)
		}
		for i, row := range sel.CrossR2 {
			cells := []string{sel.Protocols[i]}
			strong := map[int]bool{}
			for j, x := range row {
				cells = append(cells, fmtR2(float64(x)))
				if i == j {
					strong[j+1] = true
				}
			}
			v.Cross.Rows = append(v.Cross.Rows, htmlRow{Cells: cells, Strong: strong})
		}
	}
}

// conventionsSection writes the card's conventions.
func (in *Input) conventionsSection(v *reportView) {
	c := in.card
	// The conventions needed to read this report's numbers; the card
	// states every convention (model.json, key "conventions").
	if cv := c.Conventions; cv != nil {
		v.Conventions = []Fact{{Name: "Angle", Value: cv.Angle}, {Name: "Kinematics", Value: cv.Kinematics}, {Name: "Invariants", Value: cv.Invariants}, {Name: "Energy", Value: cv.Energy},
			{Name: "Fibre switch", Value: cv.FibreSwitch}}
		if c.Layout != nil && in.fit.Dispersion {
			v.Conventions = append(v.Conventions, Fact{Name: "Dispersion", Value: cv.Dispersion})
		}
		if in.fit.InPlane && cv.InPlane != "" {
			v.Conventions = append(v.Conventions, Fact{Name: "In-plane dispersion", Value: cv.InPlane})
		}
		v.Conventions = append(v.Conventions, Fact{Name: "Stress", Value: cv.Stress})
	}
}

// minusPattern finds a hyphen-minus used as a minus sign: before a digit,
// after a space, an opening bracket, a ± or the start.
var minusPattern = regexp.MustCompile(`(^|[\s(\[±=,;:])-(\d)`)

// negativeZeroAngle finds an angle that rounded to zero with its sign kept
// ("-0.0°", "−0.00°"), which free text from the card can hold.
var negativeZeroAngle = regexp.MustCompile(`(^|[\s(\[±=,;:])(?:-|−)(0(?:\.0+)?°)`)

// minusSigns writes the minus signs of numbers in free text as U+2212, and
// an angle that rounds to zero without a sign.
func minusSigns(s string) string {
	s = negativeZeroAngle.ReplaceAllString(s, "${1}${2}")
	return minusPattern.ReplaceAllString(s, "${1}−${2}")
}

// capitalise starts a sentence with a capital letter.
func capitalise(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if n == 0 || !unicode.IsLower(r) {
		return s
	}
	return string(unicode.ToUpper(r)) + s[n:]
}

// StatusLegend explains, once each and in a fixed order, the parameter
// statuses other than "estimated" that appear in a table.
func StatusLegend(shown []string) []string {
	var out []string
	for _, st := range []string{aniso.StatusCorrelated, aniso.StatusDegenerate, aniso.StatusNotDetermined, aniso.StatusAtBound, aniso.StatusInactive} {
		for _, s := range shown {
			if s == st {
				out = append(out, st+": "+aniso.StatusMeaning(st))
				break
			}
		}
	}
	return out
}

// toHTMLFigure prepares a rendered figure for the page.
func toHTMLFigure(f renderedFigure, withPNG bool) htmlFigure {
	files := "plots/" + f.name + ".svg"
	if withPNG {
		files += ", plots/" + f.name + ".png"
	}
	return htmlFigure{ID: f.name, Title: f.title, Caption: f.caption, SVG: inlineSVG(f.svg, f.title), Files: files}
}

// heldoutText writes a candidate's held-out error ± its standard error.
func heldoutText(cc card.CandidateCard) string {
	m := float64(cc.HeldoutError)
	switch {
	case math.IsInf(m, 0):
		return "a fold failed"
	case math.IsNaN(m):
		return "—"
	}
	return fsig(m, 3) + " ± " + sameDecimals(float64(cc.HeldoutStdErr), m, 3)
}

// sameDecimals formats x with the decimals that n significant digits of
// ref take (at least one significant digit of x), so that a value and its
// standard error line up: 0.00735 ± 0.00026.
func sameDecimals(x, ref float64, n int) string {
	if bad(x) || bad(ref) || ref == 0 {
		return fsig(x, 2)
	}
	dec := n - 1 - int(math.Floor(math.Log10(math.Abs(ref))))
	if x != 0 {
		dec = max(dec, -int(math.Floor(math.Log10(math.Abs(x)))))
	}
	return fixed(x, max(dec, 0))
}
