package modelfile

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"flangeseg/material/bolt"
	"flangeseg/post/handcalc"

	"github.com/BurntSushi/toml"
)

// Thread returns the bolt's thread from its size or its diameter and pitch.
func (s *Spec) Thread() (bolt.Thread, error) {
	if s.Bolt.Size != "" {
		return bolt.CoarseThread(s.Bolt.Size)
	}
	if s.Bolt.Diameter == nil || s.Bolt.Pitch == nil {
		return bolt.Thread{}, errors.New("no bolt size, or no diameter and pitch")
	}
	return bolt.Thread{D: *s.Bolt.Diameter, Pitch: *s.Bolt.Pitch}, nil
}

// Built-in materials: structural steels and bolt grades, E and ν of steel.
const (
	SteelE  = 210000.0 // MPa
	SteelNu = 0.3
)

func builtinSteels() []string { return []string{"S235", "S275", "S355", "S420", "S460"} }

// steelYield returns the minimum yield strength R_eH (MPa) of a structural
// steel grade at nominal thickness t (mm), for t ≤ 150 mm.
//
// Source: EN 10025-2 for S235–S355; EN 10025-3/-4 for S420 and S460 (those
// two rows from memory), as ../shared/CHECKS.md tabulates them.
func steelYield(grade string, thickness float64) (float64, error) {
	var row [6]float64 // t ≤ 16, ≤ 40, ≤ 63, ≤ 80, ≤ 100, ≤ 150 mm
	switch grade {
	case "S235":
		row = [6]float64{235, 225, 215, 215, 215, 195}
	case "S275":
		row = [6]float64{275, 265, 255, 245, 235, 225}
	case "S355":
		row = [6]float64{355, 345, 335, 325, 315, 295}
	case "S420":
		row = [6]float64{420, 400, 390, 370, 360, 340}
	case "S460":
		row = [6]float64{460, 440, 430, 410, 400, 385}
	default:
		return 0, fmt.Errorf("steel grade %q: not one of %s", grade, strings.Join(builtinSteels(), ", "))
	}
	if !(thickness > 0) {
		return 0, fmt.Errorf("steel %s: thickness %s mm: must be > 0", grade, FormatNumber(thickness))
	}
	for i, limit := range [6]float64{16, 40, 63, 80, 100, 150} {
		if thickness <= limit {
			return row[i], nil
		}
	}
	return 0, fmt.Errorf("steel %s: thickness %s mm: beyond the yield table (t ≤ 150 mm)", grade, FormatNumber(thickness))
}

// MaterialInfo is what the model needs of a named material.
type MaterialInfo struct {
	E, Nu float64
	Yield float64 // f_y, MPa; 0 for a linear elastic material
	User  bool    // defined in [materials]
}

// Material looks a name up, first in [materials], then among the built-in
// steels (yield strength at the given thickness) and the bolt grades.
func (s *Spec) Material(name string, thickness float64) (MaterialInfo, error) {
	if m, ok := s.Materials[name]; ok {
		info := MaterialInfo{E: m.E, Nu: m.Nu, User: true}
		if len(m.Curve) > 0 && len(m.Curve[0]) == 2 {
			info.Yield = m.Curve[0][1]
		}
		return info, nil
	}
	if g, err := bolt.NominalGrade(name); err == nil {
		return MaterialInfo{E: SteelE, Nu: SteelNu, Yield: g.Fyb}, nil
	}
	fy, err := steelYield(name, thickness)
	if err != nil {
		return MaterialInfo{}, err
	}
	return MaterialInfo{E: SteelE, Nu: SteelNu, Yield: fy}, nil
}

