package biaxial

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// stressFamily is how a file gives its stresses. Cauchy and nominal stress
// columns are read as they are; loads become nominal stress through the
// specimen geometry, so their StressKind is Nominal.
type stressFamily int

const (
	cauchyColumns stressFamily = iota
	nominalColumns
	loadColumns
)

// String names the family in messages.
func (f stressFamily) String() string {
	switch f {
	case nominalColumns:
		return "nominal stress"
	case loadColumns:
		return "load"
	}
	return "Cauchy stress"
}

// kind is the stress measure the family's values are kept as.
func (f stressFamily) kind() StressKind {
	if f == cauchyColumns {
		return Cauchy
	}
	return Nominal
}

// normalRoles are the family's columns for the two normal axes, both
// required.
func (f stressFamily) normalRoles() []role {
	switch f {
	case nominalColumns:
		return []role{roleNominal11, roleNominal22}
	case loadColumns:
		return []role{roleLoad1, roleLoad2}
	}
	return []role{roleCauchy11, roleCauchy22}
}

// stressRole returns the stress family of a column role and the component
// it fills.
func stressRole(r role) (f stressFamily, c Component, ok bool) {
	switch r {
	case roleCauchy11, roleCauchy22, roleCauchy12, roleCauchy21:
		return cauchyColumns, Component(r - roleCauchy11), true
	case roleNominal11, roleNominal22, roleNominal12, roleNominal21:
		return nominalColumns, Component(r - roleNominal11), true
	case roleLoad1:
		return loadColumns, C11, true
	case roleLoad2:
		return loadColumns, C22, true
	}
	return cauchyColumns, 0, false
}

// geometryKeys are the metadata keys of the specimen geometry, in the
// order they are checked.
var geometryKeys = [3]string{"thickness", "size_1", "size_2"}

// setHeader reads the header row (fields are its cells) together with the
// metadata met before it, in the order the steps depend on each other:
// the specimen name, the geometry and the stress unit of the metadata, the
// column roles, the kinematics, the stress family, the stress unit of the
// record, and the factor that turns each stress or load cell into it.
func (p *tableParser) setHeader(line int, fields []string) error {
	p.header = true
	p.headerLine = line
	if err := p.specimenName(); err != nil {
		return err
	}
	have, err := p.geometry()
	if err != nil {
		return err
	}
	metaUnit, err := p.metaStressUnit()
	if err != nil {
		return err
	}
	if err := p.columnRoles(line, fields); err != nil {
		return err
	}
	hint := p.ignoredHint()
	if err := p.kinematics(line, hint); err != nil {
		return err
	}
	fam, err := p.stressFamily(line, hint)
	if err != nil {
		return err
	}
	p.rec.Kind = fam.kind()
	p.rec.FromLoads = fam == loadColumns
	unit, err := p.stressUnit(line, fam, metaUnit)
	if err != nil {
		return err
	}
	p.rec.StressUnit = unit
	p.toKPa, _ = StressFactor(unit, "kPa")
	if err := p.stressFactors(line, metaUnit, have); err != nil {
		return err
	}
	p.timeCycleProtocol()
	if p.intoTable {
		p.table = newRawTable(layoutOf(p.rec))
	}
	return nil
}

// specimenName takes the specimen's name from the metadata, if given.
func (p *tableParser) specimenName() error {
	n, ok := p.rec.Meta["specimen"]
	if !ok || n == "" {
		return nil
	}
	if k := utf8.RuneCountInString(n); k > MaxLabelLength {
		return p.errAt(p.metaLine["specimen"], 0, ErrMetadata, fmt.Sprintf("shorten it to at most %d characters", MaxLabelLength),
			"metadata specimen is %d characters long (%s); the name also names the output folder", k, quote(n))
	}
	p.rec.Name = n
	return nil
}

// geometry checks every geometry length the metadata give (loads need
// them, and a wrong one is an error even when unused) and sets
// rec.Geometry when all three are there. have says which were given.
func (p *tableParser) geometry() (have [3]bool, err error) {
	var v [3]float64
	for i, key := range geometryKeys {
		v[i], have[i], err = p.metaLength(key)
		if err != nil {
			return have, err
		}
	}
	if have[0] && have[1] && have[2] {
		p.rec.Geometry = &Geometry{Thickness: v[0], Size1: v[1], Size2: v[2]}
	}
	return have, nil
}

