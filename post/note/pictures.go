package note

import (
	"fmt"
	"math"
	"strings"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/mesh"
	"flangeseg/post"
	"flangeseg/post/report"
	"flangeseg/post/results"
)

// notePressure is results.PressurePlot without series that have no paired node.
func notePressure(res *segment.Result) []post.Plot {
	if len(res.States) == 0 {
		return nil
	}
	p := results.PressurePlot(res)
	kept := p.Series[:0:0]
	for _, s := range p.Series {
		if len(s.X) > 0 {
			kept = append(kept, s)
		}
	}
	if len(kept) == 0 {
		return nil
	}
	p.Series = kept
	return []post.Plot{p}
}

// isBoltPart reports whether a mesh region belongs to the bolt body:
// bolt, head, nut and washers.
func isBoltPart(name string) bool {
	return strings.HasPrefix(name, "bolt_") || name == "nut" || strings.HasSuffix(name, "_washer")
}

// noteFields are the pictures of von Mises stress and, with yielding
// materials, equivalent plastic strain at the last converged state. The
// bolt lies over the flange across the hole in the section, so flanges
// with shell and the bolt body are separate pictures.
func noteFields(res *segment.Result) ([]report.Field, error) {
	if len(res.States) == 0 {
		return nil, nil
	}
	st := res.States[len(res.States)-1]
	m := res.Segment.Mesh()
	point, _, err := post.SolutionFields(st.Solution)
	if err != nil {
		return nil, err
	}
	var vm []float64
	for _, f := range point {
		if f.Name == "von_mises" {
			vm = f.Values
		}
	}
	if len(vm) != len(m.Nodes) {
		return nil, fmt.Errorf("von Mises stress: %d values for %d nodes", len(vm), len(m.Nodes))
	}
	nodes := make([][2]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		nodes[i] = [2]float64{p.X, p.Z}
	}
	var body, bolt [][]int
	for _, e := range m.Elements {
		if isBoltPart(m.Regions[e.Region].Name) {
			bolt = append(bolt, e.Nodes)
		} else {
			body = append(body, e.Nodes)
		}
	}
	s := res.Segment.Spec()
	top := s.Flange.Thickness + s.Bolt.WasherThickness + math.Max(s.Bolt.HeadHeight, s.Bolt.NutHeight) + 20
	view := &report.Box{XMin: -s.Flange.A - 10, XMax: s.Flange.B + s.Shell.Thickness/2 + 10, ZMin: -top, ZMax: top}
	at := fmt.Sprintf("at the last converged state (%s, Z = %.4g kN), undeformed shape", st.Label, st.Row.Z/1e3)
	out := []report.Field{
		{Caption: "von Mises stress " + at + ": flanges and shell near the joint.", Name: "von Mises stress", Unit: "MPa",
			Nodes: nodes, Cells: body, Values: vm, View: view},
		{Caption: "von Mises stress " + at + ": bolt, head, nut and washers. The re-entrant corners where the shank meets head and nut carry local peaks of the strip model.", Name: "von Mises stress", Unit: "MPa",
			Nodes: nodes, Cells: bolt, Values: vm},
	}
	if ep := nodalPlastic(m, st.Plastic); ep != nil {
		cap := "Equivalent plastic strain " + at + " (cell means of the integration points, averaged to the nodes)"
		out = append(out,
			report.Field{Caption: cap + ": flanges and shell near the joint.", Name: "equivalent plastic strain", Unit: report.Dimensionless,
				Nodes: nodes, Cells: body, Values: ep, View: view},
			report.Field{Caption: cap + ": bolt, head, nut and washers.", Name: "equivalent plastic strain", Unit: report.Dimensionless,
				Nodes: nodes, Cells: bolt, Values: ep})
	}
	return out, nil
}

// nodalPlastic averages each element's mean equivalent plastic strain
// over the elements that share a node; nil when no element keeps a
// plastic strain (elastic laws).
func nodalPlastic(m *mesh.Mesh, plastic [][]float64) []float64 {
	some := false
	for _, p := range plastic {
		some = some || len(p) > 0
	}
	if !some || len(plastic) != len(m.Elements) {
		return nil
	}
	sum := make([]float64, len(m.Nodes))
	count := make([]int, len(m.Nodes))
	for e, el := range m.Elements {
		mean := 0.0
		for _, v := range plastic[e] {
			mean += v / float64(len(plastic[e]))
		}
		for _, n := range el.Nodes {
			sum[n] += mean
			count[n]++
		}
	}
	for n := range sum {
		if count[n] > 0 {
			sum[n] /= float64(count[n])
		}
	}
	return sum
}

