package contact

import (
	"math"
	"slices"
	"strings"
	"testing"
)

func TestNewPairRejects(t *testing.T) {
	good := flat(2, 2, 2, 2)
	ok := Settings{Penalty: 1000}
	cases := []struct {
		name   string
		edit   func(m *model, s *Settings)
		weight func(x, z float64) float64
		gap0   func(x, z float64) float64
		want   string
	}{
		{name: "no penalty", edit: func(m *model, s *Settings) { s.Penalty = 0 }, want: "penalty"},
		{name: "infinite penalty", edit: func(m *model, s *Settings) { s.Penalty = math.Inf(1) }, want: "penalty"},
		{name: "negative friction", edit: func(m *model, s *Settings) { s.Friction = -0.1 }, want: "friction"},
		{name: "NaN stick penalty", edit: func(m *model, s *Settings) { s.StickPenalty = math.NaN() }, want: "stick penalty"},
		{name: "negative tolerance", edit: func(m *model, s *Settings) { s.Tolerance = -1 }, want: "tolerance"},
		{name: "too many points", edit: func(m *model, s *Settings) { s.Points = maxPoints + 1 }, want: "Gauss points"},
		{name: "empty slave", edit: func(m *model, s *Settings) { m.slave.Segments = nil }, want: "slave surface: no segments"},
		{name: "4-node segment", edit: func(m *model, s *Settings) { m.master.Segments[0] = []int{0, 1, 2, 3} }, want: "master surface: segment 0 has 4 nodes"},
		{name: "node out of range", edit: func(m *model, s *Settings) { m.slave.Segments[1][1] = len(m.ref) }, want: "outside"},
		{name: "repeated node", edit: func(m *model, s *Settings) { m.slave.Segments[0] = []int{3, 4, 3} }, want: "repeats node"},
		{name: "coincident ends", edit: func(m *model, s *Settings) { m.ref[m.slave.Segments[0][1]] = m.ref[m.slave.Segments[0][0]] }, want: "coincide"},
		{name: "non-finite node", edit: func(m *model, s *Settings) { m.ref[0].X = math.NaN() }, want: "non-finite"},
		{name: "reversed slave", edit: func(m *model, s *Settings) {
			for i, seg := range m.slave.Segments {
				m.slave.Segments[i] = []int{seg[1], seg[0]}
			}
		}, want: "face the same way"},
		{name: "negative weight", weight: func(x, z float64) float64 { return -1 }, want: "weight"},
		{name: "NaN gap", gap0: func(x, z float64) float64 { return math.NaN() }, want: "initial gap"},
	}
	for _, c := range cases {
		m := &model{ref: slices.Clone(good.ref)}
		for _, seg := range good.slave.Segments {
			m.slave.Segments = append(m.slave.Segments, slices.Clone(seg))
		}
		for _, seg := range good.master.Segments {
			m.master.Segments = append(m.master.Segments, slices.Clone(seg))
		}
		s := ok
		if c.edit != nil {
			c.edit(m, &s)
		}
		_, err := NewPair("bad", m.slave, m.master, m.ref, s, c.gap0, c.weight)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), `"bad"`) {
			t.Errorf("%s: error %v, want one naming the pair and %q", c.name, err, c.want)
		}
	}
	if _, err := NewPair("good", good.slave, good.master, good.ref, ok, nil, nil); err != nil {
		t.Errorf("good pair: %v", err)
	}
}

func TestDefaults(t *testing.T) {
	m := flat(2, 3, 2, 3)
	p := mustPair(t, m, Settings{Penalty: 500}, nil, nil)
	got := p.Settings()
	if got.StickPenalty != 50 || got.Tolerance != 1e-3 {
		t.Errorf("defaults: %+v", got)
	}
	if len(p.points) != 2*4 {
		t.Errorf("%d Gauss points on two 3-node segments, want 8", len(p.points))
	}
	m = flat(2, 2, 3, 2)
	if p := mustPair(t, m, Settings{Penalty: 500}, nil, nil); len(p.points) != 3*3 {
		t.Errorf("%d Gauss points on three 2-node segments, want 9", len(p.points))
	}
}

