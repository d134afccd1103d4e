package mesh

import "math"

// upperHalf plans the upper flange and shell stub (UpperBody). The flange
// is a grid of rectangular blocks: columns between the node lines across
// x, rows between those across z. The shell stands on the columns under
// it; with a neck fillet a ring of blocks round the fillet joins flange
// and shell instead (see fillet).
func (s *section) upperHalf() Plan {
	p := newPart(UpperBody)
	if s.r > 0 {
		s.fillet(p)
		return p.plan
	}
	cols := s.flangeColumns(s.hf)
	rows := layout([]knot{{0, s.hf, true}, {s.tf, s.hf, true}}, s.longest(cols, s.hmax))
	s.flangeBlocks(p, cols, rows, nil)
	s.shellBlocks(p, within(cols, s.x2, s.x3), s.tf, s.hf)
	return p.plan
}

// aspectCap bounds the element length across a row of the flange or the
// shell in terms of the narrowest element of the columns it crosses.
const aspectCap = 6

// longest returns the element length that rows crossing cols may reach:
// hmax, or less where a narrow column would make elements too slender, but
// not below the fine length.
func (s *section) longest(cols []run, hmax float64) float64 {
	w := math.Inf(1)
	for _, c := range cols {
		first, last := c.ends()
		w = min(w, first, last)
	}
	return min(hmax, max(s.hf, aspectCap*w))
}

// flangeColumns lays out the flange across x, from the free edge to the
// shell's outer face, with elements of length s1 at x1.
func (s *section) flangeColumns(s1 float64) []run {
	ks := []knot{{-s.a, s.hf, true}, {s.x1, s1, true}, {s.x3, s.hf, true}}
	if s.r > 0 {
		ks = append(ks, knot{s.xr, s.hf, true})
	}
	for _, x := range append([]float64{-s.dw / 2, -s.dh / 2, s.dh / 2, s.dw / 2}, s.g.FaceLines...) {
		ks = append(ks, knot{x, s.hf, false})
	}
	return layout(sortedKnots(ks, s.tol), s.hmax)
}

// flangeBlocks adds the flange grid: every column takes the rows low,
// and the columns up to x1 also the rows high above them.
func (s *section) flangeBlocks(p *part, cols, low, high []run) {
	for _, x := range cols {
		region := "upper_flange"
		if mid := (x.lo + x.hi) / 2; math.Abs(mid) < s.dh/2 {
			region = "upper_flange_hole"
		}
		rows, top := low, x.hi <= s.x1
		if top {
			rows = append(rows[:len(rows):len(rows)], high...)
		}
		for j, z := range rows {
			var sides [4]string
			if j == 0 {
				sides[0] = "upper_face"
			}
			if top && j == len(rows)-1 {
				sides[2] = "upper_top"
			}
			p.rect(x, z, region, sides)
		}
	}
}

// shellBlocks adds the shell stub on the columns cols, from z0, where its
// elements are s0 long, to its end, where they are twice ElementSize long
// unless the columns' narrowest element limits them.
func (s *section) shellBlocks(p *part, cols []run, z0, s0 float64) {
	h := s.longest(cols, 2*s.hmax)
	rows := layout([]knot{{z0, s0, true}, {s.tf + s.l, h, true}}, h)
	for i, x := range cols {
		for j, z := range rows {
			var sides [4]string
			if i == 0 {
				sides[3] = "upper_shell_inner"
			}
			if i == len(cols)-1 {
				sides[1] = "upper_shell_outer"
			}
			if j == len(rows)-1 {
				sides[2] = "upper_end"
			}
			p.rect(x, z, "upper_shell", sides)
		}
	}
}

