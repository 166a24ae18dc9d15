package aniso

import (
	"encoding/binary"
	"fmt"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
)

// profiles computes the loss profile over every angle parameter: at each
// grid angle the loss minimised over every other non-linear parameter and
// the weights. The 95 % profile-likelihood interval is where the profile
// stays below loss·(1 + F(0.95; 1, n−k)/(n−k)) (Bates & Watts 1988, §6.1;
// Venzon & Moolgavkar 1988); its ends are refined by bisection between the
// grid angles that bracket the threshold. Each angle parameter is profiled
// on its own engine, in parallel.
func (r *Result) profiles(p *Problem, set Settings) {
	e := r.e
	n, k := r.Rows, r.FreeParams
	if n <= k {
		return
	}
	fq := profileQuantile(n, k)
	r.sweeps++
	var idx []int
	for i, q := range e.params {
		if q.Kind == kindAngle {
			idx = append(idx, i)
		}
	}
	// Many rows: every profile is guided by the search subset, built once.
	var guideOn *Problem
	if p.Rows() > profileGuideRows {
		if ps, err := searchSubset(p, DefaultSearchPoints); err == nil && ps != p {
			guideOn = ps
		}
	}
	out := make([]AngleProfile, len(idx))
	jobs := make([]func(), len(idx))
	for j, i := range idx {
		jobs[j] = func() {
			// One angle alone: its two halves (above and below the
			// optimum) are profiled side by side, each on its own engine.
			var twin *engine
			if len(idx) == 1 {
				twin = r.profileEngine(p)
			}
			out[j] = r.profileOne(r.profileEngine(p), twin, p, guideOn, i, set, fq)
		}
	}
	(&pool{n: len(jobs)}).run(jobs)
	r.Profiles = append(r.Profiles, out...)
	// Leave the fit's engine at the optimum.
	e.eval(r.theta, true)
	for _, pr := range out {
		if pr.Unresolved && !pr.NotDetermined {
			// A profile that stays below the threshold everywhere does so
			// however much lower the true one lies; one that crosses it
			// may cross too early.
			r.Flags = append(r.Flags, fmt.Sprintf("%s: its loss profile was still falling when its sweeps reached their bound of work (%d loss evaluations), so it may lie above the true profile and its interval [%.2f°, %.2f°] may be too narrow (model.json also gives the Wald interval)", pr.Name, pr.Evaluations, pr.LoDeg, pr.HiDeg))
		}
		if !pr.NotDetermined {
			if where := pr.belowAway(); where != "" {
				why := ""
				switch {
				case r.Structure.Layout == LayoutFree:
					why = " (there the other family can take this family's place)"
				case r.Structure.Layout == LayoutMirror && !r.Structure.HoldPairAxis && !p.HasShear:
					why = " (without shear information a pair at θ ± β and one at β ± θ have the same fibre directions up to their signs)"
				}
				r.Flags = append(r.Flags, fmt.Sprintf("%s: its loss profile also falls below the 95 %% threshold away from its interval [%.2f°, %.2f°], at %s on the profile's grid%s, so the data exclude neither region: the 95 %% profile confidence set is not one interval", pr.Name, pr.LoDeg, pr.HiDeg, where, why))
			}
			// An angle on a symmetry line has no Wald interval (its
			// column is zero, so the covariance leaves it undetermined);
			// a profile that bounds it determines it, with the profile's
			// interval (package note, Mirror symmetry).
			for j := range r.Estimates {
				est := &r.Estimates[j]
				if est.Name == pr.Name && est.onMirrorLine && est.Status == StatusNotDetermined {
					est.Status = StatusEstimated
				}
			}
			continue
		}
		for j := range r.Estimates {
			est := &r.Estimates[j]
			if est.Name == pr.Name && (est.Status == StatusEstimated || est.Status == StatusCorrelated) {
				est.Status = StatusNotDetermined
				est.StdErr, est.Lo, est.Hi = math.NaN(), math.NaN(), math.NaN()
			}
		}
		why := ""
		if r.Structure.Layout == LayoutFree {
			why = " (the other family can take this family's place)"
		}
		r.Flags = append(r.Flags, fmt.Sprintf("%s is not determined by the data: its loss profile stays below the 95 %% threshold over the angle's whole range, so the data exclude no angle%s", pr.Name, why))
	}
}

// profileQuantile is F₀.₉₅(1, n − k), the quantile of the 95 % profile
// threshold L·(1 + F₀.₉₅(1, n − k)/(n − k)) for n residuals and k free
// parameters (Bates & Watts 1988, §6.1).
func profileQuantile(n, k int) float64 {
	return distuv.F{D1: 1, D2: float64(n - k)}.Quantile(0.95)
}

