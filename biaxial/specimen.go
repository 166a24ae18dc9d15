// Package biaxial reads planar biaxial test files of thin soft tissue and turns
// them into clean, weighted protocol data for a constitutive fit.
//
// It knows the weft input layout (CSV and xlsx), units, stress kinds, loading
// cycles, the reference state and how each protocol and axis is weighted. It
// knows nothing about strain-energy functions or fitting: those live in
// packages terms and aniso, which consume a Specimen.
//
// Reading is two steps: ReadRecord (or ReadRecordFile) parses and validates
// a file into a Record, every row in file order with units converted;
// Prepare selects cycles and branches, re-references, resamples and weights
// it into a Specimen. Read and ReadFile do both. WriteRecord and WriteCSV
// write the layout back (stress or load columns), so records built in code,
// e.g. synthetic multi-cycle data, can be saved and read like measured ones.
// Input problems are *ParseError values naming file, line and column (sheet
// and cell for xlsx) and the fix. Numbers are read strictly (ParseNumber),
// text must be UTF-8, and Limits bound the file's size, its rows, a
// workbook's unpacked size and the plausible range of stretches and
// stresses.
//
// Memory: CSV text is read line by line, never whole (classic Mac text,
// with carriage returns alone for line ends, is the one exception), and
// problems are reported in file order, the first one found. Read and
// ReadFile keep each row in a compact form until the protocols are
// prepared — 8 bytes for each value the file gives, 40 to 88 bytes a row —
// and a Specimen keeps only the points selected (a Point is 88 bytes), so
// their memory grows with the rows of a file, not its size in bytes.
// ReadRecord keeps every Row (about 100 bytes each) for the caller. A
// workbook is held in memory whole, within the workbook limit.
//
// Conventions (shared by every weft package, see also package aniso): axes
// 1 and 2 are the loading axes of the tester; the in-plane deformation
// gradient is F11, F12, F21, F22; nominal stress is first Piola–Kirchhoff,
// P = σ F⁻ᵀ; stresses are kept in the specimen's stress unit (kPa unless the
// file says otherwise; Pa, kPa and MPa are read).
//
// # Loads to stress
//
// Loads act on the edges through hooks, rakes, sutures or clamps. With the
// reference thickness H and the reference loaded widths W1 and W2 (the load
// f1 along axis 1 acts over the specimen's extent along axis 2, W2, and vice
// versa) the nominal stresses are P11 = f1/(W2 H) and P22 = f2/(W1 H)
// (common practice; e.g. Sacks 2000). For a pure biaxial stretch the Cauchy
// stresses are σ11 = λ1 P11 and σ22 = λ2 P22. Loads are read in N, mN or
// gram-force, lengths in µm, mm or m; the reader's conversion is
// tableParser.loadFactor in header.go, the writer's Layout.Loads.
//
// # Stretches, cycles and the reference state
//
// Stretches come from markers in the central region, not from the grip
// travel (common practice); markers also give the in-plane shear F12, F21
// when the material axes are not aligned with the loading axes. Soft tissue
// is preconditioned, and the loading branch of the last cycle is the one
// usually fitted (common practice; Options.Cycle and Options.Branch). A
// preload defines the reference state; re-referencing moves it to the first
// kept point of each protocol and removes its stress as a tare. Markers are
// tracked with noise: the point-to-point scatter of every F entry is
// estimated for each protocol (Protocol.StrainScatter, scatter.go), and
// Options.SmoothStrain smooths F when asked to.
//
// # Protocols
//
// Protocols are usually named by the ratio of the two axes' targets (stretch
// or load), e.g. 1:1, 1:0.75, 0.75:1, 1:0.5, 0.5:1 (common practice).
//
// # Protocol order
//
// Prepare lists a specimen's protocols in an order taken from their data
// alone, never from their labels or their place in the file
// (Specimen.SortProtocols, order.go), because a fit's floating-point sums
// depend on the order of the rows, and the same protocols written in
// another order must give the same fit. The order is the usual sequence of
// a stretch-ratio study (common practice): the most balanced protocol
// first (smaller over larger axis peak Green strain, rounded to 0.01), then
// ever less balanced ones, each axis-1-dominated protocol before its
// axis-2 mirror (1:1, 1:0.75, 0.75:1, 1:0.5, 0.5:1, …); the tie-breaks are
// listed at the head of order.go.
package biaxial

import "strings"

// StressKind says which stress measure a file gave.
type StressKind int

const (
	// Cauchy is true stress, force per current area.
	Cauchy StressKind = iota
	// Nominal is first Piola–Kirchhoff stress, force per reference area. Loads
	// with specimen geometry are converted to nominal stress.
	Nominal
)

// String returns "cauchy" or "nominal".
func (k StressKind) String() string {
	if k == Nominal {
		return "nominal"
	}
	return "cauchy"
}

