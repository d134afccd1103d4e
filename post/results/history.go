package results

import (
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"strconv"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/post"
)

// HistoryTable lays out history.csv (column names of DESIGN.md).
func HistoryTable(res *segment.Result) (post.Table, error) {
	cols := []string{"increment", "stage", "Z_kN", "u_mm", "bolt_force_kN", "bolt_moment_interface_kNm",
		"bolt_moment_head_kNm", "bolt_stress_axial_MPa", "bolt_stress_bending_MPa", "gap_edge_mm"}
	for _, z := range res.Segment.Zones() {
		cols = append(cols, "contact_force_"+z.Name+"_kN")
	}
	cols = append(cols, "max_plastic_strain", "max_damage", "iterations")
	t := post.Table{Columns: cols}
	// Bending stress on the stress-area section: W = π·d_s³/32 with
	// d_s = √(4·A_s/π).
	as := res.Segment.Derived().StressArea
	ds := math.Sqrt(4 * as / math.Pi)
	w := math.Pi * ds * ds * ds / 32
	for _, r := range res.History {
		stage := 1.0
		if r.Stage == "preload" {
			stage = 0
		}
		row := []float64{float64(r.Increment), stage, r.Z / 1e3, r.U, r.Fs / 1e3, r.MomentInterface / 1e6,
			r.MomentHead / 1e6, r.Fs / as, math.Abs(r.MomentInterface) / w, r.GapEdge}
		for _, f := range r.ZoneForce {
			row = append(row, f/1e3)
		}
		row = append(row, r.MaxPlastic, r.MaxDamage, float64(r.Iterations))
		if err := t.Append(row...); err != nil {
			return t, err
		}
	}
	return t, nil
}

// ReadHistoryColumns reads the numeric columns of a run's history.csv.
func ReadHistoryColumns(path string) (map[string][]float64, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	records, err := csv.NewReader(f).ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if len(records) < 2 {
		return nil, fmt.Errorf("%s: no rows", path)
	}
	cols := map[string][]float64{}
	for _, r := range records[1:] {
		for c, name := range records[0] {
			if c >= len(r) {
				continue
			}
			if v, err := strconv.ParseFloat(r[c], 64); err == nil {
				cols[name] = append(cols[name], v)
			}
		}
	}
	for _, need := range []string{"Z_kN", "u_mm", "bolt_force_kN"} {
		if len(cols[need]) != len(records)-1 {
			return nil, fmt.Errorf("%s: column %s missing or incomplete", path, need)
		}
	}
	return cols, nil
}

// ReadHistory reads a run's history.csv back into rows (forces in N,
// moments in N·mm), as far as the note needs them.
func ReadHistory(path string, zones []segment.Zone) ([]figures.Row, error) {
	cols, err := ReadHistoryColumns(path)
	if err != nil {
		return nil, err
	}
	n := len(cols["Z_kN"])
	need := []string{"increment", "stage", "Z_kN", "u_mm", "bolt_force_kN", "bolt_moment_interface_kNm", "bolt_moment_head_kNm", "gap_edge_mm", "iterations"}
	for _, z := range zones {
		need = append(need, "contact_force_"+z.Name+"_kN")
	}
	for _, c := range need {
		if len(cols[c]) != n {
			return nil, fmt.Errorf("%s: column %s missing or incomplete", path, c)
		}
	}
	rows := make([]figures.Row, n)
	for i := range rows {
		r := &rows[i]
		r.Increment, r.Stage = int(cols["increment"][i]), "tension"
		if cols["stage"][i] == 0 {
			r.Stage = "preload"
		}
		r.Z, r.U, r.Fs = cols["Z_kN"][i]*1e3, cols["u_mm"][i], cols["bolt_force_kN"][i]*1e3
		r.MomentInterface, r.MomentHead = cols["bolt_moment_interface_kNm"][i]*1e6, cols["bolt_moment_head_kNm"][i]*1e6
		r.GapEdge, r.Iterations = cols["gap_edge_mm"][i], int(cols["iterations"][i])
		for _, z := range zones {
			r.ZoneForce = append(r.ZoneForce, cols["contact_force_"+z.Name+"_kN"][i]*1e3)
		}
	}
	return rows, nil
}

// Column is the quantity q of every row, in order.
func Column(rows []figures.Row, q func(figures.Row) float64) []float64 {
	out := make([]float64, len(rows))
	for i, r := range rows {
		out[i] = q(r)
	}
	return out
}
