package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// run writes every promised file and exits 0; an invalid model exits 2
// and creates no output directory.
func TestRunWritesResults(t *testing.T) {
	dir := t.TempDir()
	model := filepath.Join(dir, "joint.toml")
	data := string(demoModels()[0].Data) + "\n"
	data = replaceKey(t, data, "size = 8", "size = 16")
	data = replaceKey(t, data, "increments = 40", "increments = 3")
	if err := os.WriteFile(model, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	dump := filepath.Join(dir, "matrices")
	code, stdout, stderr := runCLI("run", model, "-o", out, "--dump-matrix", dump)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	for _, f := range []string{"history.csv", "summary.json", "model.resolved.toml", "fields.pvd", "fields/state_000.vtu",
		"Z_u.svg", "Z_u.png", "Fs_Z.svg", "Ms_Z.svg", "gap_Z.svg", "contact_force_Z.svg", "contact_pressure.svg"} {
		if _, err := os.Stat(filepath.Join(out, f)); err != nil {
			t.Errorf("missing %s", f)
		}
	}
	for _, f := range []string{"joint_first_tangent.matrix.mtx", "joint_first_tangent.rhs.mtx", "flangeseg_result.txt"} {
		if _, err := os.Stat(filepath.Join(dump, f)); err != nil {
			t.Errorf("--dump-matrix: missing %s", f)
		}
	}
	// --dump-matrix follows the output-directory rule: a foreign directory
	// that holds anything, or the -o directory itself, is refused.
	foreign := filepath.Join(dir, "foreign")
	if err := os.MkdirAll(foreign, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(foreign, "notes.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"run", model, "-o", filepath.Join(dir, "out2"), "--dump-matrix", foreign},
		{"run", model, "-o", out, "--dump-matrix", out},
	} {
		if code, _, stderr := runCLI(args...); code != exitBadInput || !strings.Contains(stderr, "--dump-matrix") {
			t.Errorf("%v: exit %d, want 2 naming --dump-matrix (%s)", args[3:], code, stderr)
		}
	}
	if data, err := os.ReadFile(filepath.Join(foreign, "notes.txt")); err != nil || string(data) != "mine" {
		t.Error("the refused directory was touched")
	}
	bad := filepath.Join(dir, "bad.toml")
	if err := os.WriteFile(bad, []byte(replaceKey(t, data, "hole = 52", "hole = 40")), 0o644); err != nil {
		t.Fatal(err)
	}
	badOut := filepath.Join(dir, "bad_out")
	if code, _, stderr := runCLI("run", bad, "-o", badOut); code != exitBadInput {
		t.Errorf("invalid model: exit %d, want 2 (%s)", code, stderr)
	}
	if _, err := os.Stat(badOut); !os.IsNotExist(err) {
		t.Errorf("invalid model created %s", badOut)
	}
}

// replaceKey replaces one whole line of a model file.
func replaceKey(t *testing.T, data, line, with string) string {
	t.Helper()
	lines := strings.Split(data, "\n")
	for i, l := range lines {
		if strings.TrimSpace(l) == line {
			lines[i] = with
			return strings.Join(lines, "\n")
		}
	}
	t.Fatalf("line %q not in the model", line)
	return ""
}

// mesh writes mesh.vtu and reports the regions and the element quality.
func TestMeshCommand(t *testing.T) {
	dir := t.TempDir()
	model := filepath.Join(dir, "joint.toml")
	if err := os.WriteFile(model, demoModels()[1].Data, 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "mesh")
	code, stdout, stderr := runCLI("mesh", model, "-o", out)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	for _, want := range []string{"upper_flange_hole", "bolt_thread", "Jacobian ratio", "mesh.vtu"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("output lacks %q:\n%s", want, stdout)
		}
	}
	if _, err := os.Stat(filepath.Join(out, "mesh.vtu")); err != nil {
		t.Error(err)
	}
	// The model's own directory holds the model: not a result to replace.
	if code, _, stderr := runCLI("mesh", model, "-o", dir); code != exitBadInput || !strings.Contains(stderr, "not a flangeseg result") {
		t.Errorf("mesh into the model's directory: exit %d\n%s", code, stderr)
	}
}
