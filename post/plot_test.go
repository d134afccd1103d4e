package post

import (
	"bytes"
	"encoding/xml"
	"errors"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
)

// forcePlot is a made-up force–displacement chart: a smooth curve, a
// coarser dashed one with points, and two markers.
func forcePlot() Plot {
	var u, z, hu, hz []float64
	for i := 0; i <= 60; i++ {
		u = append(u, 0.05*float64(i))
		z = append(z, 900*(1-math.Exp(-u[i]/0.8)))
	}
	for i := 0; i <= 12; i++ {
		hu = append(hu, 0.25*float64(i))
		hz = append(hz, 820*(1-math.Exp(-hu[i]/0.7)))
	}
	return Plot{
		Title:  "Segment force & displacement",
		XLabel: "u [mm]",
		YLabel: "Z [kN]",
		Series: []Series{
			{Name: "finite-element model", X: u, Y: z},
			{Name: "hand method", X: hu, Y: hz, Dashed: true, Points: true},
		},
		Markers: []Marker{{Name: "peak", X: 2.5, Y: 857}, {Name: "opening", X: 0.3, Y: 280}},
	}
}

// svgTexts returns the text of every <text> element, failing if the
// document is not well-formed XML.
func svgTexts(t *testing.T, b []byte) []string {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(b))
	var out []string
	in := false
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return out
		}
		if err != nil {
			t.Fatalf("SVG does not parse as XML: %v", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			in = tok.Name.Local == "text"
		case xml.EndElement:
			in = false
		case xml.CharData:
			if in {
				out = append(out, string(tok))
			}
		}
	}
}

func TestWritePlot(t *testing.T) {
	dir := t.TempDir()
	stem := filepath.Join(dir, "force")
	p := forcePlot()
	if err := WritePlot(stem, p); err != nil {
		t.Fatal(err)
	}
	noTempFiles(t, dir)

	svg, err := os.ReadFile(stem + ".svg")
	if err != nil {
		t.Fatal(err)
	}
	texts := strings.Join(svgTexts(t, svg), "\n")
	for _, want := range []string{p.Title, p.XLabel, p.YLabel, "finite-element model", "hand method", "peak", "opening"} {
		if !strings.Contains(texts, want) {
			t.Errorf("SVG has no text %q; texts:\n%s", want, texts)
		}
	}

	f, err := os.Open(stem + ".png")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("PNG does not decode: %v", err)
	}
	if b := img.Bounds(); b.Dx() != 1200 || b.Dy() != 800 {
		t.Errorf("PNG is %d × %d px, want 1200 × 800", b.Dx(), b.Dy())
	}
}

func TestWritePlotDeterministic(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a"), filepath.Join(dir, "b")
	for _, stem := range []string{a, b} {
		if err := WritePlot(stem, forcePlot()); err != nil {
			t.Fatal(err)
		}
	}
	for _, ext := range []string{".svg", ".png"} {
		fa, err := os.ReadFile(a + ext)
		if err != nil {
			t.Fatal(err)
		}
		fb, err := os.ReadFile(b + ext)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(fa, fb) {
			t.Errorf("two %s files of the same plot differ", ext)
		}
	}
	var buf bytes.Buffer
	if err := EncodeSVG(&buf, forcePlot()); err != nil {
		t.Fatal(err)
	}
	if fa, _ := os.ReadFile(a + ".svg"); !bytes.Equal(buf.Bytes(), fa) {
		t.Error("EncodeSVG differs from the file WritePlot wrote")
	}
	buf.Reset()
	if err := EncodePNG(&buf, forcePlot()); err != nil {
		t.Fatal(err)
	}
	if fa, _ := os.ReadFile(a + ".png"); !bytes.Equal(buf.Bytes(), fa) {
		t.Error("EncodePNG differs from the file WritePlot wrote")
	}
}

