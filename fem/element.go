package fem

import (
	"fmt"
	"math"

	"flangeseg/material"
)

// scratch is per-goroutine working memory for element routines, so that
// assembly does not allocate per element.
type scratch struct {
	n, dxi, deta, dndx, dndz [8]float64
	ue, fe                   [maxElementDofs]float64
	ke                       [maxElementDofs * maxElementDofs]float64
	geo                      PointGeometry
	jac                      [4]float64 // J11, J12, J21, J22 of the last point
	kernel                   kernelWork
}

func newScratch() *scratch { return &scratch{} }

// pointGeometry evaluates the element's geometry at a natural point.
func (m *Model) pointGeometry(e int, p naturalPoint, s *scratch) (*PointGeometry, error) {
	el := &m.mesh.Elements[e]
	nen := len(el.Nodes)
	shapeFunctions(m.mesh.Kind)(p.xi, p.eta, s.n[:nen], s.dxi[:nen], s.deta[:nen])
	var j11, j12, j21, j22, x, z float64 // J = ∂(x,z)/∂(ξ,η)
	for a, node := range el.Nodes {
		q := m.mesh.Nodes[node]
		j11 += s.dxi[a] * q.X
		j12 += s.dxi[a] * q.Z
		j21 += s.deta[a] * q.X
		j22 += s.deta[a] * q.Z
		x += s.n[a] * q.X
		z += s.n[a] * q.Z
	}
	det := j11*j22 - j12*j21
	if !(det > 0) {
		return nil, fmt.Errorf("fem: element %d (region %q): Jacobian determinant %.3g at ξ = %.3f, η = %.3f: element inverted or degenerate",
			e, m.mesh.Regions[el.Region].Name, det, p.xi, p.eta)
	}
	s.jac = [4]float64{j11, j12, j21, j22}
	for a := 0; a < nen; a++ {
		s.dndx[a] = (j22*s.dxi[a] - j12*s.deta[a]) / det
		s.dndz[a] = (-j21*s.dxi[a] + j11*s.deta[a]) / det
	}
	w := p.w * det
	if m.opt.Condition == material.Axisymmetric {
		w *= 2 * math.Pi * x
	} else {
		w *= m.mesh.Regions[el.Region].Thickness
	}
	g := &s.geo
	g.N, g.DNdx, g.DNdz = s.n[:nen], s.dndx[:nen], s.dndz[:nen]
	g.X, g.Z, g.Weight = x, z, w
	return g, nil
}

// geometryLimit bounds the values the geometry cache may hold.
const geometryLimit = 1 << 24

// cacheGeometry keeps every integration point's geometry, which depends
// only on the reference mesh: a Newton run evaluates the same points
// hundreds of times. Nothing is kept if the cache would be too large or an
// element is degenerate (its error then comes from pointGeometry).
func (m *Model) cacheGeometry() {
	if m.geo != nil {
		return
	}
	nen := 0
	for _, el := range m.mesh.Elements {
		nen = max(nen, len(el.Nodes))
	}
	if len(m.mesh.Elements)*len(m.rule)*(3*nen+3) > geometryLimit {
		return
	}
	geo := make([][]PointGeometry, len(m.mesh.Elements))
	s := newScratch()
	for e, el := range m.mesh.Elements {
		n := len(el.Nodes)
		geo[e] = make([]PointGeometry, len(m.rule))
		values := make([]float64, 3*n*len(m.rule))
		for ip, p := range m.rule {
			g, err := m.pointGeometry(e, p, s)
			if err != nil {
				return
			}
			v := values[3*n*ip : 3*n*(ip+1)]
			copy(v, g.N)
			copy(v[n:], g.DNdx)
			copy(v[2*n:], g.DNdz)
			geo[e][ip] = PointGeometry{N: v[:n:n], DNdx: v[n : 2*n : 2*n], DNdz: v[2*n:], X: g.X, Z: g.Z, Weight: g.Weight}
		}
	}
	m.geo = geo
}

// geometryAt is the geometry of integration point ip (natural point p) of
// element e: cached, or evaluated into s. Callers only read it.
func (m *Model) geometryAt(e, ip int, p naturalPoint, s *scratch) (*PointGeometry, error) {
	if m.geo != nil {
		return &m.geo[e][ip], nil
	}
	return m.pointGeometry(e, p, s)
}

