package report

import (
	"fmt"
	"math"
	"strings"
)

// Joint drawing layout [px].
const (
	jointMaxW    = 600
	jointMaxH    = 640
	jointPad     = 14
	jointLegendW = 200
	arrowLen     = 8
	arrowHalf    = 2.6
	extGap       = 3 // extension line from the measured point
	extOver      = 5 // extension line beyond the dimension line
	dimColour    = "#0b3d6b"
)

// jointSVG draws the regions, the bolt axis and the dimension lines of j.
func jointSVG(j *JointDrawing) string {
	view := jointView(j)
	fr := fit(view, jointMaxW, jointMaxH, jointPad, jointPad)
	w := fr.left + fr.width() + 24 + jointLegendW
	h := math.Max(fr.top+fr.height(), fr.top+float64(len(j.Regions))*22+40) + 40

	var b strings.Builder
	fmt.Fprintf(&b, `<svg class="joint" role="img" aria-label="joint section" width="%s" height="%s" viewBox="0 0 %s %s" font-family="'Liberation Sans',Arial,Helvetica,sans-serif">`,
		num(w), num(h), num(w), num(h))
	fmt.Fprintf(&b, `<rect width="%s" height="%s" fill="#fff"/>`, num(w), num(h))
	fmt.Fprintf(&b, `<svg x="%s" y="%s" width="%s" height="%s" viewBox="%s %s %s %s">`,
		num(fr.left), num(fr.top), num(fr.width()), num(fr.height()),
		num(fr.left), num(fr.top), num(fr.width()), num(fr.height()))
	for i, r := range j.Regions {
		var d strings.Builder
		for _, l := range r.Loops {
			pathLoop(&d, fr, l)
		}
		fmt.Fprintf(&b, `<path fill="%s" stroke="#2b2b2b" stroke-width="1" stroke-linejoin="round" d="%s"/>`,
			regionTints[i%len(regionTints)], d.String())
	}
	if j.BoltAxis {
		x, _ := fr.pt([2]float64{0, 0})
		fmt.Fprintf(&b, `<path d="M%s %sV%s" stroke="#555" stroke-width="0.9" stroke-dasharray="14 3 3 3" fill="none"/>`,
			num(x), num(fr.top), num(fr.top+fr.height()))
	}
	for _, d := range j.Dimensions {
		dimension(&b, fr, d)
	}
	b.WriteString(`</svg>`)

	lx := fr.left + fr.width() + 24
	for i, r := range j.Regions {
		y := fr.top + 8 + float64(i)*22
		fmt.Fprintf(&b, `<rect x="%s" y="%s" width="22" height="14" fill="%s" stroke="#2b2b2b" stroke-width="0.8"/>`,
			num(lx), num(y), regionTints[i%len(regionTints)])
		fmt.Fprintf(&b, `<text x="%s" y="%s" font-size="12" dominant-baseline="central">%s</text>`,
			num(lx+30), num(y+7), esc(r.Name))
	}
	if j.BoltAxis {
		y := fr.top + 8 + float64(len(j.Regions))*22 + 7
		fmt.Fprintf(&b, `<path d="M%s %sh22" stroke="#555" stroke-width="0.9" stroke-dasharray="14 3 3 3"/>`, num(lx), num(y))
		fmt.Fprintf(&b, `<text x="%s" y="%s" font-size="12" dominant-baseline="central">bolt axis, x = 0</text>`, num(lx+30), num(y))
	}
	scaleBar(&b, fr, fr.left, fr.top+fr.height()+24, math.Min(150, fr.width()/2))
	b.WriteString(`</svg>`)
	return b.String()
}

