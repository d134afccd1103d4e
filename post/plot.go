package post

// This file is longer than most: one plot builder (axes, ticks, legend,
// curves, markers) shared by the SVG and PNG writers, kept together so
// that both show the same picture.

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Series is one curve of a Plot: Y against X, point by point, joined by
// straight lines.
type Series struct {
	Name   string // legend text; an empty name leaves the series out of the legend
	X, Y   []float64
	Dashed bool // dashed instead of solid line
	Points bool // a marker at each point as well (always for a single point)
}

// Marker is a labelled point drawn over the curves, such as a peak or the
// opening load.
type Marker struct {
	Name string // label beside the point; may be empty
	X, Y float64
}

// Plot is a line chart of one or more series. Axis labels carry their
// unit, e.g. "Z [kN]".
type Plot struct {
	Title, XLabel, YLabel string
	Series                []Series
	Markers               []Marker
	// EqualAxes draws a unit of x and a unit of y at the same length on
	// the page (the axis with the smaller span is widened), so that a
	// circle in the data is a circle in the picture: polar plots.
	EqualAxes bool
	// LogY draws the y axis in decades (base 10), for a quantity whose
	// values span several, as fatigue damage around a ring does; every y
	// value must then be > 0.
	LogY bool
}

// Page size: 6 in × 4 in, which at pngDPI is 1200 × 800 px. The SVG has the
// same size in points, so both files have the same layout.
const (
	plotWidth  = 6 * vg.Inch
	plotHeight = 4 * vg.Inch
	pngDPI     = 200
)

// WritePlot draws p and writes it to stem+".svg" and stem+".png", each
// replaced atomically. Both images are drawn before either file is
// touched, so invalid data leaves no file behind. The same Plot gives
// byte-identical files.
func WritePlot(stem string, p Plot) error {
	svg, err := renderSVG(p)
	if err != nil {
		return fmt.Errorf("post: plot %s: %w", stem, err)
	}
	png, err := renderPNG(p)
	if err != nil {
		return fmt.Errorf("post: plot %s: %w", stem, err)
	}
	if err := writeBytes(stem+".svg", svg); err != nil {
		return err
	}
	return writeBytes(stem+".png", png)
}

// EncodeSVG writes what WritePlot puts in the .svg file to w.
func EncodeSVG(w io.Writer, p Plot) error {
	b, err := renderSVG(p)
	if err != nil {
		return fmt.Errorf("post: plot: %w", err)
	}
	_, err = w.Write(b)
	return err
}

// EncodePNG writes what WritePlot puts in the .png file to w.
func EncodePNG(w io.Writer, p Plot) error {
	b, err := renderPNG(p)
	if err != nil {
		return fmt.Errorf("post: plot: %w", err)
	}
	_, err = w.Write(b)
	return err
}

func writeBytes(path string, b []byte) error {
	return WriteFileAtomic(path, func(w io.Writer) error {
		_, err := w.Write(b)
		return err
	})
}

// validate rejects what the chart cannot show. Errors name the series or
// marker by its name and its index in the Plot.
func (p Plot) validate() error {
	if len(p.Series) == 0 {
		return errors.New("no series")
	}
	for i, s := range p.Series {
		where := fmt.Sprintf("series %q (Series[%d])", s.Name, i)
		switch {
		case len(s.X) != len(s.Y):
			return fmt.Errorf("%s: X has %d values, Y has %d", where, len(s.X), len(s.Y))
		case len(s.X) == 0:
			return fmt.Errorf("%s: no points", where)
		}
		if err := allFinite(where, "X", s.X); err != nil {
			return err
		}
		if err := allFinite(where, "Y", s.Y); err != nil {
			return err
		}
		if p.LogY {
			for j, y := range s.Y {
				if !(y > 0) {
					return fmt.Errorf("%s: Y[%d] = %v: a logarithmic y axis needs values > 0", where, j, y)
				}
			}
		}
	}
	for i, m := range p.Markers {
		if plottable(m.X) != nil || plottable(m.Y) != nil {
			return fmt.Errorf("marker %q (Markers[%d]): point (%v, %v) is not finite or beyond ±%v", m.Name, i, m.X, m.Y, plotLimit)
		}
		if p.LogY && !(m.Y > 0) {
			return fmt.Errorf("marker %q (Markers[%d]): y = %v: a logarithmic y axis needs values > 0", m.Name, i, m.Y)
		}
	}
	return nil
}

