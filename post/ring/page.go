package ring

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"flangeseg/post"
	"flangeseg/post/report"
)

// polar is a closed curve of a quantity around the ring: radius v at each
// bolt's angle, drawn as seen from above the tower with 0° at the top and
// the angle growing clockwise (x = v·sin θ, y = v·cos θ).
func polar(name string, bolts []BoltResult, v func(BoltResult) float64, dashed bool) post.Series {
	s := post.Series{Name: name, Dashed: dashed}
	for i := 0; i <= len(bolts); i++ {
		b := bolts[i%len(bolts)]
		th := b.Angle * math.Pi / 180
		r := v(b)
		s.X, s.Y = append(s.X, r*math.Sin(th)), append(s.Y, r*math.Cos(th))
	}
	return s
}

// plots are the polar plots around the circumference, with their file
// stems, and the bolt-force functions of the classes.
func (res *Result) plots() (stems []string, around []post.Plot, curves []post.Plot) {
	bs := res.Bolts
	if len(bs) == 0 {
		return nil, nil, nil
	}
	gap := post.Plot{EqualAxes: true, Title: "Gap at each bolt, before and after the preload",
		XLabel: "radius: gap [mm]; 0° at the top, clockwise", YLabel: "gap [mm]",
		Series: []post.Series{
			polar("parallel gap before tightening", bs, func(b BoltResult) float64 { return b.Parallel }, true),
			polar("largest gap left after the preload", bs, func(b BoltResult) float64 { return b.GapLeftMM }, false),
		}}
	clamp := post.Plot{EqualAxes: true, Title: "Preload, and clamp force left after closing",
		XLabel: "radius: force [kN]; 0° at the top, clockwise", YLabel: "force [kN]",
		Series: []post.Series{
			polar("preload", bs, func(b BoltResult) float64 { return b.PreloadKN }, true),
			polar("clamp force after the preload", bs, func(b BoltResult) float64 { return b.ClampKN }, false),
		}}
	stems = []string{"ring_gap", "ring_clamp"}
	around = []post.Plot{gap, clamp}
	if res.Loads != nil {
		damage := post.Plot{EqualAxes: true, Title: "Fatigue damage D per bolt",
			XLabel: "radius: D [–]; 0° at the top, clockwise", YLabel: "D [–]",
			Series: []post.Series{
				polar("FE", bs, func(b BoltResult) float64 { return fe(b) }, false),
				polar("trilinear (hand)", bs, trilinear, false),
			}}
		if max := maxDamage(bs); max >= 0.5 {
			// Drawn only where some bolt comes near it: otherwise the
			// circle would shrink every bolt's damage to a dot.
			damage.Title = "Fatigue damage D per bolt (dashed: D = 1)"
			damage.Series = append(damage.Series, polar("D = 1", bs, func(BoltResult) float64 { return 1 }, true))
		}
		stems, around = append(stems, "ring_damage"), append(around, damage)
		if p, ok := damageByAngle(bs); ok {
			stems, around = append(stems, "ring_damage_log"), append(around, p)
		}
	}
	fn := post.Plot{Title: "FE bolt-force function of each class", XLabel: "Z [kN]", YLabel: "F_s [kN]"}
	done := map[string]bool{}
	for _, b := range bs {
		if done[b.Class] || len(b.FunctionZ) < 2 {
			continue
		}
		done[b.Class] = true
		fn.Series = append(fn.Series, post.Series{Name: b.Class, X: b.FunctionZ, Y: b.FunctionFs})
	}
	if len(fn.Series) > 0 {
		stems, curves = append(stems, "ring_functions"), append(curves, fn)
	}
	return stems, around, curves
}

// damageByAngle is the damage of every bolt against its angle on a
// logarithmic scale: in the polar plot one gapped bolt's damage, often
// decades above the rest, shrinks the others to a dot. Damages below a
// millionth of the largest are drawn at that floor, which the axis label
// names; false if no bolt has any.
func damageByAngle(bs []BoltResult) (post.Plot, bool) {
	top := 0.0
	for _, b := range bs {
		top = math.Max(top, math.Max(fe(b), trilinear(b)))
	}
	if !(top > 0) {
		return post.Plot{}, false
	}
	floor := top * 1e-6
	series := func(name string, v func(BoltResult) float64) post.Series {
		s := post.Series{Name: name, Points: true}
		for _, b := range bs {
			s.X, s.Y = append(s.X, b.Angle), append(s.Y, math.Max(v(b), floor))
		}
		return s
	}
	limit := post.Series{Name: "D = 1", Dashed: true, X: []float64{0, 360}, Y: []float64{1, 1}}
	return post.Plot{LogY: true, Title: "Fatigue damage D per bolt around the ring (log scale)",
		XLabel: "bolt angle [°], 0° = bolt 1, clockwise seen from above",
		YLabel: fmt.Sprintf("D [–]; below %.0e drawn at it", floor),
		Series: []post.Series{series("FE", fe), series("trilinear (hand)", trilinear), limit}}, true
}

