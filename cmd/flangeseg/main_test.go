package main

import (
	"bytes"
	"flangeseg/post/results"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runCLI(args ...string) (int, string, string) {
	var out, errb bytes.Buffer
	code := run(args, &out, &errb)
	return code, out.String(), errb.String()
}

func TestExitCodes(t *testing.T) {
	cases := []struct {
		args []string
		code int
		want string // in stdout or stderr
	}{
		{nil, exitBadInput, "Usage"},
		{[]string{"help"}, exitOK, "design aid"},
		{[]string{"frobnicate"}, exitBadInput, `unknown command "frobnicate"`},
		{[]string{"verify", "--no-such-flag"}, exitBadInput, "no-such-flag"},
		{[]string{"verify", "--case", "nonesuch"}, exitBadInput, `no case "nonesuch"`},
		{[]string{"verify", "--help"}, exitOK, "Usage: flangeseg verify"},
		{[]string{"version"}, exitOK, "flangeseg " + version},
		{[]string{"verify", "--case", "patch"}, exitOK, "verify: "},
	}
	for _, c := range cases {
		code, out, errs := runCLI(c.args...)
		if code != c.code || !strings.Contains(out+errs, c.want) {
			t.Errorf("flangeseg %v: exit %d, want %d; output lacks %q?\n%s%s", c.args, code, c.code, c.want, out, errs)
		}
	}
}

// verify -o and --dump-matrix write one .vtu per solve and a matrix and a
// right-hand side per solve, each directory marked as a flangeseg result,
// and no temporary files.
func TestVerifyWritesFiles(t *testing.T) {
	dir := t.TempDir()
	fields, mats := filepath.Join(dir, "fields"), filepath.Join(dir, "matrices")
	code, out, errs := runCLI("verify", "--case", "lame", "-o", fields, "--dump-matrix", mats)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, out, errs)
	}
	for _, c := range []struct {
		dir    string
		suffix string
		n      int
	}{{fields, ".vtu", 2}, {mats, ".matrix.mtx", 2}, {mats, ".rhs.mtx", 2}} {
		ents, err := os.ReadDir(c.dir)
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		for _, e := range ents {
			if strings.HasSuffix(e.Name(), c.suffix) {
				n++
			} else if !strings.HasSuffix(e.Name(), ".mtx") && e.Name() != results.MarkerFile {
				t.Errorf("unexpected file %s", e.Name())
			}
		}
		if n != c.n {
			t.Errorf("%s: %d files *%s, want %d", c.dir, n, c.suffix, c.n)
		}
	}
	for _, d := range []string{fields, mats} {
		if _, err := os.Stat(filepath.Join(d, results.MarkerFile)); err != nil {
			t.Errorf("%s is not marked as a flangeseg result: %v", d, err)
		}
	}
	if left, _ := filepath.Glob(filepath.Join(dir, ".*writing*")); len(left) > 0 {
		t.Errorf("staging directories left: %v", left)
	}
	head, err := os.ReadFile(filepath.Join(mats, "lame_axisymmetric_q8_20_2.matrix.mtx"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(string(head), "%%MatrixMarket matrix coordinate real symmetric") {
		t.Errorf("matrix file starts %q", string(head[:min(60, len(head))]))
	}
}

func TestFileStem(t *testing.T) {
	for in, want := range map[string]string{
		"Lamé plane strain Q8 16×16, graded": "lame_plane_strain_q8_16_16_graded",
		"patch Q8 plane stress":              "patch_q8_plane_stress",
	} {
		if got := fileStem(in); got != want {
			t.Errorf("fileStem(%q) = %q, want %q", in, got, want)
		}
	}
}

// verify follows the output-directory rule: a directory that holds
// anything but a flangeseg result is refused (exit 2) and left as it was,
// and -o and --dump-matrix may not be the same directory.
func TestVerifyOutputDirectoryRule(t *testing.T) {
	dir := t.TempDir()
	foreign := filepath.Join(dir, "mine")
	if err := os.MkdirAll(foreign, 0o755); err != nil {
		t.Fatal(err)
	}
	keep := filepath.Join(foreign, "notes.txt")
	if err := os.WriteFile(keep, []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"verify", "--case", "patch", "-o", foreign},
		{"verify", "--case", "patch", "--dump-matrix", foreign},
		{"verify", "--case", "patch", "-o", filepath.Join(dir, "same"), "--dump-matrix", filepath.Join(dir, "same")},
	} {
		code, _, errs := runCLI(args...)
		if code != exitBadInput {
			t.Errorf("%v: exit %d, want %d\n%s", args, code, exitBadInput, errs)
		}
	}
	if b, err := os.ReadFile(keep); err != nil || string(b) != "mine" {
		t.Errorf("the foreign directory was touched: %q %v", b, err)
	}
	if left, _ := filepath.Glob(filepath.Join(dir, ".*writing*")); len(left) > 0 {
		t.Errorf("staging directories left: %v", left)
	}
}
