package modelfile

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzDecode feeds model files to Decode, seeded from the demo models and
// every model of testdata: no input may panic or hang; an invalid one
// gives a *Error whose every line names a key or a line of the file, and
// a valid one derives its quantities and resolves to a model file that
// decodes again.
func FuzzDecode(f *testing.F) {
	root := filepath.Join("..", "..", "..", "testdata")
	var paths []string
	for _, pattern := range []string{filepath.Join(demoDir, "*.toml"), filepath.Join(root, "*.toml"), filepath.Join(root, "*", "*.toml")} {
		p, err := filepath.Glob(pattern)
		if err != nil {
			f.Fatal(err)
		}
		paths = append(paths, p...)
	}
	for _, p := range paths {
		data, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Decode(data)
		if err != nil {
			checkError(t, err)
			return
		}
		s.Derive()
		text, err := s.ResolvedTOML()
		if err != nil {
			t.Fatalf("resolved model: %v", err)
		}
		if _, err := Decode(text); err != nil {
			t.Fatalf("the resolved model does not decode: %v\n%s", err, text)
		}
	})
}

// checkError requires a *Error with at least one problem, each a line of
// its own.
func checkError(t *testing.T, err error) {
	t.Helper()
	var me *Error
	if !errors.As(err, &me) || len(me.Errs) == 0 {
		t.Fatalf("error %T without problems: %v", err, err)
	}
	for _, e := range me.Errs {
		msg := e.Error()
		if msg == "" || strings.Contains(msg, "\n") {
			t.Fatalf("problem %q: empty or more than one line", msg)
		}
	}
}
