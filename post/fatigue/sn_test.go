package fatigue

import (
	"math"
	"strings"
	"testing"
)

func near(got, want, rel float64) bool { return math.Abs(got-want) <= rel*math.Abs(want) }

// The knee points of EN 1993-1-9 Figure 7.1: Δσ_D = 0.737·Δσ_C at 5·10⁶
// cycles and Δσ_L = 0.549·Δσ_D at 10⁸, the figure's rounded factors.
func TestKneePointsEN1993(t *testing.T) {
	if got := KneeD(); math.Abs(got-0.737) > 0.0005 {
		t.Errorf("Δσ_D/Δσ_C = %.5f, EN 1993-1-9 Figure 7.1 gives 0.737", got)
	}
	if got := KneeL(); math.Abs(got-0.549) > 0.0005 {
		t.Errorf("Δσ_L/Δσ_D = %.5f, EN 1993-1-9 Figure 7.1 gives 0.549", got)
	}
	c, err := Category(50)
	if err != nil {
		t.Fatal(err)
	}
	// The knees at the exact factors, (2/5)^(1/3) and (5/100)^(1/5), of
	// which 0.737 and 0.549 are the figure's rounding.
	dsd, dsl := 50*math.Cbrt(0.4), 50*math.Cbrt(0.4)*math.Pow(0.05, 0.2)
	cases := []struct {
		name   string
		ds     float64
		cycles float64
	}{
		{"Δσ_C at N_C", 50, 2e6},
		{"Δσ_D at N_D", dsd, 5e6},
		{"Δσ_L at N_L", dsl, 1e8},
		{"m = 3 above Δσ_C", 100, 2e6 / 8},
		{"m = 5 between the knees", 30, 5e6 * math.Pow(dsd/30, 5)},
	}
	for _, k := range cases {
		if got := c.Cycles(k.ds); !near(got, k.cycles, 1e-12) {
			t.Errorf("%s: N_R(%.4g MPa) = %.6g, want %.6g (EN 1993-1-9 Figure 7.1)", k.name, k.ds, got, k.cycles)
		}
	}
	if got := c.Cycles(0.99 * dsl); !math.IsInf(got, 1) {
		t.Errorf("below the cut-off: N_R = %g, want +Inf (EN 1993-1-9 Figure 7.1)", got)
	}
	if got := c.Range(5e6); !near(got, dsd, 1e-12) {
		t.Errorf("Range(5e6) = %g, want Δσ_D = %g", got, dsd)
	}
}

// The size factor of bolts in tension, k_s = (30/d)^0.25 for d > 30 mm
// (EN 1993-1-9 Table 8.1, detail 14); the values of (30/d)^0.25 worked by
// hand.
func TestBoltSizeFactor(t *testing.T) {
	cases := []struct {
		d, ks float64
	}{
		{20, 1}, {30, 1}, {36, 0.955443}, {48, 0.889140}, {64, 0.827438},
	}
	for _, k := range cases {
		if got := SizeFactor(k.d); !near(got, k.ks, 1e-5) {
			t.Errorf("k_s(d = %g) = %.6f, want %.6f", k.d, got, k.ks)
		}
		c, err := Bolt(k.d)
		if err != nil {
			t.Fatal(err)
		}
		if got := c.Cycles(50 * SizeFactor(k.d)); !near(got, 2e6, 1e-12) {
			t.Errorf("d = %g: N_R(k_s·50 MPa) = %g, want 2e6", k.d, got)
		}
	}
}

func TestFromPoints(t *testing.T) {
	pts := []Point{{1e4, 200}, {1e6, 60}, {1e8, 30}}
	c, err := FromPoints("user", pts)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range pts {
		if got := c.Cycles(p.Range); !near(got, p.Cycles, 1e-12) {
			t.Errorf("N_R(%g) = %g, want %g", p.Range, got, p.Cycles)
		}
	}
	m := math.Log(100) / math.Log(200.0/60)
	if got, want := c.Cycles(400), 1e4*math.Pow(0.5, m); !near(got, want, 1e-12) {
		t.Errorf("above the first point: N_R(400) = %g, want %g on the first line", got, want)
	}
	if got := c.Cycles(29.9); !math.IsInf(got, 1) {
		t.Errorf("below the last point: N_R = %g, want +Inf", got)
	}
	for _, bad := range [][]Point{{{1e4, 200}}, {{1e4, 200}, {1e3, 100}}, {{1e4, 200}, {1e5, 250}}, {{1e4, -1}, {1e5, 100}}} {
		if _, err := FromPoints("bad", bad); err == nil {
			t.Errorf("points %v accepted", bad)
		}
	}
}

func TestReadCurve(t *testing.T) {
	c, err := ReadCurve(strings.NewReader("# a user curve\nstress_range_MPa,cycles\n200,1e4\n60,1e6\n30,1e8\n"), "user")
	if err != nil {
		t.Fatal(err)
	}
	if got := c.Cycles(60); !near(got, 1e6, 1e-12) {
		t.Errorf("N_R(60) = %g, want 1e6", got)
	}
	for _, text := range []string{"cycles,range\n1,2\n", "cycles,stress_range_MPa\n1e4,x\n", "cycles,stress_range_MPa\n1e4,10\n1e5,20\n"} {
		if _, err := ReadCurve(strings.NewReader(text), "bad"); err == nil {
			t.Errorf("%q accepted", text)
		}
	}
}