// fillet plans flange and shell with a neck fillet of radius r about
// C = (x1, t_f + r), which meets the flange top at P1 = (x1, t_f) and the
// shell's inner face at P3 = (x2, t_f + r), tangent to both. A block side
// that left the fillet along the flange top or the shell face would meet
// it at a zero angle, so the fillet is the inner side of a ring of blocks
// whose sides run across it. The ring fills the square [x1, xr] × [zk,
// t_f + r] outside the fillet, of side r + δ with δ = min(t, t_f/2, 1.5r),
// deep enough for well-shaped elements and shallow enough that a small
// fillet's elements do not taper too much. Beside the ring, from xr to the
// outer face, lies a block of the neck; below zk the flange's columns go
// on as elsewhere. The ring's radial division is that of the shell across
// [x2, xr] and of the flange rows from zk to t_f.
func (s *section) fillet(p *part) {
	zk := s.tf - s.dl
	cols, pieces, nb, s3 := s.filletSpacing(zk)
	rad := layout([]knot{{0, s.hf, true}, {s.dl, s.hf, true}}, s.hmax)
	d := boundaries(rad)

	// Flange rows from zk up to the top, the ring's first radial side.
	nr := len(rad)
	zUp := make([]float64, nr+1) // zUp[j] at depth d[j] below the top
	for j := range d {
		zUp[j] = s.tf - d[j]
	}
	zUp[0], zUp[nr] = s.tf, zk
	var high []run
	for j := nr - 1; j >= 0; j-- {
		high = append(high, run{zUp[j+1], zUp[j], rad[j].n, 1 / rad[j].ratio})
	}
	first, _ := high[0].ends()
	low := layout([]knot{{0, s.hf, true}, {zk, first, true}}, s.longest(cols, s.hmax))
	s.flangeBlocks(p, cols, low, high)

	// The neck beside the ring, then the shell: its columns across [x2,
	// xr] end the ring's last radial side.
	beside := within(cols, s.xr, s.x3)
	for _, x := range beside {
		for _, pc := range pieces[nb:] {
			p.rect(x, pc.r, "upper_flange", [4]string{})
		}
	}
	xs := make([]float64, nr+1)
	for j := range d {
		xs[j] = s.x2 + d[j]
	}
	xs[nr] = s.xr
	shell := make([]run, nr, nr+len(beside))
	for j, r := range rad {
		shell[j] = run{xs[j], xs[j+1], r.n, r.ratio}
	}
	s.shellBlocks(p, append(shell, beside...), s.z2, s3)
	s.ring(p, ringGeometry{rad: rad, d: d, zUp: zUp, xs: xs, pieces: pieces, nb: nb})
}

// filletSpacing lays out the flange columns and the ring's outer side so
// that the elements next to the fillet, on the flange top at x1 and on the
// shell face at t_f + r, are about as long as the fillet's own, which the
// count of elements on the outer side sets; at x1 no shorter than half the
// fine length, since those columns cross the whole flange. A few rounds
// settle the lengths s1 at x1 and s3 at t_f + r, on which the count
// depends only weakly.
func (s *section) filletSpacing(zk float64) (cols []run, pieces []piece, nb int, s3 float64) {
	s1, s3 := s.hf, s.hf
	for range 3 {
		cols = s.flangeColumns(s1)
		pieces, nb = s.ringOutline(cols, zk, s3)
		theta := ringAngles(pieces, nb)
		s1 = min(s.hf, max(s.hf/2, s.r*(theta[nb]-theta[0])/float64(elements(pieces[:nb]))))
		s3 = min(s.hf, max(s.hf/4, s.r*(theta[len(pieces)]-theta[nb])/float64(elements(pieces[nb:]))))
	}
	return cols, pieces, nb, s3
}

// elements counts the elements of the pieces.
func elements(ps []piece) int {
	n := 0
	for _, pc := range ps {
		n += pc.r.n
	}
	return n
}

// piece is a straight stretch of the ring's outer side, from s0 to s1,
// divided like the run r.
type piece struct {
	s0, s1 Point
	r      run
}

// ringOutline returns the ring's outer side counter-clockwise about the
// fillet's centre: along z = zk under the columns from x1 to xr, then up
// x = xr to the shell, where its elements are s3 long. It also returns how
// many pieces lie under the neck.
func (s *section) ringOutline(cols []run, zk, s3 float64) ([]piece, int) {
	var out []piece
	for _, x := range within(cols, s.x1, s.xr) {
		out = append(out, piece{Point{x.lo, zk}, Point{x.hi, zk}, x})
	}
	nb := len(out)
	for _, z := range layout([]knot{{zk, s.hf, true}, {s.z2, s3, true}}, s.hmax) {
		out = append(out, piece{Point{s.xr, z.lo}, Point{s.xr, z.hi}, z})
	}
	return out, nb
}

// ringGeometry is what the ring shares with its neighbours: the radial
// runs rad with ends d (depth from the fillet surface), the flange row
// ends zUp on its first side, the shell column ends xs on its last, and
// the outer side, whose first nb pieces lie under the neck.
type ringGeometry struct {
	rad    []run
	d, zUp []float64
	xs     []float64
	pieces []piece
	nb     int
}

