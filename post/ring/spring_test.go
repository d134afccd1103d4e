package ring

import (
	"math"
	"testing"
)

// TestClampedBeamClosedForms checks the influence function of the beam
// clamped at both ends against the two closed forms of Timoshenko,
// Strength of Materials, Part I (statically indeterminate beams; also
// Roark's Formulas for Stress and Strain, beams fixed at both ends):
// central point load, δ = P·l³/(192·E·I); uniform load, δ = q·l⁴/(384·E·I)
// at mid-span, here as the sum of many equal point loads, which is how the
// bolts of a long gap load the ring. And the Timoshenko beam's shear part
// under a central load, P·l/(4·G·A).
func TestClampedBeamClosedForms(t *testing.T) {
	const l, ei, ga, p = 900.0, 2.1e5 * 1.2e7, 8e4 * 2e4, 1e3
	beam := ClampedBeam{L: l, EI: ei}
	if got, want := p*beam.Deflection(l/2, l/2), p*l*l*l/(192*ei); math.Abs(got-want) > 1e-12*want {
		t.Errorf("central load: δ = %.9g mm, closed form P·l³/(192·E·I) = %.9g mm", got, want)
	}
	// Reciprocity (Maxwell): w(x; a) = w(a; x), and both ends held.
	if a, b := beam.Deflection(200, 650), beam.Deflection(650, 200); math.Abs(a-b) > 1e-12*a {
		t.Errorf("w(200; 650) = %g, w(650; 200) = %g: not reciprocal", a, b)
	}
	if w0, wl := beam.Deflection(0, 300), beam.Deflection(l, 300); w0 != 0 || math.Abs(wl) > 1e-18 {
		t.Errorf("the clamped ends move: %g, %g", w0, wl)
	}
	// Uniform load q as n point loads q·l/n at the centres of n strips.
	const q, n = 2.0, 4000
	var mid float64
	for i := range n {
		mid += q * l / n * beam.Deflection(l/2, (float64(i)+0.5)*l/n)
	}
	if want := q * l * l * l * l / (384 * ei); math.Abs(mid-want) > 1e-5*want {
		t.Errorf("uniform load: δ = %.9g mm, closed form q·l⁴/(384·E·I) = %.9g mm", mid, want)
	}
	shear := ClampedBeam{L: l, EI: ei, GA: ga}
	if got, want := p*shear.Deflection(l/2, l/2), p*l*l*l/(192*ei)+p*l/(4*ga); math.Abs(got-want) > 1e-12*want {
		t.Errorf("central load with shear: δ = %.9g mm, P·l³/(192·E·I) + P·l/(4·G·A) = %.9g mm", got, want)
	}
}

// TestBoltSpringLoadCases checks the bolt springs against the closed
// forms of the two load cases they lie between: one bolt in a gap is the
// central point load on a span of two bolt spacings; the middle bolt of a
// long run is close to the uniform load q = P/c at mid-span (within the
// difference of a row of point loads from a smooth load). Upper and lower
// ring in series halve the ring's own stiffness.
func TestBoltSpringLoadCases(t *testing.T) {
	r := RingSection{FlangeWidth: 174, FlangeThickness: 90, ShellThickness: 28, E: 2.1e5, Nu: 0.3}
	const c = 108.0
	ei, ga := r.Stiffness(2 * c)
	if got, want := r.BoltSpring(1, 0, c), 1/(2*(math.Pow(2*c, 3)/(192*ei)+2*c/(4*ga))); math.Abs(got-want) > 1e-12*want {
		t.Errorf("one bolt: k = %.6g N/mm, central point load gives %.6g N/mm", got, want)
	}
	const m = 41
	l := float64(m+1) * c
	ei, _ = r.Stiffness(l)
	bend := RingSection{FlangeWidth: r.FlangeWidth, FlangeThickness: r.FlangeThickness, ShellThickness: r.ShellThickness, E: r.E, Nu: r.Nu}
	beam := ClampedBeam{L: l, EI: ei}
	var w float64
	for i := range m {
		w += beam.Deflection(l/2, float64(i+1)*c)
	}
	want := 384 * ei / (math.Pow(l, 4) / c) // P over the uniform load's δ with q = P/c
	if got := 1 / w; math.Abs(got-want) > 0.01*want {
		t.Errorf("middle of %d bolts, bending only: P/δ = %.6g N/mm, uniform load gives %.6g N/mm", m, got, want)
	}
	// Shear only raises the deflection: the spring with it is softer.
	if k := bend.BoltSpring(m, m/2, c); !(k < 1/(2*w)) {
		t.Errorf("with shear k = %g N/mm, not below bending alone %g N/mm", k, 1/(2*w))
	}
	// The ends of a run are stiffer than its middle, and a short gap far
	// stiffer than a long one.
	if a, b := r.BoltSpring(9, 0, c), r.BoltSpring(9, 4, c); !(a > b) {
		t.Errorf("run of 9: end bolt %g N/mm not stiffer than the middle %g N/mm", a, b)
	}
	if a, b := r.BoltSpring(1, 0, c), r.BoltSpring(9, 4, c); !(a > 10*b) {
		t.Errorf("one bolt %g N/mm not far stiffer than the middle of nine %g N/mm", a, b)
	}
}
