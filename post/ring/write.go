package ring

import (
	"encoding/csv"
	"fmt"
	"io"
	"path/filepath"
	"strconv"

	"flangeseg/post"
)

// Files the ring check writes into its directory.
const (
	FileCSV       = "ring.csv"
	FileJSON      = "ring.json"
	FileSpectrum  = "ring_spectrum.csv"
	FileFunctions = "ring_functions.csv"
	FilePlan      = "ring_plan.toml"
	FilePage      = "report.html"
)

// num writes a number as the CSV files do: 10 significant digits.
func num(x float64) string { return strconv.FormatFloat(post.Round10(x), 'g', -1, 64) }

func optNum(x *float64) string {
	if x == nil {
		return ""
	}
	return num(*x)
}

// csvColumns are ring.csv's columns, one row a bolt.
var csvColumns = []string{
	"bolt", "angle_deg", "gap_inner_mm", "gap_outer_mm", "parallel_gap_mm", "taper_deg",
	"gap_run_bolts", "gap_span_mm", "gap_spring_kN_per_mm", "class", "status",
	"preload_kN", "clamp_force_after_preload_kN", "preload_spent_on_closing_kN", "preload_spent_share",
	"gap_left_after_preload_mm", "opening_load_kN", "decompression_load_kN",
	"Z_min_kN", "Z_max_kN", "cycles", "damage_FE", "equivalent_range_FE_MPa", "max_range_FE_MPa",
	"damage_trilinear", "damage_joint_diagram", "damage_over_1", "preload_loss_over_limit",
}

