package main

import "testing"

// BenchmarkDemo runs the analysis of both demo variants (default mesh,
// elastic, 40 increments) without writing files; run it with
// -benchtime 1x. The reported metrics are per run of both variants.
func BenchmarkDemo(b *testing.B) {
	for i := 0; i < b.N; i++ {
		iterations, equations := 0, 0
		for _, m := range demoModels() {
			spec, err := decodeSpec(m.Data)
			if err != nil {
				b.Fatal(err)
			}
			g, err := buildSegment(spec, spec.derive())
			if err != nil {
				b.Fatal(err)
			}
			res, err := g.analyse(analyseOptions{})
			if err != nil || res.failure != nil {
				b.Fatal(err, res.failure)
			}
			iterations += res.timing.Iterations
			equations = max(equations, res.equation)
			b.ReportMetric(res.timing.Factorization.Seconds(), m.Name+"-factor-s")
			b.ReportMetric(res.timing.Assembly.Seconds(), m.Name+"-assembly-s")
			b.ReportMetric(res.timing.Contact.Seconds(), m.Name+"-contact-s")
		}
		b.ReportMetric(float64(iterations), "newton-iterations")
		b.ReportMetric(float64(equations), "equations")
	}
}
