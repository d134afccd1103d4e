package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// flatModel is the text of the flat demo model, the base of the broken ones.
func flatModel(t *testing.T) string {
	t.Helper()
	for _, m := range demoModels() {
		if m.Name == "flat" {
			return string(m.Data)
		}
	}
	t.Fatal("no flat demo model")
	return ""
}

// edit applies replacements (old, new, old, new, …) to text, each of
// which must match.
func edit(t *testing.T, text string, pairs ...string) string {
	t.Helper()
	for i := 0; i+1 < len(pairs); i += 2 {
		if !strings.Contains(text, pairs[i]) {
			t.Fatalf("edit: %q not in the model", pairs[i])
		}
		text = strings.Replace(text, pairs[i], pairs[i+1], 1)
	}
	return text
}

// brokenModels are edits of the flat demo, each breaking one rule, with a
// part of the message that must name the key.
func brokenModels() []struct {
	name  string
	edits []string
	want  string
} {
	return []struct {
		name  string
		edits []string
		want  string
	}{
		{"missing key", []string{"diameter = 4300\n", ""}, "tower.diameter: missing"},
		{"missing table", []string{"[load]", "[loads]"}, "load.max_displacement: missing"},
		{"unknown key", []string{"thickness = 90", "thicknes = 90"}, `unknown key "flange.thicknes" (did you mean "thickness"?)`},
		{"unknown key in letter case", []string{"bolts = 120", "Bolts = 120"}, `unknown key "tower.Bolts"`},
		{"unknown table", []string{"[mesh]", "[meshing]"}, `unknown key "meshing"`},
		{"unknown key in a zone", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = -75, too = -50}]"}, `unknown key "contact.zones[0].too"`},
		{"negative thickness", []string{"thickness = 28", "thickness = -28"}, "shell.thickness = -28: must be > 0"},
		{"not finite", []string{"thickness = 28", "thickness = inf"}, "shell.thickness = +Inf: must be a finite number"},
		{"hole equal to bolt", []string{"hole = 52", "hole = 48"}, "bolt.hole = 48: must exceed the bolt diameter 48 mm"},
		{"washer inside hole", []string{"washer_outer = 92", "washer_outer = 50"}, "bolt.washer_outer = 50: must exceed the hole diameter 52 mm"},
		{"washer against shell", []string{"b = 85", "b = 55"}, "flange.b = 55: leaves b − t/2 − neck_radius = 41 mm between bolt axis and shell, less than the washer radius d_w/2 = 46 mm"},
		{"washer past free edge", []string{"a = 75", "a = 40"}, "flange.a = 40: must be at least the washer radius d_w/2 = 46 mm"},
		{"segment narrower than washer", []string{"bolts = 120", "bolts = 150"}, "tower.bolts = 150: segment width c = 2π·R_b/n = 86.5 mm is smaller than the washer outer diameter 92 mm"},
		{"too few bolts", []string{"bolts = 120", "bolts = 2"}, "tower.bolts = 2: must be ≥ 3"},
		{"zone outside face", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = -80, to = -50}]"}, "contact.zones[0]: from -80 lies outside the face x ∈ [-75, 99]"},
		{"zone past shell", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = 65, to = 100}]"}, "contact.zones[0]: to 100 lies outside the face"},
		{"overlapping zones", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = 0, to = 50}, {from = -75, to = -50}, {from = 40, to = 99}]"}, "contact.zones[0] and contact.zones[2] overlap: [0, 50] and [40, 99]"},
		{"from above to", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = -75, to = -50}, {from = 40, to = 30}]"}, "contact.zones[1]: from 40 > to 30"},
		{"empty zone list", []string{"friction = 0.2", "friction = 0.2\nzones = []"}, "contact.zones: empty"},
		{"zone without end", []string{"friction = 0.2", "friction = 0.2\nzones = [{from = -75}]"}, "contact.zones[0].to: missing"},
		{"negative friction", []string{"friction = 0.2", "friction = -0.2"}, "contact.friction = -0.2: must be ≥ 0"},
		{"preload above yield force", []string{"fraction = 1.0", "force = 1.4e6"}, "preload.force = 1400000: above the bolt's yield force A_s·f_yb = "},
		{"fraction above yield force", []string{"fraction = 1.0", "fraction = 1.3"}, "preload.fraction = 1.3: gives F_p = 1340.6 kN, above the bolt's yield force"},
		{"two preload keys", []string{"fraction = 1.0", "fraction = 1.0\nnut_turn = 60"}, "preload.fraction and preload.nut_turn: give exactly one of"},
		{"unknown material", []string{`thickness = 28
length = 600
material = "S355"`, `thickness = 28
length = 600
material = "S356"`}, `shell.material = "S356": unknown material (built in: S235, S275, S355, S420, S460; or define [materials.S356])`},
		{"unknown bolt material", []string{`nut_height = 38`, "nut_height = 38\nmaterial = \"B1\""}, `bolt.material = "B1": unknown material (built in: S235, S275, S355, S420, S460, and the bolt grades 8.8, 10.9, 12.9; or define [materials.B1])`},
		{"flange beyond yield table", []string{"thickness = 90", "thickness = 160"}, "flange.thickness = 160: beyond the yield table of S355 (t ≤ 150 mm)"},
		{"bad enum", []string{`thread = "partial"`, `thread = "half"`}, `bolt.thread = "half": must be one of "partial", "full"`},
		{"bad grade", []string{`grade = "10.9"`, `grade = "4.6"`}, `bolt.grade = "4.6": must be one of "8.8", "10.9", "12.9"`},
		{"bad end rotation", []string{`end_rotation = "free"`, `end_rotation = "clamped"`}, `load.end_rotation = "clamped": must be one of "fixed", "free"`},
		{"wrong type", []string{"thickness = 90", `thickness = "90"`}, `flange.thickness = "90": wrong type: a string where a number belongs`},
		{"float for a count", []string{"increments = 40", "increments = 40.5"}, "load.increments = 40.5: wrong type: a float where a whole number belongs"},
		{"number for a bool", []string{"ring_springs = true", "ring_springs = 1"}, "analysis.ring_springs = 1: wrong type: an integer where true or false belongs"},
		{"table for a value", []string{"[mesh]\nsize = 8", "[mesh.size]\nx = 8"}, "mesh.size = {…}: wrong type: a table where a number belongs"},
		{"no increments", []string{"increments = 40", "increments = 0"}, "load.increments = 0: must be ≥ 1"},
		{"stop drop of one", []string{"increments = 40", "increments = 40\nstop_drop = 1"}, "load.stop_drop = 1: must lie in (0, 1)"},
		{"refine above one", []string{"refine = 0.3", "refine = 1.5"}, "mesh.refine = 1.5: must lie in (0, 1]"},
		{"thread length of a full thread", []string{`thread = "partial"`, `thread = "full"`}, `bolt.thread_length = 24: applies only to thread = "partial"`},
		{"thread length beyond clamp", []string{"thread_length = 24", "thread_length = 200"}, "bolt.thread_length = 200: must lie in [0, l_k = 196 mm]"},
		{"size and diameter", []string{`size = "M48"`, "size = \"M48\"\ndiameter = 48"}, `bolt.size = "M48" with bolt.diameter or bolt.pitch: give bolt.size or bolt.diameter and bolt.pitch, not both`},
		{"no coarse size", []string{`size = "M48"`, `size = "M50"`}, `bolt.size = "M50": not an ISO 261 coarse size`},
		{"diameter without pitch", []string{`size = "M48"`, "diameter = 48"}, "bolt.pitch: missing"},
		{"material with bad nu", []string{`material = "S355"
neck_radius`, `material = "F"
neck_radius`, "ring_springs = true", "ring_springs = true\n[materials.F]\nE = 210000\nnu = 0.5"}, "materials.F.nu = 0.5: must lie in (0, 0.5)"},
		{"curve without kind", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\nE = 210000\nnu = 0.3\ncurve = [[0.002, 355], [0.1, 450]]"}, "materials.S355.curve_kind: missing"},
		{"curve above elastic line", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\nE = 210000\nnu = 0.3\ncurve_kind = \"true\"\ncurve = [[0.001, 355], [0.1, 450]]"}, "materials.S355.curve[0]: [0.001, 355] lies above the elastic line σ = E·ε = 210 MPa"},
		{"curve from zero strain", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\nE = 210000\nnu = 0.3\ncurve_kind = \"true\"\ncurve = [[0, 355], [0.1, 450]]"}, "materials.S355.curve[0]: [0, 355]: strain and stress must be > 0"},
		{"falling true curve", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\nE = 210000\nnu = 0.3\ncurve_kind = \"true\"\ncurve = [[0.002, 355], [0.1, 350]]"}, "materials.S355.curve[1]: stress 350 falls below"},
		{"curve point of three numbers", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\nE = 210000\nnu = 0.3\ncurve_kind = \"true\"\ncurve = [[0.002, 355, 1], [0.1, 450]]"}, "materials.S355.curve[0]: has 3 numbers"},
		{"material key in wrong case", []string{"ring_springs = true", "ring_springs = true\n[materials.S355]\ne = 210000\nnu = 0.3"}, `unknown key "materials.S355.e" (did you mean "E"?)`},
		{"flange material without a yield strength", []string{`material = "S355"
neck_radius`, `material = "F"
neck_radius`, "ring_springs = true", "ring_springs = true\n[materials.F]\nE = 210000\nnu = 0.3"}, `flange.material = "F": [materials.F] has no curve, so no yield strength for the hand methods`},
		{"negative damage exponent", []string{"ring_springs = true", "ring_springs = true\ndamage_beta_bolt = -1"}, "analysis.damage_beta_bolt = -1: must be > 0"},
		{"gamma_Mf below one", []string{"ring_springs = true", "ring_springs = true\n[fatigue]\ngamma_mf = 0.9"}, "fatigue.gamma_mf = 0.9: must be ≥ 1"},
		{"unknown materials behaviour", []string{`materials = "elastic"`, `materials = "plastic"`}, `analysis.materials = "plastic": must be one of "elastoplastic", "elastic"`},
		{"syntax error", []string{"bolts = 120", "bolts = = 120"}, "line 9: TOML syntax: expected value"},
	}
}

