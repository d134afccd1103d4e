package report

import (
	"fmt"
	"math"
	"strings"
)

// Field picture layout [px].
const (
	fieldMaxW = 520 // drawing area of the section
	fieldMaxH = 560
	fieldPad  = 12
	barW      = 18  // colour bar
	barGap    = 34  // section to colour bar
	barLabelW = 130 // tick labels right of the bar
	barMinH   = 220
)

// fieldSVG draws f as an SVG picture with its colour bar, and returns
// with it a sentence on the extreme values for the caption.
func fieldSVG(f Field) (svg, extremes string) {
	view := fieldView(f)
	fr := fit(view, fieldMaxW, fieldMaxH, fieldPad, fieldPad+18)
	shown := visibleCells(f, view)
	lo, hi := valueRange(f, shown)

	var b strings.Builder
	barX := fr.left + fr.width() + barGap
	barH := math.Max(barMinH, math.Min(fr.height(), 360))
	w := barX + barW + barLabelW
	h := math.Max(fr.top+fr.height(), fr.top+barH+12) + 34
	fmt.Fprintf(&b, `<svg class="field" role="img" aria-label="%s" width="%s" height="%s" viewBox="0 0 %s %s" font-family="'Liberation Sans',Arial,Helvetica,sans-serif">`,
		esc(f.Name), num(w), num(h), num(w), num(h))
	fmt.Fprintf(&b, `<rect width="%s" height="%s" fill="#fff"/>`, num(w), num(h))
	fmt.Fprintf(&b, `<text x="%s" y="%s" font-size="12">%s [%s]</text>`,
		num(fr.left), num(fieldPad+8), esc(f.Name), esc(unitText(f.Unit)))

	// The section in a nested viewport, which clips what lies outside the view.
	fmt.Fprintf(&b, `<svg x="%s" y="%s" width="%s" height="%s" viewBox="%s %s %s %s">`,
		num(fr.left), num(fr.top), num(fr.width()), num(fr.height()),
		num(fr.left), num(fr.top), num(fr.width()), num(fr.height()))
	fieldCells(&b, fr, f, shown, lo, hi)
	fieldOutline(&b, fr, f, shown)
	at := maxNode(f, shown)
	x, y := fr.pt(f.Nodes[at])
	fmt.Fprintf(&b, `<circle cx="%s" cy="%s" r="5" fill="none" stroke="#0b3d6b" stroke-width="1.6"/>`, num(x), num(y))
	b.WriteString(`</svg>`)
	fmt.Fprintf(&b, `<rect x="%s" y="%s" width="%s" height="%s" fill="none" stroke="#999" stroke-width="0.5"/>`,
		num(fr.left), num(fr.top), num(fr.width()), num(fr.height()))

	colourBar(&b, barX, fr.top, barH, lo, hi, f.Unit)
	scaleBar(&b, fr, fr.left, fr.top+fr.height()+22, math.Min(120, fr.width()/2))
	b.WriteString(`</svg>`)

	if len(shown) == 0 {
		return b.String(), "No cell lies in the view."
	}
	p := f.Nodes[at]
	extremes = fmt.Sprintf("Node values in the view range from %s to %s; the largest (ringed) is at x = %s mm, z = %s mm.",
		withUnit(snap(lo, lo, hi), f.Unit), withUnit(hi, f.Unit), formatNumber(p[0], 0), formatNumber(p[1], 0))
	return b.String(), extremes
}

func withUnit(v float64, unit string) string {
	if unit == Dimensionless {
		return formatNumber(v, 0)
	}
	return formatNumber(v, 0) + " " + unit
}

// fieldView is the requested view, or the box around every cell.
func fieldView(f Field) Box {
	if f.View != nil {
		return *f.View
	}
	var pts [][2]float64
	for _, c := range f.Cells {
		for _, n := range c {
			pts = append(pts, f.Nodes[n])
		}
	}
	b, _ := bounds(pts)
	return b.grow(0.02)
}

// visibleCells returns the indices of the cells that reach into view.
func visibleCells(f Field, view Box) []int {
	var out []int
	for i, c := range f.Cells {
		pts := make([][2]float64, len(c))
		for k, n := range c {
			pts[k] = f.Nodes[n]
		}
		if b, _ := bounds(pts); b.overlaps(view) {
			out = append(out, i)
		}
	}
	return out
}

// valueRange returns the smallest and largest node value of the cells.
func valueRange(f Field, cells []int) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, i := range cells {
		for _, n := range f.Cells[i] {
			lo, hi = math.Min(lo, f.Values[n]), math.Max(hi, f.Values[n])
		}
	}
	if len(cells) == 0 {
		return 0, 0
	}
	return lo, hi
}

