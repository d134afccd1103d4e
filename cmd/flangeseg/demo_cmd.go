package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sync"
	"text/tabwriter"
)

func runDemo(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("demo", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "demo_results", "write each demo model's results into `DIR`/flat and DIR/bands")
	printModel := fs.Bool("print-model", false, "print the demo model files (TOML) and exit")
	verbose := fs.Bool("verbose", false, "log every Newton iteration on stderr")
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg demo [-o DIR] [--print-model] [--verbose]

Runs the built-in demo joint — a tower L-flange of our own invention, once
with a flat contact face and once with defined contact bands near the
shell and the free edge — and prints how their stiffness and bolt-force
behaviour compare. --print-model shows the model files; copy one as the
start of your own.

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
	if *printModel {
		for _, m := range models {
			fmt.Fprintf(stdout, "# ---- demo/%s.toml ----\n%s\n", m.Name, m.Data)
		}
		return exitOK
	}
	specs := make([]*Spec, len(models))
	total := 0
	for i, m := range models {
		spec, err := decodeSpec(m.Data)
		if err != nil {
			fmt.Fprintf(stderr, "demo %s: %v\n", m.Name, err)
			return exitBadInput
		}
		specs[i] = spec
		total += spec.Load.Increments
	}
	// The variants run side by side (a 2-core machine halves the wait);
	// each one's output is held back and printed in order, so the text is
	// the same as a one-by-one run. --verbose runs them one by one to keep
	// the iteration logs apart.
	type outcome struct {
		code        int
		out, errOut bytes.Buffer
	}
	results := make([]outcome, len(models))
	progress := demoProgress(stderr, total)
	done := make([]int, len(models))
	var mu sync.Mutex
	var wg sync.WaitGroup
	for i, m := range models {
		o := &results[i]
		flags := runFlags{verbose: *verbose}
		if progress != nil {
			flags.progress = func(n int) {
				mu.Lock()
				defer mu.Unlock()
				done[i] = n
				progress(done)
			}
		}
		job := func() {
			o.code = runModel(specs[i], m.Name+".toml", filepath.Join(*outDir, m.Name), flags, &o.out, &o.errOut)
		}
		if *verbose {
			o.code = runModel(specs[i], m.Name+".toml", filepath.Join(*outDir, m.Name), flags, &o.out, stderr)
			continue
		}
		wg.Go(job)
	}
	wg.Wait()
	if progress != nil {
		progress(nil)
	}
	var sums []summary
	for i, m := range models {
		o := &results[i]
		stdout.Write(o.out.Bytes())
		fmt.Fprintln(stdout)
		stderr.Write(o.errOut.Bytes())
		if o.code != exitOK {
			return o.code
		}
		s, err := readSummary(filepath.Join(*outDir, m.Name, "summary.json"))
		if err != nil {
			fmt.Fprintf(stderr, "demo %s: %v\n", m.Name, err)
			return exitAnalysis
		}
		sums = append(sums, s)
	}
	compareTable(stdout, []string{"flat face", "defined bands"}, sums)
	return exitOK
}

// demoProgress returns a progress display over all variants on a
// terminal (nil in pipes and CI); called with nil it finishes the bar.
func demoProgress(stderr io.Writer, total int) func(done []int) {
	bar := progressBar(stderr, total, "demo")
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

func readSummary(path string) (summary, error) {
	var s summary
	data, err := os.ReadFile(path)
	if err != nil {
		return s, err
	}
	return s, json.Unmarshal(data, &s)
}

// compareTable prints the joint figures of several runs with their ratio
// to the first.
func compareTable(w io.Writer, names []string, sums []summary) {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprint(tw, "quantity\t")
	for i, n := range names {
		fmt.Fprintf(tw, "%s\t", n)
		if i > 0 {
			fmt.Fprint(tw, "ratio\t")
		}
	}
	fmt.Fprintln(tw)
	ptr := func(p *float64) float64 {
		if p == nil {
			return 0
		}
		return *p
	}
	rows := []struct {
		name string
		get  func(s summary) float64
	}{
		{"stiffness at Z = 0 [kN/mm]", func(s summary) float64 { return s.Joint.StiffnessTangentZero }},
		{"secant stiffness to reference [kN/mm]", func(s summary) float64 { return ptr(s.Joint.StiffnessToReference) }},
		{"joint alone, secant to reference [kN/mm]", func(s summary) float64 { return ptr(s.Joint.JointStiffnessReference) }},
		{"load factor at Z = 0 [-]", func(s summary) float64 { return s.Joint.LoadFactorTangentZero }},
		{"load factor, secant to reference [-]", func(s summary) float64 { return ptr(s.Joint.LoadFactorToReference) }},
		{"opening load [kN]", func(s summary) float64 { return ptr(s.Joint.OpeningLoadKN) }},
		{"decompression load [kN]", func(s summary) float64 { return ptr(s.Joint.DecompressionKN) }},
	}
	for _, r := range rows {
		fmt.Fprintf(tw, "%s\t", r.name)
		base := r.get(sums[0])
		for i, s := range sums {
			v := r.get(s)
			fmt.Fprintf(tw, "%.3g\t", v)
			if i > 0 {
				if base != 0 {
					fmt.Fprintf(tw, "%.3f\t", v/base)
				} else {
					fmt.Fprint(tw, "—\t")
				}
			}
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	if len(sums) > 0 {
		fmt.Fprintf(w, "reference load: %.0f kN (%s); 0 means not reached\n", sums[0].Joint.ReferenceLoadKN, sums[0].Joint.ReferenceFrom)
	}
}
