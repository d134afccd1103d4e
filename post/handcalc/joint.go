package handcalc

import (
	"fmt"
	"math"

	"flangeseg/material/bolt"
)

// Joint is one bolt segment of an L-flange joint, in mm, N and MPa.
type Joint struct {
	T  float64 `json:"t"`   // t, shell thickness
	Tf float64 `json:"t_f"` // t_f, flange thickness
	A  float64 `json:"a"`   // a, bolt axis → flange free edge
	B  float64 `json:"b"`   // b, bolt axis → shell mid-surface
	C  float64 `json:"c"`   // c, segment width (bolt spacing on the bolt circle)

	// Size names an ISO 261 coarse thread ("M48"); leave it empty and give
	// D and Pitch for any other thread.
	Size  string  `json:"size,omitempty"`
	D     float64 `json:"d,omitempty"`     // d, bolt diameter
	Pitch float64 `json:"pitch,omitempty"` // P, thread pitch
	Grade string  `json:"grade"`           // property class: "8.8", "10.9" or "12.9"

	Hole            float64 `json:"d_h"`              // d_h, hole diameter
	Washer          float64 `json:"d_w"`              // d_w, washer outer diameter
	WasherThickness float64 `json:"washer_thickness"` // of each of the two washers (head and nut side)

	// FreeThread is the length of free, loaded thread inside the clamp:
	// the clamp length 2·t_f + 2·washer_thickness for a fully threaded
	// bolt, a few pitches for a bolt with a shank.
	FreeThread float64 `json:"free_thread"`

	ShellFy  float64 `json:"shell_f_y"`  // f_y of the shell, MPa
	FlangeFy float64 `json:"flange_f_y"` // f_y of the flange, MPa
	Preload  float64 `json:"preload"`    // F_p, N
	E        float64 `json:"e"`          // Young's modulus of bolt, nut, washers and flanges, MPa
}

// ClampLength returns l_K = 2·t_f + 2·washer thickness, mm.
func (j Joint) ClampLength() float64 { return 2*j.Tf + 2*j.WasherThickness }

// Thread returns the bolt thread: the named coarse thread, or d and P.
func (j Joint) Thread() (bolt.Thread, error) {
	if j.Size != "" {
		return bolt.CoarseThread(j.Size)
	}
	t := bolt.Thread{D: j.D, Pitch: j.Pitch}
	return t, t.Valid()
}

// Validate reports every field that breaks a rule, each with its value and
// the rule, joined into one error.
func (j Joint) Validate() error {
	var v violations
	v.check("t", j.T, j.T > 0, "must be > 0")
	v.check("t_f", j.Tf, j.Tf > 0, "must be > 0")
	v.check("a", j.A, j.A > 0, "must be > 0")
	v.check("b", j.B, j.B > 0, "must be > 0")
	v.check("c", j.C, j.C > 0, "must be > 0")
	d := j.D
	switch {
	case j.Size != "" && (j.D != 0 || j.Pitch != 0):
		v.add("size = %q with d = %g, pitch = %g: give a size or d and pitch, not both", j.Size, j.D, j.Pitch)
	case j.Size != "":
		t, err := bolt.CoarseThread(j.Size)
		if err != nil {
			v.add("size = %q: %w", j.Size, err)
		}
		d = t.D
	default:
		v.check("d", j.D, j.D > 0, "must be > 0 (or give size)")
		v.check("pitch", j.Pitch, j.Pitch > 0 && j.D-bolt.MinorDiameterFactor*j.Pitch > 0, "must be > 0 and leave d − 1.2269·P > 0")
	}
	if _, err := bolt.NominalGrade(j.Grade); err != nil {
		v.add("grade = %q: must be 8.8, 10.9 or 12.9", j.Grade)
	}
	v.check("d_h", j.Hole, j.Hole > d, fmt.Sprintf("must exceed the bolt diameter d = %g", d))
	v.check("d_w", j.Washer, j.Washer > j.Hole, fmt.Sprintf("must exceed the hole diameter d_h = %g", j.Hole))
	v.check("c", j.C, j.C > j.Hole, fmt.Sprintf("must exceed the hole diameter d_h = %g (net flange width c − d_h)", j.Hole))
	v.check("a", j.A, j.A > j.Hole/2, fmt.Sprintf("must exceed d_h/2 = %g (the hole lies inside the flange)", j.Hole/2))
	v.check("b", j.B, j.B-j.T/2 > j.Hole/2, fmt.Sprintf("must exceed t/2 + d_h/2 = %g (the hole clears the shell)", (j.T+j.Hole)/2))
	v.check("washer_thickness", j.WasherThickness, j.WasherThickness >= 0, "must be ≥ 0")
	lk := j.ClampLength()
	v.check("free_thread", j.FreeThread, j.FreeThread >= 0 && j.FreeThread <= lk,
		fmt.Sprintf("must lie in [0, l_K = %g] (l_K = 2·t_f + 2·washer_thickness)", lk))
	v.check("shell_f_y", j.ShellFy, j.ShellFy > 0, "must be > 0")
	v.check("flange_f_y", j.FlangeFy, j.FlangeFy > 0, "must be > 0")
	v.check("preload", j.Preload, j.Preload > 0, "must be > 0")
	v.check("e", j.E, j.E > 0, "must be > 0")
	return v.err("joint")
}

