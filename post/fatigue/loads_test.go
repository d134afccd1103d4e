package fatigue

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// Z = 4M/(n·D_t) − N/n (common practice for ring flanges): a 4.3 m tower
// with 120 bolts under M = 30 MN·m and N = 3 MN of compression.
func TestTowerSegmentForce(t *testing.T) {
	tw := Tower{Diameter: 4300, Bolts: 120}
	got := tw.SegmentForce(30e9, 3e6)
	want := 4*30e9/(120*4300.0) - 3e6/120
	if !near(got, want, 1e-15) || !near(got, 207.558e3, 1e-5) {
		t.Errorf("Z = %g N, want %g N", got, want)
	}
}

func collect(t *testing.T, text string, tw Tower) ([]Cycle, LoadInfo, error) {
	t.Helper()
	var out []Cycle
	info, err := ReadLoads(strings.NewReader(text), tw, func(c Cycle) error {
		out = append(out, c)
		return nil
	})
	return out, info, err
}

func TestReadLoads(t *testing.T) {
	tw := Tower{Diameter: 4000, Bolts: 100}
	k := func(m, n float64) float64 { return tw.SegmentForce(m*1e6, n*1e3) }
	cases := []struct {
		name string
		text string
		kind LoadKind
		want []Cycle
	}{
		{"segment series", "# the ASTM history in kN\ntime_s,Z_kN\n0,-2\n1,1\n2,-3\n3,5\n4,-1\n5,3\n6,-4\n7,4\n8,-2\n", SegmentSeries,
			[]Cycle{{-2e3, 1e3, 0.5}, {1e3, -3e3, 0.5}, {-1e3, 3e3, 1}, {-3e3, 5e3, 0.5}, {5e3, -4e3, 0.5}, {-4e3, 4e3, 0.5}, {4e3, -2e3, 0.5}}},
		{"segment series without time", "Z_kN\n0\n10\n0\n", SegmentSeries, []Cycle{{0, 10e3, 0.5}, {10e3, 0, 0.5}}},
		{"tower series", "moment_kNm,normal_force_kN\n1000,500\n3000,500\n", TowerSeries, []Cycle{{k(1000, 500), k(3000, 500), 0.5}}},
		{"segment table", "Z_range_kN,Z_mean_kN,cycles\n100,50,1e6\n 20 , -5 , 3\n", SegmentTable,
			[]Cycle{{0, 100e3, 1e6}, {-15e3, 5e3, 3}}},
		{"tower table", "cycles,moment_mean_kNm,moment_range_kNm,normal_force_kN\n1e7,2000,4000,3000\n", TowerTable,
			[]Cycle{{k(0, 3000), k(4000, 3000), 1e7}}},
	}
	for _, c := range cases {
		got, info, err := collect(t, c.text, tw)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if info.Kind != c.kind || len(got) != len(c.want) {
			t.Errorf("%s: kind %v, %d cycles; want %v, %d", c.name, info.Kind, len(got), c.kind, len(c.want))
			continue
		}
		var n float64
		for i := range got {
			w := c.want[i]
			if math.Abs(got[i].From-w.From) > 1e-9 || math.Abs(got[i].To-w.To) > 1e-9 || got[i].Count != w.Count {
				t.Errorf("%s: cycle %d = %v, want %v", c.name, i, got[i], w)
			}
			n += w.Count
		}
		if info.Cycles != n {
			t.Errorf("%s: info counts %g cycles, want %g", c.name, info.Cycles, n)
		}
	}
}

func TestReadLoadsErrors(t *testing.T) {
	cases := []struct{ text, want string }{
		{"", "header"},
		{"Z_kN,extra\n1,2\n", `header "Z_kN,extra" matches no layout`},
		{"Z_kN,Z_kN\n1,2\n", "appears twice"},
		{"Z_kN\n1\nten\n", `line 3: Z_kN = "ten": must be a number`},
		{"Z_kN\n1\nNaN\n", "line 3: Z_kN = NaN: must be finite"},
		{"Z_range_kN,Z_mean_kN,cycles\n-5,1,1\n", "line 2: Z_range_kN = -5: must be ≥ 0"},
		{"Z_range_kN,Z_mean_kN,cycles\n5,1,0\n", "line 2: cycles = 0: must be > 0"},
		{"Z_kN\n1\n2,3\n", "wrong number of fields"},
	}
	for _, c := range cases {
		_, _, err := collect(t, c.text, Tower{Diameter: 4000, Bolts: 100})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want one containing %q", c.text, err, c.want)
		}
	}
	if _, _, err := collect(t, "moment_kNm,normal_force_kN\n1,2\n", Tower{}); err == nil || !strings.Contains(err.Error(), "tower diameter") {
		t.Errorf("tower layout without a tower: error %v", err)
	}
}

// A file without line breaks is refused once a line passes MaxLine,
// after reading little more than that: load files and S–N curves alike.
func TestLongLineRefused(t *testing.T) {
	long := strings.Repeat("1", 10*MaxLine)
	for name, text := range map[string]string{"header": long, "data": "Z_kN\n1\n" + long + "\n"} {
		_, _, err := collect(t, text, Tower{Diameter: 4000, Bolts: 100})
		if err == nil || !strings.Contains(err.Error(), "longer than 65536 bytes") {
			t.Errorf("%s: %v", name, err)
		}
	}
	if _, err := ReadCurve(strings.NewReader("cycles,stress_range_MPa\n"+long), "c"); err == nil || !strings.Contains(err.Error(), "line 2: longer than") {
		t.Errorf("curve: %v", err)
	}
	var b strings.Builder
	b.WriteString("cycles,stress_range_MPa\n")
	for i := range MaxCurvePoints + 1 {
		fmt.Fprintf(&b, "%d,%g\n", 1000+i, 1e4-float64(i)*0.5)
	}
	if _, err := ReadCurve(strings.NewReader(b.String()), "c"); err == nil || !strings.Contains(err.Error(), "more than 10000 points") {
		t.Errorf("curve of too many points: %v", err)
	}
}

// Finite numbers whose segment force or S–N slope overflows are refused
// with the line or point they come from (found by FuzzReadLoads and
// FuzzReadCurve's stricter checks).
func TestOverflowRefused(t *testing.T) {
	for _, text := range []string{"Z_range_kN,Z_mean_kN,cycles\n1,1e308,1\n", "Z_kN\n0\n1e308\n", "moment_kNm,normal_force_kN\n0,0\n1e306,0\n"} {
		_, _, err := collect(t, text, Tower{Diameter: 4000, Bolts: 100})
		if err == nil || !strings.Contains(err.Error(), "must be finite (a number of the line is far too large)") || !strings.Contains(err.Error(), "line ") {
			t.Errorf("%q: %v", text, err)
		}
	}
	_, err := ReadCurve(strings.NewReader("cycles,stress_range_MPa\n1e-300,100\n1e300,50\n"), "c")
	if err == nil || !strings.Contains(err.Error(), "point 1 (N = 1e+300") {
		t.Errorf("curve: %v", err)
	}
}
