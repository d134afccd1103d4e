package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/fatigue"
	"flangeseg/post/fatigue/assess"
	"flangeseg/post/results"
)

// fatigueFlags are the options of `flangeseg fatigue`: the output
// directory and the assessment's own.
type fatigueFlags struct {
	out string
	assess.Options
}

func runFatigue(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("fatigue", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var f fatigueFlags
	fs.StringVar(&f.Loads, "loads", "", "the load `FILE` (CSV; layouts below)")
	fs.StringVar(&f.From, "from", "", "take the FE bolt-force function from `RUN_DIR`/history.csv of 'flangeseg run' on the same model")
	fs.StringVar(&f.out, "o", "", "write the results into `DIR` (default: the model file's name without .toml, plus _fatigue)")
	fs.StringVar(&f.Curve, "sn-curve", assess.CurveEN1993Bolt, "S–N curve: "+assess.CurveEN1993Bolt+" or a CSV `FILE` of points cycles,stress_range_MPa")
	fs.StringVar(&f.Stress, "stress", assess.StressAxialBending, "FE bolt stress: "+assess.StressAxialBending+" or "+assess.StressAxial)
	fs.Float64Var(&f.GammaMf, "gamma-mf", 0, "partial factor γ_Mf on the fatigue strength (EN 1993-1-9 Table 3.1: 1.00 to 1.35); overrides [fatigue] gamma_mf of the model (default 1.15)")
	fs.Float64Var(&f.RefCycles, "reference-cycles", 2e6, "reference number of cycles `N_ref` of the damage-equivalent stress range")
	fs.Float64Var(&f.RefSlope, "reference-slope", 3, "slope `m` of the damage-equivalent stress range")
	fs.Float64Var(&f.BinWidth, "bin-width", 0, "width of the stress-range bins in the outputs, `MPa` (a multiple of 0.1; 0: chosen for at most 25 bins)")
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
	spec, ok := loadOrReport(path, "fatigue", stderr)
	if !ok {
		return exitBadInput
	}
	if err := results.CheckOutDir(f.out); err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: %v\n", err)
		return exitBadInput
	}
	if f.GammaMf == 0 {
		f.GammaMf = spec.Fatigue.GammaMf
	}
	job, err := assess.New(spec, path, f.Options)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: %v\n", err)
		return exitBadInput
	}
	for _, w := range job.Warnings() {
		fmt.Fprintf(stderr, "flangeseg fatigue: warning: %s\n", w)
	}
	if err := job.Count(); err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: --loads %s: %v\n", f.Loads, err)
		return exitBadInput
	}
	if err := results.WriteStaged(f.out, results.KindFatigue, job.Write); err != nil {
		fmt.Fprintf(stderr, "flangeseg fatigue: writing results: %v\n", err)
		return exitAnalysis
	}
	printFatigue(stdout, spec.Title, f, job)
	if job.Functions()[0].Damage() > 1 {
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
  trilinear      the hand segment model (Schmidt/Neuper), axial only;
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
`, assess.CurveEN1993Bolt, caution)
	fs.PrintDefaults()
}

// check reports every flag that breaks its rule, one per line.
func (f fatigueFlags) check() error {
	var errs []error
	bad := func(flag string, v float64, rule string) {
		errs = append(errs, fmt.Errorf("flangeseg fatigue: --%s = %s: %s", flag, modelfile.FormatNumber(v), rule))
	}
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	if f.Loads == "" {
		errs = append(errs, errors.New("flangeseg fatigue: --loads: missing: give the load file (layouts in 'flangeseg fatigue --help')"))
	}
	if f.Stress != assess.StressAxialBending && f.Stress != assess.StressAxial {
		errs = append(errs, fmt.Errorf("flangeseg fatigue: --stress = %q: must be %q or %q", f.Stress, assess.StressAxialBending, assess.StressAxial))
	}
	if f.GammaMf != 0 && (!finite(f.GammaMf) || f.GammaMf < 1) {
		bad("gamma-mf", f.GammaMf, "must be a finite number ≥ 1 (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35)")
	}
	if !finite(f.RefCycles) || !(f.RefCycles > 0) {
		bad("reference-cycles", f.RefCycles, "must be a finite number > 0")
	}
	if !finite(f.RefSlope) || !(f.RefSlope > 0) {
		bad("reference-slope", f.RefSlope, "must be a finite number > 0")
	}
	k := f.BinWidth / assess.FineBin
	if !finite(f.BinWidth) || f.BinWidth < 0 || math.Abs(k-math.Round(k)) > 1e-9*math.Max(k, 1) {
		bad("bin-width", f.BinWidth, "must be 0 (chosen by the tool) or a positive multiple of 0.1 MPa")
	}
	return errors.Join(errs...)
}

// printFatigue prints what the assessment found.
func printFatigue(w io.Writer, title string, f fatigueFlags, j *assess.Job) {
	in, curve := j.Info(), j.Curve()
	fmt.Fprintf(w, "Bolt fatigue: %s\n", title)
	loads := fmt.Sprintf("%s: %s, %d lines, %.4g cycles, Z from %.1f to %.1f kN", f.Loads, in.Kind, in.Rows, in.Cycles, in.ZMin/1e3, in.ZMax/1e3)
	if in.Kind.Series() {
		loads += fmt.Sprintf(" (rainflow, residue as half cycles; at most %d turning points held)", in.MaxStack)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "  loads\t%s\n", loads)
	fmt.Fprintf(tw, "  S–N curve\t%s; cut-off %.4g MPa\n", curve.Name(), curve.CutOff())
	fmt.Fprintf(tw, "  partial factor\tγ_Mf = %g (stress ranges × γ_Mf on the curve)\n", f.GammaMf)
	fmt.Fprintf(tw, "  bolt\tA_s = %.5g mm², W = π·d_s³/32 = %.5g mm³\n", j.StressArea(), fatigue.SectionModulus(j.StressArea()))
	tw.Flush()
	fmt.Fprintln(w)
	row := func(tw io.Writer, label string, cell func(*assess.Function) string) {
		cells := []string{"  " + label}
		for _, b := range j.Functions() {
			cells = append(cells, cell(b))
		}
		fmt.Fprintln(tw, strings.Join(cells, "\t"))
	}
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row(tw, "", func(b *assess.Function) string { return b.Label() })
	row(tw, "stress", func(b *assess.Function) string { return b.Basis().String() })
	row(tw, "damage D", func(b *assess.Function) string { return fmt.Sprintf("%.4g", b.Damage()) })
	row(tw, fmt.Sprintf("Δσ_eq at N = %.3g, m = %g [MPa]", f.RefCycles, f.RefSlope),
		func(b *assess.Function) string { return fmt.Sprintf("%.4g", b.EquivalentRange()) })
	row(tw, "largest Δσ [MPa]", func(b *assess.Function) string { return fmt.Sprintf("%.4g", b.MaxRange()) })
	tw.Flush()
	gov := j.Functions()[0]
	fmt.Fprintf(w, "\nGoverning stress-range bins (%s, the largest damage first):\n", gov.Label())
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  Δσ [MPa]\tcycles\tdamage\tshare")
	top := j.GoverningBins(j.Bins()[0], 5)
	for _, b := range top {
		fmt.Fprintf(tw, "  %.4g – %.4g\t%.6g\t%.4g\t%.1f %%\n", b.From, b.To, b.Cycles, b.Damage, 100*b.Damage/gov.Damage())
	}
	tw.Flush()
	if len(top) == 0 {
		fmt.Fprintln(w, "  none: every stress range lies below the cut-off")
	}
	verdict := "D ≤ 1"
	if gov.Damage() > 1 {
		verdict = "D > 1: the bolt does not reach the fatigue life of this spectrum"
	}
	fmt.Fprintf(w, "\n%s (%s). Results in %s\n%s\n", verdict, gov.Label(), f.out, caution)
}