func yes(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// WriteCSV writes ring.csv.
func (res *Result) WriteCSV(path string) error {
	return post.WriteFileAtomic(path, func(w io.Writer) error {
		cw := csv.NewWriter(w)
		if err := cw.Write(csvColumns); err != nil {
			return err
		}
		for _, b := range res.Bolts {
			row := []string{strconv.Itoa(b.Number), num(b.Angle), num(b.Inner), num(b.Outer), num(b.Parallel), num(b.Taper),
				strconv.Itoa(b.Run), num(b.Span), num(b.Spring / 1e3), b.Class, b.Status,
				num(b.PreloadKN), num(b.ClampKN), num(b.ClosingKN), num(b.ClosingShare),
				num(b.GapLeftMM), optNum(b.OpeningKN), optNum(b.Decompression)}
			if f := b.Fatigue; f != nil {
				row = append(row, num(f.ZMinKN), num(f.ZMaxKN), num(f.Cycles), num(f.DamageFE), num(f.EquivalentRangeMPa),
					num(f.MaxRangeMPa), num(f.DamageTrilinear), num(f.DamageJointDiagram), yes(f.DamageFE > 1))
			} else {
				row = append(row, "", "", "", "", "", "", "", "", "")
			}
			row = append(row, yes(b.ClosingShare > res.Fatigue.LossLimit))
			if err := cw.Write(row); err != nil {
				return err
			}
		}
		cw.Flush()
		return cw.Error()
	})
}

// WriteSpectrum writes ring_spectrum.csv: every bolt's FE stress range
// bins that hold cycles.
func (res *Result) WriteSpectrum(path string) error {
	t := post.Table{Columns: []string{"bolt", "range_from_MPa", "range_to_MPa", "cycles", "damage"}}
	for _, b := range res.Bolts {
		for _, bin := range b.Spectrum {
			if bin.Cycles == 0 {
				continue
			}
			t.Rows = append(t.Rows, []float64{float64(b.Number), bin.From, bin.To, bin.Cycles, bin.Damage})
		}
	}
	return post.WriteCSV(path, t)
}

// WriteFunctions writes ring_functions.csv: each class's FE bolt-force
// function (the bolts of a class share it).
func (res *Result) WriteFunctions(path string) error {
	return post.WriteFileAtomic(path, func(w io.Writer) error {
		cw := csv.NewWriter(w)
		if err := cw.Write([]string{"class", "Z_kN", "bolt_force_kN"}); err != nil {
			return err
		}
		done := map[string]bool{}
		for _, b := range res.Bolts {
			if done[b.Class] {
				continue
			}
			done[b.Class] = true
			for i := range b.FunctionZ {
				if err := cw.Write([]string{b.Class, num(b.FunctionZ[i]), num(b.FunctionFs[i])}); err != nil {
					return err
				}
			}
		}
		cw.Flush()
		return cw.Error()
	})
}

// ringJSON is ring.json.
type ringJSON struct {
	Title      string      `json:"title"`
	Model      string      `json:"model"`
	Caution    string      `json:"caution"`
	Version    string      `json:"flangeseg"`
	Bolts      int         `json:"bolts"`
	Classes    []classJSON `json:"classes"`
	Loads      *LoadInfo   `json:"loads,omitempty"`
	Curve      string      `json:"sn_curve,omitempty"`
	GammaMf    float64     `json:"gamma_Mf,omitempty"`
	LossLimit  float64     `json:"preload_loss_limit_share"`
	Governing  int         `json:"governing_bolt"`
	Basis      string      `json:"governing_by"`
	OverDamage []int       `json:"bolts_damage_over_1"`
	OverLoss   []int       `json:"bolts_preload_loss_over_limit"`
	Warnings   []string    `json:"warnings,omitempty"`
	PerBolt    []boltJSON  `json:"per_bolt"`
}

type classJSON struct {
	Name       string  `json:"name"`
	Taper      float64 `json:"taper_deg"`
	Parallel   float64 `json:"parallel_gap_mm"`
	Spring     float64 `json:"gap_spring_kN_per_mm"`
	Bolts      string  `json:"bolts"`
	Status     string  `json:"status"`
	Reason     string  `json:"reason,omitempty"`
	Ending     string  `json:"ending,omitempty"`
	TimeS      float64 `json:"-"`
	BoltsCount int     `json:"count"`
}

type boltJSON struct {
	Bolt          int          `json:"bolt"`
	Angle         float64      `json:"angle_deg"`
	Inner         float64      `json:"gap_inner_mm"`
	Outer         float64      `json:"gap_outer_mm"`
	Parallel      float64      `json:"parallel_gap_mm"`
	Taper         float64      `json:"taper_deg"`
	Run           int          `json:"gap_run_bolts"`
	Span          float64      `json:"gap_span_mm"`
	Spring        float64      `json:"gap_spring_kN_per_mm"`
	Class         string       `json:"class"`
	Status        string       `json:"status"`
	Preload       float64      `json:"preload_kN"`
	Clamp         float64      `json:"clamp_force_after_preload_kN"`
	Closing       float64      `json:"preload_spent_on_closing_kN"`
	Share         float64      `json:"preload_spent_share"`
	GapLeft       float64      `json:"gap_left_after_preload_mm"`
	Opening       *float64     `json:"opening_load_kN"`
	Decompression *float64     `json:"decompression_load_kN"`
	Fatigue       *fatigueJSON `json:"fatigue,omitempty"`
}

type fatigueJSON struct {
	ZMin       float64 `json:"Z_min_kN"`
	ZMax       float64 `json:"Z_max_kN"`
	Cycles     float64 `json:"cycles"`
	Stress     string  `json:"stress"`
	DamageFE   float64 `json:"damage_FE"`
	Equivalent float64 `json:"equivalent_range_FE_MPa"`
	MaxRange   float64 `json:"max_range_FE_MPa"`
	Trilinear  float64 `json:"damage_trilinear"`
	Diagram    float64 `json:"damage_joint_diagram"`
}

func r10p(x *float64) *float64 {
	if x == nil {
		return nil
	}
	v := post.Round10(*x)
	return &v
}

// WriteJSON writes ring.json.
func (res *Result) WriteJSON(path string) error {
	p := res.Plan
	out := ringJSON{Title: p.Spec.Title, Model: filepath.Base(p.Model), Caution: post.Caution, Version: post.Version,
		Bolts: len(res.Bolts), Loads: res.Loads, Curve: res.Curve, LossLimit: res.Fatigue.LossLimit, Governing: res.Governing,
		Basis: "largest preload share spent on closing (no loads given)", OverDamage: nonNil(res.OverDamage), OverLoss: nonNil(res.OverLoss),
		Warnings: res.Warnings}
	if res.Loads != nil {
		out.GammaMf, out.Basis = res.GammaMf, "largest FE fatigue damage"
	}
	for i, c := range p.Classes {
		r := res.Records[i]
		out.Classes = append(out.Classes, classJSON{Name: c.Name, Taper: c.Taper, Parallel: c.Parallel, Spring: post.Round10(c.Spring / 1e3),
			Bolts: boltList(c.Bolts), BoltsCount: len(c.Bolts), Status: r.Status, Reason: r.Reason, Ending: r.Ending})
	}
	for _, b := range res.Bolts {
		bj := boltJSON{Bolt: b.Number, Angle: post.Round10(b.Angle), Inner: post.Round10(b.Inner), Outer: post.Round10(b.Outer),
			Parallel: b.Parallel, Taper: b.Taper, Run: b.Run, Span: post.Round10(b.Span), Spring: post.Round10(b.Spring / 1e3),
			Class: b.Class, Status: b.Status, Preload: post.Round10(b.PreloadKN), Clamp: post.Round10(b.ClampKN),
			Closing: post.Round10(b.ClosingKN), Share: post.Round10(b.ClosingShare), GapLeft: post.Round10(b.GapLeftMM),
			Opening: r10p(b.OpeningKN), Decompression: r10p(b.Decompression)}
		if f := b.Fatigue; f != nil {
			bj.Fatigue = &fatigueJSON{ZMin: post.Round10(f.ZMinKN), ZMax: post.Round10(f.ZMaxKN), Cycles: post.Round10(f.Cycles),
				Stress: f.Stress, DamageFE: post.Round10(f.DamageFE), Equivalent: post.Round10(f.EquivalentRangeMPa),
				MaxRange: post.Round10(f.MaxRangeMPa), Trilinear: post.Round10(f.DamageTrilinear), Diagram: post.Round10(f.DamageJointDiagram)}
		}
		out.PerBolt = append(out.PerBolt, bj)
	}
	return post.WriteJSON(path, out)
}

func nonNil(x []int) []int {
	if x == nil {
		return []int{}
	}
	return x
}

// Write writes the ring's tables, plots and page into dir.
func (res *Result) Write(dir string) error {
	for _, w := range []struct {
		name  string
		write func(string) error
	}{
		{FileCSV, res.WriteCSV}, {FileJSON, res.WriteJSON}, {FileSpectrum, res.WriteSpectrum},
		{FileFunctions, res.WriteFunctions}, {"plots", res.WritePlots}, {FilePage, res.WritePage},
	} {
		if err := w.write(filepath.Join(dir, w.name)); err != nil {
			return fmt.Errorf("ring: %s: %w", w.name, err)
		}
	}
	return nil
}
