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
	h      deformation   // F − I (FiniteStrain)
	valid  bool          // h is not inverted
	log    logStrain     // ½ ln C and its derivatives (FiniteStrain)
	d      material.Mat4 // the law's tangent
	stress material.Vec4 // the law's stress
	// b holds the columns of the strain–displacement matrix B of each
	// node, db those of w·D·B: per node, so that the pass over the node
	// pairs reads one record a node.
	b  [maxElementNodes]nodeColumns
	db [maxElementNodes]nodeColumns
}

// nodeColumns are the two columns of a 4-row matrix (B or w·D·B) that
// belong to one node: x for u_x, z for u_z, rows xx, zz, yy, xz.
type nodeColumns struct{ x, z [4]float64 }

// SmallStrain is the geometrically linear formulation ε = B·u.
type SmallStrain struct{}

// strain of the small-strain B: the sums run in scalars (the elements of
// an array are kept in memory, each += a load and a store on the chain)
// over slices of one length.
func (SmallStrain) strain(c material.Condition, g *PointGeometry, u []float64, _ *pointWork) material.Vec4 {
	n := len(g.N)
	dndx, dndz, u := g.DNdx[:n], g.DNdz[:n], u[:2*n]
	var exx, ezz, eyy, gxz float64
	for a := range dndx {
		ux, uz := u[2*a], u[2*a+1]
		exx += dndx[a] * ux
		ezz += dndz[a] * uz
		gxz += dndz[a]*ux + dndx[a]*uz
	}
	if c == material.Axisymmetric {
		for a, na := range g.N {
			eyy += na / g.X * u[2*a]
		}
	}
	return material.Vec4{exx, ezz, eyy, gxz}
}

// accumulate of the small-strain B, whose column of node a is (∂N/∂x, 0,
// N/x, ∂N/∂z) for u_x and (0, ∂N/∂z, 0, ∂N/∂x) for u_z (N/x in axisymmetry
// only): the products skip its zeros.
func (SmallStrain) accumulate(c material.Condition, g *PointGeometry, k *pointWork, stress material.Vec4, d *material.Mat4, fe, ke []float64) {
	w := g.Weight
	axi := c == material.Axisymmetric
	s0, s1, s2, s3 := w*stress[0], w*stress[1], w*stress[2], w*stress[3]
	n := len(g.N)
	fe = fe[:2*n]
	for a := 0; a < n; a++ {
		dx, dz := g.DNdx[a], g.DNdz[a]
		fx := s0*dx + s3*dz
		if axi {
			r := g.N[a] / g.X
			k.b[a].x[2] = r
			fx += s2 * r
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
	for a := 0; a < n; a++ {
		dx, dz := g.DNdx[a], g.DNdz[a]
		db := &k.db[a]
		db.x[0], db.z[0] = wd[0][0]*dx+wd[0][3]*dz, wd[0][1]*dz+wd[0][3]*dx
		db.x[1], db.z[1] = wd[1][0]*dx+wd[1][3]*dz, wd[1][1]*dz+wd[1][3]*dx
		db.x[3], db.z[3] = wd[3][0]*dx+wd[3][3]*dz, wd[3][1]*dz+wd[3][3]*dx
		if axi {
			r := k.b[a].x[2]
			db.x[0] += wd[0][2] * r
			db.x[1] += wd[1][2] * r
			db.x[3] += wd[3][2] * r
			db.x[2] = wd[2][0]*dx + wd[2][3]*dz + wd[2][2]*r
			db.z[2] = wd[2][1]*dz + wd[2][3]*dx
		}
	}
	nd := 2 * n
	for a := 0; a < n; a++ {
		dxa, dza := g.DNdx[a], g.DNdz[a]
		ra := k.b[a].x[2]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		for b := a; b < n; b++ {
			db := &k.db[b]
			xx := dxa*db.x[0] + dza*db.x[3]
			xz := dxa*db.z[0] + dza*db.z[3]
			if axi {
				xx += ra * db.x[2]
				xz += ra * db.z[2]
			}
			px, pz := rx[2*b:2*b+2], rz[2*b:2*b+2]
			px[0] += xx
			px[1] += xz
			if b != a { // the zx entry of a diagonal block is in the lower triangle
				pz[0] += dza*db.x[1] + dxa*db.x[3]
			}
			pz[1] += dza*db.z[1] + dxa*db.z[3]
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
