package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/weft-tools/weft/aniso/card"
	"github.com/weft-tools/weft/biaxial"
)

// limitFlags hold --limit NAME=VALUE, which raises (or lowers) the limits
// on what weft reads: sizes that keep a damaged file from exhausting memory
// or time, and the plausible range of test data.
type limitFlags struct{ specs []string }

// limitNames are the names --limit accepts, with what each sets.
var limitNames = map[string]string{
	"file-mb":       "largest test or kinematics file, MiB",
	"rows":          "most data rows per file (also bounds --resample)",
	"workbook-mb":   "largest unpacked xlsx workbook, MiB",
	"stretch":       "plausible range of principal stretches, MIN,MAX",
	"stress-kpa":    "largest plausible stress magnitude, kPa",
	"card-mb":       "largest model card, MiB",
	"card-terms":    "most terms in a model card",
	"card-families": "most fibre families in a model card",
}

// addLimitFlag registers --limit on cmd.
func addLimitFlag(cmd *cobra.Command) *limitFlags {
	l := &limitFlags{}
	d, dc := biaxial.DefaultLimits, card.DefaultLimits
	cmd.Flags().StringArrayVar(&l.specs, "limit", nil, fmt.Sprintf(
		"raise a limit on what is read, NAME=VALUE (repeatable): file-mb (default %g), rows (%d), workbook-mb (%g), stretch (%g,%g), stress-kpa (%g), card-mb (%g), card-terms (%d), card-families (%d)",
		mib(d.MaxBytes), d.MaxRows, mib(d.MaxWorkbookBytes), d.StretchMin, d.StretchMax, d.MaxStressKPa, mib(dc.MaxBytes), dc.MaxTerms, dc.MaxFamilies))
	return l
}

func mib(n int64) float64 { return float64(n) / (1 << 20) }

// parse turns the --limit values into the readers' limits.
func (l *limitFlags) parse() (biaxial.Limits, card.Limits, error) {
	var bl biaxial.Limits
	var cl card.Limits
	seen := map[string]bool{}
	for _, spec := range l.specs {
		name, val, ok := strings.Cut(spec, "=")
		name = strings.TrimSpace(name)
		if _, known := limitNames[name]; !ok || !known {
			return bl, cl, badInputf("--limit %s: write NAME=VALUE with NAME one of %s", quoteArg(spec), strings.Join(sortedLimitNames(), ", "))
		}
		if seen[name] {
			return bl, cl, badInputf("--limit: %s is given twice", name)
		}
		seen[name] = true
		if name == "stretch" {
			v, err := parseNumbers("limit stretch", val, 2)
			if err != nil {
				return bl, cl, err
			}
			if !(v[0] > 0 && v[0] < 1 && v[1] > 1) {
				return bl, cl, badInputf("--limit stretch=%s: give MIN,MAX with 0 < MIN < 1 < MAX", val)
			}
			bl.StretchMin, bl.StretchMax = v[0], v[1]
			continue
		}
		v, err := biaxial.ParseNumber(strings.TrimSpace(val))
		if err != nil || !(v > 0) {
			return bl, cl, badInputf("--limit %s=%s: give a positive number", name, val)
		}
		count := func() (int, error) {
			if v != math.Trunc(v) || v > math.MaxInt32 {
				return 0, badInputf("--limit %s=%s: give a whole number up to %d", name, val, math.MaxInt32)
			}
			return int(v), nil
		}
		bytes := func() (int64, error) {
			if v > 1<<40/(1<<20) {
				return 0, badInputf("--limit %s=%s: give at most %d MiB", name, val, 1<<20)
			}
			return int64(v * (1 << 20)), nil
		}
		switch name {
		case "file-mb":
			bl.MaxBytes, err = bytes()
		case "workbook-mb":
			bl.MaxWorkbookBytes, err = bytes()
		case "card-mb":
			cl.MaxBytes, err = bytes()
		case "rows":
			bl.MaxRows, err = count()
		case "card-terms":
			cl.MaxTerms, err = count()
		case "card-families":
			cl.MaxFamilies, err = count()
		case "stress-kpa":
			bl.MaxStressKPa = v
		}
		if err != nil {
			return bl, cl, err
		}
	}
	return bl, cl, nil
}

func sortedLimitNames() []string {
	var ns []string
	for n := range limitNames {
		ns = append(ns, n)
	}
	sort.Strings(ns)
	return ns
}

// quoteArg quotes a command-line value for a message, clipped as every
// message of weft clips what it quotes (biaxial.QuoteValue).
func quoteArg(s string) string { return biaxial.QuoteValue(s) }

// limitHints say which --limit raises the limit an error is about.
var limitHints = []struct {
	err  error
	hint string
}{
	{biaxial.ErrFileSize, "--limit file-mb=N"},
	{biaxial.ErrRowCount, "--limit rows=N"},
	{biaxial.ErrWorkbookSize, "--limit workbook-mb=N"},
	{biaxial.ErrStretchLimit, "--limit stretch=MIN,MAX"},
	{biaxial.ErrStressLimit, "--limit stress-kpa=N"},
	{card.ErrCardSize, "--limit card-mb=N"},
	{card.ErrTermCount, "--limit card-terms=N"},
	{card.ErrFamilyCount, "--limit card-families=N"},
}

// withLimitHint marks err as bad input and, when it is about a limit, adds
// the option that raises it.
func withLimitHint(err error) error {
	if err == nil {
		return nil
	}
	for _, h := range limitHints {
		if errors.Is(err, h.err) {
			return badInput(fmt.Errorf("%w (to raise the limit: %s)", err, h.hint))
		}
	}
	return badInput(err)
}

// categorised is an error message with a category for errors.Is that does
// not show in the text.
type categorised struct {
	msg string
	cat error
}

func (e categorised) Error() string { return e.msg }
func (e categorised) Unwrap() error { return e.cat }

// tooLargeError says that file is larger than max bytes, a limit of
// category cat.
func tooLargeError(file string, max int64, cat error) error {
	return withLimitHint(categorised{fmt.Sprintf("%s is larger than %g MiB, the limit for it", file, mib(max)), cat})
}

// errTooLarge says that a file holds more than the bytes allowed.
var errTooLarge = errors.New("too large")

// readAtMost reads the file at path whole unless it holds more than max
// bytes (errTooLarge), so a huge file or a device cannot exhaust memory.
func readAtMost(path string, max int64) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, max+1))
	if err != nil {
		return nil, err
	}
	if int64(len(b)) > max {
		return nil, errTooLarge
	}
	return b, nil
}
