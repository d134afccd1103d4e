package handcalc

import (
	"math"
	"strings"
	"testing"

	"flangeseg/material/bolt"
)

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// EN 1993-1-8 Table 3.4 and 3.9.1 for an M36 10.9 (f_ub = 1000 MPa,
// A_s = 816.72 mm²):
// F_t,Rd = 0.9·1000·816.72/1.25 = 588.04 kN; F_p,C = 0.7·1000·816.72 = 571.71 kN.
func TestBoltResistanceEN1993(t *testing.T) {
	th, _ := bolt.CoarseThread("M36")
	g, err := bolt.NominalGrade("10.9")
	if err != nil {
		t.Fatal(err)
	}
	as := th.StressArea()
	if got := TensionResistance(as, g.Fub, 0.9, 1.25); !near(got, 588.04e3, 1e-5) {
		t.Errorf("F_t,Rd = %.1f N, hand 588040", got)
	}
	if got := bolt.DesignPreload(as, g.Fub); !near(got, 571.71e3, 1e-5) {
		t.Errorf("F_p,C = %.1f N, hand 571710", got)
	}
}

func contains(s, sub string) bool { return strings.Contains(s, sub) }
