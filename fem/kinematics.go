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
// the parts of an element's evaluation share working memory (kernelWork)
// that a worker of the assembly owns, so that what the strain needed (the
// deformation gradient, the logarithm of C and its derivatives) is computed
// once per point and nothing is allocated.
//
// The tangent is summed over the element's points node pair by node pair
// (pairs), not point by point: each entry of the element matrix is then
// loaded and stored once per element, its sum over the points held in a
// register, where adding each point's w·BᵀDB to the matrix in memory cost a
// load and a store per entry and point, about one for every four flops.
// Each point's term is formed, and added, in the order the point-by-point
// sum used, so the tangent is the same to the last bit.
type Kinematics interface {
	// strain returns the strain at the point for displacements u and keeps
	// in k what point needs at the same point.
	strain(c material.Condition, g *PointGeometry, u []float64, k *kernelWork) material.Vec4
	// point adds the point's internal force to fe, from the stress the law
	// wrote into k after the last call of strain; if keep is set it also
	// keeps in k, as the next of the element's kept points, this point's
	// part of the tangent as pairs needs it (from the tangent in k).
	point(c material.Condition, g *PointGeometry, k *kernelWork, fe []float64, keep bool)
	// pairs adds the tangent of the points kept in k (k.kept of them, for
	// elements of n nodes) to the upper triangle of ke (row-major, 2n×2n);
	// the caller mirrors the triangle (mirrorUpper).
	pairs(c material.Condition, k *kernelWork, n int, ke []float64)
}

// maxElementDofs bounds the dofs of one element (8 nodes × 2).
const maxElementDofs = 16

// maxElementNodes bounds the nodes of one element.
const maxElementNodes = maxElementDofs / 2

// maxElementPoints bounds the integration points of one element (the 4×4
// Gauss rule, the largest gauss1D has).
const maxElementPoints = 16

// kernelWork is the working memory of an element's evaluation by its
// kinematics, part of a worker's scratch: what strain computes for point at
// the same integration point, the law's stress and tangent, and, per node
// and kept point, what pairs reads. The columns are stored node by node,
// the points of a node one after the other, so that the pass over a node
// pair walks two contiguous runs.
type kernelWork struct {
	h      deformation   // F − I (FiniteStrain)
	valid  bool          // h is not inverted
	log    logStrain     // ½ ln C and its derivatives (FiniteStrain)
	d      material.Mat4 // the law's tangent
	stress material.Vec4 // the law's stress
	kept   int           // points whose columns are kept; the element resets it
	small  [maxElementNodes][maxElementPoints]smallColumns
	finite [maxElementNodes][maxElementPoints]finiteColumns
}

// nodeColumns are the two columns of a 4-row matrix (B or w·D·B) that
// belong to one node: x for u_x, z for u_z, rows xx, zz, yy, xz.
type nodeColumns struct{ x, z [4]float64 }

// smallColumns is what the node-pair pass of SmallStrain needs of one node
// at one point: its B column, (∂N/∂x, ∂N/∂z) and N/x (axisymmetric only),
// and its columns of w·D·B.
type smallColumns struct {
	dx, dz, r float64
	db        nodeColumns
}

// finiteColumns is what the node-pair pass of FiniteStrain needs of one
// node at one point: its columns of B and of w·D·B, ∇N and w·S·∇N for the
// geometric stiffness, and in axisymmetry N and the hoop term w·S_yy·N/x².
type finiteColumns struct {
	b, db   nodeColumns
	dx, dz  float64
	gx, gz  float64
	n, hoop float64
}

// SmallStrain is the geometrically linear formulation ε = B·u.
type SmallStrain struct{}

