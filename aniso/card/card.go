// Package card reads, validates and writes weft model cards (model.json): a
// versioned JSON description of a strain energy — its fibre families and
// weighted catalogue terms — that a user can also write by hand, and that a
// fit extends with its evidence. Readers keep keys they do not know but are
// otherwise strict (exact key case, no repeated keys, UTF-8, an object at
// the top level, bounded size; see ParseLimits).
//
// A fit's card is built by FromFit (fromfit.go); the fitted data range is
// DataRange, whose Outside tests one deformation against it and
// Interval.Outside one span (datarange.go); the JSON Schema of a card is
// model.schema.json, embedded and returned by Schema (schema.go).
//
// The other files, one job each: card.go (Card, Parse, FromModel, the
// conventions and cautions written into every card), strict.go
// (ParseLimits, the strict reader), fit.go and sections.go (the typed
// sections: FitSection, VerdictSection, SelectionSection, SplitSection),
// candidate.go (the model each cross-validated selection candidate
// carries, CandidateModel), alike.go (the near-equivalent candidates,
// NearEquivalents and AlikeModels, and the prediction band over them at
// one deformation, AlikeBand, which a prediction's alike_low_ and
// alike_high_ columns show), untested.go (the strips the data did not test, NewUntestedStrips),
// alternatives.go (the mirror alternatives, NewAlternativesSection),
// calibration.go (discovery repeated with one axis's stress scaled,
// NewCalibrationCheck), provenance.go (Provenance, Setup) and former.go
// (keys that older cards used). The command line adds to the card FromFit builds
// the untested strips of a discovered model (NewUntestedStrips, from the
// protocols' deformations) and, when asked, the calibration check.
//
// A card's numbers carry units: weights, RMSE and stress ranges in the
// card's stress unit, angles in degrees from axis 1 towards axis 2, the
// specimen's geometry in mm, model parameters dimensionless; each field's
// comment says which. The conventions are written into every card weft
// produces.
package card

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

// Format is the card format this version of weft writes and reads.
const Format = "weft.model/1"

// Cautions are printed wherever parameters leave weft.
var Cautions = []string{
	"Parameters are research-grade and specimen-specific: valid only within the tested stretch range and loading protocols.",
	"A fitted model is not a substitute for validating a simulation against independent data.",
	"Not for clinical decisions. Follow the regulations and standards that apply (for example to medical devices) and licensed professional practice.",
}

// SyntheticCaution leads the cautions of a card whose data say they are
// synthetic (CautionsOf), so that a reader of any output of the card, not
// only of its data section, learns that no tissue was measured.
const SyntheticCaution = "SYNTHETIC data: the data this model was fitted to say they are synthetic (invented, not measured), so its parameters describe no real tissue."

// SaysSynthetic reports whether any of texts contains the word
// "synthetic" in any case: the label weft's demo files carry in their
// tissue and notes, and the one the README asks of example data.
func SaysSynthetic(texts ...string) bool {
	for _, t := range texts {
		if strings.Contains(strings.ToUpper(t), "SYNTHETIC") {
			return true
		}
	}
	return false
}

// Synthetic reports whether c's cautions already hold SyntheticCaution (as
// a cohort's mean-parameter card, which has no data section, may) or its
// data section says its data are synthetic (specimen, source, tissue, notes
// or notices).
func (c *Card) Synthetic() bool {
	for _, s := range c.Cautions {
		if s == SyntheticCaution {
			return true
		}
	}
	d := c.Data
	if d == nil {
		return false
	}
	return SaysSynthetic(append([]string{d.Specimen, d.Source, d.Tissue, d.Notes}, d.Notices...)...)
}

// FamiliesCaution follows the cautions of a card whose verdict claims
// fibre families (1, 2, 1-or-mirror-pair). Measured once (2026-12-05, an
// audit with materials made by independent code): three families, and two
// coupled through I8, were a confident 2 on sutures in 10 of 42
// specimens, with angles off by up to 40° and off-axis loadings missed by
// 27–32 % against held-out errors of 1.6–2.0 %.
const FamiliesCaution = "Fibre families: the verdict counts the families the tested protocols need of weft's forms (at most two, ideal or spread in the plane); tissue with more families, or with families coupled to each other, can read as fewer and be predicted far worse off the tested axes: test a loading off those axes (an off-axis mounting, a strip) before using the fibres there."

// CautionsOf returns the cautions every output of c shows: Cautions, led by
// SyntheticCaution when c.Synthetic() and followed by FamiliesCaution when
// its verdict claims fibre families. It is computed from the card's data
// and verdict, so a card written before either caution existed is labelled
// too.
func CautionsOf(c *Card) []string {
	out := CautionsFor(c != nil && c.Synthetic())
	if c != nil && c.Verdict != nil {
		switch c.Verdict.Families {
		case "1", "2", "1-or-mirror-pair":
			out = append(append([]string(nil), out...), FamiliesCaution)
		}
	}
	return out
}

