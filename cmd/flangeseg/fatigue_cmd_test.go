package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/post/fatigue/assess"
)

// fatigueRun writes a synthetic run directory for the flat demo model: a
// history.csv whose bolt force is F_p + slope·Z, and whose interface
// moment is moment·Z (N·mm per N), up to zmax (kN).
func fatigueRun(t *testing.T, slope, moment, zmax float64) (dir string, as float64) {
	t.Helper()
	spec := demoSpec(t, "flat")
	as = spec.Derive().StressArea
	dir = t.TempDir()
	var b strings.Builder
	b.WriteString("increment,stage,Z_kN,u_mm,bolt_force_kN,bolt_moment_interface_kNm,bolt_moment_head_kNm,bolt_stress_axial_MPa,bolt_stress_bending_MPa,gap_edge_mm\n")
	fp := 1000.0 // kN
	for i := 0; i <= 10; i++ {
		stage := 1
		if i == 0 {
			stage = 0
		}
		z := zmax * float64(i) / 10
		fs := fp + slope*z
		m := moment * z // kN·mm per kN → kN·m after /1e3
		fmt.Fprintf(&b, "%d,%d,%g,%g,%g,%g,0,%.12g,0,0\n", i, stage, z, 0.01*float64(i), fs, m/1e3, fs*1e3/as)
	}
	if err := os.WriteFile(filepath.Join(dir, "history.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return dir, as
}

func writeFile(t *testing.T, dir, name, text string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func readFatigueSummary(t *testing.T, dir string) assess.Summary {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, "fatigue_summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var s assess.Summary
	if err := json.Unmarshal(data, &s); err != nil {
		t.Fatal(err)
	}
	return s
}

// Constant amplitude through a linear FE function: the FE damage is the
// closed form n/N_R on the EN 1993-1-9 bolt curve (Table 8.1 detail 14,
// Figure 7.1; M48: k_s = (30/48)^0.25), and Δσ_eq is the range itself at
// N_ref = n with m = 3.
func TestFatigueConstantAmplitude(t *testing.T) {
	run, as := fatigueRun(t, 0.5, 0, 500)
	tmp := t.TempDir()
	loads := writeFile(t, tmp, "loads.csv", "Z_range_kN,Z_mean_kN,cycles\n100,150,2e5\n")
	out := filepath.Join(tmp, "out")
	code, stdout, stderr := runCLI("fatigue", "demo/flat.toml", "--loads", loads, "--from", run, "--stress", "axial",
		"--gamma-mf", "1.15", "--reference-cycles", "2e5", "-o", out)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	ds := 0.5 * 100e3 / as
	dsc := 50 * math.Pow(30.0/48, 0.25)
	want := 2e5 / (2e6 * math.Pow(dsc/(1.15*ds), 3)) // γ_Mf·Δσ = 39.0 MPa lies above Δσ_D = 32.8 MPa: m = 3
	s := readFatigueSummary(t, out)
	fe := s.BoltForceResults[0]
	if fe.Function != "FE" || !near(fe.Damage, want, 1e-8) {
		t.Errorf("%s: D = %.10g, closed form n/N_R = %.10g", fe.Function, fe.Damage, want)
	}
	if !near(fe.EquivalentRangeMPa, ds, 1e-8) || !near(fe.MaxRangeMPa, ds, 1e-8) {
		t.Errorf("Δσ_eq = %g, largest %g, want both %g", fe.EquivalentRangeMPa, fe.MaxRangeMPa, ds)
	}
	for _, name := range []string{"fatigue_bins.csv", "fatigue_blocks.csv", "stress_range_histogram.svg", "stress_range_histogram.png",
		"damage_per_bin.svg", "damage_per_bin.png", "sn_curve.svg", "sn_curve.png"} {
		if _, err := os.Stat(filepath.Join(out, name)); err != nil {
			t.Errorf("%s not written: %v", name, err)
		}
	}
	for _, want := range []string{"damage D", "Governing stress-range bins", "trilinear", "joint diagram", "design aid"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("output lacks %q:\n%s", want, stdout)
		}
	}
}

// Axial + bending adds ΔM/W with W = π·d_s³/32 on the stress-area
// diameter (common practice for the bending stress of a bolt).
func TestFatigueBending(t *testing.T) {
	run, as := fatigueRun(t, 0.5, 2, 500) // M_s = 2 mm·Z
	tmp := t.TempDir()
	loads := writeFile(t, tmp, "loads.csv", "Z_range_kN,Z_mean_kN,cycles\n100,150,1\n")
	out := filepath.Join(tmp, "out")
	if code, o, e := runCLI("fatigue", "demo/flat.toml", "--loads", loads, "--from", run, "-o", out); code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, o, e)
	}
	ds := math.Sqrt(4 * as / math.Pi)
	want := 0.5*100e3/as + 2*100e3/(math.Pi*ds*ds*ds/32)
	if got := readFatigueSummary(t, out).BoltForceResults[0].MaxRangeMPa; !near(got, want, 1e-8) {
		t.Errorf("Δσ = %g MPa, want F/A_s + M/W = %g", got, want)
	}
}