func trilinear(b BoltResult) float64 {
	if b.Fatigue == nil {
		return 0
	}
	return b.Fatigue.DamageTrilinear
}

func fe(b BoltResult) float64 {
	if b.Fatigue == nil {
		return 0
	}
	return b.Fatigue.DamageFE
}

func maxDamage(bs []BoltResult) float64 {
	m := 0.0
	for _, b := range bs {
		m = math.Max(m, fe(b))
	}
	return m
}

// WritePlots writes the plots into the folder dir (SVG and PNG).
func (res *Result) WritePlots(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	stems, around, curves := res.plots()
	for i, p := range append(around, curves...) {
		if err := post.WritePlot(filepath.Join(dir, stems[i]), p); err != nil {
			return err
		}
	}
	return nil
}

// Finding says in sentences what the ring check found.
func (res *Result) Finding() []string {
	var out []string
	g := res.bolt(res.Governing)
	if g != nil {
		if g.Fatigue != nil {
			out = append(out, fmt.Sprintf("Governing bolt: %d at %s° (%s): FE fatigue damage D = %.3g (hand trilinear model %.3g), Δσ_eq = %.3g MPa; %.0f %% of its preload went into closing its gap.",
				g.Number, formatNumber(g.Angle), g.Class, g.Fatigue.DamageFE, g.Fatigue.DamageTrilinear, g.Fatigue.EquivalentRangeMPa, 100*g.ClosingShare))
		} else {
			out = append(out, fmt.Sprintf("Governing bolt (no loads given: by the preload spent on closing): %d at %s° (%s): %.0f %% of its preload went into closing its gap, %.3g mm left open.",
				g.Number, formatNumber(g.Angle), g.Class, 100*g.ClosingShare, g.GapLeftMM))
		}
	}
	switch {
	case res.Loads == nil:
		out = append(out, "No loads were given (--loads): no fatigue damage was assessed.")
	case len(res.OverDamage) == 0:
		out = append(out, "No bolt exceeds D = 1 by the FE bolt-force function.")
	default:
		out = append(out, fmt.Sprintf("Bolts exceeding D = 1 by the FE bolt-force function: %s.", boltList(res.OverDamage)))
	}
	if len(res.OverLoss) == 0 {
		out = append(out, fmt.Sprintf("No bolt spends more than %.0f %% of its preload on closing its gap.", 100*res.Fatigue.LossLimit))
	} else {
		out = append(out, fmt.Sprintf("Bolts spending more than %.0f %% of their preload on closing their gap: %s.", 100*res.Fatigue.LossLimit, boltList(res.OverLoss)))
	}
	var bad []string
	for _, r := range res.Records {
		if r.Status != "finished" {
			bad = append(bad, r.Name+" ("+r.Status+")")
		}
	}
	if len(bad) > 0 {
		out = append(out, fmt.Sprintf("Classes without a complete analysis: %v; their bolts have no or partial results.", bad))
	}
	return out
}

func (res *Result) bolt(n int) *BoltResult {
	for i := range res.Bolts {
		if res.Bolts[i].Number == n {
			return &res.Bolts[i]
		}
	}
	return nil
}

