package material

import (
	"fmt"
	"math"
	"math/rand"
	"sort"
	"testing"
)

const testE, testNu = 210000.0, 0.3

func mustJ2(t testing.TB, h Hardening, d DuctileDamage) J2 {
	t.Helper()
	el, err := NewElastic(testE, testNu)
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewJ2(el, h, d)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// testHardenings are the hardening cases of the tangent tests: perfectly
// plastic, linear and a multilinear steel curve.
func testHardenings(t testing.TB) map[string]Hardening {
	t.Helper()
	perfect, err := PerfectlyPlastic(355)
	if err != nil {
		t.Fatal(err)
	}
	linear, err := NewHardening([]float64{0, 1}, []float64{355, 2355})
	if err != nil {
		t.Fatal(err)
	}
	st, err := SteelStrength("S355", 30)
	if err != nil {
		t.Fatal(err)
	}
	multi, err := st.Hardening(testE, DefaultNecking())
	if err != nil {
		t.Fatal(err)
	}
	return map[string]Hardening{"perfectly plastic": perfect, "linear H=2000": linear, "S355 multilinear": multi}
}

// respondChecked calls Respond and fails the test on an error.
func respondChecked(t testing.TB, m J2, c Condition, e Vec4, committed []float64) (Vec4, Mat4, []float64) {
	t.Helper()
	trial := make([]float64, m.StateSize())
	var s Vec4
	var d Mat4
	if err := m.Respond(c, e, committed, trial, &s, &d); err != nil {
		t.Fatalf("%v, strain %v: %v", c, e, err)
	}
	return s, d, trial
}

// The consistent tangent must equal the central finite-difference
// derivative of the returned stress to 1e-6 relative, entry by entry
// (entries below 1e-3 of the largest are held to 1e-9 of the largest),
// in every condition, elastic and plastic, for every hardening slope.
func TestJ2TangentFiniteDifference(t *testing.T) {
	dir := Vec4{1, -0.45, 0.25, 0.7}
	steps := []struct {
		name    string
		pre     float64 // scale of a committed plastic step before (0: virgin)
		at      float64 // scale of the strain checked
		plastic bool
	}{
		{"elastic, virgin", 0, 0.0005, false},
		{"plastic, first step", 0, 0.004, true},
		{"plastic, from plastic state", 0.006, 0.011, true},
		{"elastic unloading from plastic state", 0.006, 0.0055, false},
		{"plastic, far along the hardening branch", 0.05, 0.07, true},
	}
	for hname, h := range testHardenings(t) {
		m := mustJ2(t, h, StructuralSteelDamage())
		for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
			for _, st := range steps {
				t.Run(fmt.Sprintf("%s/%v/%s", hname, c, st.name), func(t *testing.T) {
					var committed []float64
					if st.pre > 0 {
						_, _, committed = respondChecked(t, m, c, scale(dir, st.pre), nil)
					}
					e := scale(dir, st.at)
					_, d, trial := respondChecked(t, m, c, e, committed)
					grew := m.EquivalentPlasticStrain(trial) > m.EquivalentPlasticStrain(committed)
					if grew != st.plastic {
						t.Fatalf("plastic flow in the step: %v, want %v", grew, st.plastic)
					}
					checkTangent(t, m, c, e, committed, d)
				})
			}
		}
	}
}

func scale(v Vec4, f float64) Vec4 {
	for i := range v {
		v[i] *= f
	}
	return v
}

func checkTangent(t *testing.T, m J2, c Condition, e Vec4, committed []float64, d Mat4) {
	t.Helper()
	const h = 1e-8
	cols := []int{0, 1, 2, 3}
	if c == PlaneStress {
		cols = []int{0, 1, 3} // the yy strain is ignored in plane stress
		for j := range d {
			if d[2][j] != 0 || d[j][2] != 0 {
				t.Fatalf("plane stress tangent has a yy entry: %v", d)
			}
		}
	}
	var fd Mat4
	big := 0.0
	for _, j := range cols {
		ep, em := e, e
		ep[j] += h
		em[j] -= h
		sp, _, _ := respondChecked(t, m, c, ep, committed)
		sm, _, _ := respondChecked(t, m, c, em, committed)
		for i := range fd {
			fd[i][j] = (sp[i] - sm[i]) / (2 * h)
			big = math.Max(big, math.Abs(d[i][j]))
		}
	}
	for i := range fd {
		for _, j := range cols {
			tol := 1e-6 * math.Max(math.Abs(d[i][j]), 1e-3*big)
			if diff := math.Abs(fd[i][j] - d[i][j]); diff > tol {
				t.Errorf("D[%d][%d] = %.10g, finite difference %.10g (diff %.3g > %.3g)", i, j, d[i][j], fd[i][j], diff, tol)
			}
		}
	}
}