// jointParts groups the mesh regions into the parts the drawing names, in
// drawing order: the bolt after the flange it passes through.
func jointParts() []struct{ name, regions string } {
	return []struct{ name, regions string }{
		{"flange", "upper_flange lower_flange"},
		{"flange, hole band", "upper_flange_hole lower_flange_hole"},
		{"shell", "upper_shell lower_shell"},
		{"bolt", "bolt_shank bolt_thread bolt_preload"},
		{"head and washer", "bolt_head head_washer"},
		{"nut and washer", "nut nut_washer"},
	}
}

// jointDrawing draws the section from the mesh outline, cut off a little
// beyond head and nut, with the main dimensions.
func jointDrawing(s *modelfile.Spec, m *mesh.Mesh) (*report.JointDrawing, error) {
	parts := jointParts()
	group := map[string]int{}
	names := make([]string, len(parts))
	for i, p := range parts {
		names[i] = p.name
		for _, r := range strings.Fields(p.regions) {
			group[r] = i
		}
	}
	nodes := make([][2]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		nodes[i] = [2]float64{p.X, p.Z}
	}
	cells := make([][]int, 0, len(m.Elements))
	var cellPart []int
	for _, e := range m.Elements {
		i, ok := group[m.Regions[e.Region].Name]
		if !ok {
			return nil, fmt.Errorf("report: joint drawing: mesh region %q belongs to no part", m.Regions[e.Region].Name)
		}
		cells = append(cells, e.Nodes)
		cellPart = append(cellPart, i)
	}
	regions, err := report.Outlines(nodes, cells, cellPart, names)
	if err != nil {
		return nil, err
	}
	tf, a, b, t := s.Flange.Thickness, s.Flange.A, s.Flange.B, s.Shell.Thickness
	dh, dw, tw := s.Bolt.Hole, s.Bolt.WasherOuter, s.Bolt.WasherThickness // t_w: washer thickness
	head := regionBox(m, "bolt_head")
	nut := regionBox(m, "nut")
	headTop, nutBottom := tf+tw+s.Bolt.HeadHeight, -tf-tw-s.Bolt.NutHeight
	if head != nil {
		headTop = head.ZMax
	}
	if nut != nil {
		nutBottom = nut.ZMin
	}
	top := math.Max(headTop, -nutBottom) + 50
	shellZ := tf + 0.35*(top-tf)
	mmText := func(sym string, v float64) string {
		return sym + " = " + modelfile.FormatNumber(math.Round(v*10)/10) + " mm"
	}
	below := nutBottom + tf - 18 // offset of the a and b lines from the lower flange's bottom face
	return &report.JointDrawing{
		Caption: fmt.Sprintf("Modelled section of one bolt segment, drawn from the mesh outline and cut off at z = ±%s mm; the shell stubs run on to z = ±%s mm. Dimensions in mm.",
			modelfile.FormatNumber(math.Round(top)), modelfile.FormatNumber(tf+s.Shell.Length)),
		Regions:  regions,
		BoltAxis: true,
		View:     &report.Box{XMin: -a - 45, XMax: b + t/2 + 45, ZMin: -top, ZMax: top},
		Dimensions: []report.Dimension{
			{From: [2]float64{-a, 0}, To: [2]float64{-a, tf}, Label: mmText("t_f", tf), Offset: 16},
			{From: [2]float64{-a, -tf}, To: [2]float64{0, -tf}, Label: mmText("a", a), Offset: below},
			{From: [2]float64{0, -tf}, To: [2]float64{b, -tf}, Label: mmText("b", b), Offset: below},
			{From: [2]float64{b + t/2, shellZ}, To: [2]float64{b - t/2, shellZ}, Label: mmText("t", t), Offset: -10},
			{From: [2]float64{-dh / 2, -tf / 2}, To: [2]float64{dh / 2, -tf / 2}, Label: mmText("d_h", dh), Offset: 0},
			{From: [2]float64{-dw / 2, headTop}, To: [2]float64{dw / 2, headTop}, Label: mmText("d_w", dw), Offset: 12},
		},
	}, nil
}

// regionBox is the box around a mesh region's nodes; nil if the mesh has
// no such region.
func regionBox(m *mesh.Mesh, name string) *report.Box {
	r, ok := m.RegionIndex(name)
	if !ok {
		return nil
	}
	b := report.Box{XMin: math.Inf(1), XMax: math.Inf(-1), ZMin: math.Inf(1), ZMax: math.Inf(-1)}
	for _, e := range m.Elements {
		if e.Region != r {
			continue
		}
		for _, n := range e.Nodes {
			p := m.Nodes[n]
			b.XMin, b.XMax = math.Min(b.XMin, p.X), math.Max(b.XMax, p.X)
			b.ZMin, b.ZMax = math.Min(b.ZMin, p.Z), math.Max(b.ZMax, p.Z)
		}
	}
	if math.IsInf(b.XMin, 0) {
		return nil
	}
	return &b
}