// plotLimit bounds the magnitude of plotted values. gonum/plot's tick
// search does not end for an axis range near the float64 limit (±1.8e308
// spans overflow), and no result of ours comes near it.
const plotLimit = 1e300

func allFinite(where, axis string, v []float64) error {
	for i, x := range v {
		if err := plottable(x); err != nil {
			return fmt.Errorf("%s: %s[%d] %w", where, axis, i, err)
		}
	}
	return nil
}

func plottable(x float64) error {
	switch {
	case !finite(x):
		return fmt.Errorf("is %v", x)
	case math.Abs(x) > plotLimit:
		return fmt.Errorf("= %v is beyond ±%v", x, plotLimit)
	}
	return nil
}

func renderSVG(p Plot) ([]byte, error) {
	c := vgsvg.New(plotWidth, plotHeight)
	if err := render(c, p); err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, err
	}
	// The fonts are not embedded (that would add half a megabyte per face).
	// A viewer without Liberation Sans falls back to Arial, whose metrics
	// are the same, so the layout holds; then to any sans-serif face.
	return bytes.ReplaceAll(buf.Bytes(),
		[]byte("font-family:Liberation Sans;"),
		[]byte("font-family:'Liberation Sans',Arial,Helvetica,sans-serif;")), nil
}

func renderPNG(p Plot) ([]byte, error) {
	c := vgimg.NewWith(vgimg.UseWH(plotWidth, plotHeight), vgimg.UseDPI(pngDPI))
	if err := render(c, p); err != nil {
		return nil, err
	}
	// Line art on a white page compresses well at the fastest level too:
	// a few per cent larger files, written in half the time.
	var buf bytes.Buffer
	enc := png.Encoder{CompressionLevel: png.BestSpeed}
	if err := enc.Encode(&buf, c.Image()); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// render validates p and draws it on c. gonum/plot reports some
// conditions by panicking; they are turned into errors here so that none
// crosses this package's boundary.
func render(c vg.CanvasSizer, p Plot) (err error) {
	if err := p.validate(); err != nil {
		return err
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("drawing failed: %v", r)
		}
	}()
	pl := build(p)
	page := draw.New(c)
	page.SetColor(color.White)
	page.Fill(page.Rectangle.Path())
	margin := vg.Points(6)
	area := draw.Crop(page, margin, -margin, margin, -margin)
	if p.EqualAxes {
		equalAxes(pl, pl.DataCanvas(area))
	}
	pl.Draw(area)
	return nil
}

// equalAxes widens the axis of pl whose data span is the smaller per unit
// of page length of the data area da, about its middle.
func equalAxes(pl *plot.Plot, da draw.Canvas) {
	w, h := float64(da.Max.X-da.Min.X), float64(da.Max.Y-da.Min.Y)
	if !(w > 0 && h > 0) {
		return
	}
	perPoint := max((pl.X.Max-pl.X.Min)/w, (pl.Y.Max-pl.Y.Min)/h)
	cx, cy := (pl.X.Min+pl.X.Max)/2, (pl.Y.Min+pl.Y.Max)/2
	pl.X.Min, pl.X.Max = cx-perPoint*w/2, cx+perPoint*w/2
	pl.Y.Min, pl.Y.Max = cy-perPoint*h/2, cy+perPoint*h/2
}

// seriesColor returns the colour of series i, after Okabe & Ito (2008),
// "Color Universal Design", a set that stays distinct under the common
// forms of colour blindness. Their yellow is left out: it is too faint on
// white.
func seriesColor(i int) color.RGBA {
	palette := [...]color.RGBA{
		{0x00, 0x72, 0xB2, 0xFF}, // blue
		{0xD5, 0x5E, 0x00, 0xFF}, // vermilion
		{0x00, 0x9E, 0x73, 0xFF}, // bluish green
		{0xCC, 0x79, 0xA7, 0xFF}, // reddish purple
		{0xE6, 0x9F, 0x00, 0xFF}, // orange
		{0x56, 0xB4, 0xE9, 0xFF}, // sky blue
		{0x00, 0x00, 0x00, 0xFF}, // black
	}
	return palette[i%len(palette)]
}

