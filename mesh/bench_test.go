package mesh

import "testing"

// benchPlan is the L-shaped plan with about 10⁵ Quad8 nodes.
func benchPlan() Plan { return lPlan(160, 120, 160) }

func BenchmarkBuildQuad8(b *testing.B) {
	p := benchPlan()
	for b.Loop() {
		if _, err := Build(p, Quad8); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBuildQuad8Curved(b *testing.B) {
	p := annulusPlan(100, 200, 100, 300)
	for b.Loop() {
		if _, err := Build(p, Quad8); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCheckQuad8(b *testing.B) {
	m, err := Build(benchPlan(), Quad8)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if err := m.Check(); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(m.Nodes)), "nodes")
}

func BenchmarkQualityQuad8(b *testing.B) {
	m, err := Build(benchPlan(), Quad8)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		m.Quality()
	}
}

// BenchmarkBuildFlangeSegment builds the demo-like segment with a neck
// fillet in Quad8 elements (about 12 700 nodes).
func BenchmarkBuildFlangeSegment(b *testing.B) {
	g := demoSegment(20, Quad8)
	for b.Loop() {
		if _, err := BuildFlangeSegment(g, demoMaterials); err != nil {
			b.Fatal(err)
		}
	}
}