// A tower-section time series is counted by rainflow and converted by
// Z = 4M/(n·D) − N/n (common practice); without --from the trilinear hand
// function governs. The demo tower has D = 4300 mm and n = 120 bolts.
func TestFatigueTowerSeries(t *testing.T) {
	tmp := t.TempDir()
	var b strings.Builder
	b.WriteString("time_s,moment_kNm,normal_force_kN\n")
	for i := 0; i <= 200; i++ {
		m := 20000.0
		if i%2 == 1 {
			m = 60000
		}
		fmt.Fprintf(&b, "%g,%g,3000\n", 0.5*float64(i), m)
	}
	loads := writeFile(t, tmp, "tower.csv", b.String())
	out := filepath.Join(tmp, "out")
	code, stdout, stderr := runCLI("fatigue", "demo/flat.toml", "--loads", loads, "-o", out)
	if code != exitOK {
		t.Fatalf("exit %d\n%s%s", code, stdout, stderr)
	}
	s := readFatigueSummary(t, out)
	zmin := 4*20000e6/(120*4300.0) - 3000e3/120
	zmax := 4*60000e6/(120*4300.0) - 3000e3/120
	if s.Loads.Cycles != 100 || !near(s.Loads.ZMinKN, zmin/1e3, 1e-9) || !near(s.Loads.ZMaxKN, zmax/1e3, 1e-9) {
		t.Errorf("loads %+v: want 100 cycles from %g to %g kN", s.Loads, zmin/1e3, zmax/1e3)
	}
	if s.Governing != "trilinear" || !strings.Contains(s.Loads.Rainflow, "E1049") {
		t.Errorf("governing %q, rainflow %q", s.Governing, s.Loads.Rainflow)
	}
	if _, err := os.Stat(filepath.Join(out, "fatigue_blocks.csv")); err == nil {
		t.Error("fatigue_blocks.csv written for a time series")
	}
}

// The demo loads run on the hand functions alone; damage far above 1
// exits 1.
func TestFatigueDemoLoadsAndExitOne(t *testing.T) {
	out := t.TempDir()
	if code, o, e := runCLI("fatigue", "demo/flat.toml", "--loads", "demo/loads.csv", "-o", out); code != exitOK {
		t.Fatalf("demo loads: exit %d\n%s%s", code, o, e)
	}
	loads := writeFile(t, out, "heavy.csv", "Z_range_kN,Z_mean_kN,cycles\n400,200,1e8\n")
	if code, o, e := runCLI("fatigue", "demo/flat.toml", "--loads", loads, "-o", out); code != exitFailed || !strings.Contains(o, "D > 1") {
		t.Errorf("heavy loads: exit %d, want %d and \"D > 1\"\n%s%s", code, exitFailed, o, e)
	}
}

func TestFatigueBadInput(t *testing.T) {
	run, _ := fatigueRun(t, 0.5, 0, 300)
	tmp := t.TempDir()
	good := writeFile(t, tmp, "good.csv", "Z_range_kN,Z_mean_kN,cycles\n100,100,1e3\n")
	cases := []struct {
		name string
		args []string
		want string
	}{
		{"no loads", []string{"demo/flat.toml"}, "--loads: missing"},
		{"no model", []string{"--loads", good}, "exactly one model file"},
		{"γ_Mf below 1", []string{"demo/flat.toml", "--loads", good, "--gamma-mf", "0.9"}, "--gamma-mf = 0.9: must be a finite number ≥ 1"},
		{"stress basis", []string{"demo/flat.toml", "--loads", good, "--stress", "bending"}, `--stress = "bending"`},
		{"bin width", []string{"demo/flat.toml", "--loads", good, "--bin-width", "0.25"}, "--bin-width = 0.25"},
		{"curve file", []string{"demo/flat.toml", "--loads", good, "--sn-curve", "nonesuch.csv"}, `--sn-curve = "nonesuch.csv"`},
		{"run dir", []string{"demo/flat.toml", "--loads", good, "--from", filepath.Join(tmp, "nonesuch")}, "--from"},
		{"layout", []string{"demo/flat.toml", "--loads", writeFile(t, tmp, "l1.csv", "range,mean,cycles\n1,2,3\n")}, "matches no layout"},
		{"value", []string{"demo/flat.toml", "--loads", writeFile(t, tmp, "l2.csv", "Z_range_kN,Z_mean_kN,cycles\n100,100,-1\n")}, "line 2: cycles = -1: must be > 0"},
		{"beyond the FE function", []string{"demo/flat.toml", "--loads", writeFile(t, tmp, "l3.csv", "Z_range_kN,Z_mean_kN,cycles\n100,280,1\n"), "--from", run},
			"lies beyond the bolt-force function"},
		{"model file", []string{writeFile(t, tmp, "bad.toml", "title = 1\n"), "--loads", good}, "title"},
	}
	for _, c := range cases {
		args := append([]string{"fatigue"}, c.args...)
		args = append(args, "-o", filepath.Join(tmp, "out"))
		code, o, e := runCLI(args...)
		if code != exitBadInput || !strings.Contains(o+e, c.want) {
			t.Errorf("%s: exit %d, want %d with %q\n%s%s", c.name, code, exitBadInput, c.want, o, e)
		}
	}
}

func TestFatigueHelp(t *testing.T) {
	code, _, e := runCLI("fatigue", "--help")
	for _, want := range []string{"Z_range_kN,Z_mean_kN,cycles", "moment_range_kNm", "ASTM E1049-85", "EN 1993-1-9", "design aid", "-gamma-mf"} {
		if code != exitOK || !strings.Contains(e, want) {
			t.Errorf("help: exit %d, lacks %q", code, want)
		}
	}
}