func TestBrokenModels(t *testing.T) {
	base := flatModel(t)
	for _, c := range brokenModels() {
		_, err := decodeSpec([]byte(edit(t, base, c.edits...)))
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		if !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error lacks %q:\n%v", c.name, c.want, err)
		}
		var me *modelError
		if !errors.As(err, &me) {
			t.Errorf("%s: error %T, want *modelError", c.name, err)
		}
	}
}

// Through the command line each broken model exits 2 with its message on
// stderr after the file name, and validate writes nothing.
func TestValidateBrokenExits2(t *testing.T) {
	base := flatModel(t)
	wd, err := os.Getwd()
	if err != nil {
		t.Fatal(err)
	}
	before := dirNames(t, wd)
	for _, c := range brokenModels() {
		dir := t.TempDir()
		path := filepath.Join(dir, "model.toml")
		if err := os.WriteFile(path, []byte(edit(t, base, c.edits...)), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI("validate", path)
		if code != exitBadInput || !strings.Contains(errs, path+": "+c.want) {
			t.Errorf("%s: exit %d, want %d; stderr lacks %q\n%s", c.name, code, exitBadInput, path+": "+c.want, errs)
		}
		if strings.Contains(out, "model is valid") {
			t.Errorf("%s: stdout says valid", c.name)
		}
		if names := dirNames(t, dir); names != "model.toml" {
			t.Errorf("%s: validate left %s in the model's directory", c.name, names)
		}
	}
	if after := dirNames(t, wd); after != before {
		t.Errorf("working directory changed: %s → %s", before, after)
	}
}

func dirNames(t *testing.T, dir string) string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	return strings.Join(names, ",")
}

