package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"flangeseg/post/results"
	"flangeseg/post/sweep"
	"flangeseg/post/sweep/plan"
)

// sweepFlags are the flags of flangeseg sweep.
type sweepFlags struct {
	dir           string
	jobs, shards  int
	shard         string
	collect, list bool
	allFields     bool
}

func runSweep(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("sweep", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var f sweepFlags
	fs.StringVar(&f.dir, "o", "", "write the cases into `DIR`/cases/NAME and the tables into DIR (default: the plan's name without .toml, plus _sweep)")
	fs.IntVar(&f.jobs, "jobs", 0, "run `K` cases side by side (default: as many as the cores the process may use)")
	fs.StringVar(&f.shard, "shard", "", "run only part `I/N` of the cases: those whose index i has (i−1) mod N = I−1 (default: from SLURM_ARRAY_TASK_ID or JOB_COMPLETION_INDEX, else all)")
	fs.IntVar(&f.shards, "shards", 0, "the number of shards `N` of a Kubernetes indexed Job (its completions), with JOB_COMPLETION_INDEX (default: FLANGESEG_SHARDS)")
	fs.BoolVar(&f.collect, "collect", false, "run nothing: build sweep.csv, sweep.json, the plots and report.html from the case folders and list the cases missing")
	fs.BoolVar(&f.allFields, "all-fields", false, "keep every increment of each case, so that output.field_states chooses its field files (VTK) as in run (default: the preload and the last increment only)")
	fs.BoolVar(&f.list, "list", false, "run nothing: print the cases with their index, name and values")
	fs.Usage = func() { sweepUsage(fs, stderr) }
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg sweep: give exactly one plan file (flangeseg sweep PLAN.toml -o DIR); run 'flangeseg sweep --help'")
		return exitBadInput
	}
	path := fs.Arg(0)
	if f.dir == "" {
		f.dir = strings.TrimSuffix(filepath.Base(path), ".toml") + "_sweep"
	}
	p, cases, err := plan.Load(path)
	if err != nil {
		var pe *plan.Error
		fmt.Fprintln(stderr, err)
		if errors.As(err, &pe) {
			fmt.Fprintf(stderr, "%s: plan is invalid (%d %s); nothing was run\n", path, len(pe.Errs), plural(len(pe.Errs), "error", "errors"))
		}
		return exitBadInput
	}
	shard, code := sweepShard(f, stderr)
	if code != exitOK {
		return code
	}
	switch {
	case f.list:
		listCases(stdout, cases, shard)
		return exitOK
	case f.collect:
		return collectSweep(p, cases, f.dir, stdout, stderr)
	}
	// DIR is marked as a sweep's before any case runs, so that the same
	// command run again (a resume, another shard) finds its own result
	// there, while a directory of anything else is refused.
	if err := results.CheckOutDir(f.dir); err != nil {
		fmt.Fprintf(stderr, "flangeseg sweep: %v\n", err)
		return exitBadInput
	}
	err = os.MkdirAll(f.dir, 0o755)
	if err == nil {
		err = results.Mark(f.dir, results.KindSweep)
	}
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg sweep: %v\n", err)
		return exitAnalysis
	}
	return runSweepCases(p, cases, f, shard, stdout, stderr)
}