// thresholdMargin is how far the 95 % profile threshold lies above the
// fit's loss, L·F₀.₉₅(1, n − k)/(n − k); 0 when n ≤ k.
func (r *Result) thresholdMargin() float64 {
	n, k := r.Rows, r.FreeParams
	if n <= k {
		return 0
	}
	return r.Loss * profileQuantile(n, k) / float64(n-k)
}

// belowAway describes where, away from [LoDeg, HiDeg], the profile lies
// at or below the threshold on its grid ("" where it does nowhere): the
// arc from HiDeg onwards round the 180° period to the last such grid angle
// (beyond 90° where it passes it, as an interval may), or for a mirrored
// profile (|α|) the ranges of |α| below LoDeg and above HiDeg. The
// interval is the connected part of the confidence set {angle: profile ≤
// threshold} that holds the optimum (Venzon & Moolgavkar 1988 follow the
// profile outwards from the optimum); a profile that dips below the
// threshold again elsewhere (two free families, where the other family
// takes this one's place over part of the period, or a second local
// minimum) makes the set two or more pieces, and the interval alone would
// understate it.
func (pr AngleProfile) belowAway() string {
	if pr.NotDetermined || math.IsNaN(pr.LoDeg) || math.IsNaN(pr.HiDeg) {
		return ""
	}
	// A margin of 1e-9° keeps the interval's own ends (grid points within
	// round-off of them) inside.
	const eps = 1e-9
	in := func(a float64) bool {
		if pr.Mirrored || !pr.periodic {
			return a >= pr.LoDeg-eps && a <= pr.HiDeg+eps
		}
		d := math.Mod(a-pr.LoDeg, 180)
		if d < 0 {
			d += 180
		}
		return d <= pr.HiDeg-pr.LoDeg+eps || d >= 180-eps
	}
	// inside: in the interval, or in its image under the pair's exact
	// equivalence (the same two families described from the other
	// bisector: θ + 90° with 90° − β).
	inside := func(a float64) bool {
		if pr.Mirrored {
			a = math.Abs(a)
		}
		switch {
		case in(a):
			return true
		case pr.twin == twinMeanAngle && pr.Mirrored:
			return in(90 - a)
		case pr.twin == twinMeanAngle:
			return in(a - 90)
		case pr.twin == twinHalfAngle:
			return in(90 - a)
		}
		return false
	}
	var parts []string
	if pr.Mirrored || !pr.periodic {
		lo, hi := math.Inf(1), math.Inf(-1)
		blo, bhi := math.Inf(1), math.Inf(-1)
		for j, a := range pr.AnglesDeg {
			if pr.Mirrored {
				a = math.Abs(a)
			}
			switch {
			case pr.Loss[j] > pr.Threshold || inside(a):
			case a < pr.LoDeg:
				blo, bhi = math.Min(blo, a), math.Max(bhi, a)
			default:
				lo, hi = math.Min(lo, a), math.Max(hi, a)
			}
		}
		if blo <= bhi {
			parts = append(parts, fmt.Sprintf("%.1f°–%.1f°", blo, bhi))
		}
		if lo <= hi {
			parts = append(parts, fmt.Sprintf("%.1f°–%.1f°", lo, hi))
		}
		return strings.Join(parts, " and ")
	}
	dlo, dhi := math.Inf(1), math.Inf(-1)
	for j, a := range pr.AnglesDeg {
		if pr.Loss[j] > pr.Threshold || inside(a) {
			continue
		}
		// Offset from the interval's upper end along the period.
		d := math.Mod(a-pr.HiDeg, 180)
		if d < 0 {
			d += 180
		}
		dlo, dhi = math.Min(dlo, d), math.Max(dhi, d)
	}
	if dlo <= dhi {
		return fmt.Sprintf("%.1f°–%.1f°", pr.HiDeg+dlo, pr.HiDeg+dhi)
	}
	return ""
}

// Exact equivalences of a profiled angle (AngleProfile.twin): a mirror
// pair with a learned axis is the same two families at (θ, β) and at
// (θ + 90°, 90° − β), so its mean angle's profile repeats 90° on and its
// half angle's about 45°.
const (
	twinNone = iota
	twinMeanAngle
	twinHalfAngle
)

// profileEngine returns an engine for profiling r on p. Profiles of a
// dispersed family re-optimise at every grid angle: they integrate with
// the search rule, shifted to agree with the fit at its optimum (about
// 1e-5 of the loss near it; away from it up to 7e-5 on the three-family
// specimen of issue 14, at a profile point with a concentration of 127:
// 0.9 % of the 95 % threshold's margin there).
func (r *Result) profileEngine(p *Problem) *engine {
	e := r.e
	pe := newEngine(p, cloneModelDeep(e.model), e.groups, e.famOf, e.layout, e.params)
	if r.Structure.Planar {
		pe.cols.Search = true
		pe.lossOffset = pe.eval(r.theta, false) - r.Loss
	}
	return pe
}

