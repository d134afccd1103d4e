package main

import (
	"strings"
	"testing"
)

// The mechanism names the sites where the plastic strain concentrates and
// the Petersen mode they make up (Petersen, Stahlbau: A bolt alone, B bolt
// and shell hinge, C shell and flange hinges).
func TestMechanism(t *testing.T) {
	for _, c := range []struct {
		name   string
		site   map[string]float64
		prying float64
		want   []string
		not    []string
	}{
		{"nothing formed", map[string]float64{"bolt thread": 0.001}, 1.5, []string{"no mechanism"}, []string{"mode"}},
		{"bolt alone, no prying", map[string]float64{"bolt thread": 0.2, "plastic hinge in the shell": 0.01}, 1.02, []string{"bolt thread", "mode A"}, []string{"shell"}},
		{"bolt under prying", map[string]float64{"bolt thread": 0.2}, 2.1, []string{"bolt thread", "under prying"}, []string{"mode"}},
		{"bolt and shell hinge", map[string]float64{"bolt thread": 0.2, "plastic hinge in the shell": 0.1}, 1.8, []string{"bolt thread (ε̄p 20.0 %) + plastic hinge in the shell", "mode B"}, nil},
		{"two hinges", map[string]float64{"plastic hinge in the shell": 0.15, "plastic hinge in the flange": 0.2, "bolt shank": 0.01}, 1.5, []string{"plastic hinge in the flange", "plastic hinge in the shell", "mode C"}, []string{"bolt"}},
	} {
		got := mechanism(c.site, c.prying)
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
