package aniso

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// The discovery of a cohort's shared form; the steps are listed in
// cohort.go.

// cohortCandidate is one candidate form of a cohort.
type cohortCandidate struct {
	st  Structure
	key string
	// init are the parameters its scout found; rel its BIC there above the
	// scout's best, which picks the leader of each layout.
	init map[string]float64
	rel  float64
	// fits[i] is the form fitted to specimen i's search subset (nil when
	// it failed); cv[i] its leave-one-protocol-out score there.
	fits []*Result
	cv   []*CVScore
}

// formID names a model form with its terms, so that the same form found
// on two scouts is one candidate.
func formID(st Structure) string {
	var ls []string
	for _, t := range st.Terms {
		ls = append(ls, t.Label(st.Layout))
	}
	return fmt.Sprintf("%s|%t|%s", FormKey(st), st.HoldPairAxis, strings.Join(ls, "+"))
}

// screenSettings are the fit settings of the search (newSearch, discover.go): they
// compare forms, so a looser tolerance and the cheaper quadrature serve.
func (c *cohortRun) screenSettings() Settings {
	s := c.set.Discover.Fit
	s.Profile = false
	if s.Tolerance == 0 {
		s.Tolerance = searchTolerance
		s.SearchQuadrature = true
	}
	if s.MaxIterations == 0 {
		s.MaxIterations = searchMaxIterations
	}
	return s
}

// discoverForm runs steps 1–4 of cohort.go and returns the chosen form.
func (c *cohortRun) discoverForm() (Structure, error) {
	d := &Discovery{}
	c.out.Discovery = d
	c.scout()
	if len(c.cands) == 0 {
		return Structure{}, ErrNoCandidate
	}
	c.screen()
	if err := c.poolCandidates(); err != nil {
		return Structure{}, err
	}
	c.crossValidate()
	d.decideOn(c.evidence())
	presets := c.compareGreenPresets()
	c.noteMixedShear(&d.Verdict)
	c.support(presets)
	c.scoreForBand()
	c.keepSpecimenFits(presets)
	ci := c.paretoCand[d.Chosen]
	c.init = c.cands[ci].init
	d.Search = append(d.Search, c.searchNotes()...)
	return c.cands[ci].st, nil
}

// noteMixedShear adds to the cohort's verdict v, when some usable
// specimens carry shear information and others do not, how many do: the
// pooled evidence has shear information only when every specimen has it
// (evidence), so the verdict speaks of data "without shear information"
// although some specimens identify their angles' signs (a synthetic
// cohort of six, four on sutures with tracked shear, read so without a
// word of it).
func (c *cohortRun) noteMixedShear(v *Verdict) {
	use := c.usable()
	k := 0
	for _, i := range use {
		if c.sub[i].HasShear {
			k++
		}
	}
	if k > 0 && k < len(use) {
		v.Reason += fmt.Sprintf("; %d of %d specimens carry shear information and the others none, so the cohort's verdict, on their pooled evidence, is taken without it (each specimen's own verdict uses its own)", k, len(use))
	}
}

// chooseScouts spreads the scouts evenly over the usable specimens.
func chooseScouts(use []int, n int) []int {
	if n >= len(use) {
		return append([]int(nil), use...)
	}
	if n == 1 {
		return []int{use[(len(use)-1)/2]}
	}
	out := make([]int, n)
	for k := range out {
		out[k] = use[k*(len(use)-1)/(n-1)]
	}
	return out
}

