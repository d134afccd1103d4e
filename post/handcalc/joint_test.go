package handcalc

import (
	"bytes"
	"encoding/json"
	"math"
	"regexp"
	"strings"
	"testing"
)

// demoJoint is an invented, plausible tower-flange segment (our numbers, not
// a published case): S355 shell t = 30 mm (f_y = 345 MPa for 16 < t ≤ 40) and
// flange t_f = 80 mm (f_y = 325 MPa for 63 < t ≤ 80, EN 10025-2), M48 10.9,
// a = 70, b = 80, c = 120 mm.
func demoJoint() Joint {
	return Joint{
		T: 30, Tf: 80, A: 70, B: 80, C: 120,
		Size: "M48", Grade: "10.9",
		Hole: 52, Washer: 92, WasherThickness: 8, FreeThread: 20,
		ShellFy: 345, FlangeFy: 325, Preload: 1000e3, E: 210000,
	}
}

func TestJointValidate(t *testing.T) {
	if err := demoJoint().Validate(); err != nil {
		t.Fatalf("demo joint: %v", err)
	}
	cases := []struct {
		edit func(*Joint)
		want string // field, value and rule
	}{
		{func(j *Joint) { j.T = 0 }, "t = 0: must be > 0"},
		{func(j *Joint) { j.Tf = -5 }, "t_f = -5: must be > 0"},
		{func(j *Joint) { j.C = 50 }, "c = 50: must exceed the hole diameter d_h = 52"},
		{func(j *Joint) { j.A = 20 }, "a = 20: must exceed d_h/2 = 26"},
		{func(j *Joint) { j.B = 40 }, "b = 40: must exceed t/2 + d_h/2 = 41"},
		{func(j *Joint) { j.Size = "M50" }, `size = "M50"`},
		{func(j *Joint) { j.D = 48 }, "give a size or d and pitch, not both"},
		{func(j *Joint) { j.Size, j.D, j.Pitch = "", 48, 0 }, "pitch = 0: must be > 0"},
		{func(j *Joint) { j.Grade = "10.8" }, `grade = "10.8": must be 8.8, 10.9 or 12.9`},
		{func(j *Joint) { j.Hole = 47 }, "d_h = 47: must exceed the bolt diameter d = 48"},
		{func(j *Joint) { j.Washer = 50 }, "d_w = 50: must exceed the hole diameter d_h = 52"},
		{func(j *Joint) { j.WasherThickness = -1 }, "washer_thickness = -1: must be ≥ 0"},
		{func(j *Joint) { j.FreeThread = 200 }, "free_thread = 200: must lie in [0, l_K = 176]"},
		{func(j *Joint) { j.ShellFy = math.NaN() }, "shell_f_y = NaN: must be a finite number"},
		{func(j *Joint) { j.FlangeFy = 0 }, "flange_f_y = 0: must be > 0"},
		{func(j *Joint) { j.Preload = 0 }, "preload = 0: must be > 0"},
		{func(j *Joint) { j.E = math.Inf(1) }, "e = +Inf: must be a finite number"},
	}
	for _, c := range cases {
		j := demoJoint()
		c.edit(&j)
		err := j.Validate()
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("want %q, got %v", c.want, err)
		}
		if _, err := Analyze(j, DefaultParams()); err == nil {
			t.Errorf("Analyze accepted a joint with %q", c.want)
		}
	}
	// All errors at once.
	j := demoJoint()
	j.T, j.Preload = 0, -1
	if err := j.Validate(); err == nil || !strings.Contains(err.Error(), "t = 0") || !strings.Contains(err.Error(), "preload = -1") {
		t.Errorf("two errors: %v", err)
	}
	// A thread by diameter and pitch.
	j = demoJoint()
	j.Size, j.D, j.Pitch = "", 48, 5
	if err := j.Validate(); err != nil {
		t.Errorf("d and pitch: %v", err)
	}
}

