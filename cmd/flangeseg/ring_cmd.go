package main

import (
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
	"flangeseg/post/fatigue"
	"flangeseg/post/fatigue/assess"
	"flangeseg/post/results"
	"flangeseg/post/ring"
	"flangeseg/post/sweep"
)

// ringFlags are the flags of flangeseg ring.
type ringFlags struct {
	survey, loads, directions string
	dir                       string
	jobs, shards              int
	shard                     string
	collect, list             bool
	opt                       ring.Options
	fat                       ring.FatigueOptions
}

func runRing(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("ring", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var f ringFlags
	fs.StringVar(&f.survey, "survey", "", "the flatness survey `FILE` (CSV; columns below)")
	fs.StringVar(&f.loads, "loads", "", "tower loads `FILE` for the fatigue check (the fatigue command's tower layouts, optionally with direction_deg); without it no fatigue is checked")
	fs.StringVar(&f.directions, "directions", "", "direction sectors `FILE` of the tower moment (CSV direction_deg,share; shares sum to 1), for loads without a direction_deg column")
	fs.StringVar(&f.dir, "o", "", "write the classes' runs into `DIR`/cases/NAME and the ring's tables into DIR (default: the model's name without .toml, plus _ring)")
	fs.IntVar(&f.jobs, "jobs", 0, "run `K` classes side by side (default: as many as the cores the process may use)")
	fs.StringVar(&f.shard, "shard", "", "run only part `I/N` of the classes, as sweep does (default: from SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX, else all)")
	fs.IntVar(&f.shards, "shards", 0, "the number of shards `N` of a Kubernetes indexed Job, with JOB_COMPLETION_INDEX (default: FLANGESEG_SHARDS)")
	fs.BoolVar(&f.collect, "collect", false, "run nothing: build the ring's tables, plots and page from the class folders")
	fs.BoolVar(&f.list, "list", false, "run nothing: print every bolt's imperfection and class")
	fs.StringVar(&f.opt.Flange, "flange", ring.Internal, "which edge of the face is the flange's free edge: "+ring.Internal+" (the inner edge) or "+ring.External+" (the outer edge)")
	fs.Float64Var(&f.opt.GapTolerance, "gap-tolerance", ring.DefaultGapTolerance, "parallel gaps are rounded to multiples of `MM` (bolts with the same rounded values share one analysis; a gap that rounds to 0 is none)")
	fs.Float64Var(&f.opt.TaperTolerance, "taper-tolerance", ring.DefaultTaperTolerance, "tapers are rounded to multiples of `DEG`")
	fs.Float64Var(&f.opt.SpringTolerance, "spring-tolerance", ring.DefaultSpringTolerance, "ring springs are snapped to powers of 1 + `TOL` (two significant digits), so that the bolts of a long gap share analyses")
	fs.Float64Var(&f.opt.RingFactor, "ring-factor", 1, "factor on every bolt's ring spring, to bracket the ring's stiffness")
	fs.Float64Var(&f.fat.LossLimit, "loss-limit", ring.DefaultLossLimit, "flag the bolts that spend more than this `SHARE` of their preload on closing their gap")
	fs.StringVar(&f.fat.Curve, "sn-curve", assess.CurveEN1993Bolt, "S–N curve: "+assess.CurveEN1993Bolt+" or a CSV `FILE` of points cycles,stress_range_MPa")
	fs.StringVar(&f.fat.Stress, "stress", assess.StressAxialBending, "FE bolt stress: "+assess.StressAxialBending+" or "+assess.StressAxial)
	fs.Float64Var(&f.fat.GammaMf, "gamma-mf", 0, "partial factor γ_Mf on the fatigue strength (EN 1993-1-9 Table 3.1: 1.00 to 1.35); overrides [fatigue] gamma_mf of the model (default 1.15)")
	fs.Usage = func() { ringUsage(fs, stderr) }
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg ring: give exactly one model file (flangeseg ring MODEL.toml --survey SURVEY.csv [--loads LOADS.csv] -o DIR); run 'flangeseg ring --help'")
		return exitBadInput
	}
	if msg := f.check(); msg != "" {
		fmt.Fprintln(stderr, "flangeseg ring: "+msg)
		return exitBadInput
	}
	path := fs.Arg(0)
	if f.dir == "" {
		f.dir = strings.TrimSuffix(filepath.Base(path), ".toml") + "_ring"
	}
	p, code := ringPlan(path, f, stderr)
	if code != exitOK {
		return code
	}
	shard, code := sweepShard(sweepFlags{shard: f.shard, shards: f.shards, collect: f.collect}, stderr)
	if code != exitOK {
		return code
	}
	if f.list {
		listBolts(stdout, p, shard)
		return exitOK
	}
	if !f.collect {
		if err := results.CheckOutDir(f.dir); err != nil {
			fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
			return exitBadInput
		}
		if code := startRing(p, f, stderr); code != exitOK {
			return code
		}
		code := runRingClasses(p, f, shard, stdout, stderr)
		if code != exitOK || !shard.Whole() {
			return code
		}
	}
	return collectRing(p, f, stdout, stderr)
}