// After a plastic step the stress lies on the yield surface of the updated
// ε̄_p, and in plane stress σ_yy = 0 exactly.
func TestJ2ReturnOnYieldSurface(t *testing.T) {
	for hname, h := range testHardenings(t) {
		m := mustJ2(t, h, DuctileDamage{})
		for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
			s, _, st := respondChecked(t, m, c, Vec4{0.02, -0.004, 0.003, 0.015}, nil)
			ep := m.EquivalentPlasticStrain(st)
			sy, _ := h.Yield(ep)
			if !(ep > 0) || math.Abs(VonMises(s)-sy) > 1e-10*sy {
				t.Errorf("%s, %v: ε̄_p = %g, von Mises %.12g, yield %.12g", hname, c, ep, VonMises(s), sy)
			}
			if c == PlaneStress && s[2] != 0 {
				t.Errorf("%s, plane stress: σ_yy = %g", hname, s[2])
			}
		}
	}
}

// The plane-stress return must be the exact plane-stress solution: the
// same path run through the three-dimensional return, with ε_yy iterated
// until σ_yy = 0, gives the same stress, plastic strain and thickness
// strain ε_yy (a check of the Simo–Taylor projection against the full
// return it reduces).
func TestJ2PlaneStressMatchesIteratedFullReturn(t *testing.T) {
	path := []Vec4{{0.003, -0.001, 0, 0.002}, {0.008, 0.001, 0, 0.006}, {0.012, 0.006, 0, 0.004}, {0.009, 0.004, 0, 0.001}, {0.02, -0.004, 0, -0.01}}
	for hname, h := range testHardenings(t) {
		m := mustJ2(t, h, StructuralSteelDamage())
		var ps, full []float64
		for k, e := range path {
			s1, _, st1 := respondChecked(t, m, PlaneStress, e, ps)
			s2, st2 := fullWithZeroYY(t, m, e, full)
			for i := range s1 {
				if math.Abs(s1[i]-s2[i]) > 1e-8*VonMises(s1) {
					t.Errorf("%s, step %d: plane stress %v, iterated full return %v", hname, k, s1, s2)
					break
				}
			}
			for i, v := range st1 {
				if math.Abs(v-st2[i]) > 1e-10*(1+math.Abs(v)) {
					t.Errorf("%s, step %d: state[%d] = %.12g, iterated full return %.12g", hname, k, i, v, st2[i])
				}
			}
			ps, full = st1, st2
		}
	}
}

// fullWithZeroYY solves σ_yy(ε_yy) = 0 by Newton on the plane-strain
// response, which with a free ε_yy is the three-dimensional one.
func fullWithZeroYY(t *testing.T, m J2, e Vec4, committed []float64) (Vec4, []float64) {
	t.Helper()
	e[2] = m.OutOfPlaneStrain(committed)
	for it := 0; it < 50; it++ {
		s, d, st := respondChecked(t, m, PlaneStrain, e, committed)
		if math.Abs(s[2]) < 1e-11*math.Max(VonMises(s), 1) {
			return s, st
		}
		e[2] -= s[2] / d[2][2]
	}
	t.Fatalf("σ_yy = 0 not reached for strain %v", e)
	return Vec4{}, nil
}