// profileMinimum returns the lowest point any profile met, with its
// parameters (+Inf when there is none).
func (r *Result) profileMinimum() ([]float64, float64) {
	best, th := math.Inf(1), []float64(nil)
	for _, pr := range r.Profiles {
		if pr.minTheta != nil && pr.minLoss < best {
			best, th = pr.minLoss, pr.minTheta
		}
	}
	return append([]float64(nil), th...), best
}

// profileIterations bounds each re-optimisation at a profile angle (warm
// starts are close), profileRounds the pairs of sweeps over the grid after
// the first, and profileWork a sweep's loss evaluations per grid angle
// (checked before each further round, where the halves have joined, so
// that the bound is the same on any number of cores: the work of one
// profile is at most that plus one round and the interval ends; see
// profiler.budget). A round re-places only the angles whose neighbour
// moved (profiler.minimize's memo), so a converged round costs nothing
// and twelve rounds resolve where three did not: the three-family
// specimen of issue 14 stopped after three with its profile still
// falling, and converged in at most twelve at 380 evaluations per grid
// angle; the other specimens checked took at most 100.
// profileFarIterations places a guided profile's angle far from the
// minimum, where the loss matters only to about 1e-3 of itself.
const (
	profileIterations    = 40
	profileRounds        = 12
	profileFarIterations = 6
)

// profileWork is a sweep's bound of loss evaluations per grid angle (see
// profileIterations); a variable so that a test can make it bite.
var profileWork = 600

// allBut marks every one of n parameters free but the held ones.
func allBut(n int, held ...int) []bool {
	free := make([]bool, n)
	for j := range free {
		free[j] = true
	}
	for _, i := range held {
		free[i] = false
	}
	return free
}

// profiler minimises the loss over every parameter but angle parameter i.
type profiler struct {
	e    *engine
	i    int
	free []bool
	// offLoss is the best loss of the form without the fibre family that
	// angle i moves, and offTheta its parameters: at every angle the
	// profile is at most offLoss, since zero weights for that family are
	// admissible at any angle.
	offLoss  float64
	offTheta []float64
	// iterations bounds each minimisation (profileIterations when 0).
	iterations int
	// near, when positive, is the loss above which a sweep only places an
	// angle, with profileFarIterations (see sweep); 0 minimises every
	// angle fully.
	near float64
	// twin, when set, profiles the angles below the optimum on an engine
	// of its own while this one profiles those above (see halves).
	twin *profiler
	// memo holds the minimisations run so far, by start (see minimize);
	// each profiler of a twin pair has its own.
	memo map[string][]minimisation
	// evals counts the loss evaluations of this profiler's minimisations
	// (its twin counts its own).
	evals int
	// budget, when positive, bounds the loss evaluations of a sweep
	// (with the twin's): no further round starts once they reach it.
	// unresolved is set when a sweep stopped (on the budget or after
	// profileRounds rounds) while its last round still lowered the
	// profile.
	budget     int
	unresolved bool
}

// withTwin gives pf a twin on engine e, with pf's settings, for the angles
// below the optimum (see halves).
func (pf *profiler) withTwin(e *engine) {
	tw := *pf
	tw.e = e
	tw.memo, tw.evals = nil, 0
	pf.twin = &tw
}

// work is the loss evaluations of pf and its twin.
func (pf *profiler) work() int {
	if pf.twin != nil {
		return pf.evals + pf.twin.evals
	}
	return pf.evals
}

// lower returns the profiler of the angles below the optimum.
func (pf *profiler) lower() *profiler {
	if pf.twin != nil {
		return pf.twin
	}
	return pf
}

// setNear sets near on pf and its twin.
func (pf *profiler) setNear(near float64) {
	pf.near = near
	if pf.twin != nil {
		pf.twin.near = near
	}
}

// halves runs up (the angles above the optimum, on pf) and down (those
// below, on pf.lower()) side by side when pf has a twin, else one after
// the other. They touch disjoint grid angles and an engine's result does
// not depend on what it evaluated before, so the profile is the same
// either way.
func (pf *profiler) halves(up, down func()) {
	if pf.twin == nil {
		up()
		down()
		return
	}
	done := make(chan struct{})
	go func() {
		defer close(done)
		down()
	}()
	up()
	<-done
}

func newProfiler(r *Result, p *Problem, pe *engine, i int, set Settings) *profiler {
	pf := &profiler{e: pe, i: i, free: allBut(len(pe.params), i)}
	pf.offLoss, pf.offTheta = r.familyOff(p, i, set)
	return pf
}