// CautionsFor returns Cautions, led by SyntheticCaution when synthetic: for
// outputs whose data are not one card's (a cohort's summary and its
// population and mean-parameter cards).
func CautionsFor(synthetic bool) []string {
	if !synthetic {
		return Cautions
	}
	return append([]string{SyntheticCaution}, Cautions...)
}

// Conventions states, in the card itself, how to read its numbers.
type Conventions struct {
	Angle          string `json:"angle"`
	Kinematics     string `json:"kinematics"`
	Invariants     string `json:"invariants"`
	Energy         string `json:"energy"`
	FibreSwitch    string `json:"fibre_switch"`
	Dispersion     string `json:"dispersion"`
	InPlane        string `json:"in_plane_dispersion"`
	Stress         string `json:"stress"`
	Normalisations string `json:"normalisations"`
	GreenStrain    string `json:"green_strain"`
}

// StandardConventions are weft's conventions (see the README).
var StandardConventions = Conventions{
	Angle:       "angle_deg is the reference fibre direction a0 = (cos α, sin α, 0), α in degrees from axis 1 towards axis 2 (counter-clockwise seen from +3), modulo 180, reported in (-90, 90]",
	Kinematics:  "in-plane F = [[F11, F12], [F21, F22]], F33 = 1/(F11 F22 - F12 F21) (incompressible); C = F^T F, B = F F^T, a = F a0",
	Invariants:  "I1 = tr C, I2 = (I1^2 - tr C^2)/2, I4 = a0.C a0, I5 = a0.C^2 a0, K = I5 - I1 I4 + I2; principal stretches lambda1, lambda2 = square roots of the eigenvalues of the in-plane C (shear included), lambda3 = 1/(lambda1 lambda2)",
	Energy:      "Psi = sum_k weight_k * f_k(x_k); each term's f and argument x are given by its id and written out in 'energy'",
	FibreSwitch: "terms in E_f and I5-1 give no energy and no stress while the family's I4 <= 1; cof-* terms are zero while K <= 1",
	Dispersion:  "E_f = kappa (I1 - 3) + (1 - 3 kappa)(I4 - 1), 0 <= kappa <= 1/3 (Gasser, Ogden & Holzapfel 2006); kappa = 0 gives I4 - 1",
	InPlane: "a family with a concentration b spreads its fibres over the plane with the density rho(t) = exp(b cos 2(t - alpha)) / (pi I0(b)) over one period of t (b = 0: every in-plane direction alike); " +
		"each of its terms is w <f(E(t))> = w * integral of rho(t) f(I4(t) - 1) dt with a0(t) = (cos t, sin t, 0) and I4(t) = a0(t).C a0(t), each direction carrying load only while its own I4(t) > 1 " +
		"(angular integration; Lanir 1983, Sacks 2003); written <...>_name in 'energy'",
	Stress:         "plane stress sigma33 = 0; Cauchy sigma = -p 1 + 2 psi1 B + 2 psi2 (I1 B - B^2) + sum_families [2 psi4 a(x)a + 2 psi5 (a(x)Ba + Ba(x)a)] + sum_ps-terms w sum_i lambda_i g'(lambda_i) n_i(x)n_i (n_i the principal directions of B); nominal P = sigma F^-T",
	Normalisations: "i1-lin weight = C10 = mu/2; i2-lin weight = C01 (Mooney 1940, Rivlin 1948); *-exp: w (exp(b x) - 1)/b; *-expsq: w (exp(b x^2) - 1)/(2 b) (w = k1, b = k2 of Holzapfel, Gasser & Ogden 2000); *-gent: -w J ln(1 - x/J); fib-exp: w (exp(b x) - 1 - b x)/b^2; *-quad: w x^2; *-cube: w x^3; ps-pos, ps-neg: w (2/alpha^2)(lambda1^alpha + lambda2^alpha + lambda3^alpha - 3) = w sum_i g(lambda_i), g(l) = (2/alpha^2)(l^alpha - 1), w = mu, the initial shear modulus (Ogden 1972 with mu_p = 2 w/alpha); fib-recruit: lambda_f = sqrt(1 + E_f) is the family's fibre stretch (lambda_f1 for family f1), straightening stretches uniform on [la, la + D] (onset la, spread D), w = fibre modulus E, energy (w/D) integral from la to min(max(lambda_f, la), la + D) of (lambda_f - s)^2/(2 s) ds (Lanir 1983), zero while lambda_f <= la; D = 0: w <lambda_f - la>^2/(2 la); fung, fung-general: w (exp(Q) - 1)/2 (w = c of Tong & Fung 1976)",
	GreenStrain: "fung terms act on the Green strain E = (C - 1)/2 of the in-plane C in the tester's axes 1, 2 (E11 = (C11 - 1)/2, E22 = (C22 - 1)/2, E12 = E21 = C12/2), " +
		"Q = b1 E11^2 + b2 E22^2 + 2 b3 E11 E22 + b4 (E12^2 + E21^2) (Tong & Fung 1976); the energy does not depend on C33, so plane stress gives p = 0 and " +
		"sigma = F S F^T with S = dW/dE = w exp(Q) (b1 E11 + b3 E22, b2 E22 + b3 E11, b4 E12); nominal P = F S; its axes are fixed in the specimen, not a fibre family; " +
		"fung-general adds 2 b5 E11 (E12 + E21) + 2 b6 E22 (E12 + E21) to Q and (2 b5 E12, 2 b6 E12, b5 E11 + b6 E22) to S/(w exp(Q))",
}

