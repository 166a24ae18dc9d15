package card

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/weft-tools/weft/aniso"
	"github.com/weft-tools/weft/terms"
)

var update = flag.Bool("update", false, "rewrite model.schema.json from the catalogue")

// kv is an ordered JSON object, so that the schema file reads in a
// sensible order and is byte-for-byte reproducible.
type kv struct {
	k string
	v any
}
type obj []kv

func (o obj) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteByte('{')
	for i, e := range o {
		if i > 0 {
			b.WriteByte(',')
		}
		kb, _ := marshalPlain(e.k)
		b.Write(kb)
		b.WriteByte(':')
		vb, err := marshalPlain(e.v)
		if err != nil {
			return nil, err
		}
		b.Write(vb)
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// marshalPlain is json.Marshal without escaping &, < and >.
func marshalPlain(v any) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return bytes.TrimSuffix(b.Bytes(), []byte("\n")), nil
}

// buildSchema writes the model-card schema from the catalogue.
func buildSchema() []byte {
	units := StressUnits
	family := familySchema()
	term := termSchema(termRules())
	layout := layoutSchema()
	dataRange := dataRangeSchema()
	alternatives := alternativesSchema(family, term, schemaStr)
	verdict := verdictSchema()
	calibration := calibrationSchema()
	strips := untestedStripsSchema()
	fit := fitSchema()
	conv := obj{{"type", "object"}, {"description", "how to read the card's numbers, written by weft"}, {"additionalProperties", obj{{"type", "string"}}}}
	s := obj{
		{"$schema", "https://json-schema.org/draft/2020-12/schema"},
		{"$id", SchemaID},
		{"title", "weft model card (" + Format + ")"},
		{"description", "A strain energy Psi = sum_k weight_k f_k(x_k) of a fibre-reinforced incompressible membrane in plane stress, " +
			"its fibre families and, in fitted cards, the evidence. Stresses and weights are in stress_unit; angles in degrees " +
			"(keys ending in _deg); every other number is dimensionless. Keys not described here (the other sections a fit writes: " +
			"data, setup, split, selection, provenance) are allowed; readers ignore keys they do not know. Parameters are research-grade " +
			"and specimen-specific, " +
			"valid only within the tested range, and not for clinical decisions."},
		{"type", "object"},
		{"required", []string{"format", "stress_unit", "terms"}},
		{"properties", obj{
			{"format", obj{{"const", Format}, {"description", "card format and its version"}}},
			{"specimen", schemaStr("free text naming the specimen")},
			{"stress_unit", obj{{"enum", units}, {"description", "unit of every stress and every weight in the card"}}},
			{"energy", schemaStr("the energy with its numbers, plain text")},
			{"energy_latex", schemaStr("the energy with its numbers, LaTeX")},
			{"conventions", conv},
			{"cautions", obj{{"type", "array"}, {"items", obj{{"type", "string"}}}}},
			{"families", obj{{"type", []string{"array", "null"}}, {"items", family}, {"description", "fibre families; null or absent means none"}}},
			{"layout", layout},
			{"terms", obj{{"type", "array"}, {"minItems", 1}, {"items", term}}},
			{"data_range", dataRange},
			{"alternatives", alternatives},
			{"verdict", verdict},
			{"calibration_check", calibration},
			{"untested_strips", strips},
			{"fit", fit},
		}},
		{"additionalProperties", true},
	}
	b, err := marshalPlain(s)
	if err != nil {
		panic(err)
	}
	var out bytes.Buffer
	json.Indent(&out, b, "", "  ")
	out.WriteByte('\n')
	return out.Bytes()
}

// schemaNum, schemaStr and schemaPair are the schema of a described
// number, string, and [min, max] pair (min, when not nil, an exclusive
// lower bound of both).
func schemaNum(desc string) obj { return obj{{"type", "number"}, {"description", desc}} }

func schemaStr(desc string) obj { return obj{{"type", "string"}, {"description", desc}} }

func schemaPair(desc string, min any) obj {
	items := obj{{"type", "number"}}
	if min != nil {
		items = append(items, kv{"exclusiveMinimum", min})
	}
	return obj{{"type", "array"}, {"description", desc}, {"items", items}, {"minItems", 2}, {"maxItems", 2}}
}

