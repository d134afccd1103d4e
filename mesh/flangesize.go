package mesh

// FlangeSize is the size of a flange-segment mesh, counted from its plan
// without building it. The counts are float64 so that a mesh far too
// large to build is still counted.
type FlangeSize struct {
	Elements float64
	Nodes    float64
}

// PlanSize counts the elements and nodes of the mesh BuildFlangeSegment
// would build of g, without building it. g must satisfy Validate's rules
// except the bound on the number of elements, so that a caller can report
// a mesh beyond it.
func (g FlangeSegment) PlanSize() (FlangeSize, error) {
	c := &checker{bad: make(map[string]bool)}
	g.checkLengths(c)
	g.checkBolt(c)
	g.checkFlange(c)
	g.checkMesh(c)
	if len(c.errs) > 0 {
		return FlangeSize{}, c.errs
	}
	return planSize(newSection(g).plan(FlangeMaterials{}), g.Kind), nil
}

// planSize counts the elements and nodes of a plan's mesh: each block's
// interior nodes, each side's inner nodes once however many blocks share
// it, and each corner vertex once.
func planSize(p Plan, kind Kind) FlangeSize {
	var s FlangeSize
	sides := map[[2]int]bool{}
	corners := map[int]bool{}
	perSide := func(n float64) float64 { // inner nodes of a side of n elements
		if kind == Quad8 {
			return 2*n - 1
		}
		return n - 1
	}
	for _, b := range p.Blocks {
		nx, ny := float64(b.Divisions[0]), float64(b.Divisions[1])
		s.Elements += nx * ny
		if kind == Quad8 {
			s.Nodes += (2*nx-1)*(2*ny-1) - nx*ny // inside: the grid without the centres of the elements
		} else {
			s.Nodes += (nx - 1) * (ny - 1)
		}
		for i := range 4 {
			a, c := b.Corners[i], b.Corners[(i+1)%4]
			corners[a] = true
			key := [2]int{min(a, c), max(a, c)}
			if !sides[key] {
				sides[key] = true
				s.Nodes += perSide(float64(b.Divisions[i%2]))
			}
		}
	}
	s.Nodes += float64(len(corners))
	return s
}