// WritePage writes the ring page.
func (res *Result) WritePage(path string) error {
	p := res.Plan
	_, around, curves := res.plots()
	one := report.Dimensionless
	sum := sha256.Sum256(p.Sweep.BaseText)
	r := report.Ring{Title: "Ring check: " + p.Spec.Title, Survey: p.Survey, Caution: post.Caution,
		Generated: fmt.Sprintf("flangeseg %s; model sha256 %s", post.Version, hex.EncodeToString(sum[:8])),
		Finding:   res.Finding(), Around: around, Curves: curves, Warnings: res.Warnings, Notes: notes(),
		External: p.Options.Flange == External}
	r.Setup = report.Quantities{Caption: "What the check is made of", Rows: []report.Quantity{
		{Name: "model file", Value: report.Text(filepath.Base(p.Model)), Source: "command line"},
		{Name: "survey file", Value: report.Text(p.Survey), Source: "--survey"},
		{Symbol: "n", Name: "bolts", Value: report.Num(float64(len(res.Bolts)), one), Source: "tower.bolts"},
		{Name: "classes (analyses)", Value: report.Num(float64(len(p.Classes)), one), Source: "tolerances below"},
		{Name: "gap tolerance of the classes", Value: report.Num(p.Options.GapTolerance, "mm"), Source: "--gap-tolerance"},
		{Name: "taper tolerance of the classes", Value: report.Num(p.Options.TaperTolerance, "°"), Source: "--taper-tolerance"},
		{Name: "flange", Value: report.Text(p.Options.Flange), Source: "--flange"},
		{Name: "factor on the ring spring", Value: report.Num(p.Options.RingFactor, one), Source: "--ring-factor"},
		{Name: "preload-loss limit", Value: report.Num(res.Fatigue.LossLimit, one), Source: "--loss-limit"},
	}}
	if res.Loads != nil {
		r.Setup.Rows = append(r.Setup.Rows,
			report.Quantity{Name: "load file", Value: report.Text(filepath.Base(res.Fatigue.LoadsLabel) + " (" + res.Loads.Layout + ")"), Source: "--loads"},
			report.Quantity{Name: "direction of the moment", Value: report.Text(res.Loads.Directions), Source: "--loads, --directions"},
			report.Quantity{Name: "S–N curve", Value: report.Text(res.Curve), Source: "--sn-curve"},
			report.Quantity{Symbol: "γ_Mf", Name: "partial factor on the fatigue strength", Value: report.Num(res.GammaMf, one), Source: "fatigue.gamma_mf or --gamma-mf"})
	}
	r.Classes = report.Table{Caption: "Bolts whose imperfections round to the same values share one analysis", Source: "ring_plan.toml; cases/NAME",
		Columns: []report.Column{{Heading: "class"}, {Heading: "taper", Unit: "°"}, {Heading: "parallel gap", Unit: "mm"},
			{Heading: "ring spring", Unit: "kN/mm"}, {Heading: "bolts"}, {Heading: "status"}}}
	for i, c := range p.Classes {
		r.Classes.Rows = append(r.Classes.Rows, []report.Cell{report.Text(c.Name), report.Num(c.Taper, "°"), report.Num(c.Parallel, "mm"),
			report.Num(c.Spring/1e3, "kN/mm"), report.Text(boltList(c.Bolts)), report.Text(res.Records[i].Status)})
	}
	r.Bolts = report.Table{Caption: "One row a bolt", Source: "ring.csv",
		Columns: []report.Column{{Heading: "bolt"}, {Heading: "angle", Unit: "°"}, {Heading: "gap inner", Unit: "mm"}, {Heading: "gap outer", Unit: "mm"},
			{Heading: "class"}, {Heading: "spent on closing", Unit: one}, {Heading: "clamp force", Unit: "kN"}, {Heading: "gap left", Unit: "mm"}}}
	if res.Loads != nil {
		r.Bolts.Columns = append(r.Bolts.Columns, report.Column{Heading: "D FE", Unit: one}, report.Column{Heading: "D trilinear", Unit: one},
			report.Column{Heading: "Δσ_eq FE", Unit: "MPa"})
	}
	for _, b := range res.Bolts {
		row := []report.Cell{report.Text(strconv.Itoa(b.Number)), report.Num(b.Angle, "°"), report.Num(b.Inner, "mm"), report.Num(b.Outer, "mm"),
			report.Text(b.Class), report.Num(b.ClosingShare, one), report.Num(b.ClampKN, "kN"), report.Num(b.GapLeftMM, "mm")}
		if res.Loads != nil {
			if f := b.Fatigue; f != nil {
				row = append(row, report.Num(f.DamageFE, one), report.Num(f.DamageTrilinear, one), report.Num(f.EquivalentRangeMPa, "MPa"))
			} else {
				row = append(row, report.Missing(one), report.Missing(one), report.Missing("MPa"))
			}
		}
		r.Bolts.Rows = append(r.Bolts.Rows, row)
	}
	return report.WriteRing(path, r)
}

// notes are the conventions the page states.
func notes() []string {
	return []string{
		"Bolt k stands at (k − 1)·360/n degrees; the plots look down on the tower with 0° at the top and the angle growing clockwise. Gaps between measuring positions are interpolated linearly in the angle, around the circle.",
		"Each bolt's parallel gap is the gap common to both edges of its face, less the smallest such gap of the ring (where the ring rests); its taper is the difference of the edges over the face width a + b + t/2, as contact.taper (each face tilted by half).",
		"A parallel gap spanning several bolts is held open by the ring: each bolt's segment gets a spring (contact.gap_spring) from the flange-and-shell ring bending as a beam clamped at the nearest closed bolts on either side, loaded by equal forces at the bolts in the gap, with the upper and the lower ring in series (DEVELOPERS.md, \"The ring check\"). The spring is an idealisation: its stiffness is uncertain by a factor of about two; --ring-factor brackets it.",
		"The segment force of the bolt at angle θ is Z = 4·M·cos(θ − θ_M)/(n·D) − N/n (common practice for ring flanges). The hand models (trilinear, joint diagram) assume closed flat faces and do not see the gaps.",
	}
}
