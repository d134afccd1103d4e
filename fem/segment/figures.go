package segment

import (
	"fmt"
	"math"

	"flangeseg/post/handcalc"
)

// jointFigures are the numbers an engineer reads off the curves (DESIGN.md,
// "Outputs — names").
type jointFigures struct {
	PreloadTargetKN    float64  `json:"preload_target_kN,omitempty"`
	PreloadReachedKN   float64  `json:"preload_reached_kN"`
	PreloadEigenstrain float64  `json:"preload_slice_strain"`
	OpeningLoadKN      *float64 `json:"opening_load_kN"`
	OpenAfterPreload   bool     `json:"open_after_preload"`
	DecompressionKN    *float64 `json:"decompression_load_kN"`
	ReferenceLoadKN    float64  `json:"reference_load_kN"`
	ReferenceFrom      string   `json:"reference_load_from"`

	StiffnessTangentZero    float64  `json:"stiffness_tangent_at_zero_kN_per_mm"`
	StiffnessToOpening      *float64 `json:"stiffness_secant_to_opening_kN_per_mm"`
	StiffnessToReference    *float64 `json:"stiffness_secant_to_reference_kN_per_mm"`
	JointStiffnessTangent   float64  `json:"joint_stiffness_tangent_at_zero_kN_per_mm"`
	JointStiffnessOpening   *float64 `json:"joint_stiffness_secant_to_opening_kN_per_mm"`
	JointStiffnessReference *float64 `json:"joint_stiffness_secant_to_reference_kN_per_mm"`

	LoadFactorTangentZero float64  `json:"load_factor_tangent_at_zero"`
	LoadFactorToReference *float64 `json:"load_factor_secant_to_reference"`

	PeakLoadKN         float64 `json:"peak_load_kN"`
	DisplacementPeakMM float64 `json:"displacement_at_peak_mm"`
	DisplacementEndMM  float64 `json:"displacement_at_end_mm"`
	PenetrationMaxMM   float64 `json:"penetration_max_mm"`
	FailureLocation    string  `json:"failure_location"` // the failure mechanism, from where plastic strain concentrates at the end
	MaxPlasticStrain   float64 `json:"max_plastic_strain"`
	MaxDamage          float64 `json:"max_damage"`
	HandUltimateKN     float64 `json:"hand_ultimate_kN"`
	HandUltimateBasis  string  `json:"hand_ultimate_basis"`
	// FEVersusHand states how the FE ultimate load compares with the hand
	// methods' best estimate, in words and as the ratio of the FE peak to
	// it (0 when the FE side is not assessed).
	FEVersusHand     string  `json:"fe_versus_hand"`
	FEToHandUltimate float64 `json:"fe_peak_over_hand_ultimate"`
	// MechanismMode is the Petersen mode the FE mechanism matches (empty
	// if none), ModeHandKN that mode's hand value on the same basis as
	// HandUltimateKN, and FEToMode the FE peak over it: where the FE does
	// not form the mechanism that governs by hand, this is the like-for-
	// like comparison.
	MechanismMode       string  `json:"fe_mechanism_mode,omitempty"`
	ModeHandKN          float64 `json:"fe_mechanism_mode_hand_kN,omitempty"`
	FEToMode            float64 `json:"fe_peak_over_fe_mechanism_mode,omitempty"`
	StubElongationPerKN float64 `json:"stub_elongation_per_kN_mm"`
}

// openGap is the opening that counts as open (DESIGN.md: gap > 1 µm).
const openGap = 1e-3

// crossing returns the first Z at which f(row) passes from false to true,
// interpolating linearly on the quantity q between the two rows.
func crossing(rows []historyRow, q func(historyRow) float64, above float64) *float64 {
	for i := 1; i < len(rows); i++ {
		a, b := q(rows[i-1]), q(rows[i])
		if a <= above && b > above {
			t := (above - a) / (b - a)
			z := (rows[i-1].z + t*(rows[i].z-rows[i-1].z)) / 1e3
			return &z
		}
	}
	return nil
}

// at interpolates the row quantity q at segment force z (N) on the rising
// part of the curve; false if z is not reached.
func at(rows []historyRow, z float64, q func(historyRow) float64) (float64, bool) {
	for i := 1; i < len(rows); i++ {
		if rows[i].z >= z && rows[i-1].z < z {
			t := (z - rows[i-1].z) / (rows[i].z - rows[i-1].z)
			return q(rows[i-1]) + t*(q(rows[i])-q(rows[i-1])), true
		}
	}
	return 0, false
}

