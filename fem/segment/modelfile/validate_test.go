package modelfile

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// flatModel is the text of the flat demo model, the base of the broken ones.
func flatModel(t *testing.T) string {
	t.Helper()
	return string(demoData(t, "flat"))
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
// part of the message that must name the key.
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

// brokenModels are read from testdata/broken_models.json, which the
// command's tests read too.
func brokenModels(t *testing.T) []brokenModel {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "..", "testdata", "broken_models.json"))
	if err != nil {
		t.Fatal(err)
	}
	var out []brokenModel
	if err := json.Unmarshal(data, &out); err != nil {
		t.Fatal(err)
	}
	return out
}

func TestBrokenModels(t *testing.T) {
	base := flatModel(t)
	for _, c := range brokenModels(t) {
		_, err := Decode([]byte(c.text(t, base)))
		if err == nil {
			t.Errorf("%s: no error", c.Name)
			continue
		}
		if !strings.Contains(err.Error(), c.Want) {
			t.Errorf("%s: error lacks %q:\n%v", c.Name, c.Want, err)
		}
		var me *Error
		if !errors.As(err, &me) {
			t.Errorf("%s: error %T, want *Error", c.Name, err)
		}
	}
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
	_, err := Decode([]byte(text))
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

}

// validate() on a Spec built in code checks the same rules.
func TestValidateBuiltSpec(t *testing.T) {
	s, err := Decode([]byte(flatModel(t)))
	if err != nil {
		t.Fatal(err)
	}
	if err := s.Validate(); err != nil {
		t.Fatalf("valid demo: %v", err)
	}
	s.Bolt.Hole = 36
	s.Preload.Force = ptr(5e5)
	err = s.Validate()
	for _, w := range []string{"bolt.hole = 36: must exceed the bolt diameter 48 mm", "preload.force and preload.fraction"} {
		if err == nil || !strings.Contains(err.Error(), w) {
			t.Errorf("error lacks %q: %v", w, err)
		}
	}
}

// A file far larger than a model file (100 MB) is refused for its size
// after reading MaxFileSize bytes and one: Load allocates about that
// much, not the file.
func TestLoadReadsBounded(t *testing.T) {
	path := filepath.Join(t.TempDir(), "huge.toml")
	if err := os.WriteFile(path, []byte(flatModel(t)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Truncate(path, 100<<20); err != nil {
		t.Fatal(err)
	}
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	_, err := Load(path)
	runtime.ReadMemStats(&after)
	want := "file size = 1048577 bytes or more: must be at most 1048576 bytes"
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Fatalf("error %v, want %q", err, want)
	}
	if got := after.TotalAlloc - before.TotalAlloc; got > 8*MaxFileSize {
		t.Errorf("Load allocated %d bytes for a 100 MB file, want at most %d", got, 8*MaxFileSize)
	}
}
