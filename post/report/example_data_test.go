package report

import (
	"fmt"
	"math"

	"flangeseg/post"
)

// This file builds a realistic input for the tests: an invented tower
// joint "T3" (D = 4100 mm, 112 M42 10.9 bolts, t = 26 mm, t_f = 84 mm,
// a = 72 mm, b = 80 mm), with a mesh of our own and response curves and
// fields shaped like those of a run. The numbers are plausible but
// invented; nothing here is a check value.

// Geometry of the invented joint [mm].
const (
	exD   = 4100.0 // shell mid-surface diameter
	exN   = 112    // bolts
	exT   = 26.0   // t, shell thickness
	exTf  = 84.0   // t_f, flange thickness
	exA   = 72.0   // a, bolt axis to flange free edge
	exB   = 80.0   // b, bolt axis to shell mid-surface
	exL   = 500.0  // modelled shell length
	exDb  = 42.0   // d, bolt diameter
	exP   = 4.5    // pitch of M42 (ISO 261)
	exDh  = 45.0   // d_h, hole
	exDw  = 78.0   // d_w, washer outer diameter
	exTw  = 8.0    // washer thickness
	exHh  = 26.0   // head height
	exHn  = 34.0   // nut height
	exFub = 1000.0 // f_ub of 10.9 [MPa]
)

// exSegment is c = πD/n, the bolt spacing on the bolt circle.
func exSegment() float64 { return math.Pi * exD / exN }

// exStressArea is A_s after ISO 898-1 [mm²].
func exStressArea() float64 {
	d2, d3 := exDb-0.6495*exP, exDb-1.2269*exP
	return math.Pi / 4 * math.Pow((d2+d3)/2, 2)
}

// exPreload is F_p,C = 0.7·f_ub·A_s [kN] (EN 1993-1-8, 3.9).
func exPreload() float64 { return 0.7 * exFub * exStressArea() / 1e3 }

// exMesh is a structured quad mesh of the section: two flange bodies
// with their shells and the bolt body with head, nut and washers.
type exMesh struct {
	nodes   [][2]float64
	cells   [][]int
	region  []int
	names   []string
	nodeIDs map[[3]int64]int // body, x, z (to 1 µm) → node, so blocks of a body share nodes
}

func (m *exMesh) node(body int, x, z float64) int {
	k := [3]int64{int64(body), int64(math.Round(x * 1e3)), int64(math.Round(z * 1e3))}
	if id, ok := m.nodeIDs[k]; ok {
		return id
	}
	m.nodes = append(m.nodes, [2]float64{x, z})
	m.nodeIDs[k] = len(m.nodes) - 1
	return len(m.nodes) - 1
}

// block meshes the rectangle x0…x1 × z0…z1 with cells of about size mm.
func (m *exMesh) block(body int, name string, x0, x1, z0, z1, size float64) {
	r := -1
	for i, n := range m.names {
		if n == name {
			r = i
		}
	}
	if r < 0 {
		m.names = append(m.names, name)
		r = len(m.names) - 1
	}
	nx := max(1, int(math.Ceil((x1-x0)/size)))
	nz := max(1, int(math.Ceil((z1-z0)/size)))
	for j := range nz {
		for i := range nx {
			xa, xb := x0+(x1-x0)*float64(i)/float64(nx), x0+(x1-x0)*float64(i+1)/float64(nx)
			za, zb := z0+(z1-z0)*float64(j)/float64(nz), z0+(z1-z0)*float64(j+1)/float64(nz)
			m.cells = append(m.cells, []int{
				m.node(body, xa, za), m.node(body, xb, za), m.node(body, xb, zb), m.node(body, xa, zb),
			})
			m.region = append(m.region, r)
		}
	}
}