// familyOff fits r's form without the fibre family that angle parameter i
// moves (a mirror pair as a whole), with its own global angle scan, and
// returns its loss and its parameters mapped onto r's (the removed
// family's parameters kept at r's values). The loss is +Inf when that fit
// fails.
func (r *Result) familyOff(p *Problem, i int, set Settings) (float64, []float64) {
	e := r.e
	sf := e.angleFamily(i)
	theta := append([]float64(nil), r.theta...)
	sub := Structure{Dispersion: r.Structure.Dispersion, Planar: r.Structure.Planar, Layout: LayoutNone}
	var termOf []int // sub-structure term → r's term
	for g, t := range r.Structure.Terms {
		switch {
		case t.Family < 0:
		case r.Structure.Layout == LayoutFree && t.Family != sf:
			t.Family = 0
			sub.Layout = LayoutSingle
		default:
			continue
		}
		sub.Terms = append(sub.Terms, t)
		termOf = append(termOf, g)
	}
	if sub.Layout == LayoutNone {
		sub.Dispersion, sub.Planar = false, false
	}
	if len(sub.Terms) == 0 {
		// No term left: every weight is zero.
		yy := 0.0
		for _, y := range p.Target {
			yy += y * y
		}
		return yy, theta
	}
	res, err := Fit(p, sub, Settings{Starts: set.Starts, MaxIterations: set.MaxIterations})
	if err != nil {
		return math.Inf(1), nil
	}
	// canonical keeps the relative order of the terms, so sub-structure
	// term s is r's term termOf[s].
	for j, q := range res.e.params {
		for k, fq := range e.params {
			match := false
			switch q.Kind {
			case kindAngle:
				match = fq.Kind == kindAngle && fq.Angle == 1-sf
			case kindKappa, kindConcentration:
				match = fq.Kind == q.Kind && len(fq.Families) == 1 && fq.Families[0] == 1-sf
			case kindShape:
				match = fq.Kind == kindShape && fq.Group == termOf[q.Group] && fq.Index == q.Index
			}
			if match {
				theta[k] = res.theta[j]
			}
		}
	}
	return res.Loss, theta
}

// angleFamily is the structural family that angle parameter i moves: its
// own in a free layout, the first otherwise (a mirror pair's angles move
// both members).
func (e *engine) angleFamily(i int) int {
	if e.layout == LayoutFree {
		return e.params[i].Angle
	}
	return 0
}

// at returns the profiled loss at angle a and its parameters: the lowest of
// local minimisations from each start and from the family-off optimum,
// never above the family-off loss.
func (pf *profiler) at(a float64, starts ...[]float64) ([]float64, float64) {
	bestL, bestTh := math.Inf(1), []float64(nil)
	try := func(s []float64) {
		it := pf.iterations
		if it <= 0 {
			it = profileIterations
		}
		if th, l := pf.minimize(a, s, it); l < bestL {
			bestL, bestTh = l, th
		}
	}
	for _, s := range starts {
		if s != nil {
			try(s)
		}
	}
	if pf.offTheta != nil && !(bestL <= pf.offLoss) {
		// With the family back on, the non-negative weights can only
		// lower the family-off loss: a start that honours the bound.
		try(pf.offTheta)
		if !(bestL <= pf.offLoss) {
			bestL, bestTh = pf.offLoss, append([]float64(nil), pf.offTheta...)
			bestTh[pf.i] = a
		}
	}
	return bestTh, bestL
}

// profileMemo lets profiler.minimize serve a repeated minimisation from
// its memo; false runs every one (the reference the tests compare with).
var profileMemo = true

// minimisation is one local minimisation of a profile, remembered by
// profiler.minimize: its start (angle included), result and loss, its
// iteration cap and the iterations it took.
type minimisation struct {
	theta           []float64
	loss            float64
	cap, iterations int
}

// minimize minimises the loss at angle a from start (its angle replaced by
// a) with at most it iterations and returns the parameters and the loss.
// A minimisation is a deterministic function of its start and cap (an
// engine's result does not depend on what it evaluated before), so one
// already run from the same start is not run again: the same cap gives the
// same result, and so does any cap of at least the iterations taken by a
// run that stopped on its own before its cap (the iterations up to there
// are the same). Sweeps revisit angles from unchanged neighbours and place
// tries the start again after its rough run; on a three-family specimen
// (13 parameters, two angles) 56 % of the evaluations were such repeats.
func (pf *profiler) minimize(a float64, start []float64, it int) ([]float64, float64) {
	th := append([]float64(nil), start...)
	th[pf.i] = a
	key := make([]byte, 0, 8*len(th))
	for _, v := range th {
		key = binary.LittleEndian.AppendUint64(key, math.Float64bits(v))
	}
	if profileMemo {
		for _, m := range pf.memo[string(key)] {
			if m.cap == it || (m.iterations < m.cap && it >= m.iterations) {
				return append([]float64(nil), m.theta...), m.loss
			}
		}
	}
	lr := pf.e.minimize(th, pf.free, it)
	pf.evals += lr.Evals
	if pf.memo == nil {
		pf.memo = map[string][]minimisation{}
	}
	pf.memo[string(key)] = append(pf.memo[string(key)], minimisation{theta: append([]float64(nil), th...), loss: lr.Loss, cap: it, iterations: lr.Iterations})
	return th, lr.Loss
}