// TestCurrentChecks: a configuration missing nodes, or with a non-finite
// one, is an error for Evaluate and gives empty answers elsewhere.
func TestCurrentChecks(t *testing.T) {
	m := flat(2, 2, 2, 2)
	p := mustPair(t, m, Settings{Penalty: 1000}, nil, nil)
	add := func([]int, []float64, []float64) error { return nil }
	if err := p.Evaluate(m.ref[:3], true, add); err == nil {
		t.Error("short configuration accepted")
	}
	bad := slices.Clone(m.ref)
	bad[2].Z = math.Inf(-1)
	if err := p.Evaluate(bad, true, add); err == nil || !strings.Contains(err.Error(), "node 2") {
		t.Errorf("non-finite position: %v", err)
	}
	if p.NodeResults(bad) != nil || p.Couplings(bad) != nil || p.MaxPenetration(bad) != 0 {
		t.Error("answers for a non-finite configuration")
	}
	if pen, again := p.Augment(bad); pen != 0 || again {
		t.Error("Augment acted on a non-finite configuration")
	}
	// An error from add comes back wrapped with the pair's name.
	cur := m.moved(func(int, Point) (float64, float64) { return 0, -0.01 })
	sentinel := errorString("full")
	err := p.Evaluate(cur, false, func([]int, []float64, []float64) error { return sentinel })
	if err == nil || !strings.Contains(err.Error(), `"test"`) || !strings.Contains(err.Error(), "full") {
		t.Errorf("add error: %v", err)
	}
}

type errorString string

func (e errorString) Error() string { return string(e) }

// TestCouplingsCoverEvaluate: every dof group Evaluate emits is one of the
// groups Couplings lists at the same configuration.
func TestCouplingsCoverEvaluate(t *testing.T) {
	key := func(g []int) string {
		return nodeKey(slices.Sorted(slices.Values(g)))
	}
	for _, c := range fdCases() {
		widest := 0
		p, cur := c.configure(t, c.set)
		listed := map[string]bool{}
		for _, g := range p.Couplings(cur) {
			listed[key(g)] = true
		}
		emitted := assemble(t, p, cur, true).groups
		if len(emitted) == 0 {
			t.Errorf("%s: nothing emitted", c.name)
		}
		for _, g := range emitted {
			if !listed[key(g)] {
				t.Errorf("%s: emitted group %v not among the couplings", c.name, g)
			}
			widest = max(widest, len(g))
		}
		// Sticking across a master node couples the slave segment with two
		// master segments: 2 + 3 nodes.
		if c.name == "sticking across a master node" && widest != 10 {
			t.Errorf("%s: widest group %d dofs, want 10 (an anchor on another master segment)", c.name, widest)
		}
	}
}

func TestGaussLegendre(t *testing.T) {
	for n := 1; n <= maxPoints; n++ {
		pts, wts, err := gaussLegendre(n)
		if err != nil {
			t.Fatal(err)
		}
		// Exact for polynomials up to degree 2n−1: ∫x^k over [−1, 1].
		for k := 0; k < 2*n; k++ {
			got := 0.0
			for i, x := range pts {
				got += wts[i] * math.Pow(x, float64(k))
			}
			want := 0.0
			if k%2 == 0 {
				want = 2 / float64(k+1)
			}
			if math.Abs(got-want) > 1e-14 {
				t.Errorf("n = %d: ∫x^%d = %.16g, want %.16g", n, k, got, want)
			}
		}
		if !slices.IsSorted(pts) {
			t.Errorf("n = %d: points not ascending: %v", n, pts)
		}
	}
	if _, _, err := gaussLegendre(0); err == nil {
		t.Error("0 points accepted")
	}
}