// Derived holds the quantities that follow from a valid Spec, in mm, mm²,
// N, MPa and N/mm³.
type Derived struct {
	D           float64 // d, bolt diameter
	Pitch       float64 // P, thread pitch
	StressArea  float64 // A_s = π/4·((d₂ + d₃)/2)² (ISO 898-1)
	NominalArea float64 // A = π·d²/4
	Fub, Fyb    float64 // f_ub, f_yb, nominal (EN 1993-1-8 Table 3.1)

	DesignPreload float64 // F_p,C = 0.7·f_ub·A_s (EN 1993-1-8, 3.9)
	YieldForce    float64 // A_s·f_yb, the preload's upper bound

	// PreloadForce is the target F_p for a preload given as force or
	// fraction; 0 for a nut turn, which gives PreloadShortening instead
	// (angle/360·P) and leaves the force to the analysis.
	PreloadForce      float64
	PreloadShortening float64

	BoltCircleRadius float64 // R_b = D/2 − b
	SegmentWidth     float64 // c = 2π·R_b/n
	ClampLength      float64 // l_k = 2(t_f + t_w)
	ThreadInClamp    float64 // loaded thread inside the clamp: l_k (full) or thread_length
	ShankInClamp     float64 // l_k − ThreadInClamp

	// Out-of-plane thicknesses of the strip model's regions.
	ShellStrip    float64 // shell: c
	FlangeStrip   float64 // flange away from the hole: c
	HoleBandStrip float64 // flange band |x| < d_h/2: c − d_h
	BoltWidth     float64 // in-plane width of the bolt strip, h = (√3/2)·d
	ShankStrip    float64 // A/h: the shank's area and second moment of area
	ThreadStrip   float64 // A_s/h
	BearingStrip  float64 // head, nut, washers: t_b = π(d_w² − d_h²)/(4(d_w − d_h))

	ShellYield  float64 // f_y of the shell at t, MPa; 0 if linear elastic
	FlangeYield float64 // f_y of the flange at t_f, MPa; 0 if linear elastic

	RingSpring        float64 // E·t/R² per unit wall area, R = D/2, N/mm³
	DecayLength       float64 // 1/β, β = [3(1−ν²)/(R²t²)]^¼
	ThreeDecayLengths float64 // 3/β: a longer stub makes the end condition irrelevant

	Warnings []string
}

// Derive computes the derived quantities of a valid Spec; on a Spec that
// failed validation its values are meaningless (but it does not panic).
func (s *Spec) Derive() Derived {
	var d Derived
	th, _ := s.Thread()
	d.D, d.Pitch = th.D, th.Pitch
	d.StressArea, d.NominalArea = th.StressArea(), th.NominalArea()
	g, _ := bolt.NominalGrade(s.Bolt.Grade)
	d.Fub, d.Fyb = g.Fub, g.Fyb
	d.DesignPreload = bolt.DesignPreload(d.StressArea, d.Fub)
	d.YieldForce = d.StressArea * d.Fyb
	s.derivePreload(&d)
	s.deriveGeometry(&d)
	s.deriveShell(&d)
	d.Warnings = s.warnings(d)
	return d
}

func (s *Spec) derivePreload(d *Derived) {
	p := s.Preload
	switch {
	case p.Force != nil:
		d.PreloadForce = *p.Force
	case p.Fraction != nil:
		d.PreloadForce = *p.Fraction * d.DesignPreload
	case p.NutTurn != nil:
		d.PreloadShortening = *p.NutTurn / 360 * d.Pitch
	}
}

func (s *Spec) deriveGeometry(d *Derived) {
	b := s.Bolt
	d.BoltCircleRadius = s.Tower.Diameter/2 - s.Flange.B
	if s.Tower.Bolts > 0 {
		d.SegmentWidth = 2 * math.Pi * d.BoltCircleRadius / float64(s.Tower.Bolts)
	}
	d.ClampLength = 2 * (s.Flange.Thickness + b.WasherThickness)
	d.ThreadInClamp = d.ClampLength
	if b.Thread == ThreadPartial && b.ThreadLength != nil {
		d.ThreadInClamp = *b.ThreadLength
	}
	d.ShankInClamp = d.ClampLength - d.ThreadInClamp

	d.ShellStrip, d.FlangeStrip = d.SegmentWidth, d.SegmentWidth
	d.HoleBandStrip = d.SegmentWidth - b.Hole
	// h² = 12·I/A = 0.75·d² gives the strip the round bar's A and I at once.
	d.BoltWidth = math.Sqrt(3) / 2 * d.D
	if d.BoltWidth > 0 {
		d.ShankStrip = d.NominalArea / d.BoltWidth
		d.ThreadStrip = d.StressArea / d.BoltWidth
	}
	// The annulus π/4·(d_w² − d_h²) spread evenly over the two bearing
	// lines of total length d_w − d_h.
	if dw, dh := b.WasherOuter, b.Hole; dw > dh {
		d.BearingStrip = math.Pi * (dw*dw - dh*dh) / (4 * (dw - dh))
	}
}

func (s *Spec) deriveShell(d *Derived) {
	shell, _ := s.Material(s.Shell.Material, s.Shell.Thickness)
	flange, _ := s.Material(s.Flange.Material, s.Flange.Thickness)
	d.ShellYield, d.FlangeYield = shell.Yield, flange.Yield
	r, t := s.Tower.Diameter/2, s.Shell.Thickness
	if r > 0 && t > 0 {
		d.RingSpring = shell.E * t / (r * r)
		beta := math.Pow(3*(1-shell.Nu*shell.Nu)/(r*r*t*t), 0.25)
		d.DecayLength = 1 / beta
		d.ThreeDecayLengths = 3 / beta
	}
}

