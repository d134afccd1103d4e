package assess

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

func flatSpec(t *testing.T) *modelfile.Spec {
	t.Helper()
	s, err := modelfile.Load(filepath.Join("..", "..", "..", "cmd", "flangeseg", "demo", "flat.toml"))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func options(loads string) Options {
	return Options{Loads: loads, Curve: CurveEN1993Bolt, Stress: StressAxialBending, GammaMf: 1.15, RefCycles: 2e6, RefSlope: 3}
}

// Palmgren–Miner is linear in the cycles: twice the cycles of a block,
// twice the damage, on both hand functions; the governing one is the
// trilinear model when no FE run is given. The files are written.
func TestHandFunctionsLinearInCycles(t *testing.T) {
	dir := t.TempDir()
	damage := func(cycles string) []float64 {
		path := filepath.Join(dir, "loads"+cycles+".csv")
		if err := os.WriteFile(path, []byte("Z_range_kN,Z_mean_kN,cycles\n300,200,"+cycles+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		job, err := New(flatSpec(t), "flat.toml", options(path))
		if err != nil {
			t.Fatal(err)
		}
		if err := job.Count(); err != nil {
			t.Fatal(err)
		}
		if err := job.Write(filepath.Join(dir, "out"+cycles)); err != nil {
			t.Fatal(err)
		}
		var d []float64
		for _, f := range job.Functions() {
			d = append(d, f.Damage())
		}
		if job.Functions()[0].Label() != "trilinear" {
			t.Errorf("governing function %q, want trilinear", job.Functions()[0].Label())
		}
		return d
	}
	one, two := damage("1e5"), damage("2e5")
	for i := range one {
		if !(one[i] > 0) || math.Abs(two[i]-2*one[i]) > 1e-12*two[i] {
			t.Errorf("function %d: damage %g for 1e5 cycles, %g for 2e5", i, one[i], two[i])
		}
	}
	for _, f := range []string{"fatigue_bins.csv", "fatigue_blocks.csv", "fatigue_summary.json", "sn_curve.svg", "damage_per_bin.png"} {
		if _, err := os.Stat(filepath.Join(dir, "out1e5", f)); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
}

// A run directory that is not there is an error naming the option.
func TestMissingRun(t *testing.T) {
	o := options("loads.csv")
	o.From = filepath.Join(t.TempDir(), "nonesuch")
	if _, err := New(flatSpec(t), "flat.toml", o); err == nil || !strings.Contains(err.Error(), "--from") {
		t.Errorf("error %v, want one naming --from", err)
	}
}
