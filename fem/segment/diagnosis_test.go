package segment

import (
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem"
	"flangeseg/fem/segment/figures"
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
	got := s.g.diagnose("tension", "increment 3 (u = 0.15 mm, Z = 80 kN)", nc, nil)
	for _, want := range []string{"tension stage", "increment 3", "from 0.05 to 0.0001", "123 N", "node 7", "upper_flange",
		"5 contact points of the flange faces between x = 40.5 and 61.2 mm", "open, sticking", "What to try:", "load.increments"} {
		if !strings.Contains(got, want) {
			t.Errorf("diagnosis lacks %q:\n%s", want, got)
		}
	}
}

// TestGivingWayWords: a tension stage that stops on a joint giving way —
// an indefinite tangent, or steps shrunk to nothing while the force
// falls — names the part and place where the plastic strain grew most,
// says the path turned back and what to try instead of more increments;
// without yielding, or with the force still rising, the general words
// stay.
func TestGivingWayWords(t *testing.T) {
	spec, err := modelfile.Load(filepath.Join("..", "..", "testdata", "endings", "shell_necks.toml"))
	if err != nil {
		t.Fatal(err)
	}
	s, err := Build(spec)
	if err != nil {
		t.Fatal(err)
	}
	// A joint of first stiffness 40 kN/mm whose force falls from its
	// peak by 2 kN over 1e-4 mm: a path turning back.
	rows := []figures.Row{{Stage: "preload"}, {Stage: "tension", U: 1, Z: 40e3}, {Stage: "tension", U: 10, Z: 300e3},
		{Stage: "tension", U: 10.0001, Z: 298e3}}
	giving := yielding{region: "lower_shell", x: 73.1, z: -72.4, strain: 0.018, increase: 7e-5}
	indefinite := &fem.NotConvergedError{Indefinite: true, Residual: 3e-6, First: 3e-6, Best: 3e-6, Reason: "the tangent is not positive definite"}
	stalling := &fem.NotConvergedError{Iterations: 33, Residual: 2.6e-6, First: 3.2e-6, Best: 2.6e-6, Reason: "the residual does not fall below the tolerance"}
	common := []string{"gives way in the lower shell at x = 73.1, z = -72.4 mm", "turns back", "peak of 300.0 kN at u = 10 mm",
		"What to try:", "model's ultimate load", `shell.material = "flat_690"`, "shell.length = 2400 mm"}
	cases := []struct {
		name string
		err  error
		want []string
	}{
		{"indefinite", &fem.RampError{Reached: 10.0001, Step: 4.7e-5, Cuts: 6, Err: indefinite},
			append([]string{"halved 6 times", "first Newton iteration", "not positive definite"}, common...)},
		{"stalled", &fem.RampError{Reached: 10.0001, Step: 5.7e-6, Cuts: 3, Stalled: true, Err: stalling},
			append([]string{"shrunk from 3 mm to steps of 5.7e-06 mm", "in 33 Newton iterations"}, common...)},
	}
	for _, c := range cases {
		got := s.g.diagnose("tension", lastState(rows), c.err, &tensionPath{rows: rows, giving: giving, found: true})
		for _, w := range c.want {
			if !strings.Contains(got, w) {
				t.Errorf("%s: diagnosis lacks %q:\n%s", c.name, w, got)
			}
		}
		if strings.Contains(got, "more increments (load.increments);") || strings.Contains(got, "(load.increments) and") {
			t.Errorf("%s: more increments offered as a remedy:\n%s", c.name, got)
		}
	}
	// No yielding, or a force still rising when the steps stalled: the
	// general words.
	elastic := s.g.diagnose("tension", lastState(rows), cases[0].err, &tensionPath{rows: rows})
	rising := append(rows[:3:3], figures.Row{Stage: "tension", U: 10.0001, Z: 301e3})
	climbing := s.g.diagnose("tension", lastState(rising), cases[1].err, &tensionPath{rows: rising, giving: giving, found: true})
	for name, got := range map[string]string{"elastic": elastic, "rising": climbing} {
		if strings.Contains(got, "gives way") || !strings.Contains(got, "more increments (load.increments)") {
			t.Errorf("%s: want the general words:\n%s", name, got)
		}
	}
}
