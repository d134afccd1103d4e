package contact

import "testing"

// benchPair is a flange-face sized pair: 60 quadratic slave segments on 45
// quadratic master segments, pressed and shifted.
func benchPair(b *testing.B, set Settings) (*Pair, []Point) {
	m := flat(45, 3, 60, 3)
	p, err := NewPair("bench", m.slave, m.master, m.ref, set, nil, nil)
	if err != nil {
		b.Fatal(err)
	}
	cur := wobble(m.moved(func(int, Point) (float64, float64) { return 0.05, -0.02 }), 1e-3)
	return p, cur
}

func BenchmarkEvaluate(b *testing.B) {
	cases := []struct {
		name    string
		set     Settings
		tangent bool
	}{
		{"frictionless/force", Settings{Penalty: 1000}, false},
		{"frictionless/tangent", Settings{Penalty: 1000}, true},
		{"friction/tangent", Settings{Penalty: 1000, Friction: 0.3}, true},
		{"frozen/tangent", Settings{Penalty: 1000, FrozenGeometry: true}, true},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			p, cur := benchPair(b, c.set)
			add := func([]int, []float64, []float64) error { return nil }
			b.ReportAllocs()
			for b.Loop() {
				if err := p.Evaluate(cur, c.tangent, add); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkCouplings(b *testing.B) {
	p, cur := benchPair(b, Settings{Penalty: 1000, Friction: 0.3})
	b.ReportAllocs()
	for b.Loop() {
		p.Couplings(cur)
	}
}

// BenchmarkGlobalSearch: every point misses its hint (none at the start)
// and searches all master segments.
func BenchmarkGlobalSearch(b *testing.B) {
	p, cur := benchPair(b, Settings{Penalty: 1000})
	for i := range p.working {
		p.working[i].hint = -1
	}
	b.ReportAllocs()
	for b.Loop() {
		p.MaxPenetration(cur)
	}
}
