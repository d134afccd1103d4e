package segment

import (
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// BenchmarkDemo runs the analysis of both demo variants (default mesh,
// elastic, 40 increments) one after the other without writing files, for
// the time split; run it with -benchtime 1x. The reported metrics are per
// run of both variants.
func BenchmarkDemo(b *testing.B) {
	for i := 0; i < b.N; i++ {
		iterations, equations := 0, 0
		for _, m := range demoModels() {
			spec, err := modelfile.Decode(m.Data)
			if err != nil {
				b.Fatal(err)
			}
			g, err := buildSegment(spec, spec.Derive())
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
			b.ReportMetric(res.timing.Solve.Seconds(), m.Name+"-solve-s")
			b.ReportMetric(float64(res.timing.Factorizations), m.Name+"-factorizations")
			b.ReportMetric(float64(res.timing.ContactFactorizations), m.Name+"-contact-factorizations")
			b.ReportMetric(float64(res.timing.KrylovSteps), m.Name+"-gmres-steps")
			b.ReportMetric(float64(res.timing.Iterations), m.Name+"-iterations")
		}
		b.ReportMetric(float64(iterations), "newton-iterations")
		b.ReportMetric(float64(equations), "equations")
	}
}

// BenchmarkFailure is the flat demo joint loaded towards failure:
// elastoplastic materials, large deformation, contact, 48 increments to
// 6 mm, no file output. Run it with -benchtime 1x.
func BenchmarkFailure(b *testing.B) {
	benchmarkFailure(b, func(spec *modelfile.Spec) {
		spec.Load.MaxDisplacement, spec.Load.Increments = 6, 48
	})
}

// BenchmarkFailure35k is the speed issue's larger joint: the flat demo
// joint meshed finer (size 5 mm, about 35 000 equations), yielding, large
// deformation, loaded as `demo --to-failure` is (60 increments planned
// to 30 mm) until the bolt ruptures; no file output. Aim: 15 s on 2 cores.
func BenchmarkFailure35k(b *testing.B) {
	benchmarkFailure(b, func(spec *modelfile.Spec) {
		spec.Mesh.Size = 5
		spec.Load.MaxDisplacement, spec.Load.Increments = 30, 60
	})
}

// benchmarkFailure runs the flat demo joint with elastoplastic laws and
// large deformation, as edit sets its mesh and load, and reports where
// the time went.
func benchmarkFailure(b *testing.B, edit func(*modelfile.Spec)) {
	for i := 0; i < b.N; i++ {
		spec, err := modelfile.Decode(demoModels()[0].Data)
		if err != nil {
			b.Fatal(err)
		}
		spec.Analysis.Materials, spec.Analysis.LargeDeformation = modelfile.Elastoplastic, true
		edit(spec)
		g, res := analyseSpec(b, spec)
		tm := res.timing
		b.ReportMetric(float64(res.equation), "equations")
		b.ReportMetric(float64(len(res.rows)-1), "increments")
		b.ReportMetric(float64(tm.Iterations)/float64(len(res.rows)-1), "iterations/increment")
		b.ReportMetric(tm.Assembly.Seconds(), "assembly-s")
		b.ReportMetric(tm.Factorization.Seconds(), "factor-s")
		b.ReportMetric(tm.Solve.Seconds(), "solve-s")
		b.ReportMetric(tm.Contact.Seconds(), "contact-s")
		b.ReportMetric(float64(tm.Factorizations), "factorizations")
		b.ReportMetric(float64(tm.KrylovSteps), "gmres-steps")
		b.ReportMetric(jointFigures(g, res).PeakLoadKN, "peak-kN")
		if i == 0 {
			b.Logf("ending: %s", res.ending)
		}
	}
}
