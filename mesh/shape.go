package mesh

import "math"

// Natural coordinates of the nodes: corners, then midsides of sides
// 0-1, 1-2, 2-3, 3-0.
var (
	nodeXi  = [8]float64{-1, 1, 1, -1, 0, 1, 0, -1}
	nodeEta = [8]float64{-1, -1, 1, 1, -1, 0, 1, 0}
)

type gaussPoint struct{ xi, eta, w float64 }

// gauss3x3 is the 3×3 Gauss–Legendre rule on [−1, 1]².
var gauss3x3 = func() []gaussPoint {
	a := math.Sqrt(0.6)
	x := [3]float64{-a, 0, a}
	w := [3]float64{5.0 / 9, 8.0 / 9, 5.0 / 9}
	g := make([]gaussPoint, 0, 9)
	for j := range 3 {
		for i := range 3 {
			g = append(g, gaussPoint{x[i], x[j], w[i] * w[j]})
		}
	}
	return g
}()

// shapeDerivs fills the natural derivatives of the shape functions of an
// element with len(dxi) nodes (4 or 8) at (ξ, η).
func shapeDerivs(xi, eta float64, dxi, deta []float64) {
	if len(dxi) == 4 {
		for i := range 4 {
			a, b := nodeXi[i], nodeEta[i]
			dxi[i] = 0.25 * a * (1 + b*eta)
			deta[i] = 0.25 * b * (1 + a*xi)
		}
		return
	}
	for i := range 4 {
		a, b := nodeXi[i], nodeEta[i]
		dxi[i] = 0.25 * a * (1 + b*eta) * (2*a*xi + b*eta)
		deta[i] = 0.25 * b * (1 + a*xi) * (a*xi + 2*b*eta)
	}
	for i := 4; i < 8; i++ {
		a, b := nodeXi[i], nodeEta[i]
		if a == 0 { // on η = b: N = ½(1−ξ²)(1+bη)
			dxi[i] = -xi * (1 + b*eta)
			deta[i] = 0.5 * b * (1 - xi*xi)
		} else { // on ξ = a: N = ½(1+aξ)(1−η²)
			dxi[i] = 0.5 * a * (1 - eta*eta)
			deta[i] = -eta * (1 + a*xi)
		}
	}
}

// detJ is the Jacobian determinant of the map from (ξ, η) to (x, z) of an
// element with nodes x (4 or 8 of them).
func detJ(x []Point, xi, eta float64) float64 {
	var dxi, deta [8]float64
	shapeDerivs(xi, eta, dxi[:len(x)], deta[:len(x)])
	var xXi, xEta, zXi, zEta float64
	for i, p := range x {
		xXi += dxi[i] * p.X
		xEta += deta[i] * p.X
		zXi += dxi[i] * p.Z
		zEta += deta[i] * p.Z
	}
	return xXi*zEta - xEta*zXi
}
