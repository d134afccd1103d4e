package fem

import "flangeseg/material"

// PointGeometry is what an element knows at one integration point: shape
// function values and Cartesian derivatives in the reference configuration,
// the point's position and its integration weight (Gauss weight × det J ×
// thickness, or × 2π·x in an axisymmetric model).
type PointGeometry struct {
	N, DNdx, DNdz []float64
	X, Z          float64
	Weight        float64
}

// Kinematics turns the element's nodal displacements (x, z per node, in
// element node order) into the strain measure a material.Law takes, and the
// law's stress and tangent into nodal force and stiffness. Small strain is
// the one here; a large-deformation formulation is another implementation
// of the same interface, so assembly and the laws stay as they are.
type Kinematics interface {
	// Strain at the point for displacements u.
	Strain(c material.Condition, g *PointGeometry, u []float64) material.Vec4
	// Accumulate adds the point's internal force to fe and, if ke is not
	// nil, its tangent stiffness (row-major, len(u)×len(u)) to ke.
	Accumulate(c material.Condition, g *PointGeometry, u []float64, stress material.Vec4, d *material.Mat4, fe, ke []float64)
}

// maxElementDofs bounds the dofs of one element (8 nodes × 2).
const maxElementDofs = 16

// SmallStrain is the geometrically linear formulation ε = B·u.
type SmallStrain struct{}

// Strain implements Kinematics.
func (SmallStrain) Strain(c material.Condition, g *PointGeometry, u []float64) material.Vec4 {
	var e material.Vec4
	for a := range g.N {
		ux, uz := u[2*a], u[2*a+1]
		e[0] += g.DNdx[a] * ux
		e[1] += g.DNdz[a] * uz
		e[3] += g.DNdz[a]*ux + g.DNdx[a]*uz
		if c == material.Axisymmetric {
			e[2] += g.N[a] / g.X * ux
		}
	}
	return e
}

// fillB writes the strain–displacement matrix, 4 rows × 2n columns.
func fillB(c material.Condition, g *PointGeometry, b [][]float64) {
	for a := range g.N {
		ix, iz := 2*a, 2*a+1
		b[0][ix], b[0][iz] = g.DNdx[a], 0
		b[1][ix], b[1][iz] = 0, g.DNdz[a]
		b[2][ix], b[2][iz] = 0, 0
		if c == material.Axisymmetric {
			b[2][ix] = g.N[a] / g.X
		}
		b[3][ix], b[3][iz] = g.DNdz[a], g.DNdx[a]
	}
}

// Accumulate implements Kinematics.
func (SmallStrain) Accumulate(c material.Condition, g *PointGeometry, u []float64, stress material.Vec4, d *material.Mat4, fe, ke []float64) {
	nd := len(u)
	var bb [4][maxElementDofs]float64
	var scratch [4 * maxElementDofs]float64
	b := [][]float64{bb[0][:nd], bb[1][:nd], bb[2][:nd], bb[3][:nd]}
	fillB(c, g, b)
	w := g.Weight
	for j := 0; j < nd; j++ {
		fe[j] += w * (b[0][j]*stress[0] + b[1][j]*stress[1] + b[2][j]*stress[2] + b[3][j]*stress[3])
	}
	if ke == nil {
		return
	}
	addBtDB(b, d, w, ke, scratch[:])
}

// addBtDB adds w·BᵀDB to k (nd×nd, row-major); scratch holds 4·nd values.
// D is symmetric (the tangent of every law in package material is), so only
// the upper triangle is computed and mirrored; the yy row of B, zero outside
// axisymmetry, is skipped when it is. The product dominated the assembly of
// yielding, large-deformation runs.
func addBtDB(b [][]float64, d *material.Mat4, w float64, k, scratch []float64) {
	nd := len(b[0])
	hoop := false
	for _, v := range b[2] {
		hoop = hoop || v != 0
	}
	db := scratch[:4*nd]
	d0, d1, d2, d3 := db[:nd], db[nd:2*nd], db[2*nd:3*nd], db[3*nd:4*nd]
	b0, b1, b2, b3 := b[0], b[1], b[2], b[3]
	for j := 0; j < nd; j++ {
		x0, x1, x3 := b0[j], b1[j], b3[j]
		d0[j] = w * (d[0][0]*x0 + d[0][1]*x1 + d[0][3]*x3)
		d1[j] = w * (d[1][0]*x0 + d[1][1]*x1 + d[1][3]*x3)
		d3[j] = w * (d[3][0]*x0 + d[3][1]*x1 + d[3][3]*x3)
		if hoop {
			x2 := b2[j]
			d0[j] += w * d[0][2] * x2
			d1[j] += w * d[1][2] * x2
			d3[j] += w * d[3][2] * x2
			d2[j] = w * (d[2][0]*x0 + d[2][1]*x1 + d[2][2]*x2 + d[2][3]*x3)
		}
	}
	for r := 0; r < nd; r++ {
		y0, y1, y2, y3 := b0[r], b1[r], b2[r], b3[r]
		kr := k[r*nd : (r+1)*nd]
		for j := r; j < nd; j++ {
			v := y0*d0[j] + y1*d1[j] + y3*d3[j]
			if hoop {
				v += y2 * d2[j]
			}
			kr[j] += v
			if j != r {
				k[j*nd+r] += v
			}
		}
	}
}
