package plan

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzPlan: no plan text panics, hangs or allocates without bound; each
// gives cases or problems, each problem a line of its own that names a
// key or a line of the file (issue 16, item 1). The base model is the flat demo
// joint on a coarse mesh, so that a plan's cases are decoded as models.
func FuzzPlan(f *testing.F) {
	base, err := os.ReadFile(filepath.Join("..", "..", "..", "cmd", "flangeseg", "demo", "flat.toml"))
	if err != nil {
		f.Fatal(err)
	}
	seeds, err := filepath.Glob(filepath.Join("..", "..", "..", "testdata", "sweep", "*.toml"))
	if err != nil {
		f.Fatal(err)
	}
	for _, path := range seeds {
		data, err := os.ReadFile(path)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		p, errs := decode(data)
		// Up to MaxCases models are decoded for a plan that makes that
		// many; a few dozen exercise the same code at fuzzing speed.
		if len(errs) == 0 && p.combined()+len(p.Named) <= 64 {
			p.BaseText = base
			_, errs = p.Cases()
		}
		for _, err := range errs {
			// One line a problem; a case's model problems follow its line,
			// indented, one a line.
			lines := strings.Split(err.Error(), "\n")
			if lines[0] == "" || strings.HasPrefix(lines[0], " ") {
				t.Fatalf("a problem without its own line: %q", err.Error())
			}
			for _, l := range lines {
				if strings.ContainsAny(l, "\r\x00") || l != lines[0] && !strings.HasPrefix(l, "    ") {
					t.Fatalf("a problem's line is broken: %q", err.Error())
				}
			}
		}
	})
}