func TestWritePlotErrors(t *testing.T) {
	good := []float64{0, 1, 2}
	one := func(s Series) Plot { return Plot{Series: []Series{{Name: "ok", X: good, Y: good}, s}} }
	for _, c := range []struct {
		name string
		p    Plot
		want []string
	}{
		{"no series", Plot{Title: "t"}, []string{"no series"}},
		{"empty", one(Series{Name: "bolt force"}), []string{`"bolt force" (Series[1])`, "no points"}},
		{"length", one(Series{Name: "bolt force", X: good, Y: good[:2]}), []string{`"bolt force"`, "X has 3 values, Y has 2"}},
		{"NaN", one(Series{Name: "gap", X: good, Y: []float64{0, math.NaN(), 1}}), []string{`"gap"`, "Y[1] is NaN"}},
		{"Inf", one(Series{Name: "gap", X: []float64{0, 1, math.Inf(1)}, Y: good}), []string{`"gap"`, "X[2] is +Inf"}},
		{"marker", Plot{Series: []Series{{X: good, Y: good}}, Markers: []Marker{{Name: "peak", X: 1, Y: math.Inf(-1)}}},
			[]string{`marker "peak" (Markers[0])`, "not finite"}},
		// gonum/plot's tick search would not end for this range.
		{"huge", one(Series{Name: "huge", X: []float64{-math.MaxFloat64, 0, math.MaxFloat64}, Y: good}), []string{`"huge"`, "X[0] = -1.7976931348623157e+308 is beyond ±1e+300"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			stem := filepath.Join(dir, "bad")
			err := WritePlot(stem, c.p)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range append(c.want, stem) {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			entries, _ := os.ReadDir(dir)
			if len(entries) != 0 {
				t.Errorf("%d files written despite the error", len(entries))
			}
			if err := EncodeSVG(io.Discard, c.p); err == nil {
				t.Error("EncodeSVG: no error")
			}
			if err := EncodePNG(io.Discard, c.p); err == nil {
				t.Error("EncodePNG: no error")
			}
		})
	}
}

// Plots drawn at the same time share gonum's font cache; they must not
// race (run with -race) and must come out the same as drawn alone.
func TestEncodeSVGConcurrent(t *testing.T) {
	var want bytes.Buffer
	if err := EncodeSVG(&want, forcePlot()); err != nil {
		t.Fatal(err)
	}
	errs := make(chan error, 4)
	for range 4 {
		go func() {
			var buf bytes.Buffer
			err := EncodeSVG(&buf, forcePlot())
			if err == nil && !bytes.Equal(buf.Bytes(), want.Bytes()) {
				err = errors.New("concurrent drawing gave a different SVG")
			}
			errs <- err
		}()
	}
	for range 4 {
		if err := <-errs; err != nil {
			t.Error(err)
		}
	}
}

// Plots that stress the layout: degenerate ranges, more series than
// colours, no names, values at the limit. They must draw.
func TestWritePlotEdgeCases(t *testing.T) {
	many := Plot{Title: "many"}
	for i := range 12 {
		f := float64(i)
		many.Series = append(many.Series, Series{Name: "s" + string(rune('a'+i)), X: []float64{0, 1}, Y: []float64{f, f + 1}, Points: i%2 == 0})
	}
	for _, c := range []struct {
		name string
		p    Plot
	}{
		{"single point", Plot{Series: []Series{{Name: "one", X: []float64{1}, Y: []float64{2}}}}},
		{"constant", Plot{Series: []Series{{Name: "flat", X: []float64{0, 1, 2}, Y: []float64{5, 5, 5}}}}},
		{"unnamed", Plot{Series: []Series{{X: []float64{0, 1}, Y: []float64{0, 1}}}, Markers: []Marker{{X: 0.5, Y: 0.5}}}},
		{"many series", many},
		{"limit", Plot{Series: []Series{{Name: "big", X: []float64{-1e300, 1e300}, Y: []float64{1e-300, 1e300}}}}},
	} {
		t.Run(c.name, func(t *testing.T) {
			var buf bytes.Buffer
			if err := EncodeSVG(&buf, c.p); err != nil {
				t.Fatal(err)
			}
			svgTexts(t, buf.Bytes())
		})
	}
}

// The legend goes to the first corner, in the order top left, top right,
// bottom right, bottom left, that no curve crosses.
func TestLegendCorner(t *testing.T) {
	line := func(x0, y0, x1, y1 float64) []Series {
		var x, y []float64
		for i := 0; i <= 50; i++ {
			s := float64(i) / 50
			x = append(x, x0+s*(x1-x0))
			y = append(y, y0+s*(y1-y0))
		}
		return []Series{{Name: "curve", X: x, Y: y}}
	}
	for _, c := range []struct {
		name      string
		series    []Series
		top, left bool
	}{
		{"rising", line(0, 0, 1, 1), true, true},
		{"falling", line(0, 1, 1, 0), true, false},
		// Lines just inside the edges of the data area (the legend box is
		// inset from the edges, so a line on an edge does not touch it).
		{"top and left", append(line(0, 0.95, 1, 0.95), line(0.03, 0, 0.03, 1)...), false, false},
		{"all but bottom left", append(append(line(0, 0.95, 1, 0.95), line(0.97, 0, 0.97, 1)...), line(0.5, 0.05, 1, 0.05)...), false, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := Plot{Series: c.series}
			pl := build(p)
			pl.X.Min, pl.X.Max, pl.Y.Min, pl.Y.Max = 0, 1, 0, 1
			l := &legend{p: p, sty: text.Style{Font: sans(legendSize), Handler: pl.TextHandler}, entries: []legendEntry{{name: "curve"}}}
			area := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: 400, Y: 250}}}
			w, h, _ := l.size()
			r := l.place(area, pl, w, h)
			top, left := r.Max.Y > 125, r.Min.X < 200
			if top != c.top || left != c.left {
				t.Errorf("legend at top=%v left=%v, want top=%v left=%v", top, left, c.top, c.left)
			}
		})
	}
}

