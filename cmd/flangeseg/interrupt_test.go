package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"flangeseg/post/results"
)

// longModel writes the flat demo with many small increments, a run that
// is still in its tension stage when the signal comes, as name.toml into
// dir.
func longModel(t *testing.T, dir, name string) string {
	t.Helper()
	text := edit(t, flatModel(t), "increments = 40", "increments = 400", "size = 8", "size = 12")
	path := filepath.Join(dir, name+".toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// interruptedRun checks a run directory written after an interruption:
// marked as a result, summary.json not converged and saying where it
// stopped, history.csv ending at that increment, the note and the fields
// written, and no temporary file left. It returns the last increment.
func interruptedRun(t *testing.T, dir string) string {
	t.Helper()
	if !results.IsResult(dir) {
		t.Fatalf("%s: no %s", dir, results.MarkerFile)
	}
	data, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var sum struct {
		Converged bool   `json:"converged"`
		Ending    string `json:"ending"`
		Failure   string `json:"failure"`
	}
	if err := json.Unmarshal(data, &sum); err != nil {
		t.Fatal(err)
	}
	rows := readHistory(t, filepath.Join(dir, "history.csv"))
	last := rows[len(rows)-1][0]
	if sum.Converged || sum.Ending != "interrupted by the caller" || !strings.HasPrefix(sum.Failure, "interrupted after increment "+last+" ") {
		t.Errorf("summary.json: converged %v, ending %q, failure %q; history.csv ends at increment %s", sum.Converged, sum.Ending, sum.Failure, last)
	}
	for _, f := range []string{"report.html", "fields.pvd", "model.resolved.toml"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("not written: %v", err)
		}
	}
	return last
}

// noTemporaries fails if a temporary file or directory of an atomic write
// is left anywhere under root.
func noTemporaries(t *testing.T, root string) {
	t.Helper()
	filepath.WalkDir(root, func(path string, d os.DirEntry, err error) error {
		if err != nil {
			t.Error(err)
			return nil
		}
		if n := d.Name(); strings.Contains(n, ".tmp-") || strings.Contains(n, ".writing-") {
			t.Errorf("temporary left: %s", path)
		}
		return nil
	})
}

// SIGINT during `run`: the run stops after the increment in hand, writes
// what converged, says so and exits 3.
func TestInterruptRun(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	model := longModel(t, dir, "long")
	c := startChild(t, dir, nil, "run", model, "-o", "out", "--verbose")
	c.waitFor(t, "increment 3:", 2*time.Minute)
	if err := c.cmd.Process.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := c.wait(t)
	if code != exitAnalysis {
		t.Fatalf("exit %d, want %d\n%s", code, exitAnalysis, stderr)
	}
	last := interruptedRun(t, filepath.Join(dir, "out"))
	for _, w := range []string{"interrupted after increment " + last + " ", `by signal "interrupt"`, "everything up to that state is written in out"} {
		if !strings.Contains(stderr, w) {
			t.Errorf("stderr lacks %q:\n%s", w, lastLines(stderr, 5))
		}
	}
	noTemporaries(t, dir)
}

// SIGTERM during `compare`: the model in hand stops after its increment,
// the next one does not start, the runs are written and no comparison.
func TestInterruptCompare(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	a, b := longModel(t, dir, "a"), longModel(t, dir, "b")
	c := startChild(t, dir, nil, "compare", a, b, "-o", "cmp", "--verbose")
	c.waitFor(t, "increment 3:", 2*time.Minute)
	if err := c.cmd.Process.Signal(syscall.SIGTERM); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := c.wait(t)
	if code != exitAnalysis {
		t.Fatalf("exit %d, want %d\n%s", code, exitAnalysis, stderr)
	}
	out := filepath.Join(dir, "cmp")
	interruptedRun(t, filepath.Join(out, "a"))
	if _, err := os.Stat(filepath.Join(out, "comparison.csv")); err == nil {
		t.Error("comparison.csv written after an interruption")
	}
	for _, w := range []string{`by signal "terminated"`, "b.toml: interrupted", "no comparison written"} {
		if !strings.Contains(stderr, w) {
			t.Errorf("stderr lacks %q:\n%s", w, lastLines(stderr, 6))
		}
	}
	if !results.IsResult(out) {
		t.Errorf("%s is not marked as a result", out)
	}
	noTemporaries(t, dir)
}

// SIGINT during `demo`: as compare.
func TestInterruptDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	c := startChild(t, dir, nil, "demo", "-o", "demo", "--verbose")
	c.waitFor(t, "increment 3:", 2*time.Minute)
	if err := c.cmd.Process.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := c.wait(t)
	if code != exitAnalysis || !strings.Contains(stderr, "no comparison written") {
		t.Fatalf("exit %d, want %d\n%s", code, exitAnalysis, lastLines(stderr, 6))
	}
	interruptedRun(t, filepath.Join(dir, "demo", "flat"))
	noTemporaries(t, dir)
}

func lastLines(s string, n int) string {
	lines := strings.Split(strings.TrimRight(s, "\n"), "\n")
	return strings.Join(lines[max(0, len(lines)-n):], "\n")
}

// SIGINT during `sweep`: the case in hand stops, the sweep says so and
// exits 3, nothing half-written is left; the same command run again does
// only what is missing (the cases finished before are "already done")
// and ends with every case in sweep.csv.
func TestInterruptSweep(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	dir := t.TempDir()
	plan, err := filepath.Abs(filepath.Join("..", "..", "testdata", "sweep", "array_plan.toml"))
	if err != nil {
		t.Fatal(err)
	}
	args := []string{"sweep", plan, "-o", "out", "--jobs", "1"}
	c := startChild(t, dir, nil, args...)
	c.waitFor(t, "case 1/8 ", 2*time.Minute)
	if err := c.cmd.Process.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := c.wait(t)
	if code != exitAnalysis || !strings.Contains(stderr, "interrupted") || !strings.Contains(stderr, "run the same command again") {
		t.Fatalf("exit %d, want %d and the interruption said:\n%s", code, exitAnalysis, lastLines(stderr, 4))
	}
	noTemporaries(t, dir)
	again := startChild(t, dir, nil, args...)
	code, _, stderr = again.wait(t)
	if code != exitOK {
		t.Fatalf("resumed: exit %d\n%s", code, lastLines(stderr, 6))
	}
	if !strings.Contains(stderr, "case 1/8 ") || !strings.Contains(stderr, "already done") {
		t.Errorf("the resumed sweep did not find the finished case done:\n%s", stderr)
	}
	data, err := os.ReadFile(filepath.Join(dir, "out", "sweep.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if rows := strings.Count(strings.TrimSpace(string(data)), "\n"); rows != 8 {
		t.Errorf("sweep.csv has %d cases, want 8", rows)
	}
	noTemporaries(t, dir)
}
