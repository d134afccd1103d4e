package handcalc

import "testing"

// Borderline is inclusive at 1 ± margin.
func TestUtilisationStatus(t *testing.T) {
	for _, c := range []struct {
		eta  float64
		want string
	}{
		{0.5, "ok"}, {0.899, "ok"}, {0.9, "borderline"}, {1.0, "borderline"},
		{1.1, "borderline"}, {1.101, "exceeded"}, {2, "exceeded"},
	} {
		if got := UtilisationStatus(c.eta, 0.1); got != c.want {
			t.Errorf("utilisation %g: %q, want %q", c.eta, got, c.want)
		}
	}
}
