package assess

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/fatigue"
	"flangeseg/post/handcalc"
)

// The words the options take.
const (
	CurveEN1993Bolt    = "en1993-bolt"   // Options.Curve: EN 1993-1-9 detail category 50 with k_s
	StressAxial        = "axial"         // Options.Stress: F_s/A_s
	StressAxialBending = "axial+bending" // Options.Stress: F_s/A_s + M_s/W
	FineBin            = 0.1             // MPa: the bins cycles are tallied in; display bins merge them
	displayMax         = 25              // display bins at most, when BinWidth is left to the job
)

// Options are the choices of an assessment that do not come from the
// model file. They are the flags of `flangeseg fatigue`, and messages
// name each by its flag.
type Options struct {
	Loads     string  // the load file (CSV)
	From      string  // run directory whose history.csv gives the FE function; "" for none
	Curve     string  // CurveEN1993Bolt or the path of an S–N curve CSV
	Stress    string  // StressAxialBending or StressAxial: the FE bolt stress
	GammaMf   float64 // γ_Mf on the fatigue strength
	RefCycles float64 // N_ref of the damage-equivalent stress range
	RefSlope  float64 // m of the damage-equivalent stress range
	BinWidth  float64 // MPa, a multiple of FineBin; 0 lets the job choose
}

// Function is one bolt-force function with the tallies of its stress
// ranges.
type Function struct {
	slug     string // column suffix in the CSV files
	label    string // name in tables and plots
	tr       *fatigue.Transfer
	spec     *fatigue.Spectrum
	eq       *fatigue.Equivalent
	damage   float64
	maxRange float64
}

