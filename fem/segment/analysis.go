package segment

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/material"
	"flangeseg/mesh"
	"flangeseg/post/handcalc"
)

// segment is one bolt segment turned into a finite-element model.
type segment struct {
	spec    *modelfile.Spec
	der     modelfile.Derived
	mesh    *mesh.Mesh
	model   *fem.Model
	edge    fem.RigidEdge
	faces   *contact.Pair // upper flange face on the lower one
	head    *contact.Pair // head washer on the upper flange
	nut     *contact.Pair // nut washer on the lower flange
	spring  *gapSpring    // contact.gap_spring between the flanges, nil without (gapspring.go)
	zones   []zoneRange   // contact zones of the face (or the whole face)
	cut     boltCut       // the bolt section at the contact plane
	under   boltCut       // the bolt section under the head
	slice   float64       // length of the preload slice, mm
	hand    handcalc.Results
	shellE  float64
	penalty float64
	tie     fem.Dof // the bolt's lateral tie at the contact plane
	laws    map[string]material.Law
	// stickWashers: the washers are held sticking, not only pressed,
	// while the bolt is tightened (see preload).
	stickWashers bool
	// searchingClosing: this model only looks for the bolt force the
	// closing of an initial gap took (findClosing).
	searchingClosing bool
}

// nearestOnSet is the node of a node set nearest to x (−1 if none).
func nearestOnSet(m *mesh.Mesh, set string, x float64) int {
	best, at := math.Inf(1), -1
	for _, n := range m.NodeSets[set] {
		if d := math.Abs(m.Nodes[n].X - x); d < best {
			best, at = d, n
		}
	}
	return at
}

type zoneRange struct {
	name   string
	x0, x1 float64
}

type boltCut struct {
	elems, nodes []int
}

// geometry maps the model file to the mesher's description.
func geometry(s *modelfile.Spec, d modelfile.Derived) mesh.FlangeSegment {
	kind := mesh.Quad8
	if s.Mesh.Element == "quad4" {
		kind = mesh.Quad4
	}
	var lines []float64
	for _, z := range s.Contact.Zones {
		lines = append(lines, z.From, z.To)
	}
	face0, face1 := -s.Flange.A, s.Flange.B+s.Shell.Thickness/2
	var inside []float64
	for _, x := range lines {
		if x > face0+1e-9 && x < face1-1e-9 && !slices.Contains(inside, x) {
			inside = append(inside, x)
		}
	}
	slices.Sort(inside)
	return mesh.FlangeSegment{
		ShellThickness:  s.Shell.Thickness,
		ShellLength:     s.Shell.Length,
		FlangeThickness: s.Flange.Thickness,
		A:               s.Flange.A,
		B:               s.Flange.B,
		SegmentWidth:    d.SegmentWidth,
		NeckRadius:      s.Flange.NeckRadius,
		BoltDiameter:    d.D,
		HoleDiameter:    s.Bolt.Hole,
		WasherOuter:     s.Bolt.WasherOuter,
		WasherThickness: s.Bolt.WasherThickness,
		HeadHeight:      s.Bolt.HeadHeight,
		NutHeight:       s.Bolt.NutHeight,
		StressArea:      d.StressArea,
		FullThread:      s.Bolt.Thread == "full",
		ThreadInClamp:   d.ThreadInClamp,
		FaceLines:       inside,
		ElementSize:     s.Mesh.Size,
		Refine:          s.Mesh.Refine,
		Kind:            kind,
	}
}

