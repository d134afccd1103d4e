package figures

import (
	"fmt"
	"math"

	"flangeseg/post/handcalc"
)

// Joint are the numbers an engineer reads off the curves (DESIGN.md,
// "Outputs — names").
type Joint struct {
	PreloadTargetKN    float64  `json:"preload_target_kN,omitempty"`
	PreloadReachedKN   float64  `json:"preload_reached_kN"`
	PreloadEigenstrain float64  `json:"preload_slice_strain"`
	OpeningLoadKN      *float64 `json:"opening_load_kN"`
	OpenAfterPreload   bool     `json:"open_after_preload"`
	// Closure describes how the preload closed an initial gap between the
	// faces (taper, parallel gap); nil when the faces start closed.
	Closure         *Closure `json:"face_closure,omitempty"`
	DecompressionKN *float64 `json:"decompression_load_kN"`
	ReferenceLoadKN float64  `json:"reference_load_kN"`
	ReferenceFrom   string   `json:"reference_load_from"`

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

// OpenGap is the opening that counts as open, mm (DESIGN.md: gap > 1 µm).
const OpenGap = 1e-3

// crossing returns the first Z at which f(row) passes from false to true,
// interpolating linearly on the quantity q between the two rows.
func crossing(rows []Row, q func(Row) float64, above float64) *float64 {
	i := crossingRow(rows, q, above)
	if i < 0 {
		return nil
	}
	a, b := q(rows[i-1]), q(rows[i])
	t := (above - a) / (b - a)
	z := (rows[i-1].Z + t*(rows[i].Z-rows[i-1].Z)) / 1e3
	return &z
}

// crossingRow is the first row i ≥ 1 at which q rises past above (q of
// row i−1 ≤ above < q of row i), or −1.
func crossingRow(rows []Row, q func(Row) float64, above float64) int {
	for i := 1; i < len(rows); i++ {
		if q(rows[i-1]) <= above && q(rows[i]) > above {
			return i
		}
	}
	return -1
}

// At interpolates the row quantity q at segment force z (N) on the rising
// part of the curve; false if z is not reached.
func At(rows []Row, z float64, q func(Row) float64) (float64, bool) {
	for i := 1; i < len(rows); i++ {
		if rows[i].Z >= z && rows[i-1].Z < z {
			t := (z - rows[i-1].Z) / (rows[i].Z - rows[i-1].Z)
			return q(rows[i-1]) + t*(q(rows[i])-q(rows[i-1])), true
		}
	}
	return 0, false
}

// Input is what the figures need beside the history.
type Input struct {
	PreloadTarget      float64 // F_p the preload aimed at, N; 0 for a nut turn
	PreloadReached     float64 // bolt force after the preload stage, N
	PreloadEigenstrain float64 // locked shortening strain of the preload slice
	Hand               handcalc.Results
	ServiceForce       *float64 // the reference load of the secants, N; nil: 40 % of the hand-method ultimate load
	// StubElongation is the elongation of both shell stubs per unit
	// segment force, 2·L/(E·t·c), mm/N: both stubs stretch as bars, and
	// that is taken out for the stiffness of the joint alone, since the
	// modelled length is arbitrary.
	StubElongation float64
	// Yielding says the laws are path-dependent: then the peak load and
	// the mechanism are results of the run.
	Yielding bool
}

// Read reads the joint figures off the rows of a run (the preload row
// first) and names its failure mechanism.
func Read(rows []Row, in Input) Joint {
	f := Joint{PreloadTargetKN: in.PreloadTarget / 1e3, PreloadReachedKN: in.PreloadReached / 1e3,
		PreloadEigenstrain: in.PreloadEigenstrain, FailureLocation: "not assessed: linear elastic materials"}
	f.HandUltimateKN = in.Hand.CurveEnd / 1e3
	f.HandUltimateBasis = "Seidel, characteristic, without k2 (post/handcalc)"
	stub := in.StubElongation
	f.StubElongationPerKN = stub * 1e3
	if in.ServiceForce != nil {
		f.ReferenceLoadKN, f.ReferenceFrom = *in.ServiceForce/1e3, "load.service_force"
	} else {
		f.ReferenceLoadKN, f.ReferenceFrom = 0.4*f.HandUltimateKN, "40 % of the hand-method ultimate load"
	}
	for _, r := range rows {
		f.PenetrationMaxMM = math.Max(f.PenetrationMaxMM, r.Penetration)
		if r.Z/1e3 > f.PeakLoadKN {
			f.PeakLoadKN, f.DisplacementPeakMM = r.Z/1e3, r.U
		}
	}
	f.FEVersusHand = "not assessed: linear elastic materials (no FE ultimate load)"
	if !in.Yielding || len(rows) == 0 {
		return curveFigures(rows, f, stub)
	}
	last := rows[len(rows)-1]
	prying := 0.0
	if last.Z > 0 {
		prying = last.Fs / last.Z
	}
	var mode handcalc.Mode
	f.FailureLocation, mode = Mechanism(last.SitePlastic, prying)
	f.MaxPlasticStrain, f.MaxDamage = last.MaxPlastic, last.MaxDamage
	if f.HandUltimateKN > 0 {
		f.FEToHandUltimate = f.PeakLoadKN / f.HandUltimateKN
		// Rising at the end means the last row is the largest and still
		// climbing: a path that fell from its peak and rises again by a
		// rounding in its last increment has shown its peak.
		rising := len(rows) > 1 && last.Z >= rows[len(rows)-2].Z && last.Z/1e3 >= f.PeakLoadKN
		if rising {
			f.FEVersusHand = fmt.Sprintf("FE largest Z %.1f kN is %.2f × the hand ultimate load %.1f kN, and still rising at the end: a lower bound of the FE ultimate load", f.PeakLoadKN, f.FEToHandUltimate, f.HandUltimateKN)
		} else {
			f.FEVersusHand = fmt.Sprintf("FE peak %.1f kN is %.2f × the hand ultimate load %.1f kN", f.PeakLoadKN, f.FEToHandUltimate, f.HandUltimateKN)
		}
		if u, ok := in.Hand.UltimateOn(handcalc.BasisCharacteristicNoK2); ok && mode != "" {
			f.MechanismMode, f.ModeHandKN = string(mode), modeValue(u.Seidel, mode)/1e3
			f.FEToMode = f.PeakLoadKN / f.ModeHandKN
			f.FEVersusHand += fmt.Sprintf("; the FE mechanism is Petersen's mode %s, whose hand value is %.1f kN (FE/hand %.2f)", mode, f.ModeHandKN, f.FEToMode)
		}
	}
	return curveFigures(rows, f, stub)
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

// curveFigures reads the service-range figures off the curves:
// stiffness, load factor, opening and decompression load.
func curveFigures(rows []Row, f Joint, stub float64) Joint {
	if len(rows) < 2 {
		return f
	}
	f.DisplacementEndMM = rows[len(rows)-1].U
	p, first := rows[0], rows[1]
	secant := func(z, u float64) float64 { return (z - p.Z) / 1e3 / (u - p.U) }
	joint := func(z, u float64) float64 { return (z - p.Z) / 1e3 / (u - p.U - (z-p.Z)*stub) }
	f.StiffnessTangentZero = secant(first.Z, first.U)
	f.JointStiffnessTangent = joint(first.Z, first.U)
	f.LoadFactorTangentZero = (first.Fs - p.Fs) / (first.Z - p.Z)
	if p.GapEdge > OpenGap {
		// The corner is open after preload already (a band face bent by
		// the preload): it opens at Z = 0.
		zero := 0.0
		f.OpeningLoadKN = &zero
		f.OpenAfterPreload = true
	} else {
		f.OpeningLoadKN = crossing(rows, edgeGap, OpenGap)
	}
	f.DecompressionKN = crossing(rows, shellSideRelief, decompressed)
	if f.OpeningLoadKN != nil && *f.OpeningLoadKN > 0 {
		z := *f.OpeningLoadKN * 1e3
		if u, ok := At(rows, z, func(r Row) float64 { return r.U }); ok {
			k, kj := secant(z, u), joint(z, u)
			f.StiffnessToOpening, f.JointStiffnessOpening = &k, &kj
		}
	}
	zr := f.ReferenceLoadKN * 1e3
	if u, ok := At(rows, zr, func(r Row) float64 { return r.U }); ok {
		k, kj := secant(zr, u), joint(zr, u)
		f.StiffnessToReference, f.JointStiffnessReference = &k, &kj
		if fs, ok := At(rows, zr, func(r Row) float64 { return r.Fs }); ok {
			lf := (fs - p.Fs) / (zr - p.Z)
			f.LoadFactorToReference = &lf
		}
	}
	return f
}

// Closure is what the preload did to an initial gap between the faces
// where they are meant to touch (the defined contact zones, or the whole
// face). A 2D strip has no neighbouring segments: nothing but the flanges'
// and the shell's own bending resists closing the gap, where in a ring the
// segments on either side hold it open too, so the strip closes more of it,
// for less bolt force, than the ring would.
type Closure struct {
	InitialGapMM float64 `json:"initial_gap_max_mm"`
	// GapLeftMM is the largest gap left open after the preload, at x =
	// GapLeftAtXMM.
	GapLeftMM    float64 `json:"gap_left_after_preload_mm"`
	GapLeftAtXMM float64 `json:"gap_left_at_x_mm"`
	Note         string  `json:"note"`
	// ClosingForceKN is the bolt force at which the largest gap inside
	// the zones fell to 1 µm, found by a separate tightening of a fresh
	// model with the shell end free, in levels, stopped at the first level
	// whose gap is closed, and read linearly in the gap between that level
	// and the one before, whose bolt forces ClosingBetweenKN gives. Where
	// the preload leaves the gap open it is the whole preload (no search).
	// It is null where the search found none (the note says why).
	// ClosingShare is its share of the preload reached.
	ClosingForceKN   *float64  `json:"closing_force_kN"`
	ClosingShare     *float64  `json:"closing_force_share_of_preload"`
	ClosingBetweenKN []float64 `json:"closing_force_between_levels_kN,omitempty"`
	// ClosingSearch is what the separate tightening cost, apart from the
	// analysis (nil where none ran).
	ClosingSearch *ClosingSearch `json:"closing_search,omitempty"`
}

// ClosingSearch is the cost of the separate tightening that looked for
// the closing force.
type ClosingSearch struct {
	Levels           int `json:"levels"`
	NewtonIterations int `json:"newton_iterations"`
	StepHalvings     int `json:"step_halvings"`
}
