package fem

import (
	"fmt"
	"math"
	"slices"

	"flangeseg/material"
	"flangeseg/mesh"
)

// Direction is a displacement direction of the section.
type Direction int

const (
	X Direction = iota // radial
	Z                  // axial
)

func (d Direction) String() string {
	if d == X {
		return "x"
	}
	return "z"
}

// Dof identifies a degree of freedom: node dofs first (2·node + direction),
// then the master dofs of rigid edges.
type Dof int

// Formulation selects the element formulation.
type Formulation int

const (
	// Standard is the isoparametric displacement element.
	Standard Formulation = iota
	// IncompatibleModes adds four internal bubble modes to the 4-node
	// quadrilateral (Wilson et al. 1973; with the patch-test correction of
	// Taylor, Beresford & Wilson 1976), which removes its shear locking in
	// bending. Linear elastic laws only; condensed at element level.
	IncompatibleModes
)

// Options configure a Model.
type Options struct {
	Condition   material.Condition
	GaussPoints int         // per direction; 0 selects 3 for Quad8 and 2 for Quad4
	Formulation Formulation // Standard unless IncompatibleModes is asked for (Quad4 only)
	Kinematics  Kinematics  // nil selects SmallStrain
}

// term is one part of a dependent dof: value = Σ coef · value(master).
type term struct {
	master Dof
	coef   float64
}

// Model is a meshed body with its laws, supports, constraints and loads.
// Build it with NewModel, then Fix/AddRigidEdge/Add* before the first solve.
type Model struct {
	mesh  *mesh.Mesh
	opt   Options
	kin   Kinematics
	laws  []material.Law  // per region
	eigen []material.Vec4 // per region: stress-free strain (bolt preload)
	// foundation per region: elastic support in x per unit volume (ring springs)
	foundation [][2]float64
	rule       []naturalPoint
	geo        [][]PointGeometry // per element and rule point; nil until cacheGeometry
	nDof       int               // node dofs plus master dofs
	fixed      []bool
	value      []float64 // prescribed value of fixed dofs
	depends    [][]term  // non-nil for a node dof tied to rigid-edge masters
	force      []float64 // nodal external forces, all dofs
	edges      []edgeLoad
	edgeSet    []string // rigid-edge names, for messages
	eq         []int    // dof → equation, −1 if fixed or dependent; nil until numbered
	stamp      int      // changes whenever element responses may change (foundations)
	nEq        int
	history    history
}

// history is the material state of every integration point: committed
// at the last converged state, trial at the last evaluation. Element e's
// points hold committed[offset[e]:offset[e+1]], size[e] values a point.
type history struct {
	offset, size     []int
	committed, trial []float64
}

// newHistory lays out the state of laws that keep one (none for elastic).
func newHistory(m *mesh.Mesh, laws []material.Law, points int) history {
	h := history{offset: make([]int, len(m.Elements)+1), size: make([]int, len(m.Elements))}
	for e, el := range m.Elements {
		h.size[e] = laws[el.Region].StateSize()
		h.offset[e+1] = h.offset[e] + points*h.size[e]
	}
	n := h.offset[len(m.Elements)]
	h.committed, h.trial = make([]float64, n), make([]float64, n)
	return h
}

// point returns the committed and trial state of point ip of element e
// (nil for a law without state).
func (h *history) point(e, ip int) (committed, trial []float64) {
	if h.size[e] == 0 {
		return nil, nil
	}
	a := h.offset[e] + ip*h.size[e]
	return h.committed[a : a+h.size[e]], h.trial[a : a+h.size[e]]
}

// CommitHistory accepts the material state of the last evaluation as
// converged (the Solver does this in Commit).
func (m *Model) CommitHistory() { copy(m.history.committed, m.history.trial) }

// HasHistory tells whether any material law keeps a state, so that the
// response depends on the path and increments must stay small.
func (m *Model) HasHistory() bool { return len(m.history.trial) > 0 }

