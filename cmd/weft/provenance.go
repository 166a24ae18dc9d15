package main

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime/debug"
	"sort"
	"strconv"

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

// hashFile returns the size and hexadecimal SHA-256 of a file's contents,
// read as a stream.
func hashFile(path string) (int64, string, error) {
	f, err := os.Open(path)
	if err != nil {
		return 0, "", err
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return 0, "", err
	}
	return n, hex.EncodeToString(h.Sum(nil)), nil
}

// fitProvenance says what made the card of a fit of the file at path: this
// build, the options that decide the result, and the file's name, size
// and SHA-256. A file that cannot be read again (it was read a moment ago)
// is an error.
func fitProvenance(path string, ff *fitOptions) (*card.Provenance, error) {
	p := buildVersion()
	p.Command = "weft fit"
	p.Options = fitOptionList(ff)
	n, sum, err := hashFile(path)
	if err != nil {
		return nil, fmt.Errorf("cannot read %s again to record its SHA-256 (%s)", path, safeout.Reason(err))
	}
	p.Inputs = []card.InputFile{{File: filepath.Base(path), Sheet: ff.read.Sheet, Bytes: n, SHA256: sum}}
	return &p, nil
}

// fitOptionList writes every option of a fit that decides its result, the
// defaults included, as they would be typed.
func fitOptionList(ff *fitOptions) []string {
	o := ff.read
	var out []string
	if o.Sheet != "" {
		out = append(out, "--sheet="+o.Sheet)
	}
	cycle := strconv.Itoa(o.Cycle)
	switch o.Cycle {
	case biaxial.CycleLast:
		cycle = "last"
	case biaxial.CycleAll:
		cycle = "all"
	}
	out = append(out, "--cycle="+cycle, "--branch="+o.Branch.String())
	if o.Rereference {
		out = append(out, "--rereference")
	}
	if o.Resample > 0 {
		out = append(out, "--resample="+strconv.Itoa(o.Resample))
	}
	var labels []string
	for l := range o.ProtocolWeights {
		labels = append(labels, l)
	}
	sort.Strings(labels)
	for _, l := range labels {
		out = append(out, "--protocol-weight="+l+"="+strconv.FormatFloat(o.ProtocolWeights[l], 'g', -1, 64))
	}
	switch {
	case ff.preset != "":
		out = append(out, "--preset="+ff.preset)
		if ff.pairAxis != "" {
			out = append(out, "--pair-axis="+ff.pairAxis)
		}
	case ff.termIDs != "":
		out = append(out, "--terms="+ff.termIDs)
		if ff.families >= 0 {
			out = append(out, "--families="+strconv.Itoa(ff.families))
		}
		out = append(out, "--layout="+ff.layout)
		if ff.dispersion != "" {
			out = append(out, "--dispersion="+ff.dispersion)
		}
		if ff.pairAxis != "" {
			out = append(out, "--pair-axis="+ff.pairAxis)
		}
	default:
		out = append(out, "--max-terms="+strconv.Itoa(ff.maxTerms))
		if ff.dispersion != "" {
			out = append(out, "--dispersion="+ff.dispersion)
		}
	}
	return out
}

// readRecordView reads a test file again with every cycle and both
// branches, as measured (no re-referencing or resampling), for the
// report's view of the whole record. It returns nil when the file cannot
// be read so (the report then has no such view); the fit itself does not
// depend on it.
func readRecordView(path string, o biaxial.Options) *biaxial.Specimen {
	o.Cycle, o.Branch, o.Rereference, o.Resample = biaxial.CycleAll, biaxial.BranchAll, false, 0
	s, err := biaxial.ReadFile(path, o)
	if err != nil {
		return nil
	}
	return s
}
