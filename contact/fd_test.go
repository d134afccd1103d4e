package contact

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// fdCase is a configuration whose tangent is checked against central
// differences of the force.
type fdCase struct {
	name   string
	build  func() *model
	set    Settings
	gap0   func(x, z float64) float64
	weight func(x, z float64) float64
	shift  float64 // tangential (x) shift of the slave before rotation, mm
	press  float64 // penetration of the slave, mm (0 → 0.02)
	curved bool    // shift along the arc of arc() rather than along x
	want   status  // status every Gauss point must have
}

func fdCases() []fdCase {
	taper := func(x, z float64) float64 { return 0.004 + 0.0005*x }
	strip := func(x, z float64) float64 { return 1 + 0.1*x }
	frictionless := Settings{Penalty: 1000}
	friction := Settings{Penalty: 1000, Friction: 0.3}
	slippery := Settings{Penalty: 1000, Friction: 0.1}
	return []fdCase{
		{name: "flat matching 2-node", build: func() *model { return flatSpan(4, 2, 0, 10, 4, 2) }, set: frictionless, want: pressed},
		{name: "flat matching 3-node", build: func() *model { return flatSpan(3, 3, 0, 10, 3, 3) }, set: frictionless, want: pressed},
		{name: "flat non-matching 2-node on 3-node, gap0", build: func() *model { return flat(3, 3, 5, 2) },
			set: frictionless, gap0: taper, weight: strip, want: pressed},
		{name: "flat non-matching 3-node on 2-node", build: func() *model { return flat(4, 2, 3, 3) }, set: frictionless, weight: strip, want: pressed},
		{name: "curved master, 3-node slave", build: func() *model { return arc(3, 4, 3) }, set: frictionless, want: pressed},
		{name: "curved master, 2-node slave, gap0", build: func() *model { return arc(4, 5, 2) }, set: frictionless, gap0: taper, want: pressed},
		{name: "flat sticking", build: func() *model { return flat(3, 3, 4, 3) }, set: friction, shift: 0.01, weight: strip, want: sticking},
		{name: "flat sliding", build: func() *model { return flat(3, 3, 4, 3) }, set: friction, shift: 0.2, weight: strip, want: sliding},
		{name: "flat sliding backwards, 2-node", build: func() *model { return flat(4, 2, 5, 2) }, set: friction, shift: -0.2, want: sliding},
		{name: "curved sticking, gap0", build: func() *model { return arc(3, 4, 3) }, set: friction, shift: 0.01, curved: true, gap0: taper, want: sticking},
		{name: "sticking across a master node", build: func() *model { return flat(3, 2, 2, 2) },
			set: Settings{Penalty: 1000, Friction: 20}, shift: 1.5, want: sticking},
		{name: "curved sliding", build: func() *model { return arc(3, 4, 3) }, set: friction, shift: 0.2, curved: true, want: sliding},
		{name: "curved sliding, 2-node slave", build: func() *model { return arc(4, 5, 2) }, set: slippery, shift: -0.1, curved: true, press: 0.03, weight: strip, want: sliding},
	}
}

// configure returns the pair and the current positions of a case: the
// slave pressed (0.02 mm by default) into the master and shifted, every node disturbed,
// the whole turned by 0.3 rad so that no direction is special.
func (c fdCase) configure(t *testing.T, set Settings) (*Pair, []Point) {
	t.Helper()
	const angle = 0.3
	m := c.build()
	press := c.press
	if press == 0 {
		press = 0.02
	}
	cur := m.moved(func(n int, p Point) (float64, float64) {
		if !c.curved {
			return c.shift, -press
		}
		// Turn about the arc's centre, then press.
		q := rotate([]Point{{p.X - 5, p.Z + 20}}, -c.shift/20)[0]
		return q.X + 5 - p.X, q.Z - 20 - p.Z - press
	})
	cur = rotate(wobble(cur, 2e-3), angle)
	m.ref = rotate(m.ref, angle)
	// gap0 and weight see rotated reference positions; turn them back.
	back := func(f func(x, z float64) float64) func(x, z float64) float64 {
		if f == nil {
			return nil
		}
		return func(x, z float64) float64 {
			q := rotate([]Point{{x, z}}, -angle)[0]
			return f(q.X, q.Z)
		}
	}
	return mustPair(t, m, set, back(c.gap0), back(c.weight)), cur
}