// Params holds the factors of the methods. Start from DefaultParams.
type Params struct {
	K2      float64 `json:"k2"`       // k₂ on the bolt's tensile resistance (EN 1993-1-8 Table 3.4)
	GammaM2 float64 `json:"gamma_m2"` // γ_M2, partial factor of the bolt (EN 1993-1-8 2.2)
	GammaM0 float64 `json:"gamma_m0"` // γ_M0, partial factor of shell and flange (EN 1993-1-1 6.1)

	// LeverLimit bounds the mode-B lever arm, a' = min(a, LeverLimit·b);
	// 0 means no bound (see Petersen).
	LeverLimit float64 `json:"lever_limit"`

	// LoadIntroduction is VDI 2230's load-introduction factor n for the
	// joint diagram (see DefaultParams).
	LoadIntroduction float64 `json:"load_introduction"`

	// ArmFactor is a'/a, the reduced lever arm of the trilinear model's
	// last branch (see Trilinear).
	ArmFactor float64 `json:"arm_factor"`
}

// DefaultParams returns k₂ = 0.9, γ_M2 = 1.25 (EN 1993-1-8), γ_M0 = 1.0
// (EN 1993-1-1, recommended value), the mode-B bound a ≤ 1.25·b, n = 0.5 and
// a'/a = 0.7.
//
// n = 0.5 says the segment force enters each flange halfway between its
// bearing face and the interface. The shell meets the flange over its whole
// thickness and passes its force in by bending of the flange rather than at
// either face, so neither limit (n = 1 at the bearing faces, n → 0 at the
// interface) applies; halfway is the usual estimate when the load
// introduction is not worked out in detail (common practice; VDI 2230
// Part 1 gives n for standard cases in a table that we do not reproduce).
func DefaultParams() Params {
	return Params{K2: 0.9, GammaM2: 1.25, GammaM0: 1.0, LeverLimit: 1.25, LoadIntroduction: 0.5, ArmFactor: 0.7}
}

// Validate reports every factor out of its range, joined into one error.
func (p Params) Validate() error {
	var v violations
	v.check("k2", p.K2, p.K2 > 0 && p.K2 <= 1, "must be in (0, 1]")
	v.check("gamma_m2", p.GammaM2, p.GammaM2 >= 1, "must be ≥ 1")
	v.check("gamma_m0", p.GammaM0, p.GammaM0 >= 1, "must be ≥ 1")
	v.check("lever_limit", p.LeverLimit, p.LeverLimit >= 0, "must be ≥ 0 (0 = no bound)")
	v.check("load_introduction", p.LoadIntroduction, p.LoadIntroduction > 0 && p.LoadIntroduction <= 1, "must be in (0, 1]")
	v.check("arm_factor", p.ArmFactor, p.ArmFactor > 0 && p.ArmFactor <= 1, "must be in (0, 1]")
	return v.err("params")
}

// Basis says which resistances an ultimate load is built from.
type Basis string

// The bases, in the order Results lists them.
const (
	// BasisDesign: bolt F_t,Rd = k₂·f_ub·A_s/γ_M2, shell and flange f_y/γ_M0.
	BasisDesign Basis = "design"
	// BasisDesignNoK2: bolt f_ub·A_s/γ_M2, shell and flange f_y/γ_M0.
	BasisDesignNoK2 Basis = "design_without_k2"
	// BasisCharacteristic: bolt k₂·f_ub·A_s, shell and flange f_y.
	BasisCharacteristic Basis = "characteristic"
	// BasisCharacteristicNoK2: bolt f_ub·A_s, shell and flange f_y.
	BasisCharacteristicNoK2 Basis = "characteristic_without_k2"
)