func exampleMesh() *exMesh {
	m := &exMesh{nodeIDs: map[[3]int64]int{}}
	hole := exDh / 2
	in, out := exB-exT/2, exB+exT/2
	for body, s := range [...]float64{1, -1} { // upper, lower
		side := [...]string{"upper", "lower"}[body]
		z := func(v float64) (float64, float64) { // a z range on this side, ordered
			return math.Min(0, s*v), math.Max(0, s*v)
		}
		za, zb := z(exTf)
		m.block(body, side+" flange", -exA, -hole, za, zb, 6)
		m.block(body, side+" flange, hole band", -hole, hole, za, zb, 6)
		m.block(body, side+" flange", hole, in, za, zb, 6)
		m.block(body, side+" flange", in, out, za, zb, 6)
		lo, hi := math.Min(s*exTf, s*exL), math.Max(s*exTf, s*exL)
		m.block(body, side+" shell", in, out, lo, hi, 6.5)
	}
	h := math.Sqrt(3) / 2 * exDb // bolt strip width: matches A and I of the round bar
	top, bot := exTf+exTw, -exTf-exTw
	m.block(2, "bolt", -h/2, h/2, bot, top, 6)
	m.block(2, "head and washer", -exDw/2, exDw/2, exTf, top, 6)
	m.block(2, "head and washer", -exDw/2, exDw/2, top, top+exHh, 6)
	m.block(2, "nut and washer", -exDw/2, exDw/2, bot, -exTf, 6)
	m.block(2, "nut and washer", -exDw/2, exDw/2, bot-exHn, bot, 6)
	return m
}

// Invented response of the defined-contact variant [kN, mm].
const (
	exOpen = 220.0 // opening load
	exPeak = 410.0 // peak segment force
)

// exZ is the segment force at displacement u of the loaded edge [kN]:
// stiff up to opening, softening towards the peak, then a slight drop.
func exZ(u, peak float64) float64 {
	z := peak * (1 - math.Exp(-u/0.26))
	if u > 1.0 {
		z *= 1 - 0.08*(u-1.0)/0.2
	}
	return z
}

// exBoltForce is the bolt force at segment force z [kN].
func exBoltForce(z, open, fp float64) float64 {
	if z < open {
		return fp + 0.05*z
	}
	d := z - open
	return fp + 0.05*open + d*(1.2+0.6*math.Min(d, 300)/300)
}

func exampleCurves(open, peak float64) (z, u, fs, gap, ms []float64) {
	fp := exPreload()
	for i := range 41 {
		ui := 1.2 * float64(i) / 40
		zi := exZ(ui, peak)
		z, u = append(z, zi), append(u, ui)
		fs = append(fs, exBoltForce(zi, open, fp))
		g := 0.0
		if zi > open {
			g = 0.004 * (zi - open) * (1 + (zi-open)/150)
		}
		gap = append(gap, g/10)
		ms = append(ms, 0.9+0.006*zi)
	}
	return z, u, fs, gap, ms
}

// exampleHand is the trilinear bolt-force curve of the hand method for
// the invented joint [kN] (shape only).
func exampleHand() (z, fs []float64) {
	fp := exPreload()
	lever := (exA + exB) / exA
	zOpen := 0.8 * fp * exA / (exA + exB) * 0.5
	return []float64{0, zOpen, 440},
		[]float64{fp, fp + 0.08*zOpen, fp + 0.08*zOpen + lever*(440-zOpen)*0.85}
}

func exampleInputs() []Quantities {
	mf := "model file"
	return []Quantities{
		{Caption: "Tower and shell", Rows: []Quantity{
			{"D", "shell mid-surface diameter at the joint", Num(exD, "mm"), mf},
			{"n", "number of bolts", Num(exN, Dimensionless), mf},
			{"c", "segment width πD/n", Num(exSegment(), "mm"), "derived"},
			{"t", "shell thickness", Num(exT, "mm"), mf},
			{"L", "modelled shell length each side", Num(exL, "mm"), mf},
			{"", "shell material", Text("S355"), mf},
			{"f_y", "yield strength of the shell, 16 < t ≤ 40 mm", Num(345, "MPa"), "EN 10025-2"},
		}},
		{Caption: "Flange", Rows: []Quantity{
			{"t_f", "flange thickness", Num(exTf, "mm"), mf},
			{"a", "bolt axis to flange free edge", Num(exA, "mm"), mf},
			{"b", "bolt axis to shell mid-surface", Num(exB, "mm"), mf},
			{"f_y", "yield strength of the flange, 80 < t ≤ 100 mm", Num(315, "MPa"), "EN 10025-2"},
		}},
		{Caption: "Bolt", Rows: []Quantity{
			{"", "size and grade", Text("M42 10.9, partially threaded"), mf},
			{"d", "bolt diameter", Num(exDb, "mm"), "ISO 261"},
			{"P", "pitch", Num(exP, "mm"), "ISO 261"},
			{"A_s", "stress area", Num(exStressArea(), "mm²"), "ISO 898-1"},
			{"f_ub", "tensile strength, nominal", Num(exFub, "MPa"), "EN 1993-1-8 Table 3.1"},
			{"d_h", "hole diameter", Num(exDh, "mm"), mf},
			{"d_w", "washer outer diameter", Num(exDw, "mm"), mf},
			{"h", "in-plane width of the bolt strip, (√3/2)·d", Num(math.Sqrt(3)/2*exDb, "mm"), "derived: matches A and I of the round bar"},
		}},
		{Caption: "Contact, load and analysis", Rows: []Quantity{
			{"μ", "friction coefficient", Num(0.2, Dimensionless), mf},
			{"", "contact zones", Text("x = −72…−50 mm and x = 60…93 mm"), mf},
			{"", "recess outside the zones", Num(0.3, "mm"), mf},
			{"u_max", "largest displacement of the loaded edge", Num(1.2, "mm"), mf},
			{"", "increments", Num(40, Dimensionless), mf},
			{"", "loaded end", Text("rotation free"), mf},
			{"", "plane", Text("plane stress, ring springs on"), "default"},
			{"", "element size", Num(6, "mm"), mf},
		}},
	}
}

