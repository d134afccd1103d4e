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
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg run MODEL.toml [-o DIR] [--verbose] [--dump-matrix DIR]

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
	spec, err := modelfile.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	return runModel(note.ModelJob{Spec: spec, Path: path, Dir: dir}, runFlags{verbose: *verbose, dump: *dump}, stdout, stderr)
}

// runFlags are the options of a run that do not come from the model file.
type runFlags struct {
	verbose bool
	dump    string // --dump-matrix directory, or ""
	// progress, if set, receives the increments done instead of a
	// progress bar of the run's own (demo runs several models at once).
	progress func(done int)
}

// runModel runs one valid model and writes its results; it returns the
// exit code.
func runModel(job note.ModelJob, flags runFlags, stdout, stderr io.Writer) int {
	spec, path, dir := job.Spec, job.Path, job.Dir
	for _, w := range spec.Derive().Warnings {
		fmt.Fprintf(stderr, "%s: warning: %s\n", path, w)
	}
	seg, err := segment.Build(spec)
	if err != nil {
		fmt.Fprintf(stderr, "%s: %v\n", path, err)
		return exitBadInput
	}
	var opt segment.Options
	if flags.dump != "" {
		if err := os.MkdirAll(flags.dump, 0o755); err != nil {
			fmt.Fprintf(stderr, "%s: --dump-matrix: %v\n", path, err)
			return exitBadInput
		}
		opt.Inspect = func(k *sparse.Matrix, rhs []float64) error {
			return dumpSystem(flags.dump, strings.TrimSuffix(filepath.Base(path), ".toml")+" first tangent", k, rhs)
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
			defer bar.Finish()
		}
	}
	start := time.Now()
	res, err := seg.Run(context.Background(), opt)
	if err != nil {
		fmt.Fprintf(stderr, "%s: analysis: %v\n", path, err)
		return exitAnalysis
	}
	sum, err := results.Write(dir, path, res)
	if err == nil {
		err = note.WriteRun(dir, path, job.Text, res, sum)
	}
	if err != nil {
		fmt.Fprintf(stderr, "%s: writing results: %v\n", path, err)
		return exitAnalysis
	}
	printSummary(stdout, sum, dir, time.Since(start))
	if res.Failure != nil {
		fmt.Fprintf(stderr, "%s: the analysis stopped: %v\n%s\nresults up to the last converged increment are in %s\n", path, res.Failure, res.Diagnosis, dir)
		return exitAnalysis
	}
	return exitOK
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

func printSummary(w io.Writer, s results.Summary, dir string, took time.Duration) {
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
}

// closingLine is the bolt force the closing of an initial gap took, its
// share of the preload and the levels of the separate tightening that
// bracket it, or why it was not found.
func closingLine(c *figures.Closure) string {
	if c.ClosingForceKN == nil || c.ClosingShare == nil {
		return "not found (see the note above)"
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