func TestTicks(t *testing.T) {
	for _, c := range []struct {
		lo, hi float64
		labels string // the labelled ticks, or "" to check only their count and values
	}{
		{0, 880, "0 100 200 300 400 500 600 700 800"},
		{0, 4, "0 0.5 1 1.5 2 2.5 3 3.5 4"},
		{-0.35, 0.35, "-0.3 -0.2 -0.1 0 0.1 0.2 0.3"},
		{0, 0.7, "0 0.1 0.2 0.3 0.4 0.5 0.6 0.7"},
		{-1e-6, 3e-6, "-1e-06 -5e-07 0 5e-07 1e-06 1.5e-06 2e-06 2.5e-06 3e-06"},
		{480, 920, "500 600 700 800 900"},
		{1e10, 1e10 + 1e-3, ""}, // falls back to gonum's ticker
		{-1e300, 1e300, ""},
	} {
		var labels []string
		var last float64
		for i, tk := range (ticks{}).Ticks(c.lo, c.hi) {
			if i > 0 && tk.Value <= last {
				t.Errorf("[%v, %v]: ticks not increasing at %v", c.lo, c.hi, tk.Value)
			}
			last = tk.Value
			if tk.Label == "" {
				continue
			}
			labels = append(labels, tk.Label)
			if v, err := strconv.ParseFloat(tk.Label, 64); err != nil || math.Abs(v-tk.Value) > 1e-9*math.Max(math.Abs(c.lo), math.Abs(c.hi)) {
				t.Errorf("[%v, %v]: label %q at %v", c.lo, c.hi, tk.Label, tk.Value)
			}
		}
		if c.labels != "" && strings.Join(labels, " ") != c.labels {
			t.Errorf("[%v, %v]: labels %q, want %q", c.lo, c.hi, strings.Join(labels, " "), c.labels)
		}
		if len(labels) < 2 || len(labels) > 10 {
			t.Errorf("[%v, %v]: %d labels %q", c.lo, c.hi, len(labels), labels)
		}
	}
}

