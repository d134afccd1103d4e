package verify

import (
	"math"
	"testing"
)

// TestCases runs every verification problem; each row carries its
// published source (Row.Source) and its tolerance from CHECKS.md: patch
// test 1e-8, cantilever 1 %, LE1 2 % on the fine mesh, Lamé 0.5 %,
// Kirsch 2 %, every solve's residual below 1e-10.
func TestCases(t *testing.T) {
	for _, c := range Cases() {
		t.Run(c.Name, func(t *testing.T) {
			out, err := c.Run(Options{})
			if err != nil {
				t.Fatal(err)
			}
			if len(out.Rows) == 0 {
				t.Fatal("case produced no rows")
			}
			for _, r := range out.Rows {
				if !r.Pass() {
					t.Errorf("%s: computed %.6g, reference %.6g, error %.3g > tolerance %.3g (source: %s)",
						r.Quantity, r.Computed, r.Reference, r.Error, r.Tolerance, r.Source)
				} else {
					t.Logf("%s: computed %.6g, reference %.6g, error %.3g (source: %s)", r.Quantity, r.Computed, r.Reference, r.Error, r.Source)
				}
			}
		})
	}
}

// A row whose error exceeds its tolerance must fail, and NaN must fail too.
func TestRowPass(t *testing.T) {
	cases := []struct {
		r    Row
		want bool
	}{
		{Row{Error: 0.01, Tolerance: 0.02}, true},
		{Row{Error: 0.03, Tolerance: 0.02}, false},
		{Row{Error: math.NaN(), Tolerance: 0.02}, false},
	}
	for _, c := range cases {
		if got := c.r.Pass(); got != c.want {
			t.Errorf("error %g tolerance %g: Pass() = %v", c.r.Error, c.r.Tolerance, got)
		}
	}
}
