package sparse

import "testing"

func BenchmarkProfND1(b *testing.B) {
	m := benchMatrix(b, "200k")
	s, _ := Analyze(m, OrderNestedDissection)
	var c Cholesky
	c.SetWorkers(1)
	c.Factorize(s, m)
	b.ResetTimer()
	for b.Loop() {
		c.Factorize(s, m)
	}
}