// Below yield J2 answers as Hooke's law.
func TestJ2ElasticBelowYield(t *testing.T) {
	h, _ := PerfectlyPlastic(355)
	m := mustJ2(t, h, StructuralSteelDamage())
	e := Vec4{0.0008, -0.0003, 0.0001, 0.0005}
	for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
		s, d, st := respondChecked(t, m, c, e, nil)
		var s0 Vec4
		var d0 Mat4
		if err := m.Elasticity().Respond(c, e, nil, nil, &s0, &d0); err != nil {
			t.Fatal(err)
		}
		for i := range s {
			if math.Abs(s[i]-s0[i]) > 1e-9*VonMises(s0) {
				t.Errorf("%v: stress %v, Hooke %v", c, s, s0)
			}
			for j := range d[i] {
				if math.Abs(d[i][j]-d0[i][j]) > 1e-9*testE {
					t.Errorf("%v: tangent %v, Hooke %v", c, d, d0)
				}
			}
		}
		if m.EquivalentPlasticStrain(st) != 0 || m.Damage(st) != 0 {
			t.Errorf("%v: elastic step left ε̄_p = %g, D = %g", c, m.EquivalentPlasticStrain(st), m.Damage(st))
		}
	}
}

// Respond leaves the committed state alone and refuses bad arguments with
// an error that says why.
func TestJ2RespondArguments(t *testing.T) {
	h, _ := PerfectlyPlastic(355)
	m := mustJ2(t, h, StructuralSteelDamage())
	committed := make([]float64, m.StateSize())
	_, _, committed = respondChecked(t, m, PlaneStress, Vec4{0.01, 0, 0, 0}, committed)
	keep := append([]float64(nil), committed...)
	respondChecked(t, m, PlaneStress, Vec4{0.02, 0, 0, 0.01}, committed)
	for i := range keep {
		if keep[i] != committed[i] {
			t.Fatalf("committed state changed: %v → %v", keep, committed)
		}
	}
	same := make([]float64, m.StateSize())
	bad := []struct {
		name             string
		c                Condition
		e                Vec4
		committed, trial []float64
	}{
		{"short trial", PlaneStress, Vec4{}, nil, make([]float64, 3)},
		{"short committed", PlaneStrain, Vec4{}, make([]float64, 2), make([]float64, 7)},
		{"NaN strain", Axisymmetric, Vec4{math.NaN(), 0, 0, 0}, nil, make([]float64, 7)},
		{"infinite strain", PlaneStress, Vec4{0, 0, 0, math.Inf(-1)}, nil, make([]float64, 7)},
		{"committed is trial", PlaneStress, Vec4{}, same, same},
		{"unknown condition", Condition(9), Vec4{}, nil, make([]float64, 7)},
	}
	for _, b := range bad {
		var s Vec4
		var d Mat4
		if err := m.Respond(b.c, b.e, b.committed, b.trial, &s, &d); err == nil {
			t.Errorf("%s: accepted", b.name)
		}
	}
	var zero J2
	var s Vec4
	var d Mat4
	if err := zero.Respond(PlaneStress, Vec4{}, nil, make([]float64, 7), &s, &d); err == nil {
		t.Error("the zero J2 answered")
	}
	if zero.Elasticity() != (Elastic{}) || zero.DamageModel() != (DuctileDamage{}) || zero.HardeningCurve().Len() != 0 {
		t.Error("the zero J2 has parameters")
	}
}

func TestNewJ2Rejects(t *testing.T) {
	h, _ := PerfectlyPlastic(355)
	if _, err := NewJ2(Elastic{E: -1, Nu: 0.3}, h, DuctileDamage{}); err == nil {
		t.Error("negative E accepted")
	}
	if _, err := NewJ2(Elastic{E: testE, Nu: 0.3}, Hardening{}, DuctileDamage{}); err == nil {
		t.Error("empty hardening accepted")
	}
	if _, err := NewJ2(Elastic{E: testE, Nu: 0.3}, h, DuctileDamage{Alpha: -1, Beta: 1.5}); err == nil {
		t.Error("negative damage alpha accepted")
	}
}

