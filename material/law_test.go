package material

import (
	"math"
	"testing"
)

// Uniaxial stress must give ε_xx = σ/E and lateral strain −ν σ/E (Hooke's law).
func TestElasticUniaxial(t *testing.T) {
	m, err := NewElastic(210000, 0.3)
	if err != nil {
		t.Fatal(err)
	}
	sigma := 100.0
	eps := sigma / m.E
	lat := -m.Nu * eps
	cases := []struct {
		name   string
		c      Condition
		strain Vec4
	}{
		{"plane stress", PlaneStress, Vec4{eps, lat, 0, 0}},
		{"plane strain", PlaneStrain, Vec4{eps, lat, lat, 0}},
		{"axisymmetric", Axisymmetric, Vec4{eps, lat, lat, 0}},
	}
	for _, tc := range cases {
		var s Vec4
		var d Mat4
		if err := m.Respond(tc.c, tc.strain, nil, nil, &s, &d); err != nil {
			t.Fatal(err)
		}
		if math.Abs(s[0]-sigma) > 1e-9*sigma || math.Abs(s[1]) > 1e-9*sigma || math.Abs(s[2]) > 1e-9*sigma {
			t.Errorf("%s: stress %v, want (%g,0,0,0)", tc.name, s, sigma)
		}
		if vm := VonMises(s); math.Abs(vm-sigma) > 1e-9*sigma {
			t.Errorf("%s: von Mises %g, want %g", tc.name, vm, sigma)
		}
	}
}

func TestNewElasticRejects(t *testing.T) {
	for _, c := range []struct{ e, nu float64 }{{0, 0.3}, {-1, 0.3}, {210000, 0.5}, {210000, -1}} {
		if _, err := NewElastic(c.e, c.nu); err == nil {
			t.Errorf("NewElastic(%g, %g) accepted", c.e, c.nu)
		}
	}
}
