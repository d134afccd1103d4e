package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"path/filepath"
	"runtime"
	"sync"

	"flangeseg/post/note"
	"flangeseg/post/results"
)

// runModels runs valid models side by side, as many at once as there are
// cores, and returns their summaries in order. Each model's output is held
// back and printed in order, so the text is the same as a one-by-one run;
// verbose runs them one by one to keep the iteration logs apart. On a
// terminal one progress bar counts the increments of all. The exit code is
// the first failing model's, after every model has run.
func runModels(ctx context.Context, jobs []note.ModelJob, shown []string, label string, verbose bool, stdout, stderr io.Writer) ([]results.Summary, int) {
	type outcome struct {
		code        int
		out, errOut bytes.Buffer
	}
	outs := make([]outcome, len(jobs))
	total := 0
	for _, j := range jobs {
		total += j.Spec.Load.Increments
	}
	progress := combinedProgress(stderr, total, label)
	done := make([]int, len(jobs))
	var mu sync.Mutex
	var wg sync.WaitGroup
	slots := make(chan struct{}, max(1, runtime.NumCPU()))
	for i, j := range jobs {
		o := &outs[i]
		flags := runFlags{verbose: verbose, shown: shown[i]}
		if progress != nil {
			flags.progress = func(n int) {
				mu.Lock()
				defer mu.Unlock()
				done[i] = n
				progress(done)
			}
		}
		if verbose {
			o.code = runModel(ctx, j, flags, &o.out, stderr)
			continue
		}
		wg.Go(func() {
			slots <- struct{}{}
			defer func() { <-slots }()
			o.code = runModel(ctx, j, flags, &o.out, &o.errOut)
		})
	}
	wg.Wait()
	if progress != nil {
		progress(nil)
	}
	var sums []results.Summary
	code := exitOK
	for i, j := range jobs {
		o := &outs[i]
		stdout.Write(o.out.Bytes())
		fmt.Fprintln(stdout)
		stderr.Write(o.errOut.Bytes())
		if o.code != exitOK {
			if code == exitOK {
				code = o.code
			}
			continue
		}
		s, err := results.ReadSummary(filepath.Join(j.Dir, "summary.json"))
		if err != nil {
			fmt.Fprintf(stderr, "%s: %v\n", j.Path, err)
			code = exitAnalysis
			continue
		}
		sums = append(sums, s)
	}
	return sums, code
}

// combinedProgress returns a progress display over several runs on a
// terminal (nil in pipes and CI); called with nil it finishes the bar.
func combinedProgress(stderr io.Writer, total int, label string) func(done []int) {
	bar := progressBar(stderr, total, label)
	if bar == nil {
		return nil
	}
	return func(done []int) {
		if done == nil {
			_ = bar.Finish()
			return
		}
		n := 0
		for _, d := range done {
			n += d
		}
		_ = bar.Set(n)
	}
}

// runSideBySide runs jobs side by side (runModels), each into the
// directory named by its Dir inside dir (the jobs' Dir are rewritten in
// place to the staged directories), and then, if every run finished,
// compareAll, which writes the comparison into the directory it is given.
// Everything is written into a staged copy of dir that replaces it whole
// at the end (results.Stage): dir must be new, empty or an earlier
// result. SIGINT or SIGTERM stops every run at its next safe point; what
// converged is kept and no comparison is written.
func runSideBySide(dir, label string, jobs []note.ModelJob, verbose bool, stdout, stderr io.Writer,
	compareAll func(staged string, sums []results.Summary) int) int {
	st, err := results.Stage(dir)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg %s: %v\n", label, err)
		return exitBadInput
	}
	shown := make([]string, len(jobs))
	for i := range jobs {
		shown[i] = filepath.Join(dir, jobs[i].Dir)
		jobs[i].Dir = filepath.Join(st.Dir, jobs[i].Dir)
	}
	ctx, release := interruptible()
	defer release()
	sums, code := runModels(ctx, jobs, shown, label, verbose, stdout, stderr)
	if code == exitOK {
		code = compareAll(st.Dir, sums)
	}
	if ctx.Err() != nil && code != exitOK {
		fmt.Fprintf(stderr, "flangeseg %s: interrupted (%v); each run up to its last converged increment is in %s; no comparison written\n", label, context.Cause(ctx), dir)
	}
	if st.Empty() {
		st.Discard()
		return code
	}
	if err := st.Commit(results.KindComparison); err != nil {
		fmt.Fprintf(stderr, "flangeseg %s: %v\n", label, err)
		return exitAnalysis
	}
	return code
}