func TestTangentFiniteDifferences(t *testing.T) {
	for _, c := range fdCases() {
		t.Run(c.name, func(t *testing.T) {
			p, cur := c.configure(t, c.set)
			if got := statuses(p, cur); got[c.want] != len(p.points) {
				t.Fatalf("statuses %v, want all %d points %v", got, len(p.points), c.want)
			}
			if e := fdError(t, p, cur); e > 1e-6 {
				t.Errorf("tangent differs from central differences by %.2e (relative)", e)
			} else {
				t.Logf("relative difference %.2e", e)
			}
		})
	}
}

// TestTangentAfterAugment checks the tangent with nonzero multipliers,
// normal and tangential.
func TestTangentAfterAugment(t *testing.T) {
	for _, c := range fdCases() {
		if c.set.Friction == 0 || c.want != sticking {
			continue
		}
		t.Run(c.name, func(t *testing.T) {
			set := c.set
			set.Tolerance = 1e-9
			p, cur := c.configure(t, set)
			if _, again := p.Augment(cur); !again {
				t.Fatal("Augment made no update")
			}
			moved := append([]Point(nil), cur...)
			for n := range moved {
				moved[n].X += 1e-3 * math.Sin(float64(n))
			}
			if got := statuses(p, moved); got[sticking] != len(p.points) {
				t.Fatalf("statuses %v, want all sticking", got)
			}
			if e := fdError(t, p, moved); e > 1e-6 {
				t.Errorf("tangent differs from central differences by %.2e (relative)", e)
			}
		})
	}
}

// TestSymmetricTangent checks that SymmetricTangent hands out the symmetric
// part of the full tangent, and that sliding makes the full one
// non-symmetric.
func TestSymmetricTangent(t *testing.T) {
	for _, c := range fdCases() {
		t.Run(c.name, func(t *testing.T) {
			p, cur := c.configure(t, c.set)
			sym := c.set
			sym.SymmetricTangent = true
			q, _ := c.configure(t, sym)
			full := assemble(t, p, cur, true)
			half := assemble(t, q, cur, true)
			n := len(full.f)
			worst, skew, kmax := 0.0, 0.0, 0.0
			for i := 0; i < n; i++ {
				if full.f[i] != half.f[i] {
					t.Fatalf("force %d differs: %g and %g", i, full.f[i], half.f[i])
				}
				for j := 0; j < n; j++ {
					s := (full.k[i*n+j] + full.k[j*n+i]) / 2
					worst = math.Max(worst, math.Abs(half.k[i*n+j]-s))
					skew = math.Max(skew, math.Abs(full.k[i*n+j]-full.k[j*n+i]))
					kmax = math.Max(kmax, math.Abs(full.k[i*n+j]))
				}
			}
			if worst > 1e-14*kmax {
				t.Errorf("symmetric tangent is off the symmetric part by %.2e of max |k|", worst/kmax)
			}
			if c.want == sliding && skew < 1e-3*kmax {
				t.Errorf("sliding tangent is symmetric (skew %.2e of max |k|)", skew/kmax)
			}
			if c.want != sliding && skew > 1e-12*kmax {
				t.Errorf("non-sliding tangent is not symmetric (skew %.2e of max |k|)", skew/kmax)
			}
		})
	}
}

// TestFrozenGeometry: the frozen-geometry tangent keeps the forces, and
// without friction it is symmetric positive semi-definite (checked by a
// dense symmetric eigendecomposition).
func TestFrozenGeometry(t *testing.T) {
	for _, c := range fdCases() {
		t.Run(c.name, func(t *testing.T) {
			p, cur := c.configure(t, c.set)
			frozen := c.set
			frozen.FrozenGeometry = true
			q, _ := c.configure(t, frozen)
			full, fz := assemble(t, p, cur, true), assemble(t, q, cur, true)
			n := len(full.f)
			for i := range full.f {
				if full.f[i] != fz.f[i] {
					t.Fatalf("force %d differs: %g and %g", i, full.f[i], fz.f[i])
				}
			}
			if c.set.Friction > 0 {
				return
			}
			var eig mat.EigenSym
			if !eig.Factorize(mat.NewSymDense(n, fz.k), false) {
				t.Fatal("eigendecomposition failed")
			}
			vals := eig.Values(nil)
			if lo, hi := vals[0], vals[n-1]; lo < -1e-12*hi {
				t.Errorf("smallest eigenvalue %g of largest %g: not positive semi-definite", lo, hi)
			}
		})
	}
}