// metaLength parses a metadata length like "0.8 mm" into millimetres.
func (p *tableParser) metaLength(key string) (float64, bool, error) {
	v, ok := p.rec.Meta[key]
	if !ok {
		return 0, false, nil
	}
	line := p.metaLine[key]
	x, unit, ok := splitQuantity(v, p.decCommaOK)
	if !ok {
		return 0, false, p.errAt(line, 0, ErrNumber, "write a number and a length unit, e.g. `# "+key+" = 0.8 mm`",
			"metadata %s = %s is not a length", key, quote(v))
	}
	if unit == "" {
		return 0, false, p.errAt(line, 0, ErrUnit, "write the unit, e.g. `# "+key+" = "+v+" mm` (m, mm, µm)",
			"metadata %s = %s has no unit", key, v)
	}
	f, ok := LengthToMetre(unit)
	if !ok {
		return 0, false, p.errAt(line, 0, ErrUnit, "use one of "+unitNames(lengthUnits),
			"metadata %s has unknown length unit %s", key, quote(unit))
	}
	if !(x > 0) || math.IsInf(x, 0) {
		return 0, false, p.errAt(line, 0, ErrRange, "give the reference "+key+" of the specimen, a positive length",
			"metadata %s = %s must be > 0", key, v)
	}
	return lengthInMillimetres(x, f), true, nil
}

// lengthInMillimetres converts x, a length in a unit of toMetre metres (a
// power of ten), to millimetres by moving the decimal exponent of the
// shortest decimal that reads back as x, so the result is the number as
// typed, rounded once: multiplying by toMetre and then by 1000 turned
// "9 mm" into 9.000000000000002 mm and "0.42 mm" into 0.42000000000000004
// mm, which the card's geometry, the inspection and the load-to-stress
// factor then carried.
func lengthInMillimetres(x, toMetre float64) float64 {
	k := int(math.Round(math.Log10(toMetre))) + 3
	s := strconv.FormatFloat(x, 'e', -1, 64)
	i := strings.IndexByte(s, 'e')
	e, err := strconv.Atoi(s[i+1:])
	if err == nil {
		if v, err := strconv.ParseFloat(s[:i]+"e"+strconv.Itoa(e+k), 64); err == nil {
			return v
		}
	}
	return x * toMetre * 1e3
}

// metaStressUnit returns the canonical stress unit of the `stress_unit`
// metadata ("" when absent). It applies to stress columns without a unit
// and to stresses computed from loads.
func (p *tableParser) metaStressUnit() (string, error) {
	u, ok := p.rec.Meta["stress_unit"]
	if !ok {
		return "", nil
	}
	cu, ok := CanonicalStressUnit(u)
	if !ok {
		return "", p.errAt(p.metaLine["stress_unit"], 0, ErrUnit, "use one of Pa, kPa, MPa",
			"metadata stress_unit = %s is not a stress unit", quote(u))
	}
	return cu, nil
}

// maxIgnoredNotices is how many ignored columns get a notice each; the
// rest are counted in one notice. A header of a few hundred thousand
// unknown names (a row of data taken for the header, or a damaged file)
// would otherwise keep a notice per column, some 250 bytes of memory for
// each two bytes of input.
const maxIgnoredNotices = 10

// columnRoles gives every header cell its role (unknown names are ignored
// with a notice), refusing repeated quantities and checking the units that
// are fixed by the role.
func (p *tableParser) columnRoles(line int, fields []string) error {
	p.cols = make([]column, len(fields))
	more := 0 // ignored columns past maxIgnoredNotices
	defer func() {
		if more > 0 {
			p.notice("%s: %d more columns are not part of the weft layout and are ignored", p.where(line, 0), more)
		}
	}()
	for i, h := range fields {
		col := i + 1
		name, unit, hasUnit := splitHeader(h)
		r, known := columnNames[canonicalName(name)]
		h = strings.TrimSpace(h)
		if !known {
			if h == "" {
				continue
			}
			if len(p.ignored) == maxIgnoredNotices {
				more++
				continue
			}
			p.ignored = append(p.ignored, h)
			p.notice("%s: column %s is not part of the weft layout and is ignored", p.where(line, col), quote(h))
			continue
		}
		if prev := p.byRole[r]; prev != 0 {
			return p.errAt(line, col, ErrDuplicateColumn, "remove or rename one of them",
				"column %s repeats %s (column %d)", quote(h), roleName[r], prev)
		}
		if r == roleCauchy21 {
			return p.errAt(line, col, ErrMixedStress, "give the in-plane shear as cauchy_12 only",
				"column %s: Cauchy stress is symmetric, so cauchy_21 is not a separate quantity", quote(h))
		}
		p.byRole[r] = col
		p.cols[i] = column{role: r, header: clip(h, 80), unit: unit, factor: 1}
		if err := p.roleUnit(line, col, h, unit, hasUnit && unit != ""); err != nil {
			return err
		}
	}
	return nil
}