// check reports the first flag that breaks its rule.
func (f ringFlags) check() string {
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	switch {
	case f.survey == "":
		return "--survey: missing: give the flatness survey (columns in 'flangeseg ring --help')"
	case f.directions != "" && f.loads == "":
		return "--directions = " + f.directions + ": needs --loads (the directions are those of the loads' moment)"
	case f.fat.Stress != assess.StressAxialBending && f.fat.Stress != assess.StressAxial:
		return fmt.Sprintf("--stress = %q: must be %q or %q", f.fat.Stress, assess.StressAxialBending, assess.StressAxial)
	case f.fat.GammaMf != 0 && (!finite(f.fat.GammaMf) || f.fat.GammaMf < 1 || f.fat.GammaMf > 2):
		return fmt.Sprintf("--gamma-mf = %s: must lie from 1 to 2 (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35)", modelfile.FormatNumber(f.fat.GammaMf))
	case !finite(f.fat.LossLimit) || f.fat.LossLimit <= 0 || f.fat.LossLimit >= 1:
		return fmt.Sprintf("--loss-limit = %s: must lie between 0 and 1 (a share of the preload)", modelfile.FormatNumber(f.fat.LossLimit))
	case !finite(f.opt.GapTolerance) || f.opt.GapTolerance <= 0:
		return fmt.Sprintf("--gap-tolerance = %s mm: must be > 0", modelfile.FormatNumber(f.opt.GapTolerance))
	case !finite(f.opt.TaperTolerance) || f.opt.TaperTolerance <= 0:
		return fmt.Sprintf("--taper-tolerance = %s°: must be > 0", modelfile.FormatNumber(f.opt.TaperTolerance))
	case !finite(f.opt.SpringTolerance) || f.opt.SpringTolerance <= 0:
		return fmt.Sprintf("--spring-tolerance = %s: must be > 0", modelfile.FormatNumber(f.opt.SpringTolerance))
	case !finite(f.opt.RingFactor) || f.opt.RingFactor <= 0:
		return fmt.Sprintf("--ring-factor = %s: must be > 0", modelfile.FormatNumber(f.opt.RingFactor))
	case f.jobs < 0:
		return fmt.Sprintf("--jobs = %d: must be ≥ 1 (or 0: the cores)", f.jobs)
	}
	return ""
}

