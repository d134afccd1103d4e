package figures

import (
	"strings"
	"testing"

	"flangeseg/post/handcalc"
)

// The mechanism names the sites where the plastic strain concentrates and
// the Petersen mode they make up (Petersen, Stahlbau: A bolt alone, B bolt
// and a hinge at the junction, C a hinge at the junction and one in the
// flange at the bolt line).
func TestMechanism(t *testing.T) {
	for _, c := range []struct {
		name   string
		site   map[string]float64
		prying float64
		mode   handcalc.Mode
		want   []string
		not    []string
	}{
		{"nothing formed", map[string]float64{SiteThread: 0.001}, 1.5, "", []string{"no mechanism"}, []string{"mode"}},
		{"bolt alone, no prying", map[string]float64{SiteThread: 0.2, SiteShell: 0.003}, 1.02, handcalc.ModeA, []string{"bolt thread", "mode A"}, []string{"shell"}},
		{"bolt under prying", map[string]float64{SiteThread: 0.2}, 2.1, "", []string{"bolt thread", "under prying"}, []string{"mode"}},
		{"bolt and shell hinge", map[string]float64{SiteThread: 0.2, SiteShell: 0.1}, 1.8, handcalc.ModeB, []string{"bolt thread (ε̄p 20.0 %) + plastic hinge in the shell", "mode B"}, nil},
		{"bolt and junction hinge in the flange", map[string]float64{SiteShank: 0.2, SiteFlangeJoint: 0.1}, 1.8, handcalc.ModeB, []string{"at the shell", "mode B"}, nil},
		{"two hinges", map[string]float64{SiteShell: 0.15, SiteFlangeBolt: 0.2, SiteShank: 0.004}, 1.5, handcalc.ModeC, []string{"in the flange at the bolt line", "plastic hinge in the shell", "mode C"}, []string{"bolt shank", "bolt thread"}},
		{"bolt and bolt-line hinge", map[string]float64{SiteThread: 0.3, SiteFlangeBolt: 0.2}, 1.8, "", []string{"not one of Petersen's modes"}, []string{"mode A", "mode B", "mode C"}},
	} {
		got, mode := Mechanism(c.site, c.prying)
		if mode != c.mode {
			t.Errorf("%s: mode %q, want %q", c.name, mode, c.mode)
		}
		for _, w := range c.want {
			if !strings.Contains(got, w) {
				t.Errorf("%s: %q lacks %q", c.name, got, w)
			}
		}
		for _, w := range c.not {
			if strings.Contains(got, w) {
				t.Errorf("%s: %q should not name %q", c.name, got, w)
			}
		}
	}
}

// A hinge is a cut yielded through most of its depth; a corner that
// yields alone is not one, however far it strains.
func TestHingeStrain(t *testing.T) {
	even := func(strains ...float64) []CutPoint {
		pts := make([]CutPoint, len(strains))
		for i, s := range strains {
			pts[i] = CutPoint{float64(i), s}
		}
		return pts
	}
	for _, c := range []struct {
		name string
		pts  []CutPoint
		want float64
	}{
		{"yielded faces, elastic core", even(0.05, 0.02, 0.0005, 0, 0.0008, 0.02, 0.04), 0},
		{"yielded but a thin core", even(0.05, 0.02, 0.004, 0.002, 0.0005, 0.003, 0.02, 0.04), 0.05},
		{"corner alone", even(0.8, 0.01, 0, 0, 0, 0, 0, 0), 0},
		{"too few points", even(0.1, 0.1), 0},
	} {
		if got := HingeStrain(c.pts); got != c.want {
			t.Errorf("%s: %g, want %g", c.name, got, c.want)
		}
	}
}

// A formed hinge takes part beside a bolt that necks far more; of thread
// and shank only the one that necks is named.
func TestMechanismHingeBesideNeckingBolt(t *testing.T) {
	got, mode := Mechanism(map[string]float64{SiteThread: 0.95, SiteShank: 0.02, SiteShell: 0.021}, 2.0)
	if mode != handcalc.ModeB || !strings.Contains(got, "plastic hinge in the shell") || strings.Contains(got, "shank") {
		t.Errorf("%q (mode %q): want the thread and the shell hinge, mode B", got, mode)
	}
}
