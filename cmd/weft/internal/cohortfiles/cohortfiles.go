// Package cohortfiles reads the data files of one cohort run: each file
// once, in an order that depends neither on the command line's order nor
// on how a path is spelt; protocol weights that a file lacks applied to
// the others; groups from a metadata key or a group table; the cohort's
// common stress unit; and one output folder and one problem a specimen.
// A file that cannot be used keeps its reason in its Member and the others
// go on. Its errors say what is wrong; the command adds which option gave
// the value.
package cohortfiles

import (
	"fmt"
	"path"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/cohortreport"
	"github.com/weft-tools/weft/cmd/weft/internal/grouptable"
	"github.com/weft-tools/weft/cmd/weft/internal/report"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// Member is one data file of a cohort run, as it was read, prepared and
// fitted (the embedded cohortreport.Member's fields).
type Member struct {
	cohortreport.Member
	// key is the resolved path that orders the cohort's files (orderKey).
	key string
}

// Read reads every file in a fixed order, that of its resolved path
// (absolute, links resolved), so that the result depends neither on the
// order of the command line nor on how each path is typed (relative or
// absolute, from which folder, through a link): the order decides the
// scouts and the order of the population fit's sums. A file given twice,
// under any spelling, fails the second time. hint is applied to every
// error of reading a file (the command adds how to raise a limit).
func Read(files []string, opt biaxial.Options, hint func(error) error) []*Member {
	var ms []*Member
	for _, f := range files {
		m := &Member{key: orderKey(f)}
		m.File, m.At = filepath.ToSlash(filepath.Clean(f)), -1
		ms = append(ms, m)
	}
	sort.SliceStable(ms, func(a, b int) bool {
		if ms[a].key != ms[b].key {
			return ms[a].key < ms[b].key
		}
		return ms[a].File < ms[b].File
	})
	for i, m := range ms {
		if prev := SameFile(m, ms[:i]); prev != nil {
			if prev.File == m.File {
				m.Err = fmt.Errorf("%s is given twice", m.File)
			} else {
				m.Err = fmt.Errorf("%s is given twice (also as %s); give each file once", m.File, prev.File)
			}
			continue
		}
		var err error
		m.Spec, m.Unweighted, err = readOne(filepath.FromSlash(m.File), opt)
		if err != nil {
			m.Spec, m.Err = nil, hint(err)
		}
	}
	return ms
}

// readOne reads one file of a cohort. A protocol weight whose label the
// file lacks applies to the other files: specimens of one study often
// differ in the protocols run, and failing such a file would drop its data
// from the cohort (CheckWeights refuses a label no file has). It returns
// those labels.
func readOne(path string, opt biaxial.Options) (*biaxial.Specimen, []string, error) {
	if len(opt.ProtocolWeights) == 0 {
		s, err := biaxial.ReadFile(path, opt)
		return s, nil, err
	}
	rows, err := biaxial.ReadRows(path, opt)
	if err != nil {
		return nil, nil, err
	}
	has := map[string]bool{}
	for _, l := range rows.ProtocolLabels() {
		has[l] = true
	}
	own := opt
	own.ProtocolWeights = map[string]float64{}
	var missing []string
	for l, w := range opt.ProtocolWeights {
		if has[l] {
			own.ProtocolWeights[l] = w
		} else {
			missing = append(missing, l)
		}
	}
	sort.Strings(missing)
	s, err := rows.Prepare(own)
	if err != nil {
		return nil, nil, err
	}
	return s, missing, nil
}

// CheckWeights refuses a protocol weight whose label no file of the
// cohort that could be read has: a mistyped label, which would otherwise
// weigh nothing without a word. Its error begins with the weight as
// LABEL=WEIGHT. It is nil when no file could be read (each member's error
// says why).
func CheckWeights(ms []*Member, weights map[string]float64) error {
	if len(weights) == 0 {
		return nil
	}
	seen := map[string]bool{}
	read := false
	var unread []string
	for _, m := range ms {
		if m.Spec == nil {
			unread = append(unread, m.File)
			continue
		}
		read = true
		for _, pr := range m.Spec.Protocols {
			seen[pr.Label] = true
		}
	}
	if !read {
		return nil
	}
	var labels []string
	for l := range seen {
		labels = append(labels, strconv.Quote(l))
	}
	sort.Strings(labels)
	var given []string
	for l := range weights {
		given = append(given, l)
	}
	sort.Strings(given)
	// A file that could not be read may have the label: say so, or the
	// refusal reads as if no file had it and hides why that one failed
	// (until 2026-12-05 it did).
	unreadText := ""
	if len(unread) > 0 {
		unreadText = fmt.Sprintf(" (%d file(s) could not be read and are not counted: %s)", len(unread), strings.Join(unread, ", "))
	}
	for _, l := range given {
		if !seen[l] {
			return fmt.Errorf("%s=%g: no file of the cohort that could be read has a protocol %q%s; use one of %s", l, weights[l], l, unreadText, strings.Join(labels, ", "))
		}
	}
	return nil
}

// orderKey is the path that orders a cohort's files: absolute, cleaned
// and with symbolic links resolved, '/' separated. A path that cannot be
// resolved (a missing file, whose reading fails anyway) keeps its
// absolute form.
func orderKey(f string) string {
	k, err := filepath.Abs(f)
	if err != nil {
		k = filepath.Clean(f)
	}
	if r, err := filepath.EvalSymlinks(k); err == nil {
		k = r
	}
	return filepath.ToSlash(k)
}

// SameFile returns the member of earlier that names the same file as m
// (the same resolved path, or the same file on disk: a hard link), or nil.
func SameFile(m *Member, earlier []*Member) *Member {
	for _, e := range earlier {
		if e.key == m.key || safeout.SameFile(filepath.FromSlash(e.File), filepath.FromSlash(m.File)) {
			return e
		}
	}
	return nil
}

// GroupByTable gives each member its row's group in the group table t,
// read from the file named table. A row by base name that two members
// share is refused, naming the table's line: it would give both its group
// without telling, whichever of them it was meant for.
func GroupByTable(ms []*Member, t grouptable.Table, table string) error {
	byBase := map[string][]string{}
	for _, m := range ms {
		r, base := t.Lookup(m.File)
		m.Group = r.Group
		if base {
			byBase[path.Base(m.File)] = append(byBase[path.Base(m.File)], m.File)
		}
	}
	for _, m := range ms {
		b := path.Base(m.File)
		if files := byBase[b]; len(files) > 1 {
			return fmt.Errorf("%s:%d: %q matches %d files (%s); give each file's path as on the command line", table, t[b].Line, b, len(files), strings.Join(files, ", "))
		}
	}
	return nil
}

// GroupByKey gives each member read the value of its metadata line key
// (matched without regard to case and surrounding spaces) as its group,
// and reports whether any file has that line.
func GroupByKey(ms []*Member, key string) (found bool) {
	key = strings.ToLower(strings.TrimSpace(key))
	for _, m := range ms {
		if m.Spec != nil {
			m.Group = strings.TrimSpace(m.Spec.Meta[key])
			_, has := m.Spec.Meta[key]
			found = found || has
		}
	}
	return found
}

// Unit is the stress unit and measure most members were read in (ties:
// the first member's).
func Unit(ms []*Member) (unit, kind string) {
	count := map[string]int{}
	best := 0
	for _, m := range ms {
		if m.Spec == nil {
			continue
		}
		count[m.Spec.StressUnit]++
		if n := count[m.Spec.StressUnit]; n > best {
			best, unit = n, m.Spec.StressUnit
		}
	}
	kinds := map[string]int{}
	best = 0
	for _, m := range ms {
		if m.Spec == nil {
			continue
		}
		k := m.Spec.Kind.String()
		kinds[k]++
		if kinds[k] > best {
			best, kind = kinds[k], k
		}
	}
	return unit, kind
}

// Prepare converts every member read to the stress unit, gives it an
// output folder of its own (its specimen's name, made safe, with .weft)
// and a problem; it returns the problems in member order, each member's
// At its index among them. Two members whose folders would differ only in
// case fail the second.
func Prepare(ms []*Member, unit string) []*aniso.Problem {
	var ps []*aniso.Problem
	seen := map[string]string{}
	for _, m := range ms {
		if m.Err != nil {
			continue
		}
		s, err := m.Spec.InStressUnit(unit)
		if err != nil {
			m.Err = err
			continue
		}
		m.Spec = s
		name := report.SafeName(s.Name)
		if name == "" || name == "." || name == ".." {
			name = strings.TrimSuffix(filepath.Base(m.File), filepath.Ext(m.File))
		}
		m.Folder = name + ".weft"
		if prev, dup := seen[strings.ToLower(m.Folder)]; dup {
			m.Err = fmt.Errorf("%s and %s would both write %s (their specimen names give the same folder name, ignoring case); give them different 'specimen' metadata", prev, m.File, m.Folder)
			continue
		}
		p, err := aniso.NewProblem(s, nil)
		if err != nil {
			m.Err = fmt.Errorf("%s: %w", m.File, err)
			continue
		}
		seen[strings.ToLower(m.Folder)] = m.File
		m.Problem, m.At = p, len(ps)
		ps = append(ps, p)
	}
	return ps
}

// ForReport gives the members as the cohort's cards and summary read
// them.
func ForReport(ms []*Member) []cohortreport.Member {
	out := make([]cohortreport.Member, len(ms))
	for i, m := range ms {
		out[i] = m.Member
	}
	return out
}
