package ring

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"flangeseg/post/fatigue"
	"flangeseg/post/fatigue/assess"
	"flangeseg/post/results"
	"flangeseg/post/sweep"
)

// FatigueOptions are the fatigue check's choices, as the fatigue command
// takes them; Loads "" checks no fatigue.
type FatigueOptions struct {
	Loads      string   // the tower load file
	Sectors    []Sector // direction sectors, or nil
	Curve      string   // assess.CurveEN1993Bolt or an S–N curve CSV
	Stress     string   // assess.StressAxialBending or assess.StressAxial
	GammaMf    float64  // 0: the model's fatigue.gamma_mf
	RefCycles  float64  // 0: 2·10⁶
	RefSlope   float64  // 0: 3
	LossLimit  float64  // share of the preload whose loss to the closing is flagged (0: 0.1)
	BinMPa     float64  // width of the spectrum's bins, MPa (0: 1)
	LoadsLabel string   // the load file as messages and outputs name it (default Loads)
}

// Defaults of FatigueOptions.
const (
	DefaultLossLimit = 0.1
	DefaultBinMPa    = 1.0
)

// BoltResult is one bolt's outcome.
type BoltResult struct {
	Bolt
	Class  string `json:"class"`
	Status string `json:"status"` // the class's analysis: finished, stopped, failed, missing
	Reason string `json:"reason,omitempty"`
	// The preload reached and the clamp force left on the faces after it
	// (kN); the preload lost to closing the gap (ring spring) and its
	// share; the gap left open after the preload (mm).
	PreloadKN     float64 `json:"preload_kN"`
	ClampKN       float64 `json:"clamp_force_after_preload_kN"`
	ClosingKN     float64 `json:"preload_spent_on_closing_kN"`
	ClosingShare  float64 `json:"preload_spent_share"`
	GapLeftMM     float64 `json:"gap_left_after_preload_mm"`
	OpeningKN     *float64
	Decompression *float64
	// Fatigue (nil without loads): Z range of the bolt, damage and ranges
	// of the FE function, the hand models' damage.
	Fatigue *BoltFatigue `json:"fatigue,omitempty"`
	// Function is the FE bolt-force function: Z and F_s, kN.
	FunctionZ, FunctionFs []float64 `json:"-"`
	// Spectrum is the FE stress range spectrum (bins with cycles).
	Spectrum []fatigue.Bin `json:"-"`
}

// BoltFatigue is a bolt's fatigue outcome.
type BoltFatigue struct {
	ZMinKN, ZMaxKN     float64
	Cycles             float64
	DamageFE           float64
	EquivalentRangeMPa float64
	MaxRangeMPa        float64
	DamageTrilinear    float64
	DamageJointDiagram float64
	Stress             string
}

// Result is the ring check.
type Result struct {
	Plan    *Plan
	Bolts   []BoltResult
	Records []sweep.Record
	Loads   *LoadInfo
	Fatigue FatigueOptions
	GammaMf float64
	Curve   string
	// Governing is the bolt with the largest FE damage (with loads), else
	// the one that lost the largest share of its preload (0: none).
	Governing int
	// OverDamage are the bolts with FE damage above 1; OverLoss those
	// that lost more than LossLimit of their preload to the closing.
	OverDamage, OverLoss []int
	Warnings             []string
}

// Evaluate reads the classes' runs from dir (as sweep.Collect returns
// their records, in class order) and gives every bolt its results: the
// preload and the clamp force left after closing, the gap left open, the
// bolt-force function, and with loads its segment-force cycles through
// the class's FE bolt-force function and the hand ones (the fatigue
// command's machinery, post/fatigue/assess).
func Evaluate(dir string, p *Plan, recs []sweep.Record, f FatigueOptions) (*Result, error) {
	if f.LossLimit == 0 {
		f.LossLimit = DefaultLossLimit
	}
	if f.BinMPa == 0 {
		f.BinMPa = DefaultBinMPa
	}
	if f.RefCycles == 0 {
		f.RefCycles = 2e6
	}
	if f.RefSlope == 0 {
		f.RefSlope = 3
	}
	if f.Curve == "" {
		f.Curve = assess.CurveEN1993Bolt
	}
	if f.Stress == "" {
		f.Stress = assess.StressAxialBending
	}
	if f.GammaMf == 0 {
		f.GammaMf = p.Spec.Fatigue.GammaMf
	}
	if f.LoadsLabel == "" {
		f.LoadsLabel = f.Loads
	}
	if len(recs) != len(p.Classes) {
		return nil, fmt.Errorf("ring: %d records for %d classes", len(recs), len(p.Classes))
	}
	res := &Result{Plan: p, Records: recs, Fatigue: f, GammaMf: f.GammaMf}
	type classRun struct {
		ok                  bool
		preload, clamp, gap float64
		opening, decomp     *float64
		z, fs               []float64
	}
	runs := make([]classRun, len(p.Classes))
	for i, r := range recs {
		c := &runs[i]
		if r.Status != sweep.Finished && r.Status != sweep.Stopped {
			continue
		}
		cols, err := results.ReadHistoryColumns(filepath.Join(dir, "cases", r.Name, "history.csv"))
		if err != nil {
			return nil, fmt.Errorf("ring: class %s: %w", r.Name, err)
		}
		c.ok = true
		last := 0
		for k, s := range cols["stage"] {
			if s == 0 {
				last = k
			}
		}
		c.preload = cols["bolt_force_kN"][last]
		for _, name := range slices.Sorted(mapKeys(cols)) {
			if strings.HasPrefix(name, "contact_force_") {
				c.clamp += cols[name][last]
			}
		}
		for k := last; k < len(cols["Z_kN"]); k++ {
			if k > last && cols["Z_kN"][k] <= c.z[len(c.z)-1] {
				break
			}
			c.z, c.fs = append(c.z, cols["Z_kN"][k]), append(c.fs, cols["bolt_force_kN"][k])
		}
		if r.Summary != nil {
			j := r.Summary.Joint
			if j.Closure != nil {
				c.gap = j.Closure.GapLeftMM
			}
			c.opening, c.decomp = j.OpeningLoadKN, j.DecompressionKN
		}
	}
	for _, b := range p.Bolts {
		r := recs[b.Class]
		br := BoltResult{Bolt: b, Class: r.Name, Status: r.Status, Reason: r.Reason}
		if c := runs[b.Class]; c.ok {
			br.PreloadKN, br.ClampKN, br.GapLeftMM = c.preload, c.clamp, c.gap
			br.ClosingKN = math.Max(0, c.preload-c.clamp)
			if c.preload > 0 {
				br.ClosingShare = br.ClosingKN / c.preload
			}
			br.OpeningKN, br.Decompression = c.opening, c.decomp
			br.FunctionZ, br.FunctionFs = c.z, c.fs
		}
		res.Bolts = append(res.Bolts, br)
	}
	if f.Loads != "" {
		if err := res.fatigue(dir); err != nil {
			return nil, err
		}
	}
	res.verdict()
	return res, nil
}