// Family is a fibre family in a card.
type Family struct {
	// Name is referenced by terms' Family.
	Name string `json:"name"`
	// AngleDeg is the fibre angle in degrees from axis 1 towards axis 2.
	AngleDeg *float64 `json:"angle_deg"`
	// AngleSignKnown is false when the data could not tell +α from −α
	// (pure biaxial stretch without shear information).
	AngleSignKnown *bool `json:"angle_sign_known,omitempty"`
	// Dispersion is κ ∈ [0, 1/3]; absent means 0.
	Dispersion *float64 `json:"dispersion,omitempty"`
	// Concentration, when present, spreads the family's fibres over the
	// plane with a von Mises density in 2θ of this concentration b ≥ 0
	// (dimensionless); absent means an ideal (or κ-dispersed) family.
	Concentration *float64 `json:"concentration,omitempty"`
}

// Layout records how families were parameterised in a fit.
type Layout struct {
	// Kind is "single", "mirror" (θ ± β, shared weights and rates) or "free".
	Kind string `json:"kind"`
	// MeanDeg and HalfAngleDeg are θ and β of a mirror pair, in degrees.
	MeanDeg      *float64 `json:"mean_deg,omitempty"`
	HalfAngleDeg *float64 `json:"half_angle_deg,omitempty"`
	// PairAxis says how a mirror pair's axis θ was found: "axis-1" when it
	// was held at 0, so that the pair is symmetric about axis 1 by
	// construction; "free" when θ was learned. Empty for other layouts.
	PairAxis string `json:"pair_axis,omitempty"`
}

// Term is one weighted energy term in a card.
type Term struct {
	// ID is the catalogue shape id.
	ID string `json:"id"`
	// Weight is w ≥ 0 in WeightUnit (the card's stress unit).
	Weight     *float64 `json:"weight"`
	WeightUnit string   `json:"weight_unit,omitempty"`
	// Params are the shape's non-linear parameters by name (dimensionless).
	Params map[string]float64 `json:"params,omitempty"`
	// Family names the fibre family of a fibre, cofactor or I5 term.
	Family string `json:"family,omitempty"`
	// Formula is the term written out (informational; ignored on read).
	Formula string `json:"formula,omitempty"`
}

// Card is a model card: the model itself (format to terms), the sections a
// fit adds (Fit to Selection; nil when the card has none, as in a card
// written by hand), and Extra, every key this version does not know, so that
// reading and rewriting a card loses nothing.
type Card struct {
	Format      string       `json:"format"`
	Specimen    string       `json:"specimen,omitempty"`
	StressUnit  string       `json:"stress_unit"`
	Energy      string       `json:"energy,omitempty"`
	EnergyLaTeX string       `json:"energy_latex,omitempty"`
	Conventions *Conventions `json:"conventions,omitempty"`
	Cautions    []string     `json:"cautions,omitempty"`
	Families    []Family     `json:"families"`
	Layout      *Layout      `json:"layout,omitempty"`
	Terms       []Term       `json:"terms"`

	// Fit is how the model was fitted and how well the data determine it
	// (key "fit").
	Fit *FitSection `json:"-"`
	// Data is what data the card was fitted to (key "data").
	Data *DataSection `json:"-"`
	// DataRange is the span of those data (key "data_range").
	DataRange *DataRange `json:"-"`
	// Split is the matrix/fibre split of the stress (key "split").
	Split *SplitSection `json:"-"`
	// Verdict is discovery's answer on the number of fibre families and
	// Selection its evidence (keys "verdict", "selection"); nil for a
	// chosen-form fit.
	Verdict   *VerdictSection   `json:"-"`
	Selection *SelectionSection `json:"-"`
	// Alternatives lists the models the data cannot tell from this one
	// (key "alternatives"; AlternativeModels reads them); nil when the
	// fibre layout is determined or the card predates the section.
	Alternatives *AlternativesSection `json:"-"`
	// CalibrationCheck is discovery repeated with axis 1's stress scaled
	// (key "calibration_check"); nil unless asked for.
	CalibrationCheck *CalibrationCheck `json:"-"`
	// UntestedStrips are the strips (1:0, 0:1) the fitted data did not
	// test, with how far the near-equivalent models part along them (key
	// "untested_strips"); nil for a chosen form, when every strip was
	// tested or when no other model predicted the held-out protocols as
	// well, and in cards written before 2026-12-05.
	UntestedStrips []UntestedStrip `json:"-"`
	// Provenance is what made the card (key "provenance") and Setup how
	// the specimen was set up (key "setup"); nil in cards written before
	// them or by hand.
	Provenance *Provenance `json:"-"`
	Setup      *Setup      `json:"-"`

	// Extra holds keys this version does not know, written back unchanged.
	Extra map[string]json.RawMessage `json:"-"`

	// unread holds the sections above that are present but could not be
	// decoded, written back unchanged; SectionError says why.
	unread map[string]unreadSection
}

