package assess

import (
	"os"
	"path/filepath"

	"flangeseg/post"
	"flangeseg/post/fatigue"
)

// Summary is fatigue_summary.json.
type Summary struct {
	Title            string      `json:"title"`
	Model            string      `json:"model"`
	Caution          string      `json:"caution"`
	Loads            LoadSummary `json:"loads"`
	Curve            string      `json:"sn_curve"`
	CutOffMPa        float64     `json:"cut_off_MPa"`
	GammaMf          float64     `json:"gamma_Mf"`
	StressAreaMM2    float64     `json:"stress_area_mm2"`
	SectionModulus   float64     `json:"section_modulus_mm3"`
	ReferenceCycles  float64     `json:"reference_cycles"`
	ReferenceSlope   float64     `json:"reference_slope"`
	RunDirectory     string      `json:"run_directory,omitempty"`
	Governing        string      `json:"governing"`
	BoltForceResults []Outcome   `json:"results"`
}

// LoadSummary describes the load file of an assessment.
type LoadSummary struct {
	File      string  `json:"file"`
	Layout    string  `json:"layout"`
	Rows      int     `json:"rows"`
	Cycles    float64 `json:"cycles"`
	ZMinKN    float64 `json:"Z_min_kN"`
	ZMaxKN    float64 `json:"Z_max_kN"`
	MaxStack  int     `json:"rainflow_stack_max,omitempty"`
	Rainflow  string  `json:"rainflow,omitempty"`
	Transform string  `json:"tower_to_segment,omitempty"`
}

// Outcome is one bolt-force function's result.
type Outcome struct {
	Function           string  `json:"function"`
	Stress             string  `json:"stress"`
	Damage             float64 `json:"damage"`
	EquivalentRangeMPa float64 `json:"equivalent_range_MPa"`
	MaxRangeMPa        float64 `json:"max_range_MPa"`
}

// Summary is what fatigue_summary.json holds.
func (j *Job) Summary() Summary {
	r := post.Round10
	in := j.info
	s := Summary{
		Title: j.spec.Title, Model: filepath.Base(j.path), Caution: post.Caution,
		Loads: LoadSummary{File: filepath.Base(j.opt.Loads), Layout: in.Kind.String(), Rows: in.Rows, Cycles: r(in.Cycles),
			ZMinKN: r(in.ZMin / 1e3), ZMaxKN: r(in.ZMax / 1e3), MaxStack: in.MaxStack},
		Curve: j.miner.Curve().Name(), CutOffMPa: r(j.miner.Curve().CutOff()), GammaMf: j.opt.GammaMf,
		StressAreaMM2: r(j.der.StressArea), SectionModulus: r(fatigue.SectionModulus(j.der.StressArea)),
		ReferenceCycles: j.opt.RefCycles, ReferenceSlope: j.opt.RefSlope, RunDirectory: j.opt.From,
		Governing: j.fns[0].label,
	}
	if in.Kind.Series() {
		s.Loads.Rainflow = "ASTM E1049-85 5.4.4, residue counted as half cycles"
	}
	if in.Kind == fatigue.TowerSeries || in.Kind == fatigue.TowerTable {
		s.Loads.Transform = "Z = 4M/(n·D) − N/n; M positive puts the segment in tension, N positive in compression"
	}
	for _, b := range j.fns {
		s.BoltForceResults = append(s.BoltForceResults, Outcome{Function: b.label, Stress: b.tr.Basis().String(),
			Damage: r(b.damage), EquivalentRangeMPa: r(b.eq.Range()), MaxRangeMPa: r(b.maxRange)})
	}
	return s
}

// Write writes into dir the CSV files, the summary and the plots.
func (j *Job) Write(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	bins := j.Bins()
	cols := []string{"range_from_MPa", "range_to_MPa"}
	for _, b := range j.fns {
		cols = append(cols, "cycles_"+b.slug, "damage_"+b.slug)
	}
	t := post.Table{Columns: cols}
	for k := range bins[0] {
		row := []float64{bins[0][k].From, bins[0][k].To}
		for i := range j.fns {
			row = append(row, bins[i][k].Cycles, bins[i][k].Damage)
		}
		if err := t.Append(row...); err != nil {
			return err
		}
	}
	if err := post.WriteCSV(filepath.Join(dir, "fatigue_bins.csv"), t); err != nil {
		return err
	}
	if err := j.writeBlocks(filepath.Join(dir, "fatigue_blocks.csv")); err != nil {
		return err
	}
	if err := post.WriteJSON(filepath.Join(dir, "fatigue_summary.json"), j.Summary()); err != nil {
		return err
	}
	return j.writePlots(dir, bins)
}

// writeBlocks writes a table's rows with what each function makes of them.
func (j *Job) writeBlocks(path string) error {
	if len(j.blocks) == 0 {
		return nil
	}
	cols := []string{"row", "Z_min_kN", "Z_max_kN", "cycles"}
	for _, b := range j.fns {
		cols = append(cols, "stress_range_"+b.slug+"_MPa", "endurance_"+b.slug, "damage_"+b.slug)
	}
	t := post.Table{Columns: cols}
	for i, c := range j.blocks {
		row := []float64{float64(i + 1), c.Min() / 1e3, c.Max() / 1e3, c.Count}
		for _, b := range j.fns {
			ds, err := b.tr.Range(c)
			if err != nil {
				return err
			}
			row = append(row, ds, j.miner.Endurance(ds), j.miner.Damage(ds, c.Count))
		}
		if err := t.Append(row...); err != nil {
			return err
		}
	}
	return post.WriteCSV(path, t)
}
