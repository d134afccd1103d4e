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
func addBtDB(b [][]float64, d *material.Mat4, w float64, k, scratch []float64) {
	nd := len(b[0])
	db := scratch[:4*nd]
	for i := 0; i < 4; i++ {
		row := db[i*nd : (i+1)*nd]
		for j := 0; j < nd; j++ {
			row[j] = w * (d[i][0]*b[0][j] + d[i][1]*b[1][j] + d[i][2]*b[2][j] + d[i][3]*b[3][j])
		}
	}
	for r := 0; r < nd; r++ {
		b0, b1, b2, b3 := b[0][r], b[1][r], b[2][r], b[3][r]
		kr := k[r*nd : (r+1)*nd]
		for j := 0; j < nd; j++ {
			kr[j] += b0*db[j] + b1*db[nd+j] + b2*db[2*nd+j] + b3*db[3*nd+j]
		}
	}
}