// Bases returns the bases in the order Results lists them.
func Bases() []Basis {
	return []Basis{BasisDesign, BasisDesignNoK2, BasisCharacteristic, BasisCharacteristicNoK2}
}

// Ultimate is the ultimate segment force on one basis by Petersen's
// mechanisms and by Seidel's extension.
type Ultimate struct {
	Basis    Basis      `json:"basis"`
	Hinges   Hinges     `json:"hinges"` // the resistances used
	Petersen Mechanisms `json:"petersen"`
	Seidel   Mechanisms `json:"seidel"`
}

// SegmentHinges returns the resistances of the joint's segment on a basis:
// the bolt's, M_pl,shell = f_y·c·t²/4 and N_pl = f_y·c·t of the shell, the
// flange's f_y·c·t_f²/4 at the shell face and f_y·(c − d_h)·t_f²/4 at the
// bolt line, with the partial factors the basis asks for.
func SegmentHinges(j Joint, p Params, basis Basis) (Hinges, error) {
	if err := j.Validate(); err != nil {
		return Hinges{}, err
	}
	if err := p.Validate(); err != nil {
		return Hinges{}, err
	}
	return segmentHinges(j, p, basis)
}

func segmentHinges(j Joint, p Params, basis Basis) (Hinges, error) {
	k2, gammaM2, gammaM0 := p.K2, p.GammaM2, p.GammaM0
	switch basis {
	case BasisDesign:
	case BasisDesignNoK2:
		k2 = 1
	case BasisCharacteristic:
		gammaM2, gammaM0 = 1, 1
	case BasisCharacteristicNoK2:
		k2, gammaM2, gammaM0 = 1, 1, 1
	default:
		return Hinges{}, fmt.Errorf("handcalc: basis %q: want one of %v", basis, Bases())
	}
	t, err := j.Thread()
	if err != nil {
		return Hinges{}, err
	}
	g, err := bolt.NominalGrade(j.Grade)
	if err != nil {
		return Hinges{}, err
	}
	fys, fyf := j.ShellFy/gammaM0, j.FlangeFy/gammaM0
	return Hinges{
		A:           j.A,
		B:           j.B,
		Bolt:        TensionResistance(t.StressArea(), g.Fub, k2, gammaM2),
		Shell:       fys * j.C * j.T * j.T / 4,
		ShellAxial:  fys * j.C * j.T,
		FlangeGross: fyf * j.C * j.Tf * j.Tf / 4,
		FlangeNet:   fyf * (j.C - j.Hole) * j.Tf * j.Tf / 4,
		LeverLimit:  p.LeverLimit,
	}, nil
}

// BoltResults describes the bolt and its code resistances.
type BoltResults struct {
	Thread        bolt.Thread `json:"thread"`
	PitchDiameter float64     `json:"d_2"`  // d₂, mm
	MinorDiameter float64     `json:"d_3"`  // d₃, mm
	NominalArea   float64     `json:"area"` // A = π·d²/4, mm²
	StressArea    float64     `json:"a_s"`  // A_s, mm²
	Nominal       bolt.Grade  `json:"nominal_grade"`
	Minimum       bolt.Grade  `json:"minimum_grade"`

	TensionResistance float64 `json:"f_t_rd"` // F_t,Rd = k₂·f_ub·A_s/γ_M2, N
	PreloadForce      float64 `json:"f_p_c"`  // F_p,C = 0.7·f_ub·A_s, N
}

// Results collects the hand methods for one joint. Forces in N, lengths in
// mm, resiliences in mm/N.
type Results struct {
	Params Params      `json:"params"`
	Bolt   BoltResults `json:"bolt"`

	// Ultimate holds one entry per basis, in the order of Bases.
	Ultimate []Ultimate `json:"ultimate"`

	BoltBody        BoltBody        `json:"bolt_body"`
	BoltResilience  BoltResilience  `json:"bolt_resilience"`
	Clamp           Clamp           `json:"clamp"`
	ClampResilience ClampResilience `json:"clamp_resilience"`

	JointDiagram JointDiagram `json:"joint_diagram"`
	Trilinear    Trilinear    `json:"trilinear"`

	// CurveEnd is where the characteristic points end: the ultimate load on
	// the characteristic basis without k₂ by Seidel, the best estimate of
	// the real capacity.
	CurveEnd           float64 `json:"curve_end"`
	JointDiagramPoints []Point `json:"joint_diagram_points"`
	TrilinearPoints    []Point `json:"trilinear_points"`
}

