package main

import (
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

func TestMemTotal(t *testing.T) {
	got, err := memTotal(strings.NewReader("MemTotal:       24683568 kB\nMemFree:         1000 kB\n"))
	if err != nil || got != 24683568*1024 {
		t.Errorf("got %g, %v", got, err)
	}
	for _, bad := range []string{"MemFree: 1 kB\n", "MemTotal: lots\n", ""} {
		if _, err := memTotal(strings.NewReader(bad)); err == nil {
			t.Errorf("%q: no error", bad)
		}
	}
}

func TestMemoryLimitFlag(t *testing.T) {
	for in, want := range map[string]float64{"2GB": 2e9, "1.5GiB": 1.5 * (1 << 30), "800 MB": 800e6, "1000000": 1e6, "64KiB": 65536} {
		var m memoryLimit
		if err := m.Set(in); err != nil || m.bytes != want {
			t.Errorf("%q: %g, %v; want %g", in, m.bytes, err, want)
		}
	}
	for _, in := range []string{"", "lots", "-1GB", "0", "NaN", "1e30GB"} {
		var m memoryLimit
		if err := m.Set(in); err == nil {
			t.Errorf("%q: no error", in)
		}
	}
}

// A model over the memory limit is refused before any work, by validate,
// run and compare, with its estimate and the keys that set its size; one
// under it is printed with its estimate.
func TestMemoryGuard(t *testing.T) {
	dir := t.TempDir()
	demo := filepath.Join(dir, "demo.toml")
	fine := filepath.Join(dir, "fine.toml")
	if err := os.WriteFile(demo, []byte(flatModel(t)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(fine, []byte(edit(t, flatModel(t), "size = 8", "size = 0.1")), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI("validate", demo, "--max-memory", "2GB")
	if code != exitOK || !strings.Contains(out, "Estimated size (from the mesh keys): 3270 elements, 21014 equations, 41 kept states, peak memory about") ||
		!strings.Contains(out, "limit 2.0 GB (--max-memory)") {
		t.Errorf("validate: exit %d\n%s%s", code, out, errs)
	}
	out1 := filepath.Join(dir, "out")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"validate", demo, "--max-memory", "100MB"}, demo + ": mesh.size = 8, mesh.refine = 0.3, load.increments = 40: the model needs about 21014 equations and"},
		{[]string{"validate", fine}, fine + ": mesh.size = 0.1, mesh.refine = 0.3, load.increments = 40: the model needs about 39378246 equations"},
		{[]string{"run", fine, "-o", out1}, "raise mesh.size or mesh.refine"},
		{[]string{"run", demo, "-o", out1, "--max-memory", "100MB"}, "more than the limit of 100 MB (--max-memory)"},
		{[]string{"compare", demo, demo, "-o", out1, "--max-memory", "700MB"}, "(with the models that run beside it,"},
	}
	for _, c := range cases {
		if c.args[0] == "compare" && runtime.NumCPU() < 2 {
			continue // one model at a time: none runs beside another
		}
		code, _, errs := runCLI(c.args...)
		if code != exitBadInput || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, want %d; stderr lacks %q:\n%s", c.args, code, exitBadInput, c.want, errs)
		}
	}
	if names := dirNames(t, dir); names != "demo.toml,fine.toml" {
		t.Errorf("a refused model left %s", names)
	}
}