// roleUnit checks the unit of a column whose role fixes it: protocol and
// cycle take none, stretches and F are ratios, and time is converted to
// seconds.
func (p *tableParser) roleUnit(line, col int, header, unit string, hasUnit bool) error {
	c := &p.cols[col-1]
	switch c.role {
	case roleProtocol, roleCycle:
		if hasUnit {
			return p.errAt(line, col, ErrUnit, "remove the unit", "column %s takes no unit", quote(header))
		}
	case roleStretch1, roleStretch2, roleF11, roleF12, roleF21, roleF22:
		if hasUnit && unit != "-" && unit != "1" {
			return p.errAt(line, col, ErrUnit, "stretches are ratios (1 in the reference state); leave the unit out or write [-]",
				"column %s has unit %s", quote(header), quote(unit))
		}
	case roleTime:
		if hasUnit {
			d, ok := findUnit(timeUnits, unit)
			if !ok {
				return p.errAt(line, col, ErrUnit, "use one of "+unitNames(timeUnits),
					"column %s has unknown time unit %s", quote(header), quote(unit))
			}
			c.factor = d.toSI
		}
	}
	return nil
}

// ignoredHint lists the ignored columns for messages about missing ones:
// a misspelt header is the usual cause.
func (p *tableParser) ignoredHint() string {
	if len(p.ignored) == 0 {
		return ""
	}
	return fmt.Sprintf(" (ignored columns: %s)", clip(strings.Join(p.ignored, ", "), 200))
}

// kinematics decides between F columns (preferred when both are given)
// and stretch columns, and requires the whole set of either.
func (p *tableParser) kinematics(line int, hint string) error {
	hasStretch := p.byRole[roleStretch1] != 0 || p.byRole[roleStretch2] != 0
	hasF := p.byRole[roleF11] != 0 || p.byRole[roleF12] != 0 || p.byRole[roleF21] != 0 || p.byRole[roleF22] != 0
	switch {
	case hasF:
		for _, r := range []role{roleF11, roleF12, roleF21, roleF22} {
			if p.byRole[r] == 0 {
				return p.errAt(line, 0, ErrMissingColumn, "add the column or give stretch_1, stretch_2 instead",
					"the header has some of F11, F12, F21, F22 but no %s%s", roleName[r], hint)
			}
		}
		p.rec.Kinematics = GradientColumns
		if hasStretch {
			for _, r := range []role{roleStretch1, roleStretch2} {
				if c := p.byRole[r]; c != 0 {
					p.cols[c-1].role = roleIgnore
					p.byRole[r] = 0
				}
			}
			p.notice("%s: both stretch and F columns are given; F is used and the stretch columns are ignored", p.where(line, 0))
		}
	case hasStretch:
		for _, r := range []role{roleStretch1, roleStretch2} {
			if p.byRole[r] == 0 {
				return p.errAt(line, 0, ErrMissingColumn, "add the column (header names are case-insensitive)",
					"the header has no %s column%s", roleName[r], hint)
			}
		}
		p.rec.Kinematics = StretchColumns
	default:
		return p.errAt(line, 0, ErrMissingColumn,
			"name the kinematic columns stretch_1, stretch_2 or F11, F12, F21, F22 (case-insensitive)",
			"no kinematic columns in the header%s", hint)
	}
	return nil
}