// scout searches candidate forms on each scout specimen (step 1).
func (c *cohortRun) scout() {
	c.out.Scouts = chooseScouts(c.usable(), c.set.Scouts)
	seen := map[string]bool{}
	for _, i := range c.out.Scouts {
		s, err := newSearch(c.ps[i], c.set.Discover)
		if err != nil {
			continue
		}
		s.pl = c.pl
		s.searchForms()
		// The presets are fitted beside the search (fitFullForms); the
		// Fung-type comparison reuses them (compareGreenPresets).
		for k, name := range s.set.Presets {
			if r := s.presets[k]; r != nil {
				if c.scoutPresets == nil {
					c.scoutPresets = map[int]map[string]*Result{}
				}
				if c.scoutPresets[i] == nil {
					c.scoutPresets[i] = map[string]*Result{}
				}
				c.scoutPresets[i][name] = r
			}
		}
		if s.paretoFront() != nil {
			continue
		}
		minBIC := map[string]float64{}
		best := math.Inf(1)
		for _, cd := range s.d.Pareto {
			k := FormKey(cd.Result.Structure)
			if v, ok := minBIC[k]; !ok || cd.Result.BIC < v {
				minBIC[k] = cd.Result.BIC
			}
			best = math.Min(best, cd.Result.BIC)
		}
		bestSize := map[string]int{}
		for _, cd := range s.d.Pareto {
			if k := FormKey(cd.Result.Structure); cd.Result.BIC == minBIC[k] {
				bestSize[k] = cd.Result.Complexity
			}
		}
		for _, cd := range s.d.Pareto {
			// The one-standard-error rule picks models no larger than the
			// best, so larger ones are left to the scout's own front.
			k := FormKey(cd.Result.Structure)
			if cd.Result.BIC-minBIC[k] > cvBICWindow || cd.Result.Complexity > bestSize[k] {
				continue
			}
			st := canonical(activeStructure(cd.Result))
			id := formID(st)
			if seen[id] {
				continue
			}
			seen[id] = true
			c.cands = append(c.cands, &cohortCandidate{st: st, key: id, init: cd.Result.Params(), rel: cd.Result.BIC - best,
				fits: make([]*Result, len(c.ps)), cv: make([]*CVScore, len(c.ps))})
		}
	}
}

// leaders returns, per fibre layout, the candidate that leads its
// screening: an ideal family before a spread one, then the lowest BIC on
// its scout relative to that scout's best.
func (c *cohortRun) leaders() map[Layout]int {
	lead := map[Layout]int{}
	for ci, cd := range c.cands {
		j, ok := lead[cd.st.Layout]
		if !ok {
			lead[cd.st.Layout] = ci
			continue
		}
		lj := c.cands[j]
		spreadJ, spreadC := lj.st.Planar || lj.st.Dispersion, cd.st.Planar || cd.st.Dispersion
		if spreadJ && !spreadC || spreadJ == spreadC && cd.rel < lj.rel {
			lead[cd.st.Layout] = ci
		}
	}
	return lead
}

// screen fits the candidates to the usable specimens' search subsets
// (step 2): first every candidate to the scouts, then only those on each
// form's Pareto front over the scouts within ΔBIC cvBICWindow of the
// form's best (and the leaders) to the other specimens.
func (c *cohortRun) screen() {
	var scouts, rest []int
	isScout := map[int]bool{}
	for _, i := range c.out.Scouts {
		isScout[i] = true
	}
	for _, i := range c.usable() {
		if isScout[i] {
			scouts = append(scouts, i)
		} else {
			rest = append(rest, i)
		}
	}
	lead := c.leaders()
	all := make([]int, len(c.cands))
	for ci := range all {
		all[ci] = ci
	}
	c.screenOn(all, scouts, lead)
	keep := map[int]bool{}
	for _, ci := range lead {
		keep[ci] = true
	}
	front := c.paretoOf(all, scouts)
	minBIC := map[string]float64{}
	for _, pc := range front {
		if v, ok := minBIC[pc.form]; !ok || pc.r.BIC < v {
			minBIC[pc.form] = pc.r.BIC
		}
	}
	for _, pc := range front {
		if pc.r.BIC-minBIC[pc.form] <= cvBICWindow {
			keep[pc.ci] = true
		}
	}
	var kept []int
	for ci := range c.cands {
		if keep[ci] {
			kept = append(kept, ci)
		}
	}
	c.screened = len(kept)
	c.screenOn(kept, rest, lead)
	// A specimen that no candidate could be fitted to is left out.
	for _, i := range c.usable() {
		ok := false
		for _, cd := range c.cands {
			ok = ok || cd.fits[i] != nil
		}
		if !ok {
			c.out.Specimens[i].Err = fmt.Errorf("%s: no candidate model form could be fitted", c.ps[i].Specimen.Name)
		}
	}
}