// referenceConsistency is the plane-stress consistency solve as it was
// before the reciprocal form: Newton on r(Δγ) = q(Δγ) − σ_y(ε̄(Δγ)) with
// bisection whenever a step leaves the bracket, to |r| ≤ 1e-13·σ_y(ε̄_n).
// It returns Δγ and dr/dΔγ there.
func referenceConsistency(t *testing.T, m J2, md *planeStressModes, ep0 float64) (dg, slope float64) {
	t.Helper()
	q := func(x float64) (q, dq float64) {
		p, r := 1+md.ka*x, 1+md.kb*x
		q = math.Sqrt(md.alpha/(p*p) + md.beta/(r*r))
		return q, -(md.alpha*md.ka/(p*p*p) + md.beta*md.kb/(r*r*r)) / q
	}
	sy0, _ := m.hardening.Yield(ep0)
	lo, hi, x := 0.0, math.Inf(1), 0.0
	for it := 0; it < 500; it++ {
		qx, dq := q(x)
		sy, h := m.hardening.Yield(ep0 + 2*x*qx/3)
		r, dr := qx-sy, dq-h*2*(qx+x*dq)/3
		if math.Abs(r) <= 1e-13*sy0 {
			return x, dr
		}
		if r > 0 {
			lo = x
		} else {
			hi = x
		}
		next := x - r/dr
		if !(dr < 0) || !(next > lo && next < hi) {
			if math.IsInf(hi, 1) {
				next = 2*x + 1e-12
			} else {
				next = (lo + hi) / 2
			}
		}
		if !math.IsInf(hi, 1) && hi-lo <= 1e-15*hi {
			return next, dr
		}
		x = next
	}
	t.Fatalf("reference consistency did not converge")
	return 0, 0
}

// The plane-stress return's consistency solve (Newton on the reciprocal
// form, stopped on a predicted residual) meets q = σ_y(ε̄) to 1e-14·σ_y at
// the Δγ it returns (the bound before was 1e-13·σ_y(ε̄_n)), and its Δγ
// differs from that of the former solve (bracketed Newton on q − σ_y to
// |q − σ_y| ≤ 1e-13·σ_y(ε̄_n)) by no more than that solve's tolerance
// allows, |ΔΔγ·dr/dΔγ| ≤ 1e-13·σ_y(ε̄_n): random strain directions from
// just past yield to 300 % strain, from a virgin and from hardened
// states, for perfectly plastic, linear and multilinear tables, and a
// table whose slope rises (a plateau, then hardening) so that the walk
// over segments meets both kinds of kink.
func TestJ2PlaneStressConsistencyMatchesReference(t *testing.T) {
	hs := testHardenings(t)
	rising, err := NewHardening([]float64{0, 0.01, 0.02, 0.05, 0.3}, []float64{355, 355, 380, 470, 520})
	if err != nil {
		t.Fatal(err)
	}
	hs["plateau, then hardening"] = rising
	names := make([]string, 0, len(hs))
	for name := range hs {
		names = append(names, name)
	}
	sort.Strings(names)
	rng := rand.New(rand.NewSource(15))
	el := Elastic{E: testE, Nu: testNu}
	g, eA := el.ShearModulus(), el.E/(1-el.Nu)
	for _, name := range names {
		h := hs[name]
		m := mustJ2(t, h, DuctileDamage{})
		n := 0
		for k := 0; k < 4000; k++ {
			ep0 := []float64{0, 0.005, 0.01, 0.02, 0.08, 0.6}[k%6]
			mag := math.Pow(10, -3+3.5*rng.Float64())
			e := [3]float64{mag * rng.NormFloat64(), mag * rng.NormFloat64(), mag * rng.NormFloat64()}
			md := newPlaneStressModes(eA*(e[0]+e[1]), 2*g*(e[1]-e[0]), g*e[2], eA/3, 2*g)
			seg := h.segment(ep0)
			sy0 := h.onSegment(seg, ep0)
			if md.alpha+md.beta <= sy0*sy0 {
				continue
			}
			n++
			dg, _, err := m.planeStressConsistency(&md, ep0, seg)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			p, r := 1+md.ka*dg, 1+md.kb*dg
			q := math.Sqrt(md.alpha/(p*p) + md.beta/(r*r))
			sy, _ := h.Yield(ep0 + 2*dg*q/3)
			if math.Abs(q-sy) > 1e-14*sy {
				t.Errorf("%s: ε̄_n %g, strain %v: q − σ_y = %.3g MPa at Δγ = %.17g", name, ep0, e, q-sy, dg)
			}
			want, slope := referenceConsistency(t, m, &md, ep0)
			if d := math.Abs((dg - want) * slope); d > 1e-13*sy0 {
				t.Errorf("%s: ε̄_n %g, strain %v: Δγ = %.17g, reference %.17g: |ΔΔγ·dr/dΔγ| = %.3g MPa", name, ep0, e, dg, want, d)
			}
		}
		if n < 1000 {
			t.Errorf("%s: only %d plastic states", name, n)
		}
	}
}