// termRules returns the catalogue's shape ids and, per shape, the rule
// that its parameters and family must follow.
func termRules() (ids []string, perTerm []any) {
	for _, sh := range terms.Catalogue() {
		ids = append(ids, sh.ID)
		var then obj
		props := obj{}
		var req []string
		for _, p := range sh.Params {
			props = append(props, kv{p.Name, obj{{"type", "number"}, {"minimum", p.Min}, {"maximum", p.Max},
				{"description", p.Doc + "; default " + trimFloat(p.Default)}}})
			req = append(req, p.Name)
		}
		if len(req) > 0 {
			then = append(then, kv{"required", []string{"params"}})
			then = append(then, kv{"properties", obj{
				{"params", obj{{"properties", props}, {"required", req}, {"additionalProperties", false}}},
				familyRule(sh),
			}})
		} else {
			then = append(then, kv{"properties", obj{
				{"params", obj{{"maxProperties", 0}}},
				familyRule(sh),
			}})
		}
		if sh.Arg.NeedsFamily() {
			then = append(then, kv{"required", append(requiredOf(then), "family")})
			then = dedupRequired(then)
		}
		perTerm = append(perTerm, obj{
			{"if", obj{{"properties", obj{{"id", obj{{"const", sh.ID}}}}}, {"required", []string{"id"}}}},
			{"then", then},
		})
	}
	return ids, perTerm
}

// familySchema is the schema of a fibre family.
func familySchema() obj {
	return obj{
		{"type", "object"},
		{"description", "a fibre family: reference direction a0 = (cos α, sin α, 0)"},
		{"required", []string{"name", "angle_deg"}},
		{"properties", obj{
			{"name", obj{{"type", "string"}, {"minLength", 1}, {"description", "unique name that terms refer to, e.g. \"f1\""}}},
			{"angle_deg", obj{{"type", "number"}, {"minimum", -MaxAngleDeg}, {"maximum", MaxAngleDeg},
				{"description", "fibre angle α in degrees from axis 1 towards axis 2 (counter-clockwise seen from +3), modulo 180, within ±360"}}},
			{"angle_sign_known", obj{{"type", "boolean"}, {"description", "false when the data could not tell +α from −α"}}},
			{"dispersion", obj{{"type", "number"}, {"minimum", 0}, {"maximum", 0.33333333333333334},
				{"description", "dispersion κ ∈ [0, 1/3] (Gasser, Ogden & Holzapfel 2006), dimensionless; absent means 0"}}},
			{"concentration", obj{{"type", "number"}, {"minimum", 0}, {"maximum", aniso.MaxConcentration},
				{"description", "in-plane concentration b ≥ 0 of a von Mises density in 2θ about angle_deg (angular integration, each direction switched by its own I4 > 1), dimensionless; absent means an ideal family; excludes a non-zero dispersion"}}},
		}},
	}
}

// termSchema is the schema of an energy term, ids the catalogue's shape ids
// and perTerm the rules of each shape (termRules).
func termSchema(ids []string, perTerm []any) obj {
	return obj{
		{"type", "object"},
		{"description", "one energy term weight × f(x); f and its argument x are given by id (see 'weft terms')"},
		{"required", []string{"id", "weight"}},
		{"properties", obj{
			{"id", obj{{"enum", ids}, {"description", "catalogue shape id"}}},
			{"weight", obj{{"type", "number"}, {"minimum", 0}, {"description", "weight w ≥ 0 in the card's stress_unit (also stated by weight_unit)"}}},
			{"weight_unit", obj{{"enum", StressUnits}, {"description", "unit of weight; must equal stress_unit"}}},
			{"params", obj{{"type", "object"}, {"additionalProperties", obj{{"type", "number"}}},
				{"description", "the shape's non-linear parameters by name, dimensionless; every parameter of the shape is required"}}},
			{"family", schemaStr("name of the fibre family of a fibre (fib-*), cofactor (cof-*) or I5 (i5-*) term; empty or absent for isotropic terms")},
			{"formula", schemaStr("the term written out; informational, ignored on read")},
		}},
		{"allOf", perTerm},
	}
}

// layoutSchema is the schema of how the families were parameterised.
func layoutSchema() obj {
	return obj{
		{"type", "object"},
		{"description", "how the families were parameterised in a fit"},
		{"required", []string{"kind"}},
		{"properties", obj{
			{"kind", obj{{"enum", []string{"single", "mirror", "free"}}}},
			{"mean_deg", schemaNum("mean direction θ of a mirror pair, degrees from axis 1 towards axis 2")},
			{"half_angle_deg", schemaNum("half angle β of a mirror pair θ ± β, degrees")},
			{"pair_axis", obj{{"enum", []string{"axis-1", "free"}},
				{"description", "axis-1: the pair's axis θ was held at 0 (symmetric about axis 1, the published form); free: θ was learned"}}},
		}},
	}
}

