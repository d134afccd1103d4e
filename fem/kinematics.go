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
// law's stress and tangent into nodal force and stiffness. SmallStrain and
// FiniteStrain implement it; the methods are the package's own, because
// the two halves of a point's evaluation share working memory (pointWork)
// that a worker of the assembly owns, so that what the strain needed (the
// deformation gradient, the logarithm of C and its derivatives) is computed
// once per point and nothing is allocated.
type Kinematics interface {
	// strain returns the strain at the point for displacements u and keeps
	// in k what accumulate needs at the same point.
	strain(c material.Condition, g *PointGeometry, u []float64, k *pointWork) material.Vec4
	// accumulate adds the point's internal force to fe and, if ke is not
	// nil, its tangent stiffness to the upper triangle of ke (row-major,
	// nd×nd); the caller mirrors the triangle once per element (mirrorUpper).
	// stress and d are the law's response to the strain of the last call
	// of strain, at the same point.
	accumulate(c material.Condition, g *PointGeometry, k *pointWork, stress material.Vec4, d *material.Mat4, fe, ke []float64)
}

// maxElementDofs bounds the dofs of one element (8 nodes × 2).
const maxElementDofs = 16

// maxElementNodes bounds the nodes of one element.
const maxElementNodes = maxElementDofs / 2

// pointWork is the working memory of one integration point's evaluation,
// part of a worker's scratch: what strain computes for accumulate, and the
// strain–displacement rows and their products with the tangent.
type pointWork struct {
	h     deformation   // F − I (FiniteStrain)
	valid bool          // h is not inverted
	log   logStrain     // ½ ln C and its derivatives (FiniteStrain)
	d     material.Mat4 // the law's tangent
	// b holds the rows xx, zz, yy, xz of the strain–displacement matrix B
	// (columns: element dofs), db the rows of w·D·B.
	b, db [4][maxElementDofs]float64
}

// SmallStrain is the geometrically linear formulation ε = B·u.
type SmallStrain struct{}

func (SmallStrain) strain(c material.Condition, g *PointGeometry, u []float64, _ *pointWork) material.Vec4 {
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

// accumulate of the small-strain B, whose column of node a is (∂N/∂x, 0,
// N/x, ∂N/∂z) for u_x and (0, ∂N/∂z, 0, ∂N/∂x) for u_z (N/x in axisymmetry
// only): the products skip its zeros.
func (SmallStrain) accumulate(c material.Condition, g *PointGeometry, k *pointWork, stress material.Vec4, d *material.Mat4, fe, ke []float64) {
	w := g.Weight
	axi := c == material.Axisymmetric
	s0, s1, s2, s3 := w*stress[0], w*stress[1], w*stress[2], w*stress[3]
	hoop := &k.b[2] // N/x at the x dofs (axisymmetry)
	for a, n := range g.N {
		dx, dz := g.DNdx[a], g.DNdz[a]
		fx := s0*dx + s3*dz
		if axi {
			hoop[2*a] = n / g.X
			fx += s2 * hoop[2*a]
		}
		fe[2*a] += fx
		fe[2*a+1] += s1*dz + s3*dx
	}
	if ke == nil {
		return
	}
	var wd material.Mat4
	for i := range wd {
		for j := range wd[i] {
			wd[i][j] = w * d[i][j]
		}
	}
	// w·D·B, rows xx, zz, xz (and yy in axisymmetry).
	db0, db1, db2, db3 := &k.db[0], &k.db[1], &k.db[2], &k.db[3]
	for a := range g.N {
		dx, dz := g.DNdx[a], g.DNdz[a]
		ix, iz := 2*a, 2*a+1
		db0[ix], db0[iz] = wd[0][0]*dx+wd[0][3]*dz, wd[0][1]*dz+wd[0][3]*dx
		db1[ix], db1[iz] = wd[1][0]*dx+wd[1][3]*dz, wd[1][1]*dz+wd[1][3]*dx
		db3[ix], db3[iz] = wd[3][0]*dx+wd[3][3]*dz, wd[3][1]*dz+wd[3][3]*dx
		if axi {
			r := hoop[ix]
			db0[ix] += wd[0][2] * r
			db1[ix] += wd[1][2] * r
			db3[ix] += wd[3][2] * r
			db2[ix] = wd[2][0]*dx + wd[2][3]*dz + wd[2][2]*r
			db2[iz] = wd[2][1]*dz + wd[2][3]*dx
		}
	}
	nd := 2 * len(g.N)
	for a := range g.N {
		dxa, dza := g.DNdx[a], g.DNdz[a]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		for b := a; b < len(g.N); b++ {
			jx, jz := 2*b, 2*b+1
			xx := dxa*db0[jx] + dza*db3[jx]
			xz := dxa*db0[jz] + dza*db3[jz]
			if axi {
				xx += hoop[2*a] * db2[jx]
				xz += hoop[2*a] * db2[jz]
			}
			rx[jx] += xx
			rx[jz] += xz
			if b != a { // the zx entry of a diagonal block is in the lower triangle
				rz[jx] += dza*db1[jx] + dxa*db3[jx]
			}
			rz[jz] += dza*db1[jz] + dxa*db3[jz]
		}
	}
}

// mirrorUpper copies the upper triangle of the nd×nd row-major k into its
// lower triangle: the element routines add to the upper triangle only, the
// tangents of all laws here being symmetric.
func mirrorUpper(k []float64, nd int) {
	for r := 1; r < nd; r++ {
		row := k[r*nd : r*nd+r]
		for c := range row {
			row[c] = k[c*nd+r]
		}
	}
}
