package figures

import (
	"math"
	"testing"
)

// crossing and At interpolate linearly between rows (arithmetic written
// out in the cases).
func TestCrossingAndAt(t *testing.T) {
	rows := []Row{
		{Z: 0, U: 0, GapEdge: -1e-5},
		{Z: 100e3, U: 0.2, GapEdge: 0.0005},
		{Z: 200e3, U: 0.5, GapEdge: 0.0025},
	}
	gap := func(r Row) float64 { return r.GapEdge }
	// 1e-3 lies a quarter of the way from 0.0005 to 0.0025: Z = 100 + 25 kN.
	if z := crossing(rows, gap, 1e-3); z == nil || math.Abs(*z-125) > 1e-9 {
		t.Errorf("crossing = %v kN, want 125", z)
	}
	if z := crossing(rows, gap, 1); z != nil {
		t.Errorf("crossing above the data = %v, want none", *z)
	}
	// u at Z = 150 kN: halfway between 0.2 and 0.5 mm.
	if u, ok := At(rows, 150e3, func(r Row) float64 { return r.U }); !ok || math.Abs(u-0.35) > 1e-12 {
		t.Errorf("u(150 kN) = %g, %v; want 0.35", u, ok)
	}
	if _, ok := At(rows, 300e3, func(r Row) float64 { return r.U }); ok {
		t.Error("At beyond the data reported a value")
	}
}
