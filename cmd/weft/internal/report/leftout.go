package report

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
)

// Why candidates of the selection were not cross-validated. Discovery
// leaves a candidate out of cross-validation for one of three reasons
// (aniso's search.crossValidate): its BIC lies more than a window above
// its form's best; every family of it is spread at the fit's bound on the
// concentration (an ideal family, so it is its ideal form's model with a
// parameter more); or its two families point the same way (one family).
// Cards record the reason per candidate (selection.pareto[].
// not_cross_validated); for cards written before that, the
// cross-validation note (selection.search) names the candidates of the
// last two kinds and the window, and the BIC of every candidate is in the
// card, so the report reads the reasons from there rather than assuming
// the first for all.

// leftOut sorts the candidates of the selection that have no held-out
// error (the chosen one aside) by why.
type leftOut struct {
	// far counts the candidates more than window above their form's best
	// BIC.
	far    int
	window string
	// bound and same name the candidates with every family spread at the
	// concentration bound conc, and those whose two families point the
	// same way.
	bound, same []string
	conc        string
	// failed names candidates that were cross-validated but have no mean
	// held-out error (a fold's refit failed); other counts those the card
	// gives no reason for.
	failed []string
	other  int
}

var (
	cvWindowNote = regexp.MustCompile(`left out because their BIC is more than ([0-9.]+) above`)
	cvBoundNote  = regexp.MustCompile(`(?:^|; )([^;]+?) left out because every family of theirs is spread at the fit's bound on the concentration \(b = ([0-9.]+)`)
	cvSameNote   = regexp.MustCompile(`(?:^|; )([^;]+?) left out because their two families point the same way`)
)

// total is the number of candidates left out.
func (l leftOut) total() int { return l.far + len(l.bound) + len(l.same) + len(l.failed) + l.other }

// leftOutOf reads why each candidate of sel without a held-out error was
// not cross-validated.
func leftOutOf(sel *card.SelectionSection) leftOut {
	l := leftOut{window: "10", conc: strconv.Itoa(aniso.FitMaxConcentration)}
	named := map[string]string{}
	for _, s := range sel.Search {
		if !strings.HasPrefix(s, "cross-validation:") {
			continue
		}
		if m := cvWindowNote.FindStringSubmatch(s); m != nil {
			l.window = m[1]
		}
		for _, m := range cvBoundNote.FindAllStringSubmatch(s, -1) {
			l.conc = m[2]
			for _, n := range strings.Split(m[1], ", ") {
				named[n] = "bound"
			}
		}
		for _, m := range cvSameNote.FindAllStringSubmatch(s, -1) {
			for _, n := range strings.Split(m[1], ", ") {
				named[n] = "same"
			}
		}
	}
	window, _ := strconv.ParseFloat(l.window, 64)
	best := map[string]float64{}
	for _, c := range sel.Pareto {
		k := verdictKey(c)
		if b, ok := best[k]; !ok || float64(c.BIC) < b {
			best[k] = float64(c.BIC)
		}
	}
	for _, c := range sel.Pareto {
		if !bad(float64(c.HeldoutError)) || c.Chosen {
			continue
		}
		switch {
		// A card that records the reason per candidate is read as it
		// says; an older one through its note and the BICs.
		case c.NotCrossValidated == aniso.NotValidatedAtBound:
			l.bound = append(l.bound, c.Name)
		case c.NotCrossValidated == aniso.NotValidatedCoincident:
			l.same = append(l.same, c.Name)
		case c.NotCrossValidated == aniso.NotValidatedBIC:
			l.far++
		case named[c.Name] == "bound":
			l.bound = append(l.bound, c.Name)
		case named[c.Name] == "same":
			l.same = append(l.same, c.Name)
		case len(c.HeldoutFolds) > 0:
			l.failed = append(l.failed, c.Name)
		case float64(c.BIC)-best[verdictKey(c)] > window:
			l.far++
		default:
			l.other++
		}
	}
	return l
}

// reasons says why the candidates were left out, one clause per reason
// with its count; long names the candidates of the rarer reasons and
// explains each.
func (l leftOut) reasons(long bool) []string {
	var out []string
	names := func(ns []string) string {
		if !long {
			return ""
		}
		return " (" + strings.Join(ns, ", ") + ")"
	}
	// their is "its" for a single candidate.
	their := func(n int) string {
		if n == 1 {
			return "its"
		}
		return "their"
	}
	if l.far > 0 {
		out = append(out, fmt.Sprintf("%d with a BIC more than %s above %s form's best", l.far, l.window, their(l.far)))
	}
	if n := len(l.bound); n > 0 {
		s := fmt.Sprintf("%d%s with every family spread at the fit's bound on the concentration (b = %s), an ideal family", n, names(l.bound), l.conc)
		if long {
			s += fmt.Sprintf(", which makes %s %s ideal form's model with a parameter more", map[bool]string{true: "it", false: "them"}[n == 1], their(n))
		}
		out = append(out, s)
	}
	if n := len(l.same); n > 0 {
		s := fmt.Sprintf("%d%s whose two families point the same way (within 2°)", n, names(l.same))
		if long {
			s += ", which is one family"
		}
		out = append(out, s)
	}
	if n := len(l.failed); n > 0 {
		out = append(out, fmt.Sprintf("%d%s cross-validated but without a held-out error, as the refit of a fold failed", n, names(l.failed)))
	}
	if l.other > 0 {
		out = append(out, fmt.Sprintf("%d for a reason the card does not record (see the search notes)", l.other))
	}
	return out
}

// crossValidated says whether any candidate of the selection (a model
// form or a preset) has a held-out error. With one protocol there is none
// to leave out: discovery then picks by BIC (its rule says so), and the
// report must not describe a cross-validation that did not happen.
func (in *Input) crossValidated() bool {
	if in.sel == nil {
		return false
	}
	for _, c := range append(append([]card.CandidateCard{}, in.sel.Pareto...), in.sel.Presets...) {
		if !bad(float64(c.HeldoutError)) {
			return true
		}
	}
	return false
}

// notCrossValidatedWhy says why no candidate has a held-out error.
func notCrossValidatedWhy(protocols int) string {
	if protocols == 1 {
		return "one protocol, so there is none to leave out"
	}
	return "no candidate has a held-out error"
}