func exampleReport() Report {
	m := exampleMesh()
	regions, err := Outlines(m.nodes, m.cells, m.region, m.names)
	if err != nil {
		panic(err) // the example mesh is built above; a failure is a bug of this file
	}
	z, u, fs, gap, ms := exampleCurves(exOpen, exPeak)
	hz, hfs := exampleHand()
	fp := exPreload()
	As := exStressArea()
	view := &Box{XMin: -95, XMax: 115, ZMin: -160, ZMax: 160}

	return Report{
		Title:     "Tower joint T3 — defined contact bands",
		Model:     "t3-bands.toml",
		Generated: "flangeseg (test build), example input of the report tests",
		Caution:   exCaution,
		Joint: &JointDrawing{
			Regions:  regions,
			BoltAxis: true,
			View:     &Box{XMin: -110, XMax: 140, ZMin: -190, ZMax: 190},
			Dimensions: []Dimension{
				{From: [2]float64{-exA, 0}, To: [2]float64{-exA, exTf}, Label: "t_f = 84 mm", Offset: 18},
				{From: [2]float64{-exA, -exTf}, To: [2]float64{0, -exTf}, Label: "a = 72 mm", Offset: -44},
				{From: [2]float64{0, -exTf}, To: [2]float64{exB, -exTf}, Label: "b = 80 mm", Offset: -44},
				{From: [2]float64{exB + exT/2, 150}, To: [2]float64{exB - exT/2, 150}, Label: "t = 26 mm", Offset: -10},
			},
		},
		Inputs: exampleInputs(),
		Preload: Quantities{Caption: "Preload", Rows: []Quantity{
			{"F_p,C", "target preload 0.7·f_ub·A_s", Num(fp, "kN"), "EN 1993-1-8, 3.9"},
			{"F_p", "preload reached", NumDigits(fp-0.002, "kN", 6), "FE, this run"},
			{"", "method", Text("shortening of a shank slice, then locked"), "flangeseg"},
			{"ε_0", "locked shortening strain of the slice", Num(-0.0612, Dimensionless), "FE, this run"},
			{"σ_p", "bolt stress after preload F_p/A_s", Num(fp*1e3/As, "MPa"), "derived"},
		}},
		Results: Quantities{Caption: "Joint figures", Rows: []Quantity{
			{"K_0", "stiffness, tangent at Z = 0", Num(1830, "kN/mm"), "FE, this run"},
			{"K_ref", "stiffness, secant to the reference load", Num(1615, "kN/mm"), "FE, this run"},
			{"Φ_0", "load factor ΔF_s/ΔZ at Z = 0", Num(0.05, Dimensionless), "FE, this run"},
			{"Z_open", "opening load (shell-side corner, gap > 1 µm)", Num(exOpen, "kN"), "FE, this run"},
			{"Z_dec", "decompression load", Num(268, "kN"), "FE, this run"},
			{"Z_peak", "peak segment force", Num(exPeak, "kN"), "FE, this run"},
			{"u_peak", "displacement at the peak", Num(0.96, "mm"), "FE, this run"},
			{"", "failure location", Text("bolt thread, then shell hinge at the flange"), "FE, this run"},
		}},
		Curves: []post.Plot{
			{Title: "Bolt force against segment force", XLabel: "Z [kN]", YLabel: "F_s [kN]",
				Series:  []post.Series{{Name: "FE", X: z, Y: fs}, {Name: "hand method (trilinear)", X: hz, Y: hfs, Dashed: true}},
				Markers: []post.Marker{{Name: "opening", X: exOpen, Y: exBoltForce(exOpen, exOpen, fp)}}},
			{Title: "Segment force against displacement", XLabel: "u [mm]", YLabel: "Z [kN]",
				Series: []post.Series{{Name: "FE", X: u, Y: z}}},
			{Title: "Gap at the shell-side corner", XLabel: "Z [kN]", YLabel: "gap [mm]",
				Series: []post.Series{{Name: "FE", X: z, Y: gap}}},
			{Title: "Bolt bending moment at the interface", XLabel: "Z [kN]", YLabel: "M_s [kN·m]",
				Series: []post.Series{{Name: "FE", X: z, Y: ms}}},
		},
		HandVersusFE: Table{
			Caption: "Ultimate segment force by FE and by the plastic-hinge methods",
			Columns: []Column{{Heading: "method"}, {Heading: "failure mode"}, {Heading: "ultimate segment force", Unit: "kN"},
				{Heading: "FE / method", Unit: Dimensionless}, {Heading: "source"}},
			Rows: [][]Cell{
				{Text("FE, this run"), Text("bolt + shell hinge"), Num(exPeak, ""), Num(1, ""), Text("peak of the tension stage")},
				{Text("plastic hinges"), Text("B"), Num(452.3, ""), Num(exPeak/452.3, ""), Text("Petersen, Stahlbau (mode B)")},
				{Text("plastic hinges, M–N"), Text("B"), Num(438.6, ""), Num(exPeak/438.6, ""), Text("Seidel (2001)")},
				{Text("bolt tension resistance"), Text("A"), Num(0.9*exFub*As/1.25/1e3, ""), Num(exPeak/(0.9*exFub*As/1.25/1e3), ""), Text("EN 1993-1-8 Table 3.4, k₂ = 0.9, γ_M2 = 1.25")},
			},
			Source: "FE: this run; hand methods: post/handcalc, each with the source in its row",
		},
		ContactPressure: []post.Plot{exampleContact()},
		Fields:          exampleFields(m, view),
		Convergence: Quantities{Caption: "Solver statistics", Rows: []Quantity{
			{"", "equations", Num(20946, Dimensionless), "FE, this run"},
			{"", "converged increments", Num(40, Dimensionless), "FE, this run"},
			{"", "Newton iterations", Num(312, Dimensionless), "FE, this run"},
			{"", "mean iterations per increment", Num(312.0/45, Dimensionless), "FE, this run"},
			{"", "largest penetration", Num(0.0000412, "mm"), "FE, this run"},
			{"", "wall time", Num(38.4, "s"), "this machine"},
		}},
		Notes: []string{
			"Example input of the report tests: an invented joint with curves and fields shaped like those of a run; not a result.",
		},
	}
}