// ringPlan reads the model, the survey and the directions and makes the
// classes; bad input is reported (exit 2) before anything runs.
func ringPlan(path string, f ringFlags, stderr io.Writer) (*ring.Plan, int) {
	spec, ok := loadOrReport(path, "ring", stderr)
	if !ok {
		return nil, exitBadInput
	}
	text, err := os.ReadFile(path)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return nil, exitBadInput
	}
	if c := spec.Contact; c.Taper != 0 || c.ParallelGap != 0 || c.GapSpring != 0 {
		fmt.Fprintf(stderr, "flangeseg ring: warning: %s sets contact.taper, parallel_gap or gap_spring: the survey sets them for each bolt, the model's are not used\n", path)
	}
	file, err := os.Open(f.survey)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: --survey: %v\n", err)
		return nil, exitBadInput
	}
	defer file.Close()
	sv, err := ring.ReadSurvey(file, f.survey, spec.Tower.Bolts)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return nil, exitBadInput
	}
	bolts, err := ring.Bolts(spec, sv, f.opt)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return nil, exitBadInput
	}
	p, err := ring.NewPlan(spec, path, text, f.survey, f.opt, bolts)
	if err != nil {
		reportModelError(path, err, stderr)
		return nil, exitBadInput
	}
	if f.loads != "" {
		if code := checkRingLoads(p, &f, stderr); code != exitOK {
			return nil, code
		}
	}
	return p, exitOK
}

// checkRingLoads reads the directions and reads the loads once for one
// bolt, so that a bad load file is refused before the analyses run.
func checkRingLoads(p *ring.Plan, f *ringFlags, stderr io.Writer) int {
	if f.directions != "" {
		d, err := os.Open(f.directions)
		if err != nil {
			fmt.Fprintf(stderr, "flangeseg ring: --directions: %v\n", err)
			return exitBadInput
		}
		defer d.Close()
		if f.fat.Sectors, err = ring.ReadSectors(d, f.directions); err != nil {
			fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
			return exitBadInput
		}
	}
	l, err := os.Open(f.loads)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: --loads: %v\n", err)
		return exitBadInput
	}
	defer l.Close()
	tower := ringTower(p)
	if _, err := ring.StreamLoads(l, f.loads, tower, []float64{0}, f.fat.Sectors, nil); err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return exitBadInput
	}
	return exitOK
}

func ringUsage(fs *flag.FlagSet, w io.Writer) {
	fmt.Fprintf(w, `Usage: flangeseg ring MODEL.toml --survey SURVEY.csv [--loads LOADS.csv]
                      [--directions SECTORS.csv] [-o DIR] [--jobs K] [--shard I/N]
                      [--collect] [--list] [flags]

Checks every bolt of the ring flange described by MODEL.toml against a
flatness survey of its faces before tightening. Each bolt's segment gets
its radial taper and parallel gap from the survey, and a spring for the
ring's resistance to closing that gap (contact.gap_spring: the flange-and-
shell ring bending as a beam clamped at the nearest closed bolts, loaded
by the bolts in the gap; upper and lower ring in series). Bolts whose
values agree after rounding (--gap-tolerance, --taper-tolerance) share
one analysis: the classes run as the cases of a sweep (DIR/cases/class-NN,
side by side, resumable, in shards on a batch cluster exactly as 'flangeseg
sweep'; DIR/ring_plan.toml is that plan). Then every bolt gets the preload
it spent on closing its gap, the clamp force and the gap left after the
preload, its class's FE bolt-force function and, with --loads, its stress
range spectrum and fatigue damage (EN 1993-1-9 with γ_Mf, as 'flangeseg
fatigue'), beside the hand models' damage for the same loads.

Survey file (CSV; lines starting with # are comments; units in the header):
  bolt  or  angle_deg       the measuring position: bolt number 1 … n (bolt
                            k stands at (k − 1)·360/n°) or angle 0 ≤ θ < 360
  gap_inner_mm,gap_outer_mm the gap between the two faces at the inner and
                            at the outer edge of the face (feeler gauge), or
  upper_inner_mm,upper_outer_mm,lower_inner_mm,lower_outer_mm
                            each face's depth below a flat plane through its
                            highest points, summed into the gap
Gaps between the positions are interpolated linearly in the angle, around
the circle. A bolt's parallel gap is the smaller of its two edges' gaps,
less the smallest such value of the ring (the ring rests there); its taper
is the difference over the face width a + b + t/2, positive where the gap
opens towards the free edge (the inner edge of an internal flange,
--flange). Every value must be ≥ 0 and at most 5 mm; an error names the
line, the column, the value and the rule.

Loads (--loads): the fatigue command's tower layouts,
  time_s,moment_kNm,normal_force_kN            (time series; time optional)
  moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles   (table)
each optionally with direction_deg, the direction θ_M of the moment's
tension side; or a sectors file (--directions: direction_deg,share) whose
shares take each row in every direction; with neither, every bolt is
checked as the most loaded one. The bolt at θ gets Z = 4·M·cos(θ − θ_M)/(n·D)
− N/n (M positive: tension at θ_M; N positive in compression).

Writes into DIR: ring.csv and ring.json (one row a bolt: survey gaps,
parallel gap, taper, gap run and span, ring spring, class, preload, clamp
force after the preload, preload spent on closing and its share, gap left
open, opening and decompression load, Z range, cycles, FE damage, Δσ_eq,
largest Δσ, trilinear and joint-diagram damage, flags), ring_spectrum.csv
(each bolt's FE stress-range bins), ring_functions.csv (each class's FE
bolt-force function), plots/ (polar plots of the gap before and after the
preload, the clamp force and the damage around the ring; the classes'
bolt-force functions) and report.html, the ring page, which names the
governing bolt and the bolts over D = 1 or over the preload-loss limit.

Exit codes: 0 done, no bolt over D = 1; 1 done, a bolt's FE damage is
above 1; 2 bad arguments, model, survey or load file (nothing runs); 3 a
class stopped or failed, the run was interrupted, or --collect found
classes missing. A shard exits 0 once each of its classes has its record.

%s

Flags:
`, caution)
	fs.PrintDefaults()
}

