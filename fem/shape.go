package fem

import (
	"fmt"
	"math"

	"flangeseg/mesh"
)

// shapeQ4 evaluates the bilinear shape functions and their natural
// derivatives at (ξ, η); corners at (−1,−1), (1,−1), (1,1), (−1,1).
func shapeQ4(xi, eta float64, n, dxi, deta []float64) {
	cx := [4]float64{-1, 1, 1, -1}
	ce := [4]float64{-1, -1, 1, 1}
	for i := 0; i < 4; i++ {
		n[i] = 0.25 * (1 + cx[i]*xi) * (1 + ce[i]*eta)
		dxi[i] = 0.25 * cx[i] * (1 + ce[i]*eta)
		deta[i] = 0.25 * ce[i] * (1 + cx[i]*xi)
	}
}

// shapeQ8 evaluates the serendipity shape functions: corners as in shapeQ4,
// then the midsides of sides 0-1, 1-2, 2-3, 3-0.
func shapeQ8(xi, eta float64, n, dxi, deta []float64) {
	cx := [4]float64{-1, 1, 1, -1}
	ce := [4]float64{-1, -1, 1, 1}
	for i := 0; i < 4; i++ {
		a, b := cx[i], ce[i]
		n[i] = 0.25 * (1 + a*xi) * (1 + b*eta) * (a*xi + b*eta - 1)
		dxi[i] = 0.25 * a * (1 + b*eta) * (2*a*xi + b*eta)
		deta[i] = 0.25 * b * (1 + a*xi) * (a*xi + 2*b*eta)
	}
	// Midsides on η = ∓1 (sides 0-1 and 2-3): N = ½(1−ξ²)(1±η).
	for k, b := range [2]float64{-1, 1} {
		i := 4 + 2*k
		n[i] = 0.5 * (1 - xi*xi) * (1 + b*eta)
		dxi[i] = -xi * (1 + b*eta)
		deta[i] = 0.5 * b * (1 - xi*xi)
	}
	// Midsides on ξ = ±1 (sides 1-2 and 3-0): N = ½(1±ξ)(1−η²).
	for k, a := range [2]float64{1, -1} {
		i := 5 + 2*k
		n[i] = 0.5 * (1 + a*xi) * (1 - eta*eta)
		dxi[i] = 0.5 * a * (1 - eta*eta)
		deta[i] = -eta * (1 + a*xi)
	}
}

func shapeFunctions(kind mesh.Kind) func(xi, eta float64, n, dxi, deta []float64) {
	if kind == mesh.Quad8 {
		return shapeQ8
	}
	return shapeQ4
}

// gauss1D returns the Gauss–Legendre points and weights of an n-point rule.
func gauss1D(n int) (pts, wts []float64, err error) {
	switch n {
	case 1:
		return []float64{0}, []float64{2}, nil
	case 2:
		g := 1 / math.Sqrt(3)
		return []float64{-g, g}, []float64{1, 1}, nil
	case 3:
		g := math.Sqrt(0.6)
		return []float64{-g, 0, g}, []float64{5.0 / 9, 8.0 / 9, 5.0 / 9}, nil
	case 4:
		a := math.Sqrt(3.0/7 - 2.0/7*math.Sqrt(1.2))
		b := math.Sqrt(3.0/7 + 2.0/7*math.Sqrt(1.2))
		wa := (18 + math.Sqrt(30)) / 36
		wb := (18 - math.Sqrt(30)) / 36
		return []float64{-b, -a, a, b}, []float64{wb, wa, wa, wb}, nil
	}
	return nil, nil, fmt.Errorf("fem: Gauss rule with %d points per direction: only 1 to 4 are available", n)
}

// naturalPoint is one point of a tensor-product rule on the unit square.
type naturalPoint struct{ xi, eta, w float64 }

func gauss2D(n int) ([]naturalPoint, error) {
	p, w, err := gauss1D(n)
	if err != nil {
		return nil, err
	}
	out := make([]naturalPoint, 0, n*n)
	for j := range p {
		for i := range p {
			out = append(out, naturalPoint{p[i], p[j], w[i] * w[j]})
		}
	}
	return out, nil
}