// place minimises at angle a from start: fully, or, with pf.near set, by
// a few iterations first, refined fully only when that lands within near
// (the rough loss is an upper bound of the profile, so an angle left
// rough lies above near, far outside any interval).
func (pf *profiler) place(a float64, start []float64) ([]float64, float64) {
	if pf.near <= 0 {
		return pf.at(a, start)
	}
	pf.iterations = profileFarIterations
	th, l := pf.at(a, start)
	pf.iterations = 0
	if l <= pf.near || th == nil {
		th, l = pf.at(a, th, start)
	}
	return th, l
}

// sweep profiles the grid: outwards from the optimum (grid index c, whose
// loss is the fit's), then inwards from the ends, each angle warm-started
// from the neighbour on that side and keeping the lower loss, repeated
// while a sweep still lowers some point. Over a full period the two ends
// are one angle, so each end also starts from the other.
func (pf *profiler) sweep(grid []float64, c int, fitLoss float64, fitTheta []float64, wraps bool) ([]float64, [][]float64) {
	n := len(grid)
	loss := make([]float64, n)
	thetas := make([][]float64, n)
	for j := range loss {
		loss[j] = math.Inf(1)
	}
	loss[c] = fitLoss
	thetas[c] = append([]float64(nil), fitTheta...)
	thetas[c][pf.i] = grid[c]
	// improved[0] is the upper half's, improved[1] the lower half's.
	var improved [2]bool
	from := func(q *profiler, half, j, nb int) {
		if j == c || nb < 0 || nb >= n || thetas[nb] == nil {
			return
		}
		th, l := q.place(grid[j], thetas[nb])
		if thetas[j] != nil && !(l < loss[j]) {
			return
		}
		// Another round is worth its cost only for a change the interval
		// could notice.
		if thetas[j] != nil && l < loss[j]*(1-1e-6) && (q.near <= 0 || l <= q.near) {
			improved[half] = true
		}
		loss[j], thetas[j] = l, th
	}
	lo := pf.lower()
	outwards := func() {
		pf.halves(func() {
			for j := c + 1; j < n; j++ {
				from(pf, 0, j, j-1)
			}
		}, func() {
			for j := c - 1; j >= 0; j-- {
				from(lo, 1, j, j+1)
			}
		})
	}
	outwards()
	for round := 0; ; round++ {
		if round == profileRounds || (pf.budget > 0 && pf.work() >= pf.budget) {
			// The last sweep still lowered the profile: it may lie
			// above the true one (see AngleProfile.Unresolved).
			pf.unresolved = true
			break
		}
		improved = [2]bool{}
		if wraps {
			from(pf, 0, n-1, 0)
			from(pf, 0, 0, n-1)
		}
		pf.halves(func() {
			for j := n - 2; j > c; j-- {
				from(pf, 0, j, j+1)
			}
		}, func() {
			for j := 1; j < c; j++ {
				from(lo, 1, j, j-1)
			}
		})
		if !improved[0] && !improved[1] {
			break
		}
		outwards()
	}
	return loss, thetas
}

// profileFarMargins is how many 95 % threshold margins (relative to the
// fit's loss) above the minimum an angle must lie for a profile to only
// place it (profileFarIterations): there its loss matters to the curve
// drawn, not to the interval. 0 minimises every angle fully (the
// reference the tests compare with).
var profileFarMargins = 100.0

// profileGuideRows is the number of residual rows above which a profile is
// guided by one on the search subset (see profileGuide): below it the
// full sweep is cheap.
var profileGuideRows = 8 * 2 * 5 * DefaultSearchPoints

