package fatigue

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"regexp"
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

// What a load file's or an S–N curve file's error must name: the header,
// a line, or (a curve) the points it has.
var (
	loadErrorSays  = regexp.MustCompile(`^load file: (header|line \d+|(parse error|record) on line \d+|the residue at the end)`)
	curveErrorSays = regexp.MustCompile(`header|line \d+|point \d+|\d+ points`)
)

// FuzzReadLoads feeds load files of all four layouts (seeded from
// testdata and the demo's spectrum) to ReadLoads: every input gives
// finite cycles or an error that says where (the header or a line).
func FuzzReadLoads(f *testing.F) {
	addSeeds(f, "*_s*.csv", filepath.Join("..", "..", "cmd", "flangeseg", "demo", "loads.csv"))
	addSeeds(f, "*_table.csv")
	// Once accepted: a table row whose finite numbers overflow Z.
	f.Add([]byte("Z_range_kN,Z_mean_kN,cycles\n1,1e308,1\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		var n int
		_, err := ReadLoads(bytes.NewReader(data), Tower{Diameter: 4300, Bolts: 120}, func(c Cycle) error {
			n++
			if !finite(c.From) || !finite(c.To) || !(c.Count > 0) || math.IsInf(c.Count, 0) {
				t.Fatalf("cycle %d: %+v", n, c)
			}
			return nil
		})
		if err != nil && !loadErrorSays.MatchString(err.Error()) {
			t.Fatalf("error that names no line: %v", err)
		}
	})
}

// FuzzReadCurve feeds S–N curve files to ReadCurve: every input gives a
// curve whose endurance falls with the stress range, or an error naming
// the curve.
func FuzzReadCurve(f *testing.F) {
	addSeeds(f, "sn_*.csv")
	f.Add([]byte("stress_range_MPa,cycles\n100,1e5\n50,1e6\n"))
	// Once refused naming a branch, not a point: a slope that overflows.
	f.Add([]byte("cycles,stress_range_MPa\n1e-300,100\n1e300,50\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := ReadCurve(bytes.NewReader(data), "fuzz")
		if err != nil {
			if !strings.Contains(err.Error(), `"fuzz"`) || !curveErrorSays.MatchString(err.Error()) {
				t.Fatalf("error without the curve's name or where: %v", err)
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
