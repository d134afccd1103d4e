package note

import (
	"fmt"
	"math"
	"strings"

	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/handcalc"
	"flangeseg/post/report"
)

// derived are the quantities that follow from the inputs, each with the
// rule or standard that gives it.
func (n *runNote) derived() report.Quantities {
	s, d, h := n.seg.Spec(), n.seg.Derived(), n.seg.Hand()
	num := report.Num
	mm := "mm"
	thread := "ISO 261 coarse thread, " + s.Bolt.Size
	if s.Bolt.Size == "" {
		thread = srcFile
	}
	rows := []report.Quantity{
		{Symbol: "d", Name: "bolt diameter", Value: num(d.D, mm), Source: thread},
		{Symbol: "P", Name: "thread pitch", Value: num(d.Pitch, mm), Source: thread},
		{Symbol: "A", Name: "shank area π·d²/4", Value: num(d.NominalArea, "mm²"), Source: srcDerived},
		{Symbol: "A_s", Name: "stress area π/4·((d₂ + d₃)/2)²", Value: num(d.StressArea, "mm²"), Source: "ISO 898-1"},
		{Symbol: "f_ub", Name: "bolt tensile strength, nominal", Value: num(d.Fub, "MPa"), Source: "EN 1993-1-8 Table 3.1"},
		{Symbol: "f_yb", Name: "bolt yield strength, nominal", Value: num(d.Fyb, "MPa"), Source: "EN 1993-1-8 Table 3.1"},
		{Symbol: "F_p,C", Name: "design preload 0.7·f_ub·A_s", Value: num(d.DesignPreload/1e3, "kN"), Source: "EN 1993-1-8, 3.9"},
		{Symbol: "F_t,Rd", Name: "tension resistance k₂·f_ub·A_s/γ_M2", Value: num(h.Bolt.TensionResistance/1e3, "kN"),
			Source: fmt.Sprintf("EN 1993-1-8 Table 3.4, k₂ = %s, γ_M2 = %s", modelfile.FormatNumber(h.Params.K2), modelfile.FormatNumber(h.Params.GammaM2))},
		{Symbol: "R_b", Name: "bolt circle radius D/2 − b", Value: num(d.BoltCircleRadius, mm), Source: srcDerived},
		{Symbol: "c", Name: "segment width 2π·R_b/n", Value: num(d.SegmentWidth, mm), Source: srcDerived},
		{Symbol: "l_k", Name: "clamp length 2·(t_f + t_w)", Value: num(d.ClampLength, mm), Source: srcDerived},
		{Name: "loaded thread inside the clamp", Value: num(d.ThreadInClamp, mm), Source: "bolt.thread, bolt.thread_length"},
		{Name: "out-of-plane thickness of shell and flange, c", Value: num(d.FlangeStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of the flange across the hole, c − d_h", Value: num(d.HoleBandStrip, mm), Source: "strip model"},
		{Symbol: "h", Name: "in-plane width of the bolt strip (√3/2)·d", Value: num(d.BoltWidth, mm), Source: "strip model: h² = 12·I/A keeps the round bar's A and I"},
		{Name: "out-of-plane thickness of the shank strip A/h", Value: num(d.ShankStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of the thread strip A_s/h", Value: num(d.ThreadStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of head, nut and washers π(d_w² − d_h²)/(4(d_w − d_h))", Value: num(d.BearingStrip, mm), Source: "strip model: keeps the bearing area"},
	}
	if d.PreloadForce > 0 {
		rows = append(rows, report.Quantity{Symbol: "F_p", Name: "target preload", Value: num(d.PreloadForce/1e3, "kN"), Source: preloadRule(s)})
	} else {
		rows = append(rows, report.Quantity{Name: "bolt shortening by the nut turn, angle/360·P", Value: num(d.PreloadShortening, mm), Source: preloadRule(s)})
	}
	for _, p := range []struct {
		symbol, part, mat string
		t, fy             float64
	}{{"f_y", "shell", s.Shell.Material, s.Shell.Thickness, d.ShellYield}, {"f_y", "flange", s.Flange.Material, s.Flange.Thickness, d.FlangeYield}} {
		if p.fy > 0 {
			rows = append(rows, report.Quantity{Symbol: p.symbol, Name: "yield strength of the " + p.part + " (" + p.mat + ")",
				Value: num(p.fy, "MPa"), Source: yieldSource(s, p.mat, p.t)})
		}
	}
	rows = append(rows,
		report.Quantity{Symbol: "k_r", Name: "ring spring stiffness E·t/R² per unit wall area", Value: num(d.RingSpring, "N/mm³"), Source: "strip model: hoop stiffness of the ring"},
		report.Quantity{Symbol: "1/β", Name: "decay length of shell bending, β = [3(1−ν²)/(R²t²)]^¼", Value: num(d.DecayLength, mm), Source: "beam on elastic foundation (Hetényi 1946, from memory)"},
		report.Quantity{Symbol: "3/β", Name: "stub length beyond which the end condition does not matter", Value: num(d.ThreeDecayLengths, mm), Source: "beam on elastic foundation (Hetényi 1946, from memory)"},
	)
	return report.Quantities{Caption: "Derived quantities", Rows: rows}
}

func preloadRule(s *modelfile.Spec) string {
	p := s.Preload
	switch {
	case p.Force != nil:
		return "preload.force"
	case p.Fraction != nil:
		return "preload.fraction × F_p,C"
	}
	return "preload.nut_turn"
}

// yieldSource names where a part's yield strength comes from.
func yieldSource(s *modelfile.Spec, name string, t float64) string {
	switch {
	case s.Materials[name].E > 0:
		return "[materials." + name + "], first point of the curve"
	case name == "S420" || name == "S460":
		return fmt.Sprintf("EN 10025-3/-4 at t = %s mm (from memory)", modelfile.FormatNumber(t))
	}
	return fmt.Sprintf("EN 10025-2 at t = %s mm", modelfile.FormatNumber(t))
}

func (n *runNote) preload() report.Quantities {
	j, d := n.sum.Joint, n.seg.Derived()
	if len(n.rows) == 0 {
		return report.Quantities{}
	}
	num := report.Num
	method := fmt.Sprintf("a slice of the bolt, %s mm long, is shortened until the bolt force reaches the target, then locked", modelfile.FormatNumber(math.Round(n.seg.SliceLength()*100)/100))
	if d.PreloadForce == 0 {
		method = fmt.Sprintf("a slice of the bolt, %s mm long, is shortened by the nut turn and locked", modelfile.FormatNumber(math.Round(n.seg.SliceLength()*100)/100))
	}
	rows := []report.Quantity{
		{Name: "method", Value: report.Text(method), Source: "flangeseg preload stage"},
		{Symbol: "F_p,C", Name: "design preload 0.7·f_ub·A_s", Value: num(d.DesignPreload/1e3, "kN"), Source: "EN 1993-1-8, 3.9"},
	}
	if j.PreloadTargetKN > 0 {
		rows = append(rows, report.Quantity{Symbol: "F_p", Name: "target preload", Value: num(j.PreloadTargetKN, "kN"), Source: preloadRule(n.seg.Spec())})
	}
	rows = append(rows, report.Quantity{Symbol: "F_p", Name: "preload reached", Value: report.NumDigits(j.PreloadReachedKN, "kN", 6), Source: srcFE})
	if j.PreloadTargetKN > 0 {
		rows = append(rows, report.Quantity{Name: "preload reached / target − 1", Value: num(j.PreloadReachedKN/j.PreloadTargetKN-1, report.Dimensionless), Source: srcFE + "; the stage holds it within ±0.005"})
	}
	rows = append(rows,
		report.Quantity{Symbol: "ε_0", Name: "locked shortening strain of the slice", Value: num(j.PreloadEigenstrain, report.Dimensionless), Source: srcFE},
		report.Quantity{Symbol: "σ_p", Name: "bolt stress after preload F_p/A_s", Value: num(j.PreloadReachedKN*1e3/d.StressArea, "MPa"), Source: srcDerived + " and the FE preload"},
		report.Quantity{Name: "preload reached / F_p,C", Value: report.NumDigits(j.PreloadReachedKN*1e3/d.DesignPreload, report.Dimensionless, 6), Source: srcDerived + " and the FE preload"},
	)
	if c := j.Closure; c != nil {
		rows = append(rows,
			report.Quantity{Name: "initial gap between the faces where they are meant to touch, largest", Value: num(c.InitialGapMM, "mm"), Source: "contact.taper, contact.parallel_gap"},
			report.Quantity{Name: "gap left open after preload, largest", Value: num(c.GapLeftMM, "mm"), Source: srcFE + fmt.Sprintf(", at x = %.1f mm; ", c.GapLeftAtXMM) + c.Note},
			report.Quantity{Name: "bolt force the closing took", Value: orMissing(c.ClosingForceKN, "kN"), Source: srcFE + closingSource(c)},
			report.Quantity{Name: "bolt force the closing took / preload reached", Value: orMissing(c.ClosingShare, report.Dimensionless), Source: srcFE},
		)
	}
	return report.Quantities{Caption: "Preload of the bolt", Rows: rows}
}

// orMissing is a number cell, or "—" when the value is not reached.
func orMissing(p *float64, unit string) report.Cell {
	if p == nil {
		return report.Missing(unit)
	}
	return report.Num(*p, unit)
}

func (n *runNote) results() report.Quantities {
	if len(n.rows) < 2 {
		return report.Quantities{}
	}
	j, s := n.sum.Joint, n.sum
	num := report.Num
	stiff := "kN/mm"
	ref := fmt.Sprintf("Z_ref = %.4g kN", j.ReferenceLoadKN)
	opening := report.Quantity{Symbol: "Z_open", Name: "opening load: the shell-side corner x = b + t/2 opens (gap > 1 µm)", Value: orMissing(j.OpeningLoadKN, "kN"), Source: srcFE}
	if j.OpenAfterPreload {
		opening.Source = srcFE + ": the corner is open after preload already"
	} else if j.OpeningLoadKN == nil {
		opening.Source = srcFE + ": not reached"
	}
	dec := report.Quantity{Symbol: "Z_dec", Name: "decompression load: no contact left between bolt axis and shell face", Value: orMissing(j.DecompressionKN, "kN"), Source: srcFE}
	if j.DecompressionKN == nil {
		dec.Source = srcFE + ": not reached"
	}
	rows := []report.Quantity{
		{Symbol: "K_0", Name: "stiffness ΔZ/Δu, tangent at Z = 0, whole model", Value: num(j.StiffnessTangentZero, stiff), Source: srcFE},
		{Symbol: "K_0,j", Name: "stiffness, tangent at Z = 0, joint alone (shell stubs' elongation taken out)", Value: num(j.JointStiffnessTangent, stiff), Source: srcFE},
		{Symbol: "K_open", Name: "stiffness, secant to the opening load, whole model", Value: orMissing(j.StiffnessToOpening, stiff), Source: srcFE},
		{Symbol: "K_open,j", Name: "stiffness, secant to the opening load, joint alone", Value: orMissing(j.JointStiffnessOpening, stiff), Source: srcFE},
		{Symbol: "Z_ref", Name: "reference load of the secants", Value: num(j.ReferenceLoadKN, "kN"), Source: j.ReferenceFrom},
		{Symbol: "K_ref", Name: "stiffness, secant to " + ref + ", whole model", Value: orMissing(j.StiffnessToReference, stiff), Source: srcFE},
		{Symbol: "K_ref,j", Name: "stiffness, secant to " + ref + ", joint alone", Value: orMissing(j.JointStiffnessReference, stiff), Source: srcFE},
		{Name: "elongation of both shell stubs per kN, 2·L/(E·t·c)", Value: num(j.StubElongationPerKN, "mm/kN"), Source: srcDerived},
		{Symbol: "Φ_0", Name: "load factor ΔF_s/ΔZ, tangent at Z = 0", Value: num(j.LoadFactorTangentZero, report.Dimensionless), Source: srcFE},
		{Symbol: "Φ_ref", Name: "load factor, secant to " + ref, Value: orMissing(j.LoadFactorToReference, report.Dimensionless), Source: srcFE},
		opening,
		dec,
		{Symbol: "Z_max", Name: "largest segment force reached", Value: num(j.PeakLoadKN, "kN"), Source: srcFE},
		{Symbol: "u_peak", Name: "displacement at the largest segment force", Value: num(j.DisplacementPeakMM, "mm"), Source: srcFE},
		{Symbol: "u_end", Name: "displacement at the end of the run", Value: num(j.DisplacementEndMM, "mm"), Source: srcFE},
		{Name: "why the run ended", Value: report.Text(s.Ending), Source: srcFE},
		{Name: "failure mechanism", Value: report.Text(j.FailureLocation), Source: srcFE},
		{Name: "largest penetration of any contact pair", Value: num(j.PenetrationMaxMM, "mm"), Source: srcFE},
		{Symbol: "Z_u", Name: "hand-method ultimate load, " + j.HandUltimateBasis, Value: num(j.HandUltimateKN, "kN"), Source: srcHand},
	}
	if s.Failure != "" {
		rows = append(rows, report.Quantity{Name: "analysis stopped", Value: report.Text(s.Failure), Source: srcFE})
	}
	if v := s.Verdict; v != nil {
		rows = append(rows, report.Quantity{Symbol: "Z_Ed", Name: "design segment force", Value: num(v.DesignForceKN, "kN"), Source: "load.design_force"})
		for _, l := range v.Lines {
			rows = append(rows, report.Quantity{Symbol: "η", Name: fmt.Sprintf("utilisation Z_Ed/Z_u, %s, mode %s: %s", l.Method, l.Mode, l.Status),
				Value: report.NumDigits(l.Utilisation, report.Dimensionless, 3), Source: fmt.Sprintf("%s; borderline within 1 ± %s", srcHand, modelfile.FormatNumber(v.Margin))})
		}
		rows = append(rows, report.Quantity{Name: "verdict of the hand methods", Value: report.Text(verdictText(v)), Source: srcHand})
	}
	return report.Quantities{Caption: "Key results of the joint", Rows: rows}
}

// verdictText is the verdict in a sentence, as `flangeseg hand` prints it.
func verdictText(v *handcalc.Verdict) string {
	switch {
	case v.Borderline:
		return "borderline: a refined check is worth making"
	case v.Exceeded:
		return "exceeded by the hand methods"
	}
	return "the hand methods show a clear reserve"
}

// notAssessed reports whether the run's materials cannot fail: then peak
// load and mechanism are not results.
func (n *runNote) notAssessed() bool {
	return n.seg.Spec().Analysis.Materials == modelfile.ElasticOnly || strings.HasPrefix(n.sum.Joint.FailureLocation, "not assessed")
}

// basisText names a basis of the hand methods in words.
func basisText(b handcalc.Basis) string {
	switch b {
	case handcalc.BasisDesign:
		return "design, with k₂"
	case handcalc.BasisDesignNoK2:
		return "design, without k₂"
	case handcalc.BasisCharacteristic:
		return "characteristic, with k₂"
	case handcalc.BasisCharacteristicNoK2:
		return "characteristic, without k₂"
	}
	return string(b)
}

// handVersusFE sets the FE peak beside the ultimate loads of the hand
// methods, on every basis and by both mechanism methods.
func (n *runNote) handVersusFE() report.Table {
	h, j := n.seg.Hand(), n.sum.Joint
	t := report.Table{
		Caption: "Ultimate segment force by FE and by the plastic-hinge methods",
		Columns: []report.Column{{Heading: "method"}, {Heading: "basis"}, {Heading: "governing mode"},
			{Heading: "ultimate segment force", Unit: "kN"}, {Heading: "FE / method", Unit: report.Dimensionless}, {Heading: "source"}},
		Source: fmt.Sprintf("FE: this run; hand methods: post/handcalc, each with its source in its row. Modes: A %s; B %s; C %s.",
			handcalc.ModeA.Description(), handcalc.ModeB.Description(), handcalc.ModeC.Description()),
	}
	assessed := !n.notAssessed() && len(n.rows) > 1
	na := report.Text("not assessed: linear elastic materials")
	fe := []report.Cell{report.Text("FE, this run"), report.Text("material curves of the model"), report.Text(j.FailureLocation),
		report.Num(j.PeakLoadKN, ""), report.Num(1, ""), report.Text("largest Z of the tension stage")}
	if !assessed {
		fe[1], fe[3], fe[4] = report.Text("linear elastic"), na, report.Text("not assessed")
		if len(n.rows) < 2 {
			fe[2], fe[3] = report.Text("no tension stage"), report.Text("no tension stage")
		}
	}
	if assessed && n.rows[len(n.rows)-1].Z/1e3 >= j.PeakLoadKN {
		fe[5] = report.Text("largest Z of the tension stage, still rising at its end: a lower bound of the ultimate load")
	}
	t.Rows = append(t.Rows, fe)
	ratio := func(z float64) report.Cell {
		if !assessed || !(z > 0) {
			return report.Text("not assessed")
		}
		return report.Num(j.PeakLoadKN*1e3/z, "")
	}
	if assessed && j.MechanismMode != "" {
		t.Rows = append(t.Rows, []report.Cell{report.Text("the FE mechanism's own mode, by hand"), report.Text(basisText(handcalc.BasisCharacteristicNoK2)),
			report.Text(j.MechanismMode), report.Num(j.ModeHandKN, ""), ratio(j.ModeHandKN * 1e3),
			report.Text("Seidel (2001), the mode the FE mechanism matches, " + srcHand)})
	}
	for _, u := range h.Ultimate {
		for _, m := range []struct {
			name, source string
			mech         handcalc.Mechanisms
		}{
			{"plastic hinges", "Petersen, Stahlbau", u.Petersen},
			{"plastic hinges, shell hinge reduced by its axial force", "Seidel (2001)", u.Seidel},
		} {
			t.Rows = append(t.Rows, []report.Cell{report.Text(m.name), report.Text(basisText(u.Basis)), report.Text(string(m.mech.Governing)),
				report.Num(m.mech.Z/1e3, ""), ratio(m.mech.Z), report.Text(m.source + ", " + srcHand)})
		}
	}
	tr := h.Bolt.TensionResistance
	t.Rows = append(t.Rows, []report.Cell{report.Text("bolt tension resistance F_t,Rd"), report.Text(basisText(handcalc.BasisDesign)),
		report.Text(string(handcalc.ModeA)), report.Num(tr/1e3, ""), ratio(tr),
		report.Text(fmt.Sprintf("EN 1993-1-8 Table 3.4, k₂ = %s, γ_M2 = %s", modelfile.FormatNumber(h.Params.K2), modelfile.FormatNumber(h.Params.GammaM2)))})
	return t
}

func (n *runNote) convergence() report.Quantities {
	m, s := n.sum.Mesh, n.sum.Solver
	one := report.Dimensionless
	num := report.Num
	rows := []report.Quantity{
		{Name: "nodes", Value: num(float64(m.Nodes), one), Source: "mesh"},
		{Name: "elements, " + m.Element, Value: num(float64(m.Elements), one), Source: "mesh"},
		{Name: "smallest Jacobian ratio of an element", Value: num(m.MinJacobianRatio, one), Source: "mesh quality check"},
		{Name: "largest aspect ratio of an element", Value: num(m.MaxAspectRatio, one), Source: "mesh quality check"},
		{Name: "equations", Value: num(float64(m.Equations), one), Source: srcFE},
		{Name: "converged increments of the tension stage", Value: num(float64(s.Increments), one), Source: srcFE},
		{Name: "Newton iterations, all stages", Value: num(float64(s.NewtonIterations), one), Source: srcFE},
		{Name: "factorizations of the tangent", Value: num(float64(s.Factorizations), one), Source: srcFE},
		{Name: "Krylov (GMRES) steps", Value: num(float64(s.KrylovSteps), one), Source: srcFE},
		{Name: "preload solves", Value: num(float64(s.PreloadSolves), one), Source: srcFE},
		{Name: "contact penalty", Value: num(s.PenaltyMPaPerMM, "MPa/mm"), Source: "10·E/(mesh.size·mesh.refine)"},
		{Name: "largest penetration of any contact pair", Value: num(n.sum.Joint.PenetrationMaxMM, "mm"), Source: srcFE},
		{Name: "states written as field files", Value: num(float64(s.FieldStatesWritten), one), Source: srcFE},
	}
	if s.Increments > 0 {
		var tension int
		for _, r := range n.rows {
			if r.Stage != "preload" {
				tension += r.Iterations
			}
		}
		rows = append(rows, report.Quantity{Name: "mean Newton iterations per tension increment", Value: num(float64(tension)/float64(s.Increments), one), Source: srcFE})
	}
	return report.Quantities{Caption: "Solver statistics (times are in summary.json: they differ from machine to machine)", Rows: rows}
}

// notes are the limits of the model, in brief, and the model's warnings.
func (n *runNote) notes() []string {
	s := n.seg.Spec()
	plane := "plane stress"
	if s.Analysis.Plane == modelfile.PlaneStrain {
		plane = "plane strain"
	}
	springs := "Ring springs E·t/R² on the wall stand in for the hoop stiffness of the ring."
	if !s.Analysis.RingSprings {
		springs = "Ring springs are off: the end condition of the shell stub decides how much moment the shell carries, and with it the prying force."
	}
	out := []string{
		"Strip model: a 2D " + plane + " section through the bolt axis of one segment, whose out-of-plane thicknesses keep the areas that matter (shell and flange c, flange across the hole c − d_h, bolt A and A_s with the in-plane width (√3/2)·d, bearing parts the washer annulus). " + springs + " What varies around the circumference — the contact pressure between the bolts, the bolt's bending out of plane, ovalisation of the ring — is outside the model.",
	}
	if s.Analysis.LargeDeformation {
		out = append(out, "Kinematics: large deformation (total Lagrangian, logarithmic strain). Contact: finite sliding in the current configuration, penalty with augmented-Lagrangian updates, Coulomb friction.")
	} else {
		out = append(out, "Kinematics: small strain. Contact: small sliding (gap and slip along the reference geometry), penalty with augmented-Lagrangian updates, Coulomb friction; the largest penetration is in the key results.")
	}
	if s.Analysis.Materials == modelfile.ElasticOnly {
		out = append(out, `Materials: every part linear elastic (analysis.materials = "elastic"). The note covers the service range — stiffness, load factor, opening, bolt-force function; the largest segment force is where the displacement ended, not an ultimate load, and no failure mechanism is assessed.`)
	} else {
		out = append(out, "Materials: von Mises plasticity with isotropic hardening on each part's curve; the preload slice of the bolt stays elastic. The failure mechanism is read from where the plastic strain concentrates.")
	}
	out = append(out, "The loaded shell end is a rigid edge moved along the tower axis (rotation "+s.Load.EndRotation+"); the other end is fixed. Z is the segment force per bolt.")
	for _, w := range n.seg.Derived().Warnings {
		out = append(out, "Warning: "+w+".")
	}
	if n.sum.Failure != "" {
		out = append(out, "The analysis stopped before its end ("+n.sum.Failure+"); every result comes from the increments that converged.")
	}
	return out
}

// closingSource says how the closing force was found and to what
// resolution.
func closingSource(c *figures.Closure) string {
	switch {
	case c.GapLeftMM > figures.OpenGap:
		return "; the gap stays open, so the whole preload went into closing it"
	case c.ClosingForceKN == nil:
		return "; not found: a separate tightening with the shell end free did not give it (see the gap's note)"
	case len(c.ClosingBetweenKN) != 2:
		return "; nothing to close"
	}
	return fmt.Sprintf("; a separate tightening of the joint in levels with the shell end free, stopped once the faces closed (the analysis's preload path is not changed): where the largest gap inside the zones falls to 1 µm, read linearly in the gap between its levels at %.1f and %.1f kN (resolution: one level)",
		c.ClosingBetweenKN[0], c.ClosingBetweenKN[1])
}
