package report

import (
	"bytes"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"flangeseg/post"
)

// frame maps section coordinates (x, z) [mm] to picture coordinates
// [px]: x to the right, z up, at a common scale, with the view's top left
// corner at (left, top).
type frame struct {
	view      Box
	scale     float64 // px per mm
	left, top float64 // px
}

// fit returns the frame that shows view within maxW × maxH px.
func fit(view Box, maxW, maxH, left, top float64) frame {
	s := math.Min(maxW/(view.XMax-view.XMin), maxH/(view.ZMax-view.ZMin))
	return frame{view: view, scale: s, left: left, top: top}
}

func (f frame) width() float64  { return (f.view.XMax - f.view.XMin) * f.scale }
func (f frame) height() float64 { return (f.view.ZMax - f.view.ZMin) * f.scale }

func (f frame) pt(p [2]float64) (x, y float64) {
	return f.left + (p[0]-f.view.XMin)*f.scale, f.top + (f.view.ZMax-p[1])*f.scale
}

// num writes a picture coordinate to 0.1 px, which is finer than any
// screen or print shows, without trailing zeros.
func num(v float64) string {
	s := strconv.FormatFloat(v, 'f', 1, 64)
	s = strings.TrimSuffix(s, ".0")
	if s == "-0" {
		return "0"
	}
	return s
}

// pathLoop appends the closed loop through pts to a path's d attribute.
func pathLoop(b *strings.Builder, f frame, pts [][2]float64) {
	for i, p := range pts {
		x, y := f.pt(p)
		if i == 0 {
			b.WriteString("M")
		} else {
			b.WriteString("L")
		}
		b.WriteString(num(x))
		b.WriteString(" ")
		b.WriteString(num(y))
	}
	b.WriteString("Z")
}

// bounds returns the box around pts; ok is false for no points.
func bounds(pts [][2]float64) (b Box, ok bool) {
	b = Box{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	for _, p := range pts {
		b.XMin, b.XMax = math.Min(b.XMin, p[0]), math.Max(b.XMax, p[0])
		b.ZMin, b.ZMax = math.Min(b.ZMin, p[1]), math.Max(b.ZMax, p[1])
	}
	return b, len(pts) > 0
}

// grow returns b enlarged by frac of its larger side on every side, and
// made at least 1 mm wide and high so that the frame's scale is finite.
func (b Box) grow(frac float64) Box {
	d := frac * math.Max(b.XMax-b.XMin, b.ZMax-b.ZMin)
	d = math.Max(d, 0.5)
	return Box{b.XMin - d, b.XMax + d, b.ZMin - d, b.ZMax + d}
}

// overlaps reports whether the boxes share any point.
func (b Box) overlaps(o Box) bool {
	return b.XMin <= o.XMax && o.XMin <= b.XMax && b.ZMin <= o.ZMax && o.ZMin <= b.ZMax
}

// niceLength returns a length of 1, 2 or 5 × 10^k not above v.
func niceLength(v float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(v)))
	switch {
	case v >= 5*p:
		return 5 * p
	case v >= 2*p:
		return 2 * p
	}
	return p
}

// scaleBar draws a length scale of a round number of mm at (x, y), the
// left end of the bar, no longer than maxPx.
func scaleBar(b *strings.Builder, f frame, x, y, maxPx float64) {
	mm := niceLength(maxPx / f.scale)
	w := mm * f.scale
	fmt.Fprintf(b, `<path d="M%s %sv-4h%sv4" fill="none" stroke="#222" stroke-width="1.2"/>`,
		num(x), num(y), num(w))
	fmt.Fprintf(b, `<text x="%s" y="%s" font-size="11" text-anchor="middle">%s mm</text>`,
		num(x+w/2), num(y+13), esc(formatNumber(mm, 0)))
}

var (
	svgStart = regexp.MustCompile(`<svg\b`)
	svgXMLNS = regexp.MustCompile(`\s+xmlns(:[a-z]+)?="[^"]*"`)
)

// plotSVG renders p with post.EncodeSVG for inline use: without the XML
// prolog and the namespace declarations, which HTML supplies for an svg
// element, and sized by the page's style sheet.
func plotSVG(p post.Plot) (string, error) {
	var buf bytes.Buffer
	if err := post.EncodeSVG(&buf, p); err != nil {
		return "", err
	}
	b := buf.Bytes()
	loc := svgStart.FindIndex(b)
	if loc == nil {
		return "", fmt.Errorf("plot %q: the SVG has no svg element", p.Title)
	}
	b = b[loc[0]:]
	end := bytes.IndexByte(b, '>')
	head := svgXMLNS.ReplaceAll(b[:end], nil)
	var out strings.Builder
	out.WriteString(`<svg class="plot" role="img" aria-label="`)
	out.WriteString(esc(p.Title))
	out.WriteString(`"`)
	out.Write(head[len("<svg"):])
	out.Write(bytes.TrimSpace(b[end:]))
	return out.String(), nil
}
