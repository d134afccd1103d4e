package mesh

import (
	"math"
	"slices"
)

// knot is a node line across one axis at position at, with the element
// length wanted next to it. A fixed knot's position is one the planner
// compares exactly, so merging keeps it.
type knot struct {
	at, size float64
	fixed    bool
}

// run is one block's share of an axis: n elements from lo to hi whose
// lengths grow geometrically, ratio being last/first read from lo to hi.
type run struct {
	lo, hi float64
	n      int
	ratio  float64
}

// growth is the length ratio of neighbouring elements that a layout aims
// at; it stays below 1.5. The wanted element length rises away from a knot
// by slope = ln(growth) per unit length: a mesh that follows such a linear
// size function evenly is geometric with ratio growth.
const (
	growth = 1.4
	slope  = 0.33647223662121289 // ln(growth)
)

// maxRunElements bounds the elements of one run; a plan that reaches it
// fails the element-count rule of FlangeSegment.Validate.
const maxRunElements = 1 << 24

// layout places runs between the knots, which must be sorted by position
// and distinct: lengths start at each knot's size and grow by about growth
// per element up to hmax. An interval whose middle would hold fewer than
// three elements of hmax is split in two graded runs instead, and one that
// has no room for a rise from each end gets a single run, so the lengths
// of neighbouring elements stay within the growth ratio apart from
// intervals too short for their knots' sizes.
func layout(knots []knot, hmax float64) []run {
	var runs []run
	for i := 0; i+1 < len(knots); i++ {
		runs = append(runs, interval(knots[i], knots[i+1], hmax)...)
	}
	return runs
}

// interval lays out the runs between two neighbouring knots.
func interval(p, q knot, hmax float64) []run {
	sp, sq := min(p.size, hmax), min(q.size, hmax)
	l := q.at - p.at
	rp, rq := (hmax-sp)/slope, (hmax-sq)/slope // lengths over which the size reaches hmax
	// A rise shorter than its first element is no rise.
	if rp < sp {
		rp = 0
	}
	if rq < sq {
		rq = 0
	}
	whole := []run{gradedRun(p.at, q.at, sp, sq)}
	switch mid := l - rp - rq; {
	case mid >= 3*hmax:
		a, b := p.at+rp, q.at-rq
		var out []run
		if rp > 0 {
			out = append(out, gradedRun(p.at, a, sp, hmax))
		}
		out = append(out, run{a, b, countOf(math.Ceil(mid/hmax - 1e-9)), 1})
		if rq > 0 {
			out = append(out, gradedRun(b, q.at, hmax, sq))
		}
		return out
	case mid >= 0:
		x := rp + mid/2
		if x < sp || l-x < sq {
			return whole
		}
		m := p.at + x
		return []run{gradedRun(p.at, m, sp, hmax), gradedRun(m, q.at, hmax, sq)}
	}
	// The sizes rising from both ends meet below hmax, at x from p.
	x := (l + (sq-sp)/slope) / 2
	if x < sp || l-x < sq {
		return whole
	}
	peak := sp + slope*x
	m := p.at + x
	return []run{gradedRun(p.at, m, sp, peak), gradedRun(m, q.at, peak, sq)}
}

// gradedRun meshes [lo, hi] evenly for a size that varies linearly from sa
// at lo to sb at hi: elements grow geometrically, and rounding the count up
// keeps their ratio at or below e^(size slope).
func gradedRun(lo, hi, sa, sb float64) run {
	l := hi - lo
	big, small := max(sa, sb), min(sa, sb)
	if big-small <= 1e-9*big {
		return run{lo, hi, countOf(math.Round(l / small)), 1}
	}
	k := (big - small) / l
	n := countOf(math.Ceil(math.Log(big/small)/k - 1e-9))
	return run{lo, hi, n, math.Pow(sb/sa, float64(n-1)/float64(n))}
}

// countOf turns an element count computed in floating point into an int
// of at least 1, capped at maxRunElements.
func countOf(x float64) int {
	switch {
	case !(x >= 1):
		return 1
	case x >= maxRunElements:
		return maxRunElements
	}
	return int(x)
}

// ends returns the lengths of the first and the last element of r.
func (r run) ends() (first, last float64) {
	l := r.hi - r.lo
	if r.n == 1 || r.ratio == 1 {
		return l / float64(r.n), l / float64(r.n)
	}
	q := math.Pow(r.ratio, 1/float64(r.n-1))
	first = l * (q - 1) / (math.Pow(q, float64(r.n)) - 1)
	return first, first * r.ratio
}

// within returns the runs that lie in [lo, hi].
func within(runs []run, lo, hi float64) []run {
	var out []run
	for _, r := range runs {
		if r.lo >= lo && r.hi <= hi {
			out = append(out, r)
		}
	}
	return out
}

// sortedKnots sorts knots by position and merges those closer than tol,
// keeping the position of a fixed knot, else the first, and the smaller
// size.
func sortedKnots(ks []knot, tol float64) []knot {
	ks = slices.Clone(ks)
	slices.SortStableFunc(ks, func(a, b knot) int {
		switch {
		case a.at < b.at:
			return -1
		case a.at > b.at:
			return 1
		}
		return 0
	})
	out := ks[:0]
	for _, k := range ks {
		if n := len(out); n > 0 && k.at-out[n-1].at <= tol {
			out[n-1].size = min(out[n-1].size, k.size)
			if k.fixed && !out[n-1].fixed {
				out[n-1].at, out[n-1].fixed = k.at, true
			}
			continue
		}
		out = append(out, k)
	}
	return out
}

// boundaries returns the run ends lo of each run and hi of the last.
func boundaries(runs []run) []float64 {
	b := make([]float64, 0, len(runs)+1)
	for _, r := range runs {
		b = append(b, r.lo)
	}
	if len(runs) > 0 {
		b = append(b, runs[len(runs)-1].hi)
	}
	return b
}
