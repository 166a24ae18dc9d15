package biaxial

import (
	"strings"
)

// Unit factors to SI. Gram-force is defined through standard gravity,
// gn = 9.80665 m/s² (the conventional value adopted by the 3rd CGPM, 1901),
// so 1 gf = 9.80665 mN.
const (
	// GramForce is one gram-force in newtons.
	GramForce = 9.80665e-3
)

// stressUnits lists the accepted stress units with their factor to pascal.
// Matching is case-insensitive ("kpa" is kPa; "mpa" is read as MPa, since
// millipascal never occurs in tissue testing); "N/mm²" (also "N/mm2",
// "N/mm^2") is MPa and "N/m²" is Pa.
var stressUnits = []unitDef{
	{"Pa", 1, []string{"pa", "n/m2", "n/m^2", "n/m²"}},
	{"kPa", 1e3, []string{"kpa"}},
	{"MPa", 1e6, []string{"mpa", "n/mm2", "n/mm^2", "n/mm²"}},
}

var forceUnits = []unitDef{
	{"N", 1, []string{"n"}},
	{"mN", 1e-3, []string{"mn"}},
	{"gf", GramForce, []string{"gf"}},
}

var lengthUnits = []unitDef{
	{"m", 1, []string{"m"}},
	{"mm", 1e-3, []string{"mm"}},
	{"µm", 1e-6, []string{"µm", "μm", "um"}},
}

var timeUnits = []unitDef{
	{"s", 1, []string{"s", "sec"}},
	{"ms", 1e-3, []string{"ms"}},
	{"min", 60, []string{"min"}},
}

type unitDef struct {
	name    string   // canonical spelling
	toSI    float64  // factor to the SI unit
	aliases []string // lower-case spellings accepted
}

func findUnit(defs []unitDef, s string) (unitDef, bool) {
	l := strings.ToLower(strings.TrimSpace(s))
	for _, d := range defs {
		for _, a := range d.aliases {
			if l == a {
				return d, true
			}
		}
	}
	return unitDef{}, false
}

func unitNames(defs []unitDef) string {
	var parts []string
	for _, d := range defs {
		parts = append(parts, d.name)
	}
	return strings.Join(parts, ", ")
}

// StressFactor returns the factor that converts a stress in unit from to
// unit to (multiply by it), and false when either unit is not one of Pa, kPa,
// MPa (case-insensitive, see the package documentation for aliases).
func StressFactor(from, to string) (float64, bool) {
	a, ok1 := findUnit(stressUnits, from)
	b, ok2 := findUnit(stressUnits, to)
	if !ok1 || !ok2 {
		return 0, false
	}
	return a.toSI / b.toSI, true
}

// CanonicalStressUnit returns the canonical spelling ("Pa", "kPa", "MPa") of
// an accepted stress unit, and false for any other text.
func CanonicalStressUnit(u string) (string, bool) {
	d, ok := findUnit(stressUnits, u)
	return d.name, ok
}

// ForceToNewton returns the factor that converts a force in unit u (N, mN,
// gf) to newtons, and false for an unknown unit.
func ForceToNewton(u string) (float64, bool) {
	d, ok := findUnit(forceUnits, u)
	return d.toSI, ok
}

// LengthToMetre returns the factor that converts a length in unit u (m, mm,
// µm, also written um) to metres, and false for an unknown unit.
func LengthToMetre(u string) (float64, bool) {
	d, ok := findUnit(lengthUnits, u)
	return d.toSI, ok
}

// splitQuantity splits "0.8 mm" (or "0.8mm", "0,8 mm" with decimalComma)
// into a value and a unit text. The unit may be empty.
func splitQuantity(s string, decimalComma bool) (float64, string, bool) {
	s = strings.TrimSpace(s)
	i := 0
	for i < len(s) {
		c := s[i]
		if (c >= '0' && c <= '9') || c == '.' || c == '-' || c == '+' || c == 'e' || c == 'E' || (c == ',' && decimalComma) {
			// An 'e' is part of the number only when digits follow it.
			if (c == 'e' || c == 'E') && (i+1 >= len(s) || !(s[i+1] >= '0' && s[i+1] <= '9' || s[i+1] == '-' || s[i+1] == '+')) {
				break
			}
			i++
			continue
		}
		break
	}
	num := s[:i]
	if decimalComma {
		num = strings.Replace(num, ",", ".", 1)
	}
	v, err := ParseNumber(num)
	if err != nil {
		return 0, "", false
	}
	return v, strings.TrimSpace(s[i:]), true
}
