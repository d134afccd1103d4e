package modelfile

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"flangeseg/material"
)

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Abs(want)
}

// demoDir holds the demo models the binary embeds; the tests read them
// from there, so there is one copy.
var demoDir = filepath.Join("..", "..", "..", "cmd", "flangeseg", "demo")

// demoNames are the demo models, in the order the binary runs them.
var demoNames = []string{"flat", "bands"}

func demoData(t *testing.T, name string) []byte {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(demoDir, name+".toml"))
	if err != nil {
		t.Fatal(err)
	}
	return data
}

func demoSpec(t *testing.T, name string) *Spec {
	t.Helper()
	s, err := Decode(demoData(t, name))
	if err != nil {
		t.Fatalf("demo %s: %v", name, err)
	}
	return s
}

// The demo joint (invented: D = 4300, n = 120, t = 28, t_f = 90, a = 75,
// b = 85, M48 10.9, d_h = 52, d_w = 92, t_w = 8, S355) worked by hand.
func TestDemoDerived(t *testing.T) {
	// ISO 898-1: A_s = π/4·((d₂ + d₃)/2)², d₂ = d − 0.6495P, d₃ = d − 1.2269P;
	// M48, P = 5 (ISO 261): d₂ = 44.7525, d₃ = 41.8655, A_s = 1473.15 mm²
	// (ISO 898-1 tabulates 1473).
	as := math.Pi / 4 * math.Pow(((48-0.6495*5)+(48-1.2269*5))/2, 2)
	a := math.Pi / 4 * 48 * 48
	h := math.Sqrt(3) / 2 * 48
	c := 2 * math.Pi * (2150 - 85) / 120 // 108.12 mm
	for _, name := range []string{"flat", "bands"} {
		d := demoSpec(t, name).Derive()
		cases := []struct {
			what      string
			got, want float64
		}{
			{"d", d.D, 48},
			{"P", d.Pitch, 5},
			{"A_s", d.StressArea, as},
			{"A", d.NominalArea, a},
			{"f_ub (EN 1993-1-8 Table 3.1)", d.Fub, 1000},
			{"f_yb (EN 1993-1-8 Table 3.1)", d.Fyb, 900},
			{"F_p,C = 0.7·f_ub·A_s (EN 1993-1-8 3.9)", d.DesignPreload, 0.7 * 1000 * as},
			{"yield force A_s·f_yb", d.YieldForce, 900 * as},
			{"F_p (fraction 1.0)", d.PreloadForce, 0.7 * 1000 * as},
			{"R_b", d.BoltCircleRadius, 2065},
			{"c", d.SegmentWidth, c},
			{"l_k = 2(90 + 8)", d.ClampLength, 196},
			{"thread in clamp", d.ThreadInClamp, 24},
			{"shank in clamp", d.ShankInClamp, 172},
			{"shell strip", d.ShellStrip, c},
			{"flange strip", d.FlangeStrip, c},
			{"hole band c − 52", d.HoleBandStrip, c - 52},
			{"h = (√3/2)·48", d.BoltWidth, 41.5692},
			{"shank A/h", d.ShankStrip, a / h},
			{"thread A_s/h", d.ThreadStrip, as / h},
			// π(92² − 52²)/(4·40) = π·5760/160 = 36π
			{"bearing t_b", d.BearingStrip, 36 * math.Pi},
			// EN 10025-2 (CHECKS.md): S355 at 16 < t ≤ 40 and at 80 < t ≤ 100.
			{"shell f_y, t = 28", d.ShellYield, 345},
			{"flange f_y, t_f = 90", d.FlangeYield, 315},
			// 210000·28/2150² N/mm³
			{"ring spring E·t/R²", d.RingSpring, 5.88e6 / 4.6225e6},
			// 1/β = √(R·t)/(3(1 − ν²))^¼ = √60200/2.73^¼ = 245.357/1.28541
			{"1/β", d.DecayLength, 190.879},
			{"3/β", d.ThreeDecayLengths, 572.636},
		}
		for _, k := range cases {
			if !near(k.got, k.want, 1e-5) {
				t.Errorf("%s: %s = %.6g, hand %.6g", name, k.what, k.got, k.want)
			}
		}
		if math.Abs(d.StressArea-1473) > 0.5 {
			t.Errorf("%s: A_s = %.2f mm², ISO 898-1 table 1473 mm²", name, d.StressArea)
		}
		if d.SegmentWidth <= 92 {
			t.Errorf("%s: c = %.1f mm must exceed the washer 92 mm", name, d.SegmentWidth)
		}
		if len(d.Warnings) != 0 {
			t.Errorf("%s: warnings %q", name, d.Warnings)
		}
	}
}

func TestDemoBandsZones(t *testing.T) {
	s := demoSpec(t, "bands")
	want := []ZoneSpec{{From: -75, To: -50}, {From: 65, To: 99}}
	if !reflect.DeepEqual(s.Contact.Zones, want) || s.Contact.Recess != 0.3 || s.Contact.RecessOn != RecessBoth {
		t.Errorf("contact %+v", s.Contact)
	}
	if flat := demoSpec(t, "flat"); flat.Contact.Zones != nil {
		t.Errorf("flat: zones %v, want none", flat.Contact.Zones)
	}
}

