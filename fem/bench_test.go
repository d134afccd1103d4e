package fem

import (
	"testing"

	"flangeseg/fem/sparse"
	"flangeseg/material"
	"flangeseg/mesh"
)

// benchBlock is a plane-strain Q8 block of n×n unit elements with its bottom
// edge fixed: n = 58 gives 20 416 equations, n = 183 gives 201 666.
func benchBlock(b *testing.B, n int) *Model {
	b.Helper()
	msh, err := mesh.Rect(0, 0, float64(n), float64(n), n, n, mesh.Region{Name: "block", Thickness: 1, Material: "steel"}, mesh.Quad8)
	if err != nil {
		b.Fatal(err)
	}
	m, err := NewModel(msh, steel, Options{Condition: material.PlaneStrain})
	if err != nil {
		b.Fatal(err)
	}
	for _, d := range []Direction{X, Z} {
		if err := m.FixSet("bottom", d, 0); err != nil {
			b.Fatal(err)
		}
	}
	if err := m.AddTraction("top", 1, -10); err != nil {
		b.Fatal(err)
	}
	m.Number()
	return m
}

var benchSizes = []struct {
	name string
	n    int
}{{"20k", 58}, {"200k", 183}}

// BenchmarkAssemble times one assembly of tangent and internal force on a
// fixed pattern, as a Newton iteration of an elastic model does it (element
// stiffnesses cached after the first).
func BenchmarkAssemble(b *testing.B) {
	for _, bs := range benchSizes {
		b.Run(bs.name, func(b *testing.B) {
			m := benchBlock(b, bs.n)
			a := newAssembler(m)
			k, err := a.pattern()
			if err != nil {
				b.Fatal(err)
			}
			u := make([]float64, m.nDof)
			fint := make([]float64, m.nDof)
			b.ReportMetric(float64(m.nEq), "equations")
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if err := a.assemble(u, fint, k, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAssembleFirst times the first assembly of a model: every
// element evaluated at its Gauss points (this is the cost of an iteration
// once materials are nonlinear; elastic elements are cached after it).
func BenchmarkAssembleFirst(b *testing.B) {
	for _, bs := range benchSizes {
		b.Run(bs.name, func(b *testing.B) {
			m := benchBlock(b, bs.n)
			k, err := newAssembler(m).pattern()
			if err != nil {
				b.Fatal(err)
			}
			u := make([]float64, m.nDof)
			fint := make([]float64, m.nDof)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				a := newAssembler(m)
				if err := a.assemble(u, fint, k, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkPattern times building the sparsity pattern (once per model).
func BenchmarkPattern(b *testing.B) {
	for _, bs := range benchSizes {
		b.Run(bs.name, func(b *testing.B) {
			m := benchBlock(b, bs.n)
			a := newAssembler(m)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if _, err := a.pattern(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkSolveLinear times a whole linear solve: pattern, assembly,
// ordering, factorization, solve and the residual check.
func BenchmarkSolveLinear(b *testing.B) {
	for _, bs := range benchSizes {
		b.Run(bs.name, func(b *testing.B) {
			m := benchBlock(b, bs.n)
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				sol, err := m.SolveLinear(LinearOptions{Ordering: sparse.OrderAMD})
				if err != nil {
					b.Fatal(err)
				}
				if i == 0 {
					b.ReportMetric(float64(sol.FactorNonzeros), "factor-nnz")
				}
			}
		})
	}
}

// Flops per integration point of the element routines, counted from the
// code (each +, −, ×, ÷ and √ of float64 one flop; math.Log1p 28, its main
// path; comparisons, conversions, loads and stores none) for a Q8 element
// in plane stress, 3×3 points, geometry cached, at the states of
// BenchmarkElementPoint:
//
//	finite strain (FiniteStrain.strain, point and pairs, logStrain):
//	  F − I (deformationAt)                                     80
//	  validity 6, Green–Lagrange strain 18                      24
//	  logStrain.evaluate without ψ: m, a, b, q, 1/det 9, ℓ and its
//	    derivatives 19 + Log1p 28, φ and its derivatives 45, E 8
//	    (E_yy's Log1p of 0 costs nothing), gradients 30,
//	    Jacobian 6, J_yy 3                                     148
//	  ψ series, 8 flops a term, 7–8 terms at these strains
//	    (s ≈ 1e-3)                                              60
//	  pull-back 16, w·S 4, F diagonal 2                         22
//	  B and internal force, 22 a node                          176
//	  tangent: D·J 45, Jᵀ·D·J 30, curvature 65, sum 6,
//	    times w (the 9 in-plane entries B uses) 9              155
//	  w·D·B, 8 nodes × 2 columns × 3 rows × 5                  240
//	  node-pair pass (w·BᵀDB and the geometric stiffness):
//	    7 a node, 23 a diagonal block, 29 an off-diagonal one
//	    (8 × 7 + 8 × 23 + 28 × 29)                            1052
//	  eigenstrain subtraction                                    4
//	  kernel total                                            1961
//
//	small strain (SmallStrain.strain, point and pairs):
//	  strain 64, eigenstrain 4, w·σ 4, internal force 64, w·D (the
//	  9 in-plane entries B uses) 9, w·D·B 144, node pairs
//	  (8 × 12 + 28 × 16) 544                                   833
//
//	laws (package material), per point:
//	  Hooke's law in plane stress (Tangent and the product)     40
//	  J2 plane-stress return while yielding (respondPlaneStress,
//	  planeStressConsistency; the elastic constants come from
//	  NewJ2): elastic trial strain 3, modes 6, α, β and their
//	  products with the rates 9, σ_y(ε̄_n) 3, elastic test 2;
//	  the consistency condition: segment 3, 3 evaluations at
//	  Δγ = 0 and at the two Newton iterates (1/q and its
//	  derivative 25, segment end 4, ρ 6, ρ′ 4, step 2, stopping
//	  test 5 but in the first: 41 + 46 + 46); 1/p, 1/r and the
//	  stress 15, Ξ 8, flow direction 7, q 9, state 17, consistent
//	  tangent 39, damage 2                                     256
//	  (the previous return, Newton on q − σ_y: 470, with 5
//	  evaluations of 52)
const (
	flopsFiniteKernel = 1961
	flopsSmallKernel  = 833
	flopsHooke        = 40
	flopsJ2Yielding   = 256
)

// BenchmarkElementPoint times one Q8 element's internal force and tangent
// (3×3 points, plane stress as in the flange-segment models, no
// allocation) and reports the time per integration point, the flops a
// point takes (counted above) and the rate that makes; compare it with
// BenchmarkFlopRate. The yielding states are about 2 % strain, past the
// yield strain of the J2 law (0.17 %), from a virgin state at every call.
func BenchmarkElementPoint(b *testing.B) {
	laws := kernelLaws(b)
	cases := []struct {
		name  string
		kin   Kinematics
		law   material.Law
		flops float64
	}{
		{"finite-strain/elastic", FiniteStrain{}, laws[0], flopsFiniteKernel + flopsHooke},
		{"finite-strain/yielding", FiniteStrain{}, laws[1], flopsFiniteKernel + flopsJ2Yielding},
		{"small-strain/elastic", SmallStrain{}, laws[0], flopsSmallKernel + flopsHooke},
		{"small-strain/yielding", SmallStrain{}, laws[1], flopsSmallKernel + flopsJ2Yielding},
	}
	for _, tc := range cases {
		b.Run(tc.name, func(b *testing.B) {
			msh, err := mesh.Rect(2, 0, 12, 8, 1, 1, mesh.Region{Name: "block", Thickness: 3, Material: "steel"}, mesh.Quad8)
			if err != nil {
				b.Fatal(err)
			}
			m, err := NewModel(msh, map[string]material.Law{"steel": tc.law}, Options{Condition: material.PlaneStress, Kinematics: tc.kin})
			if err != nil {
				b.Fatal(err)
			}
			m.cacheGeometry()
			u := elementDisplacements(m, imposed([2][2]float64{{1.02, 0.01}, {-0.005, 0.99}}, 0.001))
			fe, ke := make([]float64, len(u)), make([]float64, len(u)*len(u))
			sc := newScratch()
			b.ResetTimer()
			for i := 0; i < b.N; i++ {
				if err := m.elementResponse(0, u, fe, ke, nil, sc); err != nil {
					b.Fatal(err)
				}
			}
			points := float64(b.N * len(m.rule))
			ns := float64(b.Elapsed().Nanoseconds())
			b.ReportMetric(ns/points, "ns/point")
			b.ReportMetric(tc.flops, "flops/point")
			b.ReportMetric(tc.flops*points/ns, "Gflop/s")
		})
	}
}

// BenchmarkFlopRate measures this machine's rate at scalar floating-point
// work in plain Go (no assembly, no SIMD; on amd64 the compiler emits a
// separate multiply and add for a*b + c), the yardstick of
// BenchmarkElementPoint:
//
//   - block: the rank-3 update of the upper triangle of a 16 × 16 block,
//     k_ij += x_i·y_j + x'_i·y'_j + x"_i·y"_j, all in the first-level
//     cache: the shape of the node-pair pass of a Q8 element, 136 entries
//     × 6 flops;
//   - chains: 12 independent multiply-add chains in registers, the most
//     scalar code can do (no loads or stores).
func BenchmarkFlopRate(b *testing.B) {
	b.Run("block", func(b *testing.B) {
		var k [16 * 16]float64
		var x [6][16]float64
		for r := range x {
			for j := range x[r] {
				x[r][j] = 1e-3 * float64(1+r+j)
			}
		}
		b.ResetTimer()
		for i := 0; i < b.N; i++ {
			rankThreeUpper(&k, &x)
		}
		b.ReportMetric(136*6*float64(b.N)/float64(b.Elapsed().Nanoseconds()), "Gflop/s")
		sink = k[17]
	})
	b.Run("chains", func(b *testing.B) {
		a0, a1, a2, a3, a4, a5 := 1.0, 2.0, 3.0, 4.0, 5.0, 6.0
		a6, a7, a8, a9, a10, a11 := 7.0, 8.0, 9.0, 10.0, 11.0, 12.0
		c, d := 0.999999, 1e-7
		b.ResetTimer()
		for i := 0; i < b.N; i++ {
			for r := 0; r < 64; r++ {
				a0, a1, a2, a3 = a0*c+d, a1*c+d, a2*c+d, a3*c+d
				a4, a5, a6, a7 = a4*c+d, a5*c+d, a6*c+d, a7*c+d
				a8, a9, a10, a11 = a8*c+d, a9*c+d, a10*c+d, a11*c+d
			}
		}
		b.ReportMetric(64*12*2*float64(b.N)/float64(b.Elapsed().Nanoseconds()), "Gflop/s")
		sink = a0 + a1 + a2 + a3 + a4 + a5 + a6 + a7 + a8 + a9 + a10 + a11
	})
}

// sink keeps the benchmarks' results alive.
var sink float64

// rankThreeUpper adds x0·y0ᵀ + x1·y1ᵀ + x2·y2ᵀ (x = rows 0–2, y = rows
// 3–5) to the upper triangle of k.
func rankThreeUpper(k *[16 * 16]float64, x *[6][16]float64) {
	x0, x1, x2, y0, y1, y2 := &x[0], &x[1], &x[2], &x[3], &x[4], &x[5]
	for i := 0; i < 16; i++ {
		a0, a1, a2 := x0[i], x1[i], x2[i]
		row := k[i*16 : i*16+16]
		for j := i; j < 16; j++ {
			row[j] += a0*y0[j] + a1*y1[j] + a2*y2[j]
		}
	}
}
