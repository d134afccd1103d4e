package main

import (
	"flag"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/note"
	"flangeseg/post/results"
)

func runCompare(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("compare", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "compare_results", "write each model's run into `DIR`/NAME and the comparison into DIR")
	verbose := fs.Bool("verbose", false, "log every Newton iteration on stderr (runs the models one by one)")
	limit := addMemoryFlag(fs)
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg compare A.toml B.toml [C.toml ...] [-o DIR] [--verbose] [--max-memory SIZE]

Runs several models side by side (one per core) and compares them: a table
of initial stiffness, secant stiffness to the reference load, load factor,
opening and decompression load, peak segment force, displacement at the end
and failure mechanism, each with its ratio to the first model. The table is
printed and written to DIR/comparison.csv; DIR/compare_Fs_Z and
DIR/compare_Z_u (SVG and PNG) overlay the curves; each model's own results
are in DIR/NAME, NAME being its file name without .toml.

Typical uses: defined contact bands against a flat face, a fully threaded
against a partially threaded bolt, another flange thickness.

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
	if fs.NArg() < 2 {
		fmt.Fprintln(stderr, "flangeseg compare: want two or more model files; run 'flangeseg compare --help'")
		return exitBadInput
	}
	jobs, names, ok := compareJobs(fs.Args(), stderr)
	if !ok {
		return exitBadInput
	}
	specs, paths := make([]*modelfile.Spec, len(jobs)), make([]string, len(jobs))
	for i, j := range jobs {
		specs[i], paths[i] = j.Spec, j.Path
	}
	if !checkSizes(specs, paths, limit, stderr) {
		return exitBadInput
	}
	return runSideBySide(*outDir, "compare", jobs, *verbose, stdout, stderr, func(staged string, sums []results.Summary) int {
		compareTable(stdout, names, sums)
		if err := note.WriteCompare(staged, names, jobs, sums); err != nil {
			fmt.Fprintf(stderr, "flangeseg compare: writing the report: %v\n", err)
			return exitAnalysis
		}
		paths, dirs := make([]string, len(jobs)), make([]string, len(jobs))
		for i, j := range jobs {
			paths[i], dirs[i] = j.Path, j.Dir
		}
		if err := results.WriteComparison(staged, names, paths, dirs, sums); err != nil {
			fmt.Fprintf(stderr, "flangeseg compare: writing the comparison: %v\n", err)
			return exitAnalysis
		}
		fmt.Fprintf(stdout, "comparison in %s\n", *outDir)
		return exitOK
	})
}

// compareJobs loads every model (all errors are reported before any run)
// and gives each a run directory named after its file (relative to the
// comparison's directory).
func compareJobs(paths []string, stderr io.Writer) ([]note.ModelJob, []string, bool) {
	var jobs []note.ModelJob
	var names []string
	used := map[string]int{}
	ok := true
	for _, path := range paths {
		spec, loaded := loadOrReport(path, "compare", stderr)
		if !loaded {
			ok = false
			continue
		}
		name := fileStem(strings.TrimSuffix(filepath.Base(path), filepath.Ext(path)))
		if name == "" {
			name = "model"
		}
		used[name]++
		if n := used[name]; n > 1 {
			name = fmt.Sprintf("%s_%d", name, n)
		}
		names = append(names, name)
		jobs = append(jobs, note.ModelJob{Spec: spec, Path: path, Dir: name})
	}
	return jobs, names, ok
}
