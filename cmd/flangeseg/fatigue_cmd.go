package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"flag"
	"fmt"
	"image/color"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
	"flangeseg/post/fatigue"
	"flangeseg/post/handcalc"
)

// The words the fatigue flags take.
const (
	curveEN1993Bolt   = "en1993-bolt"
	stressAxial       = "axial"
	stressAxialBend   = "axial+bending"
	fatigueFineBin    = 0.1 // MPa: the bins cycles are tallied in; display bins merge them
	fatigueDisplayMax = 25  // display bins at most, when --bin-width is left to the tool
)

// fatigueFlags are the options of `flangeseg fatigue`.
type fatigueFlags struct {
	loads, from, out string
	curve            string // curveEN1993Bolt or the path of an S–N curve CSV
	stress           string // stressAxialBend or stressAxial
	gammaMf          float64
	refCycles        float64
	refSlope         float64
	binWidth         float64 // MPa; 0 lets the tool choose
}

func runFatigue(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("fatigue", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var f fatigueFlags
	fs.StringVar(&f.loads, "loads", "", "the load `FILE` (CSV; layouts below)")
	fs.StringVar(&f.from, "from", "", "take the FE bolt-force function from `RUN_DIR`/history.csv of 'flangeseg run' on the same model")
	fs.StringVar(&f.out, "o", "", "write the results into `DIR` (default: the model file's name without .toml, plus _fatigue)")
	fs.StringVar(&f.curve, "sn-curve", curveEN1993Bolt, "S–N curve: "+curveEN1993Bolt+" or a CSV `FILE` of points cycles,stress_range_MPa")
	fs.StringVar(&f.stress, "stress", stressAxialBend, "FE bolt stress: "+stressAxialBend+" or "+stressAxial)
	fs.Float64Var(&f.gammaMf, "gamma-mf", 0, "partial factor γ_Mf on the fatigue strength (EN 1993-1-9 Table 3.1: 1.00 to 1.35); overrides [fatigue] gamma_mf of the model (default 1.15)")
	fs.Float64Var(&f.refCycles, "reference-cycles", 2e6, "reference number of cycles `N_ref` of the damage-equivalent stress range")
	fs.Float64Var(&f.refSlope, "reference-slope", 3, "slope `m` of the damage-equivalent stress range")
	fs.Float64Var(&f.binWidth, "bin-width", 0, "width of the stress-range bins in the outputs, `MPa` (a multiple of 0.1; 0: chosen for at most 25 bins)")
	fs.Usage = func() { fatigueUsage(stderr, fs) }
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg fatigue: give exactly one model file (flangeseg fatigue MODEL.toml --loads FILE [--from RUN_DIR] -o DIR)")
		return exitBadInput
	}
	if err := f.check(); err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	path := fs.Arg(0)
	if f.out == "" {
		f.out = strings.TrimSuffix(filepath.Base(path), ".toml") + "_fatigue"
	}
	spec, err := modelfile.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	if f.gammaMf == 0 {
		f.gammaMf = spec.Fatigue.GammaMf
	}
	job, err := newFatigueJob(spec, path, f)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: %v\n", err)
		return exitBadInput
	}
	for _, w := range job.warnings {
		fmt.Fprintf(stderr, "flangeseg fatigue: warning: %s\n", w)
	}
	if err := job.count(); err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: --loads %s: %v\n", f.loads, err)
		return exitBadInput
	}
	if err := job.write(); err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: writing results: %v\n", err)
		return exitAnalysis
	}
	job.print(stdout)
	if job.fns[0].damage > 1 {
		return exitFailed
	}
	return exitOK
}

