package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// endingSummary is what an ending test reads of summary.json.
type endingSummary struct {
	Converged bool   `json:"converged"`
	Diagnosis string `json:"diagnosis"`
}

// runEnding runs testdata/endings/<file>.toml, wants exit 3, and returns
// stderr, the summary and the run directory.
func runEnding(t *testing.T, file string) (string, endingSummary, string) {
	t.Helper()
	out := filepath.Join(t.TempDir(), "run")
	code, _, stderr := runCLI("run", filepath.Join("..", "..", "testdata", "endings", file+".toml"), "-o", out)
	if code != exitAnalysis {
		t.Fatalf("exit %d, want %d\n%s", code, exitAnalysis, stderr)
	}
	data, err := os.ReadFile(filepath.Join(out, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var sum endingSummary
	if err := json.Unmarshal(data, &sum); err != nil {
		t.Fatal(err)
	}
	if sum.Converged {
		t.Errorf("summary.json says converged")
	}
	return stderr, sum, out
}

// wantWords checks that every word is in stderr and in the diagnosis.
func wantWords(t *testing.T, stderr string, sum endingSummary, want []string) {
	t.Helper()
	for _, w := range want {
		if !strings.Contains(stderr, w) || !strings.Contains(sum.Diagnosis, w) {
			t.Errorf("%q missing from stderr or summary.json's diagnosis:\n%s", w, stderr)
		}
	}
}

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
			stderr, sum, out := runEnding(t, c.file)
			wantWords(t, stderr, sum, c.want)
			if _, err := os.Stat(filepath.Join(out, "history.csv")); err != nil {
				t.Errorf("the preloaded state was not written: %v", err)
			}
		})
	}
}

// TestTensionEndings: a joint that gives way in the tension stage (not
// one of its normal endings: maximum displacement, the drop below the
// peak, bolt rupture) exits 3, writes every increment up to the last
// converged one, and says which part gives way, where, what the path did
// and what to try (robust-solve issue, item 4).
func TestTensionEndings(t *testing.T) {
	cases := []struct {
		file string
		want []string // in stderr and in summary.json's diagnosis
		// least is the fewest tension increments history.csv must hold.
		least int
	}{
		{"shell_necks", []string{"The tension stage found no equilibrium", "gives way in the upper shell", "turns back",
			"What to try:", "model's ultimate load", `shell.material = "flat_690"`, "shell.length"}, 8},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			t.Parallel()
			stderr, sum, out := runEnding(t, c.file)
			wantWords(t, stderr, sum, c.want)
			rows := readHistory(t, filepath.Join(out, "history.csv"))
			last := rows[len(rows)-1][0]
			if n := len(rows) - 1; n < c.least {
				t.Errorf("history.csv holds %d tension increments, want at least %d", n, c.least)
			}
			if at := fmt.Sprintf("after increment %s ", last); !strings.Contains(sum.Diagnosis, at) {
				t.Errorf("the diagnosis does not start from history.csv's last increment (%q):\n%s", at, sum.Diagnosis)
			}
		})
	}
}

// readHistory returns the data rows of history.csv (the header dropped).
func readHistory(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("the converged increments were not written: %v", err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 2 {
		t.Fatalf("history.csv has %d lines, want a header and rows", len(rows))
	}
	return rows[1:]
}
