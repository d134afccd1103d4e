package fem

import (
	"math"
	"testing"
)

// TestGMRES: an unsymmetric system A = M + C with M symmetric positive
// definite, solved with M⁻¹ as preconditioner, against the residual it
// leaves; with C = 0 one step (one application of M⁻¹) solves it.
func TestGMRES(t *testing.T) {
	const n = 12
	m := make([]float64, n*n)
	c := make([]float64, n*n)
	for i := 0; i < n; i++ {
		m[i*n+i] = 4
		if i > 0 {
			m[i*n+i-1], m[(i-1)*n+i] = -1, -1
		}
		if i+2 < n {
			c[i*n+i+2] = 0.8 // a strong one-sided coupling
		}
	}
	mul := func(a []float64) func(dst, v []float64) error {
		return func(dst, v []float64) error {
			for i := range dst {
				dst[i] = 0
				for j := range v {
					dst[i] += a[i*n+j] * v[j]
				}
			}
			return nil
		}
	}
	// M⁻¹ by Gauss–Seidel sweeps to convergence: exact for the test.
	precond := func(dst, v []float64) error {
		clear(dst)
		for sweep := 0; sweep < 400; sweep++ {
			for i := 0; i < n; i++ {
				s := v[i]
				for j := 0; j < n; j++ {
					if j != i {
						s -= m[i*n+j] * dst[j]
					}
				}
				dst[i] = s / m[i*n+i]
			}
		}
		return nil
	}
	b := make([]float64, n)
	for i := range b {
		b[i] = math.Sin(float64(i + 1))
	}
	a := make([]float64, n*n)
	for i := range a {
		a[i] = m[i] + c[i]
	}
	for _, tc := range []struct {
		name     string
		op       []float64
		maxSteps int
	}{
		{"symmetric: preconditioner alone", m, 1},
		{"unsymmetric", a, 40},
		{"unsymmetric, restarted", a, 40},
	} {
		t.Run(tc.name, func(t *testing.T) {
			x := make([]float64, n)
			restart := 30
			if tc.name == "unsymmetric, restarted" {
				restart = 3
			}
			steps, rel, err := gmres(mul(tc.op), precond, b, x, 1e-10, restart, tc.maxSteps)
			if err != nil {
				t.Fatal(err)
			}
			r := make([]float64, n)
			_ = mul(tc.op)(r, x)
			res := 0.0
			for i := range r {
				res += (b[i] - r[i]) * (b[i] - r[i])
			}
			if tc.maxSteps == 1 && steps != 1 {
				t.Errorf("%d steps, want 1", steps)
			}
			if got := math.Sqrt(res) / norm(b); got > 1e-9 || math.Abs(got-rel) > 1e-9 {
				t.Errorf("after %d steps: residual %g (reported %g), want ≤ 1e-9", steps, got, rel)
			}
		})
	}
}