// unreadSection is a fit section kept as it was read.
type unreadSection struct {
	raw json.RawMessage
	err error
}

// section ties a fit section's key to its field.
type section struct {
	key string
	// get returns the field, and false when it is nil.
	get func(c *Card) (any, bool)
	// decode reads raw into the field.
	decode func(c *Card, raw []byte) error
}

// decodeInto returns a section decoder that reads into a new T and sets
// the field with set.
func decodeInto[T any](set func(c *Card, v *T)) func(c *Card, raw []byte) error {
	return func(c *Card, raw []byte) error {
		v := new(T)
		if err := json.Unmarshal(raw, v); err != nil {
			return err
		}
		set(c, v)
		return nil
	}
}

// sections lists the fit sections in key order.
var sections = []section{
	{KeyData, func(c *Card) (any, bool) { return c.Data, c.Data != nil }, decodeInto(func(c *Card, v *DataSection) { c.Data = v })},
	{KeyDataRange, func(c *Card) (any, bool) { return c.DataRange, c.DataRange != nil }, decodeInto(func(c *Card, v *DataRange) { c.DataRange = v })},
	{KeyFit, func(c *Card) (any, bool) { return c.Fit, c.Fit != nil }, decodeInto(func(c *Card, v *FitSection) { c.Fit = v })},
	{KeySelection, func(c *Card) (any, bool) { return c.Selection, c.Selection != nil }, decodeInto(func(c *Card, v *SelectionSection) { c.Selection = v })},
	{KeySplit, func(c *Card) (any, bool) { return c.Split, c.Split != nil }, decodeInto(func(c *Card, v *SplitSection) { c.Split = v })},
	{KeyVerdict, func(c *Card) (any, bool) { return c.Verdict, c.Verdict != nil }, decodeInto(func(c *Card, v *VerdictSection) { c.Verdict = v })},
	{KeyAlternatives, func(c *Card) (any, bool) { return c.Alternatives, c.Alternatives != nil }, decodeInto(func(c *Card, v *AlternativesSection) { c.Alternatives = v })},
	{KeyCalibrationCheck, func(c *Card) (any, bool) { return c.CalibrationCheck, c.CalibrationCheck != nil }, decodeInto(func(c *Card, v *CalibrationCheck) { c.CalibrationCheck = v })},
	{KeyUntestedStrips, func(c *Card) (any, bool) { return c.UntestedStrips, len(c.UntestedStrips) > 0 }, decodeInto(func(c *Card, v *[]UntestedStrip) { c.UntestedStrips = *v })},
	{KeyProvenance, func(c *Card) (any, bool) { return c.Provenance, c.Provenance != nil }, decodeInto(func(c *Card, v *Provenance) { c.Provenance = v })},
	{KeySetup, func(c *Card) (any, bool) { return c.Setup, c.Setup != nil }, decodeInto(func(c *Card, v *Setup) { c.Setup = v })},
}

// SectionError returns why the fit section under key (KeyFit, KeyData, ...)
// is present in the card read but could not be decoded, or nil. Such a
// section is left nil and written back unchanged, so a card whose evidence
// a newer weft shaped differently still serves every command that does not
// need that section.
func (c *Card) SectionError(key string) error {
	return c.unread[key].err
}

// StressUnits are the stress units a card may use.
var StressUnits = []string{"Pa", "kPa", "MPa"}

// Error is a problem in a card, located by a JSON path such as
// `$.terms[2].weight`.
type Error struct {
	File string
	Path string
	Msg  string
	// Err is a category for errors.Is (ErrCardSize, ErrTermCount,
	// ErrFamilyCount), or nil.
	Err error
}

func (e *Error) Error() string {
	if e.File == "" {
		return fmt.Sprintf("%s: %s", e.Path, e.Msg)
	}
	return fmt.Sprintf("%s: %s: %s", e.File, e.Path, e.Msg)
}

// Unwrap returns the error's category.
func (e *Error) Unwrap() error { return e.Err }

var knownKeys = map[string]bool{}

func init() {
	for _, k := range []string{"format", "specimen", "stress_unit", "energy", "energy_latex", "conventions", "cautions", "families", "layout", "terms"} {
		knownKeys[k] = true
	}
}

