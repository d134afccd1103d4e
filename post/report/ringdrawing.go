package report

import (
	"fmt"
	"math"
	"strings"
)

// surveyDrawing is a sketch of the survey's conventions as inline SVG:
// on the left the ring seen from above (bolt 1 at 0° at the top, the
// angle growing clockwise), on the right a section through one bolt with
// the gaps at the inner and outer edge of the face, the free edge on the
// inner side for an internal flange and on the outer side for an external
// one. It is drawn, not plotted: no data enter it.
func surveyDrawing(external bool) string {
	var b strings.Builder
	b.WriteString(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 720 270" width="720" height="270" role="img" aria-label="survey conventions" font-family="'Liberation Sans',Arial,Helvetica,sans-serif" font-size="12">` + "\n")
	planView(&b, 135, 140, 90)
	sectionView(&b, external)
	b.WriteString("</svg>")
	return b.String()
}

// planView draws the ring from above with its bolt positions.
func planView(b *strings.Builder, cx, cy, r float64) {
	fmt.Fprintf(b, `<circle cx="%g" cy="%g" r="%g" fill="none" stroke="#444" stroke-width="1.5"/>`+"\n", cx, cy, r)
	for k := range 24 {
		th := 2 * math.Pi * float64(k) / 24
		x, y := cx+r*math.Sin(th), cy-r*math.Cos(th)
		fill := "#888"
		if k == 0 {
			fill = "#000"
		}
		fmt.Fprintf(b, `<circle cx="%.1f" cy="%.1f" r="3" fill="%s"/>`+"\n", x, y, fill)
	}
	label := func(x, y float64, anchor, s string) {
		fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="%s">%s</text>`+"\n", x, y, anchor, esc(s))
	}
	label(cx, cy-r-10, "middle", "0° · bolt 1")
	label(cx+r+8, cy+4, "start", "90°")
	label(cx, cy+r+18, "middle", "180°")
	label(cx-r-8, cy+4, "end", "270°")
	// The clockwise arrow inside the ring, from 20° to 70°.
	a0, a1, ra := 20*math.Pi/180, 70*math.Pi/180, r-18
	x0, y0 := cx+ra*math.Sin(a0), cy-ra*math.Cos(a0)
	x1, y1 := cx+ra*math.Sin(a1), cy-ra*math.Cos(a1)
	fmt.Fprintf(b, `<path d="M %.1f %.1f A %g %g 0 0 1 %.1f %.1f" fill="none" stroke="#000" stroke-width="1.2"/>`+"\n", x0, y0, ra, ra, x1, y1)
	// Arrow head along the tangent at the end.
	tx, ty := math.Cos(a1), math.Sin(a1)
	nx, ny := -ty, tx
	fmt.Fprintf(b, `<path d="M %.1f %.1f L %.1f %.1f L %.1f %.1f Z" fill="#000"/>`+"\n",
		x1+6*tx, y1+6*ty, x1-4*tx+4*nx, y1-4*ty+4*ny, x1-4*tx-4*nx, y1-4*ty-4*ny)
	label(cx, cy+4, "middle", "seen from above")
	label(cx, cy+20, "middle", "bolt k at (k − 1)·360°/n")
}

// sectionView draws a section through one bolt: the two flanges with a
// gap that opens towards the free edge (a taper), the shell on its side,
// the bolt axis, and where gap_inner and gap_outer are measured.
func sectionView(b *strings.Builder, external bool) {
	const (
		left, right = 420.0, 600.0
		face        = 130.0 // z of the lower face
		tf          = 34.0  // flange thickness in the sketch
		bottom      = 205.0 // where the lower shell ends
		gapFree     = 14.0  // the gap at the free edge (drawn large)
		gapShell    = 4.0   // the gap at the shell side
		shellWidth  = 24.0
	)
	boltX := left + 0.42*(right-left)
	shellL, freeX, shellX := right-shellWidth, left, right
	if external {
		shellL, freeX, shellX = left, right, left
		boltX = right - 0.42*(right-left)
	}
	gapAt := func(x float64) float64 {
		return gapFree + (gapShell-gapFree)*math.Abs(x-freeX)/math.Abs(shellX-freeX)
	}
	gl, gr := gapAt(left), gapAt(right)
	// Lower flange with a flat face; the upper one's face tilted by the gap.
	fmt.Fprintf(b, `<path d="M %g %g L %g %g L %g %g L %g %g Z" fill="#ddd" stroke="#444"/>`+"\n",
		left, face, right, face, right, face+tf, left, face+tf)
	fmt.Fprintf(b, `<path d="M %g %g L %g %g L %g %g L %g %g Z" fill="#ddd" stroke="#444"/>`+"\n",
		left, face-gl, right, face-gr, right, face-gr-tf, left, face-gl-tf)
	// The shell, above the upper flange and below the lower one.
	top := face - gapShell - tf
	fmt.Fprintf(b, `<rect x="%g" y="%g" width="%g" height="%g" fill="#ccc" stroke="#444"/>`+"\n", shellL, 20.0, shellWidth, top-20)
	fmt.Fprintf(b, `<rect x="%g" y="%g" width="%g" height="%g" fill="#ccc" stroke="#444"/>`+"\n", shellL, face+tf, shellWidth, bottom-face-tf)
	fmt.Fprintf(b, `<line x1="%g" y1="%g" x2="%g" y2="%g" stroke="#000" stroke-dasharray="6 3"/>`+"\n", boltX, 55.0, boltX, bottom)
	label := func(x, y float64, anchor, s string) {
		fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="%s">%s</text>`+"\n", x, y, anchor, esc(s))
	}
	label(boltX, 47, "middle", "bolt axis")
	// The gaps at both edges, named outside the section.
	mark := func(x, g float64) {
		fmt.Fprintf(b, `<line x1="%g" y1="%g" x2="%g" y2="%g" stroke="#b00" stroke-width="2"/>`+"\n", x, face, x, face-g)
	}
	mark(left+1, gl)
	mark(right-1, gr)
	label(left-6, face-gl/2+4, "end", "gap_inner_mm")
	label(right+6, face-gr/2+4, "start", "gap_outer_mm")
	inner, outer := "inner edge: free edge (x = −a)", "outer edge: shell side"
	if external {
		inner, outer = "inner edge: shell side", "outer edge: free edge (x = −a)"
	}
	label(left, bottom+20, "middle", inner)
	label(right, bottom+38, "middle", outer)
	label((left+right)/2, 262, "middle", "section through a bolt, before tightening (gaps drawn large)")
}
