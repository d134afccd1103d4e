package material

import "testing"

// BenchmarkJ2RespondPlastic times one plastic step of the J2 law with the
// built-in S355 curve, from a committed plastic state, in each condition.
func BenchmarkJ2RespondPlastic(b *testing.B) {
	st, err := SteelStrength("S355", 30)
	if err != nil {
		b.Fatal(err)
	}
	h, err := st.Hardening(testE, DefaultNecking())
	if err != nil {
		b.Fatal(err)
	}
	m := mustJ2(b, h, StructuralSteelDamage())
	for _, c := range []Condition{PlaneStress, PlaneStrain, Axisymmetric} {
		b.Run(c.String(), func(b *testing.B) {
			committed := make([]float64, m.StateSize())
			trial := make([]float64, m.StateSize())
			var s Vec4
			var d Mat4
			if err := m.Respond(c, Vec4{0.03, -0.012, -0.01, 0.01}, nil, committed, &s, &d); err != nil {
				b.Fatal(err)
			}
			e := Vec4{0.036, -0.014, -0.012, 0.012}
			if err := m.Respond(c, e, committed, trial, &s, &d); err != nil {
				b.Fatal(err)
			}
			if m.EquivalentPlasticStrain(trial) <= m.EquivalentPlasticStrain(committed) {
				b.Fatal("the benchmarked step is not plastic")
			}
			b.ReportAllocs()
			for b.Loop() {
				if err := m.Respond(c, e, committed, trial, &s, &d); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
