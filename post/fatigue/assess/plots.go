package assess

import (
	"bytes"
	"fmt"
	"image/color"
	"io"
	"math"
	"path/filepath"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"flangeseg/post"
	"flangeseg/post/fatigue"
)

// Plots. They follow post/plot.go's page (6 in × 4 in, PNG at 200 dpi),
// fonts and colours, but draw bars and log–log axes, which post.Plot does
// not.

func fatigueFont(size vg.Length) font.Font {
	return font.From(font.Font{Typeface: "Liberation", Variant: "Sans"}, size)
}

// fatigueColor is the colour of function i (Okabe & Ito, as post/plot.go).
func fatigueColor(i int) color.Color {
	palette := [...]color.RGBA{{0x00, 0x72, 0xB2, 0xFF}, {0xD5, 0x5E, 0x00, 0xFF}, {0x00, 0x9E, 0x73, 0xFF}, {0xCC, 0x79, 0xA7, 0xFF}}
	return palette[i%len(palette)]
}

func newFatiguePlot(title, xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = fatigueFont(14)
	p.Title.Padding = vg.Points(8)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = fatigueFont(12)
		ax.Tick.Label.Font = fatigueFont(10)
		ax.Label.Padding = vg.Points(4)
	}
	p.X.Label.Text, p.Y.Label.Text = xlabel, ylabel
	p.Legend.TextStyle.Font = fatigueFont(11)
	p.Legend.Top = true
	grid := plotter.NewGrid()
	grid.Vertical = draw.LineStyle{Color: color.Gray{Y: 0xD9}, Width: vg.Points(0.5)}
	grid.Horizontal = grid.Vertical
	p.Add(grid)
	return p
}

// bars draws one function's value per bin as a bar in its slot: slot of
// slots side by side inside each bin.
type bars struct {
	bins        []fatigue.Bin
	value       func(fatigue.Bin) float64
	slot, slots int
	base        float64 // bottom of the bars (> 0 on a log axis)
	col         color.Color
}

func (b *bars) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	c.SetColor(b.col)
	for _, bin := range b.bins {
		v := b.value(bin)
		if !(v > b.base) {
			continue
		}
		w := (bin.To - bin.From) / float64(b.slots)
		x0 := bin.From + float64(b.slot)*w
		r := vg.Rectangle{Min: vg.Point{X: trX(x0), Y: trY(b.base)}, Max: vg.Point{X: trX(x0 + 0.92*w), Y: trY(v)}}
		c.Fill(r.Path())
	}
}

func (b *bars) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax, ymin, ymax = math.Inf(1), math.Inf(-1), b.base, b.base
	for _, bin := range b.bins {
		xmin, xmax = math.Min(xmin, bin.From), math.Max(xmax, bin.To)
		ymax = math.Max(ymax, b.value(bin))
	}
	return xmin, xmax, ymin, ymax
}

func (b *bars) Thumbnail(c *draw.Canvas) {
	c.SetColor(b.col)
	c.Fill(c.Rectangle.Path())
}

// barPlot draws one bar series per function over the shared bins.
func (j *Job) barPlot(title, ylabel string, bins [][]fatigue.Bin, value func(fatigue.Bin) float64, logY bool) *plot.Plot {
	p := newFatiguePlot(title, "stress range Δσ [MPa]", ylabel)
	base := 0.0
	if logY {
		low := math.Inf(1)
		for _, bs := range bins {
			for _, b := range bs {
				if v := value(b); v > 0 {
					low = math.Min(low, v)
				}
			}
		}
		base = math.Pow(10, math.Floor(math.Log10(low/2))) // below the lowest bar, a power of ten
		p.Y.Scale, p.Y.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	}
	for i, b := range j.fns {
		br := &bars{bins: bins[i], value: value, slot: i, slots: len(j.fns), base: base, col: fatigueColor(i)}
		p.Add(br)
		p.Legend.Add(b.label+" ("+b.tr.Basis().String()+")", br)
	}
	return p
}

// snLine is a curve of the S–N plot.
type snLine struct {
	name   string
	xy     plotter.XYs
	col    color.Color
	dashed bool
}