func fatigueUsage(w io.Writer, fs *flag.FlagSet) {
	fmt.Fprintf(w, `Usage: flangeseg fatigue MODEL.toml --loads FILE [--from RUN_DIR] [-o DIR] [flags]

Bolt fatigue of the joint in MODEL.toml under the loads in FILE. Every
segment-force cycle is mapped through a bolt-force function, its minimum
and its maximum each on their own (the function is nonlinear, so the mean
load counts), to a bolt stress range on the stress area A_s; the ranges are
summed by Palmgren–Miner on the S–N curve with γ_Mf. Bolt-force functions:
  FE             from RUN_DIR/history.csv (--from), the run of this model
                 by 'flangeseg run'; its tension stage up to the largest Z.
                 Stress per --stress: axial F_s/A_s, or axial + bending
                 F_s/A_s + M_s/W with the moment at the contact plane
                 (bolt_moment_interface_kNm) and W = π·d_s³/32 on the
                 stress-area diameter d_s = √(4·A_s/π).
  trilinear      the hand segment model (Schmidt/Neuhaus), axial only;
  joint diagram  the hand joint-diagram model (VDI 2230), axial only.
Below its first point (compression) a function goes on with its first
slope; loads above its last point (FE: the largest Z of the run; hand: the
ultimate load) are an error: raise [load] max_displacement and run again.
The first function listed (FE if given, else trilinear) governs.

Load file (CSV, units kN, kNm, s; lines starting with # are comments; the
header names the columns, in any order, and chooses the layout):
  time_s,Z_kN                     segment-force time series (time optional)
  time_s,moment_kNm,normal_force_kN
                                  tower-section time series (time optional)
  Z_range_kN,Z_mean_kN,cycles     range–mean–cycles table of Z
  moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles
                                  range–mean–cycles table of the moment
A time series is streamed through a rainflow count (ASTM E1049-85, 5.4.4)
and never held in memory; its residue counts as half cycles. Tower rows
become segment forces by Z = 4·M/(n·D) − N/n with D = tower.diameter and
n = tower.bolts: M positive puts the segment in tension (the bolts on the
tension side of the bending, the ones checked), N positive in compression
(the tower's weight). Give the loads with any load factor γ_Ff included.

S–N curve: %s is EN 1993-1-9 detail category 50 (bolts in tension, Table
8.1 detail 14) times k_s = (30/d)^0.25 for d > 30 mm: m = 3 to Δσ_D =
0.737·Δσ_C at 5·10⁶ cycles, m = 5 to the cut-off Δσ_L = 0.549·Δσ_D at 10⁸,
no damage below. A CSV file with the header cycles,stress_range_MPa gives
a curve of your own: straight lines on log–log axes between its points,
the first line extended upwards, no damage below the last point.

Writes into DIR: fatigue_bins.csv (cycles and damage per stress-range bin
and function), fatigue_blocks.csv (a table's rows with their stress ranges,
endurances and damage; tables only), fatigue_summary.json, and the plots
stress_range_histogram, damage_per_bin and sn_curve (SVG and PNG).

Exit codes: 0 done, damage D ≤ 1; 1 done, the governing D > 1; 2 bad
arguments, model or load file; 3 the results could not be written.

%s

Flags:
`, curveEN1993Bolt, caution)
	fs.PrintDefaults()
}

// check reports every flag that breaks its rule, one per line.
func (f fatigueFlags) check() error {
	var errs []error
	bad := func(flag string, v float64, rule string) {
		errs = append(errs, fmt.Errorf("flangeseg fatigue: --%s = %s: %s", flag, fnum(v), rule))
	}
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	if f.loads == "" {
		errs = append(errs, errors.New("flangeseg fatigue: --loads: missing: give the load file (layouts in 'flangeseg fatigue --help')"))
	}
	if f.stress != stressAxialBend && f.stress != stressAxial {
		errs = append(errs, fmt.Errorf("flangeseg fatigue: --stress = %q: must be %q or %q", f.stress, stressAxialBend, stressAxial))
	}
	if f.gammaMf != 0 && (!finite(f.gammaMf) || f.gammaMf < 1) {
		bad("gamma-mf", f.gammaMf, "must be a finite number ≥ 1 (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35)")
	}
	if !finite(f.refCycles) || !(f.refCycles > 0) {
		bad("reference-cycles", f.refCycles, "must be a finite number > 0")
	}
	if !finite(f.refSlope) || !(f.refSlope > 0) {
		bad("reference-slope", f.refSlope, "must be a finite number > 0")
	}
	k := f.binWidth / fatigueFineBin
	if !finite(f.binWidth) || f.binWidth < 0 || math.Abs(k-math.Round(k)) > 1e-9*math.Max(k, 1) {
		bad("bin-width", f.binWidth, "must be 0 (chosen by the tool) or a positive multiple of 0.1 MPa")
	}
	return errors.Join(errs...)
}

