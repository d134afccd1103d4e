package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/schollz/progressbar/v3"

	"golang.org/x/term"

	"flangeseg/fem"
	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/fem/sparse"
	"flangeseg/post/note"
	"flangeseg/post/results"
)

func runRun(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("run", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "", "write the results into this `DIR` (default: the model file's name without .toml, plus _results)")
	verbose := fs.Bool("verbose", false, "log every Newton iteration on stderr")
	dump := fs.String("dump-matrix", "", "write the first assembled tangent and residual in Matrix Market form into this `DIR`")
	limit := addMemoryFlag(fs)
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg run MODEL.toml [-o DIR] [--verbose] [--dump-matrix DIR] [--max-memory SIZE]

Builds the finite-element model of one bolt segment from MODEL.toml,
preloads the bolt, loads the segment in tension by moving the shell end and
writes into DIR: history.csv (one row per converged increment), summary.json
(preload, stiffness, load factor, opening and decompression load, peak,
hand methods), plots (SVG and PNG), the fields as VTK (fields/*.vtu,
compressed binary, and fields.pvd; [output] field_states chooses the
states: "key" by default, the end of the preload, the opening, the
decompression, the peak and the last; "all"; or "every N") and
model.resolved.toml (the model with every default filled in). Exit codes: 0 done, 2 bad model file, 3 the analysis stopped before
its end (results up to the last converged increment are written).

DIR must be new, empty or an earlier flangeseg result (it holds
flangeseg_result.txt), which is replaced whole; anything else is refused.
Ctrl-C or SIGTERM stops the analysis after the increment in hand, writes
what converged and exits 3.

%s

Flags:
`, caution)
		fs.PrintDefaults()
	}
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg run: give exactly one model file (flangeseg run MODEL.toml -o DIR)")
		return exitBadInput
	}
	path := fs.Arg(0)
	dir := *outDir
	if dir == "" {
		dir = strings.TrimSuffix(filepath.Base(path), ".toml") + "_results"
	}
	spec, ok := loadOrReport(path, "run", stderr)
	if !ok {
		return exitBadInput
	}
	if _, err := checkSize(spec, limit, 0); err != nil {
		reportModelError(path, err, stderr)
		return exitBadInput
	}
	if err := results.CheckOutDir(dir); err != nil {
		fmt.Fprintf(stderr, "flangeseg run: %v\n", err)
		return exitBadInput
	}
	if *dump != "" && filepath.Clean(*dump) == filepath.Clean(dir) {
		fmt.Fprintf(stderr, "flangeseg run: --dump-matrix = %s: must differ from -o (each is a result directory of its own)\n", *dump)
		return exitBadInput
	}
	ctx, release := interruptible()
	defer release()
	return runModel(ctx, note.ModelJob{Spec: spec, Path: path, Dir: dir}, runFlags{verbose: *verbose, dump: *dump, stage: true}, stdout, stderr)
}

// runFlags are the options of a run that do not come from the model file.
type runFlags struct {
	verbose bool
	dump    string // --dump-matrix directory, or ""
	// progress, if set, receives the increments done instead of a
	// progress bar of the run's own (demo runs several models at once).
	progress func(done int)
	// stage: the run writes its results under a temporary name beside
	// the job's Dir and renames them into place whole (results.Stage);
	// without it the job's Dir lies inside a directory that is staged
	// already (demo, compare), and shown is how messages name it.
	stage bool
	shown string
}

// shownDir is the job's results directory as messages name it.
func (f runFlags) shownDir(job note.ModelJob) string {
	if f.shown != "" {
		return f.shown
	}
	return job.Dir
}

// runModel runs one valid model and writes its results; it returns the
// exit code. ctx ending stops the analysis at its next safe point; what
// converged is written and the exit code is exitAnalysis.
func runModel(ctx context.Context, job note.ModelJob, flags runFlags, stdout, stderr io.Writer) int {
	spec, path := job.Spec, job.Path
	for _, w := range spec.Derive().Warnings {
		fmt.Fprintf(stderr, "%s: warning: %s\n", path, w)
	}
	seg, err := segment.Build(spec)
	if err != nil {
		reportModelError(path, err, stderr)
		return exitBadInput
	}
	opt, finish, err := runOptions(path, spec, flags, stderr)
	if err != nil {
		fmt.Fprintf(stderr, "%s: %v\n", path, err)
		return exitBadInput
	}
	start := time.Now()
	res, err := seg.Run(ctx, opt)
	finish()
	switch {
	case err != nil && ctx.Err() != nil:
		fmt.Fprintf(stderr, "%s: interrupted (%v) before the preload converged; nothing written\n", path, context.Cause(ctx))
		return exitAnalysis
	case err != nil:
		fmt.Fprintf(stderr, "%s: analysis: %v\n", path, err)
		return exitAnalysis
	}
	shown := flags.shownDir(job)
	sum, err := writeRun(job, flags.stage, res)
	if err != nil {
		fmt.Fprintf(stderr, "%s: writing results: %v\n", path, err)
		return exitAnalysis
	}
	printSummary(stdout, sum, res.Timing, shown, time.Since(start))
	switch {
	case segment.IsInterrupted(res.Failure):
		fmt.Fprintf(stderr, "%s: %v\neverything up to that state is written in %s (summary.json says \"interrupted\")\n", path, res.Failure, shown)
		return exitAnalysis
	case res.Failure != nil:
		fmt.Fprintf(stderr, "%s: the analysis stopped: %v\n%s\nresults up to the last converged increment are in %s\n", path, res.Failure, res.Diagnosis, shown)
		return exitAnalysis
	}
	return exitOK
}

// runOptions are the segment options of flags: the matrix dump, the
// Newton log or a progress bar; finish ends the progress bar.
func runOptions(path string, spec *modelfile.Spec, flags runFlags, stderr io.Writer) (opt segment.Options, finish func(), err error) {
	finish = func() {}
	if flags.dump != "" {
		// The directory follows the output-directory rule and is put in
		// place whole once the run ends, however it ends.
		st, err := results.Stage(flags.dump)
		if err != nil {
			return opt, finish, fmt.Errorf("--dump-matrix: %w", err)
		}
		opt.Inspect = func(k *sparse.Matrix, rhs []float64) error {
			return dumpSystem(st.Dir, strings.TrimSuffix(filepath.Base(path), ".toml")+" first tangent", k, rhs)
		}
		finish = func() {
			if err := st.Commit(results.KindMatrices); err != nil {
				fmt.Fprintf(stderr, "%s: --dump-matrix: %v\n", path, err)
			}
		}
	}
	switch {
	case flags.verbose:
		opt.Log = func(line string) { fmt.Fprintln(stderr, line) }
	case flags.progress != nil:
		opt.Progress = func(done, _ int) { flags.progress(done) }
	default:
		if bar := progressBar(stderr, spec.Load.Increments, filepath.Base(path)); bar != nil {
			opt.Progress = func(done, _ int) { _ = bar.Set(done) }
			commit := finish
			finish = func() { _ = bar.Finish(); commit() }
		}
	}
	return opt, finish, nil
}

// writeRun writes a run's results and its calculation note into the
// job's Dir: staged (under a temporary name, then renamed into place
// whole, replacing an earlier result) or straight into a directory that
// is itself staged. Either way the directory is marked as a run's result.
func writeRun(job note.ModelJob, stage bool, res *segment.Result) (sum results.Summary, err error) {
	write := func(dir string) error {
		if sum, err = results.Write(dir, job.Path, res); err != nil {
			return err
		}
		return note.WriteRun(dir, job.Path, job.Text, res, sum)
	}
	if stage {
		return sum, results.WriteStaged(job.Dir, results.KindRun, write)
	}
	if err := write(job.Dir); err != nil {
		return sum, err
	}
	return sum, results.Mark(job.Dir, results.KindRun)
}

// progressBar returns a bar on a terminal, nil in pipes and CI.
func progressBar(w io.Writer, n int, name string) *progressbar.ProgressBar {
	f, ok := w.(*os.File)
	if !ok || !term.IsTerminal(int(f.Fd())) || os.Getenv("CI") != "" {
		return nil
	}
	return progressbar.NewOptions(n, progressbar.OptionSetWriter(w), progressbar.OptionSetDescription(name),
		progressbar.OptionClearOnFinish(), progressbar.OptionShowCount())
}

// reorderFlags puts flags before positional arguments, so that
// `run MODEL.toml -o DIR` parses like `run -o DIR MODEL.toml`; a flag of
// fs that is not boolean takes the next argument.
func reorderFlags(fs *flag.FlagSet, args []string) []string {
	var flags, pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		switch {
		case a == "--":
			pos = append(pos, args[i+1:]...)
			i = len(args)
		case strings.HasPrefix(a, "-") && a != "-":
			flags = append(flags, a)
			name := strings.TrimLeft(a, "-")
			if strings.Contains(name, "=") || i+1 >= len(args) {
				continue
			}
			if fl := fs.Lookup(name); fl != nil {
				if b, ok := fl.Value.(interface{ IsBoolFlag() bool }); !ok || !b.IsBoolFlag() {
					flags = append(flags, args[i+1])
					i++
				}
			}
		default:
			pos = append(pos, a)
		}
	}
	return append(flags, pos...)
}

func kNOr(p *float64) string {
	if p == nil {
		return "not reached"
	}
	return fmt.Sprintf("%.1f kN", *p)
}

func kNPerMMOr(p *float64) string {
	if p == nil {
		return "—"
	}
	return fmt.Sprintf("%.0f kN/mm", *p)
}

func printSummary(w io.Writer, s results.Summary, tm fem.Timing, dir string, took time.Duration) {
	j := s.Joint
	fmt.Fprintf(w, "%s\n", s.Title)
	fmt.Fprintf(w, "  preload               %.1f kN (target %.1f kN)\n", j.PreloadReachedKN, j.PreloadTargetKN)
	fmt.Fprintf(w, "  stiffness at Z = 0    %.0f kN/mm (joint alone %.0f kN/mm)\n", j.StiffnessTangentZero, j.JointStiffnessTangent)
	fmt.Fprintf(w, "  secant to %.0f kN     %s (joint alone %s)\n", j.ReferenceLoadKN, kNPerMMOr(j.StiffnessToReference), kNPerMMOr(j.JointStiffnessReference))
	fmt.Fprintf(w, "  load factor at Z = 0  %.3f\n", j.LoadFactorTangentZero)
	opening := kNOr(j.OpeningLoadKN)
	if j.OpenAfterPreload {
		opening = "0 kN: the shell-side corner is open (gap > 1 µm) after preload already"
	}
	if c := j.Closure; c != nil {
		fmt.Fprintf(w, "  face after preload    %s\n", c.Note)
		fmt.Fprintf(w, "  closing force         %s\n", closingLine(c))
	}
	fmt.Fprintf(w, "  opening load          %s\n", opening)
	fmt.Fprintf(w, "  decompression load    %s\n", kNOr(j.DecompressionKN))
	fmt.Fprintf(w, "  largest Z             %.1f kN at u = %.3f mm (%s)\n", j.PeakLoadKN, j.DisplacementPeakMM, s.Ending)
	fmt.Fprintf(w, "  hand ultimate load    %.1f kN (%s)\n", j.HandUltimateKN, j.HandUltimateBasis)
	fmt.Fprintf(w, "  FE versus hand        %s\n", j.FEVersusHand)
	if s.Joint.FailureLocation != "" {
		fmt.Fprintf(w, "  failure mechanism     %s\n", j.FailureLocation)
	}
	if v := s.Verdict; v != nil {
		for _, l := range v.Lines {
			fmt.Fprintf(w, "  hand utilisation      %.3f of Z_u = %.1f kN for Z_Ed = %.1f kN, %s (%s)\n", l.Utilisation, l.CapacityKN, v.DesignForceKN, l.Status, l.Method)
		}
	}
	fmt.Fprintf(w, "  largest penetration   %.2g mm\n", j.PenetrationMaxMM)
	fmt.Fprintf(w, "  %d equations, %d increments, %d Newton iterations, %.1f s; results in %s\n",
		s.Mesh.Equations, s.Solver.Increments, s.Solver.NewtonIterations, took.Seconds(), dir)
	fmt.Fprintf(w, "  solver time           assembly %.2f s, contact %.2f s, ordering %.2f s, factorization %.2f s, solves %.2f s\n",
		tm.Assembly.Seconds(), tm.Contact.Seconds(), tm.Analysis.Seconds(), tm.Factorization.Seconds(), tm.Solve.Seconds())
}

// closingLine is the bolt force the closing of an initial gap took, its
// share of the preload and the levels of the separate tightening that
// bracket it, or why it was not found.
func closingLine(c *figures.Closure) string {
	if c.ClosingForceKN == nil || c.ClosingShare == nil {
		return "not found (see the note above)"
	}
	if *c.ClosingForceKN == 0 && len(c.ClosingBetweenKN) == 0 && c.GapLeftMM <= figures.OpenGap {
		return "none: the faces touch within 1 µm before any tightening"
	}
	line := fmt.Sprintf("%.1f kN (%.0f %% of the preload)", *c.ClosingForceKN, 100**c.ClosingShare)
	if b := c.ClosingBetweenKN; len(b) == 2 {
		line += fmt.Sprintf(", between the free-end tightening levels at %.1f and %.1f kN", b[0], b[1])
	}
	if k := c.ClosingSearch; k != nil {
		line += fmt.Sprintf("; that tightening: %d levels, %d Newton iterations", k.Levels, k.NewtonIterations)
	}
	return line
}