// UltimateOn returns the entry of a basis.
func (r Results) UltimateOn(b Basis) (Ultimate, bool) {
	for _, u := range r.Ultimate {
		if u.Basis == b {
			return u, true
		}
	}
	return Ultimate{}, false
}

// OuterDiameter returns D_A', the diameter of the substitute body of the
// clamped parts: the narrowest width centred on the bolt axis, min(c, 2·a,
// 2·b + t) — the segment width, twice the distance to the free edge and
// twice the distance to the shell's outer face. This is our choice for a
// flange segment; VDI 2230 leaves a non-circular body to the user.
func (j Joint) OuterDiameter() float64 {
	return math.Min(j.C, math.Min(2*j.A, 2*j.B+j.T))
}

// Analyze validates the joint and the factors and runs every hand method.
func Analyze(j Joint, p Params) (Results, error) {
	if err := j.Validate(); err != nil {
		return Results{}, err
	}
	if err := p.Validate(); err != nil {
		return Results{}, err
	}
	r := Results{Params: p}
	if err := r.bolt(j, p); err != nil {
		return Results{}, err
	}
	for _, b := range Bases() {
		u, err := ultimate(j, p, b)
		if err != nil {
			return Results{}, err
		}
		r.Ultimate = append(r.Ultimate, u)
	}
	if err := r.curves(j, p); err != nil {
		return Results{}, err
	}
	return r, nil
}

func (r *Results) bolt(j Joint, p Params) error {
	t, err := j.Thread()
	if err != nil {
		return err
	}
	nom, err := bolt.NominalGrade(j.Grade)
	if err != nil {
		return err
	}
	minimum, err := bolt.MinimumGrade(j.Grade, t.D)
	if err != nil {
		return err
	}
	as := t.StressArea()
	r.Bolt = BoltResults{
		Thread:            t,
		PitchDiameter:     t.PitchDiameter(),
		MinorDiameter:     t.MinorDiameter(),
		NominalArea:       t.NominalArea(),
		StressArea:        as,
		Nominal:           nom,
		Minimum:           minimum,
		TensionResistance: TensionResistance(as, nom.Fub, p.K2, p.GammaM2),
		PreloadForce:      bolt.DesignPreload(as, nom.Fub),
	}
	return nil
}

func ultimate(j Joint, p Params, b Basis) (Ultimate, error) {
	h, err := segmentHinges(j, p, b)
	if err != nil {
		return Ultimate{}, err
	}
	pet, err := Petersen(h)
	if err != nil {
		return Ultimate{}, err
	}
	sei, err := Seidel(h)
	if err != nil {
		return Ultimate{}, err
	}
	return Ultimate{Basis: b, Hinges: h, Petersen: pet, Seidel: sei}, nil
}

func (r *Results) curves(j Joint, p Params) error {
	lk := j.ClampLength()
	r.BoltBody = BoltBody{Thread: r.Bolt.Thread, Shank: lk - j.FreeThread, Free: j.FreeThread, E: j.E}
	br, err := r.BoltBody.Resilience()
	if err != nil {
		return err
	}
	r.Clamp = Clamp{Length: lk, Bearing: j.Washer, Hole: j.Hole, Outer: j.OuterDiameter(), E: j.E}
	cr, err := r.Clamp.Resilience()
	if err != nil {
		return err
	}
	r.BoltResilience, r.ClampResilience = br, cr
	phi := LoadFactor(p.LoadIntroduction, br.Total, cr.Total)
	if r.JointDiagram, err = NewJointDiagram(j.Preload, phi, j.A, j.B); err != nil {
		return err
	}
	stiff := LoadFactor(1, br.Total, cr.Total)
	if r.Trilinear, err = NewTrilinear(j.Preload, stiff, j.A, j.B, p.ArmFactor); err != nil {
		return err
	}
	if u, ok := r.UltimateOn(BasisCharacteristicNoK2); ok {
		r.CurveEnd = u.Seidel.Z
	}
	r.JointDiagramPoints = r.JointDiagram.Points(r.CurveEnd)
	r.TrilinearPoints = r.Trilinear.Points(r.CurveEnd)
	return nil
}
