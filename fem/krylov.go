package fem

import (
	"errors"
	"math"
	"slices"
)

// gmres solves A·x = b by restarted GMRES with right preconditioning,
// keeping the preconditioned vectors z_j = M⁻¹·v_j so that the update
// x += Z·y needs no further application of M⁻¹ (the flexible variant,
// Saad 2003, Iterative Methods for Sparse Linear Systems, 2nd ed.,
// algorithm 9.6): mulA computes A·v, precond M⁻¹·v. From x = 0 its first
// step is x = M⁻¹·b scaled optimally, so with A = M it returns after one
// step. It stops when the residual norm (the Givens estimate, exact in
// exact arithmetic) is at most tol·‖b‖ or after maxSteps steps, and
// returns the steps taken, each one application of M⁻¹ and one of A, and
// the relative residual reached.
//
// The Newton solver uses it when sliding friction makes the tangent
// unsymmetric, with M the factorized symmetric part, and when it keeps
// the factorization of an earlier tangent.
func gmres(mulA, precond func(dst, v []float64) error, b, x []float64, tol float64, restart, maxSteps int) (int, float64, error) {
	n := len(b)
	clear(x)
	bnorm := norm(b)
	if bnorm == 0 {
		return 0, 0, nil
	}
	r := slices.Clone(b)
	w := make([]float64, n)
	v := make([][]float64, restart+1)
	z := make([][]float64, restart)
	for i := range v {
		v[i] = make([]float64, n)
	}
	for i := range z {
		z[i] = make([]float64, n)
	}
	h := make([][]float64, restart+1) // Hessenberg, h[i][j]
	for i := range h {
		h[i] = make([]float64, restart)
	}
	cs, sn, g, y := make([]float64, restart), make([]float64, restart), make([]float64, restart+1), make([]float64, restart)
	steps, rel := 0, 1.0
	for {
		beta := norm(r)
		rel = beta / bnorm
		if rel <= tol || steps >= maxSteps {
			return steps, rel, nil
		}
		for i := range r {
			v[0][i] = r[i] / beta
		}
		clear(g)
		g[0] = beta
		k := 0
		for k < restart && steps < maxSteps {
			steps++
			if err := precond(z[k], v[k]); err != nil {
				return steps, rel, err
			}
			if err := mulA(w, z[k]); err != nil {
				return steps, rel, err
			}
			for i := 0; i <= k; i++ { // modified Gram–Schmidt
				h[i][k] = dot(w, v[i])
				axpyVec(w, -h[i][k], v[i])
			}
			h[k+1][k] = norm(w)
			if h[k+1][k] > 0 {
				for i := range w {
					v[k+1][i] = w[i] / h[k+1][k]
				}
			}
			for i := 0; i < k; i++ { // earlier rotations
				a, c := h[i][k], h[i+1][k]
				h[i][k], h[i+1][k] = cs[i]*a+sn[i]*c, -sn[i]*a+cs[i]*c
			}
			d := math.Hypot(h[k][k], h[k+1][k])
			if d == 0 {
				return steps, rel, errors.New("fem: GMRES breakdown (singular operator)")
			}
			cs[k], sn[k] = h[k][k]/d, h[k+1][k]/d
			h[k][k], h[k+1][k] = d, 0
			g[k+1] = -sn[k] * g[k]
			g[k] *= cs[k]
			k++
			if math.Abs(g[k])/bnorm <= tol {
				break
			}
		}
		// y = H⁻¹·g over the first k columns; x += Z·y
		for i := k - 1; i >= 0; i-- {
			s := g[i]
			for j := i + 1; j < k; j++ {
				s -= h[i][j] * y[j]
			}
			y[i] = s / h[i][i]
		}
		for j := 0; j < k; j++ {
			axpyVec(x, y[j], z[j])
		}
		if math.Abs(g[k])/bnorm <= tol || steps >= maxSteps {
			return steps, math.Abs(g[k]) / bnorm, nil
		}
		// restart from the true residual
		if err := mulA(w, x); err != nil {
			return steps, rel, err
		}
		for i := range r {
			r[i] = b[i] - w[i]
		}
	}
}

func dot(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

func axpyVec(y []float64, a float64, x []float64) {
	for i := range y {
		y[i] += a * x[i]
	}
}
