package fatigue

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestRainflowASTMExample counts the worked example of rainflow counting
// in ASTM E1049-85 (reapproved 2017), section 5.4.4 — from memory: the
// load history A … I of the example's figure and its cycle table as we
// recall them; check against the standard before relying on it.
func TestRainflowASTMExample(t *testing.T) {
	//                  A   B   C  D   E  F   G  H   I
	history := []float64{-2, 1, -3, 5, -1, 3, -4, 4, -2}
	got, err := Count(history)
	if err != nil {
		t.Fatal(err)
	}
	// The events in the order the rules count them: A–B and B–C as half
	// cycles (each contains the starting point), E–F as a full cycle, C–D
	// as a half cycle, then the residue D–G, G–H, H–I as half cycles.
	want := []Cycle{
		{-2, 1, 0.5}, {1, -3, 0.5}, {-1, 3, 1}, {-3, 5, 0.5},
		{5, -4, 0.5}, {-4, 4, 0.5}, {4, -2, 0.5},
	}
	if !slices.Equal(got, want) {
		t.Errorf("events:\n got %v\nwant %v", got, want)
	}
	// The standard's cycle table: counts by range, 10 load units down to 1.
	table := map[float64]float64{10: 0, 9: 0.5, 8: 1, 7: 0, 6: 0.5, 5: 0, 4: 1.5, 3: 0.5, 2: 0, 1: 0}
	counted := map[float64]float64{}
	for _, c := range got {
		counted[c.Range()] += c.Count
	}
	for r, n := range table {
		if counted[r] != n {
			t.Errorf("range %g: %g cycles, the standard's table has %g", r, counted[r], n)
		}
	}
	for r := range counted {
		if _, ok := table[r]; !ok {
			t.Errorf("range %g counted, not in the standard's table", r)
		}
	}
}

// Samples that are not turning points (repeats, points on a rise or a
// fall) change nothing; a constant history has no cycles.
func TestRainflowTurningPoints(t *testing.T) {
	cases := []struct {
		name    string
		history []float64
		want    []Cycle
	}{
		{"empty", nil, nil},
		{"constant", []float64{3, 3, 3}, nil},
		{"one rise", []float64{0, 1, 2, 5}, []Cycle{{0, 5, 0.5}}},
		{"repeats and ramps", []float64{-2, -2, 0, 1, 1, -1, -3, 0, 5, 5, 2, -1, 0, 3, -4, -4, 4, -2},
			[]Cycle{{-2, 1, 0.5}, {1, -3, 0.5}, {-1, 3, 1}, {-3, 5, 0.5}, {5, -4, 0.5}, {-4, 4, 0.5}, {4, -2, 0.5}}},
	}
	for _, c := range cases {
		got, err := Count(c.history)
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(got, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, got, c.want)
		}
	}
}

// A constant-amplitude history of k reversals counts k/2 cycles, all of
// the full range (common practice: each reversal is half a cycle).
func TestRainflowConstantAmplitude(t *testing.T) {
	var h []float64
	for i := 0; i <= 101; i++ {
		h = append(h, 10*float64(1-2*(i%2)))
	}
	got, err := Count(h)
	if err != nil {
		t.Fatal(err)
	}
	var n float64
	for _, c := range got {
		if c.Range() != 20 {
			t.Fatalf("cycle %v: range %g, want 20", c, c.Range())
		}
		n += c.Count
	}
	if n != 50.5 {
		t.Errorf("%g cycles, want 101 reversals / 2 = 50.5", n)
	}
}

// Rainflow counting depends only on the order of the turning points, so a
// rising transform of the history maps cycle to cycle — the ground on
// which a Transfer maps each Z cycle's extremes.
func TestRainflowRisingTransform(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	h := make([]float64, 2000)
	for i := range h {
		h[i] = rng.NormFloat64()
	}
	f := func(x float64) float64 { return math.Exp(x) + x*x*x }
	fh := make([]float64, len(h))
	for i, x := range h {
		fh[i] = f(x)
	}
	a, _ := Count(h)
	b, _ := Count(fh)
	if len(a) != len(b) {
		t.Fatalf("%d cycles of the history, %d of its transform", len(a), len(b))
	}
	for i := range a {
		if f(a[i].From) != b[i].From || f(a[i].To) != b[i].To || a[i].Count != b[i].Count {
			t.Fatalf("cycle %d: %v maps to %v, transform counted %v", i, a[i], Cycle{f(a[i].From), f(a[i].To), a[i].Count}, b[i])
		}
	}
}

// Every reversal belongs to exactly one cycle or half cycle: the counts
// add up to half the number of ranges between turning points.
func TestRainflowConservesReversals(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	h := make([]float64, 5000)
	for i := range h {
		h[i] = math.Round(10 * rng.NormFloat64())
	}
	cycles, _ := Count(h)
	var n float64
	for _, c := range cycles {
		n += c.Count
	}
	turns := 0
	var prev float64
	dir := 0
	for i, x := range h {
		if i == 0 {
			prev = x
			continue
		}
		if d := x - prev; d != 0 {
			if dir == 0 || sign(d) != dir {
				turns++
				dir = sign(d)
			}
			prev = x
		}
	}
	if n != float64(turns)/2 {
		t.Errorf("%g cycles from %d ranges between turning points, want %g", n, turns, float64(turns)/2)
	}
}

func TestRainflowRejectsNaN(t *testing.T) {
	c := NewCounter(func(Cycle) error { return nil })
	if err := c.Add(math.NaN()); err == nil {
		t.Error("NaN sample accepted")
	}
}
