package main

import (
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"text/tabwriter"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/handcalc"
)

func runHand(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("hand", flag.ContinueOnError)
	fs.SetOutput(stderr)
	asJSON := fs.Bool("json", false, "print the results as JSON instead of tables")
	margin := fs.Float64("margin", handcalc.DefaultBorderline, "a utilisation within 1 ± `M` of the design force counts as borderline")
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg hand MODEL.toml [--json] [--margin M]

Runs the hand methods that the finite-element check refines, for the joint
of a model file, and prints them with their sources:
  - the bolt: stress area (ISO 898-1), F_t,Rd and F_p,C (EN 1993-1-8);
  - the ultimate segment force by the plastic-hinge mechanisms A, B and C
    (Petersen) and with the shell hinge reduced by its axial force (Seidel),
    on four bases: design and characteristic, each with and without k2;
  - the segment bolt-force models: the joint diagram with the VDI 2230
    load factor, and the trilinear model (Schmidt/Neuper).
With [load] design_force in the file it adds the verdict: the utilisation
of each method, and "borderline" when a utilisation lies within 1 ± M
(default %.2f).

%s

Flags:
`, handcalc.DefaultBorderline, caution)
		fs.PrintDefaults()
	}
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg hand: want one model file; run 'flangeseg hand --help'")
		return exitBadInput
	}
	if !(*margin >= 0 && *margin < 1) {
		fmt.Fprintf(stderr, "flangeseg hand: --margin = %s: must lie in [0, 1)\n", modelfile.FormatNumber(*margin))
		return exitBadInput
	}
	path := fs.Arg(0)
	s, ok := loadOrReport(path, "hand", stderr)
	if !ok {
		return exitBadInput
	}
	d := s.Derive()
	r, err := handcalc.Analyze(s.HandJoint(d), handcalc.DefaultParams())
	if err != nil {
		fmt.Fprintf(stderr, "%s: hand methods: %v\n", path, err)
		return exitBadInput
	}
	v := handcalc.CheckDesignForce(r, s.Load.DesignForce, *margin)
	if *asJSON {
		out := struct {
			Model   string            `json:"model"`
			Caution string            `json:"caution"`
			Hand    handcalc.Results  `json:"hand_methods"`
			Verdict *handcalc.Verdict `json:"verdict,omitempty"`
		}{path, caution, r, v}
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(out); err != nil {
			fmt.Fprintf(stderr, "flangeseg hand: %v\n", err)
			return exitAnalysis
		}
		return exitOK
	}
	printHand(stdout, s, d, r, v)
	return exitOK
}

func printHand(w io.Writer, s *modelfile.Spec, d modelfile.Derived, r handcalc.Results, v *handcalc.Verdict) {
	b := r.Bolt
	fmt.Fprintf(w, "%s — hand methods\n\n", s.Title)
	fmt.Fprintf(w, "Bolt %s %s (EN 1993-1-8 nominal f_ub = %s MPa, f_yb = %s MPa)\n", s.Bolt.Size, s.Bolt.Grade, modelfile.FormatNumber(b.Nominal.Fub), modelfile.FormatNumber(b.Nominal.Fyb))
	fmt.Fprintf(w, "  stress area A_s          %8.1f mm²  (ISO 898-1)\n", b.StressArea)
	fmt.Fprintf(w, "  F_t,Rd = k2·f_ub·A_s/γM2 %8.1f kN   (EN 1993-1-8 Table 3.4, k2 = %s, γM2 = %s)\n",
		b.TensionResistance/1e3, modelfile.FormatNumber(r.Params.K2), modelfile.FormatNumber(r.Params.GammaM2))
	fmt.Fprintf(w, "  F_p,C = 0.7·f_ub·A_s     %8.1f kN   (EN 1993-1-8, 3.9)\n", b.PreloadForce/1e3)
	fmt.Fprintf(w, "  preload used by the bolt-force models F_p %.1f kN\n\n", r.JointDiagram.Preload/1e3)

	fmt.Fprintln(w, "Ultimate segment force Z_u [kN] by plastic-hinge mechanisms (Petersen; Seidel: shell hinge reduced by N)")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "basis\tmethod\tmode A\tmode B\tmode C\tZ_u\tgoverning\t")
	for _, u := range r.Ultimate {
		for _, m := range []struct {
			name string
			mech handcalc.Mechanisms
		}{{"Petersen", u.Petersen}, {"Seidel", u.Seidel}} {
			fmt.Fprintf(tw, "%s\t%s\t%.1f\t%.1f\t%.1f\t%.1f\t%s\t\n", u.Basis, m.name,
				m.mech.A/1e3, m.mech.B/1e3, m.mech.C/1e3, m.mech.Z/1e3, m.mech.Governing)
		}
	}
	tw.Flush()
	fmt.Fprintln(w, "  modes: A bolt without prying; B bolt with a hinge at the flange–shell junction;")
	fmt.Fprintln(w, "  C hinges at the junction and in the flange at the bolt line (net width c − d_h)")
	fmt.Fprintln(w)

	jd, tri := r.JointDiagram, r.Trilinear
	fmt.Fprintln(w, "Segment bolt-force models")
	fmt.Fprintf(w, "  joint diagram (VDI 2230 Part 1 load factor): Φ = %.4f, lever ratio (a + b)/a = %.3f,\n", jd.LoadFactor, jd.LeverRatio)
	fmt.Fprintf(w, "    opening at Z = %.1f kN, decompression at Z = %.1f kN\n", jd.Opening/1e3, jd.Decompression/1e3)
	fmt.Fprintf(w, "  trilinear (Schmidt/Neuper): p = %.4f, Z_I = %.1f kN, Z_II = %.1f kN, λ' = %.3f\n",
		tri.Stiffness, tri.Z1/1e3, tri.Z2/1e3, tri.ReducedLeverRatio)
	fmt.Fprintln(w, "  bolt force F_s [kN] at Z [kN]:")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "    Z\tjoint diagram\ttrilinear\t")
	for _, z := range handSamples(r.CurveEnd) {
		fmt.Fprintf(tw, "    %.1f\t%.1f\t%.1f\t\n", z/1e3, jd.Force(z)/1e3, tri.Force(z)/1e3)
	}
	tw.Flush()
	fmt.Fprintln(w)
	printVerdict(w, v)
	fmt.Fprintln(w, caution)
}

// handSamples are eight segment forces from 0 to end.
func handSamples(end float64) []float64 {
	var z []float64
	for i := 0; i <= 8; i++ {
		z = append(z, end*float64(i)/8)
	}
	return z
}

func printVerdict(w io.Writer, v *handcalc.Verdict) {
	if v == nil {
		fmt.Fprintln(w, "Verdict: no [load] design_force in the model, so no utilisation.")
		fmt.Fprintln(w)
		return
	}
	fmt.Fprintf(w, "Verdict for the design segment force Z_Ed = %.1f kN (borderline within 1 ± %.2f):\n", v.DesignForceKN, v.Margin)
	for _, l := range v.Lines {
		fmt.Fprintf(w, "  %-62s Z_u = %7.1f kN (mode %s)  utilisation %.3f  %s\n", l.Method, l.CapacityKN, l.Mode, l.Utilisation, l.Status)
	}
	switch {
	case v.Borderline:
		fmt.Fprintln(w, "  borderline: a refined check (flangeseg run) is worth making.")
	case v.Exceeded:
		fmt.Fprintln(w, "  exceeded by the hand methods.")
	default:
		fmt.Fprintln(w, "  the hand methods show a clear reserve.")
	}
	fmt.Fprintln(w)
}
