package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
)

// runValidate is `flangeseg validate MODEL.toml`.
func runValidate(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("validate", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { validateUsage(stderr, fs) }
	limit := addMemoryFlag(fs)
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg validate: want one model file; run 'flangeseg validate --help'")
		return exitBadInput
	}
	path := fs.Arg(0)
	s, ok := loadOrReport(path, "validate", stderr)
	if !ok {
		return exitBadInput
	}
	size, err := segment.EstimateSize(s)
	if err != nil {
		reportModelError(path, err, stderr)
		return exitBadInput
	}
	if err := printModel(stdout, path, s, size, limit); err != nil {
		fmt.Fprintf(stderr, "flangeseg validate: %v\n", err)
		return exitBadInput
	}
	if sizeErr := refuseSize(s, size, limit, 0); sizeErr != nil {
		fmt.Fprintf(stderr, "%s: %v\n%s: model refused: too large for the memory limit (1 error)\n", path, sizeErr, path)
		return exitBadInput
	}
	fmt.Fprintln(stdout, "model is valid")
	return exitOK
}

// loadOrReport loads a model file; if it cannot, it writes every error
// (an invalid model: each broken rule and their count) to stderr and
// reports false.
func loadOrReport(path, command string, stderr io.Writer) (*modelfile.Spec, bool) {
	s, err := modelfile.Load(path)
	var me *modelfile.Error
	switch {
	case errors.As(err, &me):
		reportInvalid(path, me, stderr)
		return nil, false
	case err != nil:
		fmt.Fprintf(stderr, "flangeseg %s: %v\n", command, err)
		return nil, false
	}
	return s, true
}

// reportInvalid writes every problem of an invalid model, each after the
// file name, and their count.
func reportInvalid(path string, me *modelfile.Error, stderr io.Writer) {
	me.File = path
	fmt.Fprintln(stderr, me)
	fmt.Fprintf(stderr, "%s: model is invalid (%d %s)\n", path, len(me.Errs), plural(len(me.Errs), "error", "errors"))
}

