package results

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
)

// demoState is the last state of the flat demo joint at its own mesh
// (20 946 equations, Q8), preloaded and pulled 0.1 mm in one increment.
func demoState(b *testing.B) segment.State {
	b.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "cmd", "flangeseg", "demo", "flat.toml"))
	if err != nil {
		b.Fatal(err)
	}
	spec, err := modelfile.Decode(data)
	if err != nil {
		b.Fatal(err)
	}
	spec.Load.MaxDisplacement, spec.Load.Increments = 0.1, 1
	res, err := segment.Run(context.Background(), spec, segment.Options{})
	if err != nil || res.Failure != nil {
		b.Fatal(err, res.Failure)
	}
	return res.States[len(res.States)-1]
}

// BenchmarkStateFieldFile writes the field file of one state of the demo
// joint: "write" is all of it as a run does it (nodal stresses recovered,
// contact and yielding fields gathered, the file encoded, compressed and
// written through a temporary file); "encode" is the encoding and
// compression alone, of fields gathered once.
func BenchmarkStateFieldFile(b *testing.B) {
	st := demoState(b)
	b.Run("write", func(b *testing.B) {
		path := filepath.Join(b.TempDir(), "state.vtu")
		for b.Loop() {
			if err := writeState(path, st); err != nil {
				b.Fatal(err)
			}
		}
		if info, err := os.Stat(path); err == nil {
			b.ReportMetric(float64(info.Size())/1e6, "MB")
		}
	})
	b.Run("encode", func(b *testing.B) {
		m := st.Solution.Model().Mesh()
		point, cell, err := post.SolutionFields(st.Solution)
		if err != nil {
			b.Fatal(err)
		}
		point = append(point, contactFields(len(m.Nodes), st.Contacts)...)
		cell = append(cell, historyFields(st.Plastic, st.Damage, len(m.Elements))...)
		g := post.GridFromMesh(m)
		for b.Loop() {
			if err := post.EncodeVTU(io.Discard, g, point, cell); err != nil {
				b.Fatal(err)
			}
		}
		b.ReportMetric(float64(len(g.Points)), "points")
	})
}