// screenOn fits the candidates cis to the specimens idx: the leaders
// first, with an angle scan, then the others warm-started from their
// leader's angles on the same specimen.
func (c *cohortRun) screenOn(cis, idx []int, lead map[Layout]int) {
	set := c.screenSettings()
	isLeader := map[int]bool{}
	for _, ci := range lead {
		isLeader[ci] = true
	}
	for round := 0; round < 2; round++ {
		var jobs []func()
		for _, ci := range cis {
			cd := c.cands[ci]
			if isLeader[ci] != (round == 0) {
				continue
			}
			leader := c.cands[lead[cd.st.Layout]]
			for _, i := range idx {
				jobs = append(jobs, func() {
					s := set
					s.Init = cd.init
					if lf := leader.fits[i]; round == 1 && lf != nil {
						s.Init, s.NoScan = withLayoutParams(cd.init, lf.Params()), true
					}
					cd.fits[i], _ = Fit(c.sub[i], cd.st, s)
				})
			}
		}
		c.pl.run(jobs)
	}
}

// withLayoutParams is init with the layout's own parameters (angles,
// concentration, dispersion: the names without a term label) taken from
// from where it has them.
func withLayoutParams(init, from map[string]float64) map[string]float64 {
	out := map[string]float64{}
	for k, v := range init {
		out[k] = v
	}
	for k, v := range from {
		if !strings.Contains(k, "[") {
			out[k] = v
		}
	}
	return out
}

// pooledCand is a candidate's evidence summed over specimens.
type pooledCand struct {
	ci   int
	form string
	r    *Result
}

// paretoOf pools the candidates cis over the specimens use and keeps, per
// form, the best at each number of parameters that improves on every
// smaller one (by the summed loss), simplest form first.
func (c *cohortRun) paretoOf(cis, use []int) []pooledCand {
	type pkey struct {
		form   string
		params int
	}
	best := map[pkey]pooledCand{}
	var keys []pkey
	for _, ci := range cis {
		cd := c.cands[ci]
		r := c.pooledResult(cd, use)
		if r == nil {
			continue
		}
		k := pkey{FormKey(cd.st), r.Complexity}
		old, ok := best[k]
		if !ok {
			keys = append(keys, k)
		}
		if !ok || less(r.Loss, old.r.Loss) {
			best[k] = pooledCand{ci, k.form, r}
		}
	}
	sort.SliceStable(keys, func(a, b int) bool {
		ra, rb := formRank(c.cands[best[keys[a]].ci].st), formRank(c.cands[best[keys[b]].ci].st)
		if ra != rb {
			return ra < rb
		}
		return keys[a].params < keys[b].params
	})
	var out []pooledCand
	last := map[string]float64{}
	for _, k := range keys {
		pc := best[k]
		if prev, ok := last[k.form]; ok && pc.r.Loss >= prev {
			continue
		}
		last[k.form] = pc.r.Loss
		out = append(out, pc)
	}
	return out
}

// poolCandidates makes the Pareto front of the candidates fitted to every
// usable specimen the candidates of the pooled discovery (step 3).
func (c *cohortRun) poolCandidates() error {
	use := c.usable()
	all := make([]int, len(c.cands))
	for ci := range all {
		all[ci] = ci
	}
	d := c.out.Discovery
	for _, pc := range c.paretoOf(all, use) {
		st := c.cands[pc.ci].st
		d.Pareto = append(d.Pareto, Candidate{Name: fmt.Sprintf("%s-t%d-p%d", formName(st), len(st.Terms), pc.r.Complexity),
			Layout: st.Layout, Terms: len(st.Terms), Result: pc.r})
		c.paretoCand = append(c.paretoCand, pc.ci)
	}
	if len(d.Pareto) == 0 {
		return ErrNoCandidate
	}
	for _, i := range use {
		d.Points += c.ps[i].Data.Points()
		d.SearchPoints += c.sub[i].Data.Points()
	}
	return nil
}

