package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// sweepPlan writes a plan over a model of the repository (a path from the
// repository's root) and returns its path.
func sweepPlan(t *testing.T, base, body string) string {
	t.Helper()
	abs, err := filepath.Abs(filepath.Join("..", "..", base))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "plan.toml")
	if err := os.WriteFile(path, []byte("base = "+strconv.Quote(abs)+"\n"+body), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// Two cases that stop in the preload (cheap): the sweep runs both, writes
// the tables and exits 3; run again it runs nothing.
func TestSweepCommand(t *testing.T) {
	plan := sweepPlan(t, "testdata/endings/gap_not_closed.toml", `
set = { mesh = { size = 16 }, load = { increments = 2 } }
[[vary]]
key = "preload.nut_turn"
values = [4, 5]
`)
	dir := filepath.Join(t.TempDir(), "out")
	code, out, errs := runCLI("sweep", plan, "-o", dir)
	if code != exitAnalysis {
		t.Fatalf("exit %d, want %d\n%s%s", code, exitAnalysis, out, errs)
	}
	for _, want := range []string{"2 of 2 cases", "0 finished, 2 stopped early", "case 1 case-01: stopped:", "sweep.csv"} {
		if !strings.Contains(out, want) {
			t.Errorf("stdout lacks %q:\n%s", want, out)
		}
	}
	if n := strings.Count(errs, ": stopped in "); n != 2 {
		t.Errorf("stderr reports %d cases, want a line each for 2:\n%s", n, errs)
	}
	for _, f := range []string{"sweep.csv", "sweep.json", "report.html", "cases/case-02/case.json"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Error(err)
		}
	}
	code, _, errs = runCLI("sweep", plan, "-o", dir)
	if code != exitAnalysis || strings.Count(errs, "already done") != 2 {
		t.Errorf("run again: exit %d, want %d with both cases already done:\n%s", code, exitAnalysis, errs)
	}
	code, out, _ = runCLI("sweep", plan, "-o", dir, "--collect")
	if code != exitAnalysis || !strings.Contains(out, "2 stopped early") {
		t.Errorf("--collect: exit %d, want %d:\n%s", code, exitAnalysis, out)
	}

	// A shard whose cases all have their records did its part: exit 0,
	// the stopped case named; the collect gives the sweep's status.
	sharded := filepath.Join(t.TempDir(), "out")
	for _, s := range []string{"1/2", "2/2"} {
		code, out, errs := runCLI("sweep", plan, "-o", sharded, "--shard", s)
		if code != exitOK || !strings.Contains(out, "shard "+s+": 0 finished, 1 stopped early") || !strings.Contains(out, "--collect") {
			t.Errorf("--shard %s: exit %d, want %d:\n%s%s", s, code, exitOK, out, errs)
		}
	}
	if code, out, _ := runCLI("sweep", plan, "-o", sharded, "--collect"); code != exitAnalysis || !strings.Contains(out, "2 stopped early") {
		t.Errorf("--collect after the shards: exit %d, want %d:\n%s", code, exitAnalysis, out)
	}
}

// A bad plan or bad flags exit 2 before anything runs; every plan error
// is named at once.
func TestSweepBadInput(t *testing.T) {
	good := "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, 0.2]\n"
	for _, tc := range []struct {
		name, plan string
		args       []string
		env        map[string]string
		want       []string
	}{
		{"plan errors", "colour = 2\n[[vary]]\nkey = \"flange.thicknes\"\nvalues = [80]\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, -1]\n", nil, nil,
			[]string{`unknown key "colour"`, `vary[0].key = "flange.thicknes"`, "plan is invalid (2 errors); nothing was run"}},
		{"invalid case", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, -1]\n", nil, nil, []string{"case 2 (case-02: contact.recess = -1)", "contact.recess = -1"}},
		{"bad shard", good, []string{"--shard", "5/4"}, nil, []string{"1 ≤ I ≤ N"}},
		{"shard and collect", good, []string{"--shard", "1/2", "--collect"}, nil, []string{"--collect takes every case"}},
		{"shards without an index", good, []string{"--shards", "3"}, nil, []string{"without JOB_COMPLETION_INDEX"}},
		{"index without a count", good, nil, map[string]string{"JOB_COMPLETION_INDEX": "1"}, []string{"--shards N"}},
		{"two plans", good, []string{"other.toml"}, nil, []string{"exactly one plan file"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for k, v := range tc.env {
				t.Setenv(k, v)
			}
			dir := filepath.Join(t.TempDir(), "out")
			args := append([]string{"sweep", sweepPlan(t, "cmd/flangeseg/demo/bands.toml", tc.plan), "-o", dir}, tc.args...)
			code, out, errs := runCLI(args...)
			if code != exitBadInput {
				t.Errorf("exit %d, want %d", code, exitBadInput)
			}
			for _, w := range tc.want {
				if !strings.Contains(out+errs, w) {
					t.Errorf("output lacks %q:\n%s%s", w, out, errs)
				}
			}
			if _, err := os.Stat(dir); err == nil {
				t.Errorf("%s was made, but nothing may run", dir)
			}
		})
	}
}

// --list prints every case with its values, and marks the shard's, from
// the flag or from a Slurm array task's variables.
func TestSweepList(t *testing.T) {
	plan := sweepPlan(t, "cmd/flangeseg/demo/bands.toml", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, 0.2, 0.3]\n[[case]]\nname = \"wide\"\nset = { \"contact.zones[1].from\" = 60 }\n")
	for _, tc := range []struct {
		name string
		args []string
		env  map[string]string
		mine []int // cases marked as the shard's (from 1)
	}{
		{"all", nil, nil, nil},
		{"flag", []string{"--shard", "2/3"}, nil, []int{2}},
		{"slurm", nil, map[string]string{"SLURM_ARRAY_TASK_ID": "0", "SLURM_ARRAY_TASK_COUNT": "2", "SLURM_ARRAY_TASK_MIN": "0"}, []int{1, 3}},
		{"kubernetes", []string{"--shards", "2"}, map[string]string{"JOB_COMPLETION_INDEX": "1"}, []int{2, 4}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for k, v := range tc.env {
				t.Setenv(k, v)
			}
			code, out, errs := runCLI(append([]string{"sweep", plan, "--list"}, tc.args...)...)
			if code != exitOK {
				t.Fatalf("exit %d\n%s%s", code, out, errs)
			}
			lines := strings.Split(strings.TrimSpace(out), "\n")
			if len(lines) != 4 || !strings.Contains(lines[1], "case-02  contact.recess = 0.2") || !strings.Contains(lines[3], "wide  contact.zones[1].from = 60") {
				t.Fatalf("list:\n%s", out)
			}
			for i, l := range lines {
				marked := strings.Contains(l, "(shard ")
				want := false
				for _, m := range tc.mine {
					want = want || m == i+1
				}
				if marked != want {
					t.Errorf("case %d marked %v, want %v: %q", i+1, marked, want, l)
				}
			}
		})
	}
}

func TestSweepHelp(t *testing.T) {
	_, out, _ := runCLI("help")
	if !strings.Contains(out, "sweep") {
		t.Errorf("help does not list sweep:\n%s", out)
	}
	code, _, errs := runCLI("sweep", "--help")
	for _, want := range []string{"Usage: flangeseg sweep", "[[vary]]", "SLURM_ARRAY_TASK_ID", "JOB_COMPLETION_INDEX", "design aid"} {
		if code != exitOK || !strings.Contains(errs, want) {
			t.Errorf("sweep --help (exit %d) lacks %q", code, want)
		}
	}
}