// dataRangeSchema is the schema of the span of the fitted data.
func dataRangeSchema() obj {
	return obj{
		{"type", "object"},
		{"description", "span of the data a fitted model was fitted to; queries outside it extrapolate"},
		{"required", []string{"stretch_1", "stretch_2", "shear"}},
		{"properties", obj{
			{"stretch_1", schemaPair("[min, max] of F11 over the fitted points, dimensionless", 0)},
			{"stretch_2", schemaPair("[min, max] of F22 over the fitted points, dimensionless", 0)},
			{"shear", schemaPair("[min, max] of F12 and F21 together, dimensionless (zero for pure biaxial data)", nil)},
			{"shear_12", schemaPair("[min, max] of F12, dimensionless, including 0 when the fitted data hold an unsheared point; when absent, shear is used", nil)},
			{"shear_21", schemaPair("[min, max] of F21, dimensionless, including 0 when the fitted data hold an unsheared point; when absent, shear is used", nil)},
			{"fibre_stretch", obj{{"type", "array"}, {"items", schemaPair("[min, max] of the fibre stretch √I4, dimensionless", 0)},
				{"description", "per family, in the order of families"}}},
			{"stress_kind", obj{{"enum", []string{"cauchy", "nominal"}}, {"description", "the stress measure the fit used"}}},
		}},
	}
}

// verdictSchema is the schema of the verdict on the number of families.
func verdictSchema() obj {
	return obj{
		{"type", "object"},
		{"description", "the answer of model discovery on the number of fibre families, with its evidence"},
		{"required", []string{"families", "reason"}},
		{"properties", obj{
			{"families", obj{{"enum", []string{"0", "1", "2", "1-or-mirror-pair", "undecided"}},
				{"description", "1-or-mirror-pair: without shear information one family and a mirror pair give the same normal stresses; undecided: the evidence does not settle the number of families"}}},
			{"form", obj{{"type", "string"}, {"description", "the model form the verdict rests on: 0, 1, 2-mirror or 2-free, with +dispersed (spread in the plane) or +kappa"}}},
			{"reason", obj{{"type", "string"}, {"description", "the evidence in words and numbers"}}},
			{"delta_bic", obj{{"type", "object"}, {"description", "per form (0, 1, 1+dispersed, 2-mirror, 2-free, ...): its best BIC minus the best over forms, dimensionless"}}},
			{"heldout_error", obj{{"type", "object"}, {"description", "per form: its best leave-one-protocol-out held-out normalised RMSE, dimensionless"}}},
			{"comparisons", obj{{"type", "array"}, {"description", "the walk from the simplest form to the richest: held-out gain, its standard error, relative gain and ΔBIC of each step, and whether it was decisive; a form with more families that beat the walk's form is also compared with the form with the walk's number of families that predicts best, when that is another"}}},
			{"ruled_out", obj{{"type", "array"}, {"items", obj{{"type", "string"}}}, {"description", "richer explanations that fitted better without beating the verdict's form by more than the noise, and look-alikes; and forms not considered, with why"}}},
			{"decider", obj{{"type", "string"}, {"description", "the extra measurement that would settle an undecided verdict"}}},
			{"in_sample_best", obj{{"type", "string"}, {"description", fmt.Sprintf("the selection candidate that fits better in sample (BIC at least %g lower) than every model of the kind the held-out errors favour, when that is why the verdict is undecided: a model with two fibre directions against every one-direction model, a model with fibres against every isotropic model, or a Fung-type preset (preset:fung, preset:fung-general), which has no fibres, against a verdict with fibre families when it also predicts the held-out protocols no worse", aniso.DisagreeDeltaBIC)}}},
			{"ties_with", obj{{"type", "string"}, {"description", "the selection candidate with two fibre families at least 60° apart, placed elsewhere (every family at least 20° from the one-family answer's direction) or adding one (one family within 20° of that direction, the other at least 45° from it and from that family), that fits and predicts as well as the one-family answer (held-out error within one standard error, BIC not 6 or more higher), when that tie is why the verdict is undecided"}}},
			{"look_alike", obj{{"type", "string"}, {"description", "the selection candidate of the look-alike the reason names: for an isotropic verdict the lowest-BIC model with fibres placed symmetrically about the 45° line (and about the tester's axes when the data carry shear information), which stiffen the two axes alike as an isotropic material does; for a verdict left undecided by that look-alike the lowest-BIC isotropic model"}}},
		}},
	}
}

