package material

import (
	"math"
	"testing"
)

// In a uniaxial bar η = 1/3 throughout, so D = ε̄_p/ε_f(1/3) with
// ε_f(η) = α·exp(−βη) (the indicator's definition; Rice and Tracey 1969
// form), in each condition; elastic steps add nothing.
func TestDamageUniaxial(t *testing.T) {
	h, err := NewHardening([]float64{0, 0.5}, []float64{355, 700})
	if err != nil {
		t.Fatal(err)
	}
	dm := StructuralSteelDamage()
	m := mustJ2(t, h, dm)
	for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
		stresses, states, strains := uniaxialBar(t, m, c, ramp(0.3, 60))
		last := states[len(states)-1]
		if eta := Triaxiality(stresses[len(stresses)-1]); math.Abs(eta-1.0/3) > 1e-9 {
			t.Errorf("%v: triaxiality %g, want 1/3", c, eta)
		}
		ep := m.EquivalentPlasticStrain(last)
		want := ep / (dm.Alpha * math.Exp(-dm.Beta/3))
		if got := m.Damage(last); !(ep > 0.25) || math.Abs(got-want) > 1e-9*want {
			t.Errorf("%v: D = %.12g at ε̄_p = %g, want ε̄_p/ε_f(1/3) = %.12g", c, got, ep, want)
		}
		// Unload elastically: neither ε̄_p nor D may change.
		e := strains[len(strains)-1]
		e[1] -= 0.001
		_, _, st := respondChecked(t, m, c, e, last)
		if m.Damage(st) != m.Damage(last) || m.EquivalentPlasticStrain(st) != ep {
			t.Errorf("%v: elastic step changed D %g → %g, ε̄_p %g → %g", c, m.Damage(last), m.Damage(st), ep, m.EquivalentPlasticStrain(st))
		}
	}
}

// In pure shear η = 0, so D = ε̄_p/α.
func TestDamagePureShear(t *testing.T) {
	h, err := PerfectlyPlastic(355)
	if err != nil {
		t.Fatal(err)
	}
	dm := BoltSteelDamage()
	m := mustJ2(t, h, dm)
	for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
		var st []float64
		for _, g := range ramp(0.05, 10) {
			_, _, st = respondChecked(t, m, c, Vec4{0, 0, 0, g}, st)
		}
		ep := m.EquivalentPlasticStrain(st)
		if got, want := m.Damage(st), ep/dm.Alpha; !(ep > 0) || math.Abs(got-want) > 1e-12*want {
			t.Errorf("%v: D = %g, want ε̄_p/α = %g", c, got, want)
		}
	}
}

// The family defaults come from the stated calibration: ε_f at the
// Bridgman neck (η = 1/3 + ln 1.5) equals ln(1/(1−Z)), Z = 0.50 for
// structural steel and 0.44 for bolt steel; β = 3/2 (Rice and Tracey 1969).
func TestDamageDefaults(t *testing.T) {
	eta := 1.0/3 + math.Log(1.5)
	for _, c := range []struct {
		name string
		d    DuctileDamage
		z    float64
	}{{"structural steel", StructuralSteelDamage(), 0.50}, {"bolt steel", BoltSteelDamage(), 0.44}} {
		if c.d.Beta != 1.5 {
			t.Errorf("%s: β = %g, want 1.5", c.name, c.d.Beta)
		}
		if got, want := c.d.FractureStrain(eta), -math.Log(1-c.z); math.Abs(got-want) > 1e-12 {
			t.Errorf("%s: ε_f at the neck %g, want %g", c.name, got, want)
		}
	}
	if !math.IsInf(DuctileDamage{}.FractureStrain(0.3), 1) {
		t.Error("the zero indicator has a finite fracture strain")
	}
	for _, b := range [][2]float64{{0, 1.5}, {-1, 1.5}, {1, -1}, {math.Inf(1), 1}} {
		if _, err := NewDuctileDamage(b[0], b[1]); err == nil {
			t.Errorf("NewDuctileDamage(%g, %g) accepted", b[0], b[1])
		}
	}
}
