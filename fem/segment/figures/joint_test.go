package figures

import (
	"math"
	"strings"
	"testing"

	"flangeseg/post/handcalc"
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

// TestStillRising: the FE ultimate load is called a lower bound only when
// the run ended on its largest segment force, still climbing; a path that
// fell from its peak and rose by a rounding in its last increment has
// shown its peak (a consistency check of the words, no published value).
func TestStillRising(t *testing.T) {
	row := func(u, z float64) Row { return Row{Stage: "tension", U: u, Z: z * 1e3} }
	in := Input{Yielding: true, Hand: handcalc.Results{CurveEnd: 500e3}}
	cases := []struct {
		name   string
		rows   []Row
		rising bool
	}{
		{"climbing", []Row{row(0, 0), row(1, 300), row(2, 450), row(3, 520)}, true},
		{"fell from its peak", []Row{row(0, 0), row(1, 300), row(2, 614), row(3, 588)}, false},
		{"fell, then a rounding up", []Row{row(0, 0), row(1, 300), row(2, 614), row(3, 588), row(3.001, 588.000006)}, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := Read(append([]Row{{Stage: "preload"}}, c.rows...), in)
			if got := strings.Contains(f.FEVersusHand, "still rising"); got != c.rising {
				t.Errorf("%q: still rising %v, want %v", f.FEVersusHand, got, c.rising)
			}
		})
	}
}