// seriesShape returns the point shape of series i, so that series with
// points also differ without colour.
func seriesShape(i int) draw.GlyphDrawer {
	shapes := [...]draw.GlyphDrawer{
		draw.CircleGlyph{}, draw.SquareGlyph{}, draw.TriangleGlyph{},
		draw.CrossGlyph{}, draw.PyramidGlyph{}, draw.PlusGlyph{}, draw.BoxGlyph{},
	}
	return shapes[i%len(shapes)]
}

// gridColor is a light grey that stays behind the curves.
func gridColor() color.Color { return color.Gray{Y: 0xD9} }

// Line and text sizes, in points on the 6 in × 4 in page.
const (
	titleSize  = 14
	labelSize  = 12
	tickSize   = 10
	legendSize = 11
	markerSize = 10
	lineWidth  = 1.5
)

func sans(size vg.Length) font.Font {
	return font.From(font.Font{Typeface: "Liberation", Variant: "Sans"}, size)
}

// build turns p into a gonum plot. It is called once per canvas, since
// drawing a gonum plot changes its axes.
func build(p Plot) *plot.Plot {
	pl := plot.New()
	pl.BackgroundColor = nil // the page is filled in render, margin included
	pl.Title.Text = p.Title
	pl.Title.TextStyle.Font = sans(titleSize)
	pl.Title.Padding = vg.Points(8)
	for _, ax := range []*plot.Axis{&pl.X, &pl.Y} {
		ax.Label.TextStyle.Font = sans(labelSize)
		ax.Tick.Label.Font = sans(tickSize)
		ax.Label.Padding = vg.Points(4)
	}
	pl.X.Tick.Marker = ticks{}
	pl.Y.Tick.Marker = ticks{}
	if p.LogY {
		pl.Y.Scale = plot.LogScale{}
		pl.Y.Tick.Marker = plot.LogTicks{Prec: 1}
	}
	pl.X.Label.Text = p.XLabel
	pl.Y.Label.Text = p.YLabel

	grid := plotter.NewGrid()
	grid.Vertical = draw.LineStyle{Color: gridColor(), Width: vg.Points(0.5)}
	grid.Horizontal = grid.Vertical
	pl.Add(grid)

	leg := &legend{p: p, sty: text.Style{Color: color.Black, Font: sans(legendSize), Handler: pl.TextHandler}}
	for i, s := range p.Series {
		thumbs := addSeries(pl, i, s)
		if s.Name != "" {
			leg.entries = append(leg.entries, legendEntry{s.Name, thumbs})
		}
	}
	for _, m := range p.Markers {
		addMarker(pl, m, p)
	}
	if len(leg.entries) > 0 {
		pl.Add(leg) // last, so that it covers the curves beneath it
	}
	return pl
}

func addSeries(pl *plot.Plot, i int, s Series) []plot.Thumbnailer {
	xy := make(plotter.XYs, len(s.X))
	for k := range xy {
		xy[k] = plotter.XY{X: s.X[k], Y: s.Y[k]}
	}
	col := seriesColor(i)
	line := &plotter.Line{XYs: xy, LineStyle: draw.LineStyle{Color: col, Width: vg.Points(lineWidth)}}
	if s.Dashed {
		line.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
	}
	pl.Add(line)
	thumbs := []plot.Thumbnailer{line}
	if s.Points || len(xy) == 1 { // a line through one point draws nothing
		dots := &plotter.Scatter{XYs: xy, GlyphStyle: draw.GlyphStyle{
			Color: col, Radius: vg.Points(2.5), Shape: seriesShape(i),
		}}
		pl.Add(dots)
		thumbs = append(thumbs, dots)
	}
	return thumbs
}

// ticks is a plot.Ticker that divides an axis into four to nine labelled
// steps of 1, 2 or 5 × 10^k, with unlabelled ticks between them; gonum's
// default labels about three, too few to read values off a chart.
type ticks struct{}

