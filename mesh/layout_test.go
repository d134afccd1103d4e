package mesh

import (
	"math"
	"strings"
	"testing"
)

// runLengths expands runs into element lengths, as Build spaces them.
func runLengths(runs []run) []float64 {
	var ls []float64
	for _, r := range runs {
		s := spacing(r.n, r.ratio)
		for k := range r.n {
			ls = append(ls, (s[k+1]-s[k])*(r.hi-r.lo))
		}
	}
	return ls
}

func TestLayout(t *testing.T) {
	if math.Abs(slope-math.Log(growth)) > 1e-16 {
		t.Fatalf("slope %.17g is not ln %g = %.17g", slope, growth, math.Log(growth))
	}
	for _, c := range []struct {
		name  string
		knots []knot
		hmax  float64
		// smooth: neighbours within 1.5 and elements at the knots near
		// their size; false for intervals too short for their sizes.
		smooth bool
	}{
		{"long, fine ends", []knot{{0, 1, true}, {100, 1, true}}, 8, true},
		{"coarse ends", []knot{{0, 8, true}, {100, 8, true}}, 8, true},
		{"rise to the end", []knot{{0, 1, true}, {100, 8, true}}, 8, true},
		{"sizes meet below hmax", []knot{{0, 2.4, true}, {9, 2.4, true}, {48, 2.4, true}}, 8, true},
		{"middle too short for uniform", []knot{{0, 2, true}, {40, 2, true}}, 8, true},
		{"unequal ends, short", []knot{{0, 2.4, true}, {5, 1.05, true}}, 8, false},
		{"sizes above hmax", []knot{{-10, 20, true}, {10, 20, true}}, 4, true},
		{"short interval", []knot{{0, 3, true}, {1, 3, true}}, 8, false},
	} {
		runs := layout(c.knots, c.hmax)
		first, last := c.knots[0], c.knots[len(c.knots)-1]
		if runs[0].lo != first.at || runs[len(runs)-1].hi != last.at {
			t.Errorf("%s: runs span [%g, %g]", c.name, runs[0].lo, runs[len(runs)-1].hi)
		}
		for i, r := range runs {
			if r.n < 1 || !(r.hi > r.lo) || (i > 0 && r.lo != runs[i-1].hi) {
				t.Errorf("%s: run %d = %+v", c.name, i, r)
			}
			f, l := r.ends()
			ls := runLengths([]run{r})
			if math.Abs(f-ls[0]) > 1e-12*f || math.Abs(l-ls[len(ls)-1]) > 1e-12*l {
				t.Errorf("%s: run %d ends %g, %g; spaced %g, %g", c.name, i, f, l, ls[0], ls[len(ls)-1])
			}
		}
		ls := runLengths(runs)
		smallest := math.Inf(1)
		for _, k := range c.knots {
			smallest = min(smallest, k.size, c.hmax)
		}
		for i, l := range ls {
			if l > c.hmax*(1+1e-9) {
				t.Errorf("%s: element %d is %g long, above %g", c.name, i, l, c.hmax)
			}
			if l < smallest/2 && len(ls) > 1 {
				t.Errorf("%s: element %d is a sliver, %g long", c.name, i, l)
			}
			if i > 0 && c.smooth && max(l/ls[i-1], ls[i-1]/l) > 1.5 {
				t.Errorf("%s: elements %d and %d are %g and %g long", c.name, i-1, i, ls[i-1], l)
			}
		}
		if !c.smooth {
			continue
		}
		for _, k := range []struct {
			at, got float64
		}{{first.at, ls[0]}, {last.at, ls[len(ls)-1]}} {
			want := min(c.hmax, first.size)
			if k.at == last.at {
				want = min(c.hmax, last.size)
			}
			if k.got < 0.7*want || k.got > 1.3*want {
				t.Errorf("%s: element at %g is %g long, want about %g", c.name, k.at, k.got, want)
			}
		}
	}
}

func TestSortedKnots(t *testing.T) {
	got := sortedKnots([]knot{{5, 2, false}, {1, 3, false}, {5 + 1e-9, 1, true}, {3, 1, false}}, 1e-6)
	want := []knot{{1, 3, false}, {3, 1, false}, {5 + 1e-9, 1, true}}
	if len(got) != len(want) {
		t.Fatalf("knots %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("knot %d = %v, want %v", i, got[i], want[i])
		}
	}
}

// twoSquares is two unit squares side by side; with join their common side
// shares vertices, else each has its own, coincident ones.
func twoSquares(join bool, body0, body1 int) Plan {
	v := []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {2, 0}, {2, 1}, {1, 0}, {1, 1}}
	right := [4]int{6, 4, 5, 7}
	if join {
		right = [4]int{1, 4, 5, 2}
	}
	return Plan{
		Vertices: v,
		Blocks: []Block{
			{Corners: [4]int{0, 1, 2, 3}, Divisions: [2]int{2, 2}, Region: "steel", Body: body0},
			{Corners: right, Divisions: [2]int{2, 2}, Region: "steel", Body: body1},
		},
		Regions: []Region{steel},
	}
}

func TestBodies(t *testing.T) {
	for _, kind := range []Kind{Quad4, Quad8} {
		if _, err := Build(twoSquares(true, 0, 1), kind); err == nil || !strings.Contains(err.Error(), "bodies share no vertices") {
			t.Errorf("%v: shared vertices across bodies: error %v", kind, err)
		}
		m, err := Build(twoSquares(false, 0, 1), kind)
		if err != nil {
			t.Fatal(err)
		}
		if err := m.Check(); err != nil {
			t.Errorf("%v: coincident nodes of two bodies: %v", kind, err)
		}
		if m.Elements[0].Body != 0 || m.Elements[len(m.Elements)-1].Body != 1 {
			t.Errorf("%v: element bodies %d, %d", kind, m.Elements[0].Body, m.Elements[len(m.Elements)-1].Body)
		}
		m, err = Build(twoSquares(false, 3, 3), kind)
		if err != nil {
			t.Fatal(err)
		}
		if err := m.Check(); err == nil || !strings.Contains(err.Error(), "coincide") {
			t.Errorf("%v: coincident nodes within a body: error %v", kind, err)
		}
	}
	// A node that elements of two bodies use joins them.
	m := &Mesh{
		Kind:  Quad4,
		Nodes: []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {2, 0}, {2, 1}},
		Elements: []Element{
			{Nodes: []int{0, 1, 2, 3}, Body: 0},
			{Nodes: []int{1, 4, 5, 2}, Body: 1},
		},
		Regions: []Region{steel},
	}
	if err := m.Check(); err == nil || !strings.Contains(err.Error(), "joins bodies 0 and 1") {
		t.Errorf("node of two bodies: error %v", err)
	}
}