// calibrationSchema is the schema of the calibration check (weft fit
// --calibration-check).
func calibrationSchema() obj {
	outcome := obj{
		{"type", "object"},
		{"required", []string{"axis_1_scale", "verdict"}},
		{"properties", obj{
			{"axis_1_scale", obj{{"type", "number"}, {"exclusiveMinimum", 0}, {"description", "the factor axis 1's stress was scaled by, dimensionless"}}},
			{"verdict", obj{{"type", "string"}, {"description", "discovery's verdict on the number of fibre families with the stress so scaled"}}},
			{"chosen", obj{{"type", "string"}, {"description", "the chosen candidate's name"}}},
			{"angles_deg", obj{{"type", "array"}, {"items", obj{{"type", "number"}}}, {"description", "the chosen model's family angles, degrees"}}},
		}},
	}
	return obj{
		{"type", "object"},
		{"description", "discovery repeated with axis 1's stress scaled by 1 + fraction and 1 - fraction: the data a per-axis error of the load-to-stress conversion (a load cell's calibration, an effective loaded width) would have given; written only when asked for"},
		{"required", []string{"fraction", "verdict", "holds", "outcomes"}},
		{"properties", obj{
			{"fraction", obj{{"type", "number"}, {"exclusiveMinimum", 0}, {"exclusiveMaximum", 0.5}, {"description", "the relative scale tried, dimensionless (0.05 for ±5 %)"}}},
			{"verdict", obj{{"type", "string"}, {"description", "the card's own verdict on the number of fibre families"}}},
			{"holds", obj{{"type", "boolean"}, {"description", "true when every outcome's verdict is the card's; the fibre directions may still move with the scale, which the summary says when one moves by more than 10 degrees"}}},
			{"outcomes", obj{{"type", "array"}, {"items", outcome}}},
			{"summary", obj{{"type", "string"}, {"description", "the check in words"}}},
		}},
	}
}

// untestedStripsSchema is the schema of the strips the fitted data did
// not test (UntestedStrip).
func untestedStripsSchema() obj {
	nullable := func(desc string) obj { return obj{{"type", []string{"number", "null"}}, {"description", desc}} }
	strip := obj{
		{"type", "object"},
		{"required", []string{"label", "stretch", "models", "summary"}},
		{"properties", obj{
			{"label", schemaStr("the strip: 1:0 (axis 2 held at stretch 1), 0:1 (axis 1 held), or 1:0 turned 45° or −45° (the specimen cut or mounted so, its lateral stretch held at 1, read in its own axes)")},
			{"stretch", schemaNum("the largest stretch of the driven axis along the strip, the data's largest along an axis, dimensionless")},
			{"models", obj{{"type", "integer"}, {"minimum", 0}, {"description", "how many near-equivalent models the band holds besides the card's own; 0 when none, and then the numbers are null: nothing measures the strip"}}},
			{"widest", nullable("the largest high - low of a normal stress over the strip, fitted stress measure, stress_unit")},
			{"largest", nullable("the card's model's largest |normal stress| along the strip, stress_unit")},
			{"percent", nullable("100 widest / largest")},
			{"widest_shear", nullable("the largest high - low of a shear stress over the strip (the grips carry it), stress_unit")},
			{"shear_percent", nullable("100 widest_shear / largest")},
			{"leaves_range_at", nullable("the stretch from which the strip leaves the fitted data range, where every model extrapolates; null when it stays inside (an unmeasured strip gives it too)")},
			{"summary", schemaStr("the strip in words")},
		}},
	}
	return obj{{"type", "array"}, {"items", strip},
		{"description", "the strips the fitted data did not test and how far the card's model and its near-equivalent models part along them (the spread of models the data could not tell apart, not a confidence interval)"}}
}

