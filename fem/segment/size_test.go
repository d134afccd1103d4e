package segment

import (
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// The plan's counts are the built mesh's; the equations, two per node,
// bound the model's from above by the few constrained dofs (within 10 %).
func TestEstimateSizeCountsTheMesh(t *testing.T) {
	for _, size := range []float64{16, 8} {
		for _, kind := range []string{"quad8", "quad4"} {
			spec, err := modelfile.Decode(demoModels()[0].Data)
			if err != nil {
				t.Fatal(err)
			}
			spec.Mesh.Size, spec.Mesh.Element = size, kind
			est, err := EstimateSize(spec)
			if err != nil {
				t.Fatal(err)
			}
			g, err := Build(spec)
			if err != nil {
				t.Fatal(err)
			}
			m := g.Mesh()
			g.Model().Number()
			eq := float64(g.Model().Equations())
			t.Logf("size %g %s: elements %g / %d, nodes %g / %d, equations %g / %g", size, kind, est.Elements, len(m.Elements), est.Nodes, len(m.Nodes), est.Equations, eq)
			if est.Elements != float64(len(m.Elements)) {
				t.Errorf("size %g %s: %g elements estimated, %d built", size, kind, est.Elements, len(m.Elements))
			}
			for _, c := range []struct {
				what      string
				est, real float64
			}{{"nodes", est.Nodes, float64(len(m.Nodes))}, {"equations", est.Equations, eq}} {
				if c.est < c.real || c.est > 1.1*c.real || (c.what == "nodes" && c.est != c.real) {
					t.Errorf("size %g %s: %s %g estimated, %g built: want the count, or for equations up to 10 %% more", size, kind, c.what, c.est, c.real)
				}
			}
		}
	}
}