// Ticks implements plot.Ticker.
func (ticks) Ticks(lo, hi float64) []plot.Tick {
	span := hi - lo
	if !(span > 0) || math.IsInf(span, 0) {
		return plot.DefaultTicks{}.Ticks(lo, hi)
	}
	mag := math.Pow(10, math.Floor(math.Log10(span/6)))
	step, sub := 10*mag, 5 // labelled step and its number of minor steps
	switch f := span / 6 / mag; {
	case f < 1.5:
		step = mag
	case f < 3:
		step, sub = 2*mag, 4
	case f < 7:
		step = 5 * mag
	}
	minor := step / float64(sub)
	first := math.Ceil(lo/minor - 1e-9)
	if math.Abs(first) > 1e15 {
		// Tick numbers this large no longer count in steps of one.
		return plot.DefaultTicks{}.Ticks(lo, hi)
	}
	var out []plot.Tick
	for k := int64(first); k <= int64(first)+100; k++ {
		v := float64(k) * minor
		if v > hi+1e-9*minor {
			break
		}
		t := plot.Tick{Value: v}
		if k%int64(sub) == 0 {
			// 10 significant digits hide the rounding noise of k·minor.
			t.Label = strconv.FormatFloat(v, 'g', 10, 64)
		}
		out = append(out, t)
	}
	return out
}

// ringGlyph is a circle outline drawn with the glyph's colour at a
// visible line width (draw.RingGlyph uses a hairline).
type ringGlyph struct{}

func (ringGlyph) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	c.SetLineStyle(draw.LineStyle{Color: sty.Color, Width: vg.Points(1.2)})
	var path vg.Path
	path.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
	path.Arc(pt, sty.Radius, 0, 2*math.Pi)
	path.Close()
	c.Stroke(path)
}

// addMarker draws m as a black ring with its name beside it: to the right,
// or to the left for a point in the right third of the x range, so the
// label stays inside the chart.
func addMarker(pl *plot.Plot, m Marker, p Plot) {
	ring := &plotter.Scatter{
		XYs:        plotter.XYs{{X: m.X, Y: m.Y}},
		GlyphStyle: draw.GlyphStyle{Color: color.Black, Radius: vg.Points(4), Shape: ringGlyph{}},
	}
	pl.Add(ring)
	if m.Name == "" {
		return
	}
	sty := text.Style{
		Color:   color.Black,
		Font:    sans(markerSize),
		YAlign:  draw.YCenter,
		Handler: pl.TextHandler,
	}
	off := vg.Point{X: vg.Points(7), Y: vg.Points(3)}
	xmin, xmax := xRange(p)
	if xmax > xmin && m.X > xmin+2*(xmax-xmin)/3 {
		sty.XAlign = draw.XRight
		off.X = -off.X
	}
	pl.Add(&plotter.Labels{
		XYs:       plotter.XYs{{X: m.X, Y: m.Y}},
		Labels:    []string{m.Name},
		TextStyle: []text.Style{sty},
		Offset:    off,
	})
}

func xRange(p Plot) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, s := range p.Series {
		for _, x := range s.X {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
	}
	for _, m := range p.Markers {
		lo, hi = math.Min(lo, m.X), math.Max(hi, m.X)
	}
	return lo, hi
}

// legend is a plotter that draws the legend in a box inside the data
// area, in the corner that the curves and markers cross least; on a tie
// the first of top left, top right, bottom right, bottom left wins. It is
// drawn as a plotter rather than with plot.Legend so that the corner is
// chosen on the very canvas it is drawn on, and the box can have a
// background.
type legend struct {
	entries []legendEntry
	sty     text.Style
	p       Plot // the data whose crossings are counted
}

type legendEntry struct {
	name   string
	thumbs []plot.Thumbnailer
}

// Legend layout, in points.
const (
	legendInset = 6  // box from the data area's edges
	legendPad   = 5  // text and symbols from the box's edges
	legendThumb = 26 // width of a line sample
	legendGap   = 3  // between rows
)