func sweepUsage(fs *flag.FlagSet, w io.Writer) {
	fmt.Fprintf(w, `Usage: flangeseg sweep PLAN.toml [-o DIR] [--jobs K] [--shard I/N] [--shards N]
                       [--collect] [--list] [--all-fields]

Runs a parameter sweep: the cases of the plan file, each the plan's base
model with some keys set, K side by side. Each case is an ordinary run in
DIR/cases/NAME (model.toml, model.resolved.toml, history.csv, summary.json,
plots, report.html, and the fields of the preload and the last increment
unless --all-fields) finished by case.json, which holds the SHA-256
of its resolved model: a case whose case.json matches is not run again, so
an interrupted sweep, run again, does only what is missing. Then DIR gets
sweep.csv and sweep.json (one row a case: index, name, varied values, every
joint figure of the summary, ending, status, exit status, reason, time_s),
plots/ (each joint figure against each varied key, the curves of every
case) and report.html, the sweep page.

The plan file (TOML; unknown keys and broken rules are errors, all
reported at once, before anything runs):

  title   = "Recess depth against band width"   # optional
  base    = "joint.toml"      # the base model, relative to the plan file
  combine = "grid"            # "grid" (default): every combination, the
                              # first key varying slowest; "zip": the i-th
                              # values of every key together
  set     = { "mesh.size" = 16 }   # optional: keys set in every case
  [[vary]]                    # any key of the model file, arrays indexed
  key    = "contact.recess"   # from 0: "contact.zones[1].from"
  values = [0.1, 0.2, 0.3]
  [[vary]]
  key    = "contact.zones[1].from"
  range  = { from = 55, to = 75, steps = 3 }   # spacing = "linear" (default) or "log"
  [[case]]                    # optional named cases, after the others
  name = "as_built"
  set  = { "contact.recess" = 0.25 }

The combined cases are named case-01, case-02 … in plan order.

Batch clusters: each task of an array job runs one shard, --shard I/N, or
without the flag the shard of a Slurm array task (SLURM_ARRAY_TASK_ID of
SLURM_ARRAY_TASK_COUNT) or of a Kubernetes indexed Job (JOB_COMPLETION_INDEX,
with --shards N or FLANGESEG_SHARDS). A shard writes only its case folders;
after the last one, --collect builds the tables from them. All tasks need
DIR on a shared file system (or copy each shard's DIR/cases together before
--collect).

Exit codes: 0 every case ran to its end, 2 bad plan or arguments (nothing
runs), 3 a case stopped or failed (its row says why; the others ran), the
sweep was interrupted, or --collect found cases missing. A shard exits 0
once each of its cases has its record, stopped or failed ones included,
so that the batch engine neither retries it nor holds back the collect
job; --collect then exits 3 and lists them.

%s

Flags:
`, caution)
	fs.PrintDefaults()
}

// sweepShard is the shard to run: --shard, else the batch engine's.
func sweepShard(f sweepFlags, stderr io.Writer) (sweep.Shard, int) {
	if f.shard != "" {
		if f.collect {
			fmt.Fprintln(stderr, "flangeseg sweep: --shard runs part of the cases; --collect takes every case")
			return sweep.Shard{}, exitBadInput
		}
		s, err := sweep.ParseShard(f.shard)
		if err != nil {
			fmt.Fprintf(stderr, "flangeseg sweep: --shard: %v\n", err)
			return s, exitBadInput
		}
		return s, exitOK
	}
	if f.collect {
		return sweep.Shard{}, exitOK
	}
	s, ok, err := sweep.ShardFromEnv(os.Getenv, f.shards)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg sweep: %v\n", err)
		return s, exitBadInput
	}
	if !ok && f.shards > 0 {
		fmt.Fprintf(stderr, "flangeseg sweep: --shards %d without %s: give --shard I/N instead\n", f.shards, sweep.JobIndex)
		return s, exitBadInput
	}
	return s, exitOK
}

func listCases(w io.Writer, cases []plan.Case, shard sweep.Shard) {
	for _, c := range cases {
		mark := ""
		if !shard.Whole() {
			mark = "  (other shard)"
			if shard.Has(c.Index) {
				mark = "  (" + shard.String() + ")"
			}
		}
		fmt.Fprintf(w, "%4d  %s  %s%s\n", c.Index, c.Name, c.Describe(), mark)
	}
}

