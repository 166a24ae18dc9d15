package main

import (
	"fmt"
	"path/filepath"
	"runtime/debug"
	"sort"
	"strconv"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
	"github.com/weft-tools/weft/cmd/weft/internal/safeout"
)

// buildVersion reads the version of this build from the Go build
// information: the main module's version ("(devel)" for a build from a
// source tree without a version) and the version-control revision and
// modified flag, when the build recorded them (go build in a checkout does;
// test binaries do not).
func buildVersion() card.Provenance {
	p := card.Provenance{Software: "weft", Version: "(devel)"}
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return p
	}
	if v := bi.Main.Version; v != "" {
		p.Version = v
	}
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			p.Revision = s.Value
		case "vcs.modified":
			p.Modified = s.Value == "true"
		}
	}
	return p
}

// versionText is what weft --version prints after "weft ".
func versionText() string {
	p := buildVersion()
	return p.VersionText()
}

// inputRef is one input file to record: its path, the workbook sheet read
// ("" for CSV) and, for a test file, the digest of the bytes parsed
// (package biaxial computes it while reading).
type inputRef struct {
	path, sheet string
	digest      biaxial.Digest
}

// hashInputs records each input by base name, sheet, size and SHA-256, in
// the order given: a test file's from the bytes it was parsed from, any
// other file's by reading it. A file that cannot be read again (it was read
// a moment ago) is an error.
func hashInputs(refs []inputRef) ([]card.InputFile, error) {
	out := make([]card.InputFile, 0, len(refs))
	for _, r := range refs {
		dg := r.digest
		var err error
		if dg.SHA256 == "" {
			dg, err = biaxial.FileDigest(r.path)
		}
		if err != nil {
			return nil, fmt.Errorf("cannot read %s again to record its SHA-256 (%s)", r.path, safeout.Reason(err))
		}
		out = append(out, card.InputFile{File: filepath.Base(r.path), Sheet: r.sheet, Bytes: dg.Bytes, SHA256: dg.SHA256})
	}
	return out, nil
}

// newProvenance says what made a card or a summary: this build, the
// command, the options that decide the result and the inputs.
func newProvenance(command string, options []string, inputs []card.InputFile) *card.Provenance {
	p := buildVersion()
	p.Command, p.Options, p.Inputs = command, options, inputs
	if p.Options == nil {
		p.Options = []string{}
	}
	if p.Inputs == nil {
		p.Inputs = []card.InputFile{}
	}
	return &p
}

// fitProvenance says what made the card of a fit of the file at path,
// read as spec: this build, the options that decide the result (form
// holds those of the model form, formOptionList) and the file's name,
// sheet, size and SHA-256.
func fitProvenance(path string, spec *biaxial.Specimen, o biaxial.Options, form []string) (*card.Provenance, error) {
	in, err := hashInputs([]inputRef{{path, spec.Sheet, spec.Digest}})
	if err != nil {
		return nil, err
	}
	return newProvenance("weft fit", append(readOptionList(o, spec.Sheet), form...), in), nil
}

// readOptionList writes every option of reading a test file that decides
// the result, the defaults included, as they would be typed; sheet is the
// workbook sheet read ("" for CSV, or for several files of either kind).
// Protocols without a --protocol-weight weigh 1 and are not listed.
func readOptionList(o biaxial.Options, sheet string) []string {
	var out []string
	if sheet != "" {
		out = append(out, "--sheet="+sheet)
	}
	cycle := strconv.Itoa(o.Cycle)
	switch o.Cycle {
	case biaxial.CycleLast:
		cycle = "last"
	case biaxial.CycleAll:
		cycle = "all"
	}
	out = append(out, "--cycle="+cycle, "--branch="+o.Branch.String(),
		"--rereference="+strconv.FormatBool(o.Rereference), "--resample="+strconv.Itoa(o.Resample),
		"--smooth-strain="+strconv.Itoa(o.SmoothStrain))
	var labels []string
	for l := range o.ProtocolWeights {
		labels = append(labels, l)
	}
	sort.Strings(labels)
	for _, l := range labels {
		out = append(out, "--protocol-weight="+l+"="+strconv.FormatFloat(o.ProtocolWeights[l], 'g', -1, 64))
	}
	return out
}

// formOptionList writes the options that decide the model form, each as
// resolved (defaults included) wherever it applies: st is the form
// structureFromFlags read from ff and chosen false for discovery.
func formOptionList(ff *fitOptions, st aniso.Structure, chosen bool) []string {
	if !chosen {
		out := []string{"--max-terms=" + strconv.Itoa(ff.maxTerms), "--dispersion=" + ff.discoveryDispersion()}
		if ff.calibration > 0 {
			out = append(out, "--calibration-check="+strconv.FormatFloat(ff.calibration, 'g', -1, 64))
		}
		return out
	}
	var out []string
	families := st.Layout.Families()
	if ff.preset != "" {
		out = append(out, "--preset="+ff.preset)
	} else {
		out = append(out, "--terms="+ff.termIDs, "--families="+strconv.Itoa(families))
		if families == 2 {
			out = append(out, "--layout="+st.Layout.String())
		}
		if families > 0 {
			disp := "none"
			switch {
			case st.Planar:
				disp = "in-plane"
			case st.Dispersion:
				disp = "kappa"
			}
			out = append(out, "--dispersion="+disp)
		}
	}
	if st.Layout == aniso.LayoutMirror {
		axis := "free"
		if st.HoldPairAxis {
			axis = "axis-1"
		}
		out = append(out, "--pair-axis="+axis)
	}
	return out
}

// recordViewOptions are o with every cycle and both branches, as measured
// (no re-referencing, resampling or smoothing).
func recordViewOptions(o biaxial.Options) biaxial.Options {
	o.Cycle, o.Branch, o.Rereference, o.Resample, o.SmoothStrain = biaxial.CycleAll, biaxial.BranchAll, false, 0, 0
	return o
}

// recordViewOf is readRecordView on rows already read (the same bytes as
// the fit's, so nothing can have changed).
func recordViewOf(rows *biaxial.Rows, o biaxial.Options) *biaxial.Specimen {
	s, err := rows.Prepare(recordViewOptions(o))
	if err != nil {
		return nil
	}
	return s
}

// readRecordView reads a test file again with every cycle and both
// branches, as measured (no re-referencing or resampling), for the
// report's view of the whole record. It returns nil when the file cannot
// be read so (the report then has no such view); the fit itself does not
// depend on it. It returns nil with changed set when the bytes differ from
// those fitted (fitted, the digest of the fit's read): a view of other data
// would misrepresent the fit.
func readRecordView(path string, o biaxial.Options, fitted biaxial.Digest) (view *biaxial.Specimen, changed bool) {
	s, err := biaxial.ReadFile(path, recordViewOptions(o))
	if err != nil {
		return nil, false
	}
	if fitted.SHA256 != "" && s.Digest != fitted {
		return nil, true
	}
	return s, false
}
