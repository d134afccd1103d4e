package sparse

import (
	"fmt"
	"math/rand/v2"
	"sync"
	"testing"
)

// Benchmark matrices: plane-strain Q8 blocks of unit squares, bottom edge
// fixed. 58×58 elements give 20 416 equations, 182×182 give 199 472.
var benchSizes = map[string]int{"20k": 58, "200k": 182}

var benchCache sync.Map // name → *Matrix, so each size is assembled once

func benchMatrix(b *testing.B, name string) *Matrix {
	if m, ok := benchCache.Load(name); ok {
		return m.(*Matrix)
	}
	nx := benchSizes[name]
	m := q8Matrix(b, nx, nx)
	benchCache.Store(name, m)
	return m
}

// reportMemory records the memory that the factorization holds (factor,
// update matrices, workspaces). The peak of the whole process is best read
// from outside, e.g. /usr/bin/time -v on the test binary.
func reportMemory(b *testing.B, c *Cholesky) {
	b.ReportMetric(float64(c.bytes())/(1<<20), "factorMiB")
}

func benchAnalyze(b *testing.B, name string, ord Ordering) {
	m := benchMatrix(b, name)
	var s *Symbolic
	b.ResetTimer()
	for b.Loop() {
		var err error
		if s, err = Analyze(m, ord); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(s.FactorNNZ())/1e6, "Mnnz(L)")
	b.ReportMetric(s.FactorFlops()/1e9, "GFlop")
}

func benchFactorize(b *testing.B, name string, ord Ordering) {
	benchFactorizeWorkers(b, name, ord, 0)
}

func benchFactorizeWorkers(b *testing.B, name string, ord Ordering, workers int) {
	m := benchMatrix(b, name)
	s, err := Analyze(m, ord)
	if err != nil {
		b.Fatal(err)
	}
	var c Cholesky
	c.SetWorkers(workers)
	if err := c.Factorize(s, m); err != nil { // allocate outside the timing
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		if err := c.Factorize(s, m); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(s.FactorNNZ())/1e6, "Mnnz(L)")
	b.ReportMetric(s.FactorFlops()*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFlop/s")
	reportMemory(b, &c)
}

func benchSolve(b *testing.B, name string, ord Ordering) {
	m := benchMatrix(b, name)
	s, err := Analyze(m, ord)
	if err != nil {
		b.Fatal(err)
	}
	var c Cholesky
	if err := c.Factorize(s, m); err != nil {
		b.Fatal(err)
	}
	rhs := randVec(m.N(), rand.New(rand.NewPCG(3, 4)))
	x := make([]float64, m.N())
	b.ResetTimer()
	for b.Loop() {
		if err := c.SolveVecTo(x, rhs); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(s.FactorNNZ())/1e6, "Mnnz(L)")
	b.ReportMetric(4*float64(s.FactorNNZ())*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFlop/s")
}

var benchOrders = []struct {
	name string
	ord  Ordering
}{{"AMD", OrderAMD}, {"ND", OrderNestedDissection}}

func byOrdering(b *testing.B, f func(*testing.B, Ordering)) {
	for _, o := range benchOrders {
		b.Run(o.name, func(b *testing.B) { f(b, o.ord) })
	}
}

func BenchmarkAnalyze20k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchAnalyze(b, "20k", o) })
}
func BenchmarkAnalyze200k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchAnalyze(b, "200k", o) })
}
func BenchmarkFactorize20k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchFactorize(b, "20k", o) })
}
func BenchmarkFactorize200k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchFactorize(b, "200k", o) })
}
func BenchmarkSolve20k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchSolve(b, "20k", o) })
}
func BenchmarkSolve200k(b *testing.B) {
	byOrdering(b, func(b *testing.B, o Ordering) { benchSolve(b, "200k", o) })
}

// BenchmarkFactorizeWorkers200k shows the parallel speed-up (ND ordering).
func BenchmarkFactorizeWorkers200k(b *testing.B) {
	for _, w := range []int{1, 2} {
		b.Run(fmt.Sprintf("workers=%d", w), func(b *testing.B) {
			benchFactorizeWorkers(b, "200k", OrderNestedDissection, w)
		})
	}
}