// stressFamily finds the one stress family of the file (loads may be
// completed by nominal shear components, since both are nominal) and
// requires its columns: both normal axes, and both nominal shear
// components or neither.
func (p *tableParser) stressFamily(line int, hint string) (stressFamily, error) {
	// Conflicts per axis first: they are the most specific message.
	if err := p.axisConflicts(line); err != nil {
		return 0, err
	}
	var present [3]bool
	for r := role(0); r < numRoles; r++ {
		if f, _, ok := stressRole(r); ok && p.byRole[r] != 0 {
			present[f] = true
		}
	}
	var fam stressFamily
	switch {
	case present[cauchyColumns] && (present[nominalColumns] || present[loadColumns]):
		c := p.firstOf(roleNominal11, roleNominal22, roleNominal12, roleNominal21, roleLoad1, roleLoad2)
		return 0, p.errAt(line, c, ErrMixedStress, "give all stresses as Cauchy or all as nominal (loads count as nominal)",
			"the header mixes Cauchy stress with %s", p.cols[c-1].header)
	case present[loadColumns]:
		fam = loadColumns
		if p.byRole[roleNominal11] != 0 || p.byRole[roleNominal22] != 0 {
			c := p.firstOf(roleNominal11, roleNominal22)
			return 0, p.errAt(line, c, ErrMixedStress, "give both normal axes as loads or both as nominal stress",
				"the header mixes loads with %s", p.cols[c-1].header)
		}
	case present[nominalColumns]:
		fam = nominalColumns
	case present[cauchyColumns]:
		fam = cauchyColumns
	default:
		return 0, p.errAt(line, 0, ErrMissingColumn,
			"add cauchy_11, cauchy_22, or nominal_11, nominal_22, or load_1, load_2 (with thickness and sizes)",
			"no stress columns in the header%s", hint)
	}
	for _, r := range fam.normalRoles() {
		if p.byRole[r] == 0 {
			return 0, p.errAt(line, 0, ErrMissingColumn, "add the column: both normal axes are needed",
				"the header has %s but no %s column%s", fam, roleName[r], hint)
		}
	}
	if fam != cauchyColumns && (p.byRole[roleNominal12] != 0) != (p.byRole[roleNominal21] != 0) {
		fix := "give both nominal_12 and nominal_21 or neither"
		if fam == nominalColumns {
			fix = "give both nominal_12 and nominal_21 (nominal stress is not symmetric) or neither"
		}
		return 0, p.errAt(line, 0, ErrMissingColumn, fix, "the header has only one of nominal_12, nominal_21")
	}
	return fam, nil
}

// axisConflicts refuses two columns that give the stress of one component.
func (p *tableParser) axisConflicts(line int) error {
	for c := C11; c < NumComponents; c++ {
		var who []int
		for r := role(0); r < numRoles; r++ {
			if _, cc, ok := stressRole(r); ok && cc == c && p.byRole[r] != 0 {
				who = append(who, p.byRole[r])
			}
		}
		if len(who) > 1 {
			return p.errAt(line, who[1], ErrMixedStress, "keep one stress measure per axis and remove the other column",
				"columns %s and %s both give the %s stress", quote(p.cols[who[0]-1].header), quote(p.cols[who[1]-1].header), c)
		}
	}
	return nil
}

// firstOf returns the column of the first present role.
func (p *tableParser) firstOf(rs ...role) int {
	best := 0
	for _, r := range rs {
		if c := p.byRole[r]; c != 0 && (best == 0 || c < best) {
			best = c
		}
	}
	return best
}

// stressUnit chooses the record's stress unit: for loads the metadata's
// stress_unit, otherwise the unit of the first stress column (its header,
// else the metadata); kPa when none is given.
func (p *tableParser) stressUnit(line int, fam stressFamily, metaUnit string) (string, error) {
	out := metaUnit
	if fam != loadColumns {
		for i := range p.cols {
			c := &p.cols[i]
			if _, _, ok := stressRole(c.role); !ok {
				continue
			}
			if c.unit != "" {
				u, ok := CanonicalStressUnit(c.unit)
				if !ok {
					return "", p.errAt(line, i+1, ErrUnit, "use one of Pa, kPa, MPa",
						"column %s has unknown stress unit %s", quote(c.header), quote(c.unit))
				}
				out = u
				if metaUnit != "" && metaUnit != u {
					p.notice("%s: metadata stress_unit = %s differs from column %s; the column's unit is used", p.where(line, i+1), metaUnit, quote(c.header))
				}
			}
			break
		}
	}
	if out == "" {
		out = "kPa"
		if fam != loadColumns {
			p.notice("%s: no stress unit given; stresses are read as kPa", p.where(line, 0))
		}
	}
	return out, nil
}