// NewModel checks the mesh against the laws (one for every region's
// material name) and the options.
func NewModel(m *mesh.Mesh, laws map[string]material.Law, opt Options) (*Model, error) {
	if m == nil || len(m.Elements) == 0 {
		return nil, fmt.Errorf("fem: model has no elements")
	}
	md := &Model{mesh: m, opt: opt, kin: opt.Kinematics}
	if md.kin == nil {
		md.kin = SmallStrain{}
	}
	for _, r := range m.Regions {
		law, ok := laws[r.Material]
		if !ok {
			return nil, fmt.Errorf("fem: region %q: material %q has no law", r.Name, r.Material)
		}
		if opt.Condition != material.Axisymmetric && !(r.Thickness > 0) {
			return nil, fmt.Errorf("fem: region %q: thickness = %g: must be positive in %v", r.Name, r.Thickness, opt.Condition)
		}
		md.laws = append(md.laws, law)
	}
	n := opt.GaussPoints
	if n == 0 {
		n = 2
		if m.Kind == mesh.Quad8 {
			n = 3
		}
	}
	rule, err := gauss2D(n)
	if err != nil {
		return nil, err
	}
	md.rule = rule
	if opt.Formulation == IncompatibleModes {
		if m.Kind != mesh.Quad4 {
			return nil, fmt.Errorf("fem: incompatible modes are for 4-node quadrilaterals, mesh has %d-node elements", m.Kind)
		}
		for i, law := range md.laws {
			if _, ok := law.(material.Elastic); !ok {
				return nil, fmt.Errorf("fem: region %q: incompatible modes need a linear elastic law", m.Regions[i].Name)
			}
		}
	}
	if opt.Condition == material.Axisymmetric {
		for i, p := range m.Nodes {
			if p.X < 0 {
				return nil, fmt.Errorf("fem: node %d at x = %g: an axisymmetric model needs x >= 0 (x is the radius)", i, p.X)
			}
		}
	}
	md.eigen = make([]material.Vec4, len(m.Regions))
	md.foundation = make([][2]float64, len(m.Regions))
	md.history = newHistory(m, md.laws, len(rule))
	md.grow(2 * len(m.Nodes))
	return md, nil
}

// Mesh returns the model's mesh.
func (m *Model) Mesh() *mesh.Mesh { return m.mesh }

// Options returns the options the model was built with.
func (m *Model) Options() Options { return m.opt }

// Dofs is the number of degrees of freedom, node and master dofs.
func (m *Model) Dofs() int { return m.nDof }

// Equations is the number of free equations (known after the first solve
// or Number).
func (m *Model) Equations() int { return m.nEq }

func (m *Model) grow(n int) {
	for m.nDof < n {
		m.fixed = append(m.fixed, false)
		m.value = append(m.value, 0)
		m.depends = append(m.depends, nil)
		m.force = append(m.force, 0)
		m.nDof++
	}
	m.eq = nil
}

// NodeDof is the dof of node in direction d.
func (m *Model) NodeDof(node int, d Direction) Dof { return Dof(2*node + int(d)) }

// DescribeDof names a dof in the user's terms: a node and a direction, or a
// rigid edge's master.
func (m *Model) DescribeDof(d Dof) string {
	nn := 2 * len(m.mesh.Nodes)
	if int(d) < nn {
		p := m.mesh.Nodes[int(d)/2]
		return fmt.Sprintf("node %d (x = %.6g, z = %.6g), %v displacement", int(d)/2, p.X, p.Z, Direction(int(d)%2))
	}
	k := int(d) - nn
	what := [3]string{"z translation", "x translation", "rotation"}[k%3]
	return fmt.Sprintf("rigid edge %q, %s", m.edgeSet[k/3], what)
}

// describePlace names a dof as DescribeDof does, with the region of an
// element that holds the node.
func (m *Model) describePlace(d Dof) string {
	desc := m.DescribeDof(d)
	if int(d) >= 2*len(m.mesh.Nodes) {
		return desc
	}
	node := int(d) / 2
	for _, el := range m.mesh.Elements {
		if slices.Contains(el.Nodes, node) {
			return desc + " in " + m.mesh.Regions[el.Region].Name
		}
	}
	return desc
}

func (m *Model) checkDof(d Dof) error {
	if d < 0 || int(d) >= m.nDof {
		return fmt.Errorf("fem: dof %d out of range [0, %d)", d, m.nDof)
	}
	return nil
}

// SetValue changes the prescribed value of a dof that is already fixed,
// keeping the equation numbering (displacement control between increments).
func (m *Model) SetValue(d Dof, value float64) error {
	if err := m.checkDof(d); err != nil {
		return err
	}
	if !m.fixed[d] {
		return fmt.Errorf("fem: %s is not prescribed", m.DescribeDof(d))
	}
	m.value[d] = value
	return nil
}

// Value is the prescribed value of a fixed dof.
func (m *Model) Value(d Dof) float64 { return m.value[d] }

// Fix prescribes the value of a dof (0 for a support).
func (m *Model) Fix(d Dof, value float64) error {
	if err := m.checkDof(d); err != nil {
		return err
	}
	if m.depends[d] != nil {
		return fmt.Errorf("fem: %s: cannot be fixed, it belongs to a rigid edge", m.DescribeDof(d))
	}
	if math.IsNaN(value) || math.IsInf(value, 0) {
		return fmt.Errorf("fem: %s: prescribed value %g is not finite", m.DescribeDof(d), value)
	}
	m.fixed[d], m.value[d] = true, value
	m.eq = nil
	return nil
}

// FixSet prescribes direction d of every node of a node set.
func (m *Model) FixSet(set string, d Direction, value float64) error {
	nodes, ok := m.mesh.NodeSets[set]
	if !ok {
		return fmt.Errorf("fem: node set %q does not exist", set)
	}
	for _, n := range nodes {
		if err := m.Fix(m.NodeDof(n, d), value); err != nil {
			return err
		}
	}
	return nil
}