// pooledResult sums a candidate's fits over the specimens use (nil when
// any of them failed): loss, rows, estimated quantities, AICc and BIC add
// up for independent specimens with their own parameters. Its model is
// the median specimen's parameters, to describe the form in words.
func (c *cohortRun) pooledResult(cd *cohortCandidate, use []int) *Result {
	r := &Result{Structure: cd.st, SignKnown: true}
	var fits []*Result
	for _, i := range use {
		f := cd.fits[i]
		if f == nil {
			return nil
		}
		fits = append(fits, f)
		r.Loss += f.Loss
		r.Rows += f.Rows
		r.FreeParams += f.FreeParams
		r.AICc += f.AICc
		r.BIC += f.BIC
		r.Complexity = max(r.Complexity, f.Complexity)
		r.SignKnown = r.SignKnown && f.SignKnown
	}
	lm := newLabelMaps(fits, r.SignKnown)
	r.Model = medianModel(fits, lm)
	r.Weights = make([]float64, len(cd.st.Terms))
	for g := range r.Weights {
		ws := make([]float64, len(fits))
		for k, f := range fits {
			// A free layout has one model term per structure term, so
			// the term map serves the weights too.
			ws[k] = f.Weights[lm.term(k, g)]
		}
		r.Weights[g] = median(ws)
	}
	return r
}

// labelMaps says, for each fit of one two-family form, which of its
// families and terms stand for each family and term of the first fit: the
// same labels, unless the fit calls its families the other way round (a
// free pair has no fixed labelling, see familyorder.go, and a mirror pair
// whose axis is learned reads θ ± β as θ + 90° ∓ (90° − β)), so that
// medians are taken over like families. swapped[k] is true for such a fit
// k.
type labelMaps struct {
	swapped []bool
	other   []int // per term of the first fit's model: the same shape's term on the other family, or −1
}

// newLabelMaps finds the fits whose two families match the first fit's
// better swapped, by angle (by magnitude when a sign is unknown) and, for
// free families, with the same shapes on each family.
func newLabelMaps(fits []*Result, signKnown bool) labelMaps {
	lm := labelMaps{swapped: make([]bool, len(fits))}
	ref := fits[0].Model
	layout := fits[0].Structure.Layout
	if layout != LayoutFree && layout != LayoutMirror || len(ref.Families) != 2 {
		return lm
	}
	lm.other = make([]int, len(ref.Terms))
	for t := range ref.Terms {
		lm.other[t] = -1
		f := ref.Terms[t].Family
		if f < 0 || layout == LayoutMirror {
			// A mirror pair's members share every term's weight and
			// parameters: only their angles swap (θ ± β read as
			// θ + 90° ∓ (90° − β)).
			lm.other[t] = t
			continue
		}
		nth := 0 // t is the nth term on its family
		for u := 0; u < t; u++ {
			if ref.Terms[u].Family == f {
				nth++
			}
		}
		for u := range ref.Terms {
			if ref.Terms[u].Family == 1-f {
				if nth == 0 && ref.Terms[u].Shape == ref.Terms[t].Shape {
					lm.other[t] = u
				}
				nth--
			}
		}
		if lm.other[t] < 0 {
			return labelMaps{swapped: lm.swapped} // the families carry different shapes
		}
	}
	gap := func(a, b float64) float64 {
		return math.Abs(familyOrderAngle(a-b, true))
	}
	if !signKnown {
		gap = func(a, b float64) float64 {
			return math.Abs(familyOrderAngle(a, false) - familyOrderAngle(b, false))
		}
	}
	r0, r1 := ref.Families[0].Angle, ref.Families[1].Angle
	for k, f := range fits {
		x0, x1 := f.Model.Families[0].Angle, f.Model.Families[1].Angle
		lm.swapped[k] = gap(r0, x1)+gap(r1, x0) < gap(r0, x0)+gap(r1, x1)
	}
	return lm
}