// reportModelError writes an error about the model at path: every
// problem of a *modelfile.Error, else the error after the file name.
func reportModelError(path string, err error, stderr io.Writer) {
	var me *modelfile.Error
	if errors.As(err, &me) {
		reportInvalid(path, me, stderr)
		return
	}
	fmt.Fprintf(stderr, "%s: %v\n", path, err)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func validateUsage(w io.Writer, fs *flag.FlagSet) {
	fmt.Fprint(w, `Usage: flangeseg validate MODEL.toml [--max-memory SIZE]

Reads a model file strictly, fills in the defaults and checks every value.
A valid model is printed with all defaults filled in (the form a run keeps
as model.resolved.toml), followed by the quantities derived from it (bolt
areas and strengths, preload, segment width, strip thicknesses, ring-spring
stiffness, shell decay length 3/β) and any warnings. An invalid model gives
every error at once on stderr, one per line, prefixed with the file name:
the key, its value and the rule it breaks. Nothing is written to disk.

It also estimates the model's size from the mesh keys, without building
it: elements, equations and the peak memory of a run (calibrated on runs
of the demo joint; it errs high). A model whose estimate exceeds the
machine's memory (MemTotal of /proc/meminfo) or --max-memory is refused
with exit 2, naming the keys that set its size; run and compare refuse it
the same way before any work.

Units in the file: mm, N, MPa, degrees. Zones are numbered from 0 in
messages (contact.zones[0] is the first).

Defaults of the keys a file may leave out:
`)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, k := range modelfile.KeyDefaults() {
		fmt.Fprintf(tw, "  %s\t%s\n", k.Key, k.Text)
	}
	tw.Flush()
	fmt.Fprint(w, `
Built-in materials (no [materials] table needed): S235, S275, S355, S420,
S460 (E = 210000 MPa, ν = 0.3, yield strength by thickness per EN 10025)
and, for bolt.material, the bolt grades 8.8, 10.9, 12.9. A [materials.NAME]
table defines a material (E, nu, optionally curve and curve_kind) and takes
precedence over a built-in one of the same name.

Exit codes: 0 the model is valid, 2 it is invalid, cannot be read or is
too large for the memory limit.

Flags:
`)
	fs.SetOutput(w)
	fs.PrintDefaults()
}

// printModel writes the resolved model, its derived quantities and the
// warnings.
func printModel(w io.Writer, path string, s *modelfile.Spec, size segment.Size, limit *memoryLimit) error {
	resolved, err := s.ResolvedTOML()
	if err != nil {
		return err
	}
	d := s.Derive()
	fmt.Fprintf(w, "%s: %s\n\nResolved model (every default filled in):\n\n%s\n", path, s.Title, resolved)
	fmt.Fprintln(w, "Derived quantities:")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, r := range derivedRows(s, d) {
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", r[0], r[1], r[2])
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintf(w, "Estimated size (from the mesh keys): %s", sizeLine(size))
	if max, from := limit.limit(); max > 0 {
		fmt.Fprintf(w, "; limit %s (%s)", formatBytes(max), from)
	}
	fmt.Fprint(w, "\n\n")
	if len(d.Warnings) == 0 {
		fmt.Fprintln(w, "Warnings: none")
	} else {
		fmt.Fprintln(w, "Warnings:")
		for _, m := range d.Warnings {
			fmt.Fprintf(w, "  - %s\n", m)
		}
	}
	return nil
}

// g5 formats a value to five significant digits.
func g5(x float64) string { return fmt.Sprintf("%.5g", x) }

func kN(x float64) string { return fmt.Sprintf("%.1f", x/1e3) }

// derivedRows lists the derived quantities as label, value, unit.
func derivedRows(s *modelfile.Spec, d modelfile.Derived) [][3]string {
	rows := [][3]string{
		{"bolt diameter d, pitch P", g5(d.D) + ", " + g5(d.Pitch), "mm"},
		{"nominal area A = π·d²/4", g5(d.NominalArea), "mm²"},
		{"stress area A_s (ISO 898-1)", g5(d.StressArea), "mm²"},
		{"nominal f_ub, f_yb of grade " + s.Bolt.Grade, g5(d.Fub) + ", " + g5(d.Fyb), "MPa"},
		{"design preload F_p,C = 0.7·f_ub·A_s", kN(d.DesignPreload), "kN"},
		{"yield force A_s·f_yb", kN(d.YieldForce), "kN"},
	}
	if s.Preload.NutTurn != nil {
		rows = append(rows, [3]string{fmt.Sprintf("preload shortening (nut turn %s° · P/360°)", modelfile.FormatNumber(*s.Preload.NutTurn)), g5(d.PreloadShortening), "mm"})
	} else {
		rows = append(rows, [3]string{"target preload F_p", kN(d.PreloadForce), "kN"})
	}
	rows = append(rows, [][3]string{
		{"bolt circle radius R_b = D/2 − b", g5(d.BoltCircleRadius), "mm"},
		{"segment width c = 2π·R_b/n", g5(d.SegmentWidth), "mm"},
		{"clamp length l_k = 2(t_f + t_w)", g5(d.ClampLength), "mm"},
		{"thread, shank inside the clamp", g5(d.ThreadInClamp) + ", " + g5(d.ShankInClamp), "mm"},
		{"strip thickness: shell and flange (c)", g5(d.ShellStrip), "mm"},
		{"strip thickness: hole band (c − d_h)", g5(d.HoleBandStrip), "mm"},
		{"bolt strip width h = (√3/2)·d", g5(d.BoltWidth), "mm"},
		{"strip thickness: shank (A/h), thread (A_s/h)", g5(d.ShankStrip) + ", " + g5(d.ThreadStrip), "mm"},
		{"strip thickness: bearing t_b = π(d_w² − d_h²)/(4(d_w − d_h))", g5(d.BearingStrip), "mm"},
		{"yield strength of shell, flange", yieldText(d.ShellYield) + ", " + yieldText(d.FlangeYield), "MPa"},
		{"ring-spring stiffness E·t/R² (per unit wall area)", g5(d.RingSpring), "N/mm³"},
		{"shell decay length 1/β, 3/β", g5(d.DecayLength) + ", " + g5(d.ThreeDecayLengths), "mm"},
	}...)
	return rows
}

func yieldText(fy float64) string {
	if fy == 0 {
		return "elastic"
	}
	return g5(fy)
}