// profileGuide returns, on ps (the subset discovery searches: evenly in
// each protocol's driving stretch, DefaultSearchPoints a protocol), every
// grid angle's other parameters minimised: starting points close to the
// full data's, found at a fraction of the cost. It returns nil when ps is
// nil (a problem of at most profileGuideRows rows). It also returns the
// loss evaluations it took.
//
// The subset's own optimum lies off the full data's by about its own
// standard error, several times the full data's interval, so the subset's
// profile is never used as the profile: only its parameters, as starts.
// With halves, the angles above and below the optimum are swept side by
// side on two engines (see profiler.halves).
func (r *Result) profileGuide(ps *Problem, i int, grid []float64, c int, theta []float64, wraps, halves bool) ([][]float64, int) {
	if ps == nil {
		return nil, 0
	}
	e := r.e
	engineOn := func() *engine {
		ge := newEngine(ps, cloneModelDeep(e.model), e.groups, e.famOf, e.layout, e.params)
		ge.cols.Search = r.Structure.Planar
		return ge
	}
	ge := engineOn()
	gf := &profiler{e: ge, i: i, free: allBut(len(ge.params), i), offLoss: math.Inf(1)}
	if halves {
		gf.withTwin(engineOn())
	}
	th, l := gf.at(grid[c], theta)
	if th == nil || math.IsInf(l, 1) {
		return nil, gf.work()
	}
	_, guide := gf.sweep(grid, c, l, th, wraps)
	return guide, gf.work()
}

// guided profiles the grid on the full data from the guide's starts: at
// each angle the minimisation starts from the guide's parameters and, near
// the minimum (within profileFarMargins of the 95 % threshold's relative
// margin thrRel), also from the neighbour towards the optimum, so that the
// interval rests on the full data's own profile.
func (pf *profiler) guided(grid []float64, c int, fitLoss float64, fitTheta []float64, guide [][]float64, thrRel float64) ([]float64, [][]float64) {
	n := len(grid)
	loss := make([]float64, n)
	thetas := make([][]float64, n)
	loss[c] = fitLoss
	thetas[c] = append([]float64(nil), fitTheta...)
	thetas[c][pf.i] = grid[c]
	// The full data's loss at the guide's parameters places an angle (an
	// upper bound of the profile, as is the family-off loss); those within
	// profileFarMargins of the minimum are minimised to the full tolerance
	// from the guide and from the neighbour.
	near := math.Inf(1)
	if profileFarMargins > 0 {
		near = fitLoss * (1 + profileFarMargins*thrRel)
	}
	lo := pf.lower()
	// The loss at each angle's guide parameters needs no neighbour: these
	// evaluations are shared evenly between the two engines (an engine's
	// result does not depend on what it evaluated before), where the
	// halves above and below the optimum can be uneven (an optimum near
	// 30° without shear: 30 angles above it, 15 below).
	// placedAt[j] is the guide's parameters at grid angle j, placed[j] the
	// full data's loss there (+Inf without a guide).
	placed := make([]float64, n)
	placedAt := make([][]float64, n)
	var js []int
	for j := range grid {
		placed[j] = math.Inf(1)
		if j != c && guide[j] != nil {
			placedAt[j] = append([]float64(nil), guide[j]...)
			placedAt[j][pf.i] = grid[j]
			js = append(js, j)
		}
	}
	evalGuides := func(q *profiler, js []int) {
		for _, j := range js {
			placed[j] = q.e.eval(placedAt[j], false)
			q.evals++
		}
	}
	half := (len(js) + 1) / 2
	pf.halves(func() { evalGuides(pf, js[:half]) }, func() { evalGuides(lo, js[half:]) })
	at := func(q *profiler, j, nb int) {
		th, l := placedAt[j], placed[j]
		if l > q.offLoss && q.offTheta != nil {
			th, l = append([]float64(nil), q.offTheta...), q.offLoss
			th[q.i] = grid[j]
		}
		if !(l > near) || th == nil || math.IsInf(l, 1) {
			th, l = q.at(grid[j], guide[j], thetas[nb])
		}
		loss[j], thetas[j] = l, th
	}
	pf.halves(func() {
		for j := c + 1; j < n; j++ {
			at(pf, j, j-1)
		}
	}, func() {
		for j := c - 1; j >= 0; j-- {
			at(lo, j, j+1)
		}
	})
	return loss, thetas
}