// term returns the index in fit k's model of the term that stands for
// term t of the first fit's model.
func (lm labelMaps) term(k, t int) int {
	if lm.swapped[k] && lm.other != nil && lm.other[t] >= 0 {
		return lm.other[t]
	}
	return t
}

// family returns the index in fit k's model of the family that stands for
// family f of the first fit's model.
func (lm labelMaps) family(k, f int) int {
	if lm.swapped[k] && lm.other != nil {
		return 1 - f
	}
	return f
}

// medianModel is the first fit's model with every weight, parameter,
// angle (on the branch nearest the first fit's), concentration and
// dispersion replaced by its median over the fits, each fit's families and
// terms matched to the first fit's by lm.
func medianModel(fits []*Result, lm labelMaps) *Model {
	m := cloneModelDeep(fits[0].Model)
	vals := make([]float64, len(fits))
	med := func(get func(k int, x *Model) float64) float64 {
		for k, f := range fits {
			vals[k] = get(k, f.Model)
		}
		return median(vals)
	}
	for t := range m.Terms {
		m.Terms[t].Weight = med(func(k int, x *Model) float64 { return x.Terms[lm.term(k, t)].Weight })
		for j := range m.Terms[t].Params {
			m.Terms[t].Params[j] = med(func(k int, x *Model) float64 { return x.Terms[lm.term(k, t)].Params[j] })
		}
	}
	for f := range m.Families {
		a0 := m.Families[f].Angle
		m.Families[f].Angle = wrapAngle(med(func(k int, x *Model) float64 { return a0 + wrapAngle(x.Families[lm.family(k, f)].Angle-a0) }))
		m.Families[f].Concentration = med(func(k int, x *Model) float64 { return x.Families[lm.family(k, f)].Concentration })
		m.Families[f].Dispersion = med(func(k int, x *Model) float64 { return x.Families[lm.family(k, f)].Dispersion })
	}
	return m
}

