package fem

import (
	"errors"
	"math"
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
	var ws krylovSpace
	return ws.gmres(mulA, precond, b, x, tol, restart, maxSteps)
}

// krylovSpace holds the vectors of gmres between calls, so that Newton
// iterations, which call it every time, do not allocate restart + 1
// vectors of the system's size each.
type krylovSpace struct {
	r, w         []float64
	v, z, h      [][]float64
	cs, sn, g, y []float64
}

// vectors returns count slices of length n from *set, growing it as needed.
func vectors(set *[][]float64, count, n int) [][]float64 {
	for len(*set) < count {
		*set = append(*set, nil)
	}
	for i := 0; i < count; i++ {
		if cap((*set)[i]) < n {
			(*set)[i] = make([]float64, n)
		}
		(*set)[i] = (*set)[i][:n]
	}
	return (*set)[:count]
}

func grow(v []float64, n int) []float64 {
	if cap(v) < n {
		return make([]float64, n)
	}
	return v[:n]
}

// gmres is gmres with the workspace's vectors.
func (ws *krylovSpace) gmres(mulA, precond func(dst, v []float64) error, b, x []float64, tol float64, restart, maxSteps int) (int, float64, error) {
	n := len(b)
	clear(x)
	bnorm := norm(b)
	if bnorm == 0 {
		return 0, 0, nil
	}
	ws.r, ws.w = grow(ws.r, n), grow(ws.w, n)
	r, w := ws.r, ws.w
	copy(r, b)
	v := vectors(&ws.v, restart+1, n)
	z := vectors(&ws.z, restart, n)
	h := vectors(&ws.h, restart+1, restart) // Hessenberg, h[i][j]
	for i := range h {
		clear(h[i])
	}
	ws.cs, ws.sn, ws.g, ws.y = grow(ws.cs, restart), grow(ws.sn, restart), grow(ws.g, restart+1), grow(ws.y, restart)
	cs, sn, g, y := ws.cs, ws.sn, ws.g, ws.y
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
