package bolt

import (
	"math"
	"strings"
	"testing"
)

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// ISO 898-1 tabulates the stress areas rounded to 1 mm²; the formula must
// reproduce them to that rounding.
func TestStressAreaISO898(t *testing.T) {
	cases := []struct {
		size      string
		hand, iso float64 // worked out below; ISO 898-1 table value
	}{
		// M36, P = 4: d₂ = 36 − 0.6495·4 = 33.402, d₃ = 36 − 1.2269·4 = 31.092,
		// mean 32.247, A_s = π/4·32.247² = 816.7 mm².
		{"M36", 816.7, 817},
		// M30, P = 3.5: d₂ = 27.727, d₃ = 25.706, mean 26.716, A_s = 560.6 mm².
		{"M30", 560.6, 561},
		// M48, P = 5: d₂ = 44.752, d₃ = 41.866, mean 43.309, A_s = 1473.1 mm².
		{"M48", 1473.1, 1473},
		// M64, P = 6: d₂ = 60.103, d₃ = 56.639, mean 58.371, A_s = 2676.0 mm².
		{"M64", 2676.0, 2676},
	}
	for _, c := range cases {
		th, err := CoarseThread(c.size)
		if err != nil {
			t.Fatal(err)
		}
		as := th.StressArea()
		if !near(as, c.hand, 1e-4) {
			t.Errorf("%s: A_s = %.2f mm², hand %.1f", c.size, as, c.hand)
		}
		if math.Abs(as-c.iso) > 0.5 {
			t.Errorf("%s: A_s = %.2f mm², ISO 898-1 %.0f", c.size, as, c.iso)
		}
	}
}

// ISO 261 coarse pitches of the sizes CHECKS.md lists.
func TestCoarsePitchISO261(t *testing.T) {
	want := map[string]float64{"M12": 1.75, "M16": 2, "M20": 2.5, "M24": 3, "M27": 3, "M30": 3.5,
		"M36": 4, "M42": 4.5, "M48": 5, "M56": 5.5, "M64": 6, "M72": 6}
	for size, p := range want {
		th, err := CoarseThread(size)
		if err != nil || th.Pitch != p {
			t.Errorf("%s: pitch %g, %v; ISO 261 %g", size, th.Pitch, err, p)
		}
	}
	for _, size := range CoarseSizes() {
		if _, err := CoarseThread(size); err != nil {
			t.Errorf("listed size %s: %v", size, err)
		}
	}
	for _, bad := range []string{"", "36", "M37", "M8", "M80", "Mx", "m36"} {
		if _, err := CoarseThread(bad); err == nil {
			t.Errorf("CoarseThread(%q): want an error", bad)
		}
	}
}

// EN 1993-1-8 3.9.1 for an M36 10.9 (f_ub = 1000 MPa, A_s = 816.72 mm²):
// F_p,C = 0.7·1000·816.72 = 571.71 kN.
func TestDesignPreloadEN1993(t *testing.T) {
	th, _ := CoarseThread("M36")
	g, err := NominalGrade("10.9")
	if err != nil {
		t.Fatal(err)
	}
	if got := DesignPreload(th.StressArea(), g.Fub); !near(got, 571.71e3, 1e-5) {
		t.Errorf("F_p,C = %.1f N, hand 571710", got)
	}
}

func TestGrades(t *testing.T) {
	cases := []struct {
		name     string
		d        float64
		nom, min [2]float64 // f_yb, f_ub
	}{
		// EN 1993-1-8 Table 3.1; ISO 898-1 minimum values (from memory, CHECKS.md).
		{"8.8", 12, [2]float64{640, 800}, [2]float64{640, 800}},
		{"8.8", 36, [2]float64{640, 800}, [2]float64{660, 830}},
		{"10.9", 36, [2]float64{900, 1000}, [2]float64{940, 1040}},
		{"12.9", 36, [2]float64{1080, 1200}, [2]float64{1100, 1220}},
	}
	for _, c := range cases {
		n, err := NominalGrade(c.name)
		if err != nil || n.Fyb != c.nom[0] || n.Fub != c.nom[1] {
			t.Errorf("nominal %s: %+v, %v", c.name, n, err)
		}
		m, err := MinimumGrade(c.name, c.d)
		if err != nil || m.Fyb != c.min[0] || m.Fub != c.min[1] {
			t.Errorf("minimum %s d=%g: %+v, %v", c.name, c.d, m, err)
		}
	}
	if _, err := NominalGrade("4.6"); err == nil || !strings.Contains(err.Error(), "4.6") {
		t.Errorf("NominalGrade(4.6): %v", err)
	}
}

// The elongation after fracture of ISO 898-1 (from memory) that the bolt
// curves of package material use.
func TestMinimumElongation(t *testing.T) {
	want := map[string]float64{"8.8": 0.12, "10.9": 0.09, "12.9": 0.08}
	for _, c := range Classes() {
		if a, err := MinimumElongation(c); err != nil || a != want[c] {
			t.Errorf("MinimumElongation(%s) = %g, %v; want %g", c, a, err, want[c])
		}
	}
	if _, err := MinimumElongation("4.6"); err == nil {
		t.Error("MinimumElongation(4.6): want an error")
	}
}