// Words names k in running text: "Cauchy" (a name, Cauchy 1823) or
// "nominal".
func (k StressKind) Words() string {
	if k == Nominal {
		return "nominal"
	}
	return "Cauchy"
}

// Symbol writes stress component comp ("11", "22", "12" or "21") of this
// measure as weft prints it everywhere: "P11" for nominal stress, "σ11"
// for Cauchy stress.
func (k StressKind) Symbol(comp string) string {
	if k == Nominal {
		return "P" + comp
	}
	return "σ" + comp
}

// Component indexes a stress component in Point.Stress and Protocol.Weight.
type Component int

const (
	// C11 is the normal stress along axis 1.
	C11 Component = iota
	// C22 is the normal stress along axis 2.
	C22
	// C12 is the in-plane shear component 12 (Cauchy σ12, or nominal P12).
	C12
	// C21 is the nominal component P21. Cauchy stress is symmetric, so for
	// Cauchy data this slot is never measured.
	C21
	// NumComponents is the number of component slots.
	NumComponents
)

// String returns "11", "22", "12" or "21".
func (c Component) String() string {
	switch c {
	case C11:
		return "11"
	case C22:
		return "22"
	case C12:
		return "12"
	case C21:
		return "21"
	}
	return "?"
}

// Point is one measured state of a specimen.
type Point struct {
	// F is the in-plane deformation gradient (F11, F12, F21, F22),
	// dimensionless. A pure biaxial stretch has F = (λ1, 0, 0, λ2).
	F [4]float64
	// Stress holds the measured stress components indexed by Component, in
	// the specimen's StressUnit and of the specimen's Kind. Slots that the
	// file did not measure are zero; Specimen.Measured says which are real.
	Stress [NumComponents]float64
	// Line is the 1-based line of the source file (row for xlsx) this point
	// came from, so that any later message can point back at the data.
	Line int
	// Cycle is the loading cycle (1-based) the point belongs to.
	Cycle int
	// Time is the time stamp in seconds, or NaN when the file has none.
	Time float64
}

// Protocol is one stretch-ratio protocol of a specimen, after cycle and
// branch selection, re-referencing and optional resampling.
type Protocol struct {
	// Label names the protocol as in the file, e.g. "1:0.5".
	Label string
	// Points are the kept points in test order.
	Points []Point
	// Weight is the residual weight of each component in this protocol
	// (1/stress unit): a fitter minimises Σ (Weight[c]·(model − measured))².
	// By default each protocol and measured axis counts equally: the weight is
	// UserWeight / (stress range · √points). Unmeasured slots are zero.
	// Guards (see Prepare): a shear component's range is at least the mean
	// range of the normal components; a normal range is at least a tenth of
	// the larger normal range; all-constant stress gives UserWeight/√points.
	Weight [NumComponents]float64
	// UserWeight is the user's relative weight of this protocol (default 1).
	UserWeight float64
	// Kept describes which part of the raw record was kept, e.g.
	// "cycle 3 of 3, loading branch, 97 of 412 rows".
	Kept string
	// Cycles is the number of cycles found in the raw record of this protocol.
	Cycles int

	// Fields below were added with the reader; they describe the selection
	// and the reference state in a form a program can use.

	// KeptCycle is the cycle kept (1-based), or 0 when every cycle was kept.
	KeptCycle int
	// KeptBranch is the branch kept in the chosen cycle(s).
	KeptBranch Branch
	// RawRows is the number of rows of this protocol in the file.
	RawRows int
	// SelectedPoints is the number of points kept before resampling.
	SelectedPoints int
	// RefF is the deformation gradient (F11, F12, F21, F22) of the point
	// used as the reference state when re-referencing, as measured (as
	// smoothed with SmoothStrain, which re-referencing uses); the
	// identity (1, 0, 0, 1) when the data are used as measured.
	RefF [4]float64
	// Tare is the stress subtracted from every point when re-referencing
	// (in StressUnit, after re-basing nominal stress); zero otherwise.
	Tare [NumComponents]float64
	// Preload is the normal stress (in StressUnit) at the first kept point
	// when that point lies at the reference state (F = I within 0.002) and
	// a normal stress there is above 1 % of its range in the protocol and
	// above 5 times its point-to-point scatter (see stressScatter): a
	// preload that was not tared, which a warning names. It is set for
	// each normal component above that bound and zero for the others; all
	// zero otherwise, and always when re-referencing (see Tare).
	Preload [NumComponents]float64
	// StrainScatter is the point-to-point scatter (standard deviation,
	// dimensionless) of each measured deformation-gradient entry (F11,
	// F12, F21, F22) over the kept points, before resampling: tracking
	// noise of the markers, estimated from third differences (see
	// scatter.go); zero with fewer than MinPoints points.
	StrainScatter [4]float64
	// SmoothWindow is the Savitzky–Golay window (points) F was smoothed
	// over (Options.SmoothStrain), 0 when F is as measured.
	SmoothWindow int
}