// crossing returns the angle between a (profile loss la ≤ thr,
// parameters thA) and b (lb > thr, thB) where the profile meets the
// threshold thr: regula falsi with the Illinois modification (Dowell &
// Jarratt 1971) on h = √(loss − minLoss) − √(thr − minLoss), each trial
// angle minimised from the brackets' parameters interpolated to it, until
// the bracket is narrower than tolAngle or a trial's loss is within
// tolLoss of the threshold (at most 8 trials, the cost of the bisection to
// step/256 it replaces). About its minimum the profile is nearly quadratic
// in the angle, so h is nearly linear in it on either side and the first
// trial lands close to the crossing however narrow the interval is
// against the grid step. On the loss itself a bracket whose outer end lies
// many interval widths out (dense data: an interval of 0.03° on a 2° grid)
// moves its inner end by steps that only double, and 8 trials ended short
// of the crossing.
//
// The answer is the secant root of h on the final bracket, with h's own
// values at its ends: a trial within tolLoss of the threshold is still
// about tolLoss/(2(thr − minLoss)) of the half-width from the crossing
// (0.005 of it for tolLoss 1 % of the margin: 0.003° on an interval of
// ±0.7°), and the Illinois step halves the value kept at a stale end, so
// interpolating with that halved value would misplace the root too.
func (pf *profiler) crossing(a, b, la, lb float64, thA, thB []float64, thr, minLoss, tolAngle, tolLoss float64) float64 {
	r0 := math.Sqrt(math.Max(thr-minLoss, 0))
	h := func(l float64) float64 { return math.Sqrt(math.Max(l-minLoss, 0)) - r0 }
	fa, fb := h(la), h(lb)
	// ha, hb are h at the bracket's ends; fa, fb the Illinois-scaled
	// values that only steer the trials.
	ha, hb := fa, fb
	side := 0
	for it := 0; it < 8 && math.Abs(b-a) > tolAngle; it++ {
		m := b - fb*(b-a)/(fb-fa)
		if !(math.Abs(m-a) < math.Abs(b-a)) || !(math.Abs(m-b) < math.Abs(b-a)) {
			m = (a + b) / 2
		}
		th, l := pf.at(m, pf.between(thA, thB, (m-a)/(b-a)))
		if l <= thr {
			a, fa, ha, thA = m, h(l), h(l), th
			if side < 0 {
				fb /= 2
			}
			side = -1
		} else {
			b, fb, hb, thB = m, h(l), h(l), th
			if side > 0 {
				fa /= 2
			}
			side = 1
		}
		if math.Abs(l-thr) <= tolLoss {
			break
		}
	}
	if hb-ha > 0 {
		return b - hb*(b-a)/(hb-ha)
	}
	return (a + b) / 2
}

// between returns the parameters a fraction u of the way from x to y (x
// or y alone when the other is nil), periodic angles along the shorter
// way round.
func (pf *profiler) between(x, y []float64, u float64) []float64 {
	switch {
	case x == nil:
		return y
	case y == nil:
		return x
	}
	out := make([]float64, len(x))
	for i := range x {
		d := y[i] - x[i]
		if pf.e.params[i].Periodic {
			d = wrapAngle(d)
		}
		out[i] = pf.e.params[i].project(x[i] + u*d)
	}
	return out
}

// profileGrid returns the grid from lo to hi with the optimum inserted and
// its index, so that the sweeps start there. Both ends belong to the grid:
// where the step does not divide the range, the last step is shorter.
// The ends are where an interval stops for want of data (|α| ∈ [0°, 90°]
// without shear information, a half angle's range) or where a full
// period closes on itself; until 2026-12-05 a 4° grid over |α| ended at
// 88°, so an interval that the data leave open to 90° was reported as
// ending at 88°, or at the fitted angle itself when that lay beyond 88°
// (one family at 88°, no shear: [85.38°, 88.52°] for [85.38°, 90°]).
func profileGrid(lo, hi, opt, step float64) ([]float64, int) {
	var grid []float64
	c := -1
	add := func(x float64) {
		if c < 0 && x > opt+1e-9 {
			c = len(grid)
			grid = append(grid, opt)
		}
		if math.Abs(x-opt) > 1e-9 {
			grid = append(grid, x)
		}
	}
	last := lo
	for x := lo; x <= hi+1e-12; x += step {
		add(x)
		last = x
	}
	if hi-last > 1e-9 {
		add(hi)
	}
	if c < 0 {
		c = len(grid)
		grid = append(grid, opt)
	}
	return grid, c
}

