package biaxial_test

import (
	"fmt"
	"path/filepath"

	"github.com/weft-tools/weft/biaxial"
)

// Read a test file (the synthetic demo specimen membrane-M1: loads with
// geometry, five protocols of three cycles) and keep the default
// selection, the loading branch of the last cycle of each protocol.
func ExampleReadFile() {
	path := filepath.Join("..", "testdata", "demo", "membrane-M1.csv")
	s, err := biaxial.ReadFile(path, biaxial.Options{})
	if err != nil {
		fmt.Println(err) // a *biaxial.ParseError naming the line, column and fix
		return
	}
	fmt.Printf("%s: %s stress in %s (from loads: %v), %d points\n", s.Name, s.Kind, s.StressUnit, s.FromLoads, s.NumPoints())
	for _, p := range s.Protocols {
		first, last := p.Points[0], p.Points[len(p.Points)-1]
		fmt.Printf("%-6s %s; stretch_1 %.4g to %.4g, P11 %.3g to %.3g %s\n",
			p.Label, p.Kept, first.Stretch1(), last.Stretch1(), first.Stress[biaxial.C11], last.Stress[biaxial.C11], s.StressUnit)
	}
	// Output:
	// membrane-M1: nominal stress in kPa (from loads: true), 200 points
	// 1:1    cycle 3 of 3, loading branch, 40 of 237 rows; stretch_1 1.01 to 1.15, P11 2.26 to 81.7 kPa
	// 1:0.75 cycle 3 of 3, loading branch, 40 of 237 rows; stretch_1 1.01 to 1.15, P11 1.34 to 69.6 kPa
	// 0.75:1 cycle 3 of 3, loading branch, 40 of 237 rows; stretch_1 1.008 to 1.113, P11 1.12 to 50 kPa
	// 1:0.5  cycle 3 of 3, loading branch, 40 of 237 rows; stretch_1 1.01 to 1.15, P11 2.98 to 59.3 kPa
	// 0.5:1  cycle 3 of 3, loading branch, 40 of 237 rows; stretch_1 1.005 to 1.075, P11 1.76 to 29.6 kPa
}

// Read a test file once and prepare its rows twice: the default selection
// for a fit, and every cycle and both branches as measured, for a view of
// the whole record (what weft fit does with one input file).
func ExampleReadRows() {
	path := filepath.Join("..", "testdata", "demo", "membrane-M1.csv")
	rows, err := biaxial.ReadRows(path, biaxial.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fit, err := rows.Prepare(biaxial.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	all, err := rows.Prepare(biaxial.Options{Cycle: biaxial.CycleAll, Branch: biaxial.BranchAll})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("fit: %d points; whole record: %d points; the same bytes: %v\n", fit.NumPoints(), all.NumPoints(), fit.Digest == all.Digest)
	fmt.Println(all.Protocols[0].Label, all.Protocols[0].Kept)
	// Output:
	// fit: 200 points; whole record: 1185 points; the same bytes: true
	// 1:1 all 3 cycles, 237 of 237 rows
}
