package fem

import (
	"math"
	"testing"
)

// TestTouchLimit: a preload step stops a twentieth past the strain at
// which the first open point touches, extrapolated linearly from two
// states, and only then.
func TestTouchLimit(t *testing.T) {
	inf := math.Inf(1)
	cases := []struct {
		name   string
		g0, g1 []float64 // gaps at e0 = 0 and e1 = −0.1
		next   float64
		want   float64
	}{
		{"closing point passed", []float64{1, 2}, []float64{0.5, 1.9}, -0.5, -0.205},
		{"the nearest touch rules", []float64{1, 0.4}, []float64{0.5, 0.3}, -0.5, -0.205},
		{"step short of the touch", []float64{1}, []float64{0.5}, -0.15, -0.15},
		{"point already touching", []float64{0.2, 1}, []float64{0.0005, 1}, -0.5, -0.5},
		{"point facing nothing", []float64{inf, 1}, []float64{0.1, inf}, -0.5, -0.5},
		{"opening point", []float64{0.5}, []float64{1}, -0.5, -0.5},
		{"unloading step", []float64{1}, []float64{0.5}, 0.2, 0.2},
		{"gaps of another surface", []float64{1, 1}, []float64{0.5}, -0.5, -0.5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := touchLimit(0, -0.1, c.next, c.g0, c.g1); math.Abs(got-c.want) > 1e-12 {
				t.Errorf("touchLimit = %.6g, want %.6g", got, c.want)
			}
		})
	}
}
