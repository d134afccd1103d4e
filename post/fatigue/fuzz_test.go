package fatigue

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// addSeeds adds the files of testdata matching pattern, and any extra
// files, as seeds of f.
func addSeeds(f *testing.F, pattern string, extra ...string) {
	f.Helper()
	paths, err := filepath.Glob(filepath.Join("testdata", pattern))
	if err != nil {
		f.Fatal(err)
	}
	for _, p := range append(paths, extra...) {
		data, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
}

// FuzzReadLoads feeds load files of all four layouts (seeded from
// testdata and the demo's spectrum) to ReadLoads: every input gives
// finite cycles or an error that says where (the header or a line).
func FuzzReadLoads(f *testing.F) {
	addSeeds(f, "*_s*.csv", filepath.Join("..", "..", "cmd", "flangeseg", "demo", "loads.csv"))
	addSeeds(f, "*_table.csv")
	f.Fuzz(func(t *testing.T, data []byte) {
		var n int
		_, err := ReadLoads(bytes.NewReader(data), Tower{Diameter: 4300, Bolts: 120}, func(c Cycle) error {
			n++
			if math.IsNaN(c.From) || math.IsNaN(c.To) || !(c.Count > 0) {
				t.Fatalf("cycle %d: %+v", n, c)
			}
			return nil
		})
		if err != nil && !strings.HasPrefix(err.Error(), "load file: ") {
			t.Fatalf("error without its source: %v", err)
		}
	})
}

// FuzzReadCurve feeds S–N curve files to ReadCurve: every input gives a
// curve whose endurance falls with the stress range, or an error naming
// the curve.
func FuzzReadCurve(f *testing.F) {
	addSeeds(f, "sn_*.csv")
	f.Add([]byte("stress_range_MPa,cycles\n100,1e5\n50,1e6\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := ReadCurve(bytes.NewReader(data), "fuzz")
		if err != nil {
			if !strings.Contains(err.Error(), `"fuzz"`) {
				t.Fatalf("error without the curve's name: %v", err)
			}
			return
		}
		prev := 0.0
		for _, ds := range []float64{1e4, 1e3, 300, 100, 50, 20, 5, 1} {
			n := c.Cycles(ds)
			if math.IsNaN(n) || n < prev {
				t.Fatalf("N(%g MPa) = %g after %g", ds, n, prev)
			}
			prev = n
		}
	})
}