// exCaution is a design-aid caution of the kind the tool passes.
const exCaution = "flangeseg is a design aid. Its results must be checked against the governing\n" +
	"codes (e.g. EN 1993-1-8, EN 1993-1-9) and signed off under local codes and\n" +
	"licensed engineering practice before any joint is built or accepted."

// exampleContact is the contact pressure along the interface at three
// loads: under preload it peaks in the bands, with rising Z it moves to
// the free edge.
func exampleContact() post.Plot {
	p := post.Plot{Title: "Contact pressure along the interface", XLabel: "x [mm]", YLabel: "p [MPa]"}
	for _, z := range [...]float64{0, 200, 380} {
		var xs, ps []float64
		for i := range 67 {
			x := -exA + (exB+exT/2+exA)*float64(i)/66
			var pr float64
			inEdge, inShell := x <= -50, x >= 60
			switch {
			case inEdge:
				pr = 55 + 0.35*z*(1+(-50-x)/22)
			case inShell:
				pr = math.Max(0, 60*(1-z/exOpen)*(1-(x-60)/40))
			}
			xs, ps = append(xs, x), append(ps, pr)
		}
		p.Series = append(p.Series, post.Series{Name: fmt.Sprintf("Z = %g kN", z), X: xs, Y: ps})
	}
	return p
}