// UnmarshalJSON decodes a card and keeps unknown keys in Extra.
func (c *Card) UnmarshalJSON(b []byte) error {
	type plain Card
	var all map[string]json.RawMessage
	if err := json.Unmarshal(b, &all); err != nil {
		return err
	}
	// Lists are decoded element by element so that a type error names the
	// element's index.
	var lists struct {
		Families []json.RawMessage `json:"families"`
		Terms    []json.RawMessage `json:"terms"`
	}
	if err := json.Unmarshal(b, &lists); err != nil {
		return err
	}
	for i, raw := range lists.Families {
		var f Family
		if err := json.Unmarshal(raw, &f); err != nil {
			return prefixTypeError(err, fmt.Sprintf("families.%d", i))
		}
	}
	for i, raw := range lists.Terms {
		var t Term
		if err := json.Unmarshal(raw, &t); err != nil {
			return prefixTypeError(err, fmt.Sprintf("terms.%d", i))
		}
	}
	var p plain
	if err := json.Unmarshal(b, &p); err != nil {
		return err
	}
	*c = Card(p)
	for _, sec := range sections {
		raw, ok := all[sec.key]
		if !ok {
			continue
		}
		delete(all, sec.key)
		err := sec.decode(c, raw)
		if err == nil && !bytes.Equal(bytes.TrimSpace(raw), []byte("null")) {
			continue
		}
		if c.unread == nil {
			c.unread = map[string]unreadSection{}
		}
		c.unread[sec.key] = unreadSection{raw: raw, err: err}
	}
	for k, v := range all {
		if !knownKeys[k] {
			if c.Extra == nil {
				c.Extra = map[string]json.RawMessage{}
			}
			c.Extra[k] = v
		}
	}
	return nil
}

// prefixTypeError puts a list element's position in front of a type error's
// field path.
func prefixTypeError(err error, prefix string) error {
	var te *json.UnmarshalTypeError
	if errors.As(err, &te) {
		e := *te
		e.Field = prefix + "." + te.Field
		return &e
	}
	return err
}

