// Package handcalc holds the hand methods that flangeseg's finite-element
// check of an L-flange segment refines: code resistances of the bolt (its
// thread and property-class data are in package material/bolt), the
// ultimate segment force by plastic-hinge mechanisms, and segment bolt-force
// models from joint resiliences. Every function is a closed formula of its
// inputs, which it never modifies; each names its source in its comment and
// says where that source is recalled from memory rather than read.
//
// Units are mm, N, N·mm and MPa throughout; resiliences are in mm/N. Forces
// are per bolt segment (one bolt, width c). Analyze runs everything for a
// Joint and returns Results, whose JSON field names are snake_case:
//
//	j := handcalc.Joint{T: 30, Tf: 80, A: 70, B: 80, C: 120, Size: "M48", Grade: "10.9", …}
//	r, err := handcalc.Analyze(j, handcalc.DefaultParams())
//	u, _ := r.UltimateOn(handcalc.BasisDesign) // u.Petersen.Z, u.Petersen.Governing
//	fs := r.Trilinear.Force(200e3)             // bolt force at Z = 200 kN
//
// Symbols, as the trade writes them, and their Go names:
//
//	t      T           shell thickness
//	t_f    Tf          flange thickness
//	a      A           bolt axis → flange free edge
//	b      B           bolt axis → shell mid-surface
//	c      C           segment width (bolt spacing on the bolt circle)
//	d, P   D, Pitch    bolt diameter, thread pitch
//	d₂, d₃             pitch and minor diameter of the thread
//	d_h    Hole        hole diameter
//	d_w    Washer      washer outer diameter (bearing diameter)
//	l_K    ClampLength clamp length, 2·t_f + 2 washers
//	D_A'   Outer       outer diameter of the clamp's substitute body
//	A, A_s             nominal (shank) area π·d²/4, stress area
//	f_yb, f_ub         bolt yield and tensile strength
//	f_y    ShellFy, FlangeFy  yield strength of shell and flange
//	F_p    Preload     bolt preload
//	F_t,Rd, F_p,C      design tensile resistance, design preload of a bolt
//	F_u    Hinges.Bolt bolt resistance used by a mechanism
//	M_pl, N_pl         plastic moment and axial force per segment
//	Z                  segment tensile force
//	Z_u                ultimate segment force
//	F_s                bolt force
//	δ_S, δ_P           resilience of bolt and of clamped parts
//	Φ, n               load factor, load-introduction factor (VDI 2230)
//	p                  stiffness ratio δ_P/(δ_S + δ_P)
//	λ, λ'              lever ratio (a + b)/a, and with a reduced arm a'
//
// Sign: tension positive. The flange pries about its free edge, so the face
// opens on the shell side first.
package handcalc
