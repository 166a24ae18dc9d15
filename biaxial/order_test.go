package biaxial

import (
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"
)

// orderCSV writes a synthetic stress-controlled file (Cauchy stress, kPa)
// of the given protocols, in the order given: each is a label and the
// peak stretches of axes 1 and 2, reached in 11 equal steps.
func orderCSV(protocols []struct {
	label  string
	l1, l2 float64
}) string {
	var b strings.Builder
	b.WriteString("# specimen = SYN-order (synthetic)\n# stress_unit = kPa\n")
	b.WriteString("protocol,cycle,stretch_1,stretch_2,cauchy_11,cauchy_22\n")
	for _, p := range protocols {
		for i := 0; i <= 10; i++ {
			s := float64(i) / 10
			l1, l2 := 1+s*(p.l1-1), 1+s*(p.l2-1)
			fmt.Fprintf(&b, "%s,1,%.6f,%.6f,%.6g,%.6g\n", p.label, l1, l2, 20*(math.Exp(10*(l1*l1-1))-1), 15*(math.Exp(10*(l2*l2-1))-1))
		}
	}
	return b.String()
}

// The protocols of a specimen come in the order of a stretch-ratio study
// (common practice: equibiaxial first, then ever less balanced, each
// axis-1-dominated protocol before its mirror), from their data alone:
// the same protocols in another order of rows, or under other labels,
// give the same sequence of protocols.
func TestProtocolOrder(t *testing.T) {
	type proto = struct {
		label  string
		l1, l2 float64
	}
	// Peak strains chosen so that the Green-strain balances are about 1,
	// 0.75, 0.5 and a negative one (axis 2 shortens).
	protocols := []proto{
		{"e", 1.05, 1.1},    // axis 2 leads, balance ≈ 0.49
		{"b", 1.1, 1.0753},  // axis 1 leads, balance ≈ 0.75
		{"z", 1.1, 0.97},    // axis 2 shortens: last
		{"a", 1.1, 1.1},     // equibiaxial: first
		{"d", 1.1, 1.05},    // axis 1 leads, balance ≈ 0.49
		{"c", 1.0753, 1.1},  // axis 2 leads, balance ≈ 0.75
		{"a2", 1.15, 1.15},  // equibiaxial to a larger strain: after "a"
		{"d2", 1.1, 1.0501}, // the scatter of "d": the same balance, after "d" by its data
	}
	want := []string{"a", "a2", "b", "c", "d", "d2", "e", "z"}
	labelsOf := func(s *Specimen) []string {
		var l []string
		for _, p := range s.Protocols {
			l = append(l, p.Label)
		}
		return l
	}
	first, err := Read(strings.NewReader(orderCSV(protocols)), "order.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := labelsOf(first); !reflect.DeepEqual(got, want) {
		t.Fatalf("protocol order %q, want %q", got, want)
	}
	// Reversed rows and new labels: the same data in the same order.
	rev := make([]proto, len(protocols))
	for i, p := range protocols {
		p.label = "P" + string(rune('8'-i))
		rev[len(protocols)-1-i] = p
	}
	second, err := Read(strings.NewReader(orderCSV(rev)), "order.csv", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(second.Protocols) != len(first.Protocols) {
		t.Fatalf("%d protocols, want %d", len(second.Protocols), len(first.Protocols))
	}
	for i := range first.Protocols {
		a, b := &first.Protocols[i], &second.Protocols[i]
		if a.Weight != b.Weight || len(a.Points) != len(b.Points) {
			t.Fatalf("protocol %d: %q and %q differ in weight or points", i, a.Label, b.Label)
		}
		for j := range a.Points {
			if a.Points[j].F != b.Points[j].F || a.Points[j].Stress != b.Points[j].Stress {
				t.Fatalf("protocol %d (%q, %q), point %d: the data differ", i, a.Label, b.Label, j)
			}
		}
	}
}