// Several mistakes in one file are reported together, one per line.
func TestAllErrorsAtOnce(t *testing.T) {
	text := edit(t, flatModel(t),
		"thickness = 90", "thicknes = 90",
		"thickness = 28", "thickness = -28",
		`thread = "partial"`, `thread = "half"`,
		"bolts = 120", `bolts = "many"`,
		"friction = 0.2", "friction = 0.2\nzones = [{from = 40, to = 30}]",
		"fraction = 1.0", "fraction = 1.0\nforce = 1e6",
		"increments = 40", "increments = 0",
	)
	wants := []string{
		`unknown key "flange.thicknes"`,
		"flange.thickness: missing",
		"shell.thickness = -28: must be > 0",
		`bolt.thread = "half": must be one of`,
		`tower.bolts = "many": wrong type: a string where a whole number belongs`,
		"contact.zones[0]: from 40 > to 30",
		"preload.force and preload.fraction: give exactly one of",
		"load.increments = 0: must be ≥ 1",
	}
	_, err := decodeSpec([]byte(text))
	if err == nil {
		t.Fatal("no error")
	}
	for _, w := range wants {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error lacks %q", w)
		}
	}
	if n := len(strings.Split(err.Error(), "\n")); n != len(wants) {
		t.Errorf("%d errors, want %d (one per mistake):\n%v", n, len(wants), err)
	}

	path := filepath.Join(t.TempDir(), "several.toml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, errs := runCLI("validate", path)
	lines := strings.Split(strings.TrimSpace(errs), "\n")
	if code != exitBadInput || len(lines) != len(wants)+1 {
		t.Fatalf("exit %d, %d lines on stderr:\n%s", code, len(lines), errs)
	}
	for _, l := range lines {
		if !strings.HasPrefix(l, path+": ") {
			t.Errorf("line without the file name: %q", l)
		}
	}
	if !strings.HasSuffix(lines[len(lines)-1], "model is invalid (8 errors)") {
		t.Errorf("last line %q", lines[len(lines)-1])
	}
}

