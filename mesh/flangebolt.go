package mesh

import "math"

// bolt plans the bolt body: a grid of blocks over the node lines across x
// (washer edges, hole edges, the shank strip's sides) and along z (nut,
// washers, flange surfaces, contact plane, thread end, preload slice,
// head), keeping the cells that hold material.
func (s *section) bolt() Plan {
	p := newPart(BoltBody)
	xs := []float64{-s.dw / 2, -s.dh / 2, -s.h / 2, s.h / 2, s.dh / 2, s.dw / 2}
	xk := make([]knot, len(xs))
	for i, x := range xs {
		xk[i] = knot{x, s.hf, true}
	}
	cols := layout(xk, s.hmax)
	rows := layout(sortedKnots(s.boltKnots(), s.tol), s.longest(cols, s.hmax))
	for _, z := range rows {
		for _, x := range cols {
			if region, sides := s.boltCell(x, z); region != "" {
				p.rect(x, z, region, sides)
			}
		}
	}
	return p.plan
}

// boltKnots are the node lines along the bolt.
func (s *section) boltKnots() []knot {
	k, m := s.g.HeadHeight, s.g.NutHeight
	ks := []knot{
		{-s.zu - m, s.hmax, true}, {-s.zu, s.hf, true}, {-s.tf, s.hf, true}, {0, s.hf, true},
		{s.tf, s.hf, true}, {s.zu, s.hf, true}, {s.zu + k, s.hmax, true},
	}
	if te := s.threadEnd(); te < s.zu {
		ks = append(ks, knot{te, s.hf, false})
	}
	lo, hi, _ := s.preloadSlice()
	return append(ks, knot{lo, s.hf, false}, knot{hi, s.hf, false})
}

// boltCell returns the region of the cell spanned by the runs x and z, ""
// where there is no material (beside the shank between the washers), and
// the cell's edge-set names.
func (s *section) boltCell(x, z run) (string, [4]string) {
	var sides [4]string
	xm, zm := math.Abs(x.lo+x.hi)/2, (z.lo+z.hi)/2
	washer, shank := xm > s.dh/2, xm < s.h/2
	switch {
	case zm > s.zu:
		return "bolt_head", sides
	case zm < -s.zu:
		return "nut", sides
	case washer && zm > s.tf:
		if z.lo == s.tf {
			sides[0] = "head_bearing"
		}
		return "head_washer", sides
	case washer && zm < -s.tf:
		if z.hi == -s.tf {
			sides[2] = "nut_bearing"
		}
		return "nut_washer", sides
	case !shank:
		return "", sides
	}
	switch z.hi {
	case 0:
		sides[2] = "bolt_interface"
	case s.zu:
		sides[2] = "bolt_under_head"
	}
	lo, hi, _ := s.preloadSlice()
	switch {
	case zm > lo && zm < hi:
		return "bolt_preload", sides
	case zm < s.threadEnd():
		return "bolt_thread", sides
	}
	return "bolt_shank", sides
}

// threadEnd is the z where the thread ends, t_f + t_w (the head) for a
// full thread or one that fills the clamp.
func (s *section) threadEnd() float64 {
	if s.g.FullThread {
		return s.zu
	}
	te := -s.zu + s.g.ThreadInClamp
	if te > s.zu-s.tol {
		return s.zu
	}
	return te
}

// preloadSlice returns the ends of the slice where the preload shortening
// acts and whether it lies in the thread. It is 0.25·d long, centred in the
// unthreaded shank if that is at least twice as long; else it lies in the
// thread, centred as near z = −t_f/2 (mid-way through the lower flange) as
// keeps it half its length clear of the nut and the thread end.
func (s *section) preloadSlice() (lo, hi float64, inThread bool) {
	lp := 0.25 * s.d
	te := s.threadEnd()
	if s.zu-te >= 2*lp {
		c := (te + s.zu) / 2
		return c - lp/2, c + lp/2, false
	}
	if span := te + s.zu; span < 3*lp {
		lp = span / 3
	}
	c := min(max(-s.tf/2, -s.zu+lp), te-lp)
	return c - lp/2, c + lp/2, true
}