func ringTower(p *ring.Plan) fatigue.Tower {
	return fatigue.Tower{Diameter: p.Spec.Tower.Diameter, Bolts: p.Spec.Tower.Bolts}
}

// listBolts prints every bolt with its imperfection and class.
func listBolts(w io.Writer, p *ring.Plan, shard sweep.Shard) {
	fmt.Fprintf(w, "%d bolts in %d classes (%s)\n", len(p.Bolts), len(p.Classes), shard)
	for i, c := range p.Classes {
		mark := ""
		if !shard.Whole() && shard.Has(i+1) {
			mark = "  (this shard)"
		}
		fmt.Fprintf(w, "%s  taper %s°  parallel gap %s mm  ring spring %s kN/mm  bolts %d%s\n", c.Name,
			modelfile.FormatNumber(c.Taper), modelfile.FormatNumber(c.Parallel), modelfile.FormatNumber(c.Spring/1e3), len(c.Bolts), mark)
	}
	fmt.Fprintln(w, "bolt  angle_deg  gap_inner_mm  gap_outer_mm  parallel_mm  taper_deg  run  class")
	for _, b := range p.Bolts {
		fmt.Fprintf(w, "%4d  %9.3f  %12.4g  %12.4g  %11.4g  %9.4g  %3d  %s\n", b.Number, b.Angle, b.Inner, b.Outer, b.Parallel, b.Taper, b.Run, p.Classes[b.Class].Name)
	}
}

// startRing marks DIR as a ring check's and writes its plan file.
func startRing(p *ring.Plan, f ringFlags, stderr io.Writer) int {
	err := os.MkdirAll(f.dir, 0o755)
	if err == nil {
		err = results.Mark(f.dir, results.KindRing)
	}
	if err == nil {
		base := p.Model
		if abs, e1 := filepath.Abs(p.Model); e1 == nil {
			if d, e2 := filepath.Abs(f.dir); e2 == nil {
				if rel, e3 := filepath.Rel(d, abs); e3 == nil {
					base = rel
				}
			}
		}
		err = post.WriteFileAtomic(filepath.Join(f.dir, ring.FilePlan), func(w io.Writer) error {
			_, err := w.Write(p.Text(base))
			return err
		})
	}
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return exitAnalysis
	}
	return exitOK
}