func mapKeys(m map[string][]float64) func(func(string) bool) {
	return func(yield func(string) bool) {
		for k := range m {
			if !yield(k) {
				return
			}
		}
	}
}

// fatigue streams the loads through each bolt's functions.
func (res *Result) fatigue(dir string) error {
	p, f := res.Plan, res.Fatigue
	jobs := make([]*assess.Job, len(res.Bolts))
	angles := make([]float64, len(res.Bolts))
	for i, b := range res.Bolts {
		angles[i] = b.Angle
		if b.Status != sweep.Finished && b.Status != sweep.Stopped {
			continue
		}
		c := p.Cases[b.Bolt.Class]
		j, err := assess.New(c.Spec, filepath.Join(dir, "cases", c.Name, "model.toml"), assess.Options{
			From: filepath.Join(dir, "cases", c.Name), Curve: f.Curve, Stress: f.Stress, GammaMf: f.GammaMf,
			RefCycles: f.RefCycles, RefSlope: f.RefSlope,
		})
		if err != nil {
			return fmt.Errorf("ring: bolt %d (%s): %w", b.Number, c.Name, err)
		}
		if i == 0 || res.Curve == "" {
			res.Curve = j.Curve().Name()
		}
		for _, w := range j.Warnings() {
			if !strings.Contains(w, "model.resolved.toml differs") && !slices.Contains(res.Warnings, w) {
				res.Warnings = append(res.Warnings, w)
			}
		}
		jobs[i] = j
	}
	file, err := os.Open(f.Loads)
	if err != nil {
		return fmt.Errorf("--loads: %w", err)
	}
	defer file.Close()
	tower := fatigue.Tower{Diameter: p.Spec.Tower.Diameter, Bolts: p.Spec.Tower.Bolts}
	info, err := StreamLoads(file, f.LoadsLabel, tower, angles, f.Sectors, func(b int, c fatigue.Cycle) error {
		if jobs[b] == nil {
			return nil
		}
		if err := jobs[b].Add(c); err != nil {
			return fmt.Errorf("bolt %d: %w", res.Bolts[b].Number, err)
		}
		return nil
	})
	if err != nil {
		return err
	}
	res.Loads = &info
	for i, j := range jobs {
		if j == nil {
			continue
		}
		fns := j.Functions()
		ji := j.Info()
		bf := &BoltFatigue{ZMinKN: ji.ZMin / 1e3, ZMaxKN: ji.ZMax / 1e3, Cycles: ji.Cycles,
			DamageFE: fns[0].Damage(), EquivalentRangeMPa: fns[0].EquivalentRange(), MaxRangeMPa: fns[0].MaxRange(),
			Stress: fns[0].Basis().String()}
		for _, h := range fns[1:] {
			switch h.Label() {
			case "trilinear":
				bf.DamageTrilinear = h.Damage()
			case "joint diagram":
				bf.DamageJointDiagram = h.Damage()
			}
		}
		res.Bolts[i].Fatigue = bf
		res.Bolts[i].Spectrum = fns[0].Bins(f.BinMPa)
	}
	return nil
}

// verdict names the governing bolt and the bolts over the limits.
func (res *Result) verdict() {
	worst := -1.0
	for _, b := range res.Bolts {
		v := b.ClosingShare
		if b.Fatigue != nil {
			v = b.Fatigue.DamageFE
		}
		if v > worst {
			worst, res.Governing = v, b.Number
		}
		if b.Fatigue != nil && b.Fatigue.DamageFE > 1 {
			res.OverDamage = append(res.OverDamage, b.Number)
		}
		if b.ClosingShare > res.Fatigue.LossLimit {
			res.OverLoss = append(res.OverLoss, b.Number)
		}
	}
}