// median of v (v is reordered).
func median(v []float64) float64 {
	sort.Float64s(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return (v[n/2-1] + v[n/2]) / 2
}

// withCV lists the usable specimens that can be cross-validated (two
// protocols or more).
func (c *cohortRun) withCV() []int {
	var out []int
	for _, i := range c.usable() {
		if len(c.sub[i].Protocols) > 1 {
			out = append(out, i)
		}
	}
	return out
}

// walkBICMargin is the least ΔBIC at which compare (select.go) counts a
// step of the verdict walk as suggestive; a richer form whose best BIC is
// not that far below the current winner's can neither replace it nor
// leave the verdict undecided.
const walkBICMargin = 2

// crossValidate scores the pooled candidates on every specimen with two
// protocols or more and pools the scores: one fold per specimen, its error
// the specimen's mean held-out error (step 3); see scoreAlongWalk for which
// candidates are scored.
func (c *cohortRun) crossValidate() {
	d := c.out.Discovery
	cvs := c.withCV()
	if len(cvs) == 0 {
		return
	}
	d.hasCV = true
	c.skipped = scoreAlongWalk(d, c.evidence(), func(ks []int) { c.scoreCandidates(ks, cvs) })
}

// scoreAlongWalk cross-validates (score) the candidates of d within ΔBIC
// cvBICWindow of their form's best, form by form in the order of the
// verdict walk (select.go), and leaves out a form that cannot change the
// verdict: one whose best BIC is less than walkBICMargin below the current
// winner's. It returns the forms left out.
func scoreAlongWalk(d *Discovery, ev evidence, score func(ks []int)) (skipped []string) {
	minBIC, forms := bestBICByForm(d)
	sort.SliceStable(forms, func(a, b int) bool { return formRankOfKey(d, forms[a]) < formRankOfKey(d, forms[b]) })
	floor := seFloor(d.noiseLevel(ev), ev)
	var win *formBest
	for _, fk := range forms {
		if win != nil && minBIC[fk] > win.c.Result.BIC-walkBICMargin {
			skipped = append(skipped, fk)
			continue
		}
		var ks []int
		for k, pc := range d.Pareto {
			if FormKey(pc.Result.Structure) == fk && pc.Result.BIC-minBIC[fk] <= cvBICWindow {
				ks = append(ks, k)
			}
		}
		score(ks)
		fb := &formBest{key: fk, rank: formRank(d.Pareto[ks[0]].Result.Structure), c: &d.Pareto[ks[0]], idx: ks[0]}
		for _, k := range ks[1:] {
			if candidateLess(&d.Pareto[k], fb.c) {
				fb.c, fb.idx = &d.Pareto[k], k
			}
		}
		if win == nil || compare(win, fb, floor).Decisive {
			win = fb
		}
	}
	return skipped
}

// bestBICByForm returns the lowest BIC of d's candidates of each form
// (FormKey) and the forms in the order they first appear.
func bestBICByForm(d *Discovery) (map[string]float64, []string) {
	minBIC := map[string]float64{}
	var forms []string
	for _, pc := range d.Pareto {
		k := FormKey(pc.Result.Structure)
		v, ok := minBIC[k]
		if !ok {
			forms = append(forms, k)
		}
		if !ok || pc.Result.BIC < v {
			minBIC[k] = pc.Result.BIC
		}
	}
	return minBIC, forms
}

// formRankOfKey is the walk rank of the form key k among d's candidates.
func formRankOfKey(d *Discovery, k string) int {
	for _, pc := range d.Pareto {
		if FormKey(pc.Result.Structure) == k {
			return formRank(pc.Result.Structure)
		}
	}
	return 0
}

// scoreCandidates cross-validates the pooled candidates ks on the
// specimens cvs (those not scored yet) and sets their pooled scores.
func (c *cohortRun) scoreCandidates(ks, cvs []int) {
	d := c.out.Discovery
	set := c.screenSettings()
	var jobs []func()
	for _, k := range ks {
		cd := c.cands[c.paretoCand[k]]
		for _, i := range cvs {
			if cd.cv[i] != nil {
				// A specimen's own verdict walk (support) scored it with
				// the same settings: the same folds, bit for bit.
				continue
			}
			cd.cv[i] = &CVScore{Folds: make([]CVFold, len(c.sub[i].Protocols))}
			for f := range c.sub[i].Protocols {
				jobs = append(jobs, func() { cd.cv[i].Folds[f] = cvFold(c.sub[i], cd.fits[i], f, set) })
			}
		}
	}
	c.pl.run(jobs)
	for _, k := range ks {
		cd := c.cands[c.paretoCand[k]]
		pooled := &CVScore{}
		for _, i := range cvs {
			cd.cv[i].summarise()
			pooled.Folds = append(pooled.Folds, CVFold{Protocol: c.ps[i].Specimen.Name, Error: cd.cv[i].Mean})
		}
		pooled.summarise()
		d.Pareto[k].CV = pooled
	}
}

// evidence is the cohort's pooled evidence for the verdict walk.
func (c *cohortRun) evidence() evidence {
	ev := evidence{hasShear: true, oneProtocol: true, idealOnly: c.set.Discover.NoPlanar}
	use := c.usable()
	for _, i := range use {
		p := c.sub[i]
		ev.rows += p.Rows()
		ev.series += len(p.Protocols) * len(p.Output.Components)
		ev.hasShear = ev.hasShear && p.HasShear
		ev.oneProtocol = ev.oneProtocol && len(p.Protocols) == 1
		if ev.preload == "" {
			if pre := preloadText(p); pre != "" {
				ev.preload = p.Specimen.Name + ", " + pre
			}
		}
		if ev.shearScatter == "" {
			if sc := shearScatterText(p); sc != "" {
				ev.shearScatter = p.Specimen.Name + ", " + sc
			}
		}
	}
	byName := map[string]*cohortCandidate{}
	for k, pc := range c.out.Discovery.Pareto {
		byName[pc.Name] = c.cands[c.paretoCand[k]]
	}
	ev.admissible = func(cand *Candidate) string {
		cd := byName[cand.Name]
		for _, i := range use {
			if why := admissibleOnData(cd.fits[i].Model, c.sub[i]); why != "" {
				return fmt.Sprintf("%s on %s", why, c.ps[i].Specimen.Name)
			}
		}
		return ""
	}
	return ev
}

// support runs the verdict walk on each specimen's own evidence (its fits
// of the pooled candidates, cross-validated where its walk needs them, see
// scoreAlongWalk, and of the presets compareGreenPresets pooled, so that
// its own verdict weighs them as the pooled one does) and counts the
// specimens that reach the cohort's verdict and form, and those whose own
// chosen model puts its fibres where the cohort's does (directionGapDeg;
// step 4).
func (c *cohortRun) support(presets []*cohortCandidate) {
	d := c.out.Discovery
	want := FormKey(d.Best().Result.Structure)
	set := c.screenSettings()
	own := make([]*Result, len(c.ps))
	var jobs []func()
	for _, i := range c.usable() {
		jobs = append(jobs, func() {
			own := &own[i]
			od := &Discovery{hasCV: d.hasCV && len(c.sub[i].Protocols) > 1}
			var cds []*cohortCandidate
			for k, pc := range d.Pareto {
				cd := c.cands[c.paretoCand[k]]
				cds = append(cds, cd)
				od.Pareto = append(od.Pareto, Candidate{Name: pc.Name, Layout: pc.Layout, Terms: pc.Terms, Result: cd.fits[i]})
			}
			for _, cd := range presets {
				pc := Candidate{Name: cd.key, Layout: cd.st.Layout, Terms: len(cd.st.Terms), Result: cd.fits[i]}
				if od.hasCV {
					pc.CV = cd.cv[i]
				}
				od.Presets = append(od.Presets, pc)
			}
			if od.hasCV {
				scoreAlongWalk(od, problemEvidence(c.sub[i]), func(ks []int) {
					for _, k := range ks {
						if cds[k].cv[i] == nil {
							cds[k].cv[i] = scoreFolds(c.sub[i], cds[k].fits[i], set)
						}
						od.Pareto[k].CV = cds[k].cv[i]
					}
				})
			}
			od.decide(c.sub[i], c.set.Discover.NoPlanar)
			sp := &c.out.Specimens[i]
			sp.Verdict, sp.Form = od.Verdict.Families, FormKey(od.Best().Result.Structure)
			*own = od.Best().Result
		})
	}
	c.pl.run(jobs)
	s := &c.out.Support
	ref := d.Best().Result
	for _, i := range c.usable() {
		sp := &c.out.Specimens[i]
		s.Specimens++
		if sp.Verdict != d.Verdict.Families {
			continue
		}
		s.SameVerdict++
		if sp.Form == want {
			s.SameForm++
		}
		sp.DirectionGap = directionGapDeg(own[i].Model, ref.Model, ref.SignKnown && own[i].SignKnown)
		if sp.DirectionGap <= directionToleranceDeg {
			s.SameDirection++
		}
	}
	d.Verdict.Reason += fmt.Sprintf("; on its own evidence, %d of %d specimens reach the same verdict (%d of them with the same form, %s; %d of them with their own model's fibre directions within %d° of the cohort's, %s)",
		s.SameVerdict, s.Specimens, s.SameForm, want, s.SameDirection, directionToleranceDeg, directionWords(ref))
}

// scoreForBand cross-validates, after the verdict, the candidates of the
// forms the verdict walk left out (skipped) that lie within ΔBIC
// cvBICWindow of their form's best, as a single specimen's discovery
// cross-validates every form. Their pooled held-out errors do not enter
// the verdict, which they could not change, but they say which forms the
// pooled evidence cannot tell from the chosen one: the band of each
// specimen's untested strips (SpecimenEvidence). Without them a cohort's
// band was most often empty (nine synthetic cohorts, 2026-12-05: 1–4 of
// 7–12 candidates cross-validated, no strip measured in seven, while each
// file fitted alone had 1–14 near-equivalents).
func (c *cohortRun) scoreForBand() {
	d := c.out.Discovery
	cvs := c.withCV()
	if len(c.skipped) == 0 || len(cvs) == 0 {
		return
	}
	left := map[string]bool{}
	for _, fk := range c.skipped {
		left[fk] = true
	}
	minBIC, _ := bestBICByForm(d)
	var ks []int
	for k, pc := range d.Pareto {
		fk := FormKey(pc.Result.Structure)
		if pc.CV == nil && left[fk] && pc.Result.BIC-minBIC[fk] <= cvBICWindow {
			ks = append(ks, k)
		}
	}
	c.scoreCandidates(ks, cvs)
	c.bandScored = len(ks)
}

// keepSpecimenFits keeps, for each usable specimen, its fits of the
// pooled candidates and presets (SpecimenEvidence).
func (c *cohortRun) keepSpecimenFits(presets []*cohortCandidate) {
	for _, i := range c.usable() {
		sp := &c.out.Specimens[i]
		sp.candidateFits = make([]*Result, len(c.paretoCand))
		for k, ci := range c.paretoCand {
			sp.candidateFits[k] = c.cands[ci].fits[i]
		}
		sp.presetFits = make([]*Result, len(presets))
		for k, cd := range presets {
			sp.presetFits[k] = cd.fits[i]
		}
	}
}

// searchNotes say how the cohort's candidates were found and scored.
func (c *cohortRun) searchNotes() []string {
	var names []string
	for _, i := range c.out.Scouts {
		names = append(names, c.ps[i].Specimen.Name)
	}
	d := c.out.Discovery
	n := -c.bandScored
	for _, pc := range d.Pareto {
		if pc.CV != nil {
			n++
		}
	}
	skipped := ""
	if len(c.skipped) > 0 {
		skipped = fmt.Sprintf("; not cross-validated for the verdict, since their best pooled BIC is less than %d below the winner's at their step of the verdict walk, so they could neither win nor leave the verdict undecided: %s", walkBICMargin, strings.Join(c.skipped, ", "))
	}
	if c.bandScored > 0 {
		skipped += fmt.Sprintf("; their %d candidates within ΔBIC %d of their form's best were cross-validated after the verdict, for the band of the specimens' untested strips only (their held-out errors do not enter the verdict)", c.bandScored, cvBICWindow)
	}
	return []string{
		fmt.Sprintf("candidate forms searched on %d scout specimen(s) spread over the cohort (%s) with discovery's search; %d distinct forms within ΔBIC %d of their form's best on a scout and no larger than that best", len(names), strings.Join(names, ", "), len(c.cands), cvBICWindow),
		fmt.Sprintf("every candidate fitted to the scouts, and the %d on their form's Pareto front over the scouts within ΔBIC %d of its best to every specimen (at most %d points per protocol): per fibre layout the form best on its scout with an angle scan, the others warm-started from its angles", c.screened, cvBICWindow, c.set.Discover.SearchPoints),
		fmt.Sprintf("pooled over %d specimens: summed loss and BIC, the Pareto front of each form; %d candidates within ΔBIC %d of their form's best cross-validated on every specimen (leave one protocol out); pooled held-out error = mean over specimens of each specimen's mean fold error (each specimen weighted equally), standard error over specimens%s", len(c.usable()), n, cvBICWindow, skipped),
	}
}