// boltFunction is one bolt-force function with the tallies of its stress
// ranges.
type boltFunction struct {
	slug     string // column suffix in the CSV files
	label    string // name in tables and plots
	tr       *fatigue.Transfer
	spec     *fatigue.Spectrum
	eq       *fatigue.Equivalent
	damage   float64
	maxRange float64
}

// add maps one segment-force cycle to a stress range and tallies it.
func (b *boltFunction) add(m fatigue.Miner, c fatigue.Cycle) error {
	ds, err := b.tr.Range(c)
	if err != nil {
		return fmt.Errorf("%s bolt-force function: %w", b.label, err)
	}
	d := m.Damage(ds, c.Count)
	b.damage += d
	b.maxRange = math.Max(b.maxRange, ds)
	b.eq.Add(ds, c.Count)
	return b.spec.Add(ds, c.Count, d)
}

// fatigueJob is one fatigue assessment: the model, the curve, the
// functions, and what the count found.
type fatigueJob struct {
	spec     *Spec
	path     string
	flags    fatigueFlags
	der      Derived
	miner    fatigue.Miner
	fns      []*boltFunction // the governing one first
	info     fatigue.LoadInfo
	blocks   []fatigue.Cycle // the rows of a table
	warnings []string
}

func newFatigueJob(spec *Spec, path string, f fatigueFlags) (*fatigueJob, error) {
	j := &fatigueJob{spec: spec, path: path, flags: f, der: spec.Derive()}
	curve, err := j.curve()
	if err != nil {
		return nil, err
	}
	if j.miner, err = fatigue.NewMiner(curve, f.gammaMf); err != nil {
		return nil, fmt.Errorf("--gamma-mf: %w", err)
	}
	if f.from != "" {
		fe, err := j.feFunction()
		if err != nil {
			return nil, err
		}
		j.fns = append(j.fns, fe)
	}
	hand, err := handcalc.Analyze(spec.HandJoint(j.der), handcalc.DefaultParams())
	if err != nil {
		return nil, fmt.Errorf("%s: hand methods: %w", path, err)
	}
	for _, h := range []struct {
		slug, label string
		pts         []handcalc.Point
	}{
		{"trilinear", "trilinear", hand.TrilinearPoints},
		{"joint_diagram", "joint diagram", hand.JointDiagramPoints},
	} {
		fn, err := handFunction(h.pts)
		if err != nil {
			return nil, fmt.Errorf("%s: hand %s bolt-force function: %w", path, h.label, err)
		}
		b, err := j.newBoltFunction(h.slug, h.label, fn, fatigue.Axial)
		if err != nil {
			return nil, err
		}
		j.fns = append(j.fns, b)
	}
	return j, nil
}

func (j *fatigueJob) curve() (*fatigue.Curve, error) {
	if j.flags.curve == curveEN1993Bolt {
		return fatigue.Bolt(j.der.D)
	}
	file, err := os.Open(j.flags.curve)
	if err != nil {
		return nil, fmt.Errorf("--sn-curve = %q: must be %q or a readable CSV file: %w", j.flags.curve, curveEN1993Bolt, err)
	}
	defer file.Close()
	c, err := fatigue.ReadCurve(file, filepath.Base(j.flags.curve))
	if err != nil {
		return nil, fmt.Errorf("--sn-curve %s: %w", j.flags.curve, err)
	}
	return c, nil
}

