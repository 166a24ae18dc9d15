package card

import (
	"sort"

	"github.com/weft-tools/weft/biaxial"
)

// Section keys of a fitted card that make it traceable: which program made
// it from which files with which options, and how the specimen was set up.
const (
	KeyProvenance = "provenance"
	KeySetup      = "setup"
)

// Provenance says what made a card: the program and its version, the
// options that decide the result, and each input file by name and content
// hash, so that a reader can tell whether a card belongs to a data file and
// repeat the fit. It holds no times and no paths, so the same input and
// program give the same card.
type Provenance struct {
	// Software is "weft".
	Software string `json:"software"`
	// Version is the module version of the build ("(devel)" for a build
	// from a source tree without a version); Revision the version-control
	// revision it was built from and Modified whether that tree had
	// uncommitted changes (both from the Go build information; empty and
	// false when the build did not record them).
	Version  string `json:"version"`
	Revision string `json:"revision,omitempty"`
	Modified bool   `json:"modified,omitempty"`
	// Command names the program and sub-command that wrote the card, as
	// the writer records it.
	Command string `json:"command"`
	// Options are every option that decides the result, defaults
	// included, spelled as the writer's command line takes them.
	Options []string `json:"options"`
	// Inputs are the files read.
	Inputs []InputFile `json:"inputs"`
}

// InputFile is one file a card was made from.
type InputFile struct {
	// File is the base name (no folders, so that the card does not reveal
	// where the data live); Sheet the workbook sheet read, if any.
	File  string `json:"file"`
	Sheet string `json:"sheet,omitempty"`
	// Bytes is the file's size and SHA256 the hexadecimal SHA-256 of its
	// contents (FIPS 180-4).
	Bytes  int64  `json:"bytes"`
	SHA256 string `json:"sha256"`
}

// VersionText is the version as one line of text: the
// version, then the revision (shortened to 12 hexadecimal digits) and
// "modified" when known.
func (p *Provenance) VersionText() string {
	s := p.Version
	if p.Revision != "" {
		r := p.Revision
		if len(r) > 12 {
			r = r[:12]
		}
		s += ", revision " + r
		if p.Modified {
			s += " (modified)"
		}
	}
	return s
}

// Setup is how the specimen was mounted and measured, as far as the test
// file says: its reference geometry, where the stress came from, how the
// deformation was measured and, when the file states it, how the test was
// controlled. Every other metadata line of the file is kept in Metadata.
type Setup struct {
	// ThicknessMM, Size1MM and Size2MM are the reference thickness H and
	// the extents W1, W2 of the loaded region along axes 1 and 2 (mm);
	// absent when the file does not give all three.
	ThicknessMM *float64 `json:"thickness_mm,omitempty"`
	Size1MM     *float64 `json:"size_1_mm,omitempty"`
	Size2MM     *float64 `json:"size_2_mm,omitempty"`
	// StressFrom is "loads and geometry" (nominal stress from forces:
	// P11 = load_1/(W2 H), P22 = load_2/(W1 H)) or "stress columns".
	StressFrom string `json:"stress_from"`
	// Kinematics is "stretches" (a pure biaxial stretch) or "deformation
	// gradient" (F11, F12, F21, F22, e.g. from tracked markers).
	Kinematics string `json:"kinematics"`
	// Control is the file's `control` metadata (e.g. "load" or
	// "stretch"), or empty when the file does not say.
	Control string `json:"control,omitempty"`
	// Metadata are the file's other metadata lines in file order (keys
	// lower case), those shown elsewhere left out.
	Metadata []MetaLine `json:"metadata,omitempty"`
}

// MetaLine is one `# key = value` line of a test file.
type MetaLine struct {
	Key   string `json:"key"`
	Value string `json:"value"`
}

// shownElsewhere are the metadata keys a card shows in other keys.
var shownElsewhere = map[string]bool{"specimen": true, "tissue": true, "notes": true, "axis_1": true, "thickness": true,
	"size_1": true, "size_2": true, "stress_unit": true, "protocol": true, "control": true}

// NewSetup describes the set-up of s.
func NewSetup(s *biaxial.Specimen) *Setup {
	st := &Setup{StressFrom: "stress columns", Kinematics: "stretches", Control: s.Meta["control"]}
	if s.FromLoads {
		st.StressFrom = "loads and geometry"
	}
	if s.Kinematics == biaxial.GradientColumns {
		st.Kinematics = "deformation gradient"
	}
	if g := s.Geometry; g != nil {
		h, w1, w2 := g.Thickness, g.Size1, g.Size2
		st.ThicknessMM, st.Size1MM, st.Size2MM = &h, &w1, &w2
	}
	keys := s.MetaKeys
	if len(keys) == 0 { // a specimen built in code may list no order
		for k := range s.Meta {
			keys = append(keys, k)
		}
		sort.Strings(keys)
	}
	for _, k := range keys {
		if !shownElsewhere[k] {
			st.Metadata = append(st.Metadata, MetaLine{Key: k, Value: s.Meta[k]})
		}
	}
	return st
}
