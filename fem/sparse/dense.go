package sparse

import "math"

// Dense kernels of the numeric factorization. Matrices are row-major; in
// every product the operands are "rows as vectors", C -= A Bᵀ, so the inner
// loops run over contiguous memory. Each entry of C is reduced over p in
// ascending order within fixed blocks of kBlock, whatever the tiling or the
// split among goroutines, so results do not depend on the number of workers.

const (
	kBlock = 256 // depth of a pass over A and B, so the B panel stays in cache
	nBlock = 192 // columns of C per pass
)

// gemmNT computes C[i, j] -= Σ_p A[i, p] B[j, p] for i < m, j < n, p < k.
func gemmNT(m, n, k int, a []float64, lda int, b []float64, ldb int, c []float64, ldc int) {
	for p0 := 0; p0 < k; p0 += kBlock {
		kk := min(kBlock, k-p0)
		for j0 := 0; j0 < n; j0 += nBlock {
			nn := min(nBlock, n-j0)
			tileNT(m, nn, kk, a[p0:], lda, b[j0*ldb+p0:], ldb, c[j0:], ldc)
		}
	}
}

// syrkLowerRows computes C[i, j] -= Σ_p A[i, p] A[j, p] for rows i0 ≤ i < i1
// and j ≤ i (the lower triangle of C restricted to a band of rows).
func syrkLowerRows(i0, i1, k int, a []float64, lda int, c []float64, ldc int) {
	for p0 := 0; p0 < k; p0 += kBlock {
		kk := min(kBlock, k-p0)
		for j0 := 0; j0 < i1; j0 += nBlock {
			j1 := min(j0+nBlock, i1)
			// Rows below the column block form a rectangle; the rows that
			// cross it form a small triangle done tile by tile.
			r0 := max(i0, j0)
			if r0 >= i1 {
				continue
			}
			if full := max(r0, j1); full < i1 {
				tileNT(i1-full, j1-j0, kk, a[full*lda+p0:], lda, a[j0*lda+p0:], lda, c[full*ldc+j0:], ldc)
			}
			for i := r0; i < min(j1, i1); i++ {
				tileNT(1, i-j0+1, kk, a[i*lda+p0:], lda, a[j0*lda+p0:], lda, c[i*ldc+j0:], ldc)
			}
		}
	}
}

// tileNT is the register-blocked core of gemmNT: C -= A Bᵀ with one depth
// block. Two rows of A against four rows of B keep eight sums in registers.
func tileNT(m, n, k int, a []float64, lda int, b []float64, ldb int, c []float64, ldc int) {
	if m <= 0 || n <= 0 || k <= 0 {
		return
	}
	i := 0
	for ; i+2 <= m; i += 2 {
		// Reslicing to len(a0) lets the compiler drop the bounds checks.
		a0 := a[i*lda : i*lda+k]
		a1 := a[(i+1)*lda:][:len(a0)]
		c0 := c[i*ldc : i*ldc+n]
		c1 := c[(i+1)*ldc:][:len(c0)]
		j := 0
		for ; j+4 <= n; j += 4 {
			b0 := b[j*ldb:][:len(a0)]
			b1 := b[(j+1)*ldb:][:len(a0)]
			b2 := b[(j+2)*ldb:][:len(a0)]
			b3 := b[(j+3)*ldb:][:len(a0)]
			var s00, s01, s02, s03, s10, s11, s12, s13 float64
			for p := range a0 {
				x0, x1 := a0[p], a1[p]
				y0, y1, y2, y3 := b0[p], b1[p], b2[p], b3[p]
				s00 += x0 * y0
				s01 += x0 * y1
				s02 += x0 * y2
				s03 += x0 * y3
				s10 += x1 * y0
				s11 += x1 * y1
				s12 += x1 * y2
				s13 += x1 * y3
			}
			c0[j] -= s00
			c0[j+1] -= s01
			c0[j+2] -= s02
			c0[j+3] -= s03
			c1[j] -= s10
			c1[j+1] -= s11
			c1[j+2] -= s12
			c1[j+3] -= s13
		}
		for ; j < n; j++ {
			bj := b[j*ldb:][:len(a0)]
			var s0, s1 float64
			for p := range a0 {
				s0 += a0[p] * bj[p]
				s1 += a1[p] * bj[p]
			}
			c0[j] -= s0
			c1[j] -= s1
		}
	}
	if i < m {
		a0 := a[i*lda : i*lda+k]
		c0 := c[i*ldc : i*ldc+n]
		j := 0
		for ; j+4 <= n; j += 4 {
			b0 := b[j*ldb:][:len(a0)]
			b1 := b[(j+1)*ldb:][:len(a0)]
			b2 := b[(j+2)*ldb:][:len(a0)]
			b3 := b[(j+3)*ldb:][:len(a0)]
			var s0, s1, s2, s3 float64
			for p, x := range a0 {
				s0 += x * b0[p]
				s1 += x * b1[p]
				s2 += x * b2[p]
				s3 += x * b3[p]
			}
			c0[j] -= s0
			c0[j+1] -= s1
			c0[j+2] -= s2
			c0[j+3] -= s3
		}
		for ; j < n; j++ {
			c0[j] -= dot(a0, b[j*ldb:j*ldb+k])
		}
	}
}

func dot(x, y []float64) float64 {
	y = y[:len(x)]
	var s float64
	for p, v := range x {
		s += v * y[p]
	}
	return s
}

// cholDiag factors in place the nb×nb diagonal block at l (stride ld) whose
// rows already hold the updates of all earlier columns. It returns the
// index of the first pivot that fails the test d > tol[j] (or is not finite)
// with its value, or -1.
func cholDiag(nb int, l []float64, ld int, tol []float64) (int, float64) {
	for j := 0; j < nb; j++ {
		rj := l[j*ld : j*ld+j+1]
		d := rj[j] - dot(rj[:j], rj[:j])
		if !(d > tol[j]) || math.IsInf(d, 1) {
			return j, d
		}
		d = math.Sqrt(d)
		rj[j] = d
		inv := 1 / d
		for i := j + 1; i < nb; i++ {
			ri := l[i*ld : i*ld+j+1]
			ri[j] = (ri[j] - dot(ri[:j], rj[:j])) * inv
		}
	}
	return -1, 0
}

// trsmRows solves X Lᵀ = B in place for rows i0 ≤ i < i1 of x (stride ldx,
// nb columns), with L the factored nb×nb block at l (stride ld). Rows go in
// pairs to share the loads of L; each row's arithmetic is that of the
// one-row loop, so results do not depend on the pairing.
func trsmRows(i0, i1, nb int, l []float64, ld int, x []float64, ldx int) {
	i := i0
	for ; i+2 <= i1; i += 2 {
		x0 := x[i*ldx : i*ldx+nb]
		x1 := x[(i+1)*ldx:][:len(x0)]
		for j := range x0 {
			rj := l[j*ld : j*ld+j+1]
			d := rj[j]
			rj = rj[:j]
			a0, a1 := x0[:j], x1[:j]
			var s0, s1 float64
			for p, v := range rj {
				s0 += a0[p] * v
				s1 += a1[p] * v
			}
			x0[j] = (x0[j] - s0) / d
			x1[j] = (x1[j] - s1) / d
		}
	}
	for ; i < i1; i++ {
		xi := x[i*ldx : i*ldx+nb]
		for j := 0; j < nb; j++ {
			rj := l[j*ld : j*ld+j+1]
			xi[j] = (xi[j] - dot(xi[:j], rj[:j])) / rj[j]
		}
	}
}