// add maps one segment-force cycle to a stress range and tallies it.
func (b *Function) add(m fatigue.Miner, c fatigue.Cycle) error {
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

// Job is one fatigue assessment: the model, the curve, the
// functions, and what the count found.
type Job struct {
	spec     *modelfile.Spec
	path     string
	opt      Options
	der      modelfile.Derived
	miner    fatigue.Miner
	fns      []*Function // the governing one first
	info     fatigue.LoadInfo
	blocks   []fatigue.Cycle // the rows of a table
	warnings []string
}

// New sets up the assessment of the model spec (read from path, which
// messages name): the S–N curve, the FE bolt-force function if
// Options.From is given, then the hand functions (trilinear, joint
// diagram). Count then streams the loads through them.
func New(spec *modelfile.Spec, path string, f Options) (*Job, error) {
	j := &Job{spec: spec, path: path, opt: f, der: spec.Derive()}
	curve, err := j.curve()
	if err != nil {
		return nil, err
	}
	if j.miner, err = fatigue.NewMiner(curve, f.GammaMf); err != nil {
		return nil, fmt.Errorf("--gamma-mf: %w", err)
	}
	if f.From != "" {
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

func (j *Job) curve() (*fatigue.Curve, error) {
	if j.opt.Curve == CurveEN1993Bolt {
		return fatigue.Bolt(j.der.D)
	}
	file, err := os.Open(j.opt.Curve)
	if err != nil {
		return nil, fmt.Errorf("--sn-curve = %q: must be %q or a readable CSV file: %w", j.opt.Curve, CurveEN1993Bolt, err)
	}
	defer file.Close()
	c, err := fatigue.ReadCurve(file, filepath.Base(j.opt.Curve))
	if err != nil {
		return nil, fmt.Errorf("--sn-curve %s: %w", j.opt.Curve, err)
	}
	return c, nil
}

func (j *Job) newBoltFunction(slug, label string, f *fatigue.BoltForceFunction, basis fatigue.Basis) (*Function, error) {
	tr, err := fatigue.NewTransfer(f, j.der.StressArea, basis)
	if err != nil {
		return nil, fmt.Errorf("%s bolt-force function: %w", label, err)
	}
	if !tr.Monotone() {
		j.warnings = append(j.warnings, fmt.Sprintf("the %s bolt stress (%s) falls somewhere as Z rises: cycles are counted in Z and their extremes mapped, so a range inside a cycle may be missed", label, basis))
	}
	spec, err := fatigue.NewSpectrum(FineBin)
	if err != nil {
		return nil, err
	}
	eq, err := fatigue.NewEquivalent(j.opt.RefSlope, j.opt.RefCycles)
	if err != nil {
		return nil, err
	}
	return &Function{slug: slug, label: label, tr: tr, spec: spec, eq: eq}, nil
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
func historyColumns() []string {
	return []string{"stage", "Z_kN", "bolt_force_kN", "bolt_moment_interface_kNm", "bolt_stress_axial_MPa"}
}

// feFunction reads the FE bolt-force function of a run: the last preload
// row, then the tension rows while Z rises.
func (j *Job) feFunction() (*Function, error) {
	path := filepath.Join(j.opt.From, "history.csv")
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %w (give the output directory of 'flangeseg run' on this model)", j.opt.From, err)
	}
	defer file.Close()
	z, fs, ms, as, err := readBoltFunction(file)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %s: %w", j.opt.From, path, err)
	}
	if math.Abs(as-j.der.StressArea) > 1e-6*j.der.StressArea {
		return nil, fmt.Errorf("--from %s: %s belongs to a bolt with A_s = %.6g mm², %s has A_s = %.6g mm²: run this model first",
			j.opt.From, path, as, j.path, j.der.StressArea)
	}
	f, err := fatigue.NewBoltForceFunction(z, fs, ms)
	if err != nil {
		return nil, fmt.Errorf("--from %s: %s: %w", j.opt.From, path, err)
	}
	// The A_s check catches another bolt; the resolved model catches any
	// other difference (a run keeps the model it was made from).
	if ran, err := os.ReadFile(filepath.Join(j.opt.From, "model.resolved.toml")); err == nil {
		if mine, err := j.spec.ResolvedTOML(); err == nil && !bytes.Equal(ran, mine) {
			j.warnings = append(j.warnings, fmt.Sprintf("--from %s: its model.resolved.toml differs from %s: the FE bolt-force function may belong to another joint", j.opt.From, j.path))
		}
	}
	basis := fatigue.AxialBending
	if j.opt.Stress == StressAxial {
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
	for _, c := range historyColumns() {
		if _, ok := col[c]; !ok {
			return nil, nil, nil, 0, fmt.Errorf("header: column %q missing (want %s)", c, strings.Join(historyColumns(), ", "))
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
		for k, c := range historyColumns() {
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

// Count streams the load file through every function.
func (j *Job) Count() error {
	file, err := os.Open(j.opt.Loads)
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
// displayMax bins.
func (j *Job) binMerge() int {
	if j.opt.BinWidth > 0 {
		return int(math.Round(j.opt.BinWidth / FineBin))
	}
	var top float64
	for _, b := range j.fns {
		top = math.Max(top, b.maxRange)
	}
	steps := [...]int{2, 5, 10} // × 10^k fine bins
	k, scale := 1, 1
	for i := 0; top/(float64(k)*FineBin) > displayMax; i++ {
		if i%3 == 0 && i > 0 {
			scale *= 10
		}
		k = steps[i%3] * scale
	}
	return k
}

// Bins returns the display bins of every function, all over the same
// stress ranges.
func (j *Job) Bins() [][]fatigue.Bin {
	k := j.binMerge()
	w := float64(k) * FineBin
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

// GoverningBins returns the bins of the governing function that do the
// most damage, at most n, largest first.
func (j *Job) GoverningBins(bins []fatigue.Bin, n int) []fatigue.Bin {
	var out []fatigue.Bin
	for _, b := range bins {
		if b.Damage > 0 {
			out = append(out, b)
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Damage > out[b].Damage })
	return out[:min(n, len(out))]
}

// Warnings are what New found valid but worth a second look.
func (j *Job) Warnings() []string { return j.warnings }

// Functions are the bolt-force functions, the governing one first.
func (j *Job) Functions() []*Function { return j.fns }

// Info describes the load file Count read.
func (j *Job) Info() fatigue.LoadInfo { return j.info }

// Curve is the S–N curve.
func (j *Job) Curve() *fatigue.Curve { return j.miner.Curve() }

// StressArea is the bolt's A_s, mm².
func (j *Job) StressArea() float64 { return j.der.StressArea }

// Label names the function in tables and plots.
func (b *Function) Label() string { return b.label }

// Basis is the bolt stress the function maps to.
func (b *Function) Basis() fatigue.Basis { return b.tr.Basis() }

// Damage is the Palmgren–Miner sum of the counted cycles.
func (b *Function) Damage() float64 { return b.damage }

// EquivalentRange is the damage-equivalent stress range, MPa.
func (b *Function) EquivalentRange() float64 { return b.eq.Range() }

// MaxRange is the largest stress range counted, MPa.
func (b *Function) MaxRange() float64 { return b.maxRange }