// maxNode returns the node of the largest value among the cells; the
// first such node on a tie.
func maxNode(f Field, cells []int) int {
	best := -1
	for _, i := range cells {
		for _, n := range f.Cells[i] {
			if best < 0 || f.Values[n] > f.Values[best] || (f.Values[n] == f.Values[best] && n < best) {
				best = n
			}
		}
	}
	return max(best, 0)
}

// level returns the colour step of v in lo…hi.
func level(v, lo, hi float64) int {
	if !(hi > lo) {
		return 0
	}
	return min(fieldLevels-1, max(0, int((v-lo)/(hi-lo)*fieldLevels)))
}

// fieldCells draws each cell in the colour of its mean node value. The
// cells of one colour step form one path, in cell order, so the file
// stays small and deterministic; a hairline stroke in the same colour
// closes the anti-aliasing seams between neighbours.
func fieldCells(b *strings.Builder, fr frame, f Field, cells []int, lo, hi float64) {
	var paths [fieldLevels]strings.Builder
	for _, i := range cells {
		c := f.Cells[i]
		var mean float64
		for _, n := range c {
			mean += f.Values[n]
		}
		mean /= float64(len(c))
		pathLoop(&paths[level(mean, lo, hi)], fr, cellPolygon(f.Nodes, c))
	}
	for k := range paths {
		if paths[k].Len() == 0 {
			continue
		}
		col := levelColour(k)
		fmt.Fprintf(b, `<path fill="%s" stroke="%s" stroke-width="0.6" stroke-linejoin="round" d="%s"/>`, col, col, paths[k].String())
	}
}

// cellPolygon returns the cell's boundary: corners with the midside
// nodes between them.
func cellPolygon(nodes [][2]float64, c []int) [][2]float64 {
	corners := len(c)
	if corners == 6 || corners == 8 {
		corners /= 2
	}
	pts := make([][2]float64, 0, len(c))
	for i := range corners {
		pts = append(pts, nodes[c[i]])
		if len(c) > corners {
			pts = append(pts, nodes[c[corners+i]])
		}
	}
	return pts
}

// fieldOutline draws the edges that only one of the cells has: the
// boundary of the section, including faces between separate bodies.
func fieldOutline(b *strings.Builder, fr frame, f Field, cells []int) {
	sub := make([][]int, len(cells))
	for k, i := range cells {
		sub[k] = f.Cells[i]
	}
	var d strings.Builder
	for _, e := range boundaryEdges(sub, nil, 0) {
		for k, n := range e.path() {
			x, y := fr.pt(f.Nodes[n])
			if k == 0 {
				d.WriteString("M")
			} else {
				d.WriteString("L")
			}
			d.WriteString(num(x) + " " + num(y))
		}
	}
	if d.Len() > 0 {
		fmt.Fprintf(b, `<path fill="none" stroke="#2b2b2b" stroke-width="0.9" stroke-linejoin="round" d="%s"/>`, d.String())
	}
}

// colourBar draws the scale from lo (bottom) to hi (top) at (x, top),
// h px high, with five labelled ticks.
func colourBar(b *strings.Builder, x, top, h, lo, hi float64, unit string) {
	step := h / fieldLevels
	for k := range fieldLevels {
		y := top + h - float64(k+1)*step
		// Each rectangle overlaps the next by a fraction of a pixel, so no seam shows.
		fmt.Fprintf(b, `<rect x="%s" y="%s" width="%d" height="%s" fill="%s"/>`,
			num(x), num(y), barW, num(step+0.4), levelColour(k))
	}
	fmt.Fprintf(b, `<rect x="%s" y="%s" width="%d" height="%s" fill="none" stroke="#444" stroke-width="0.8"/>`,
		num(x), num(top), barW, num(h))
	for i := range 5 {
		v := snap(lo+float64(i)/4*(hi-lo), lo, hi)
		y := top + h - float64(i)/4*h
		label := formatNumber(v, 0)
		if unit != Dimensionless {
			label += " " + unit
		}
		switch i {
		case 0:
			label = "min " + label
		case 4:
			label = "max " + label
		}
		fmt.Fprintf(b, `<path d="M%s %sh5" stroke="#444" stroke-width="0.8"/>`, num(x+barW), num(y))
		fmt.Fprintf(b, `<text x="%s" y="%s" font-size="11" dominant-baseline="central">%s</text>`,
			num(x+barW+8), num(y), esc(label))
	}
}

// snap returns 0 for a v that is zero to within a millionth of the range
// lo…hi, so that a scale from 5×10⁻⁹ to 880 MPa reads from 0.
func snap(v, lo, hi float64) float64 {
	if math.Abs(v) < 1e-6*math.Max(math.Abs(lo), math.Abs(hi)) {
		return 0
	}
	return v
}