// Plot implements plot.Plotter.
func (l *legend) Plot(c draw.Canvas, plt *plot.Plot) {
	w, h, rowH := l.size()
	box := l.place(c, plt, w, h)
	c.SetColor(color.NRGBA{R: 0xFF, G: 0xFF, B: 0xFF, A: 0xE0})
	c.Fill(box.Path())
	c.SetLineStyle(draw.LineStyle{Color: color.Gray{Y: 0xA0}, Width: vg.Points(0.5)})
	c.Stroke(box.Path())
	sty := l.sty
	sty.YAlign = draw.YCenter
	top := box.Max.Y - legendPad
	for _, e := range l.entries {
		icon := &draw.Canvas{Canvas: c.Canvas, Rectangle: vg.Rectangle{
			Min: vg.Point{X: box.Min.X + legendPad, Y: top - rowH},
			Max: vg.Point{X: box.Min.X + legendPad + legendThumb, Y: top},
		}}
		for _, t := range e.thumbs {
			t.Thumbnail(icon)
		}
		c.FillText(sty, vg.Point{X: icon.Max.X + legendPad, Y: icon.Center().Y}, e.name)
		top -= rowH + legendGap
	}
}

// size returns the legend box's width and height and the height of a row.
func (l *legend) size() (w, h, rowH vg.Length) {
	var textW vg.Length
	for _, e := range l.entries {
		textW = max(textW, l.sty.Width(e.name))
		rowH = max(rowH, l.sty.Height(e.name))
	}
	n := vg.Length(len(l.entries))
	w = 2*legendPad + legendThumb + legendPad + textW
	h = 2*legendPad + n*rowH + (n-1)*legendGap
	return w, h, rowH
}

// place returns the box of size w × h in the data area's corner with the
// fewest crossings. Curves are sampled every 2 pt along each segment, so a
// line that only passes through a corner counts as well as its points.
func (l *legend) place(c draw.Canvas, plt *plot.Plot, w, h vg.Length) vg.Rectangle {
	trX, trY := plt.Transforms(&c)
	area := vg.Rectangle{
		Min: vg.Point{X: c.Min.X + legendInset, Y: c.Min.Y + legendInset},
		Max: vg.Point{X: c.Max.X - legendInset, Y: c.Max.Y - legendInset},
	}
	var best vg.Rectangle
	bestHits := math.MaxInt
	for _, k := range [...]struct{ top, left bool }{{true, true}, {true, false}, {false, false}, {false, true}} {
		r := cornerRect(area, w, h, k.top, k.left)
		hits := 0
		for _, s := range l.p.Series {
			hits += segmentHits(r, s, trX, trY)
		}
		for _, m := range l.p.Markers {
			if inside(r, vg.Point{X: trX(m.X), Y: trY(m.Y)}) {
				hits += 100 // a marker and its label must stay readable
			}
		}
		if hits < bestHits {
			best, bestHits = r, hits
		}
	}
	return best
}

func cornerRect(a vg.Rectangle, w, h vg.Length, top, left bool) vg.Rectangle {
	r := vg.Rectangle{Min: vg.Point{X: a.Max.X - w, Y: a.Min.Y}, Max: vg.Point{X: a.Max.X, Y: a.Min.Y + h}}
	if left {
		r.Min.X, r.Max.X = a.Min.X, a.Min.X+w
	}
	if top {
		r.Min.Y, r.Max.Y = a.Max.Y-h, a.Max.Y
	}
	return r
}

func segmentHits(r vg.Rectangle, s Series, trX, trY func(float64) vg.Length) int {
	const step = vg.Length(2) // points
	hits := 0
	var prev vg.Point
	for i := range s.X {
		pt := vg.Point{X: trX(s.X[i]), Y: trY(s.Y[i])}
		if i == 0 {
			if inside(r, pt) {
				hits++
			}
			prev = pt
			continue
		}
		d := pt.Sub(prev)
		k := int(math.Min(math.Hypot(float64(d.X), float64(d.Y))/float64(step), 1000)) + 1
		for j := 1; j <= k; j++ {
			t := vg.Length(float64(j) / float64(k))
			if inside(r, vg.Point{X: prev.X + t*d.X, Y: prev.Y + t*d.Y}) {
				hits++
			}
		}
		prev = pt
	}
	return hits
}

func inside(r vg.Rectangle, pt vg.Point) bool {
	return pt.X >= r.Min.X && pt.X <= r.Max.X && pt.Y >= r.Min.Y && pt.Y <= r.Max.Y
}