// fitSchema is the schema of how the model was fitted.
func fitSchema() obj {
	return obj{
		{"type", "object"},
		{"description", "how the model was fitted and how well the data determine it (metrics, estimates with 95 % intervals, correlation flags, identifiability notes, angle loss profiles)"},
		{"required", []string{"method", "loss", "rows", "metrics", "estimates"}},
		{"properties", obj{
			{"loss", obj{{"type", []string{"number", "null"}}, {"description", "weighted residual sum of squares, dimensionless"}}},
			{"angle_sign_known", obj{{"type", "boolean"}}},
			{"metrics", obj{{"type", "array"}, {"items", obj{{"type", "object"}, {"required", []string{"protocol", "component", "r2", "rmse", "nrmse"}},
				{"description", "per protocol and stress component: r2 and nrmse dimensionless, rmse and range in stress_unit; null where undefined"}}}}},
			{"estimates", obj{{"type", "array"}, {"items", obj{{"type", "object"}, {"required", []string{"name", "kind", "value", "unit", "std_err", "ci95", "status"}},
				{"properties", obj{{"status", obj{{"enum", []string{"estimated", "correlated", "degenerate", "inactive", "at-bound", "not-determined"}},
					{"description", "estimated: determined, with a 95 % interval; correlated: not separately determined (|r| > 0.95), see combinations; degenerate: its term is not supported by the data, no interval; inactive: weight at zero; at-bound: held at a bound; not-determined: the data cannot fix it"}}}}}}}}},
			{"combinations", obj{{"type", "array"}, {"items", obj{{"type", "object"}, {"required", []string{"names", "coefficients", "value", "std_err", "text"}},
				{"description", "what the data determine about a block of correlated estimates: the sum of coefficient × value over names, in the estimates' units, with its standard error"}}}}},
		}},
	}
}

// alternativesSchema is the schema of the alternatives section, whose
// models hold families and terms as the card does.
func alternativesSchema(family, term obj, str func(string) obj) obj {
	return obj{
		{"type", "object"},
		{"description", "the complete models the data cannot tell from the card's own (no shear information: one family at +|α|, one at −|α|, the mirror pair ±|α| with half the weights, or sign combinations of several families), with why, what measurement decides and which to choose in an FE model"},
		{"required", []string{"models"}},
		{"properties", obj{
			{"reason", str("why the models cannot be told apart")},
			{"decider", str("the measurement that removes the doubt")},
			{"choosing", str("which model to take for which boundary conditions of an FE model")},
			{"models", obj{{"type", "array"}, {"minItems", 2}, {"items", obj{
				{"type", "object"},
				{"required", []string{"name", "families", "terms"}},
				{"properties", obj{
					{"name", obj{{"type", "string"}, {"minLength", 1}, {"description", "single-plus, single-minus, mirror-pair, or signs+- and the like for several families"}}},
					{"title", str("the alternative in words")},
					{"as_card", obj{{"type", "boolean"}, {"description", "true for the card's own model"}}},
					{"energy", str("the energy with its numbers, plain text")},
					{"families", obj{{"type", []string{"array", "null"}}, {"items", family}}},
					{"terms", obj{{"type", "array"}, {"minItems", 1}, {"items", term}}},
				}},
			}}}},
		}},
	}
}

func familyRule(sh *terms.Shape) kv {
	if sh.Arg.NeedsFamily() {
		return kv{"family", obj{{"type", "string"}, {"minLength", 1}}}
	}
	return kv{"family", obj{{"const", ""}}}
}

func requiredOf(o obj) []string {
	for _, e := range o {
		if e.k == "required" {
			return e.v.([]string)
		}
	}
	return nil
}

// dedupRequired keeps the last "required" entry of o.
func dedupRequired(o obj) obj {
	last := -1
	for i, e := range o {
		if e.k == "required" {
			last = i
		}
	}
	var out obj
	for i, e := range o {
		if e.k != "required" || i == last {
			out = append(out, e)
		}
	}
	return out
}

func trimFloat(v float64) string {
	b, _ := json.Marshal(v)
	return string(b)
}