// MarshalJSON writes the model's keys in a fixed order, then the fit
// sections and Extra's keys together, sorted, so that the same card gives
// the same bytes.
func (c Card) MarshalJSON() ([]byte, error) {
	type plain Card
	b, err := json.Marshal(plain(c))
	if err != nil {
		return nil, err
	}
	rest := map[string]json.RawMessage{}
	for k, v := range c.Extra {
		if !knownKeys[k] {
			rest[k] = v
		}
	}
	for k, u := range c.unread {
		rest[k] = u.raw
	}
	for _, sec := range sections {
		v, ok := sec.get(&c)
		if !ok {
			continue
		}
		sb, err := json.Marshal(v)
		if err != nil {
			return nil, err
		}
		rest[sec.key] = sb
	}
	if len(rest) == 0 {
		return b, nil
	}
	keys := make([]string, 0, len(rest))
	for k := range rest {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	var buf bytes.Buffer
	buf.Write(b[:len(b)-1])
	for _, k := range keys {
		kb, _ := json.Marshal(k)
		buf.WriteByte(',')
		buf.Write(kb)
		buf.WriteByte(':')
		buf.Write(rest[k])
	}
	buf.WriteByte('}')
	return buf.Bytes(), nil
}

// Parse decodes and validates a card within DefaultLimits (see
// ParseLimits). file names the source in errors.
func Parse(r io.Reader, file string) (*Card, *aniso.Model, error) {
	return ParseLimits(r, file, DefaultLimits)
}

// decodeError turns an encoding/json error into a located card error.
func decodeError(file string, b []byte, err error) error {
	var te *json.UnmarshalTypeError
	var se *json.SyntaxError
	switch {
	case errors.As(err, &te):
		return &Error{File: file, Path: jsonPath(te.Field), Msg: fmt.Sprintf("is a JSON %s, expected %s", te.Value, goTypeName(te.Type.String()))}
	case errors.As(err, &se):
		line, col := lineCol(b, se.Offset)
		return fmt.Errorf("%s:%d:%d: not valid JSON: %v", file, line, col, se)
	}
	return fmt.Errorf("%s: %v", file, err)
}

func goTypeName(t string) string {
	switch {
	case strings.Contains(t, "float"):
		return "a number"
	case strings.Contains(t, "bool"):
		return "true or false"
	case strings.Contains(t, "string"):
		return "a string"
	case strings.HasPrefix(t, "[]"):
		return "a list"
	}
	return "an object"
}

// jsonPath turns encoding/json's "terms.2.weight" into "$.terms[2].weight".
func jsonPath(field string) string {
	if field == "" {
		return "$"
	}
	var sb strings.Builder
	sb.WriteString("$")
	for _, part := range strings.Split(field, ".") {
		if part != "" && strings.Trim(part, "0123456789") == "" {
			sb.WriteString("[" + part + "]")
		} else {
			sb.WriteString("." + part)
		}
	}
	return sb.String()
}

func lineCol(b []byte, off int64) (int, int) {
	if off > int64(len(b)) {
		off = int64(len(b))
	}
	line, col := 1, 1
	for _, c := range b[:off] {
		if c == '\n' {
			line, col = line+1, 1
		} else {
			col++
		}
	}
	return line, col
}

func errAt(path, format string, args ...any) error {
	return &Error{Path: path, Msg: fmt.Sprintf(format, args...)}
}

// Model validates the card and builds the model it describes.
func (c *Card) Model() (*aniso.Model, error) {
	if c.Format != Format {
		if c.Format == "" {
			return nil, errAt("$.format", "missing; write \"format\": %q", Format)
		}
		return nil, errAt("$.format", "%s is not a format this weft reads; expected %q", quote(c.Format), Format)
	}
	if !validUnit(c.StressUnit) {
		return nil, errAt("$.stress_unit", "%s is not a stress unit; use one of %s", quote(c.StressUnit), strings.Join(StressUnits, ", "))
	}
	m := &aniso.Model{}
	index, err := c.modelFamilies(m)
	if err != nil {
		return nil, err
	}
	if err := c.modelTerms(m, index); err != nil {
		return nil, err
	}
	if err := m.Validate(); err != nil {
		return nil, errAt("$", "%v", err)
	}
	return m, nil
}

// modelFamilies reads the card's families into m and returns each
// family's index by name; a step of Model.
func (c *Card) modelFamilies(m *aniso.Model) (map[string]int, error) {
	index := map[string]int{}
	for i, f := range c.Families {
		p := fmt.Sprintf("$.families[%d]", i)
		if f.Name == "" {
			return nil, errAt(p+".name", "missing; give each family a name that terms refer to, e.g. \"f1\"")
		}
		if _, dup := index[f.Name]; dup {
			return nil, errAt(p+".name", "%s is used twice; family names must be unique", quote(f.Name))
		}
		if f.AngleDeg == nil {
			return nil, errAt(p+".angle_deg", "missing; give the fibre angle in degrees from axis 1 towards axis 2")
		}
		if math.IsNaN(*f.AngleDeg) || math.IsInf(*f.AngleDeg, 0) {
			return nil, errAt(p+".angle_deg", "is not a finite number")
		}
		if math.Abs(*f.AngleDeg) > MaxAngleDeg {
			return nil, errAt(p+".angle_deg", "%g is outside [-%d, %d]; give the angle in degrees from axis 1 towards axis 2 (it is read modulo 180)", *f.AngleDeg, MaxAngleDeg, MaxAngleDeg)
		}
		kappa := 0.0
		if f.Dispersion != nil {
			kappa = *f.Dispersion
			if !(kappa >= 0 && kappa <= aniso.MaxDispersion) {
				return nil, errAt(p+".dispersion", "%g is outside [0, 1/3]; 0 is aligned fibres, 1/3 fully dispersed", kappa)
			}
		}
		fam := aniso.Family{Name: f.Name, Angle: aniso.Rad(*f.AngleDeg), Dispersion: kappa}
		if f.Concentration != nil {
			b := *f.Concentration
			if !(b >= 0 && b <= aniso.MaxConcentration) {
				return nil, errAt(p+".concentration", "%g is outside [0, %g]; 0 spreads fibres over every in-plane direction, larger values concentrate them", b, float64(aniso.MaxConcentration))
			}
			if kappa != 0 {
				return nil, errAt(p+".concentration", "a family spreads either in the plane (concentration) or in three dimensions (dispersion κ), not both")
			}
			fam.Planar, fam.Concentration = true, b
		}
		index[f.Name] = i
		m.Families = append(m.Families, fam)
	}
	return index, nil
}

// modelTerms reads the card's terms into m, their families by index; a
// step of Model.
func (c *Card) modelTerms(m *aniso.Model, index map[string]int) error {
	if len(c.Terms) == 0 {
		return errAt("$.terms", "no terms; a model needs at least one energy term of the catalogue")
	}
	for i, t := range c.Terms {
		p := fmt.Sprintf("$.terms[%d]", i)
		sh := terms.Lookup(t.ID)
		if sh == nil {
			return errAt(p+".id", "%s is not a catalogue term; the catalogue holds %s", quote(t.ID), strings.Join(terms.IDs(), ", "))
		}
		if t.Weight == nil {
			return errAt(p+".weight", "missing; give the term's weight in %s (≥ 0)", c.StressUnit)
		}
		w := *t.Weight
		if !(w >= 0) || math.IsInf(w, 0) {
			return errAt(p+".weight", "%g must be a finite number ≥ 0 (negative weights break convexity)", w)
		}
		if t.WeightUnit != "" && t.WeightUnit != c.StressUnit {
			return errAt(p+".weight_unit", "%s differs from stress_unit %q; convert the weight", quote(t.WeightUnit), c.StressUnit)
		}
		if err := upgradeParamNames(sh, &c.Terms[i], p); err != nil {
			return err
		}
		t = c.Terms[i]
		params := make([]float64, len(sh.Params))
		// The card's parameter names in sorted order: a JSON object
		// decodes into a map, whose randomised order would let a card
		// with two wrong keys be refused for either, differently from
		// run to run.
		names := make([]string, 0, len(t.Params))
		for name := range t.Params {
			names = append(names, name)
		}
		sort.Strings(names)
		for j, q := range sh.Params {
			v, ok := t.Params[q.Name]
			if !ok {
				for _, name := range names {
					if strings.EqualFold(name, q.Name) {
						return errAt(p+".params."+clip(name), "write the key as %q: keys are case-sensitive", q.Name)
					}
				}
				return errAt(p+".params."+q.Name, "missing; %s takes %s in [%g, %g] (default %g)", sh.ID, q.Name, q.Min, q.Max, q.Default)
			}
			if v < q.Min || v > q.Max {
				return errAt(p+".params."+q.Name, "%g is outside [%g, %g]", v, q.Min, q.Max)
			}
			params[j] = v
		}
		for _, name := range names {
			if !hasParam(sh, name) {
				return errAt(p+".params."+clip(name), "%s has no parameter %s", sh.ID, quote(name))
			}
		}
		fam := -1
		if sh.Arg.NeedsFamily() {
			f, ok := index[t.Family]
			if !ok {
				if t.Family == "" {
					return errAt(p+".family", "missing; %s is a fibre-family term, name one of the families", sh.ID)
				}
				return errAt(p+".family", "%s is not a family of this card", quote(t.Family))
			}
			fam = f
		} else if t.Family != "" {
			return errAt(p+".family", "%s is isotropic and takes no family", sh.ID)
		}
		m.Terms = append(m.Terms, aniso.Term{Shape: sh, Family: fam, Weight: w, Params: params})
	}
	return nil
}

// upgradeParamNames renames, in t itself, every parameter key an older card
// used (terms.Param.FormerName, e.g. "rate" for today's "stiffening") to
// today's name, so that old cards read as before and a card written again
// uses today's names. Both names at once is an error at path p.
func upgradeParamNames(sh *terms.Shape, t *Term, p string) error {
	for _, q := range sh.Params {
		if q.FormerName == "" {
			continue
		}
		v, old := t.Params[q.FormerName]
		if !old {
			continue
		}
		if _, now := t.Params[q.Name]; now {
			return errAt(p+".params."+q.FormerName, "give %s only: %q is its former name", q.Name, q.FormerName)
		}
		params := make(map[string]float64, len(t.Params))
		for k, x := range t.Params {
			params[k] = x
		}
		delete(params, q.FormerName)
		params[q.Name] = v
		t.Params = params
	}
	return nil
}

func hasParam(s *terms.Shape, name string) bool {
	for _, q := range s.Params {
		if q.Name == name {
			return true
		}
	}
	return false
}

func validUnit(u string) bool {
	for _, s := range StressUnits {
		if u == s {
			return true
		}
	}
	return false
}

// FromModel writes a model as a card with conventions, cautions and the
// energy written out. signKnown gives angle_sign_known per family (nil: not
// stated).
func FromModel(m *aniso.Model, stressUnit string, signKnown []bool) *Card {
	c := &Card{Format: Format, StressUnit: stressUnit, Conventions: &StandardConventions, Cautions: Cautions, Families: []Family{}}
	for i, f := range m.Families {
		a := aniso.WrapDeg(aniso.Deg(f.Angle))
		fc := Family{Name: f.Name, AngleDeg: &a}
		if f.Planar {
			b := f.Concentration
			fc.Concentration = &b
		} else {
			k := f.Dispersion
			fc.Dispersion = &k
		}
		if fc.Name == "" {
			fc.Name = fmt.Sprintf("f%d", i+1)
		}
		if signKnown != nil {
			b := signKnown[i]
			fc.AngleSignKnown = &b
		}
		c.Families = append(c.Families, fc)
	}
	for _, t := range m.Terms {
		w := t.Weight
		tc := Term{ID: t.Shape.ID, Weight: &w, WeightUnit: stressUnit, Formula: t.Shape.Formula}
		if len(t.Params) > 0 {
			tc.Params = map[string]float64{}
			for j, q := range t.Shape.Params {
				tc.Params[q.Name] = t.Params[j]
			}
		}
		if t.Family >= 0 {
			tc.Family = c.Families[t.Family].Name
		}
		c.Terms = append(c.Terms, tc)
	}
	c.Energy, c.EnergyLaTeX = EnergyText(m, c)
	return c
}

// LaTeXNumber writes x with six significant digits for LaTeX math mode:
// a number Go would write in e-notation (7.80914e-08) as a power of ten
// (7.80914 \times 10^{-8}), which a typeset energy would otherwise show
// as plain text (audit 2026-12-05, a weight of 7.8e-8 kPa). The card's
// LaTeX energy and the LaTeX export both use it.
func LaTeXNumber(x float64) string {
	v := fmt.Sprintf("%.6g", x)
	i := strings.IndexByte(v, 'e')
	if i < 0 {
		return v
	}
	exp, err := strconv.Atoi(v[i+1:])
	if err != nil {
		return v
	}
	return fmt.Sprintf(`%s \times 10^{%d}`, v[:i], exp)
}

// EnergyText writes the energy with its numbers, in plain text and LaTeX.
func EnergyText(m *aniso.Model, c *Card) (string, string) {
	var plain, latex []string
	for _, t := range m.Terms {
		p, l := t.Shape.Written(t.Params)
		p = strings.ReplaceAll(p, "w*", fmt.Sprintf("%.6g*", t.Weight))
		l = strings.ReplaceAll(l, "w", LaTeXNumber(t.Weight))
		for j, q := range t.Shape.Params {
			v, lv := fmt.Sprintf("%.6g", t.Params[j]), LaTeXNumber(t.Params[j])
			if t.Params[j] < 0 {
				v, lv = "("+v+")", "("+lv+")" // a negative exponent stays one factor: 2/(-2)^2
			}
			p = strings.ReplaceAll(p, q.Symbol, v)
			l = latexSubst(l, q.LaTeXSymbol(), lv)
		}
		if t.Family >= 0 && m.Families[t.Family].Planar {
			// A planar family averages the term over its directions
			// (the weight is a constant inside the average).
			name := c.Families[t.Family].Name
			p = "<" + strings.ReplaceAll(p, "E_f", "E") + ">_" + name
			l = `\left\langle ` + strings.ReplaceAll(l, "E_f", "E") + `\right\rangle_{` + name + "}"
		} else if t.Family >= 0 {
			name := c.Families[t.Family].Name
			p = strings.ReplaceAll(p, "E_f", "E_"+name)
			p = strings.ReplaceAll(p, "(K-1)", "(K_"+name+"-1)")
			p = strings.ReplaceAll(p, "(I5-1)", "(I5_"+name+"-1)")
			p = strings.ReplaceAll(p, "λ_f", "λ_"+name)
			l = strings.ReplaceAll(l, "E_f", "E_{"+name+"}")
			// cof-quad writes its LaTeX as \langle K-1\rangle, without
			// the parentheses of its plain text: until 2026-12-05 the
			// LaTeX lost the family (K_f1 in plain text, K in LaTeX).
			l = strings.ReplaceAll(l, "K-1", "K_{"+name+"}-1")
			l = strings.ReplaceAll(l, "(I_5-1)", "(I_{5,"+name+"}-1)")
			l = strings.ReplaceAll(l, `\lambda_f`, `\lambda_{`+name+"}")
		}
		plain = append(plain, p)
		latex = append(latex, l)
	}
	return "Psi = " + joinTerms(plain), `\Psi = ` + joinTerms(latex)
}

// joinTerms writes a sum, turning "+ -x" into "- x".
func joinTerms(ts []string) string {
	var sb strings.Builder
	for i, t := range ts {
		neg := strings.HasPrefix(t, "-")
		switch {
		case i == 0:
			sb.WriteString(t)
			continue
		case neg:
			sb.WriteString(" - " + t[1:])
		default:
			sb.WriteString(" + " + t)
		}
	}
	return sb.String()
}

// latexSubst replaces sym by val in a LaTeX formula, writing a \cdot where
// a digit precedes it, so that a template's 2b does not become 20.8393.
func latexSubst(l, sym, val string) string {
	var b strings.Builder
	for {
		i := strings.Index(l, sym)
		if i < 0 {
			b.WriteString(l)
			return b.String()
		}
		b.WriteString(l[:i])
		if i > 0 && l[i-1] >= '0' && l[i-1] <= '9' {
			b.WriteString(`\cdot `)
		}
		b.WriteString(val)
		l = l[i+len(sym):]
	}
}

// Marshal returns the card as indented JSON with a trailing newline.
func (c *Card) Marshal() ([]byte, error) {
	b, err := json.Marshal(c)
	if err != nil {
		return nil, err
	}
	var out bytes.Buffer
	if err := json.Indent(&out, b, "", "  "); err != nil {
		return nil, err
	}
	out.WriteByte('\n')
	return out.Bytes(), nil
}

// EditedConventions lists, as sentences, the conventions of c that say
// something else than weft's own (StandardConventions), among those whose
// wording has not changed since the first card format: the fibre
// direction, kinematics, energy, fibre switch and dispersion. weft reads
// every card with its own conventions, so a card whose conventions were
// edited to mean another one (a fibre switch that lets fibres act in
// compression, say) is evaluated as weft's, not as edited; the other
// conventions' wording grew over versions and is not compared. None for a
// card without conventions.
func (c *Card) EditedConventions() []string {
	if c == nil || c.Conventions == nil {
		return nil
	}
	std := StandardConventions
	var out []string
	for _, f := range []struct {
		key, got, want string
	}{
		{"angle", c.Conventions.Angle, std.Angle},
		{"kinematics", c.Conventions.Kinematics, std.Kinematics},
		{"energy", c.Conventions.Energy, std.Energy},
		{"fibre_switch", c.Conventions.FibreSwitch, std.FibreSwitch},
		{"dispersion", c.Conventions.Dispersion, std.Dispersion},
	} {
		if f.got != "" && f.got != f.want {
			out = append(out, fmt.Sprintf("the card's conventions.%s says %q, not weft's %q: weft reads every card with its own conventions, so this card is evaluated as weft's, not as its conventions say", f.key, f.got, f.want))
		}
	}
	return out
}
