package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
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

// brokenModel is an edit of the flat demo that breaks one rule, with a
// part of the message that must name the key (testdata/broken_models.json,
// which the model file's own tests read too).
type brokenModel struct {
	Name  string   `json:"name"`
	Edits []string `json:"edits"` // old, new, old, new, …
	Want  string   `json:"want"`
	// Text, if given, is the whole file instead of edits of the demo.
	Text *string `json:"text"`
}

// text is the broken model file: Text, or the edits applied to base.
func (c brokenModel) text(t *testing.T, base string) string {
	t.Helper()
	if c.Text != nil {
		return *c.Text
	}
	return edit(t, base, c.Edits...)
}

func brokenModels(t *testing.T) []brokenModel {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "broken_models.json"))
	if err != nil {
		t.Fatal(err)
	}
	var out []brokenModel
	if err := json.Unmarshal(data, &out); err != nil {
		t.Fatal(err)
	}
	return out
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
	for _, c := range brokenModels(t) {
		dir := t.TempDir()
		path := filepath.Join(dir, "model.toml")
		if err := os.WriteFile(path, []byte(c.text(t, base)), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, errs := runCLI("validate", path)
		if code != exitBadInput || !strings.Contains(errs, path+": "+c.Want) {
			t.Errorf("%s: exit %d, want %d; stderr lacks %q\n%s", c.Name, code, exitBadInput, path+": "+c.Want, errs)
		}
		if strings.Contains(out, "model is valid") {
			t.Errorf("%s: stdout says valid", c.Name)
		}
		if names := dirNames(t, dir); names != "model.toml" {
			t.Errorf("%s: validate left %s in the model's directory", c.Name, names)
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
		"load.increments = 0: must lie in [1, 10000]",
	}
	_, err := modelfile.Decode([]byte(text))
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
		if _, err := modelfile.Decode([]byte(out[start:end])); err != nil {
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
	for _, k := range modelfile.KeyDefaults() {
		if !strings.Contains(errs, k.Key) || !strings.Contains(errs, k.Text) {
			t.Errorf("help lacks the default of %s (%s)", k.Key, k.Text)
		}
	}
}