// exampleFields are von Mises stress and plastic strain at the peak,
// shaped like a run's: shell bending at the flange, a bolt near yield,
// plastic strain at the shell-to-flange corner.
func exampleFields(m *exMesh, view *Box) []Field {
	vm := make([]float64, len(m.nodes))
	ep := make([]float64, len(m.nodes))
	c := exSegment()
	beta := math.Pow(3*(1-0.09)/(exD*exD/4*exT*exT), 0.25)
	for i, p := range m.nodes {
		x, z := p[0], math.Abs(p[1])
		var s float64
		switch {
		case z > exTf && x >= exB-exT/2-1e-9 && x <= exB+exT/2+1e-9: // shell
			n := exPeak * 1e3 / (c * exT)
			mb := 0.45 * exPeak * 1e3 * exB * math.Exp(-beta*(z-exTf)) * math.Cos(beta*(z-exTf))
			s = math.Abs(n + 6*mb/(c*exT*exT)*(2*(x-exB)/exT))
		case z <= exTf && math.Abs(x) > exDh/2 && x >= -exA: // flange
			s = 60 + 320*math.Exp(-((x-62)*(x-62)/700+(z-exTf)*(z-exTf)/500)) + 90*math.Exp(-((x+60)*(x+60)/200+z*z/300))
		default: // bolt, head, nut
			s = 880 + 60*math.Exp(-z*z/1500)
			if math.Abs(x) > math.Sqrt(3)/4*exDb {
				s = 240 * math.Exp(-(z-exTf)*(z-exTf)/400)
			}
		}
		yield := 345.0
		if math.Abs(x) < exDw/2 && z > exTf-1e-9 && math.Abs(x) <= math.Sqrt(3)/4*exDb {
			yield = 940
		}
		if s > yield {
			ep[i] = (s - yield) / 2000
			s = yield + 0.05*(s-yield)
		}
		vm[i] = s
	}
	return []Field{
		{Caption: "von Mises stress at the peak load, Z = 410 kN", Name: "von Mises stress", Unit: "MPa",
			Nodes: m.nodes, Cells: m.cells, Values: vm, View: view},
		{Caption: "Equivalent plastic strain at the peak load, Z = 410 kN", Name: "plastic strain", Unit: Dimensionless,
			Nodes: m.nodes, Cells: m.cells, Values: ep, View: view},
	}
}

// exampleCompare sets the flat face beside the defined-contact variant.
func exampleCompare() Compare {
	bands := exampleReport()
	flat := exampleReport()
	flat.Title = "Tower joint T3 — flat contact face"
	flat.Model = "t3-flat.toml"
	z, u, fs, _, _ := exampleCurves(150, 425)
	flat.Curves = flat.Curves[:1]
	flat.Curves[0].Series[0].X, flat.Curves[0].Series[0].Y = z, fs
	flat.Fields = flat.Fields[:1]
	zb, ub, fsb, _, _ := exampleCurves(exOpen, exPeak)
	ratio := func(a, b float64) Cell { return Num(a/b, Dimensionless) }
	return Compare{
		Title:     "Tower joint T3 — flat face against defined contact bands",
		Generated: "flangeseg (test build), example input of the report tests",
		Caution:   exCaution,
		Comparison: Table{
			Caption: "Joint figures of the runs, with the ratio of run 2 to run 1",
			Columns: []Column{{Heading: "figure"}, {Heading: "run 1"}, {Heading: "run 2"}, {Heading: "run 2 / run 1", Unit: Dimensionless}},
			Rows: [][]Cell{
				{Text("stiffness, secant to the reference load"), Num(1210, "kN/mm"), Num(1615, "kN/mm"), ratio(1615, 1210)},
				{Text("load factor at Z = 0"), Num(0.052, Dimensionless), Num(0.05, Dimensionless), ratio(0.05, 0.052)},
				{Text("decompression load"), Num(205, "kN"), Num(268, "kN"), ratio(268, 205)},
				{Text("peak segment force"), Num(425, "kN"), Num(exPeak, "kN"), ratio(exPeak, 425)},
				{Text("displacement at the end"), Num(1.2, "mm"), Num(1.2, "mm"), ratio(1.2, 1.2)},
				{Text("governing mechanism"), Text("bolt + shell hinge"), Text("bolt + shell hinge"), Text("same")},
			},
			Source: "FE runs of this note",
		},
		Overlays: []post.Plot{
			{Title: "Bolt force against segment force, both runs", XLabel: "Z [kN]", YLabel: "F_s [kN]",
				Series: []post.Series{{Name: "run 1, flat", X: z, Y: fs}, {Name: "run 2, bands", X: zb, Y: fsb}}},
			{Title: "Segment force against displacement, both runs", XLabel: "u [mm]", YLabel: "Z [kN]",
				Series: []post.Series{{Name: "run 1, flat", X: u, Y: z}, {Name: "run 2, bands", X: ub, Y: zb}}},
		},
		Runs:  []Report{flat, bands},
		Notes: []string{"Example input of the report tests; not a result."},
	}
}