// minimalModel gives only the required keys.
const minimalModel = `
[tower]
diameter = 4300
bolts = 120
[shell]
thickness = 28
length = 600
material = "S355"
[flange]
thickness = 90
a = 75
b = 85
material = "S355"
[bolt]
size = "M48"
grade = "10.9"
thread = "partial"
hole = 52
washer_outer = 92
washer_thickness = 8
head_height = 30
nut_height = 38
[load]
max_displacement = 1.2
`

func TestDefaults(t *testing.T) {
	s, err := Decode([]byte(minimalModel))
	if err != nil {
		t.Fatal(err)
	}
	want := *s
	want.Flange.NeckRadius = 0
	want.Bolt.ThreadLength = ptr(24.0) // 0.5·d
	want.Contact = ContactSpec{RecessOn: "both"}
	want.Preload = PreloadSpec{Fraction: ptr(1.0)}
	want.Load = LoadSpec{MaxDisplacement: 1.2, Increments: 40, StopDrop: 0.2, EndRotation: "free"}
	want.Mesh = MeshSpec{Size: 9, Refine: 0.3, Element: "quad8"} // round(28/3)
	want.Analysis = AnalysisSpec{Plane: "stress", RingSprings: true, Materials: "elastoplastic", BoltStrength: "minimum", NeckingWeight: ptr(0.5),
		DamageAlphaSteel: material.StructuralSteelDamage().Alpha, DamageBetaSteel: material.StructuralSteelDamage().Beta,
		DamageAlphaBolt: material.BoltSteelDamage().Alpha, DamageBetaBolt: material.BoltSteelDamage().Beta}
	if !reflect.DeepEqual(*s, want) {
		t.Errorf("defaults:\n got %+v\nwant %+v", *s, want)
	}
	// A full thread takes no thread_length: it runs the clamp.
	full, err := Decode([]byte(strings.Replace(minimalModel, `"partial"`, `"full"`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	if full.Bolt.ThreadLength != nil || full.Derive().ThreadInClamp != 196 {
		t.Errorf("full thread: thread_length %v, thread in clamp %g", full.Bolt.ThreadLength, full.Derive().ThreadInClamp)
	}
}

func TestDefaultMeshSize(t *testing.T) {
	for _, c := range []struct{ t, want float64 }{{28, 9}, {30, 10}, {10, 3}, {2, 1}, {0, 1}, {-5, 1}, {math.NaN(), 1}} {
		if got := defaultMeshSize(c.t); got != c.want {
			t.Errorf("defaultMeshSize(%g) = %g, want %g", c.t, got, c.want)
		}
	}
}

// fullModel uses the keys the demos leave out.
const fullModel = `title = "every key"
[tower]
diameter = 5000
bolts = 140
[shell]
thickness = 30
length = 700
material = "steel A"
[flange]
thickness = 100
a = 80
b = 90
material = "S460"
neck_radius = 10
[bolt]
diameter = 45
pitch = 4.5
grade = "8.8"
thread = "full"
hole = 48
washer_outer = 85
washer_thickness = 0
head_height = 28
nut_height = 36
material = "bolt curve"
[contact]
friction = 0.15
zones = [{from = 60, to = 105}, {from = -80, to = -60}]
recess = 0.2
recess_on = "lower"
taper = -0.25
parallel_gap = 0.05
[preload]
nut_turn = 90
[load]
max_displacement = 2
increments = 1
stop_drop = 0.5
end_rotation = "fixed"
service_force = 250e3
design_force = 4.2e5
[mesh]
size = 5
refine = 1
element = "quad4"
[analysis]
plane = "strain"
large_deformation = true
ring_springs = false
[materials."steel A"]
E = 205000
nu = 0.29
curve = [[0.0017, 340], [0.02, 360], [0.15, 500]]
curve_kind = "true"
[materials."bolt curve"]
E = 210000
nu = 0.3
curve = [[0.004, 840], [0.03, 1000], [0.08, 950]]
curve_kind = "engineering"
[materials.S355]
E = 200000
nu = 0.3
`

// The resolved model decodes to an equal Spec and resolves to the same text.
func TestResolvedRoundTrip(t *testing.T) {
	inputs := map[string][]byte{"minimal": []byte(minimalModel), "full": []byte(fullModel)}
	for _, name := range demoNames {
		inputs[name] = demoData(t, name)
	}
	for name, data := range inputs {
		s, err := Decode(data)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		text, err := s.ResolvedTOML()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		back, err := Decode(text)
		if err != nil {
			t.Fatalf("%s: resolved model does not decode: %v\n%s", name, err, text)
		}
		if !reflect.DeepEqual(s, back) {
			t.Errorf("%s: round trip changed the model:\n got %+v\nwant %+v", name, back, s)
		}
		again, _ := back.ResolvedTOML()
		if !bytes.Equal(text, again) {
			t.Errorf("%s: resolving twice differs:\n%s\n---\n%s", name, text, again)
		}
	}
}

func TestDerivedFullModel(t *testing.T) {
	s, err := Decode([]byte(fullModel))
	if err != nil {
		t.Fatal(err)
	}
	d := s.Derive()
	// nut_turn 90° with P = 4.5 mm: 90/360·4.5 = 1.125 mm, no target force.
	if !near(d.PreloadShortening, 1.125, 1e-12) || d.PreloadForce != 0 {
		t.Errorf("nut turn: shortening %g mm, force %g N", d.PreloadShortening, d.PreloadForce)
	}
	// 8.8: 640/800 MPa (EN 1993-1-8 Table 3.1); full thread: thread = l_k = 2·100.
	if d.Fyb != 640 || d.Fub != 800 || d.ThreadInClamp != 200 || d.ShankInClamp != 0 {
		t.Errorf("f_yb %g, f_ub %g, thread %g, shank %g", d.Fyb, d.Fub, d.ThreadInClamp, d.ShankInClamp)
	}
	// The user's material: E = 205000, yield at the curve's first point;
	// S460 at 80 < t_f ≤ 100: 400 MPa (EN 10025-4, from memory, CHECKS.md).
	if d.ShellYield != 340 || d.FlangeYield != 400 || !near(d.RingSpring, 205000*30/(2500.0*2500), 1e-12) {
		t.Errorf("shell f_y %g, flange f_y %g, ring spring %g", d.ShellYield, d.FlangeYield, d.RingSpring)
	}
	wants := []string{"ring_springs = false", "[materials.S355] replaces the built-in", "[materials.S355] is defined but not used"}
	all := strings.Join(d.Warnings, "\n")
	for _, w := range wants {
		if !strings.Contains(all, w) {
			t.Errorf("warnings lack %q:\n%s", w, all)
		}
	}
}

func TestWarnings(t *testing.T) {
	cases := []struct {
		old, new string
		want     string
	}{
		{"length = 600", "length = 300", "shell.length = 300 mm is shorter than 3/β = 573 mm: the end condition will influence the prying force"},
		{"max_displacement = 1.2", "max_displacement = 1.2\n[contact]\nrecess = 0.3", "contact.recess = 0.3 mm has no effect"},
		{"max_displacement = 1.2", "max_displacement = 1.2\n[mesh]\nsize = 15", "mesh.size = 15 mm gives fewer than two elements"},
		{"max_displacement = 1.2", "max_displacement = 1.2\n[contact]\nzones = [{from = -10, to = 10}]", "contact.zones[0] = [-10, 10] lies inside the bolt hole"},
	}
	for _, c := range cases {
		s, err := Decode([]byte(strings.Replace(minimalModel, c.old, c.new, 1)))
		if err != nil {
			t.Fatalf("%q: %v", c.new, err)
		}
		if w := strings.Join(s.Derive().Warnings, "\n"); !strings.Contains(w, c.want) {
			t.Errorf("%q: warnings lack %q:\n%s", c.new, c.want, w)
		}
	}
}

// Minimum yield strengths by thickness band: EN 10025-2 (S235–S355),
// EN 10025-3/-4 (S420, S460, from memory), as CHECKS.md tabulates them.
func TestSteelYield(t *testing.T) {
	cases := []struct {
		grade string
		t     float64
		want  float64 // 0: an error
	}{
		{"S235", 16, 235}, {"S235", 16.5, 225}, {"S235", 150, 195},
		{"S275", 63, 255}, {"S275", 80, 245},
		{"S355", 10, 355}, {"S355", 40, 345}, {"S355", 63, 335}, {"S355", 80, 325}, {"S355", 100, 315}, {"S355", 120, 295},
		{"S420", 100, 360}, {"S460", 150, 385},
		{"S355", 151, 0}, {"S355", 0, 0}, {"S355", -1, 0}, {"S356", 20, 0}, {"s355", 20, 0},
	}
	for _, c := range cases {
		got, err := steelYield(c.grade, c.t)
		if c.want == 0 {
			if err == nil {
				t.Errorf("steelYield(%s, %g) = %g: want an error", c.grade, c.t, got)
			}
			continue
		}
		if err != nil || got != c.want {
			t.Errorf("steelYield(%s, %g) = %g, %v; want %g", c.grade, c.t, got, err, c.want)
		}
	}
}

func TestEditDistance(t *testing.T) {
	for _, c := range []struct {
		a, b string
		want int
	}{{"", "", 0}, {"thicknes", "thickness", 1}, {"flang", "flange", 1}, {"abc", "", 3}, {"kitten", "sitting", 3}} {
		if got := editDistance(c.a, c.b); got != c.want {
			t.Errorf("editDistance(%q, %q) = %d, want %d", c.a, c.b, got, c.want)
		}
	}
}
