package main

import (
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"text/tabwriter"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/note"
	"flangeseg/post/results"
)

func runDemo(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("demo", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "demo_results", "write each demo model's results into `DIR`/flat and DIR/bands")
	printModel := fs.Bool("print-model", false, "print the demo model files (TOML) and exit")
	verbose := fs.Bool("verbose", false, "log every Newton iteration on stderr")
	toFailure := fs.Bool("to-failure", false, "instead, load the flat-face joint to failure (elastoplastic, large deformation; about half a minute) into DIR/flat_to_failure")
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg demo [-o DIR] [--print-model] [--verbose] [--to-failure]

Runs the built-in demo joint — a tower L-flange of our own invention, once
with a flat contact face and once with defined contact bands near the
shell and the free edge — and prints how their stiffness and bolt-force
behaviour compare. --print-model shows the model files; copy one as the
start of your own. The two variants are linear elastic, for the service
range; --to-failure runs the flat-face joint with yielding and large
deformation until the bolt ruptures or 30 mm, and states its ultimate load
against the hand methods.

DIR must be new, empty or an earlier flangeseg result (it holds
flangeseg_result.txt), which is replaced whole; anything else is refused.
Ctrl-C or SIGTERM stops the analysis after the increment in hand, writes
what converged and exits 3.

%s

Flags:
`, caution)
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return parseExit(err)
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "flangeseg demo: unexpected argument %q\n", fs.Arg(0))
		return exitBadInput
	}
	models := demoModels()
	if *toFailure {
		spec, err := modelfile.Decode(models[0].Data)
		if err != nil {
			fmt.Fprintf(stderr, "demo: %v\n", err)
			return exitBadInput
		}
		toFailureVariant(spec)
		return runToFailure(spec, *outDir, *verbose, stdout, stderr)
	}
	if *printModel {
		for _, m := range models {
			fmt.Fprintf(stdout, "# ---- demo/%s.toml ----\n%s\n", m.Name, m.Data)
		}
		return exitOK
	}
	jobs := make([]note.ModelJob, len(models))
	for i, m := range models {
		spec, err := modelfile.Decode(m.Data)
		if err != nil {
			fmt.Fprintf(stderr, "demo %s: %v\n", m.Name, err)
			return exitBadInput
		}
		jobs[i] = note.ModelJob{Spec: spec, Path: m.Name + ".toml", Dir: m.Name, Text: m.Data}
	}
	names := []string{"flat face", "defined bands"}
	return runSideBySide(*outDir, "demo", jobs, *verbose, stdout, stderr, func(staged string, sums []results.Summary) int {
		compareTable(stdout, names, sums)
		if err := note.WriteCompare(staged, names, jobs, sums); err != nil {
			fmt.Fprintf(stderr, "flangeseg demo: writing the report: %v\n", err)
			return exitAnalysis
		}
		return exitOK
	})
}

// runToFailure runs the demo to failure into dir/flat_to_failure. dir
// must be new, empty or an earlier result, and is marked as one, so that
// a later demo into dir replaces it whole.
func runToFailure(spec *modelfile.Spec, dir string, verbose bool, stdout, stderr io.Writer) int {
	if err := results.CheckOutDir(dir); err != nil {
		fmt.Fprintf(stderr, "flangeseg demo: %v\n", err)
		return exitBadInput
	}
	sub := filepath.Join(dir, "flat_to_failure")
	if err := results.CheckOutDir(sub); err != nil {
		fmt.Fprintf(stderr, "flangeseg demo: %v\n", err)
		return exitBadInput
	}
	ctx, release := interruptible()
	defer release()
	code := runModel(ctx, note.ModelJob{Spec: spec, Path: "flat.toml, to failure", Dir: sub}, runFlags{verbose: verbose, stage: true}, stdout, stderr)
	if _, err := os.Stat(sub); err == nil && !results.IsResult(dir) {
		if err := results.Mark(dir, results.KindComparison); err != nil {
			fmt.Fprintf(stderr, "flangeseg demo: %v\n", err)
			return exitAnalysis
		}
	}
	return code
}

// toFailureVariant turns the flat-face demo into its analysis to failure:
// yielding, large deformation, and a displacement well past the bolt's
// rupture.
func toFailureVariant(s *modelfile.Spec) {
	s.Title += ", to failure"
	s.Analysis.Materials, s.Analysis.LargeDeformation = modelfile.Elastoplastic, true
	s.Load.MaxDisplacement, s.Load.Increments = 30, 60
}

// compareTable prints the joint figures of several runs with their ratio
// to the first.
func compareTable(w io.Writer, names []string, sums []results.Summary) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "quantity\t")
	for i, n := range names {
		fmt.Fprintf(tw, "%s\t", n)
		if i > 0 {
			fmt.Fprint(tw, "ratio\t")
		}
	}
	fmt.Fprintln(tw)
	for _, r := range results.ComparedFigures() {
		fmt.Fprintf(tw, "%s\t", r.Label)
		for i, s := range sums {
			if v, ok := r.Get(s); ok {
				fmt.Fprintf(tw, "%.3g\t", v)
			} else {
				fmt.Fprint(tw, "not reached\t")
			}
			if i > 0 {
				if q, ok := r.Ratio(s, sums[0]); ok {
					fmt.Fprintf(tw, "%.3f\t", q)
				} else {
					fmt.Fprint(tw, "—\t")
				}
			}
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	fmt.Fprintln(w, "failure mechanism:")
	for i, s := range sums {
		fmt.Fprintf(w, "  %s: %s\n", names[i], s.Joint.FailureLocation)
	}
	if len(sums) > 0 {
		fmt.Fprintf(w, "reference load: %.0f kN (%s)\n", sums[0].Joint.ReferenceLoadKN, sums[0].Joint.ReferenceFrom)
	}
}
