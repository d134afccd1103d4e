package post

import (
	"io"
	"os"
	"path/filepath"
	"testing"

	"flangeseg/mesh"
)

// benchState is a Quad8 grid of about 10⁵ points with a displacement and
// five scalar point fields and one cell field, as a solver state writes.
func benchState(b *testing.B) (Grid, []Field, []Field) {
	m, err := mesh.Rect(0, 0, 330, 225, 220, 150, mesh.Region{Name: "plate", Thickness: 1}, mesh.Quad8)
	if err != nil {
		b.Fatal(err)
	}
	g := GridFromMesh(m)
	np := len(g.Points)
	disp := make([]float64, 2*np)
	for i, p := range g.Points {
		disp[2*i], disp[2*i+1] = 1e-3*p.X/3, -2e-4*p.Z/7
	}
	point := []Field{{"displacement", 2, disp}}
	for _, name := range []string{"stress_xx", "stress_zz", "stress_yy", "stress_xz", "von_mises"} {
		v := make([]float64, np)
		for i, p := range g.Points {
			v[i] = 355 * p.X / (p.Z + 17)
		}
		point = append(point, Field{name, 1, v})
	}
	return g, point, []Field{RegionField(m)}
}

func BenchmarkEncodeVTU(b *testing.B) {
	g, point, cell := benchState(b)
	for b.Loop() {
		if err := EncodeVTU(io.Discard, g, point, cell); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(g.Points)), "points")
}

func BenchmarkWriteVTU(b *testing.B) {
	g, point, cell := benchState(b)
	path := filepath.Join(b.TempDir(), "state.vtu")
	for b.Loop() {
		if err := WriteVTU(path, g, point, cell); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(g.Points)), "points")
	if info, err := os.Stat(path); err == nil {
		b.ReportMetric(float64(info.Size())/1e6, "MB")
	}
}