// profileOne profiles angle parameter i on engine pe.
func (r *Result) profileOne(pe, twin *engine, p, guideOn *Problem, i int, set Settings, fq float64) AngleProfile {
	step := Rad(set.ProfileStepDeg)
	q := pe.params[i]
	n, k := r.Rows, r.FreeParams
	opt := r.theta[i]
	mirrored, wraps := false, false
	var lo, hi float64
	switch {
	case !q.Periodic:
		lo, hi = q.Lo, q.Hi
	case !p.HasShear:
		// Only |α| matters: profile [0, 90°] and mirror it.
		opt, mirrored = math.Abs(wrapAngle(opt)), true
		lo, hi = 0, math.Pi/2
	default:
		// A full period centred on the optimum, so that the interval never
		// meets an artificial end of the range.
		opt = wrapAngle(opt)
		lo, hi, wraps = opt-math.Pi/2, opt+math.Pi/2, true
	}
	theta := append([]float64(nil), r.theta...)
	theta[i] = opt
	grid, c := profileGrid(lo, hi, opt, step)
	// The family-off fit and the guide on the search subset do not need
	// each other: they run side by side.
	var pf *profiler
	off := make(chan struct{})
	go func() {
		defer close(off)
		pf = newProfiler(r, p, pe, i, set)
	}()
	guide, guideEvals := r.profileGuide(guideOn, i, grid, c, theta, wraps, twin != nil)
	<-off
	if twin != nil {
		pf.withTwin(twin)
	}
	var loss []float64
	var thetas [][]float64
	if guide != nil {
		loss, thetas = pf.guided(grid, c, r.Loss, theta, guide, fq/float64(n-k))
	} else {
		if profileFarMargins > 0 {
			pf.setNear(r.Loss * (1 + profileFarMargins*fq/float64(n-k)))
		}
		pf.budget = profileWork * len(grid)
		loss, thetas = pf.sweep(grid, c, r.Loss, theta, wraps)
		pf.setNear(0)
	}
	minLoss := r.Loss
	pr := AngleProfile{Name: q.Name, Mirrored: mirrored, OptimumDeg: Deg(opt), Closed: true, minLoss: math.Inf(1), periodic: q.Periodic}
	if r.Structure.Layout == LayoutMirror && !r.Structure.HoldPairAxis {
		switch q.Name {
		case "mean_angle":
			pr.twin = twinMeanAngle
		case "half_angle":
			pr.twin = twinHalfAngle
		}
	}
	for j, l := range loss {
		minLoss = math.Min(minLoss, l)
		if j != c && l < pr.minLoss {
			pr.minLoss, pr.minTheta = l, thetas[j]
		}
	}
	thr := minLoss * (1 + fq/float64(n-k))
	pr.Threshold = thr
	crossing := func(q *profiler, in, out int) float64 {
		return Deg(q.crossing(grid[in], grid[out], loss[in], loss[out], thetas[in], thetas[out], thr, minLoss, step/256, 1e-2*(thr-minLoss)))
	}
	loIdx, hiIdx := c, c
	for loIdx > 0 && loss[loIdx-1] <= thr {
		loIdx--
	}
	for hiIdx < len(grid)-1 && loss[hiIdx+1] <= thr {
		hiIdx++
	}
	// The ends of the half-angle's range and of |α| ∈ [0°, 90°] (no shear
	// information) are natural ends of an interval; reaching an end of the
	// period centred on the optimum means the data do not bound the angle.
	pf.halves(func() {
		if hiIdx < len(grid)-1 {
			pr.HiDeg = crossing(pf, hiIdx, hiIdx+1)
		}
	}, func() {
		if loIdx > 0 {
			pr.LoDeg = crossing(pf.lower(), loIdx, loIdx-1)
		}
	})
	if loIdx == 0 {
		pr.LoDeg = Deg(grid[0])
		pr.Closed = !wraps
	}
	if hiIdx == len(grid)-1 {
		pr.HiDeg = Deg(grid[len(grid)-1])
		pr.Closed = pr.Closed && !wraps
	}
	if loIdx == 0 && hiIdx == len(grid)-1 {
		// Below the threshold over a whole period (or the whole range of
		// |α| or of a half angle): no interval.
		pr.Closed, pr.NotDetermined = false, true
		pr.LoDeg, pr.HiDeg = math.NaN(), math.NaN()
	}
	pr.AnglesDeg, pr.Loss = profileCurve(grid, loss, q.Periodic && !mirrored, mirrored)
	pr.Evaluations = pf.work() + guideEvals
	pr.Unresolved = pf.unresolved
	return pr
}

// profileCurve returns the profile sorted by angle in degrees: wrapped
// into (−90°, 90°] over a full period, or mirrored to negative angles when
// only |α| was profiled.
func profileCurve(grid, loss []float64, wrap, mirrored bool) (anglesDeg, lossOut []float64) {
	type pt struct{ a, l float64 }
	var pts []pt
	for j, x := range grid {
		a := Deg(x)
		if wrap {
			a = Deg(wrapAngle(x))
		}
		pts = append(pts, pt{a, loss[j]})
	}
	sort.SliceStable(pts, func(a, b int) bool { return pts[a].a < pts[b].a })
	for _, v := range pts {
		anglesDeg = append(anglesDeg, v.a)
		lossOut = append(lossOut, v.l)
	}
	if mirrored {
		var a, l []float64
		for j := len(grid) - 1; j > 0; j-- {
			a = append(a, Deg(-grid[j]))
			l = append(l, loss[j])
		}
		if grid[0] != 0 {
			a = append(a, Deg(-grid[0]))
			l = append(l, loss[0])
		}
		anglesDeg = append(a, anglesDeg...)
		lossOut = append(l, lossOut...)
	}
	return anglesDeg, lossOut
}
