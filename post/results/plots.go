package results

import (
	"fmt"
	"math"
	"path/filepath"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/post"
	"flangeseg/post/handcalc"
)

// curveFiles name the files of the curves of Curves, in its order.
func curveFiles() []string { return []string{"Z_u", "Fs_Z", "Ms_Z", "gap_Z", "contact_force_Z"} }

func writePlots(dir string, r *segment.Result) error {
	curves := Curves(r.Segment, r.History, r.Figures)
	if curves == nil {
		return nil
	}
	for i, name := range curveFiles() {
		if err := post.WritePlot(filepath.Join(dir, name), curves[i]); err != nil {
			return err
		}
	}
	return post.WritePlot(filepath.Join(dir, "contact_pressure"), PressurePlot(r))
}

// peakMarker marks the largest segment force of the run.
func peakMarker(rows []figures.Row) []post.Marker {
	best := 0
	for i, r := range rows {
		if r.Z > rows[best].Z {
			best = i
		}
	}
	r := rows[best]
	return []post.Marker{{Name: fmt.Sprintf("peak %.0f kN", r.Z/1e3), X: r.U, Y: r.Z / 1e3}}
}

// PressurePlot draws the face pressure at preload and at three load
// levels (a quarter, half and all of the way).
func PressurePlot(r *segment.Result) post.Plot {
	p := post.Plot{Title: "Contact pressure along the flange face", XLabel: "x [mm]", YLabel: "p [MPa]"}
	n := len(r.States)
	picks := []int{0}
	for _, f := range []float64{0.25, 0.5, 1} {
		i := int(math.Round(f * float64(n-1)))
		if i > picks[len(picks)-1] {
			picks = append(picks, i)
		}
	}
	for _, i := range picks {
		st := r.States[i]
		var x, pr []float64
		for _, r := range st.Contacts["faces"] {
			if r.Paired {
				x, pr = append(x, r.X), append(pr, r.Pressure)
			}
		}
		p.Series = append(p.Series, post.Series{Name: fmt.Sprintf("%s, Z = %.0f kN", st.Label, st.Row.Z/1e3), X: x, Y: pr})
	}
	return p
}

// Curves are the load–response curves (the files of the run directory and
// the report's figures), with the peak marked on Z–u and the opening load
// on the bolt-force function.
func Curves(g *segment.Segment, rows []figures.Row, j figures.Joint) []post.Plot {
	if len(rows) < 2 {
		return nil
	}
	z := Column(rows, func(r figures.Row) float64 { return r.Z / 1e3 })
	u := Column(rows, func(r figures.Row) float64 { return r.U })
	fs := Column(rows, func(r figures.Row) float64 { return r.Fs / 1e3 })
	zh, diagram, tri := handCurves(g.Hand(), math.Max(rows[len(rows)-1].Z, 0))
	bolt := post.Plot{Title: "Bolt force function, FE and hand bolt-force models", XLabel: "Z [kN]", YLabel: "F_s [kN]",
		Series: []post.Series{{Name: "FE", X: z, Y: fs},
			{Name: "joint diagram (VDI 2230)", X: zh, Y: diagram, Dashed: true},
			{Name: "trilinear (Schmidt/Neuper)", X: zh, Y: tri, Dashed: true}}}
	if o := j.OpeningLoadKN; o != nil && *o > 0 {
		if f, ok := figures.At(rows, *o*1e3, func(r figures.Row) float64 { return r.Fs / 1e3 }); ok {
			bolt.Markers = append(bolt.Markers, post.Marker{Name: "opening", X: *o, Y: f})
		}
	}
	zones := post.Plot{Title: "Contact force per zone", XLabel: "Z [kN]", YLabel: "contact force [kN]"}
	for i, zr := range g.Zones() {
		zones.Series = append(zones.Series, post.Series{Name: zr.Name,
			X: z, Y: Column(rows, func(r figures.Row) float64 { return r.ZoneForce[i] / 1e3 })})
	}
	return []post.Plot{
		{Title: "Segment force against loaded-edge displacement", XLabel: "u [mm]", YLabel: "Z [kN]",
			Series: []post.Series{{Name: "FE", X: u, Y: z}}, Markers: peakMarker(rows)},
		bolt,
		{Title: "Bolt bending moment", XLabel: "Z [kN]", YLabel: "M_s [kN·m]",
			Series: []post.Series{
				{Name: "at the contact plane", X: z, Y: Column(rows, func(r figures.Row) float64 { return r.MomentInterface / 1e6 })},
				{Name: "under the head", X: z, Y: Column(rows, func(r figures.Row) float64 { return r.MomentHead / 1e6 }), Dashed: true}}},
		{Title: "Opening at the shell-side corner", XLabel: "Z [kN]", YLabel: "gap [mm]",
			Series: []post.Series{{Name: "x = b + t/2", X: z, Y: Column(rows, func(r figures.Row) float64 { return r.GapEdge })}}},
		zones,
	}
}

// handCurves samples the hand bolt-force models over [0, zmax] (N).
func handCurves(h handcalc.Results, zmax float64) (z, diagram, trilinear []float64) {
	const n = 60
	for i := 0; i <= n; i++ {
		x := zmax * float64(i) / n
		z = append(z, x/1e3)
		diagram = append(diagram, h.JointDiagram.Force(x)/1e3)
		trilinear = append(trilinear, h.Trilinear.Force(x)/1e3)
	}
	return z, diagram, trilinear
}