func runSweepCases(p *plan.Plan, cases []plan.Case, f sweepFlags, shard sweep.Shard, stdout, stderr io.Writer) int {
	// As run, demo and compare: the first signal stops every case at its
	// next safe point, a second one ends the process at once.
	ctx, release := interruptible()
	defer release()
	total, n := 0, 0
	for _, c := range cases {
		if shard.Has(c.Index) {
			total += c.Spec.Load.Increments
			n++
		}
	}
	opt := sweep.Options{Dir: f.dir, Jobs: f.jobs, Shard: shard, AllFields: f.allFields}
	bar := progressBar(stderr, total, "sweep")
	if bar != nil {
		opt.Progress = func(done, _ int) { _ = bar.Set(done) }
	} else {
		opt.CaseDone = func(r sweep.Record, ran bool) { caseLine(stderr, r, ran, len(cases)) }
	}
	fmt.Fprintf(stdout, "%s: %d of %d cases (%s) into %s\n", p.Path, n, len(cases), shard, f.dir)
	recs, err := sweep.Run(ctx, cases, opt)
	if bar != nil {
		_ = bar.Finish()
	}
	if err != nil && ctx.Err() == nil {
		fmt.Fprintf(stderr, "flangeseg sweep: %v\n", err)
		return exitAnalysis
	}
	if ctx.Err() != nil {
		t := sweep.Count(recs)
		fmt.Fprintf(stderr, "flangeseg sweep: interrupted: %s; run the same command again to do what is missing\n", t)
		return exitAnalysis
	}
	if !shard.Whole() {
		return shardDone(stdout, p, f.dir, shard, recs)
	}
	return collectSweep(p, cases, f.dir, stdout, stderr)
}

// shardDone reports a shard's cases. A shard whose every case has its
// record did its part and exits 0, stopped cases included: a batch engine
// would otherwise retry it or hold back the collect job, and --collect
// gives the sweep's status.
func shardDone(stdout io.Writer, p *plan.Plan, dir string, shard sweep.Shard, recs []sweep.Record) int {
	t := sweep.Count(recs)
	fmt.Fprintf(stdout, "%s: %s\n", shard, t)
	for _, r := range recs {
		if r.Status != sweep.Finished {
			fmt.Fprintf(stdout, "  case %d %s: %s: %s\n", r.Index, r.Name, r.Status, r.Reason)
		}
	}
	fmt.Fprintf(stdout, "after the last shard: flangeseg sweep %s -o %s --collect\n", p.Path, dir)
	if t.Missing > 0 {
		return exitAnalysis
	}
	return exitOK
}

// caseLine reports one case on a line, where no progress bar shows.
func caseLine(w io.Writer, r sweep.Record, ran bool, n int) {
	how := fmt.Sprintf("%s in %.1f s", r.Status, r.Seconds)
	if !ran {
		how = "already done (" + r.Status + ")"
	}
	if r.Reason != "" && ran {
		how += ": " + r.Reason
	}
	fmt.Fprintf(w, "case %d/%d %s: %s\n", r.Index, n, r.Name, how)
}

func collectSweep(p *plan.Plan, cases []plan.Case, dir string, stdout, stderr io.Writer) int {
	recs, err := sweep.Collect(dir, cases)
	if err == nil {
		err = sweep.WriteTables(dir, p, recs)
	}
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg sweep: collecting %s: %v\n", dir, err)
		return exitAnalysis
	}
	t := sweep.Count(recs)
	fmt.Fprintf(stdout, "%d cases: %s\n", len(recs), t)
	for _, r := range recs {
		if r.Status != sweep.Finished {
			fmt.Fprintf(stdout, "  case %d %s: %s: %s\n", r.Index, r.Name, r.Status, r.Reason)
		}
	}
	fmt.Fprintf(stdout, "sweep.csv, sweep.json, plots/ and report.html in %s\n", dir)
	return tallyExit(t)
}

func tallyExit(t sweep.Tally) int {
	if t.AllFinished() {
		return exitOK
	}
	return exitAnalysis
}