func (j *fatigueJob) newBoltFunction(slug, label string, f *fatigue.BoltForceFunction, basis fatigue.Basis) (*boltFunction, error) {
	tr, err := fatigue.NewTransfer(f, j.der.StressArea, basis)
	if err != nil {
		return nil, fmt.Errorf("%s bolt-force function: %w", label, err)
	}
	if !tr.Monotone() {
		j.warnings = append(j.warnings, fmt.Sprintf("the %s bolt stress (%s) falls somewhere as Z rises: cycles are counted in Z and their extremes mapped, so a range inside a cycle may be missed", label, basis))
	}
	spec, err := fatigue.NewSpectrum(fatigueFineBin)
	if err != nil {
		return nil, err
	}
	eq, err := fatigue.NewEquivalent(j.flags.refSlope, j.flags.refCycles)
	if err != nil {
		return nil, err
	}
	return &boltFunction{slug: slug, label: label, tr: tr, spec: spec, eq: eq}, nil
}

// handFunction samples a piecewise straight hand model at its
// characteristic points, which it is exact between.
func handFunction(pts []handcalc.Point) (*fatigue.BoltForceFunction, error) {
	var z, fs []float64
	for _, p := range pts {
		if len(z) > 0 && p.Z <= z[len(z)-1] {
			continue
		}
		z, fs = append(z, p.Z), append(fs, p.Fs)
	}
	return fatigue.NewBoltForceFunction(z, fs, nil)
}

// The history.csv columns the FE function is read from (DESIGN.md,
// "Outputs — names").
var historyColumns = []string{"stage", "Z_kN", "bolt_force_kN", "bolt_moment_interface_kNm", "bolt_stress_axial_MPa"}

// feFunction reads the FE bolt-force function of a run: the last preload
// row, then the tension rows while Z rises.
func (j *fatigueJob) feFunction() (*boltFunction, error) {
	path := filepath.Join(j.flags.from, "history.csv")
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %w (give the output directory of 'flangeseg run' on this model)", j.flags.from, err)
	}
	defer file.Close()
	z, fs, ms, as, err := readBoltFunction(file)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %s: %w", j.flags.from, path, err)
	}
	if math.Abs(as-j.der.StressArea) > 1e-6*j.der.StressArea {
		return nil, fmt.Errorf("--from %s: %s belongs to a bolt with A_s = %.6g mm², %s has A_s = %.6g mm²: run this model first",
			j.flags.from, path, as, j.path, j.der.StressArea)
	}
	f, err := fatigue.NewBoltForceFunction(z, fs, ms)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %s: %w", j.flags.from, path, err)
	}
	// The A_s check catches another bolt; the resolved model catches any
	// other difference (a run keeps the model it was made from).
	if ran, err := os.ReadFile(filepath.Join(j.flags.from, "model.resolved.toml")); err == nil {
		if mine, err := j.spec.ResolvedTOML(); err == nil && !bytes.Equal(ran, mine) {
			j.warnings = append(j.warnings, fmt.Sprintf("--from %s: its model.resolved.toml differs from %s: the FE bolt-force function may belong to another joint", j.flags.from, j.path))
		}
	}
	basis := fatigue.AxialBending
	if j.flags.stress == stressAxial {
		basis = fatigue.Axial
	}
	return j.newBoltFunction("fe", "FE", f, basis)
}