// buildSegment meshes the joint and sets up supports, ring springs,
// contact pairs and the loaded edge.
func buildSegment(s *modelfile.Spec, d modelfile.Derived) (*segment, error) {
	g := &segment{spec: s, der: d}
	msh, err := mesh.BuildFlangeSegment(geometry(s, d), partMaterials(s))
	if err != nil {
		return nil, fmt.Errorf("mesh: %w", err)
	}
	if err := msh.Check(); err != nil {
		return nil, fmt.Errorf("mesh: %w", err)
	}
	g.mesh = msh
	laws, err := lawsOf(s)
	if err != nil {
		return nil, err
	}
	// The preload slice takes the bolt's elastic law: its shortening is a
	// device, not a strain of the steel, and a plastic slice would let the
	// shortening flow away instead of tensioning the bolt.
	for i, r := range msh.Regions {
		if r.Name == "bolt_preload" {
			info, err := s.Material(s.BoltMaterial(), 0)
			if err != nil {
				return nil, err
			}
			msh.Regions[i].Material = "bolt preload slice"
			laws[msh.Regions[i].Material] = material.Elastic{E: info.E, Nu: info.Nu}
		}
	}
	shell, _ := s.Material(s.Shell.Material, s.Shell.Thickness)
	g.shellE = shell.E
	cond := material.PlaneStress
	if s.Analysis.Plane == "strain" {
		cond = material.PlaneStrain
	}
	g.laws = laws
	opt := fem.Options{Condition: cond}
	if s.Analysis.LargeDeformation {
		opt.Kinematics = fem.FiniteStrain{}
	}
	m, err := fem.NewModel(msh, laws, opt)
	if err != nil {
		return nil, err
	}
	g.model = m
	if err := g.supports(); err != nil {
		return nil, err
	}
	if err := g.contacts(); err != nil {
		return nil, err
	}
	if g.spring, err = g.newGapSpring(s.Contact.GapSpring); err != nil {
		return nil, err
	}
	g.cut, err = g.section("bolt_interface", func(z, zc float64) bool { return z > zc })
	if err != nil {
		return nil, err
	}
	g.under, err = g.section("bolt_under_head", func(z, zc float64) bool { return z > zc })
	if err != nil {
		return nil, err
	}
	g.slice = g.regionHeight("bolt_preload")
	if !(g.slice > 0) {
		return nil, fmt.Errorf("mesh: the preload slice of the bolt is missing")
	}
	if !(d.ShellYield > 0 && d.FlangeYield > 0) {
		// Every run reports the hand methods beside the FE; they need f_y.
		return nil, fmt.Errorf("hand methods: shell f_y = %s MPa, flange f_y = %s MPa: both must be > 0; a [materials] entry without a curve has none — give it a curve, or use a built-in grade with analysis.materials = %q for a linear elastic analysis",
			modelfile.FormatNumber(d.ShellYield), modelfile.FormatNumber(d.FlangeYield), modelfile.ElasticOnly)
	}
	if g.hand, err = handcalc.Analyze(s.HandJoint(d), handcalc.DefaultParams()); err != nil {
		return nil, fmt.Errorf("hand methods: %w", err)
	}
	return g, nil
}

func (g *segment) supports() error {
	m, s := g.model, g.spec
	for _, dir := range []fem.Direction{fem.X, fem.Z} {
		if err := m.FixSet("lower_end", dir, 0); err != nil {
			return err
		}
	}
	top := s.Flange.Thickness + s.Shell.Length
	edge, err := m.AddRigidEdge("upper_end", mesh.Point{X: s.Flange.B, Z: top},
		fem.RigidEdgeOptions{FixLateral: true, FixRotation: s.Load.EndRotation == "fixed"})
	if err != nil {
		return err
	}
	if err := m.Fix(edge.Axial, 0); err != nil {
		return err
	}
	g.edge = edge
	for _, region := range []string{"upper_shell", "lower_shell"} {
		if err := m.SetFoundation(region, g.ringStiffness(), 0); err != nil {
			return err
		}
	}
	// Friction at head and nut centres the bolt laterally; while washers
	// slide that holds it no longer, so its axis at the contact plane
	// follows the lower flange in x. The force through the tie is the
	// lateral shear the bolt would otherwise take from friction.
	axis := nearestOnSet(g.mesh, "bolt_interface", 0)
	flange := nearestOnSet(g.mesh, "lower_face", 0)
	if axis < 0 || flange < 0 {
		return fmt.Errorf("mesh: bolt axis or flange face node at x = 0 missing")
	}
	if err := m.Tie(m.NodeDof(axis, fem.X), m.NodeDof(flange, fem.X)); err != nil {
		return err
	}
	g.tie = m.NodeDof(axis, fem.X)
	// In z and in rotation only the washers hold the bolt. A Newton iterate
	// may lift them off; a very weak support keeps the tangent regular.
	weak := g.weakSupport()
	for _, r := range g.mesh.Regions {
		if strings.HasPrefix(r.Name, "bolt_") || r.Name == "nut" || strings.HasSuffix(r.Name, "_washer") {
			if err := m.SetFoundation(r.Name, weak, weak); err != nil {
				return err
			}
		}
	}
	return nil
}

// weakSupport is a support per unit volume so weak that it never matters
// to the result (1e-9·E/d², some 0.05 N per mm of rigid bolt motion, far
// below the 1e-6 of the segment force that equilibrium is checked to) but
// keeps the tangent regular where a Newton iterate lifts a part off all
// its contacts.
func (g *segment) weakSupport() float64 { return 1e-9 * g.shellE / (g.der.D * g.der.D) }

// ringStiffness is the ring springs' stiffness per unit volume of the
// wall, E/R² (E·t/R² per unit wall area), or zero without them.
func (g *segment) ringStiffness() float64 {
	if !g.spec.Analysis.RingSprings {
		return 0
	}
	r := g.spec.Tower.Diameter / 2
	return g.shellE / (r * r)
}

