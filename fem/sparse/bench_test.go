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

// benchFactor analyses and factorizes the benchmark matrix name with
// ord on workers goroutines (0: all), outside any timing.
func benchFactor(b *testing.B, name string, ord Ordering, workers int) (*Matrix, *Symbolic, *Cholesky) {
	m := benchMatrix(b, name)
	s, err := Analyze(m, ord)
	if err != nil {
		b.Fatal(err)
	}
	c := new(Cholesky)
	c.SetWorkers(workers)
	if err := c.Factorize(s, m); err != nil {
		b.Fatal(err)
	}
	return m, s, c
}

func benchFactorizeWorkers(b *testing.B, name string, ord Ordering, workers int) {
	m, s, c := benchFactor(b, name, ord, workers) // allocates outside the timing
	b.ResetTimer()
	for b.Loop() {
		if err := c.Factorize(s, m); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(s.FactorNNZ())/1e6, "Mnnz(L)")
	b.ReportMetric(s.FactorFlops()*float64(b.N)/b.Elapsed().Seconds()/1e9, "GFlop/s")
	reportMemory(b, c)
}

func benchSolve(b *testing.B, name string, ord Ordering) {
	m, s, c := benchFactor(b, name, ord, 0)
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

// BenchmarkSolvePair measures one solve pair (forward and backward) of the
// float64 factor and of its float32 copy (Cholesky32) with 1 and 2
// workers. At 20k the factor fits in the 32 MiB L3 cache of the benchmark
// machine, which it does not in a Newton iteration, where assembly runs
// between the solves: the "cold" cases stream 64 MiB through the cache
// before each solve (outside the timing).
func BenchmarkSolvePair(b *testing.B) {
	for _, size := range []string{"20k", "200k"} {
		for _, o := range benchOrders {
			for _, cold := range []bool{false, true} {
				if cold && size == "200k" {
					continue // far larger than the cache anyway
				}
				for _, prec := range []string{"float64", "float32"} {
					for _, w := range []int{1, 2} {
						name := fmt.Sprintf("%s/%s/%s/workers=%d", size, o.name, prec, w)
						if cold {
							name = fmt.Sprintf("%s-cold/%s/%s/workers=%d", size, o.name, prec, w)
						}
						b.Run(name, func(b *testing.B) { benchSolvePair(b, size, o.ord, prec, w, cold) })
					}
				}
			}
		}
	}
}

func benchSolvePair(b *testing.B, size string, ord Ordering, prec string, workers int, cold bool) {
	m, s, c := benchFactor(b, size, ord, 0)
	c.SetWorkers(workers)
	solve := c.SolveVecTo
	if prec == "float32" {
		var f Cholesky32
		f.SetWorkers(workers)
		if err := f.Round(c); err != nil {
			b.Fatal(err)
		}
		solve = f.SolveVecTo
	}
	rhs := randVec(m.N(), rand.New(rand.NewPCG(3, 4)))
	x := make([]float64, m.N())
	var flush []float64
	if cold {
		flush = make([]float64, 8<<20)
	}
	b.ResetTimer()
	for b.Loop() {
		if cold {
			b.StopTimer()
			for i := range flush {
				flush[i]++
			}
			b.StartTimer()
		}
		if err := solve(x, rhs); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(s.StoredNNZ())/1e6, "Mstored")
}

// BenchmarkRound measures the rounding of the factor to float32.
func BenchmarkRound(b *testing.B) {
	for _, size := range []string{"20k", "200k"} {
		b.Run(size, func(b *testing.B) {
			_, _, c := benchFactor(b, size, OrderNestedDissection, 0)
			var f Cholesky32
			f.Round(c)
			b.ResetTimer()
			for b.Loop() {
				f.Round(c)
			}
		})
	}
}

// BenchmarkMulVec20k is the product of the 20k matrix with a vector, as
// GMRES takes it at every step: split over two goroutines (split) and on
// one (columns).
func BenchmarkMulVec20k(b *testing.B) {
	m := benchMatrix(b, "20k")
	x, dst := make([]float64, m.n), make([]float64, m.n)
	for i := range x {
		x[i] = 1 + float64(i%7)
	}
	b.Run("split", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			m.MulVecTo(dst, x)
		}
	})
	b.Run("columns", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			clear(dst)
			m.mulColumns(dst, x, 0, m.n, 0)
		}
	})
}