func TestParamsValidate(t *testing.T) {
	if err := DefaultParams().Validate(); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		edit func(*Params)
		want string
	}{
		{func(p *Params) { p.K2 = 0 }, "k2 = 0"},
		{func(p *Params) { p.GammaM2 = 0.9 }, "gamma_m2 = 0.9"},
		{func(p *Params) { p.GammaM0 = 0 }, "gamma_m0 = 0"},
		{func(p *Params) { p.LeverLimit = -1 }, "lever_limit = -1"},
		{func(p *Params) { p.LoadIntroduction = 1.5 }, "load_introduction = 1.5"},
		{func(p *Params) { p.ArmFactor = 0 }, "arm_factor = 0"},
	}
	for _, c := range cases {
		p := DefaultParams()
		c.edit(&p)
		if _, err := Analyze(demoJoint(), p); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("want %q, got %v", c.want, err)
		}
	}
}

// The demo joint's resistances per segment on the design basis, by hand:
// A_s(M48) = 1473.15 mm², F_t,Rd = 0.9·1000·1473.15/1.25 = 1 060 667 N;
// M_pl,shell = 345·120·30²/4 = 9.315e6 N·mm, N_pl = 345·120·30 = 1.242e6 N;
// flange at the shell face 325·120·80²/4 = 62.4e6 N·mm, at the bolt line
// 325·(120 − 52)·80²/4 = 35.36e6 N·mm. Then (Petersen):
// Z_B = (1 060 667·70 + 9.315e6)/150 = 83.5617e6/150 = 557 078 N,
// Z_C = (35.36e6 + 9.315e6)/80 = 558 438 N, so mode B governs, narrowly.
// On the characteristic basis the bolt gets A_s·0.9·1000 = 1 325 834 N and
// Z_B = (92.8084e6 + 9.315e6)/150 = 680 823 N, so mode C (558 438 N) governs.
func TestSegmentHingesDemo(t *testing.T) {
	h, err := SegmentHinges(demoJoint(), DefaultParams(), BasisDesign)
	if err != nil {
		t.Fatal(err)
	}
	want := Hinges{A: 70, B: 80, Bolt: 1060667, Shell: 9.315e6, ShellAxial: 1.242e6,
		FlangeGross: 62.4e6, FlangeNet: 35.36e6, LeverLimit: 1.25}
	got := []float64{h.Bolt, h.Shell, h.ShellAxial, h.FlangeGross, h.FlangeNet}
	for i, w := range []float64{want.Bolt, want.Shell, want.ShellAxial, want.FlangeGross, want.FlangeNet} {
		if !near(got[i], w, 1e-6) {
			t.Errorf("resistance %d = %g, hand %g", i, got[i], w)
		}
	}
	cases := []struct {
		basis  Basis
		zB, zC float64
		mode   Mode
	}{
		{BasisDesign, 557078, 558438, ModeB},
		{BasisCharacteristic, 680823, 558438, ModeC},
	}
	r, err := Analyze(demoJoint(), DefaultParams())
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		u, ok := r.UltimateOn(c.basis)
		if !ok {
			t.Fatalf("no %s entry", c.basis)
		}
		if !near(u.Petersen.B, c.zB, 2e-6) || !near(u.Petersen.C, c.zC, 2e-6) || u.Petersen.Governing != c.mode {
			t.Errorf("%s: B %.0f, C %.0f, %s; hand %.0f, %.0f, %s", c.basis,
				u.Petersen.B, u.Petersen.C, u.Petersen.Governing, c.zB, c.zC, c.mode)
		}
	}
	if _, err := SegmentHinges(demoJoint(), DefaultParams(), "nominal"); err == nil {
		t.Error("unknown basis accepted")
	}
}