// FittedStrainScatter is the scatter of F that remains in the points a fit
// uses: StrainScatter, or, when F was smoothed, StrainScatter times the
// filter's noise factor (SmoothingNoiseFactor) — the scatter of an
// interior point for independent noise.
func (p *Protocol) FittedStrainScatter() [4]float64 {
	sc := p.StrainScatter
	if p.SmoothWindow > 0 {
		f := SmoothingNoiseFactor(p.SmoothWindow)
		for e := range sc {
			sc[e] *= f
		}
	}
	return sc
}

// Warning is a finding in a file that does not stop its use.
type Warning struct {
	// File, Line and Column locate the finding (Line and Column 1-based, 0
	// when not tied to one); Sheet and Cell are set for xlsx workbooks.
	File   string
	Line   int
	Column int
	Sheet  string
	Cell   string
	// Protocol is the protocol label the finding is about, if any.
	Protocol string
	// Message says what was found and what to check.
	Message string
}

// Specimen is everything weft uses from one test file.
type Specimen struct {
	// Name is the specimen's name (metadata `specimen`, else the file stem).
	Name string
	// Source is the path of the file read; Sheet the xlsx sheet, if any.
	Source string
	Sheet  string
	// Digest identifies the bytes the specimen was read from: their
	// number and SHA-256, computed while reading (zero when it was
	// prepared from a record made in memory).
	Digest Digest
	// Meta holds the metadata lines of the file (`# key = value`), keys lower
	// case, values as written.
	Meta map[string]string
	// StressUnit is the unit of every stress value: "Pa", "kPa" or "MPa".
	StressUnit string
	// Kind is the stress measure of the data.
	Kind StressKind
	// Measured says which Components the file measured (for loads and
	// nominal stress: 11 and 22, plus 12 and 21 when given; for Cauchy
	// stress: 11 and 22, plus 12 when given).
	Measured [NumComponents]bool
	// HasShear is true when the data carry shear information: a measured
	// shear stress component, or F12/F21 departing from zero by more than
	// their point-to-point scatter explains (see ShearWithinScatter). Only
	// then can a fibre angle's sign be told (mirror symmetry of pure
	// biaxial stretch).
	HasShear bool
	// ShearWithinScatter is true when no shear stress is given and F12,
	// F21 are non-zero on some kept point but stay within 5 times their
	// point-to-point scatter of zero on every one: a pure biaxial stretch
	// seen through tracking noise, or a shear too small to tell from it.
	// HasShear is then false, and a fit takes F12 = F21 = 0 (the points
	// keep the values as read).
	ShearWithinScatter bool
	// Reference records the reference state used, e.g. "as measured" or
	// "re-referenced to the first kept point of each protocol (tare removed)".
	Reference string
	// Protocols in the protocol order of SortProtocols (from their data,
	// not their order in the file), when prepared by Prepare.
	Protocols []Protocol
	// Warnings found while reading; Notices are informational (e.g. a
	// semicolon-separated file was detected).
	Warnings []Warning
	Notices  []string

	// Fields below were added with the reader.

	// Kinematics says whether the file gave stretches or F.
	Kinematics Kinematics
	// FromLoads is true when the normal stresses were computed from loads
	// and the specimen geometry (Kind is then Nominal).
	FromLoads bool
	// Geometry is the reference geometry from the metadata, nil when any of
	// thickness, size_1, size_2 is missing.
	Geometry *Geometry
	// HasTime is true when the points carry time stamps.
	HasTime bool
	// MetaKeys lists the keys of Meta in file order (for deterministic
	// output).
	MetaKeys []string
}

// NumPoints returns the total number of kept points over all protocols.
func (s *Specimen) NumPoints() int {
	n := 0
	for i := range s.Protocols {
		n += len(s.Protocols[i].Points)
	}
	return n
}

// Deformations returns the deformation gradients (F11, F12, F21, F22) of
// the kept points of each protocol, protocol by protocol in order.
func (s *Specimen) Deformations() [][][4]float64 {
	protocols := make([][][4]float64, 0, len(s.Protocols))
	for _, pr := range s.Protocols {
		fs := make([][4]float64, 0, len(pr.Points))
		for _, pt := range pr.Points {
			fs = append(fs, pt.F)
		}
		protocols = append(protocols, fs)
	}
	return protocols
}

// Location returns where the finding is, e.g. "data.csv:14:3" or
// "tests.xlsx:SYN-3!C9", in the form of ParseError.
func (w Warning) Location() string {
	e := ParseError{File: w.File, Line: w.Line, Column: w.Column, Sheet: w.Sheet, Cell: w.Cell}
	return e.Location()
}

// String returns the warning as one line: location, protocol, message.
func (w Warning) String() string {
	s := w.Location()
	// A message that names its protocol first is not told it twice.
	if w.Protocol != "" && !strings.HasPrefix(w.Message, "protocol "+w.Protocol+":") {
		s += " (protocol " + w.Protocol + ")"
	}
	return s + ": " + w.Message
}
