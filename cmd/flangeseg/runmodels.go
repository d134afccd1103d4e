package main

import (
	"bytes"
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
func runModels(jobs []note.ModelJob, label string, verbose bool, stdout, stderr io.Writer) ([]results.Summary, int) {
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
		flags := runFlags{verbose: verbose}
		if progress != nil {
			flags.progress = func(n int) {
				mu.Lock()
				defer mu.Unlock()
				done[i] = n
				progress(done)
			}
		}
		if verbose {
			o.code = runModel(j, flags, &o.out, stderr)
			continue
		}
		wg.Go(func() {
			slots <- struct{}{}
			defer func() { <-slots }()
			o.code = runModel(j, flags, &o.out, &o.errOut)
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
