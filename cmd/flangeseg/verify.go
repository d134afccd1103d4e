package main

import (
	"flag"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"flangeseg/fem/sparse"
	"flangeseg/fem/verify"
	"flangeseg/post"
	"flangeseg/post/results"
)

func runVerify(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("verify", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "", "write each case's fields as VTK files (.vtu) into this `DIR`")
	dumpDir := fs.String("dump-matrix", "", "write every assembled stiffness matrix and right-hand side in Matrix Market form into this `DIR`")
	only := fs.String("case", "", "run only the cases whose names are in this comma-separated `LIST`")
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg verify [-o DIR] [--dump-matrix DIR] [--case LIST]

Runs the verification problems of the finite-element core on this machine
and prints one row per checked quantity: case, quantity, computed value,
reference, error %%, tolerance %% and PASS or FAIL. Exit code 0 only if
every row passes. Cases: %s.

Flags:
`, strings.Join(caseNames(), ", "))
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return parseExit(err)
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "flangeseg verify: unexpected argument %q\n", fs.Arg(0))
		return exitBadInput
	}
	cases, err := selectCases(*only)
	if err != nil {
		fmt.Fprintf(stderr, "flangeseg verify: --case %q: %v\n", *only, err)
		return exitBadInput
	}
	if *outDir != "" && *dumpDir != "" && filepath.Clean(*outDir) == filepath.Clean(*dumpDir) {
		fmt.Fprintf(stderr, "flangeseg verify: --dump-matrix = %s: must differ from -o (each is a result directory of its own)\n", *dumpDir)
		return exitBadInput
	}
	// Both directories follow the output-directory rule (new, empty or an
	// earlier flangeseg result) and are written under a temporary name,
	// put in place whole at the end, whatever the rows say.
	fields, matrices, code := stageVerify(*outDir, *dumpDir, stderr)
	if code != exitOK {
		return code
	}
	defer func() {
		for _, st := range []*results.Staging{fields, matrices} {
			if st != nil {
				if err := st.Commit(results.KindVerify); err != nil {
					fmt.Fprintf(stderr, "flangeseg verify: %v\n", err)
				}
			}
		}
	}()
	opt := verify.Options{}
	if matrices != nil {
		opt.Inspect = func(name string, k *sparse.Matrix, rhs []float64) error {
			return dumpSystem(matrices.Dir, name, k, rhs)
		}
	}
	var rows []verify.Row
	for _, c := range cases {
		out, err := c.Run(opt)
		if err != nil {
			fmt.Fprintf(stderr, "flangeseg verify: case %s: %v\n", c.Name, err)
			return exitAnalysis
		}
		rows = append(rows, out.Rows...)
		if fields != nil {
			if err := writeSnapshots(fields.Dir, out.Snapshots); err != nil {
				fmt.Fprintf(stderr, "flangeseg verify: case %s: %v\n", c.Name, err)
				return exitAnalysis
			}
		}
	}
	failed := printRows(stdout, rows)
	fmt.Fprintf(stdout, "\nverify: %d passed, %d failed\n", len(rows)-failed, failed)
	if *outDir != "" {
		fmt.Fprintf(stdout, "fields written to %s\n", *outDir)
	}
	if *dumpDir != "" {
		fmt.Fprintf(stdout, "matrices written to %s\n", *dumpDir)
	}
	if failed > 0 {
		return exitFailed
	}
	return exitOK
}

func caseNames() []string {
	var names []string
	for _, c := range verify.Cases() {
		names = append(names, c.Name)
	}
	return names
}

func selectCases(list string) ([]verify.Case, error) {
	all := verify.Cases()
	if list == "" {
		return all, nil
	}
	var out []verify.Case
	for _, name := range strings.Split(list, ",") {
		found := false
		for _, c := range all {
			if strings.EqualFold(c.Name, strings.TrimSpace(name)) {
				out = append(out, c)
				found = true
			}
		}
		if !found {
			return nil, fmt.Errorf("no case %q (cases: %s)", name, strings.Join(caseNames(), ", "))
		}
	}
	return out, nil
}

// printRows writes the table and returns the number of failed rows.
func printRows(w io.Writer, rows []verify.Row) int {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "case\tquantity\tunit\tcomputed\treference\terror %\ttolerance %\tresult")
	failed := 0
	for _, r := range rows {
		verdict := "PASS"
		if !r.Pass() {
			verdict = "FAIL"
			failed++
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%.6g\t%.6g\t%.3g\t%.3g\t%s\n",
			r.Case, r.Quantity, r.Unit, r.Computed, r.Reference, 100*r.Error, 100*r.Tolerance, verdict)
	}
	tw.Flush()
	return failed
}

// fileStem turns a solve's name into a file name.
func fileStem(name string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(name) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		case r == 'é':
			b.WriteRune('e')
		default:
			if s := b.String(); len(s) > 0 && s[len(s)-1] != '_' {
				b.WriteByte('_')
			}
		}
	}
	return strings.Trim(b.String(), "_")
}

func writeSnapshots(dir string, snaps []verify.Snapshot) error {
	for _, s := range snaps {
		point, cell, err := post.SolutionFields(s.Solution)
		if err != nil {
			return err
		}
		path := filepath.Join(dir, fileStem(s.Name)+".vtu")
		if err := post.WriteVTU(path, post.GridFromMesh(s.Solution.Model().Mesh()), point, cell); err != nil {
			return err
		}
	}
	return nil
}

func dumpSystem(dir, name string, k *sparse.Matrix, rhs []float64) error {
	stem := filepath.Join(dir, fileStem(name))
	err := post.WriteFileAtomic(stem+".matrix.mtx", func(w io.Writer) error { return sparse.WriteMatrixMarket(w, k) })
	if err != nil {
		return err
	}
	return post.WriteFileAtomic(stem+".rhs.mtx", func(w io.Writer) error { return sparse.WriteVectorMarket(w, rhs) })
}

// stageVerify stages the directories of -o and --dump-matrix that are
// given (nil for one that is not); a directory the rule refuses is bad
// input.
func stageVerify(outDir, dumpDir string, stderr io.Writer) (fields, matrices *results.Staging, code int) {
	for _, d := range []struct {
		dir string
		st  **results.Staging
	}{{outDir, &fields}, {dumpDir, &matrices}} {
		if d.dir == "" {
			continue
		}
		st, err := results.Stage(d.dir)
		if err != nil {
			fmt.Fprintf(stderr, "flangeseg verify: %v\n", err)
			if fields != nil {
				fields.Discard()
			}
			return nil, nil, exitBadInput
		}
		*d.st = st
	}
	return fields, matrices, exitOK
}
