package material

import (
	"errors"
	"fmt"
	"math"
)

// Condition is the two-dimensional idealisation of the section.
type Condition int

const (
	// PlaneStress: σ_yy = 0; out-of-plane thickness per region.
	PlaneStress Condition = iota
	// PlaneStrain: ε_yy = 0; out-of-plane thickness per region.
	PlaneStrain
	// Axisymmetric: x is the radius, yy the hoop component ε_θ = u_x/x.
	Axisymmetric
)

// String names the condition in plain words.
func (c Condition) String() string {
	switch c {
	case PlaneStress:
		return "plane stress"
	case PlaneStrain:
		return "plane strain"
	case Axisymmetric:
		return "axisymmetric"
	}
	return fmt.Sprintf("condition(%d)", int(c))
}

// Vec4 holds the components xx, zz, yy, xz of a strain or a stress.
type Vec4 [4]float64

// Mat4 is a material tangent dσ/dε in the order of Vec4.
type Mat4 [4][4]float64

// Law is the response of a material point.
type Law interface {
	// StateSize is the number of history values one point keeps (0 for
	// elastic laws).
	StateSize() int
	// Respond writes the stress and the consistent tangent at the total
	// strain into stress and tangent (both non-nil, every component set),
	// starting from the committed history; it writes the history that goes
	// with that strain into trial (len StateSize) and leaves committed
	// untouched (the two must not overlap; after an error trial holds no
	// state to use). In plane stress the yy strain given is ignored and the
	// stress has σ_yy = 0. The answer goes into the caller's memory, not
	// out as values: an element calls this at every integration point, and
	// a 4×4 tangent returned through an interface was copied twice on its
	// way (BENCHMARKS.md, "Element work").
	Respond(c Condition, strain Vec4, committed, trial []float64, stress *Vec4, tangent *Mat4) error
}

// Elastic is linear isotropic elasticity (Hooke's law).
type Elastic struct {
	E  float64 // Young's modulus, MPa
	Nu float64 // Poisson's ratio
}

// NewElastic validates E > 0 and −1 < ν < 0.5.
func NewElastic(e, nu float64) (Elastic, error) {
	if !(e > 0) {
		return Elastic{}, fmt.Errorf("material: E = %g: must be positive", e)
	}
	if !(nu > -1 && nu < 0.5) {
		return Elastic{}, fmt.Errorf("material: nu = %g: must lie in (-1, 0.5)", nu)
	}
	return Elastic{E: e, Nu: nu}, nil
}

// StateSize implements Law.
func (Elastic) StateSize() int { return 0 }

// ShearModulus is G = E / (2(1+ν)).
func (m Elastic) ShearModulus() float64 { return m.E / (2 * (1 + m.Nu)) }

// Tangent is the elastic matrix for condition c.
func (m Elastic) Tangent(c Condition) Mat4 {
	var d Mat4
	m.tangentTo(c, &d)
	return d
}

// tangentTo writes the elastic matrix for condition c into d, all of it.
func (m Elastic) tangentTo(c Condition, d *Mat4) {
	*d = Mat4{}
	g := m.ShearModulus()
	if c == PlaneStress {
		f := m.E / (1 - m.Nu*m.Nu)
		d[0][0], d[0][1] = f, f*m.Nu
		d[1][0], d[1][1] = f*m.Nu, f
		d[3][3] = g
		return
	}
	lambda := m.E * m.Nu / ((1 + m.Nu) * (1 - 2*m.Nu))
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			d[i][j] = lambda
		}
		d[i][i] += 2 * g
	}
	d[3][3] = g
}

// Respond implements Law.
func (m Elastic) Respond(c Condition, strain Vec4, _, _ []float64, stress *Vec4, tangent *Mat4) error {
	if m.E <= 0 {
		return errors.New("material: elastic law with E <= 0")
	}
	m.tangentTo(c, tangent)
	*stress = tangent.MulVec(strain)
	return nil
}

// MulVec returns d·v.
func (d *Mat4) MulVec(v Vec4) Vec4 {
	var s Vec4
	for i := range s {
		for j := range v {
			s[i] += d[i][j] * v[j]
		}
	}
	return s
}

// VonMises is the equivalent stress of a Vec4 stress.
func VonMises(s Vec4) float64 {
	xx, zz, yy, xz := s[0], s[1], s[2], s[3]
	j2 := ((xx-zz)*(xx-zz)+(zz-yy)*(zz-yy)+(yy-xx)*(yy-xx))/6 + xz*xz
	return math.Sqrt(3 * j2)
}
