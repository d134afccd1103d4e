package sparse

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// q8Stiffness returns the 16×16 plane-strain stiffness of a unit-square
// 8-node serendipity quadrilateral (unit thickness), integrated with 3×3
// Gauss points. Nodes: corners counter-clockwise from (0,0), then the
// midsides of the bottom, right, top and left edges; dofs (u_x, u_z) per node.
func q8Stiffness(e, nu float64) []float64 {
	c := e / ((1 + nu) * (1 - 2*nu))
	d := [3][3]float64{{c * (1 - nu), c * nu, 0}, {c * nu, c * (1 - nu), 0}, {0, 0, c * (1 - 2*nu) / 2}}
	xi := [8]float64{-1, 1, 1, -1, 0, 1, 0, -1}
	eta := [8]float64{-1, -1, 1, 1, -1, 0, 1, 0}
	g := math.Sqrt(0.6)
	pts := [3]float64{-g, 0, g}
	wts := [3]float64{5.0 / 9, 8.0 / 9, 5.0 / 9}
	k := make([]float64, 16*16)
	for a, s := range pts {
		for b, t := range pts {
			var dx, dz [8]float64 // derivatives in x, z; x = (ξ+1)/2, so d/dx = 2 d/dξ
			for i := 0; i < 8; i++ {
				var dxi, deta float64
				switch {
				case xi[i] == 0:
					dxi = -s * (1 + t*eta[i])
					deta = 0.5 * (1 - s*s) * eta[i]
				case eta[i] == 0:
					dxi = 0.5 * xi[i] * (1 - t*t)
					deta = -t * (1 + s*xi[i])
				default:
					dxi = 0.25 * xi[i] * (1 + t*eta[i]) * (2*s*xi[i] + t*eta[i])
					deta = 0.25 * eta[i] * (1 + s*xi[i]) * (s*xi[i] + 2*t*eta[i])
				}
				dx[i], dz[i] = 2*dxi, 2*deta
			}
			var bm [3][16]float64
			for i := 0; i < 8; i++ {
				bm[0][2*i] = dx[i]
				bm[1][2*i+1] = dz[i]
				bm[2][2*i] = dz[i]
				bm[2][2*i+1] = dx[i]
			}
			w := wts[a] * wts[b] * 0.25 // det J = 1/4
			for p := 0; p < 16; p++ {
				var db [3]float64
				for r := 0; r < 3; r++ {
					db[r] = d[r][0]*bm[0][p] + d[r][1]*bm[1][p] + d[r][2]*bm[2][p]
				}
				for q := 0; q < 16; q++ {
					k[q*16+p] += w * (bm[0][q]*db[0] + bm[1][q]*db[1] + bm[2][q]*db[2])
				}
			}
		}
	}
	return k
}

// q8Mesh returns the equation numbers of each element of an nx×nz block of
// unit-square Q8 elements with the bottom edge fixed (its dofs removed, -1),
// and the number of equations: 2·nz·(3nx+2).
func q8Mesh(nx, nz int) ([][]int, int) {
	bottom := 2*nx + 1 // nodes of the fixed bottom row come first
	var groups [][]int
	for e := 0; e < nx*nz; e++ {
		g := make([]int, 16)
		for i, nd := range q8Nodes(nx, e) {
			g[2*i], g[2*i+1] = -1, -1
			if nd >= bottom {
				g[2*i], g[2*i+1] = 2*(nd-bottom), 2*(nd-bottom)+1
			}
		}
		groups = append(groups, g)
	}
	return groups, 2 * nz * (3*nx + 2)
}

// q8Matrix assembles the stiffness of an nx×nz Q8 block (E = 210000 MPa,
// ν = 0.3, plane strain) through NewPattern and AddDense; extra groups
// widen the pattern only (their entries stay zero).
func q8Matrix(tb testing.TB, nx, nz int, extra ...[]int) *Matrix {
	tb.Helper()
	groups, n := q8Mesh(nx, nz)
	m, err := NewPattern(n, append(slices.Clone(groups), extra...))
	if err != nil {
		tb.Fatal(err)
	}
	ke := q8Stiffness(210000, 0.3)
	for _, g := range groups {
		if err := m.AddDense(g, ke); err != nil {
			tb.Fatal(err)
		}
	}
	return m
}

// randomSPD returns a random sparse symmetric matrix with about perCol
// off-diagonal entries per column, made strictly diagonally dominant (so
// positive definite and well conditioned).
func randomSPD(n, perCol int, rnd *rand.Rand) *Matrix {
	t := NewTriplets(n, n*(perCol+1))
	rowSum := make([]float64, n)
	for j := 0; j < n; j++ {
		for e := 0; e < perCol; e++ {
			i := rnd.IntN(n)
			if i == j {
				continue
			}
			v := rnd.Float64()*2 - 1
			t.Add(i, j, v)
			rowSum[i] += math.Abs(v)
			rowSum[j] += math.Abs(v)
		}
	}
	for i := 0; i < n; i++ {
		t.Add(i, i, rowSum[i]+1+rnd.Float64())
	}
	return t.Matrix()
}

// dense returns m as a full gonum matrix.
func dense(m *Matrix) *mat.SymDense {
	d := mat.NewSymDense(m.n, nil)
	for j := 0; j < m.n; j++ {
		for p := m.colPtr[j]; p < m.colPtr[j+1]; p++ {
			d.SetSym(int(m.rowIdx[p]), j, m.val[p])
		}
	}
	return d
}

func randVec(n int, rnd *rand.Rand) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = rnd.Float64()*2 - 1
	}
	return v
}

// relResidual returns ‖A x − b‖ / ‖b‖.
func relResidual(m *Matrix, x, b []float64) float64 {
	r := make([]float64, len(b))
	m.MulVecTo(r, x)
	var num, den float64
	for i := range r {
		num += (r[i] - b[i]) * (r[i] - b[i])
		den += b[i] * b[i]
	}
	return math.Sqrt(num / den)
}

// factorSolve analyses, factors and solves m x = b.
func factorSolve(tb testing.TB, m *Matrix, ord Ordering, workers int, b []float64) []float64 {
	tb.Helper()
	s, err := Analyze(m, ord)
	if err != nil {
		tb.Fatal(err)
	}
	var c Cholesky
	c.SetWorkers(workers)
	if err := c.Factorize(s, m); err != nil {
		tb.Fatal(err)
	}
	x := make([]float64, len(b))
	if err := c.SolveVecTo(x, b); err != nil {
		tb.Fatal(err)
	}
	return x
}
