package fem

import (
	"fmt"

	"gonum.org/v1/gonum/mat"

	"flangeseg/material"
)

// incompatibleResponse is the 4-node quadrilateral with the internal modes
// P1 = 1 − ξ², P2 = 1 − η² in both displacement directions (Wilson, Taylor,
// Doherty & Ghaboussi 1973). Instead of evaluating their derivatives with
// the centre Jacobian (Taylor, Beresford & Wilson 1976) the mode strains are
// made orthogonal to constant stress by subtracting their volume mean, which
// passes the patch test for any weighting, axisymmetric included. The
// internal dofs are condensed out: K = Kcc − Kci Kii⁻¹ Kic.
func (m *Model) incompatibleResponse(e int, ue, fe, ke []float64, pts []PointResult, s *scratch) error {
	law := m.laws[m.mesh.Elements[e].Region].(material.Elastic)
	c := m.opt.Condition
	d := law.Tangent(c)
	np := len(m.rule)
	b := make([][4][8]float64, np)  // compatible strain operator per point
	gm := make([][4][4]float64, np) // mode strain operator per point
	w := make([]float64, np)
	geo := make([]PointGeometry, np)
	var mean [4][4]float64
	vol := 0.0
	for ip, p := range m.rule {
		g, err := m.pointGeometry(e, p, s)
		if err != nil {
			return err
		}
		geo[ip] = PointGeometry{X: g.X, Z: g.Z, Weight: g.Weight}
		w[ip] = g.Weight
		vol += g.Weight
		for a := 0; a < 4; a++ {
			b[ip][0][2*a] = g.DNdx[a]
			b[ip][1][2*a+1] = g.DNdz[a]
			b[ip][3][2*a] = g.DNdz[a]
			b[ip][3][2*a+1] = g.DNdx[a]
			if c == material.Axisymmetric {
				b[ip][2][2*a] = g.N[a] / g.X
			}
		}
		modeDerivs(p.xi, p.eta, s, &gm[ip], c, g)
		for i := 0; i < 4; i++ {
			for j := 0; j < 4; j++ {
				mean[i][j] += g.Weight * gm[ip][i][j]
			}
		}
	}
	for ip := range gm {
		for i := 0; i < 4; i++ {
			for j := 0; j < 4; j++ {
				gm[ip][i][j] -= mean[i][j] / vol
			}
		}
	}
	kcc := mat.NewDense(8, 8, nil)
	kci := mat.NewDense(8, 4, nil)
	kii := mat.NewSymDense(4, nil)
	for ip := range m.rule {
		var db [4][8]float64
		var dg [4][4]float64
		for i := 0; i < 4; i++ {
			for k := 0; k < 4; k++ {
				for j := 0; j < 8; j++ {
					db[i][j] += d[i][k] * b[ip][k][j]
				}
				for j := 0; j < 4; j++ {
					dg[i][j] += d[i][k] * gm[ip][k][j]
				}
			}
		}
		for r := 0; r < 8; r++ {
			for col := 0; col < 8; col++ {
				v := 0.0
				for k := 0; k < 4; k++ {
					v += b[ip][k][r] * db[k][col]
				}
				kcc.Set(r, col, kcc.At(r, col)+w[ip]*v)
			}
			for col := 0; col < 4; col++ {
				v := 0.0
				for k := 0; k < 4; k++ {
					v += b[ip][k][r] * dg[k][col]
				}
				kci.Set(r, col, kci.At(r, col)+w[ip]*v)
			}
		}
		for r := 0; r < 4; r++ {
			for col := r; col < 4; col++ {
				v := 0.0
				for k := 0; k < 4; k++ {
					v += gm[ip][k][r] * dg[k][col]
				}
				kii.SetSym(r, col, kii.At(r, col)+w[ip]*v)
			}
		}
	}
	var chol mat.Cholesky
	if !chol.Factorize(kii) {
		return fmt.Errorf("fem: element %d: internal-mode stiffness is singular (degenerate element)", e)
	}
	var kiiInvKic mat.Dense // Kii⁻¹ Kic, 4×8
	if err := chol.SolveTo(&kiiInvKic, kci.T()); err != nil {
		return fmt.Errorf("fem: element %d: %w", e, err)
	}
	var cond mat.Dense
	cond.Mul(kci, &kiiInvKic)
	cond.Sub(kcc, &cond)
	u := mat.NewVecDense(8, ue[:8])
	var f, alpha mat.VecDense
	f.MulVec(&cond, u)
	alpha.MulVec(&kiiInvKic, u)
	for r := 0; r < 8; r++ {
		fe[r] = f.AtVec(r)
		if ke != nil {
			for col := 0; col < 8; col++ {
				ke[r*8+col] = cond.At(r, col)
			}
		}
	}
	if pts == nil {
		return nil
	}
	for ip := range m.rule {
		var strain material.Vec4
		for i := 0; i < 4; i++ {
			for j := 0; j < 8; j++ {
				strain[i] += b[ip][i][j] * ue[j]
			}
			for j := 0; j < 4; j++ {
				strain[i] -= gm[ip][i][j] * alpha.AtVec(j)
			}
		}
		pts[ip] = PointResult{X: geo[ip].X, Z: geo[ip].Z, Strain: strain, Stress: d.MulVec(strain)}
	}
	return nil
}

// modeDerivs fills the strain operator of the internal modes at (ξ, η):
// columns (αx1, αz1, αx2, αz2) for modes 1 − ξ² and 1 − η².
func modeDerivs(xi, eta float64, s *scratch, g *[4][4]float64, c material.Condition, pg *PointGeometry) {
	j11, j12, j21, j22 := s.jac[0], s.jac[1], s.jac[2], s.jac[3]
	det := j11*j22 - j12*j21
	p := [2]float64{1 - xi*xi, 1 - eta*eta}
	dpx := [2]float64{-2 * xi, 0}
	dpe := [2]float64{0, -2 * eta}
	for k := 0; k < 2; k++ {
		dx := (j22*dpx[k] - j12*dpe[k]) / det
		dz := (-j21*dpx[k] + j11*dpe[k]) / det
		g[0][2*k] = dx
		g[1][2*k+1] = dz
		g[3][2*k] = dz
		g[3][2*k+1] = dx
		if c == material.Axisymmetric {
			g[2][2*k] = p[k] / pg.X
		}
	}
}
