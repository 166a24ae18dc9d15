package biaxial

import (
	"fmt"
	"strconv"
	"strings"
)

// Branch selects which part of each loading cycle is kept.
type Branch int

const (
	// BranchLoading keeps the loading branch: from the start of the cycle
	// (its lowest point) up to the peak of the driving stretch, both included.
	// It is the default, and the branch usually fitted (common practice).
	BranchLoading Branch = iota
	// BranchUnloading keeps the unloading branch: from the peak of the
	// driving stretch down to the end of the cycle, both included.
	BranchUnloading
	// BranchAll keeps every point of the cycle in test order.
	BranchAll
)

// String returns "loading", "unloading" or "all".
func (b Branch) String() string {
	switch b {
	case BranchUnloading:
		return "unloading"
	case BranchAll:
		return "all"
	}
	return "loading"
}

// ParseBranch reads "loading", "unloading" or "all" (case-insensitive).
func ParseBranch(s string) (Branch, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "loading", "load", "":
		return BranchLoading, nil
	case "unloading", "unload":
		return BranchUnloading, nil
	case "all":
		return BranchAll, nil
	}
	return 0, fmt.Errorf("%w: branch %q is not one of loading, unloading, all", ErrOptions, s)
}

// Cycle selectors for Options.Cycle besides a 1-based cycle number.
const (
	// CycleLast keeps the last cycle of each protocol (the default: soft
	// tissue is preconditioned by the earlier cycles, common practice).
	CycleLast = 0
	// CycleAll keeps every cycle, in test order.
	CycleAll = -1
)

// ParseCycle reads "last", "all" or a 1-based cycle number.
func ParseCycle(s string) (int, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "last", "":
		return CycleLast, nil
	case "all":
		return CycleAll, nil
	}
	n, err := strconv.Atoi(strings.TrimSpace(s))
	if err != nil || n < 1 {
		return 0, fmt.Errorf("%w: cycle %q is not last, all or a cycle number from 1 up", ErrOptions, s)
	}
	return n, nil
}

// Options control how a test file is read and prepared. The zero value is
// the default: first sheet, loading branch of the last cycle, data as
// measured, no resampling, every protocol weighted 1.
type Options struct {
	// Sheet names the xlsx sheet to read; "" reads the first sheet. Ignored
	// for CSV.
	Sheet string
	// Cycle selects the cycle kept in each protocol: CycleLast (0, the
	// default), CycleAll (-1) or a 1-based cycle number.
	Cycle int
	// Branch selects the branch kept in the chosen cycle(s); default
	// BranchLoading.
	Branch Branch
	// Rereference moves the reference state of each protocol to its first
	// kept point: F ← F·F_ref⁻¹ (stretches divided by the reference
	// stretches), nominal stress re-based to the new reference area,
	// P ← P·F_refᵀ (incompressibility, J = 1), and that point's stress
	// subtracted as a tare. Default false: data as measured.
	Rereference bool
	// Resample, when > 0, replaces each protocol's kept points by Resample
	// points evenly spaced in the driving stretch (linear interpolation of
	// F, stress and time). It must be 0 or at least MinPoints. Default 0.
	Resample int
	// SmoothStrain, when > 0, smooths each protocol's kept deformation
	// gradient (F11, F12, F21, F22, entry by entry, in point order) with a
	// quadratic Savitzky–Golay filter over that many points (Savitzky &
	// Golay 1964: each point replaced by the value at it of the
	// least-squares quadratic through the window centred on it; the first
	// and last points by the quadratic of the first and last window), one
	// kept branch at a time (never across a turning point or from one kept
	// cycle to the next), before resampling: it lowers the tracking noise
	// of markers (see scatter.go) and leaves a quadratic path as it was.
	// It must be 0 (default: F as measured) or an odd number of at least
	// MinPoints, and every kept branch must hold at least that many points.
	SmoothStrain int
	// ProtocolWeights gives a relative weight per protocol label (> 0,
	// default 1 for a label not in the map). A label that names no protocol
	// of the file is an error.
	ProtocolWeights map[string]float64
	// Limits bound the file's size and its values; zero fields take
	// DefaultLimits.
	Limits Limits
}

// MinPoints is the fewest points a protocol may keep after cycle and branch
// selection.
const MinPoints = 5

func (o Options) check() error {
	if o.Cycle < CycleAll {
		return fmt.Errorf("%w: cycle %d is not valid; use a cycle number from 1 up, 0 for the last or -1 for all", ErrOptions, o.Cycle)
	}
	if o.Branch < BranchLoading || o.Branch > BranchAll {
		return fmt.Errorf("%w: branch %d is not valid", ErrOptions, int(o.Branch))
	}
	if o.Resample != 0 && o.Resample < MinPoints {
		return fmt.Errorf("%w: resample to %d points; use 0 (off) or at least %d", ErrOptions, o.Resample, MinPoints)
	}
	if o.SmoothStrain != 0 && (o.SmoothStrain < MinPoints || o.SmoothStrain%2 == 0) {
		return fmt.Errorf("%w: smoothing window of %d points; use 0 (off) or an odd number of at least %d", ErrOptions, o.SmoothStrain, MinPoints)
	}
	if err := o.Limits.check(); err != nil {
		return err
	}
	if max := o.Limits.withDefaults().MaxRows; o.Resample > max {
		return categorised{fmt.Sprintf("%v: resampling to %d points per protocol exceeds the row limit of %d", ErrOptions, o.Resample, max), []error{ErrOptions, ErrRowCount}}
	}
	for _, k := range sortedKeys(o.ProtocolWeights) {
		w := o.ProtocolWeights[k]
		if !(w > 0) || w > 1e300 {
			// A weight of 0 would keep the protocol in the data and in
			// cross-validation while the fit ignores it: its folds fail
			// and the selection has no held-out errors to compare.
			return fmt.Errorf("%w: weight %v for protocol %s; weights must be finite and > 0 (a protocol to be left out of the fit must be left out of the data)", ErrOptions, w, quote(k))
		}
	}
	return nil
}