// stressFactors marks the measured components and sets the factor that
// turns each stress or load cell into the record's stress unit.
func (p *tableParser) stressFactors(line int, metaUnit string, have [3]bool) error {
	out := p.rec.StressUnit
	for i := range p.cols {
		c := &p.cols[i]
		_, comp, ok := stressRole(c.role)
		if !ok {
			continue
		}
		p.rec.Measured[comp] = true
		if c.role == roleLoad1 || c.role == roleLoad2 {
			if err := p.loadFactor(line, i+1, have); err != nil {
				return err
			}
			continue
		}
		u := c.unit
		if u == "" {
			u = metaUnit
			if u == "" {
				u = "kPa"
			}
		}
		f, ok := StressFactor(u, out)
		if !ok {
			return p.errAt(line, i+1, ErrUnit, "use one of Pa, kPa, MPa",
				"column %s has unknown stress unit %s", quote(c.header), quote(c.unit))
		}
		if cu, _ := CanonicalStressUnit(u); cu != out {
			p.notice("%s: column %s is in %s; converted to %s like the first stress column", p.where(line, i+1), quote(c.header), cu, out)
		}
		c.factor = f
	}
	return nil
}

// loadFactor sets the factor of a load column: its force unit over the
// reference area it acts on, P11 = f1/(W2·H), P22 = f2/(W1·H) (Sacks 2000;
// lengths in mm), in the record's stress unit.
func (p *tableParser) loadFactor(line, col int, have [3]bool) error {
	c := &p.cols[col-1]
	if c.unit == "" {
		return p.errAt(line, col, ErrUnit, "write the load unit in the header, e.g. `"+roleName[c.role]+" [N]` (N, mN, gf)",
			"column %s has no unit", quote(c.header))
	}
	fN, ok := ForceToNewton(c.unit)
	if !ok {
		return p.errAt(line, col, ErrUnit, "use one of "+unitNames(forceUnits),
			"column %s has unknown force unit %s", quote(c.header), quote(c.unit))
	}
	g := p.rec.Geometry
	if g == nil {
		var missing []string
		for k, key := range geometryKeys {
			if !have[k] {
				missing = append(missing, key)
			}
		}
		return p.errAt(line, col, ErrGeometry,
			"add metadata lines before the header, e.g. `# thickness = 0.8 mm`, `# size_1 = 10 mm`, `# size_2 = 10 mm`",
			"loads need the specimen geometry, but the metadata lack %s", strings.Join(missing, ", "))
	}
	width := g.Size2
	if c.role == roleLoad2 {
		width = g.Size1
	}
	toOut, _ := StressFactor("Pa", p.rec.StressUnit)
	c.factor = fN / (width * 1e-3 * g.Thickness * 1e-3) * toOut
	return nil
}

// timeCycleProtocol records which optional columns exist; without a
// protocol column every row belongs to the protocol of the `protocol`
// metadata, or to "all".
func (p *tableParser) timeCycleProtocol() {
	p.rec.HasTime = p.byRole[roleTime] != 0
	p.rec.HasCycle = p.byRole[roleCycle] != 0
	if p.byRole[roleProtocol] == 0 {
		p.protoLabel = "all"
		if v := strings.TrimSpace(p.rec.Meta["protocol"]); v != "" {
			p.protoLabel = v
		}
	}
}

// splitHeader splits "load_1 [N]" into "load_1" and "N". Parentheses are
// accepted as well as brackets.
func splitHeader(h string) (name, unit string, hasUnit bool) {
	h = strings.TrimSpace(h)
	for _, br := range [2][2]byte{{'[', ']'}, {'(', ')'}} {
		if i := strings.IndexByte(h, br[0]); i >= 0 && strings.HasSuffix(h, string(br[1])) {
			return strings.TrimSpace(h[:i]), strings.TrimSpace(h[i+1 : len(h)-1]), true
		}
	}
	return h, "", false
}

// canonicalName lower-cases a header name and writes blanks and hyphens
// as underscores, so "Stretch 1" and "stretch-1" name stretch_1.
func canonicalName(n string) string {
	n = strings.ToLower(strings.TrimSpace(n))
	return strings.Map(func(r rune) rune {
		if r == ' ' || r == '-' {
			return '_'
		}
		return r
	}, n)
}