// strain of the small-strain B: the sums run in scalars (the elements of
// an array are kept in memory, each += a load and a store on the chain)
// over slices of one length.
func (SmallStrain) strain(c material.Condition, g *PointGeometry, u []float64, _ *kernelWork) material.Vec4 {
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

// point of the small-strain B, whose column of node a is (∂N/∂x, 0, N/x,
// ∂N/∂z) for u_x and (0, ∂N/∂z, 0, ∂N/∂x) for u_z (N/x in axisymmetry
// only): the products skip its zeros.
func (SmallStrain) point(c material.Condition, g *PointGeometry, k *kernelWork, fe []float64, keep bool) {
	w := g.Weight
	axi := c == material.Axisymmetric
	stress := &k.stress
	s0, s1, s2, s3 := w*stress[0], w*stress[1], w*stress[2], w*stress[3]
	n := len(g.N)
	fe = fe[:2*n]
	cols := k.small[:n]
	p := k.kept
	for a := range cols {
		dx, dz := g.DNdx[a], g.DNdz[a]
		col := &cols[a][p]
		col.dx, col.dz = dx, dz
		fx := s0*dx + s3*dz
		if axi {
			r := g.N[a] / g.X
			col.r = r
			fx += s2 * r
		}
		fe[2*a] += fx
		fe[2*a+1] += s1*dz + s3*dx
	}
	if !keep {
		return
	}
	// w·D·B, rows xx, zz, xz (and yy in axisymmetry), in a loop of its
	// own with the entries of w·D it needs in scalars: with the force's
	// terms too they would not fit the registers, and an array's elements
	// are loaded at every use.
	d := &k.d
	d00, d01, d03 := w*d[0][0], w*d[0][1], w*d[0][3]
	d10, d11, d13 := w*d[1][0], w*d[1][1], w*d[1][3]
	d30, d31, d33 := w*d[3][0], w*d[3][1], w*d[3][3]
	for a := range cols {
		col := &cols[a][p]
		dx, dz, db := col.dx, col.dz, &col.db
		db.x[0], db.z[0] = d00*dx+d03*dz, d01*dz+d03*dx
		db.x[1], db.z[1] = d10*dx+d13*dz, d11*dz+d13*dx
		db.x[3], db.z[3] = d30*dx+d33*dz, d31*dz+d33*dx
	}
	if axi {
		d02, d12, d32 := w*d[0][2], w*d[1][2], w*d[3][2]
		d20, d21, d22, d23 := w*d[2][0], w*d[2][1], w*d[2][2], w*d[2][3]
		for a := range cols {
			col := &cols[a][p]
			dx, dz, r, db := col.dx, col.dz, col.r, &col.db
			db.x[0] += d02 * r
			db.x[1] += d12 * r
			db.x[3] += d32 * r
			db.x[2] = d20*dx + d23*dz + d22*r
			db.z[2] = d21*dz + d23*dx
		}
	}
	k.kept++
}

// pairs of the small-strain B: the 2×2 block of nodes a ≤ b sums
// B_aᵀ·(w·D·B)_b over the points in four scalars.
func (SmallStrain) pairs(c material.Condition, k *kernelWork, n int, ke []float64) {
	if c == material.Axisymmetric {
		smallPairsAxisymmetric(k, n, ke)
		return
	}
	nd := 2 * n
	for a := 0; a < n; a++ {
		ca := k.small[a][:k.kept]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		// The diagonal block: its zx entry is in the lower triangle.
		xx, xz, zz := rx[2*a], rx[2*a+1], rz[2*a+1]
		for p := range ca {
			q := &ca[p]
			xx += q.dx*q.db.x[0] + q.dz*q.db.x[3]
			xz += q.dx*q.db.z[0] + q.dz*q.db.z[3]
			zz += q.dz*q.db.z[1] + q.dx*q.db.z[3]
		}
		rx[2*a], rx[2*a+1], rz[2*a+1] = xx, xz, zz
		for b := a + 1; b < n; b++ {
			cb := k.small[b][:len(ca)]
			px, pz := rx[2*b:2*b+2], rz[2*b:2*b+2]
			xx, xz, zx, zz := px[0], px[1], pz[0], pz[1]
			for p := range ca {
				qa, qb := &ca[p], &cb[p]
				xx += qa.dx*qb.db.x[0] + qa.dz*qb.db.x[3]
				xz += qa.dx*qb.db.z[0] + qa.dz*qb.db.z[3]
				zx += qa.dz*qb.db.x[1] + qa.dx*qb.db.x[3]
				zz += qa.dz*qb.db.z[1] + qa.dx*qb.db.z[3]
			}
			px[0], px[1], pz[0], pz[1] = xx, xz, zx, zz
		}
	}
}

// smallPairsAxisymmetric is pairs of SmallStrain with the hoop row of B,
// N/x at the x dofs; kept apart so that the plane conditions' inner loop
// has no branch.
func smallPairsAxisymmetric(k *kernelWork, n int, ke []float64) {
	nd := 2 * n
	for a := 0; a < n; a++ {
		ca := k.small[a][:k.kept]
		rx, rz := ke[2*a*nd:(2*a+1)*nd], ke[(2*a+1)*nd:(2*a+2)*nd]
		xx, xz, zz := rx[2*a], rx[2*a+1], rz[2*a+1]
		for p := range ca {
			q := &ca[p]
			xx += q.dx*q.db.x[0] + q.dz*q.db.x[3] + q.r*q.db.x[2]
			xz += q.dx*q.db.z[0] + q.dz*q.db.z[3] + q.r*q.db.z[2]
			zz += q.dz*q.db.z[1] + q.dx*q.db.z[3]
		}
		rx[2*a], rx[2*a+1], rz[2*a+1] = xx, xz, zz
		for b := a + 1; b < n; b++ {
			cb := k.small[b][:len(ca)]
			px, pz := rx[2*b:2*b+2], rz[2*b:2*b+2]
			xx, xz, zx, zz := px[0], px[1], pz[0], pz[1]
			for p := range ca {
				qa, qb := &ca[p], &cb[p]
				xx += qa.dx*qb.db.x[0] + qa.dz*qb.db.x[3] + qa.r*qb.db.x[2]
				xz += qa.dx*qb.db.z[0] + qa.dz*qb.db.z[3] + qa.r*qb.db.z[2]
				zx += qa.dz*qb.db.x[1] + qa.dx*qb.db.x[3]
				zz += qa.dz*qb.db.z[1] + qa.dx*qb.db.z[3]
			}
			px[0], px[1], pz[0], pz[1] = xx, xz, zx, zz
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