// The embedded schema is the one the catalogue gives.
func TestSchemaFileUpToDate(t *testing.T) {
	want := buildSchema()
	if *update {
		if err := os.WriteFile("model.schema.json", want, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	if !bytes.Equal(Schema(), want) {
		t.Fatal("model.schema.json is out of date with the catalogue; run go test ./aniso/card -run TestSchemaFile -update")
	}
}

// The schema's own description names the top-level keys it leaves
// undescribed; each must be one the schema has no property for. It named
// fit and verdict among them (written before their sections were
// described), while the properties and the README describe both.
func TestSchemaDescriptionNamesOnlyUndescribedKeys(t *testing.T) {
	var doc struct {
		Description string                     `json:"description"`
		Properties  map[string]json.RawMessage `json:"properties"`
	}
	if err := json.Unmarshal(Schema(), &doc); err != nil {
		t.Fatal(err)
	}
	const lead = "Keys not described here ("
	i := strings.Index(doc.Description, lead)
	if i < 0 {
		t.Fatalf("description does not list the keys it leaves undescribed: %q", doc.Description)
	}
	list := doc.Description[i+len(lead):]
	list = list[:strings.Index(list, ")")]
	if j := strings.LastIndex(list, ":"); j >= 0 {
		list = list[j+1:]
	}
	if j := strings.LastIndex(list, "such as"); j >= 0 {
		list = list[j+len("such as"):]
	}
	for _, k := range strings.Split(list, ",") {
		k = strings.TrimSpace(k)
		if _, ok := doc.Properties[k]; ok {
			t.Errorf("the description calls %q not described, but the schema describes it", k)
		}
	}
}

// compileSchema compiles the embedded schema with a general-purpose JSON
// Schema library, which also checks it against the draft 2020-12
// meta-schema.
func compileSchema(t *testing.T) *jsonschema.Schema {
	t.Helper()
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(Schema()))
	if err != nil {
		t.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	if err := c.AddResource(SchemaID, doc); err != nil {
		t.Fatal(err)
	}
	s, err := c.Compile(SchemaID)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func validate(t *testing.T, s *jsonschema.Schema, b []byte) error {
	t.Helper()
	inst, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return s.Validate(inst)
}

func presetModel(t *testing.T, p *terms.Preset) *aniso.Model {
	m := &aniso.Model{}
	for i := 0; i < p.Families; i++ {
		m.Families = append(m.Families, aniso.Family{Name: "", Angle: p.AnglesDeg[i] * math.Pi / 180, Dispersion: p.Kappa})
	}
	for _, pt := range p.Terms {
		sh := terms.Lookup(pt.ID)
		params := pt.Params
		if params == nil {
			params = sh.DefaultParams()
		}
		m.Terms = append(m.Terms, aniso.Term{Shape: sh, Family: pt.Family - 1, Weight: pt.Weight, Params: params})
	}
	if err := m.Validate(); err != nil {
		t.Fatal(err)
	}
	return m
}

// Cards weft writes validate against the schema (checked with
// github.com/santhosh-tekuri/jsonschema, a general-purpose validator):
// every preset, a model with every catalogue term, with and without a
// data_range section and other fit sections, and the hand-written cards
// of the README and testdata.
func TestCardsValidateAgainstSchema(t *testing.T) {
	s := compileSchema(t)
	models := map[string]*aniso.Model{"sample": sampleModel()}
	for _, p := range terms.Presets() {
		models["preset "+p.Name] = presetModel(t, p)
	}
	all := &aniso.Model{Families: []aniso.Family{{Name: "a", Angle: 0.3, Dispersion: aniso.MaxDispersion}, {Name: "b", Angle: -1.2}}}
	for i, sh := range terms.Catalogue() {
		tm := aniso.Term{Shape: sh, Family: -1, Weight: float64(i), Params: sh.DefaultParams()}
		if sh.Arg.NeedsFamily() {
			tm.Family = i % 2
		}
		all.Terms = append(all.Terms, tm)
	}
	models["every term"] = all
	n := 0
	for name, m := range models {
		for _, withRange := range []bool{false, true} {
			c := FromModel(m, "kPa", nil)
			if withRange {
				s12, s21 := Interval{-0.02, 0.01}, Interval{0, 0.03}
				dr := DataRange{Stretch1: [2]float64{0.98, 1.31}, Stretch2: [2]float64{1, 1.22}, Shear: [2]float64{-0.02, 0.03}, Shear12: &s12, Shear21: &s21, StressKind: "cauchy"}
				for range m.Families {
					dr.FibreStretch = append(dr.FibreStretch, [2]float64{1, 1.2})
				}
				c.DataRange = &dr
				c.Extra = map[string]json.RawMessage{"future_section": json.RawMessage(`{"anything":[1,2],"rmse":1.2}`)}
				unknown := make([]bool, len(m.Families))
				c.Alternatives = NewAlternativesSection(m, "kPa", unknown)
				c.CalibrationCheck = NewCalibrationCheck("1", []float64{30}, true, 0.05, []aniso.AxisScaleOutcome{
					{Axis1Scale: 1.05, Families: "1", Chosen: "single-t2-p4", AnglesDeg: []float64{31.2}, Angles: "31.2°"},
					{Axis1Scale: 0.95, Families: "0", Chosen: "none-t1-p2", AnglesDeg: []float64{}}})
				if len(m.Families) > 0 && c.Alternatives == nil {
					t.Errorf("%s: no alternatives for unknown signs", name)
				}
			}
			b, err := c.Marshal()
			if err != nil {
				t.Fatal(err)
			}
			if err := validate(t, s, b); err != nil {
				t.Errorf("%s (data_range %v): weft's own card fails the schema: %v\n%s", name, withRange, err, b)
			}
			if _, _, err := Parse(bytes.NewReader(b), name); err != nil {
				t.Errorf("%s: %v", name, err)
			}
			n++
		}
	}
	if n < 2*8 {
		t.Fatalf("only %d cards validated", n)
	}
	for _, f := range []string{"../../testdata/example/hgo-media.json"} {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if err := validate(t, s, b); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
	hand := `{"format": "weft.model/1", "stress_unit": "kPa", "families": [], "terms": [{"id": "i1-lin", "weight": 5}]}`
	if err := validate(t, s, []byte(hand)); err != nil {
		t.Errorf("hand-written neo-Hookean card: %v", err)
	}
}

// Invalid cards are rejected by the schema, and by weft's reader too, so
// the two agree on these rules.
func TestSchemaRejectsInvalidCards(t *testing.T) {
	s := compileSchema(t)
	good := `{"format":"weft.model/1","stress_unit":"kPa","families":[{"name":"f1","angle_deg":30}],
	 "terms":[{"id":"i1-lin","weight":1},{"id":"fib-expsq","weight":2,"params":{"stiffening":1},"family":"f1"}]}`
	if err := validate(t, s, []byte(good)); err != nil {
		t.Fatalf("good card rejected: %v", err)
	}
	if _, _, err := Parse(strings.NewReader(good), "good"); err != nil {
		t.Fatal(err)
	}
	bad := map[string][2]string{
		"negative weight":          {`"weight":1}`, `"weight":-1}`},
		"unknown format":           {`"weft.model/1"`, `"weft.model/9"`},
		"unknown unit":             {`"stress_unit":"kPa"`, `"stress_unit":"psi"`},
		"unknown term":             {`"id":"i1-lin"`, `"id":"i1-linear"`},
		"stiffening out of bounds": {`"stiffening":1`, `"stiffening":1001`},
		"missing stiffening":       {`"params":{"stiffening":1},`, ``},
		"extra parameter":          {`"stiffening":1`, `"stiffening":1,"limit":2`},
		"fibre without family":     {`,"family":"f1"`, ``},
		"isotropic with family":    {`{"id":"i1-lin","weight":1}`, `{"id":"i1-lin","weight":1,"family":"f1"}`},
		"dispersion above 1/3":     {`"angle_deg":30`, `"angle_deg":30,"dispersion":0.34`},
		"no terms":                 {`"terms":[{"id":"i1-lin","weight":1},{"id":"fib-expsq","weight":2,"params":{"stiffening":1},"family":"f1"}]`, `"terms":[]`},
		"angle not a number":       {`"angle_deg":30`, `"angle_deg":"30"`},
		"angle beyond a turn":      {`"angle_deg":30`, `"angle_deg":390`},
	}
	for name, r := range bad {
		card := strings.Replace(good, r[0], r[1], 1)
		if card == good {
			t.Fatalf("%s: replacement did not apply", name)
		}
		if err := validate(t, s, []byte(card)); err == nil {
			t.Errorf("%s: the schema accepts %s", name, card)
		}
		if _, _, err := Parse(strings.NewReader(card), name); err == nil {
			t.Errorf("%s: weft's reader accepts %s", name, card)
		}
	}
	// A data_range section must have the right shape.
	withRange := strings.TrimSuffix(strings.TrimSpace(good), "}") + `,"data_range":{"stretch_1":[1,1.2],"stretch_2":[1],"shear":[0,0]}}`
	if err := validate(t, s, []byte(withRange)); err == nil {
		t.Error("schema accepts a data_range with a one-number stretch_2")
	}
}
