package segment

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"flangeseg/contact"
	"flangeseg/fem"
)

// gapSpring is contact.gap_spring: the neighbouring segments of the ring,
// which a strip lacks, as a spring between the two flanges that resists
// the closing of a parallel gap.
//
// Where it acts, and why there: a parallel gap closes by the two flanges
// approaching each other as wholes, and in a ring that approach bends the
// flange-and-shell ring over the gap's length, loaded by the bolts in the
// gap. The spring's measure is the mean approach of the two faces over
// the band under the washers, |x| ≤ d_w/2, where the bolt pulls the
// flanges together: that is the closing of the gap at the bolt, measured
// where the survey measures it (on the faces, so that the flanges' own
// compression under the clamp does not count as closing). The band is
// symmetric about the bolt axis, so the flanges' turning against each
// other (prying) leaves the mean unchanged to first order: the spring
// resists the closing motion and nothing else. Its force pushes the faces
// apart as a uniform pressure over the band (consistent nodal weights of
// each face side, times the strip's thickness there, less across the
// hole), the same weights as its measure, so its tangent is symmetric.
//
// It is a compression-only spring: its force is k·c for a mean approach
// c > 0 from the places before tightening, pushing the flanges apart, and
// zero once they have moved apart past those places (the ring is bent only
// as far as the bolt pulls this segment towards the other flange).
//
// It goes to the solver as one more fem.ContactPair (a smooth law with no
// statuses to freeze or correct), so the preload, the release of the
// shell end, the closing search and the tension stage all see it without
// a change to them.
type gapSpring struct {
	k            float64   // N/mm
	upper, lower []int     // the two rows of nodes
	wu, wl       []float64 // their weights, each row summing to 1
	refU, refL   []float64 // their reference z
}

// newGapSpring builds the spring of total stiffness k (N/mm); nil where k
// is zero.
func (g *segment) newGapSpring(k float64) (*gapSpring, error) {
	if !(k > 0) {
		return nil, nil
	}
	s := &gapSpring{k: k}
	var err error
	if s.upper, s.wu, s.refU, err = g.springFace("upper_face"); err != nil {
		return nil, err
	}
	if s.lower, s.wl, s.refL, err = g.springFace("lower_face"); err != nil {
		return nil, err
	}
	return s, nil
}

// springFace weighs the nodes of a face's sides under the washer by the
// face area they stand for: each side's consistent nodal weights of a
// uniform pressure (1/6, 4/6, 1/6 of its length on a quadratic side, half
// each on a linear one) times the strip's thickness, summing to 1.
func (g *segment) springFace(set string) (nodes []int, w, ref []float64, err error) {
	msh := g.mesh
	half := g.spec.Bolt.WasherOuter / 2
	weight := map[int]float64{}
	for _, e := range msh.EdgeSets[set] {
		x0, x1 := msh.Nodes[e.Nodes[0]].X, msh.Nodes[e.Nodes[1]].X
		mid := (x0 + x1) / 2
		if math.Abs(mid) > half {
			continue
		}
		width := g.der.FlangeStrip
		if math.Abs(mid) < g.spec.Bolt.Hole/2 {
			width = g.der.HoleBandStrip
		}
		l := math.Abs(x1 - x0)
		shares := []float64{0.5, 0.5}
		if len(e.Nodes) == 3 {
			shares = []float64{1.0 / 6, 1.0 / 6, 4.0 / 6}
		}
		for i, n := range e.Nodes {
			weight[n] += shares[i] * l * width
		}
	}
	if len(weight) < 2 {
		return nil, nil, nil, fmt.Errorf("mesh: contact.gap_spring: no side of %s under the washer (|x| ≤ %g mm)", set, half)
	}
	for n := range weight {
		nodes = append(nodes, n)
	}
	slices.SortFunc(nodes, func(a, b int) int { return cmp.Compare(msh.Nodes[a].X, msh.Nodes[b].X) })
	var total float64
	for _, n := range nodes {
		total += weight[n]
	}
	for _, n := range nodes {
		w = append(w, weight[n]/total)
		ref = append(ref, msh.Nodes[n].Z)
	}
	return nodes, w, ref, nil
}

// Approach is the mean closing at cur, mm: how far the upper face has
// come down towards the lower one, under the washer, from their places
// before tightening.
func (s *gapSpring) Approach(cur []contact.Point) float64 {
	var c float64
	for i, n := range s.upper {
		c -= s.wu[i] * (cur[n].Z - s.refU[i])
	}
	for i, n := range s.lower {
		c += s.wl[i] * (cur[n].Z - s.refL[i])
	}
	return c
}

// Force is the spring's force at cur, N (pushing the flanges apart).
func (s *gapSpring) Force(cur []contact.Point) float64 {
	return s.k * math.Max(0, s.Approach(cur))
}

func (s *gapSpring) Name() string { return "gap spring" }

func (s *gapSpring) dofs() []int {
	var d []int
	for _, n := range s.upper {
		d = append(d, 2*n+1)
	}
	for _, n := range s.lower {
		d = append(d, 2*n+1)
	}
	return d
}

// weights are ∂c/∂u over dofs(): the approach falls as the upper row
// rises and grows as the lower row rises.
func (s *gapSpring) weights() []float64 {
	var b []float64
	for _, w := range s.wu {
		b = append(b, -w)
	}
	return append(b, s.wl...)
}

// Evaluate adds, while the flanges are closer than before tightening, the
// internal force −k·c·∂c/∂u (the spring pushes them apart) and the tangent
// k·(∂c/∂u)⊗(∂c/∂u).
func (s *gapSpring) Evaluate(cur []contact.Point, tangent bool, add func(dofs []int, f, k []float64) error) error {
	c := s.Approach(cur)
	if c <= 0 {
		return nil
	}
	b := s.weights()
	f := make([]float64, len(b))
	for i := range b {
		f[i] = s.k * c * b[i]
	}
	var kk []float64
	if tangent {
		kk = make([]float64, len(b)*len(b))
		for i := range b {
			for j := range b {
				kk[i*len(b)+j] = s.k * b[i] * b[j]
			}
		}
	}
	if err := add(s.dofs(), f, kk); err != nil {
		return fmt.Errorf("gap spring: %w", err)
	}
	return nil
}

func (s *gapSpring) Couplings([]contact.Point) [][]int { return [][]int{s.dofs()} }

func (s *gapSpring) Augment([]contact.Point) (float64, bool)         { return 0, false }
func (s *gapSpring) Commit()                                         {}
func (s *gapSpring) Revert()                                         {}
func (s *gapSpring) SlidingCouplings() []contact.Block               { return nil }
func (s *gapSpring) Changes() []contact.Change                       { return nil }
func (s *gapSpring) ResetFlips()                                     {}
func (s *gapSpring) Flipping(int) int                                { return 0 }
func (s *gapSpring) Freeze(int) int                                  { return 0 }
func (s *gapSpring) Cycling() int                                    { return 0 }
func (s *gapSpring) FreezeCycling() int                              { return 0 }
func (s *gapSpring) Thaw([]contact.Point) float64                    { return 0 }
func (s *gapSpring) Correct([]contact.Point, float64) (float64, int) { return 0, 0 }
func (s *gapSpring) MaxPenetration([]contact.Point) float64          { return 0 }

var _ fem.ContactPair = (*gapSpring)(nil)