// PointResult is the state of one integration point after a solve.
type PointResult struct {
	X, Z   float64
	Strain material.Vec4
	Stress material.Vec4
	// History is the material state at the point (nil for elastic laws);
	// it aliases the model's storage and changes with the next evaluation.
	History []float64
}

// PointError is a material law that gave no answer at an integration
// point: a strain it cannot take (not finite, from an inverted element) or
// a step too large for its return mapping. In an equilibrium iteration it
// means the step was too large, and the solver reports it as not
// converged so that the step is cut.
type PointError struct {
	Element, Point int
	Err            error
}

func (e *PointError) Error() string {
	return fmt.Sprintf("fem: element %d, point %d: %v", e.Element, e.Point, e.Err)
}

func (e *PointError) Unwrap() error { return e.Err }

// elementResponse computes the internal force fe and, if ke != nil, the
// tangent of element e at element displacements ue. If pts is not nil it
// receives one PointResult per integration point. It allocates nothing:
// its working memory is s, the calling worker's. The points keep their
// parts of the tangent in s, summed over the points node pair by node
// pair into the upper triangle of ke at the end (Kinematics.pairs), and
// the triangle is mirrored.
func (m *Model) elementResponse(e int, ue, fe, ke []float64, pts []PointResult, s *scratch) error {
	for i := range fe {
		fe[i] = 0
	}
	for i := range ke {
		ke[i] = 0
	}
	if m.opt.Formulation == IncompatibleModes {
		return m.incompatibleResponse(e, ue, fe, ke, pts, s)
	}
	region := m.mesh.Elements[e].Region
	law := m.laws[region]
	eigen := m.eigen[region]
	spring := m.foundation[region]
	k := &s.kernel
	k.kept = 0
	for ip, p := range m.rule {
		g, err := m.geometryAt(e, ip, p, s)
		if err != nil {
			return err
		}
		strain := m.kin.strain(m.opt.Condition, g, ue, k)
		elastic := strain
		for c := range elastic {
			elastic[c] -= eigen[c]
		}
		committed, trial := m.history.point(e, ip)
		// The law writes the stress and the tangent into s: a local passed
		// to the interface method by address would be allocated at every
		// point.
		if err := law.Respond(m.opt.Condition, elastic, committed, trial, &k.stress, &k.d); err != nil {
			return &PointError{Element: e, Point: ip, Err: err}
		}
		m.kin.point(m.opt.Condition, g, k, fe, ke != nil)
		if spring != [2]float64{} {
			addFoundation(g, spring, ue, fe, ke)
		}
		if pts != nil {
			pts[ip] = PointResult{X: g.X, Z: g.Z, Strain: strain, Stress: k.stress, History: trial}
		}
	}
	if ke != nil {
		m.kin.pairs(m.opt.Condition, k, len(ue)/2, ke)
		mirrorUpper(ke, len(ue))
	}
	return nil
}

// edgeLoad is a distributed load on an edge set: a pressure normal to the
// edge (positive pressing into the body) plus a traction in x and z, both
// per unit area (MPa).
type edgeLoad struct {
	set      string
	pressure float64
	tx, tz   float64
}

// AddPressure puts a uniform pressure p (MPa, positive pressing on the
// body) on an edge set.
func (m *Model) AddPressure(set string, p float64) error {
	if _, ok := m.mesh.EdgeSets[set]; !ok {
		return fmt.Errorf("fem: edge set %q does not exist", set)
	}
	m.edges = append(m.edges, edgeLoad{set: set, pressure: p})
	return nil
}

// AddTraction puts a uniform traction (tx, tz) in MPa on an edge set.
func (m *Model) AddTraction(set string, tx, tz float64) error {
	if _, ok := m.mesh.EdgeSets[set]; !ok {
		return fmt.Errorf("fem: edge set %q does not exist", set)
	}
	m.edges = append(m.edges, edgeLoad{set: set, tx: tx, tz: tz})
	return nil
}

// edgeShape evaluates the shape functions of an element side with 2 nodes
// (ends) or 3 nodes (ends, then midside) at s ∈ [−1, 1].
func edgeShape(n int, s float64, nv, dv []float64) {
	if n == 2 {
		nv[0], nv[1] = (1-s)/2, (1+s)/2
		dv[0], dv[1] = -0.5, 0.5
		return
	}
	nv[0], nv[1], nv[2] = s*(s-1)/2, s*(s+1)/2, 1-s*s
	dv[0], dv[1], dv[2] = s-0.5, s+0.5, -2*s
}

