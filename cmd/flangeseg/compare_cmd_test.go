package main

import (
	"bytes"
	"encoding/csv"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/results"
)

// coarseModelFile writes demo model i with a coarse mesh and few
// increments, for command tests.
func coarseModelFile(t *testing.T, dir, name string, i int) string {
	t.Helper()
	text := string(demoModels()[i].Data)
	for old, repl := range map[string]string{
		"\nsize = 8\n":             "\nsize = 16\n",
		"\nrefine = 0.3\n":         "\nrefine = 0.5\n",
		"\nincrements = 40\n":      "\nincrements = 6\n",
		"\nmax_displacement = 1.2": "\nmax_displacement = 0.6",
	} {
		if !strings.Contains(text, old) {
			t.Fatalf("demo model %d lacks %q", i, old)
		}
		text = strings.Replace(text, old, repl, 1)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// compare on the demo's two contact variants (hand-methods issue): the
// defined contact bands come out stiffer, as a ratio > 1 to the flat face
// on the joint's secant stiffness to the reference load.
func TestCompareCommand(t *testing.T) {
	in := t.TempDir()
	flat := coarseModelFile(t, in, "flat.toml", 0)
	bands := coarseModelFile(t, in, "bands.toml", 1)
	out := filepath.Join(t.TempDir(), "cmp")
	var stdout, stderr bytes.Buffer
	if code := run([]string{"compare", flat, bands, "-o", out}, &stdout, &stderr); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr.String())
	}
	f, err := os.Open(filepath.Join(out, "comparison.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rec, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rec) != 3 || rec[1][0] != "flat" || rec[2][0] != "bands" {
		t.Fatalf("comparison rows %v", rec)
	}
	col := -1
	for c, name := range rec[0] {
		if name == "ratio_joint_stiffness_secant_to_reference_kN_per_mm" {
			col = c
		}
	}
	if col < 0 {
		t.Fatalf("no stiffness ratio column in %v", rec[0])
	}
	ratio, err := strconv.ParseFloat(rec[2][col], 64)
	if err != nil || !(ratio > 1) {
		t.Errorf("stiffness ratio bands/flat = %q: want > 1", rec[2][col])
	}
	for _, name := range []string{"compare_Fs_Z.svg", "compare_Z_u.png", "flat/summary.json", "bands/history.csv"} {
		if _, err := os.Stat(filepath.Join(out, name)); err != nil {
			t.Errorf("missing %s: %v", name, err)
		}
	}
}

// Bad input to compare: exit 2, and no output directory.
func TestCompareBadInput(t *testing.T) {
	in := t.TempDir()
	flat := coarseModelFile(t, in, "flat.toml", 0)
	broken := filepath.Join(in, "broken.toml")
	if err := os.WriteFile(broken, []byte("title = \"x\"\n[bolt]\nhole = -1\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "cmp")
	for _, args := range [][]string{{"compare", flat}, {"compare", flat, broken, "-o", out}} {
		var stdout, stderr bytes.Buffer
		if code := run(args, &stdout, &stderr); code != exitBadInput {
			t.Errorf("%v: exit %d, want %d", args, code, exitBadInput)
		}
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Errorf("output directory created for bad input: %v", err)
	}
}

// The demo's analysis to failure is the flat face with yielding and large
// deformation, still a valid model.
func TestToFailureVariant(t *testing.T) {
	s, err := modelfile.Decode(demoModels()[0].Data)
	if err != nil {
		t.Fatal(err)
	}
	toFailureVariant(s)
	if s.Analysis.Materials != modelfile.Elastoplastic || !s.Analysis.LargeDeformation || !(s.Load.MaxDisplacement >= 20) {
		t.Errorf("variant %+v, %+v", s.Analysis, s.Load)
	}
	if err := s.Validate(); err != nil {
		t.Error(err)
	}
}

// A figure one run did not reach is printed as "not reached", not as 0,
// and has no ratio; an opening load of 0 (a face open after the preload)
// is a value.
func TestCompareTableNotReached(t *testing.T) {
	zero, open, dec := 0.0, 120.0, 300.0
	var a, b results.Summary
	a.Joint.OpeningLoadKN, a.Joint.DecompressionKN = &open, &dec
	b.Joint.OpeningLoadKN = &zero // decompression not reached
	var out bytes.Buffer
	compareTable(&out, []string{"a", "b"}, []results.Summary{a, b})
	for _, line := range strings.Split(out.String(), "\n") {
		f := strings.Fields(line)
		switch {
		case strings.HasPrefix(line, "decompression load"):
			if !strings.Contains(line, "not reached") || f[len(f)-1] != "—" {
				t.Errorf("decompression load not reached by b: %q", line)
			}
		case strings.HasPrefix(line, "opening load"):
			if strings.Contains(line, "not reached") || f[len(f)-2] != "0" {
				t.Errorf("opening load 0 of b is a value: %q", line)
			}
		}
	}
}
