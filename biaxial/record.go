package biaxial

import "math"

// Kinematics says how a file gave the deformation.
type Kinematics int

const (
	// StretchColumns: stretch_1 and stretch_2, a pure biaxial stretch
	// (F12 = F21 = 0).
	StretchColumns Kinematics = iota
	// GradientColumns: F11, F12, F21, F22, the in-plane deformation gradient
	// derived from markers.
	GradientColumns
)

// String returns "stretch" or "gradient".
func (k Kinematics) String() string {
	if k == GradientColumns {
		return "gradient"
	}
	return "stretch"
}

// Geometry is the reference geometry of a specimen, used to turn loads into
// nominal stresses (package documentation, Loads to stress). All lengths are in millimetres.
type Geometry struct {
	// Thickness is the reference thickness H (mm), metadata `thickness`.
	Thickness float64
	// Size1 and Size2 are the reference extents W1, W2 of the loaded region
	// along axis 1 and axis 2 (mm), metadata `size_1`, `size_2`. The load on
	// axis 1 acts over W2·H, the load on axis 2 over W1·H.
	Size1, Size2 float64
}

// Row is one data row of a file before cycle and branch selection.
type Row struct {
	// Protocol is the row's protocol label.
	Protocol string
	// Point holds the row's kinematics and stress (already converted to the
	// record's StressUnit and Kind), its source line, and its time (NaN when
	// the file has no time column). Point.Cycle is the cycle number as
	// written in the file, 0 when the file has no cycle column.
	Point
}

// Record is the raw content of one test file: every data row in file order,
// with units converted but before cycle and branch selection, re-referencing,
// resampling and weighting (see Prepare). WriteRecord writes one back, so a
// Record is also how multi-cycle data are built and saved.
type Record struct {
	// Name is the specimen's name (metadata `specimen`, else the file stem).
	Name string
	// Source is the path or name of the file; Sheet the xlsx sheet read.
	Source string
	Sheet  string
	// Digest identifies the bytes read (zero for a record made in memory).
	Digest Digest
	// Meta holds the metadata (`# key = value` lines before the header),
	// keys lower case, values as written. MetaKeys lists the keys in file
	// order so that writing is deterministic.
	Meta     map[string]string
	MetaKeys []string
	// StressUnit is the unit of every stress value ("Pa", "kPa", "MPa").
	StressUnit string
	// Kind is the stress measure (loads become Nominal).
	Kind StressKind
	// Measured says which stress components the file gave.
	Measured [NumComponents]bool
	// Kinematics says whether the file gave stretches or F.
	Kinematics Kinematics
	// FromLoads is true when the normal stresses were computed from loads.
	FromLoads bool
	// Geometry is the parsed reference geometry, nil when the metadata lack
	// any of thickness, size_1, size_2.
	Geometry *Geometry
	// HasTime is true when the file has a time column (else every Time is NaN).
	HasTime bool
	// HasCycle is true when the file has a cycle column.
	HasCycle bool
	// Rows are the data rows in file order.
	Rows []Row
	// Warnings and Notices found while parsing.
	Warnings []Warning
	Notices  []string
}

// Stretch1 is the stretch of a material line that lies along axis 1 in the
// reference state, |F e1| = √(F11² + F21²) (dimensionless). It equals λ1 for
// a pure biaxial stretch.
func (p *Point) Stretch1() float64 { return math.Hypot(p.F[0], p.F[2]) }

// Stretch2 is the stretch of a material line along axis 2, |F e2| =
// √(F12² + F22²) (dimensionless).
func (p *Point) Stretch2() float64 { return math.Hypot(p.F[1], p.F[3]) }

// drive is the measure that drives loading and unloading: the largest
// entry of |F − I|, which for a pure stretch is max(|λ1−1|, |λ2−1|).
func drive(f *[4]float64) float64 {
	return math.Max(math.Max(math.Abs(f[0]-1), math.Abs(f[1])),
		math.Max(math.Abs(f[2]), math.Abs(f[3]-1)))
}