// addEdgeLoads adds the consistent nodal forces of the distributed loads
// to f (all dofs).
func (m *Model) addEdgeLoads(f []float64) error {
	pts, wts, _ := gauss1D(3)
	var nv, dv [3]float64
	for _, load := range m.edges {
		for _, ed := range m.mesh.EdgeSets[load.set] {
			k := len(ed.Nodes)
			if k != 2 && k != 3 {
				return fmt.Errorf("fem: edge set %q: side with %d nodes", load.set, k)
			}
			region := m.mesh.Regions[m.mesh.Elements[ed.Element].Region]
			for q, s := range pts {
				edgeShape(k, s, nv[:k], dv[:k])
				var x, dxds, dzds float64
				for a, node := range ed.Nodes {
					p := m.mesh.Nodes[node]
					x += nv[a] * p.X
					dxds += dv[a] * p.X
					dzds += dv[a] * p.Z
				}
				w := wts[q]
				if m.opt.Condition == material.Axisymmetric {
					w *= 2 * math.Pi * x
				} else {
					w *= region.Thickness
				}
				// The body lies left of the side, so (dz/ds, −dx/ds) is the
				// outward normal scaled by the length element.
				qx := -load.pressure*dzds + load.tx*math.Hypot(dxds, dzds)
				qz := load.pressure*dxds + load.tz*math.Hypot(dxds, dzds)
				for a, node := range ed.Nodes {
					f[2*node] += w * nv[a] * qx
					f[2*node+1] += w * nv[a] * qz
				}
			}
		}
	}
	return nil
}

// addFoundation adds an elastic foundation of stiffness k = (kx, kz) per
// unit volume (MPa/mm) at one point: f_a = k·N_a·u, the ring-spring
// stand-in for hoop stiffness (x), or a weak support of a body that is
// held by contact alone. The stiffness goes to the upper triangle of ke.
func addFoundation(g *PointGeometry, k [2]float64, ue, fe, ke []float64) {
	var u [2]float64
	for a, n := range g.N {
		u[0] += n * ue[2*a]
		u[1] += n * ue[2*a+1]
	}
	nd := len(ue)
	for d := 0; d < 2; d++ {
		if k[d] == 0 {
			continue
		}
		wk := g.Weight * k[d]
		for a, na := range g.N {
			fe[2*a+d] += wk * na * u[d]
			if ke == nil {
				continue
			}
			row := ke[(2*a+d)*nd : (2*a+d+1)*nd]
			wkn := wk * na
			for b := a; b < len(g.N); b++ {
				row[2*b+d] += wkn * g.N[b]
			}
		}
	}
}

// SetEigenstrain imposes a stress-free strain (xx, zz, yy, xz) in every
// element of a region: the mechanical strain the law sees is the total
// strain minus this. A negative zz shortens a bolt slice to preload it.
func (m *Model) SetEigenstrain(region string, strain material.Vec4) error {
	r, ok := m.mesh.RegionIndex(region)
	if !ok {
		return fmt.Errorf("fem: region %q does not exist", region)
	}
	if m.opt.Formulation == IncompatibleModes {
		return fmt.Errorf("fem: region %q: eigenstrains need the standard formulation", region)
	}
	m.eigen[r] = strain
	return nil
}

// Eigenstrain returns the eigenstrain of a region (zero if none or unknown).
func (m *Model) Eigenstrain(region string) material.Vec4 {
	r, ok := m.mesh.RegionIndex(region)
	if !ok {
		return material.Vec4{}
	}
	return m.eigen[r]
}

// SetFoundation puts an elastic foundation on a region, kx and kz per unit
// volume (MPa/mm); for ring springs along a shell of thickness t the
// stiffness E·t/R² per unit wall area is kx = E/R² spread over the
// thickness.
func (m *Model) SetFoundation(region string, kx, kz float64) error {
	r, ok := m.mesh.RegionIndex(region)
	if !ok {
		return fmt.Errorf("fem: region %q does not exist", region)
	}
	if !(kx >= 0 && kz >= 0) {
		return fmt.Errorf("fem: region %q: foundation stiffness (%g, %g): must be >= 0", region, kx, kz)
	}
	if m.opt.Formulation == IncompatibleModes {
		return fmt.Errorf("fem: region %q: foundations need the standard formulation", region)
	}
	m.foundation[r] = [2]float64{kx, kz}
	m.stamp++
	return nil
}
