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