// runRingClasses runs the classes not done yet.
func runRingClasses(p *ring.Plan, f ringFlags, shard sweep.Shard, stdout, stderr io.Writer) int {
	ctx, release := interruptible()
	defer release()
	total, n := 0, 0
	for _, c := range p.Cases {
		if shard.Has(c.Index) {
			total += c.Spec.Load.Increments
			n++
		}
	}
	opt := sweep.Options{Dir: f.dir, Jobs: f.jobs, Shard: shard}
	bar := progressBar(stderr, total, "ring")
	if bar != nil {
		opt.Progress = func(done, _ int) { _ = bar.Set(done) }
	} else {
		opt.CaseDone = func(r sweep.Record, ran bool) { caseLine(stderr, r, ran, len(p.Cases)) }
	}
	fmt.Fprintf(stdout, "%s: %d bolts, %d classes; %d of them (%s) into %s\n", p.Model, len(p.Bolts), len(p.Cases), n, shard, f.dir)
	recs, err := sweep.Run(ctx, p.Cases, opt)
	if bar != nil {
		_ = bar.Finish()
	}
	if err != nil && ctx.Err() == nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return exitAnalysis
	}
	if ctx.Err() != nil {
		fmt.Fprintf(stderr, "flangeseg ring: interrupted: %s; run the same command again to do what is missing\n", sweep.Count(recs))
		return exitAnalysis
	}
	if !shard.Whole() {
		t := sweep.Count(recs)
		fmt.Fprintf(stdout, "%s: %s\nafter the last shard: flangeseg ring %s --survey %s -o %s --collect\n", shard, t, p.Model, p.Survey, f.dir)
		if t.Missing > 0 {
			return exitAnalysis
		}
	}
	return exitOK
}

// collectRing reads the classes' records and writes the ring's results.
func collectRing(p *ring.Plan, f ringFlags, stdout, stderr io.Writer) int {
	if !results.IsResult(f.dir) {
		fmt.Fprintf(stderr, "flangeseg ring: --collect: %s is not a ring check's directory (no %s)\n", f.dir, results.MarkerFile)
		return exitBadInput
	}
	recs, err := sweep.Collect(f.dir, p.Cases)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: collecting %s: %v\n", f.dir, err)
		return exitAnalysis
	}
	t := sweep.Count(recs)
	if t.Missing > 0 {
		fmt.Fprintf(stderr, "flangeseg ring: %s: classes missing; run their shards (or the same command without --collect) first\n", t)
		for _, r := range recs {
			if r.Status == sweep.Missing {
				fmt.Fprintf(stderr, "  %s: %s\n", r.Name, r.Reason)
			}
		}
		return exitAnalysis
	}
	fat := f.fat
	fat.Loads = f.loads
	res, err := ring.Evaluate(f.dir, p, recs, fat)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: %v\n", err)
		return exitBadInput
	}
	if err := res.Write(f.dir); err != nil {
		fmt.Fprintf(stderr, "flangeseg ring: writing results: %v\n", err)
		return exitAnalysis
	}
	for _, w := range res.Warnings {
		fmt.Fprintf(stderr, "flangeseg ring: warning: %s\n", w)
	}
	fmt.Fprintf(stdout, "%s: %d bolts, %d classes: %s\n", p.Spec.Title, len(res.Bolts), len(recs), t)
	for _, line := range res.Finding() {
		fmt.Fprintln(stdout, "  "+line)
	}
	fmt.Fprintf(stdout, "ring.csv, ring.json, ring_spectrum.csv, ring_functions.csv, plots/ and report.html in %s\n", f.dir)
	switch {
	case !t.AllFinished():
		return exitAnalysis
	case len(res.OverDamage) > 0:
		return exitFailed
	}
	return exitOK
}
