package handcalc

import "math"

// Mode names a failure mechanism of an L-flange segment.
type Mode string

// The failure modes of the plastic-hinge method (Petersen, Stahlbau).
const (
	ModeA Mode = "A" // bolt fails, the flange does not pry
	ModeB Mode = "B" // bolt fails, plastic hinge at the flange–shell junction
	ModeC Mode = "C" // plastic hinges at the junction and in the flange at the bolt line
)

// Description returns the mechanism in words.
func (m Mode) Description() string {
	switch m {
	case ModeA:
		return "bolt failure without prying"
	case ModeB:
		return "bolt failure with a plastic hinge at the flange-shell junction"
	case ModeC:
		return "plastic hinges at the flange-shell junction and in the flange at the bolt line"
	}
	return "unknown mode"
}

// Site says where the junction hinge forms: in the shell just above the
// flange, or in the flange at the shell face, whichever is weaker.
type Site string

// The sites of the junction hinge.
const (
	SiteShell  Site = "shell"
	SiteFlange Site = "flange"
)

// Hinges holds the resistances of one bolt segment that the mechanisms use.
// All values are per segment of width c, in N, mm and N·mm, and already
// divided by any partial factor.
type Hinges struct {
	A float64 `json:"a"` // a, bolt axis → flange free edge
	B float64 `json:"b"` // b, bolt axis → shell mid-surface

	// Bolt is the bolt's tensile resistance F_u (A_s·f_ub, k₂·A_s·f_ub or
	// F_t,Rd).
	Bolt float64 `json:"bolt"`

	// Shell is the plastic moment of the shell, M_pl,shell = f_y·c·t²/4, and
	// ShellAxial its plastic axial force N_pl = f_y·c·t (used by Seidel).
	Shell      float64 `json:"shell"`
	ShellAxial float64 `json:"shell_axial"`

	// FlangeGross is the plastic moment of the flange at the shell face,
	// f_y·c·t_f²/4; FlangeNet the one at the bolt line, across the hole,
	// M_pl,flange = f_y·(c − d_h)·t_f²/4.
	FlangeGross float64 `json:"flange_gross"`
	FlangeNet   float64 `json:"flange_net"`

	// LeverLimit bounds the lever arm of mode B: a' = min(a, LeverLimit·b).
	// Zero means no bound.
	LeverLimit float64 `json:"lever_limit"`
}

// Mechanisms holds the capacities of the three modes and the governing one.
type Mechanisms struct {
	A         float64 `json:"mode_a"`    // Z_u of mode A, N
	B         float64 `json:"mode_b"`    // Z_u of mode B, N
	C         float64 `json:"mode_c"`    // Z_u of mode C, N
	Governing Mode    `json:"governing"` // the mode with the smallest Z_u
	Z         float64 `json:"z_u"`       // the ultimate segment force, N

	// Junction is where the junction hinge of the governing mode forms
	// (empty for mode A); LeverArm is the a' that mode B used.
	Junction Site    `json:"junction_hinge,omitempty"`
	LeverArm float64 `json:"lever_arm"`
}

func (h Hinges) valid(needAxial bool) error {
	var v violations
	v.check("a", h.A, h.A > 0, "must be > 0")
	v.check("b", h.B, h.B > 0, "must be > 0")
	v.check("bolt", h.Bolt, h.Bolt > 0, "must be > 0")
	v.check("shell", h.Shell, h.Shell > 0, "must be > 0")
	v.check("flange_gross", h.FlangeGross, h.FlangeGross > 0, "must be > 0")
	v.check("flange_net", h.FlangeNet, h.FlangeNet > 0, "must be > 0")
	if needAxial {
		v.check("shell_axial", h.ShellAxial, h.ShellAxial > 0, "must be > 0")
	}
	v.check("lever_limit", h.LeverLimit, h.LeverLimit >= 0, "must be ≥ 0 (0 = no bound)")
	return v.err("hinges")
}

// leverArm returns a' = min(a, LeverLimit·b).
func (h Hinges) leverArm() float64 {
	if h.LeverLimit > 0 {
		return math.Min(h.A, h.LeverLimit*h.B)
	}
	return h.A
}