// AddForce adds an external force (N; N·mm for a rotation master) on a dof.
func (m *Model) AddForce(d Dof, f float64) error {
	if err := m.checkDof(d); err != nil {
		return err
	}
	m.force[d] += f
	return nil
}

// Tie makes dof d follow dof master (u_d = u_master): a lateral tie of a
// bolt that friction centres, for example. d must be free and master must
// not be tied itself.
func (m *Model) Tie(d, master Dof) error {
	if err := m.checkDof(d); err != nil {
		return err
	}
	if err := m.checkDof(master); err != nil {
		return err
	}
	if d == master || m.fixed[d] || m.depends[d] != nil {
		return fmt.Errorf("fem: %s cannot be tied: it is prescribed or tied already", m.DescribeDof(d))
	}
	if m.depends[master] != nil {
		return fmt.Errorf("fem: %s cannot lead a tie: it is tied itself", m.DescribeDof(master))
	}
	for _, ts := range m.depends {
		for _, t := range ts {
			if t.master == d {
				return fmt.Errorf("fem: %s cannot be tied: other dofs follow it", m.DescribeDof(d))
			}
		}
	}
	m.depends[d] = []term{{master, 1}}
	m.eq = nil
	return nil
}

// RigidEdgeOptions say which motions of a rigid edge are free.
type RigidEdgeOptions struct {
	FixLateral  bool // x translation held at zero
	FixRotation bool // rotation held at zero
	// LateralFree leaves the nodes' x displacements untied: the edge is
	// rigid in z and rotation only, so its length may change (Poisson
	// contraction is not held back). The Lateral master is then unused
	// and held at zero.
	LateralFree bool
}

// RigidEdge is a set of nodes that moves as one rigid line, driven by its
// master dofs: translation in z (Axial), in x (Lateral) and a small
// rotation θ about the reference point, counter-clockwise in the x–z view
// (x right, z up): u_x = U − θ(z − z_ref), u_z = W + θ(x − x_ref).
type RigidEdge struct {
	Axial, Lateral, Rotation Dof
}

// AddRigidEdge ties the nodes of a node set to a rigid line about ref.
func (m *Model) AddRigidEdge(set string, ref mesh.Point, opt RigidEdgeOptions) (RigidEdge, error) {
	nodes, ok := m.mesh.NodeSets[set]
	if !ok {
		return RigidEdge{}, fmt.Errorf("fem: node set %q does not exist", set)
	}
	base := m.nDof
	m.grow(base + 3)
	m.edgeSet = append(m.edgeSet, set)
	re := RigidEdge{Axial: Dof(base), Lateral: Dof(base + 1), Rotation: Dof(base + 2)}
	for _, n := range nodes {
		p := m.mesh.Nodes[n]
		dx, dz := m.NodeDof(n, X), m.NodeDof(n, Z)
		tied := []Dof{dx, dz}
		if opt.LateralFree {
			tied = tied[1:]
		}
		for _, d := range tied {
			if m.fixed[d] || m.depends[d] != nil {
				return RigidEdge{}, fmt.Errorf("fem: rigid edge %q: %s is already constrained", set, m.DescribeDof(d))
			}
		}
		if !opt.LateralFree {
			m.depends[dx] = []term{{re.Lateral, 1}, {re.Rotation, -(p.Z - ref.Z)}}
		}
		m.depends[dz] = []term{{re.Axial, 1}, {re.Rotation, p.X - ref.X}}
	}
	if opt.FixLateral || opt.LateralFree {
		m.fixed[re.Lateral] = true
	}
	if opt.FixRotation {
		m.fixed[re.Rotation] = true
	}
	return re, nil
}

// Number assigns equation numbers to the free dofs. Solves call it when the
// constraints have changed.
func (m *Model) Number() {
	m.eq = make([]int, m.nDof)
	m.nEq = 0
	for d := range m.eq {
		if m.fixed[d] || m.depends[d] != nil {
			m.eq[d] = -1
			continue
		}
		m.eq[d] = m.nEq
		m.nEq++
	}
}

// expand fills the dependent dofs of u from their masters.
func (m *Model) expand(u []float64) {
	for d, ts := range m.depends {
		if ts == nil {
			continue
		}
		v := 0.0
		for _, t := range ts {
			v += t.coef * u[t.master]
		}
		u[d] = v
	}
}

// reduce moves forces on dependent dofs to their masters (Tᵀ·f) in place;
// dependent entries become zero.
func (m *Model) reduce(f []float64) {
	for d, ts := range m.depends {
		if ts == nil {
			continue
		}
		for _, t := range ts {
			f[t.master] += t.coef * f[d]
		}
		f[d] = 0
	}
}