// faceGap is the initial gap between the flange faces at x: recesses
// outside the defined contact zones, the taper and a parallel gap.
func (g *segment) faceGap(x float64) float64 {
	c := g.spec.Contact
	gap := c.ParallelGap
	if len(c.Zones) > 0 {
		in := false
		for _, z := range c.Zones {
			in = in || (x >= z.From-1e-9 && x <= z.To+1e-9)
		}
		if !in {
			depth := c.Recess
			if c.RecessOn == "both" {
				depth *= 2
			}
			gap += depth
		}
	}
	tilt := 2 * math.Tan(math.Abs(c.Taper)*math.Pi/180)
	switch {
	case c.Taper > 0:
		gap += tilt * (g.spec.Flange.B + g.spec.Shell.Thickness/2 - x)
	case c.Taper < 0:
		gap += tilt * (x + g.spec.Flange.A)
	}
	return gap
}

func (g *segment) contacts() error {
	s, d := g.spec, g.der
	// A penalty well above the stiffness of the finest elements; the
	// augmented-Lagrangian updates then bring the penetration below 1 µm.
	g.penalty = 10 * g.shellE / (s.Mesh.Size * s.Mesh.Refine)
	// Small-sliding contact, also under large deformation: gap and slip
	// along the reference geometry, exact tangent. The faces of a flange
	// pair slide by fractions of a millimetre and turn against each other
	// by a few degrees at most, where measuring along the reference
	// normal errs by O(θ²); the finite-sliding measure (current normals,
	// frozen-geometry tangent) stalled large-deformation runs and left
	// kN of force on the released edge. The sliding friction coupling
	// goes beside the symmetric tangent, for the solver's GMRES steps.
	set := contact.Settings{Penalty: g.penalty, Friction: s.Contact.Friction, Tolerance: 1e-3,
		SymmetricTangent: true, SmallSliding: true, NoSlidingStiffness: true}
	stripWidth := func(x, _ float64) float64 {
		if math.Abs(x) < s.Bolt.Hole/2 {
			return d.HoleBandStrip
		}
		return d.FlangeStrip
	}
	bearing := func(x, _ float64) float64 { return d.BearingStrip }
	var err error
	if g.faces, err = fem.NewContactPair("flange faces", g.mesh, "upper_face", "lower_face", set,
		func(x, _ float64) float64 { return g.faceGap(x) }, stripWidth); err != nil {
		return err
	}
	if g.head, err = fem.NewContactPair("head washer", g.mesh, "head_bearing", "upper_top", set, nil, bearing); err != nil {
		return err
	}
	if g.nut, err = fem.NewContactPair("nut washer", g.mesh, "nut_bearing", "lower_bottom", set, nil, bearing); err != nil {
		return err
	}
	face1 := s.Flange.B + s.Shell.Thickness/2
	if len(s.Contact.Zones) == 0 {
		g.zones = []zoneRange{{"face", -s.Flange.A - 1, face1 + 1}}
	}
	for i, z := range s.Contact.Zones {
		g.zones = append(g.zones, zoneRange{fmt.Sprintf("zone%d", i+1), z.From - 1e-9, z.To + 1e-9})
	}
	return nil
}

// section collects a node line across the bolt and the bolt elements on
// one side of it that touch the line.
func (g *segment) section(set string, side func(z, zc float64) bool) (boltCut, error) {
	nodes, ok := g.mesh.NodeSets[set]
	if !ok || len(nodes) == 0 {
		return boltCut{}, fmt.Errorf("mesh: node set %q is missing", set)
	}
	on := map[int]bool{}
	zc := g.mesh.Nodes[nodes[0]].Z
	for _, n := range nodes {
		on[n] = true
	}
	var elems []int
	for e, el := range g.mesh.Elements {
		name := g.mesh.Regions[el.Region].Name
		if !strings.HasPrefix(name, "bolt_") {
			continue
		}
		touches, z := false, 0.0
		for _, n := range el.Nodes {
			touches = touches || on[n]
			z += g.mesh.Nodes[n].Z / float64(len(el.Nodes))
		}
		if touches && side(z, zc) {
			elems = append(elems, e)
		}
	}
	if len(elems) == 0 {
		return boltCut{}, fmt.Errorf("mesh: no bolt elements above the node line %q", set)
	}
	return boltCut{elems: elems, nodes: nodes}, nil
}

func (g *segment) regionHeight(name string) float64 {
	r, ok := g.mesh.RegionIndex(name)
	if !ok {
		return 0
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, el := range g.mesh.Elements {
		if el.Region != r {
			continue
		}
		for _, n := range el.Nodes {
			lo = math.Min(lo, g.mesh.Nodes[n].Z)
			hi = math.Max(hi, g.mesh.Nodes[n].Z)
		}
	}
	return hi - lo
}

func (g *segment) pairs() []fem.ContactPair {
	ps := []fem.ContactPair{g.faces, g.head, g.nut}
	if g.spring != nil {
		ps = append(ps, g.spring)
	}
	return ps
}