// Relations that hold whatever the numbers: dropping k₂ or the partial
// factors never lowers a capacity, Seidel never exceeds Petersen, the curves
// start at the preload and end at CurveEnd.
func TestAnalyzeDemo(t *testing.T) {
	r, err := Analyze(demoJoint(), DefaultParams())
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Ultimate) != len(Bases()) {
		t.Fatalf("%d ultimate entries", len(r.Ultimate))
	}
	for i, b := range Bases() {
		u := r.Ultimate[i]
		if u.Basis != b {
			t.Errorf("entry %d is %s, want %s", i, u.Basis, b)
		}
		if u.Seidel.Z > u.Petersen.Z {
			t.Errorf("%s: Seidel %g above Petersen %g", b, u.Seidel.Z, u.Petersen.Z)
		}
	}
	order := [][2]Basis{{BasisDesign, BasisDesignNoK2}, {BasisDesign, BasisCharacteristic},
		{BasisCharacteristic, BasisCharacteristicNoK2}, {BasisDesignNoK2, BasisCharacteristicNoK2}}
	for _, o := range order {
		lo, _ := r.UltimateOn(o[0])
		hi, _ := r.UltimateOn(o[1])
		if lo.Petersen.Z > hi.Petersen.Z || lo.Seidel.Z > hi.Seidel.Z {
			t.Errorf("%s above %s", o[0], o[1])
		}
	}
	if r.Bolt.TensionResistance != r.Ultimate[0].Hinges.Bolt {
		t.Errorf("F_t,Rd %g but design bolt resistance %g", r.Bolt.TensionResistance, r.Ultimate[0].Hinges.Bolt)
	}
	// Clamp: l_K = 2·80 + 2·8 = 176, D_A' = min(120, 140, 190) = 120.
	if r.Clamp.Length != 176 || r.Clamp.Outer != 120 || r.BoltBody.Shank != 156 {
		t.Errorf("clamp %+v, bolt body %+v", r.Clamp, r.BoltBody)
	}
	phi := r.JointDiagram.LoadFactor
	if !(phi > 0 && phi < 0.5) || !near(r.Trilinear.Stiffness, 2*phi, 1e-12) {
		t.Errorf("Φ = %g, p = %g (n = 0.5)", phi, r.Trilinear.Stiffness)
	}
	for _, ps := range [][]Point{r.JointDiagramPoints, r.TrilinearPoints} {
		if ps[0].Fs != 1000e3 || ps[len(ps)-1].Z != r.CurveEnd {
			t.Errorf("points %+v, curve end %g", ps, r.CurveEnd)
		}
	}
	cu, _ := r.UltimateOn(BasisCharacteristicNoK2)
	if r.CurveEnd != cu.Seidel.Z {
		t.Errorf("curve end %g, want %g", r.CurveEnd, cu.Seidel.Z)
	}
}

var snake = regexp.MustCompile(`^[a-z][a-z0-9]*(_[a-z0-9]+)*$`)

// Results serialise with snake_case names only, and the same input gives
// byte-identical JSON.
func TestResultsJSON(t *testing.T) {
	r, err := Analyze(demoJoint(), DefaultParams())
	if err != nil {
		t.Fatal(err)
	}
	b1, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	r2, _ := Analyze(demoJoint(), DefaultParams())
	b2, _ := json.Marshal(r2)
	if !bytes.Equal(b1, b2) {
		t.Error("two runs differ")
	}
	var v any
	if err := json.Unmarshal(b1, &v); err != nil {
		t.Fatal(err)
	}
	var walk func(path string, v any)
	walk = func(path string, v any) {
		switch x := v.(type) {
		case map[string]any:
			for k, e := range x {
				if !snake.MatchString(k) {
					t.Errorf("%s.%s: not snake_case", path, k)
				}
				walk(path+"."+k, e)
			}
		case []any:
			for _, e := range x {
				walk(path+"[]", e)
			}
		}
	}
	walk("results", v)
	var back Results
	if err := json.Unmarshal(b1, &back); err != nil {
		t.Fatal(err)
	}
	if back.Ultimate[0].Petersen != r.Ultimate[0].Petersen {
		t.Error("round trip changed the results")
	}
}

func BenchmarkAnalyze(b *testing.B) {
	j, p := demoJoint(), DefaultParams()
	for b.Loop() {
		if _, err := Analyze(j, p); err != nil {
			b.Fatal(err)
		}
	}
}