// warnings lists what is valid but deserves a second look.
func (s *Spec) warnings(d Derived) []string {
	var w []string
	add := func(format string, args ...any) { w = append(w, fmt.Sprintf(format, args...)) }
	if s.Analysis.RingSprings && s.Shell.Length < d.ThreeDecayLengths {
		add("shell.length = %s mm is shorter than 3/β = %.0f mm: the end condition will influence the prying force",
			FormatNumber(s.Shell.Length), d.ThreeDecayLengths)
	}
	if !s.Analysis.RingSprings {
		add("analysis.ring_springs = false: without the ring's hoop stiffness the end condition (load.end_rotation = %q) decides how much moment the shell carries, and with it the prying force and the ultimate load",
			s.Load.EndRotation)
	}
	if s.Contact.Recess > 0 && len(s.Contact.Zones) == 0 {
		add("contact.recess = %s mm has no effect: there are no contact.zones, so the whole face touches", FormatNumber(s.Contact.Recess))
	}
	for i, z := range s.Contact.Zones {
		if z.From >= -s.Bolt.Hole/2 && z.To <= s.Bolt.Hole/2 {
			add("contact.zones[%d] = [%s, %s] lies inside the bolt hole |x| < %s mm and touches nothing",
				i, FormatNumber(z.From), FormatNumber(z.To), FormatNumber(s.Bolt.Hole/2))
		}
	}
	if c := s.Contact; c.Taper != 0 || c.ParallelGap > 0 {
		face := s.Flange.A + s.Flange.B + s.Shell.Thickness/2
		open := c.ParallelGap + 2*math.Tan(math.Abs(c.Taper)*math.Pi/180)*face
		add("contact.taper = %s°, contact.parallel_gap = %s mm: the faces start up to %.3g mm apart; the preload closes the gap by bending the flanges, and a 2D strip has no neighbouring segments to hold it open as a ring does, so the strip closes more of it for the same preload: run reports the gap left open after preload and the bolt force the closing took, found by a separate tightening with the shell end free",
			FormatNumber(c.Taper), FormatNumber(c.ParallelGap), open)
	}
	if s.Mesh.Size > s.Shell.Thickness/2 {
		add("mesh.size = %s mm gives fewer than two elements through the shell thickness t = %s mm",
			FormatNumber(s.Mesh.Size), FormatNumber(s.Shell.Thickness))
	}
	for _, name := range sortedNames(s.Materials) {
		if isBuiltin(name) {
			add("[materials.%s] replaces the built-in material of that name", toml.Key{name}.String())
		}
		if !s.uses(name) {
			add("[materials.%s] is defined but not used", toml.Key{name}.String())
		}
	}
	return w
}

func isBuiltin(name string) bool {
	_, err := bolt.NominalGrade(name)
	return err == nil || isSteel(name)
}

func isSteel(name string) bool {
	for _, n := range builtinSteels() {
		if n == name {
			return true
		}
	}
	return false
}

// uses reports whether a material key names the material.
func (s *Spec) uses(name string) bool {
	return s.Shell.Material == name || s.Flange.Material == name || s.Bolt.Material == name
}

// BoltMaterial is the material the bolt regions take: bolt.material if
// given, else the grade.
func (s *Spec) BoltMaterial() string {
	if s.Bolt.Material != "" {
		return s.Bolt.Material
	}
	return s.Bolt.Grade
}

// HandJoint is the joint as the hand methods see it.
func (s *Spec) HandJoint(d Derived) handcalc.Joint {
	return handcalc.Joint{
		T: s.Shell.Thickness, Tf: s.Flange.Thickness, A: s.Flange.A, B: s.Flange.B, C: d.SegmentWidth,
		D: d.D, Pitch: d.Pitch, Grade: s.Bolt.Grade,
		Hole: s.Bolt.Hole, Washer: s.Bolt.WasherOuter, WasherThickness: s.Bolt.WasherThickness,
		FreeThread: d.ThreadInClamp, ShellFy: d.ShellYield, FlangeFy: d.FlangeYield,
		Preload: d.DesignPreload, E: SteelE,
	}
}

// MaterialNames lists the names of the [materials] entries, sorted.
func (s *Spec) MaterialNames() []string { return sortedNames(s.Materials) }
