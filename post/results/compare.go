package results

import (
	"encoding/csv"
	"io"
	"os"
	"path/filepath"
	"strconv"

	"flangeseg/fem/segment/figures"
	"flangeseg/post"
)

// ComparedFigure is a joint figure that a comparison of runs sets side by
// side: in the printed table, in comparison.csv and in the comparison
// note, each in this order.
type ComparedFigure struct {
	Name   string // as the note names it
	Label  string // as the printed table names it, with its unit
	Column string // its summary.json key, also comparison.csv's column
	Unit   string // of the value ("1" for a ratio)
	// Get is the run's value, false when the run did not reach it.
	Get func(s Summary) (float64, bool)
}

// Ratio is the run's value over the base run's, false where either was
// not reached or the base is zero.
func (f ComparedFigure) Ratio(s, base Summary) (float64, bool) {
	v, ok := f.Get(s)
	b, okBase := f.Get(base)
	if !ok || !okBase || b == 0 {
		return 0, false
	}
	return v / b, true
}

// ComparedFigures are the joint figures of a comparison.
func ComparedFigures() []ComparedFigure {
	val := func(f func(j figures.Joint) float64) func(s Summary) (float64, bool) {
		return func(s Summary) (float64, bool) { return f(s.Joint), true }
	}
	opt := func(f func(j figures.Joint) *float64) func(s Summary) (float64, bool) {
		return func(s Summary) (float64, bool) {
			if p := f(s.Joint); p != nil {
				return *p, true
			}
			return 0, false
		}
	}
	const one = "1"
	return []ComparedFigure{
		{"stiffness, tangent at Z = 0", "stiffness at Z = 0 [kN/mm]", "stiffness_tangent_at_zero_kN_per_mm", "kN/mm", val(func(j figures.Joint) float64 { return j.StiffnessTangentZero })},
		{"stiffness, secant to the reference load", "secant stiffness to reference [kN/mm]", "stiffness_secant_to_reference_kN_per_mm", "kN/mm", opt(func(j figures.Joint) *float64 { return j.StiffnessToReference })},
		{"joint alone, secant to the reference load", "joint alone, secant to reference [kN/mm]", "joint_stiffness_secant_to_reference_kN_per_mm", "kN/mm", opt(func(j figures.Joint) *float64 { return j.JointStiffnessReference })},
		{"load factor at Z = 0", "load factor at Z = 0 [-]", "load_factor_tangent_at_zero", one, val(func(j figures.Joint) float64 { return j.LoadFactorTangentZero })},
		{"load factor, secant to the reference load", "load factor, secant to reference [-]", "load_factor_secant_to_reference", one, opt(func(j figures.Joint) *float64 { return j.LoadFactorToReference })},
		{"opening load", "opening load [kN]", "opening_load_kN", "kN", opt(func(j figures.Joint) *float64 { return j.OpeningLoadKN })},
		{"decompression load", "decompression load [kN]", "decompression_load_kN", "kN", opt(func(j figures.Joint) *float64 { return j.DecompressionKN })},
		{"largest segment force", "peak segment force [kN]", "peak_load_kN", "kN", val(func(j figures.Joint) float64 { return j.PeakLoadKN })},
		{"displacement at the end", "displacement at the end [mm]", "displacement_at_end_mm", "mm", val(func(j figures.Joint) float64 { return j.DisplacementEndMM })},
	}
}

// WriteComparison writes into dir the compared figures of several runs as
// comparison.csv (one row per run, each figure with its ratio to the
// first run's) and the overlaid curves compare_Fs_Z and compare_Z_u (SVG
// and PNG), read from each run's history.csv. names, paths (the model
// files as the user named them), runDirs and sums are in the same order.
func WriteComparison(dir string, names, paths, runDirs []string, sums []Summary) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	figs := ComparedFigures()
	err := post.WriteFileAtomic(filepath.Join(dir, "comparison.csv"), func(w io.Writer) error {
		cw := csv.NewWriter(w)
		head := []string{"model", "file"}
		for _, f := range figs {
			head = append(head, f.Column, "ratio_"+f.Column)
		}
		head = append(head, "failure_mechanism")
		if err := cw.Write(head); err != nil {
			return err
		}
		for i, s := range sums {
			row := []string{names[i], paths[i]}
			for _, f := range figs {
				// A figure the run did not reach is an empty cell, not 0
				// (an opening load of 0 is a face open after the preload).
				value, ratio := "", ""
				if v, ok := f.Get(s); ok {
					value = strconv.FormatFloat(v, 'g', 10, 64)
				}
				if r, ok := f.Ratio(s, sums[0]); ok {
					ratio = strconv.FormatFloat(r, 'g', 6, 64)
				}
				row = append(row, value, ratio)
			}
			row = append(row, s.Joint.FailureLocation)
			if err := cw.Write(row); err != nil {
				return err
			}
		}
		cw.Flush()
		return cw.Error()
	})
	if err != nil {
		return err
	}
	fsz := post.Plot{Title: "Bolt force against segment force", XLabel: "Z [kN]", YLabel: "F_s [kN]"}
	zu := post.Plot{Title: "Segment force against displacement", XLabel: "u [mm]", YLabel: "Z [kN]"}
	for i, d := range runDirs {
		h, err := ReadHistoryColumns(filepath.Join(d, "history.csv"))
		if err != nil {
			return err
		}
		fsz.Series = append(fsz.Series, post.Series{Name: names[i], X: h["Z_kN"], Y: h["bolt_force_kN"]})
		zu.Series = append(zu.Series, post.Series{Name: names[i], X: h["u_mm"], Y: h["Z_kN"]})
	}
	if err := post.WritePlot(filepath.Join(dir, "compare_Fs_Z"), fsz); err != nil {
		return err
	}
	return post.WritePlot(filepath.Join(dir, "compare_Z_u"), zu)
}