// snPlot draws the S–N curve, the design curve Δσ/γ_Mf and each
// function's spectrum as cycles exceeding a stress range.
func (j *Job) snPlot(bins [][]fatigue.Bin) (*plot.Plot, error) {
	p := newFatiguePlot("S–N curve and stress-range spectra", "cycles N", "stress range Δσ [MPa]")
	p.X.Scale, p.X.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	p.Y.Scale, p.Y.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	curve := j.miner.Curve()
	end := 1e10
	var char, design plotter.XYs
	for e := 3.0; e <= 10.0001; e += 0.05 {
		n := math.Pow(10, e)
		ds := curve.Range(n)
		if ds == 0 {
			ds = curve.CutOff() // the cut-off as a horizontal line
		}
		if ds > 0 {
			char = append(char, plotter.XY{X: n, Y: ds})
			design = append(design, plotter.XY{X: n, Y: ds / j.opt.GammaMf})
		}
	}
	lines := []snLine{
		{"S–N curve", char, color.Black, false},
		{fmt.Sprintf("S–N curve / γ_Mf = %g", j.opt.GammaMf), design, color.Black, true},
	}
	for i, b := range j.fns {
		var xy plotter.XYs
		cum := 0.0
		for k := len(bins[i]) - 1; k >= 0; k-- {
			if bins[i][k].Cycles == 0 {
				continue
			}
			if len(xy) > 0 {
				xy = append(xy, plotter.XY{X: cum, Y: bins[i][k].To})
			}
			cum += bins[i][k].Cycles
			xy = append(xy, plotter.XY{X: cum, Y: bins[i][k].To})
		}
		if len(xy) > 0 && xy[len(xy)-1].X < end {
			lines = append(lines, snLine{b.label + " spectrum", xy, fatigueColor(i), false})
		}
	}
	for _, l := range lines {
		if len(l.xy) == 0 {
			continue
		}
		ln, err := plotter.NewLine(l.xy)
		if err != nil {
			return nil, err
		}
		ln.LineStyle = draw.LineStyle{Color: l.col, Width: vg.Points(1.5)}
		if l.dashed {
			ln.Dashes = []vg.Length{vg.Points(6), vg.Points(3)}
		}
		p.Add(ln)
		p.Legend.Add(l.name, ln)
	}
	p.Legend.Left = false
	return p, nil
}

func (j *Job) writePlots(dir string, bins [][]fatigue.Bin) error {
	hist := j.barPlot("Bolt stress-range histogram", "cycles per bin", bins, func(b fatigue.Bin) float64 { return b.Cycles }, true)
	dmg := j.barPlot("Damage per stress-range bin", "damage per bin", bins, func(b fatigue.Bin) float64 { return b.Damage }, false)
	sn, err := j.snPlot(bins)
	if err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		p    *plot.Plot
	}{{"stress_range_histogram", hist}, {"damage_per_bin", dmg}, {"sn_curve", sn}} {
		if err := writeFatiguePlot(filepath.Join(dir, f.name), f.p); err != nil {
			return fmt.Errorf("plot %s: %w", f.name, err)
		}
	}
	return nil
}

// writeFatiguePlot draws p as stem.svg and stem.png, both drawn before
// either file is written, each written atomically.
func writeFatiguePlot(stem string, p *plot.Plot) (err error) {
	defer func() {
		// gonum/plot reports some conditions by panicking.
		if r := recover(); r != nil {
			err = fmt.Errorf("drawing failed: %v", r)
		}
	}()
	const w, h = 6 * vg.Inch, 4 * vg.Inch
	svg := vgsvg.New(w, h)
	p.Draw(draw.New(svg))
	var sb bytes.Buffer
	if _, err := svg.WriteTo(&sb); err != nil {
		return err
	}
	svgBytes := bytes.ReplaceAll(sb.Bytes(), []byte("font-family:Liberation Sans;"),
		[]byte("font-family:'Liberation Sans',Arial,Helvetica,sans-serif;"))
	img := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(200))
	p.Draw(draw.New(img))
	var pb bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: img}).WriteTo(&pb); err != nil {
		return err
	}
	for _, f := range []struct {
		path string
		data []byte
	}{{stem + ".svg", svgBytes}, {stem + ".png", pb.Bytes()}} {
		if err := post.WriteFileAtomic(f.path, func(w io.Writer) error {
			_, err := w.Write(f.data)
			return err
		}); err != nil {
			return err
		}
	}
	return nil
}