// jointView is the requested view, or the box around the regions and the
// dimension lines with a margin for the labels.
func jointView(j *JointDrawing) Box {
	if j.View != nil {
		return *j.View
	}
	var pts [][2]float64
	for _, r := range j.Regions {
		for _, l := range r.Loops {
			pts = append(pts, l...)
		}
	}
	for _, d := range j.Dimensions {
		n := dimNormal(d)
		for _, p := range [...][2]float64{d.From, d.To} {
			pts = append(pts, [2]float64{p[0] + n[0]*d.Offset, p[1] + n[1]*d.Offset})
		}
	}
	b, _ := bounds(pts)
	return b.grow(0.06)
}

// dimNormal is the unit normal to the left of From→To.
func dimNormal(d Dimension) [2]float64 {
	dx, dz := d.To[0]-d.From[0], d.To[1]-d.From[1]
	l := math.Hypot(dx, dz)
	return [2]float64{-dz / l, dx / l}
}

// dimension draws extension lines, the dimension line with its arrows
// and the label, which sits outside the line and reads from the left or
// from below.
func dimension(b *strings.Builder, fr frame, d Dimension) {
	n := dimNormal(d)
	s := 1.0
	if d.Offset < 0 {
		s = -1
	}
	at := func(p [2]float64, off float64) (float64, float64) {
		return fr.pt([2]float64{p[0] + n[0]*off, p[1] + n[1]*off})
	}
	gap, over := extGap/fr.scale, extOver/fr.scale
	if math.Abs(d.Offset) > gap {
		for _, p := range [...][2]float64{d.From, d.To} {
			x0, y0 := at(p, s*gap)
			x1, y1 := at(p, d.Offset+s*over)
			fmt.Fprintf(b, `<path d="M%s %sL%s %s" stroke="%s" stroke-width="0.7"/>`, num(x0), num(y0), num(x1), num(y1), dimColour)
		}
	}
	x1, y1 := at(d.From, d.Offset)
	x2, y2 := at(d.To, d.Offset)
	fmt.Fprintf(b, `<path d="M%s %sL%s %s" stroke="%s" stroke-width="0.9"/>`, num(x1), num(y1), num(x2), num(y2), dimColour)
	l := math.Hypot(x2-x1, y2-y1)
	ux, uy := (x2-x1)/l, (y2-y1)/l
	arrow(b, x1, y1, ux, uy)
	arrow(b, x2, y2, -ux, -uy)

	// The label's side: away from the measured points, in picture axes (y down).
	ox, oy := n[0]*s, -n[1]*s
	mx, my := (x1+x2)/2+ox*10, (y1+y2)/2+oy*10
	angle := math.Atan2(uy, ux) * 180 / math.Pi
	if angle > 90 {
		angle -= 180
	} else if angle <= -90 {
		angle += 180
	}
	fmt.Fprintf(b, `<text x="%s" y="%s" font-size="12" text-anchor="middle" dominant-baseline="central" fill="%s" stroke="#fff" stroke-width="3" paint-order="stroke" transform="rotate(%s %s %s)">%s</text>`,
		num(mx), num(my), dimColour, num(angle), num(mx), num(my), svgLabel(d.Label))
}

// arrow draws a filled arrowhead with its tip at (x, y), its body along
// (ux, uy).
func arrow(b *strings.Builder, x, y, ux, uy float64) {
	bx, by := x+ux*arrowLen, y+uy*arrowLen
	px, py := -uy*arrowHalf, ux*arrowHalf
	fmt.Fprintf(b, `<path d="M%s %sL%s %sL%s %sZ" fill="%s"/>`,
		num(x), num(y), num(bx+px), num(by+py), num(bx-px), num(by-py), dimColour)
}

// svgLabel escapes s for SVG text and sets the part of each word after
// its first '_' as a subscript, as symbolHTML does: "t_f = 84 mm".
func svgLabel(s string) string {
	words := strings.Split(s, " ")
	for i, w := range words {
		base, sub, ok := strings.Cut(w, "_")
		if !ok || base == "" || sub == "" {
			words[i] = esc(w)
			continue
		}
		words[i] = esc(base) + `<tspan baseline-shift="sub" font-size="9">` + esc(sub) + `</tspan>`
	}
	return strings.Join(words, " ")
}