// validate() on a Spec built in code checks the same rules.
func TestValidateBuiltSpec(t *testing.T) {
	s, err := decodeSpec([]byte(flatModel(t)))
	if err != nil {
		t.Fatal(err)
	}
	if err := s.validate(); err != nil {
		t.Fatalf("valid demo: %v", err)
	}
	s.Bolt.Hole = 36
	s.Preload.Force = ptr(5e5)
	err = s.validate()
	for _, w := range []string{"bolt.hole = 36: must exceed the bolt diameter 48 mm", "preload.force and preload.fraction"} {
		if err == nil || !strings.Contains(err.Error(), w) {
			t.Errorf("error lacks %q: %v", w, err)
		}
	}
}

func TestValidateCommand(t *testing.T) {
	dir := t.TempDir()
	for _, m := range demoModels() {
		path := filepath.Join(dir, m.Name+".toml")
		if err := os.WriteFile(path, m.Data, 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI("validate", path)
		if code != exitOK {
			t.Fatalf("%s: exit %d\n%s", m.Name, code, errs)
		}
		for _, w := range []string{
			"Resolved model", "increments = 40", "stop_drop = 0.2", `element = "quad8"`,
			"stress area A_s (ISO 898-1)", "1473.1", "mm²", "1031.2", "kN", "108.12", "3/β", "572.64",
			"Warnings: none", "model is valid",
		} {
			if !strings.Contains(out, w) {
				t.Errorf("%s: output lacks %q", m.Name, w)
			}
		}
		// The printed model is itself a valid model file.
		start := strings.Index(out, "# flangeseg model")
		end := strings.Index(out, "Derived quantities:")
		if start < 0 || end < start {
			t.Fatalf("%s: no resolved model in the output", m.Name)
		}
		if _, err := decodeSpec([]byte(out[start:end])); err != nil {
			t.Errorf("%s: printed model does not decode: %v", m.Name, err)
		}
	}
	if names := dirNames(t, dir); names != "bands.toml,flat.toml" {
		t.Errorf("validate wrote files: %s", names)
	}

	missing := filepath.Join(dir, "nonesuch.toml")
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"validate", missing}, exitBadInput, missing},
		{[]string{"validate"}, exitBadInput, "want one model file"},
		{[]string{"validate", "a.toml", "b.toml"}, exitBadInput, "want one model file"},
		{[]string{"validate", "--no-such-flag"}, exitBadInput, "no-such-flag"},
		{[]string{"validate", "--help"}, exitOK, "Usage: flangeseg validate MODEL.toml"},
		{[]string{"help", "validate"}, exitOK, "Defaults of the keys a file may leave out"},
		{[]string{"help"}, exitOK, "validate"},
	}
	for _, c := range cases {
		code, out, errs := runCLI(c.args...)
		if code != c.code || !strings.Contains(out+errs, c.want) {
			t.Errorf("flangeseg %v: exit %d, want %d; output lacks %q\n%s%s", c.args, code, c.code, c.want, out, errs)
		}
	}
}

// --help states every default that keyDefaults applies.
func TestHelpListsDefaults(t *testing.T) {
	_, _, errs := runCLI("validate", "--help")
	for _, k := range keyDefaults() {
		if !strings.Contains(errs, k.key) || !strings.Contains(errs, k.text) {
			t.Errorf("help lacks the default of %s (%s)", k.key, k.text)
		}
	}
}