// readBoltFunction reads Z, F_s and M_s (N, N·mm) and the run's stress area
// (mm², from F_s and its axial stress) from a history.csv.
func readBoltFunction(r io.Reader) (z, fs, ms []float64, as float64, err error) {
	cr := csv.NewReader(r)
	head, err := cr.Read()
	if err != nil {
		return nil, nil, nil, 0, fmt.Errorf("header: %w", err)
	}
	col := map[string]int{}
	for i, h := range head {
		col[h] = i
	}
	for _, c := range historyColumns {
		if _, ok := col[c]; !ok {
			return nil, nil, nil, 0, fmt.Errorf("header: column %q missing (want %s)", c, strings.Join(historyColumns, ", "))
		}
	}
	var rows [][5]float64
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, nil, 0, err
		}
		line, _ := cr.FieldPos(0)
		var v [5]float64
		for k, c := range historyColumns {
			x, err := strconv.ParseFloat(rec[col[c]], 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, nil, nil, 0, fmt.Errorf("line %d: %s = %q: must be a finite number", line, c, rec[col[c]])
			}
			v[k] = x
		}
		rows = append(rows, v)
	}
	if len(rows) == 0 {
		return nil, nil, nil, 0, errors.New("no data rows: the run stopped before its preload was reached")
	}
	start := -1 // the last preload row
	for i, v := range rows {
		if v[0] == 0 {
			start = i
		}
	}
	if start < 0 {
		return nil, nil, nil, 0, errors.New("no preload row (stage 0)")
	}
	for i, v := range rows[start:] {
		if i > 0 && (v[0] != 1 || v[1]*1e3 <= z[len(z)-1]) {
			break // past the largest Z the function is not single-valued
		}
		z, fs, ms = append(z, v[1]*1e3), append(fs, v[2]*1e3), append(ms, v[3]*1e6)
		if v[4] != 0 {
			as = v[2] * 1e3 / v[4]
		}
	}
	if len(z) < 2 {
		return nil, nil, nil, 0, errors.New("no tension rows (stage 1) with rising Z after the preload")
	}
	return z, fs, ms, as, nil
}

// count streams the load file through every function.
func (j *fatigueJob) count() error {
	file, err := os.Open(j.flags.loads)
	if err != nil {
		return err
	}
	defer file.Close()
	lf, err := fatigue.NewLoadFile(file)
	if err != nil {
		return err
	}
	keep := !lf.Kind().Series() // a table's rows go into fatigue_blocks.csv; a series is never held
	tower := fatigue.Tower{Diameter: j.spec.Tower.Diameter, Bolts: j.spec.Tower.Bolts}
	j.info, err = lf.Read(tower, func(c fatigue.Cycle) error {
		if keep {
			j.blocks = append(j.blocks, c)
		}
		for _, b := range j.fns {
			if err := b.add(j.miner, c); err != nil {
				return err
			}
		}
		return nil
	})
	if errors.Is(err, fatigue.ErrBeyond) {
		return fmt.Errorf("%w\n(for the FE function raise [load] max_displacement of the model and run it again; the hand functions end at the ultimate load)", err)
	}
	if err != nil {
		return err
	}
	if j.info.Cycles == 0 {
		return errors.New("no cycles: the file has no data lines, or its load never changes")
	}
	return nil
}

// binMerge returns how many fine bins make one display bin: --bin-width,
// or the smallest width of 0.1, 0.2, 0.5, 1, 2, 5 … MPa that gives at most
// fatigueDisplayMax bins.
func (j *fatigueJob) binMerge() int {
	if j.flags.binWidth > 0 {
		return int(math.Round(j.flags.binWidth / fatigueFineBin))
	}
	var top float64
	for _, b := range j.fns {
		top = math.Max(top, b.maxRange)
	}
	steps := [...]int{2, 5, 10} // × 10^k fine bins
	k, scale := 1, 1
	for i := 0; top/(float64(k)*fatigueFineBin) > fatigueDisplayMax; i++ {
		if i%3 == 0 && i > 0 {
			scale *= 10
		}
		k = steps[i%3] * scale
	}
	return k
}

// bins returns the display bins of every function, all over the same
// stress ranges.
func (j *fatigueJob) bins() [][]fatigue.Bin {
	k := j.binMerge()
	w := float64(k) * fatigueFineBin
	n := 0
	for _, b := range j.fns {
		n = max(n, len(b.spec.Bins(k, 0)))
	}
	out := make([][]fatigue.Bin, len(j.fns))
	for i, b := range j.fns {
		out[i] = b.spec.Bins(k, (float64(n)-0.5)*w)
	}
	return out
}

