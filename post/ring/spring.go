package ring

import "math"

// RingSection is the cross-section of one flange's ring (the L-flange
// with the shell above it) that bends, as a beam along the circumference,
// when the bolts in a parallel gap pull the flanges together. Lengths in
// mm, E in MPa.
//
// The beam: over a gap's span l the ring is held at both ends by the
// closed, preloaded faces beyond the gap, which keep it from turning
// there: a beam clamped at both ends. It bends about the radial axis
// (deflection along the tower axis). Its section is the flange, FlangeWidth
// (a + b + t/2) by FlangeThickness, with the shell above it over an
// effective height l/π (ShellHeight): a load that varies along the wall
// with a half-wavelength l dies away into a plane wall as exp(−π·z/l)
// (a periodic load on the edge of a semi-infinite plate; Timoshenko &
// Goodier, Theory of Elasticity, the plane problem in rectangular
// coordinates — from memory), so the wall works with the flange over
// about l/π. The curvature of the ring (radius ≫ l) and its twist are
// left out. Shear deformation counts, with the shear area 5/6 of the
// section (rectangles): over short spans it is most of the deflection.
type RingSection struct {
	FlangeWidth, FlangeThickness float64
	ShellThickness               float64
	E, Nu                        float64
}

// ShellHeight is the height of shell that bends with the flange over a
// span l, mm.
func ShellHeight(l float64) float64 { return l / math.Pi }

// Stiffness returns E·I (N·mm²) and the shear stiffness G·A_v (N) of the
// section over a span l.
func (r RingSection) Stiffness(l float64) (ei, gav float64) {
	h := ShellHeight(l)
	a1, z1, i1 := r.FlangeWidth*r.FlangeThickness, r.FlangeThickness/2, r.FlangeWidth*math.Pow(r.FlangeThickness, 3)/12
	a2, z2, i2 := r.ShellThickness*h, r.FlangeThickness+h/2, r.ShellThickness*h*h*h/12
	zc := (a1*z1 + a2*z2) / (a1 + a2)
	i := i1 + a1*(z1-zc)*(z1-zc) + i2 + a2*(z2-zc)*(z2-zc)
	g := r.E / (2 * (1 + r.Nu))
	return r.E * i, g * 5.0 / 6 * (a1 + a2)
}

// ClampedBeam is a straight beam of span L clamped at both ends, with
// bending stiffness EI and shear stiffness GA (0: no shear deformation).
type ClampedBeam struct {
	L, EI, GA float64
}

// Deflection is the deflection at x under a unit load at a (mm/N).
//
// Bending (Euler–Bernoulli): for x ≤ a, w = b²·x²·(3·a·L − (3·a + b)·x) /
// (6·EI·L³) with b = L − a, and the mirror image for x > a (Roark's
// Formulas for Stress and Strain, beams fixed at both ends, concentrated
// load — from memory; the tests check it against the central point load,
// P·L³/(192·EI), and the uniform load, q·L⁴/(384·EI), Timoshenko, Strength
// of Materials, Part I, statically indeterminate beams).
//
// Shear: the shear strain V/(GA) integrated along the beam from the
// clamps, w_s = (M(x) − (M(0) + M(L))/2)/GA with the bending moment M of
// the same load (the mean of the integrals from either clamp); for a
// central load it gives the Timoshenko beam's P·L/(4·GA) exactly, for
// other positions it is an approximation whose reactions are the
// Euler–Bernoulli beam's.
func (c ClampedBeam) Deflection(x, a float64) float64 {
	l := c.L
	bend := func(x, a float64) float64 {
		b := l - a
		return b * b * x * x * (3*a*l - (3*a+b)*x) / (6 * c.EI * l * l * l)
	}
	var w float64
	if x <= a {
		w = bend(x, a)
	} else {
		w = bend(l-x, l-a)
	}
	if c.GA > 0 {
		w += (c.moment(x, a) - (c.moment(0, a)+c.moment(l, a))/2) / c.GA
	}
	return w
}

// moment is the bending moment at x under a unit load at a (sagging
// positive): the clamp moment −a·b²/L², the reaction b²·(3a + b)/L³.
func (c ClampedBeam) moment(x, a float64) float64 {
	l, b := c.L, c.L-a
	m := -a*b*b/(l*l) + b*b*(3*a+b)/(l*l*l)*x
	if x > a {
		m -= x - a
	}
	return m
}

// BoltSpring is the spring (N/mm) of the j-th (from 0) of m bolts in a
// run of open parallel gaps: the bolts stand at spacing c across a span
// (m + 1)·c between the closed bolts on either side, and each pulls the
// ring with the same force P, since all are tightened alike (a row of
// equal point loads; for many bolts the uniform load of the closed form,
// for one bolt the central point load). Bolt j's ring deflects by
// P·Σ_i w(y_j, y_i); the spring is P over that. The gap closes by both
// flanges' rings bending towards each other, the upper ring down and the
// lower one up, under the same bolt forces: two such springs in series,
// half of one.
func (r RingSection) BoltSpring(m, j int, c float64) float64 {
	l := float64(m+1) * c
	ei, gav := r.Stiffness(l)
	beam := ClampedBeam{L: l, EI: ei, GA: gav}
	var w float64
	for i := range m {
		w += beam.Deflection(float64(j+1)*c, float64(i+1)*c)
	}
	return 1 / (2 * w)
}