func figures(g *segment, res *analysis) jointFigures {
	f := jointFigures{PreloadTargetKN: g.der.PreloadForce / 1e3, PreloadReachedKN: res.preload.Force / 1e3,
		PreloadEigenstrain: res.preload.Eigenstrain, FailureLocation: "not assessed: linear elastic materials"}
	f.HandUltimateKN = g.hand.CurveEnd / 1e3
	f.HandUltimateBasis = "Seidel, characteristic, without k2 (post/handcalc)"
	rows := res.rows
	// Both shell stubs stretch as bars, Z·L/(E·t·c) each: taken out for the
	// stiffness of the joint alone, since the modelled length is arbitrary.
	stub := 2 * g.spec.Shell.Length / (g.shellE * g.spec.Shell.Thickness * g.der.SegmentWidth)
	f.StubElongationPerKN = stub * 1e3
	if g.spec.Load.ServiceForce != nil {
		f.ReferenceLoadKN, f.ReferenceFrom = *g.spec.Load.ServiceForce/1e3, "load.service_force"
	} else {
		f.ReferenceLoadKN, f.ReferenceFrom = 0.4*f.HandUltimateKN, "40 % of the hand-method ultimate load"
	}
	for _, r := range rows {
		f.PenetrationMaxMM = math.Max(f.PenetrationMaxMM, r.penetration)
		if r.z/1e3 > f.PeakLoadKN {
			f.PeakLoadKN, f.DisplacementPeakMM = r.z/1e3, r.u
		}
	}
	f.FEVersusHand = "not assessed: linear elastic materials (no FE ultimate load)"
	if !g.model.HasHistory() || len(rows) == 0 {
		return jointCurveFigures(g, res, f, stub)
	}
	last := rows[len(rows)-1]
	prying := 0.0
	if last.z > 0 {
		prying = last.fs / last.z
	}
	var mode handcalc.Mode
	f.FailureLocation, mode = mechanism(last.sitePlastic, prying)
	f.MaxPlasticStrain, f.MaxDamage = last.maxPlastic, last.maxDamage
	if f.HandUltimateKN > 0 {
		f.FEToHandUltimate = f.PeakLoadKN / f.HandUltimateKN
		rising := len(rows) > 1 && last.z >= rows[len(rows)-2].z
		if rising {
			f.FEVersusHand = fmt.Sprintf("FE largest Z %.1f kN is %.2f × the hand ultimate load %.1f kN, and still rising at the end: a lower bound of the FE ultimate load", f.PeakLoadKN, f.FEToHandUltimate, f.HandUltimateKN)
		} else {
			f.FEVersusHand = fmt.Sprintf("FE peak %.1f kN is %.2f × the hand ultimate load %.1f kN", f.PeakLoadKN, f.FEToHandUltimate, f.HandUltimateKN)
		}
		if u, ok := g.hand.UltimateOn(handcalc.BasisCharacteristicNoK2); ok && mode != "" {
			f.MechanismMode, f.ModeHandKN = string(mode), modeValue(u.Seidel, mode)/1e3
			f.FEToMode = f.PeakLoadKN / f.ModeHandKN
			f.FEVersusHand += fmt.Sprintf("; the FE mechanism is Petersen's mode %s, whose hand value is %.1f kN (FE/hand %.2f)", mode, f.ModeHandKN, f.FEToMode)
		}
	}
	return jointCurveFigures(g, res, f, stub)
}

// modeValue is a mode's ultimate segment force, N.
func modeValue(m handcalc.Mechanisms, mode handcalc.Mode) float64 {
	switch mode {
	case handcalc.ModeA:
		return m.A
	case handcalc.ModeB:
		return m.B
	}
	return m.C
}

// jointCurveFigures reads the service-range figures off the curves:
// stiffness, load factor, opening and decompression load.
func jointCurveFigures(g *segment, res *analysis, f jointFigures, stub float64) jointFigures {
	rows := res.rows
	if len(rows) < 2 {
		return f
	}
	f.DisplacementEndMM = rows[len(rows)-1].u
	p, first := rows[0], rows[1]
	secant := func(z, u float64) float64 { return (z - p.z) / 1e3 / (u - p.u) }
	joint := func(z, u float64) float64 { return (z - p.z) / 1e3 / (u - p.u - (z-p.z)*stub) }
	f.StiffnessTangentZero = secant(first.z, first.u)
	f.JointStiffnessTangent = joint(first.z, first.u)
	f.LoadFactorTangentZero = (first.fs - p.fs) / (first.z - p.z)
	if p.gapEdge > openGap {
		// The corner is open after preload already (a band face bent by
		// the preload): it opens at Z = 0.
		zero := 0.0
		f.OpeningLoadKN = &zero
		f.OpenAfterPreload = true
	} else {
		f.OpeningLoadKN = crossing(rows, func(r historyRow) float64 { return r.gapEdge }, openGap)
	}
	f.DecompressionKN = crossing(rows, func(r historyRow) float64 { return -r.shellSide }, -1e-6)
	if f.OpeningLoadKN != nil && *f.OpeningLoadKN > 0 {
		z := *f.OpeningLoadKN * 1e3
		if u, ok := at(rows, z, func(r historyRow) float64 { return r.u }); ok {
			k, kj := secant(z, u), joint(z, u)
			f.StiffnessToOpening, f.JointStiffnessOpening = &k, &kj
		}
	}
	zr := f.ReferenceLoadKN * 1e3
	if u, ok := at(rows, zr, func(r historyRow) float64 { return r.u }); ok {
		k, kj := secant(zr, u), joint(zr, u)
		f.StiffnessToReference, f.JointStiffnessReference = &k, &kj
		if fs, ok := at(rows, zr, func(r historyRow) float64 { return r.fs }); ok {
			lf := (fs - p.fs) / (zr - p.z)
			f.LoadFactorToReference = &lf
		}
	}
	return f
}

// handCurves samples the hand bolt-force models over [0, zmax] (N).
func handCurves(h handcalc.Results, zmax float64) (z, diagram, trilinear []float64) {
	const n = 60
	for i := 0; i <= n; i++ {
		x := zmax * float64(i) / n
		z = append(z, x/1e3)
		diagram = append(diagram, h.JointDiagram.Force(x)/1e3)
		trilinear = append(trilinear, h.Trilinear.Force(x)/1e3)
	}
	return z, diagram, trilinear
}
