package main

import (
	"bytes"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/results"
)

// smallPlasticModel writes a coarse elastoplastic edit of the flat demo
// whose bolt yields within three increments (about 2 % plastic strain in
// the thread) as name.toml into dir.
func smallPlasticModel(t *testing.T, dir, name string) string {
	t.Helper()
	text := edit(t, flatModel(t), `materials = "elastic"`, `materials = "elastoplastic"`,
		"max_displacement = 1.2", "max_displacement = 2.5", "increments = 40", "increments = 3",
		"size = 8", "size = 24", "refine = 0.3", "refine = 0.5")
	path := filepath.Join(dir, name+".toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// readTree returns every file under root by its path relative to root.
func readTree(t *testing.T, root string) map[string][]byte {
	t.Helper()
	files := map[string][]byte{}
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(path)
		rel, _ := filepath.Rel(root, path)
		files[rel] = data
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return files
}

// Outputs are the same byte for byte whatever the number of cores: a
// small elastoplastic model runs twice with GOMAXPROCS=1 and twice with
// GOMAXPROCS=2 and every file of the four run directories is compared.
// No field needs masking: wall-clock times go to the terminal only.
func TestDeterministicOutputs(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary and runs four analyses")
	}
	dir := t.TempDir()
	model := smallPlasticModel(t, dir, "small")
	var first map[string][]byte
	var firstName string
	for _, procs := range []int{1, 2} {
		for i := 1; i <= 2; i++ {
			name := fmt.Sprintf("procs%d_%d", procs, i)
			c := startChild(t, dir, []string{fmt.Sprintf("GOMAXPROCS=%d", procs)}, "run", model, "-o", name)
			if code, _, stderr := c.wait(t); code != exitOK {
				t.Fatalf("%s: exit %d\n%s", name, code, stderr)
			}
			files := readTree(t, filepath.Join(dir, name))
			if first == nil {
				first, firstName = files, name
				checkYielded(t, files["history.csv"])
				checkEstimate(t, model, c.maxRSS())
				continue
			}
			compareTrees(t, firstName, first, name, files)
		}
	}
}

// checkEstimate compares the memory estimate of the model at path with a
// run's measured peak: the estimate must not be below it, nor more than
// three times it.
func checkEstimate(t *testing.T, path string, peak float64) {
	t.Helper()
	spec, err := modelfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	est, err := segment.EstimateSize(spec)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%.0f equations: peak memory %s estimated, %s measured", est.Equations, formatBytes(est.PeakBytes), formatBytes(peak))
	if peak > 0 && (est.PeakBytes < peak || est.PeakBytes > 3*peak) {
		t.Errorf("estimated peak %s against %s measured: want from 1 to 3 times it", formatBytes(est.PeakBytes), formatBytes(peak))
	}
}

// checkYielded fails unless the last row of history.csv has plastic
// strain, so that the comparison covers the plastic laws' state.
func checkYielded(t *testing.T, history []byte) {
	t.Helper()
	lines := strings.Split(strings.TrimSpace(string(history)), "\n")
	head, last := strings.Split(lines[0], ","), strings.Split(lines[len(lines)-1], ",")
	for i, h := range head {
		if h == "max_plastic_strain" && i < len(last) && last[i] != "0" {
			return
		}
	}
	t.Fatalf("the model did not yield; its last row: %s", lines[len(lines)-1])
}

func compareTrees(t *testing.T, aName string, a map[string][]byte, bName string, b map[string][]byte) {
	t.Helper()
	if len(a) != len(b) {
		t.Errorf("%s has %d files, %s %d", aName, len(a), bName, len(b))
	}
	for path, data := range a {
		other, ok := b[path]
		switch {
		case !ok:
			t.Errorf("%s: %s missing", bName, path)
		case !bytes.Equal(data, other):
			t.Errorf("%s differs between %s and %s", path, aName, bName)
		}
	}
}

// -o onto a directory: a new or empty one, or an earlier result (replaced
// whole, a stale file in it gone) is written; a file, or a directory with
// anything else in it, is refused with exit 2 and left as it was.
func TestOutputDirectoryRule(t *testing.T) {
	dir := t.TempDir()
	model := smallPlasticModel(t, dir, "small")
	foreign := filepath.Join(dir, "photos")
	if err := os.MkdirAll(foreign, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(foreign, "holiday.jpg"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	aFile := filepath.Join(dir, "notes.txt")
	if err := os.WriteFile(aFile, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"run", model, "-o", foreign},
		{"run", model, "-o", aFile},
		{"compare", model, model, "-o", foreign},
		{"demo", "-o", foreign},
	} {
		code, _, errs := runCLI(args...)
		if code != exitBadInput || !strings.Contains(errs, "not a flangeseg result") {
			t.Errorf("%v: exit %d, want %d and the reason:\n%s", args, code, exitBadInput, errs)
		}
	}
	if names := dirNames(t, foreign); names != "holiday.jpg" {
		t.Errorf("the refused directory changed: %s", names)
	}
	if names := dirNames(t, dir); names != "notes.txt,photos,small.toml" {
		t.Errorf("a refused run left files beside the model: %s", names)
	}

	empty := filepath.Join(dir, "empty")
	if err := os.Mkdir(empty, 0o755); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCLI("run", model, "-o", empty); code != exitOK {
		t.Fatalf("empty directory: exit %d\n%s", code, errs)
	}
	stale := filepath.Join(empty, "fields", "state_099.vtu")
	if err := os.WriteFile(stale, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCLI("run", model, "-o", empty); code != exitOK {
		t.Fatalf("earlier result: exit %d\n%s", code, errs)
	}
	if _, err := os.Stat(stale); err == nil {
		t.Error("a file of the earlier result survived its replacement")
	}
	if !results.IsResult(empty) {
		t.Errorf("no %s in the result", results.MarkerFile)
	}
	noTemporaries(t, dir)
}