// ring adds the blocks round the fillet. Straight sides across the ring
// join the ends of the outer pieces to points of the fillet (see
// ringFrame); the lines between them at the depths d, as fractions of
// each side's length, divide the ring radially.
func (s *section) ring(p *part, rg ringGeometry) {
	c := Point{s.x1, s.z2}
	inner, outer, theta := s.ringFrame(rg.pieces, rg.nb)
	last, nr := len(rg.pieces), len(rg.rad)
	vert := func(j, k int) Point {
		switch {
		case k == 0:
			return Point{s.x1, rg.zUp[j]}
		case k == last:
			return Point{rg.xs[j], s.z2}
		case j == 0:
			return inner[k]
		case j == nr:
			return outer[k]
		}
		return lerp(inner[k], outer[k], rg.d[j]/s.dl)
	}
	for k, pc := range rg.pieces {
		arc := evenArc(c, s.r, theta[k], theta[k+1], pc.r)
		for j := range nr {
			var sides [4]string
			if j == 0 {
				sides[3] = "upper_top"
				p.curve(vert(0, k), vert(0, k+1), arc)
			} else {
				p.curve(vert(j, k), vert(j, k+1), across(arc, pc, rg.d[j]/s.dl))
			}
			p.quad([4]Point{vert(j, k), vert(j+1, k), vert(j+1, k+1), vert(j, k+1)},
				[2]int{rg.rad[j].n, pc.r.n}, [2]float64{rg.rad[j].ratio, pc.r.ratio},
				"upper_flange", sides)
		}
	}
}

// ringFrame returns the ends of the sides across the ring, on the fillet
// and on the outer side, and their angles about the fillet's centre. The
// side from the outer corner (xr, zk) meets the fillet where that corner's
// share of the outer length puts it, and on either side of it the sides
// meet the fillet evenly spaced, so the fillet's elements stay well shaped
// whatever the spacing of the outer side.
func (s *section) ringFrame(pieces []piece, nb int) (inner, outer []Point, theta []float64) {
	last := len(pieces)
	outer = make([]Point, last+1)
	for k, pc := range pieces {
		outer[k] = pc.s0
	}
	outer[last] = pieces[last-1].s1
	theta = ringAngles(pieces, nb)
	inner = make([]Point, last+1)
	for k, th := range theta {
		inner[k] = Point{s.x1 + s.r*math.Cos(th), s.z2 + s.r*math.Sin(th)}
	}
	inner[0], inner[last] = Point{s.x1, s.tf}, Point{s.x2, s.z2} // exactly P1 and P3
	return inner, outer, theta
}

// ringAngles returns the angles about the fillet's centre where the sides
// across the ring meet the fillet: from −π/2 (P1) to 0 (P3), the side from
// the outer corner at its share of the outer length, and in between in
// proportion to the elements of the pieces.
func ringAngles(pieces []piece, nb int) []float64 {
	var under, up float64 // outer lengths under the neck and up the face
	for k, pc := range pieces {
		if k < nb {
			under += dist(pc.s0, pc.s1)
		} else {
			up += dist(pc.s0, pc.s1)
		}
	}
	corner := -math.Pi / 2 * up / (under + up)
	theta := make([]float64, len(pieces)+1)
	spread := func(from, to int, a0, a1 float64) {
		total, count := elements(pieces[from:to]), 0
		for k := from; k <= to; k++ {
			theta[k] = a0 + (a1-a0)*float64(count)/float64(total)
			if k < to {
				count += pieces[k].r.n
			}
		}
	}
	spread(0, nb, -math.Pi/2, corner)
	spread(nb, len(pieces), corner, 0)
	return theta
}

// evenArc is the arc of radius r about c from angle a0 to a1, parametrized
// so that the nodes a block with the run's grading puts on it are evenly
// spaced: it inverts the run's geometric spacing.
func evenArc(c Point, r, a0, a1 float64, rn run) func(float64) Point {
	even := func(t float64) float64 { return t }
	if rn.n > 1 && rn.ratio != 1 {
		n := float64(rn.n)
		q := math.Pow(rn.ratio, 1/(n-1))
		qn := math.Pow(q, n)
		even = func(t float64) float64 { return math.Log1p(t*(qn-1)) / (n * math.Log(q)) }
	}
	return func(t float64) Point {
		sn, cs := math.Sincos(a0 + (a1-a0)*even(t))
		return Point{c.X + r*cs, c.Z + r*sn}
	}
}

// across is the line through the ring at fraction f of the way from the
// fillet (the curve arc) to the outer piece pc, both run at the same pace.
func across(arc func(float64) Point, pc piece, f float64) func(float64) Point {
	return func(u float64) Point { return lerp(arc(u), lerp(pc.s0, pc.s1, u), f) }
}
