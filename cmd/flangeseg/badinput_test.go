package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// problemLine is a line of an invalid model's report after "FILE: ": the
// key (or the line of the file, or the file's size), its value and the
// rule it breaks. A missing key has no value: "KEY: missing …".
var problemLine = regexp.MustCompile(`^(line \d+: TOML syntax: |unknown key "[^"]+" = .+: |file size = \d+ bytes or more: |[A-Za-z_][\w.\[\]]*( and [\w.\[\]]+)?( = .+)?: )\S`)

// checkReport requires every line of stderr to be a problem of the model
// at path, or the closing count.
func checkReport(t *testing.T, name, path, stderr string) {
	t.Helper()
	lines := strings.Split(strings.TrimRight(stderr, "\n"), "\n")
	if len(lines) < 2 || !strings.HasPrefix(lines[len(lines)-1], path+": model is invalid (") {
		t.Errorf("%s: no closing count:\n%s", name, stderr)
		return
	}
	for _, l := range lines[:len(lines)-1] {
		p, ok := strings.CutPrefix(l, path+": ")
		if !ok || !problemLine.MatchString(p) {
			t.Errorf("%s: a line that does not name key, value and rule: %q", name, l)
		}
	}
}

// Every broken model of testdata/broken_models.json given to `run` exits
// 2 before any work, reports every problem as key, value and rule, and
// creates no output directory.
func TestBrokenModelsRun(t *testing.T) {
	base := flatModel(t)
	cases := brokenModels(t)
	if len(cases) < 40 {
		t.Fatalf("%d broken models, want at least 40", len(cases))
	}
	for _, c := range cases {
		dir := t.TempDir()
		path := filepath.Join(dir, "model.toml")
		if err := os.WriteFile(path, []byte(c.text(t, base)), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI("run", path, "-o", filepath.Join(dir, "out"))
		if code != exitBadInput || !strings.Contains(errs, path+": "+c.Want) {
			t.Errorf("%s: exit %d, want %d; stderr lacks %q\n%s", c.Name, code, exitBadInput, c.Want, errs)
		}
		checkReport(t, c.Name, path, errs)
		if out != "" {
			t.Errorf("%s: stdout %q", c.Name, out)
		}
		if names := dirNames(t, dir); names != "model.toml" {
			t.Errorf("%s: run left %s beside the model", c.Name, names)
		}
	}
}

// A 100 MB file (the flat demo, then zero bytes) is refused for its size
// after reading 1 MiB of it, by run and validate alike.
func TestHugeModelFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "huge.toml")
	if err := os.WriteFile(path, []byte(flatModel(t)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Truncate(path, 100<<20); err != nil {
		t.Fatal(err)
	}
	want := path + ": file size = 1048577 bytes or more: must be at most 1048576 bytes"
	for _, args := range [][]string{{"run", path, "-o", filepath.Join(dir, "out")}, {"validate", path}} {
		code, _, errs := runCLI(args...)
		if code != exitBadInput || !strings.Contains(errs, want) {
			t.Errorf("%s: exit %d, want %d; stderr lacks %q\n%s", args[0], code, exitBadInput, want, errs)
		}
		checkReport(t, args[0], path, errs)
	}
	if names := dirNames(t, dir); names != "huge.toml" {
		t.Errorf("left %s", names)
	}
	if _, err := modelfile.Load(path); err == nil {
		t.Error("Load accepted it")
	}
}