// Petersen returns the ultimate segment force of the three plastic-hinge
// mechanisms of an L-flange segment (Petersen, Stahlbau — from memory; the
// derivation below is ours and stands on its own).
//
// The upper flange is a beam along x: the free edge at x = −a, the bolt at
// x = 0, the shell mid-surface at x = b. The shell pulls it up with Z, the
// bolt holds it down with F_s, and the lower flange pushes up at the free
// edge with the prying force K, so F_s = Z + K. Each mechanism is a rigid
// motion of the flange with hinges, and its load is the one at which the
// external work Z·δ equals the dissipation (the kinematic theorem, so each
// value is an upper bound and the smallest governs).
//
// The junction hinge forms in the shell just above the flange or in the
// flange at the shell face, whichever is weaker:
// M_j = min(M_pl,shell, f_y·c·t_f²/4) with M_pl,shell = f_y·c·t²/4. That is
// the common textbook form for tower flanges, where t_f > t and the hinge is
// in the shell; taking the smaller moment keeps the method sound for a thin
// flange on a stiff shell, and it is what lets mode A govern at all (mode B
// reaches F_u exactly when M_j = F_u·b).
//
// Mode A, bolt failure alone: the flange translates by δ without rotating,
// the bolt yields, nothing pries. Z·δ = F_u·δ:
//
//	Z_A = F_u
//
// Mode B, bolt failure with the junction hinge: the flange rotates by θ
// about its free edge. The bolt, a' from the pivot (a' = a unless bounded,
// below), stretches by θ·a' at F_u; the junction turns by θ at M_j; Z,
// a' + b from the pivot, moves θ·(a' + b). This is also moment equilibrium
// of the flange about the pivot:
//
//	Z_B = (F_u·a' + M_j)/(a' + b),  a' = min(a, 1.25·b)
//
// The bound on a (the LeverLimit factor 1.25) is from memory: a wide flange
// edge does not carry the prying force at its very end, and EN 1993-1-8
// Table 6.2 puts the same bound n ≤ 1.25·m on a T-stub. Set LeverLimit = 0
// for the plain a.
//
// Mode C, junction hinge plus a flange hinge at the bolt line: the bolt
// holds; the flange between bolt line and shell rotates by θ about the bolt
// line, the part outside the bolt stays propped on its free edge. The flange
// hinge turns by θ at M_pl,flange = f_y·(c − d_h)·t_f²/4 (net width across
// the hole), the junction by θ at M_j, and Z moves θ·b:
//
//	Z_C = (M_pl,flange + M_j)/b
//
// Statements of the method differ on where this second hinge sits: at the
// bolt line across the hole (net width c − d_h), as used here and as we
// recall Petersen's mode C (from memory), or at the shell face with the
// gross width c — which is the junction hinge's flange site above.
func Petersen(h Hinges) (Mechanisms, error) {
	if err := h.valid(false); err != nil {
		return Mechanisms{}, err
	}
	a := h.leverArm()
	zShellB := (h.Bolt*a + h.Shell) / (a + h.B)
	zFlangeB := (h.Bolt*a + h.FlangeGross) / (a + h.B)
	zShellC := (h.FlangeNet + h.Shell) / h.B
	zFlangeC := (h.FlangeNet + h.FlangeGross) / h.B
	return govern(h.Bolt, zShellB, zFlangeB, zShellC, zFlangeC, a), nil
}

// Seidel returns the mechanisms of Petersen with the shell hinge's plastic
// moment reduced by the axial force it carries (Seidel 2001 — from memory).
//
// A rectangular section of plastic moment M_pl and plastic axial force N_pl
// carries, with an axial force N, the moment M_pl,N = M_pl·(1 − (N/N_pl)²).
// At the shell hinge N = Z, so the reduction depends on the unknown itself;
// solved consistently, the work equation of mode B (lever L = a' + b,
// R = F_u·a' + M_pl) and of mode C (L = b, R = M_pl,flange + M_pl) becomes
//
//	Z·L = R − M_pl·(Z/N_pl)²,  i.e.  k·Z² + L·Z − R = 0,  k = M_pl/N_pl²,
//
// whose positive root is Z = 2R/(L + √(L² + 4kR)) (the form that does not
// cancel as k → 0, where it tends to Petersen's R/L). If that root exceeds
// N_pl, the shell yields in tension before the mechanism forms, and the
// mode's capacity is N_pl. A junction hinge in the flange (thin flange,
// stiff shell) carries shear, not axial force, and is not reduced; since
// each work equation is monotone in Z, the mode's capacity is the smaller of
// the shell-hinge and flange-hinge roots. Mode A has no hinge and is
// unchanged.
func Seidel(h Hinges) (Mechanisms, error) {
	if err := h.valid(true); err != nil {
		return Mechanisms{}, err
	}
	a := h.leverArm()
	k := h.Shell / (h.ShellAxial * h.ShellAxial)
	root := func(l, r float64) float64 {
		z := 2 * r / (l + math.Sqrt(l*l+4*k*r))
		return math.Min(z, h.ShellAxial)
	}
	zShellB := root(a+h.B, h.Bolt*a+h.Shell)
	zFlangeB := (h.Bolt*a + h.FlangeGross) / (a + h.B)
	zShellC := root(h.B, h.FlangeNet+h.Shell)
	zFlangeC := (h.FlangeNet + h.FlangeGross) / h.B
	return govern(h.Bolt, zShellB, zFlangeB, zShellC, zFlangeC, a), nil
}

// govern picks each mode's weaker junction site and the smallest mode;
// ties go to the earlier mode, so the result is deterministic.
func govern(zA, zShellB, zFlangeB, zShellC, zFlangeC, a float64) Mechanisms {
	m := Mechanisms{A: zA, Governing: ModeA, Z: zA, LeverArm: a}
	zB, siteB := weaker(zShellB, zFlangeB)
	zC, siteC := weaker(zShellC, zFlangeC)
	m.B, m.C = zB, zC
	if zB < m.Z {
		m.Governing, m.Z, m.Junction = ModeB, zB, siteB
	}
	if zC < m.Z {
		m.Governing, m.Z, m.Junction = ModeC, zC, siteC
	}
	return m
}

func weaker(zShell, zFlange float64) (float64, Site) {
	if zFlange < zShell {
		return zFlange, SiteFlange
	}
	return zShell, SiteShell
}