// fatigueSummary is fatigue_summary.json.
type fatigueSummary struct {
	Title            string           `json:"title"`
	Model            string           `json:"model"`
	Caution          string           `json:"caution"`
	Loads            fatigueLoads     `json:"loads"`
	Curve            string           `json:"sn_curve"`
	CutOffMPa        float64          `json:"cut_off_MPa"`
	GammaMf          float64          `json:"gamma_Mf"`
	StressAreaMM2    float64          `json:"stress_area_mm2"`
	SectionModulus   float64          `json:"section_modulus_mm3"`
	ReferenceCycles  float64          `json:"reference_cycles"`
	ReferenceSlope   float64          `json:"reference_slope"`
	RunDirectory     string           `json:"run_directory,omitempty"`
	Governing        string           `json:"governing"`
	BoltForceResults []fatigueOutcome `json:"results"`
}

type fatigueLoads struct {
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

type fatigueOutcome struct {
	Function           string  `json:"function"`
	Stress             string  `json:"stress"`
	Damage             float64 `json:"damage"`
	EquivalentRangeMPa float64 `json:"equivalent_range_MPa"`
	MaxRangeMPa        float64 `json:"max_range_MPa"`
}

func (j *fatigueJob) summary() fatigueSummary {
	r := post.Round10
	in := j.info
	s := fatigueSummary{
		Title: j.spec.Title, Model: filepath.Base(j.path), Caution: caution,
		Loads: fatigueLoads{File: filepath.Base(j.flags.loads), Layout: in.Kind.String(), Rows: in.Rows, Cycles: r(in.Cycles),
			ZMinKN: r(in.ZMin / 1e3), ZMaxKN: r(in.ZMax / 1e3), MaxStack: in.MaxStack},
		Curve: j.miner.Curve().Name(), CutOffMPa: r(j.miner.Curve().CutOff()), GammaMf: j.flags.gammaMf,
		StressAreaMM2: r(j.der.StressArea), SectionModulus: r(fatigue.SectionModulus(j.der.StressArea)),
		ReferenceCycles: j.flags.refCycles, ReferenceSlope: j.flags.refSlope, RunDirectory: j.flags.from,
		Governing: j.fns[0].label,
	}
	if in.Kind.Series() {
		s.Loads.Rainflow = "ASTM E1049-85 5.4.4, residue counted as half cycles"
	}
	if in.Kind == fatigue.TowerSeries || in.Kind == fatigue.TowerTable {
		s.Loads.Transform = "Z = 4M/(n·D) − N/n; M positive puts the segment in tension, N positive in compression"
	}
	for _, b := range j.fns {
		s.BoltForceResults = append(s.BoltForceResults, fatigueOutcome{Function: b.label, Stress: b.tr.Basis().String(),
			Damage: r(b.damage), EquivalentRangeMPa: r(b.eq.Range()), MaxRangeMPa: r(b.maxRange)})
	}
	return s
}

// write writes the CSV files, the summary and the plots.
func (j *fatigueJob) write() error {
	dir := j.flags.out
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	bins := j.bins()
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
	if err := post.WriteJSON(filepath.Join(dir, "fatigue_summary.json"), j.summary()); err != nil {
		return err
	}
	return j.writePlots(dir, bins)
}

// writeBlocks writes a table's rows with what each function makes of them.
func (j *fatigueJob) writeBlocks(path string) error {
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

// governingBins returns the bins of the governing function that do the
// most damage, at most n, largest first.
func (j *fatigueJob) governingBins(bins []fatigue.Bin, n int) []fatigue.Bin {
	var out []fatigue.Bin
	for _, b := range bins {
		if b.Damage > 0 {
			out = append(out, b)
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Damage > out[b].Damage })
	return out[:min(n, len(out))]
}

func (j *fatigueJob) print(w io.Writer) {
	in, curve := j.info, j.miner.Curve()
	fmt.Fprintf(w, "Bolt fatigue: %s\n", j.spec.Title)
	loads := fmt.Sprintf("%s: %s, %d lines, %.4g cycles, Z from %.1f to %.1f kN", j.flags.loads, in.Kind, in.Rows, in.Cycles, in.ZMin/1e3, in.ZMax/1e3)
	if in.Kind.Series() {
		loads += fmt.Sprintf(" (rainflow, residue as half cycles; at most %d turning points held)", in.MaxStack)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  loads\t%s\n", loads)
	fmt.Fprintf(tw, "  S–N curve\t%s; cut-off %.4g MPa\n", curve.Name(), curve.CutOff())
	fmt.Fprintf(tw, "  partial factor\tγ_Mf = %g (stress ranges × γ_Mf on the curve)\n", j.flags.gammaMf)
	fmt.Fprintf(tw, "  bolt\tA_s = %.5g mm², W = π·d_s³/32 = %.5g mm³\n", j.der.StressArea, fatigue.SectionModulus(j.der.StressArea))
	tw.Flush()
	fmt.Fprintln(w)
	row := func(tw io.Writer, label string, cell func(*boltFunction) string) {
		cells := []string{"  " + label}
		for _, b := range j.fns {
			cells = append(cells, cell(b))
		}
		fmt.Fprintln(tw, strings.Join(cells, "\t"))
	}
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row(tw, "", func(b *boltFunction) string { return b.label })
	row(tw, "stress", func(b *boltFunction) string { return b.tr.Basis().String() })
	row(tw, "damage D", func(b *boltFunction) string { return fmt.Sprintf("%.4g", b.damage) })
	row(tw, fmt.Sprintf("Δσ_eq at N = %.3g, m = %g [MPa]", j.flags.refCycles, j.flags.refSlope),
		func(b *boltFunction) string { return fmt.Sprintf("%.4g", b.eq.Range()) })
	row(tw, "largest Δσ [MPa]", func(b *boltFunction) string { return fmt.Sprintf("%.4g", b.maxRange) })
	tw.Flush()
	gov := j.fns[0]
	fmt.Fprintf(w, "\nGoverning stress-range bins (%s, the largest damage first):\n", gov.label)
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  Δσ [MPa]\tcycles\tdamage\tshare")
	top := j.governingBins(j.bins()[0], 5)
	for _, b := range top {
		fmt.Fprintf(tw, "  %.4g – %.4g\t%.6g\t%.4g\t%.1f %%\n", b.From, b.To, b.Cycles, b.Damage, 100*b.Damage/gov.damage)
	}
	tw.Flush()
	if len(top) == 0 {
		fmt.Fprintln(w, "  none: every stress range lies below the cut-off")
	}
	verdict := "D ≤ 1"
	if gov.damage > 1 {
		verdict = "D > 1: the bolt does not reach the fatigue life of this spectrum"
	}
	fmt.Fprintf(w, "\n%s (%s). Results in %s\n%s\n", verdict, gov.label, j.flags.out, caution)
}

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
func (j *fatigueJob) barPlot(title, ylabel string, bins [][]fatigue.Bin, value func(fatigue.Bin) float64, logY bool) *plot.Plot {
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
func (j *fatigueJob) snPlot(bins [][]fatigue.Bin) (*plot.Plot, error) {
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
			design = append(design, plotter.XY{X: n, Y: ds / j.flags.gammaMf})
		}
	}
	lines := []snLine{
		{"S–N curve", char, color.Black, false},
		{fmt.Sprintf("S–N curve / γ_Mf = %g", j.flags.gammaMf), design, color.Black, true},
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

func (j *fatigueJob) writePlots(dir string, bins [][]fatigue.Bin) error {
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
