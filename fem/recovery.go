package fem

import (
	"fmt"

	"gonum.org/v1/gonum/mat"

	"flangeseg/material"
)

// extrapolation returns the matrix (nodes × points) that carries the
// integration point values of one element to its nodes: a least-squares fit
// in (ξ, η) of a polynomial the rule can carry — a constant for 1 point,
// bilinear for 2×2 (exact extrapolation), the 8-term serendipity basis for
// 3×3 and finer — evaluated at the nodes.
func (m *Model) extrapolation() (*mat.Dense, error) {
	np := len(m.rule)
	basis := func(xi, eta float64) []float64 {
		switch {
		case np == 1:
			return []float64{1}
		case np == 4:
			return []float64{1, xi, eta, xi * eta}
		}
		return []float64{1, xi, eta, xi * eta, xi * xi, eta * eta, xi * xi * eta, xi * eta * eta}
	}
	nb := len(basis(0, 0))
	a := mat.NewDense(np, nb, nil)
	for i, p := range m.rule {
		a.SetRow(i, basis(p.xi, p.eta))
	}
	var fit mat.Dense // (AᵀA)⁻¹Aᵀ, nb × np
	var ata mat.Dense
	ata.Mul(a.T(), a)
	if err := fit.Solve(&ata, a.T()); err != nil {
		return nil, fmt.Errorf("fem: stress extrapolation: %w", err)
	}
	natural := [8][2]float64{{-1, -1}, {1, -1}, {1, 1}, {-1, 1}, {0, -1}, {1, 0}, {0, 1}, {-1, 0}}
	nen := int(m.mesh.Kind)
	at := mat.NewDense(nen, nb, nil)
	for a := 0; a < nen; a++ {
		at.SetRow(a, basis(natural[a][0], natural[a][1]))
	}
	var ex mat.Dense
	ex.Mul(at, &fit)
	return &ex, nil
}

// NodalStress recovers the stress at the nodes by extrapolating each
// element's integration point stresses to its nodes and averaging over the
// elements that share a node. Averaging spans region boundaries, where
// stress jumps are smeared: read stresses at such nodes from the point
// results instead.
func (s *Solution) NodalStress() ([]material.Vec4, error) {
	m := s.model
	ex, err := m.extrapolation()
	if err != nil {
		return nil, err
	}
	out := make([]material.Vec4, len(m.mesh.Nodes))
	count := make([]int, len(m.mesh.Nodes))
	for e, el := range m.mesh.Elements {
		pts := s.Points[e]
		for a, node := range el.Nodes {
			for ip := range pts {
				w := ex.At(a, ip)
				for c := 0; c < 4; c++ {
					out[node][c] += w * pts[ip].Stress[c]
				}
			}
			count[node]++
		}
	}
	for n := range out {
		if count[n] > 0 {
			for c := range out[n] {
				out[n][c] /= float64(count[n])
			}
		}
	}
	return out, nil
}
