package main

import (
	"fmt"
	"io"
	"os"

	"flangeseg/post"
)

// Exit codes.
const (
	exitOK       = 0
	exitFailed   = 1 // a verification check did not pass
	exitBadInput = 2 // bad arguments or model file
	exitAnalysis = 3 // the analysis could not be completed
)

// caution is printed by help and written into reports (post.Caution).
const caution = post.Caution

type command struct {
	name    string
	summary string
	run     func(args []string, stdout, stderr io.Writer) int
}

func commands() []command {
	return []command{
		{"compare", "run several model files side by side and compare their stiffness, bolt force and capacity", runCompare},
		{"demo", "run the built-in demo joint (flat face and defined contact bands) and compare them", runDemo},
		{"hand", "run the hand methods (EN 1993-1-8, Petersen, Seidel, VDI 2230, trilinear) for a model file", runHand},
		{"fatigue", "bolt fatigue damage under a load spectrum, from the FE or the hand bolt-force function", runFatigue},
		{"mesh", "mesh a model file and write mesh.vtu with the element quality", runMesh},
		{"ring", "check every bolt of a ring flange from a flatness survey: imperfection, preload left, bolt-force function and fatigue damage per bolt", runRing},
		{"run", "run the finite-element analysis of one bolt segment from a model file", runRun},
		{"sweep", "run a parameter sweep: the cases of a plan file, side by side or as shards of a batch array job", runSweep},
		{"validate", "check a model file and print it with its defaults and derived quantities", runValidate},
		{"verify", "run the verification problems of the finite-element core and print a table", runVerify},
		{"version", "print the version", runVersion},
		{"help", "show this help, or the help of one command", nil},
	}
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stderr)
		return exitBadInput
	}
	name := args[0]
	if name == "help" || name == "-h" || name == "--help" || name == "-help" {
		if len(args) > 1 {
			return run([]string{args[1], "--help"}, stdout, stderr)
		}
		usage(stdout)
		return exitOK
	}
	for _, c := range commands() {
		if c.name == name && c.run != nil {
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "flangeseg: unknown command %q; run 'flangeseg help' for the list\n", name)
	return exitBadInput
}

func usage(w io.Writer) {
	fmt.Fprintln(w, `flangeseg — nonlinear 2D finite-element check of one bolt segment of a bolted
L-flange joint in a tubular tower.

Usage:
  flangeseg <command> [arguments]

Commands:`)
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-8s %s\n", c.name, c.summary)
	}
	fmt.Fprintf(w, `
Run 'flangeseg <command> --help' for the flags of a command.

Exit codes: 0 success, 1 a check failed, 2 bad input, 3 the analysis failed.

%s
`, caution)
}