func benchPlot() Plot {
	p := Plot{Title: "bench", XLabel: "u [mm]", YLabel: "Z [kN]"}
	for k := range 3 {
		s := Series{Name: "series", Dashed: k == 1, Points: k == 2}
		for i := range 500 {
			u := float64(i) / 100
			s.X = append(s.X, u)
			s.Y = append(s.Y, float64(k+1)*300*(1-math.Exp(-u)))
		}
		p.Series = append(p.Series, s)
	}
	p.Markers = []Marker{{Name: "peak", X: 4, Y: 880}}
	return p
}

func BenchmarkEncodeSVG(b *testing.B) {
	p := benchPlot()
	for b.Loop() {
		if err := EncodeSVG(io.Discard, p); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkEncodePNG(b *testing.B) {
	p := benchPlot()
	for b.Loop() {
		if err := EncodePNG(io.Discard, p); err != nil {
			b.Fatal(err)
		}
	}
}

// A polar plot with EqualAxes draws a unit circle as a circle: one data
// unit is as long on the page in x as in y, and the circle stays inside
// both axes.
func TestEqualAxes(t *testing.T) {
	var circle Series
	for k := 0; k <= 72; k++ {
		th := 2 * math.Pi * float64(k) / 72
		circle.X, circle.Y = append(circle.X, math.Sin(th)), append(circle.Y, math.Cos(th))
	}
	for _, equal := range []bool{false, true} {
		p := Plot{Title: "circle", XLabel: "x", YLabel: "y", Series: []Series{circle}, EqualAxes: equal}
		pl := build(p)
		c := vgimg.NewWith(vgimg.UseWH(plotWidth, plotHeight), vgimg.UseDPI(pngDPI))
		area := draw.New(c)
		if equal {
			equalAxes(pl, pl.DataCanvas(area))
		}
		da := pl.DataCanvas(area)
		w, h := float64(da.Max.X-da.Min.X), float64(da.Max.Y-da.Min.Y)
		ratio := ((pl.X.Max - pl.X.Min) / w) / ((pl.Y.Max - pl.Y.Min) / h)
		if equal && math.Abs(ratio-1) > 0.02 {
			t.Errorf("equal axes: a unit of x is %.3f times a unit of y on the page", 1/ratio)
		}
		if !equal && math.Abs(ratio-1) < 0.1 {
			t.Errorf("without equal axes the 6 × 4 in page should stretch the circle; ratio %.3f", ratio)
		}
		if pl.X.Min > -1 || pl.X.Max < 1 || pl.Y.Min > -1 || pl.Y.Max < 1 {
			t.Errorf("axes x [%g, %g], y [%g, %g] cut the unit circle", pl.X.Min, pl.X.Max, pl.Y.Min, pl.Y.Max)
		}
	}
}

// TestLogY: a logarithmic y axis takes values over several decades and
// refuses a value that has no logarithm, naming the series and the value.
func TestLogY(t *testing.T) {
	s := Series{Name: "damage", X: []float64{0, 90, 180, 270}, Y: []float64{1e-6, 3e-4, 0.2, 1e-5}}
	p := Plot{Title: "damage", XLabel: "angle", YLabel: "D", Series: []Series{s}, LogY: true}
	stem := filepath.Join(t.TempDir(), "log")
	if err := WritePlot(stem, p); err != nil {
		t.Fatal(err)
	}
	pl := build(p)
	if _, ok := pl.Y.Scale.(plot.LogScale); !ok {
		t.Errorf("y scale %T, want plot.LogScale", pl.Y.Scale)
	}
	s.Y[2] = 0
	p.Series = []Series{s}
	err := WritePlot(stem+"_zero", p)
	if err == nil || !strings.Contains(err.Error(), `"damage"`) || !strings.Contains(err.Error(), "Y[2] = 0") {
		t.Errorf("a zero on a logarithmic axis: error %v, want one naming the series and Y[2] = 0", err)
	}
	if _, statErr := os.Stat(stem + "_zero.svg"); statErr == nil {
		t.Error("a refused plot left a file")
	}
}
