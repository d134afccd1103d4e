package segment

import (
	"math"
	"testing"
)

// crossing and at interpolate linearly between rows (arithmetic written
// out in the cases).
func TestCrossingAndAt(t *testing.T) {
	rows := []historyRow{
		{z: 0, u: 0, gapEdge: -1e-5},
		{z: 100e3, u: 0.2, gapEdge: 0.0005},
		{z: 200e3, u: 0.5, gapEdge: 0.0025},
	}
	gap := func(r historyRow) float64 { return r.gapEdge }
	// 1e-3 lies a quarter of the way from 0.0005 to 0.0025: Z = 100 + 25 kN.
	if z := crossing(rows, gap, 1e-3); z == nil || math.Abs(*z-125) > 1e-9 {
		t.Errorf("crossing = %v kN, want 125", z)
	}
	if z := crossing(rows, gap, 1); z != nil {
		t.Errorf("crossing above the data = %v, want none", *z)
	}
	// u at Z = 150 kN: halfway between 0.2 and 0.5 mm.
	if u, ok := at(rows, 150e3, func(r historyRow) float64 { return r.u }); !ok || math.Abs(u-0.35) > 1e-12 {
		t.Errorf("u(150 kN) = %g, %v; want 0.35", u, ok)
	}
	if _, ok := at(rows, 300e3, func(r historyRow) float64 { return r.u }); ok {
		t.Error("at beyond the data reported a value")
	}
}