// TestNoSlidingStiffness: leaving out the sliding coupling keeps the
// forces, changes nothing for frictionless or sticking points, and with
// FrozenGeometry gives a symmetric positive semi-definite tangent even
// while points slide (dense symmetric eigendecomposition).
func TestNoSlidingStiffness(t *testing.T) {
	for _, c := range fdCases() {
		t.Run(c.name, func(t *testing.T) {
			p, cur := c.configure(t, c.set)
			plain := c.set
			plain.NoSlidingStiffness, plain.FrozenGeometry = true, true
			q, _ := c.configure(t, plain)
			frozen := c.set
			frozen.FrozenGeometry = true
			r, _ := c.configure(t, frozen)
			full, ns, fz := assemble(t, p, cur, true), assemble(t, q, cur, true), assemble(t, r, cur, true)
			n := len(full.f)
			for i := range full.f {
				if full.f[i] != ns.f[i] {
					t.Fatalf("force %d differs: %g and %g", i, full.f[i], ns.f[i])
				}
			}
			if c.want != sliding {
				for i := range fz.k {
					if fz.k[i] != ns.k[i] {
						t.Fatalf("tangent entry %d changed without sliding: %g and %g", i, fz.k[i], ns.k[i])
					}
				}
			}
			var eig mat.EigenSym
			if !eig.Factorize(mat.NewSymDense(n, ns.k), false) {
				t.Fatal("eigendecomposition failed")
			}
			vals := eig.Values(nil)
			if lo, hi := vals[0], vals[n-1]; lo < -1e-12*hi {
				t.Errorf("smallest eigenvalue %g of largest %g: not positive semi-definite", lo, hi)
			}
		})
	}
}

// TestSmallSliding: measured along the reference geometry, the contact
// forces are linear in the displacements, so the tangent matches central
// differences for every status, and for a face pressed without sliding
// they equal those of the finite-sliding measure, which then sees the same
// normals.
func TestSmallSliding(t *testing.T) {
	for _, c := range fdCases() {
		t.Run(c.name, func(t *testing.T) {
			set := c.set
			set.SmallSliding = true
			p, cur := c.configure(t, set)
			if got := statuses(p, cur); got[c.want] != len(p.points) {
				t.Fatalf("statuses %v, want all %d points %v", got, len(p.points), c.want)
			}
			if e := fdError(t, p, cur); e > 1e-6 {
				t.Errorf("tangent differs from central differences by %.2e (relative)", e)
			}
			if c.shift != 0 || c.curved {
				return
			}
			q, _ := c.configure(t, c.set)
			small, finite := assemble(t, p, cur, false), assemble(t, q, cur, false)
			largest := 0.0
			for _, f := range finite.f {
				largest = math.Max(largest, math.Abs(f))
			}
			// The nodes are disturbed by 2e-3 mm against a press of 0.02 mm,
			// which turns the current normals by about 1e-3: the two
			// measures agree to a few per cent of the largest force.
			for i := range small.f {
				if d := math.Abs(small.f[i] - finite.f[i]); d > 0.05*largest {
					t.Errorf("force %d: %g sliding small, %g finite", i, small.f[i], finite.f[i])
				}
			}
		})
	}
}

// TestSlidingCouplings: the tangent without sliding stiffness plus the
// couplings handed beside it is the full tangent, for both measures of gap
// and slip; nothing is handed while no point slides.
func TestSlidingCouplings(t *testing.T) {
	for _, small := range []bool{false, true} {
		for _, c := range fdCases() {
			t.Run(fmt.Sprintf("%s/small=%v", c.name, small), func(t *testing.T) {
				set := c.set
				set.SmallSliding = small
				p, cur := c.configure(t, set)
				split := set
				split.NoSlidingStiffness = true
				q, _ := c.configure(t, split)
				full, part := assemble(t, p, cur, true), assemble(t, q, cur, true)
				n := len(full.f)
				blocks := q.SlidingCouplings()
				if c.want != sliding && len(blocks) > 0 {
					t.Fatalf("%d coupling blocks without sliding", len(blocks))
				}
				if c.want == sliding && len(blocks) == 0 {
					t.Fatal("no coupling handed while sliding")
				}
				for _, b := range blocks {
					nd := len(b.Dofs)
					for i, di := range b.Dofs {
						for j, dj := range b.Dofs {
							part.k[di*n+dj] += b.K[i*nd+j]
						}
					}
				}
				scale := 0.0
				for _, v := range full.k {
					scale = math.Max(scale, math.Abs(v))
				}
				for i := range full.k {
					if math.Abs(full.k[i]-part.k[i]) > 1e-12*scale {
						t.Fatalf("entry %d: full %g, split %g", i, full.k[i], part.k[i])
					}
				}
			})
		}
	}
}
