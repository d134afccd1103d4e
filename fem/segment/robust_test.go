package segment

import (
	"context"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// robustCase is a model file of the robustness family in
// testdata/robust (README there) and what it does today.
type robustCase struct {
	file string
	// cheap: part of the half that every test run takes (the rest runs
	// in BenchmarkRobustness).
	cheap bool
	// completes: the run reaches its ending (all do today); for a file
	// that stops, the test checks the diagnosis instead. A case that
	// changes either way fails the test, so this table stays true.
	completes bool
}

var robustFamily = []robustCase{
	{"r01_flat_elastic", true, true},
	{"r02_flat_plastic_fixed_full", true, true},
	{"r03_bands002_plastic_ld", false, true},
	{"r04_bands02_plastic_fixed", true, true},
	{"r05_bands05_plastic_mu04", true, true},
	{"r06_bands05_plastic_ld_full", false, true},
	{"r07_boltband02_elastic", true, true},
	{"r08_boltband05_plastic", false, true},
	{"r09_taper+05_plastic", false, true},
	{"r10_taper-05_plastic", false, true},
	{"r11_taper+03_elastic_ld", false, true},
	{"r12_taper-02_plastic_ld_fixed", false, true},
	{"r13_gap05_plastic", false, true},
	{"r14_gap02_elastic_strain", true, true},
	{"r15_slender_flat_plastic", true, true},
	{"r16_slender_bands02_elastic", true, true},
	{"r17_stocky_nutturn_plastic_ld", false, true},
	{"r18_stocky_force_mu04_elastic", true, true},
	{"r19_nutturn_bands02_plastic", true, true},
	{"r20_force_taper_gap_plastic_ld", false, true},
	{"r21_quad4_flat_plastic", true, true},
	{"r22_boltband002_mu04_norings", true, true},
	{"r23_m30_flat_ld_fixed_norings", false, true},
	{"r24_bands03_taper-03", false, true},
	{"r25_three_bands_plastic", true, true},
	{"r26_flat_ld_failure_full", false, true},
	{"r27_slender_taper+02_plastic", false, true},
	{"r28_m30_gap03_bands_mu0_strain", true, true},
}

func runRobust(t testing.TB, c robustCase) *Result {
	r, _ := runRobustLogged(t, c)
	return r
}

// halvingCount counts the step halvings in the solver's log (preload,
// release, tension stage and closing search together), and the most in a
// row: the halvings one preload step or one increment needed before it
// converged.
type halvingCount struct {
	all, run, most int
	failed         bool // the attempt under way was halved
}

func (h *halvingCount) line(line string) {
	switch {
	case strings.Contains(line, "step halved") || strings.Contains(line, "step cut back"):
		h.all++
		h.run++
		h.most = max(h.most, h.run)
		h.failed = true
	case strings.Contains(line, "preload: slice strain") || strings.Contains(line, "increment "):
		// A new attempt: the one before converged unless it was halved.
		if !h.failed {
			h.run = 0
		}
		h.failed = false
	}
}

// runRobustLogged runs a file of the family and counts its step halvings.
func runRobustLogged(t testing.TB, c robustCase) (*Result, halvingCount) {
	spec, err := modelfile.Load(filepath.Join("..", "..", "testdata", "robust", c.file+".toml"))
	if err != nil {
		t.Fatal(err)
	}
	var h halvingCount
	r, err := Run(context.Background(), spec, Options{Log: h.line})
	if err != nil {
		t.Fatalf("%s: %v", c.file, err)
	}
	return r, h
}

// checkRobust checks a run of the family against what the table says of
// it: an ending, or a stop with a diagnosis that names a place and what
// to try.
func checkRobust(t testing.TB, c robustCase, r *Result) {
	endings := []string{"maximum displacement reached", "below its peak", "bolt rupture", "rupture of the"}
	if c.completes {
		if r.Failure != nil {
			t.Errorf("%s: stopped: %v\n%s", c.file, r.Failure, r.Diagnosis)
			return
		}
		ok := false
		for _, e := range endings {
			ok = ok || strings.Contains(r.Ending, e)
		}
		if !ok {
			t.Errorf("%s: ending %q is none of %q", c.file, r.Ending, endings)
		}
		return
	}
	if r.Failure == nil {
		t.Errorf("%s: now reaches its ending (%s): mark it completes in robustFamily", c.file, r.Ending)
		return
	}
	for _, want := range []string{"found no equilibrium", "What to try:", " at node "} {
		if !strings.Contains(r.Diagnosis, want) {
			t.Errorf("%s: diagnosis lacks %q:\n%s", c.file, want, r.Diagnosis)
		}
	}
}

// TestRobustnessFamily runs the cheaper half of the robustness family.
func TestRobustnessFamily(t *testing.T) {
	if testing.Short() {
		t.Skip("the robustness family takes a minute")
	}
	for _, c := range robustFamily {
		if !c.cheap {
			continue
		}
		t.Run(c.file, func(t *testing.T) {
			t.Parallel()
			r, h := runRobustLogged(t, c)
			checkRobust(t, c, r)
			checkIterations(t, c, r, h)
		})
	}
}

// BenchmarkRobustness runs the whole family, one sub-benchmark per file,
// and reports the increments, the Newton iterations (all, and per
// converged increment of the tension stage: median and largest) and the
// step halvings of all stages, the most halvings one increment of the
// tension stage needed, and the most in a row any preload step, release
// step or increment needed.
func BenchmarkRobustness(b *testing.B) {
	for _, c := range robustFamily {
		b.Run(c.file, func(b *testing.B) {
			var r *Result
			var halvings halvingCount
			for i := 0; i < b.N; i++ {
				r, halvings = runRobustLogged(b, c)
			}
			checkRobust(b, c, r)
			checkIterations(b, c, r, halvings)
			var its []float64
			cuts := 0
			for _, row := range r.History[min(1, len(r.History)):] {
				its = append(its, float64(row.Iterations))
				cuts = max(cuts, row.Cuts)
			}
			b.ReportMetric(float64(len(its)), "increments")
			b.ReportMetric(float64(r.Timing.Iterations), "newton")
			b.ReportMetric(median(its), "median-its/inc")
			b.ReportMetric(maxOf(its), "max-its/inc")
			b.ReportMetric(float64(halvings.all), "halvings")
			b.ReportMetric(float64(cuts), "max-cuts/inc")
			b.ReportMetric(float64(halvings.most), "max-cuts/step")
		})
	}
}

// Aims of the robust solve for every joint of the family (issue "Every
// joint the model file can describe reaches its load", item 2): no
// converged increment of the tension stage above maxIncrementIterations
// Newton iterations, and no preload step, release step or increment
// halved or cut more than maxCutsInRow times in a row.
const (
	maxIncrementIterations = 15
	maxCutsInRow           = 2
)

// checkIterations checks a completed run of the family against those aims.
func checkIterations(t testing.TB, c robustCase, r *Result, h halvingCount) {
	if !c.completes || r.Failure != nil {
		return
	}
	for _, row := range r.History[min(1, len(r.History)):] {
		if row.Iterations > maxIncrementIterations {
			t.Errorf("%s: increment %d took %d Newton iterations, aim ≤ %d", c.file, row.Increment, row.Iterations, maxIncrementIterations)
		}
	}
	if h.most > maxCutsInRow {
		t.Errorf("%s: a step was halved or cut %d times in a row, aim ≤ %d", c.file, h.most, maxCutsInRow)
	}
}

func median(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	s := slices.Clone(v)
	slices.Sort(s)
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

func maxOf(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	return slices.Max(v)
}

// TestWallRuptureEnding: a wall whose ductile damage indicator reaches 1
// ends the run as a bolt rupture does (testdata/endings/wall_tears.toml):
// the last row is the first with D ≥ 1 in a shell or flange, and the
// ending names the part. A consistency check of the ending rule (the
// indicator's constants are the model file's defaults).
func TestWallRuptureEnding(t *testing.T) {
	spec, err := modelfile.Load(filepath.Join("..", "..", "testdata", "endings", "wall_tears.toml"))
	if err != nil {
		t.Fatal(err)
	}
	r, err := Run(context.Background(), spec, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Failure != nil || !strings.HasPrefix(r.Ending, "rupture of the upper shell") && !strings.HasPrefix(r.Ending, "rupture of the lower shell") {
		t.Fatalf("ending %q (failure %v): want a rupture of the shell", r.Ending, r.Failure)
	}
	n := len(r.History)
	if last := r.History[n-1]; last.WallDamage < 1 {
		t.Errorf("last row: wall damage %.3g, want ≥ 1", last.WallDamage)
	}
	if before := r.History[n-2]; before.WallDamage >= 1 {
		t.Errorf("the row before the last already had wall damage %.3g: the run went on past it", before.WallDamage)
	}
}
