package terms

import "sort"

// PresetTerm is one term of a preset model.
type PresetTerm struct {
	// ID is the catalogue shape id.
	ID string
	// Family is 0 for a term without a fibre family (isotropic, or the
	// Green-strain term whose axes are the tester's), 1 or 2 for a term of
	// the first or second fibre family.
	Family int
	// Weight is an illustrative weight in kPa (see Preset.Example).
	Weight float64
	// Params are illustrative non-linear parameters; nil means defaults.
	Params []float64
}

// Preset is a classical model written with catalogue terms.
type Preset struct {
	// Name is the preset's key, e.g. "neo-hookean".
	Name string
	// Title is the model's usual name; Source cites it.
	Title, Source string
	// Families is the number of fibre families (0, 1 or 2).
	Families int
	// Mirror is true when two families sit at ±β, symmetric about axis 1,
	// and share their weights and stiffening coefficients, as in Holzapfel, Gasser & Ogden
	// 2000.
	Mirror bool
	// Dispersion is true when each family has a dispersion κ
	// (Gasser, Ogden & Holzapfel 2006).
	Dispersion bool
	// Terms in order.
	Terms []PresetTerm
	// AnglesDeg and Kappa are illustrative fibre angles (degrees from axis
	// 1 towards axis 2) and dispersion for the example values.
	AnglesDeg []float64
	Kappa     float64
	// Example says where the illustrative values come from.
	Example string
}

var presets = map[string]*Preset{}

// LookupPreset returns the preset with the given name, or nil.
func LookupPreset(name string) *Preset { return presets[name] }

// Presets returns all presets sorted by name.
func Presets() []*Preset {
	out := make([]*Preset, 0, len(presets))
	for _, p := range presets {
		out = append(out, p)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Name < out[j].Name })
	return out
}

func init() {
	const invented = "illustrative values invented for weft's examples"
	for _, p := range []*Preset{
		{Name: "neo-hookean", Title: "neo-Hookean", Source: "Treloar 1943; Ogden 1984",
			Terms: []PresetTerm{{ID: "i1-lin", Weight: 5}}, Example: invented},
		{Name: "mooney-rivlin", Title: "Mooney–Rivlin", Source: "Mooney 1940; Rivlin 1948",
			Terms: []PresetTerm{{ID: "i1-lin", Weight: 4}, {ID: "i2-lin", Weight: 1}}, Example: invented},
		{Name: "demiray", Title: "Demiray exponential", Source: "Demiray 1972",
			Terms: []PresetTerm{{ID: "i1-exp", Weight: 2, Params: []float64{5}}}, Example: invented},
		{Name: "gent", Title: "Gent limiting extensibility", Source: "Gent 1996",
			Terms: []PresetTerm{{ID: "i1-gent", Weight: 5, Params: []float64{2}}}, Example: invented},
		{Name: "yeoh", Title: "Yeoh-type cubic in I1", Source: "Yeoh 1993",
			Terms:   []PresetTerm{{ID: "i1-lin", Weight: 5}, {ID: "i1-quad", Weight: 2}, {ID: "i1-cube", Weight: 1}},
			Example: invented},
		{Name: "hgo", Title: "two-family fibre model of Holzapfel, Gasser & Ogden", Source: "Holzapfel, Gasser & Ogden 2000, J Elasticity 61:1–48",
			Families: 2, Mirror: true,
			Terms: []PresetTerm{
				{ID: "i1-lin", Weight: 1.5},
				{ID: "fib-expsq", Family: 1, Weight: 2.3632, Params: []float64{0.8393}},
				{ID: "fib-expsq", Family: 2, Weight: 2.3632, Params: []float64{0.8393}},
			},
			AnglesDeg: []float64{29, -29},
			Example:   "media of a rabbit carotid artery, Holzapfel, Gasser & Ogden 2000 (c = 3 kPa, k1 = 2.3632 kPa, k2 = 0.8393, β = 29°; from memory)"},
		{Name: "goh", Title: "two-family fibre model with dispersion of Gasser, Ogden & Holzapfel", Source: "Gasser, Ogden & Holzapfel 2006, J R Soc Interface 3:15–35",
			Families: 2, Mirror: true, Dispersion: true,
			Terms: []PresetTerm{
				{ID: "i1-lin", Weight: 3.82},
				{ID: "fib-expsq", Family: 1, Weight: 996.6, Params: []float64{524.6}},
				{ID: "fib-expsq", Family: 2, Weight: 996.6, Params: []float64{524.6}},
			},
			AnglesDeg: []float64{49.98, -49.98}, Kappa: 0.226,
			Example: "adventitia of a human iliac artery after Gasser, Ogden & Holzapfel 2006 (μ = 7.64 kPa, k1 = 996.6 kPa, k2 = 524.6, κ = 0.226, γ = 49.98°; from memory)"},
		{Name: "fung", Title: "Fung-type planar exponential in the Green strain (a classical comparison)", Source: "Tong & Fung 1976, J Biomech 9:649–657",
			Terms:   []PresetTerm{{ID: "fung", Weight: 0.5, Params: []float64{12, 6, 2, 8}}},
			Example: "illustrative values invented for weft's examples, not measured (c = 0.5 kPa, b1 = 12, b2 = 6, b3 = 2, b4 = 8)"},
		{Name: "fung-general", Title: "generalised Fung-type planar exponential in the Green strain, shear coupled to the normal strains (a classical comparison)", Source: "the full quadratic form of the planar Fung-type law, e.g. Sun & Sacks 2005, Biomech Model Mechanobiol 4:190–199 (from memory)",
			Terms:   []PresetTerm{{ID: "fung-general", Weight: 0.5, Params: []float64{12, 6, 2, 8, 1, -0.5}}},
			Example: "illustrative values invented for weft's examples, not measured (c = 0.5 kPa, b1 = 12, b2 = 6, b3 = 2, b4 = 8, b5 = 1, b6 = −0.5)"},
	} {
		presets[p.Name] = p
	}
}
