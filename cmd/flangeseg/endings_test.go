package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestPreloadEndings: a run that cannot go on past its preload exits 3,
// writes the preloaded state, and says in words what happened and what to
// try (robust-solve issue, item 4).
func TestPreloadEndings(t *testing.T) {
	cases := []struct {
		file string
		want []string // in stderr and in summary.json's diagnosis
	}{
		{"gap_not_closed", []string{"could not close the gap", "0.2 mm apart", "What to try:", "nut turn"}},
		{"rupture_in_preload", []string{"ruptured while it was tightened", "bolt thread", "What to try:"}},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			t.Parallel()
			out := filepath.Join(t.TempDir(), "run")
			code, _, stderr := runCLI("run", filepath.Join("..", "..", "testdata", "endings", c.file+".toml"), "-o", out)
			if code != exitAnalysis {
				t.Fatalf("exit %d, want %d\n%s", code, exitAnalysis, stderr)
			}
			data, err := os.ReadFile(filepath.Join(out, "summary.json"))
			if err != nil {
				t.Fatal(err)
			}
			var sum struct {
				Converged bool   `json:"converged"`
				Diagnosis string `json:"diagnosis"`
			}
			if err := json.Unmarshal(data, &sum); err != nil {
				t.Fatal(err)
			}
			if sum.Converged {
				t.Errorf("summary.json says converged")
			}
			for _, w := range c.want {
				if !strings.Contains(stderr, w) || !strings.Contains(sum.Diagnosis, w) {
					t.Errorf("%q missing from stderr or summary.json's diagnosis:\n%s", w, stderr)
				}
			}
			if _, err := os.Stat(filepath.Join(out, "history.csv")); err != nil {
				t.Errorf("the preloaded state was not written: %v", err)
			}
		})
	}
}
