package segment

import (
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem"
	"flangeseg/fem/segment/modelfile"
)

// TestDiagnosisWords: a failed solve is told in words — the stage and
// state, what the residual did, the place of the largest force, the
// contact points that kept changing status, and what to try.
func TestDiagnosisWords(t *testing.T) {
	spec, err := modelfile.Load(filepath.Join("..", "..", "testdata", "robust", "r01_flat_elastic.toml"))
	if err != nil {
		t.Fatal(err)
	}
	s, err := Build(spec)
	if err != nil {
		t.Fatal(err)
	}
	nc := &fem.NotConvergedError{Iterations: 30, Residual: 2e-4, First: 0.05, Best: 1e-4, Reason: "the residual does not fall below the tolerance",
		Largest: 123, Where: "node 7 (x = 12, z = 0), z displacement in upper_flange",
		Cycling: []fem.Cycling{{Pair: "flange faces", Points: 5, Changes: 22, XMin: 40.5, XMax: 61.2, Between: "open, sticking"}}}
	got := s.g.diagnose("tension", "increment 3 (u = 0.15 mm, Z = 80 kN)", nc)
	for _, want := range []string{"tension stage", "increment 3", "from 0.05 to 0.0001", "123 N", "node 7", "upper_flange",
		"5 contact points of the flange faces between x = 40.5 and 61.2 mm", "open, sticking", "What to try:", "load.increments"} {
		if !strings.Contains(got, want) {
			t.Errorf("diagnosis lacks %q:\n%s", want, got)
		}
	}
}
