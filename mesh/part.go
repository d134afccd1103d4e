package mesh

// part collects the blocks of one body. Blocks name their corners by
// position, and equal positions give one vertex, so blocks of a part join
// wherever their corners meet exactly; the caller computes each shared
// position once.
type part struct {
	plan  Plan
	body  int
	verts map[Point]int
}

func newPart(body int) *part { return &part{body: body, verts: make(map[Point]int)} }

// vertex returns the vertex at p, adding it if it is new.
func (p *part) vertex(q Point) int {
	if v, ok := p.verts[q]; ok {
		return v
	}
	p.plan.Vertices = append(p.plan.Vertices, q)
	p.verts[q] = len(p.plan.Vertices) - 1
	return len(p.plan.Vertices) - 1
}

// quad adds a block with corners c (counter-clockwise), n elements and
// grading g along its two directions.
func (p *part) quad(c [4]Point, n [2]int, g [2]float64, region string, sides [4]string) {
	var v [4]int
	for i, q := range c {
		v[i] = p.vertex(q)
	}
	p.plan.Blocks = append(p.plan.Blocks, Block{
		Corners: v, Divisions: n, Grading: g, Region: region, Sides: sides, Body: p.body,
	})
}

// rect adds the rectangular block spanned by an x run and a z run.
func (p *part) rect(x, z run, region string, sides [4]string) {
	p.quad([4]Point{{x.lo, z.lo}, {x.hi, z.lo}, {x.hi, z.hi}, {x.lo, z.hi}},
		[2]int{x.n, z.n}, [2]float64{x.ratio, z.ratio}, region, sides)
}

// curve shapes the block side between the vertices at from and to.
func (p *part) curve(from, to Point, at func(float64) Point) {
	p.plan.Curves = append(p.plan.Curves, Curve{From: p.vertex(from), To: p.vertex(to), At: at})
}

// append adds the vertices, curves, blocks and vertex sets of q to p,
// renumbering q's vertices after p's. Regions are left to the caller.
func (p *Plan) append(q Plan) {
	off := len(p.Vertices)
	p.Vertices = append(p.Vertices, q.Vertices...)
	for _, c := range q.Curves {
		c.From += off
		c.To += off
		p.Curves = append(p.Curves, c)
	}
	for _, b := range q.Blocks {
		for i := range b.Corners {
			b.Corners[i] += off
		}
		p.Blocks = append(p.Blocks, b)
	}
	for _, s := range q.Sets {
		s.Vertex += off
		p.Sets = append(p.Sets, s)
	}
}

// mirrored returns the mirror image of p in z (z → −z) as body, with
// regions and sets renamed by rename. Mirroring turns blocks clockwise, so
// their corners are taken in the order 3 2 1 0: side 0 becomes the image
// of side 2 and the other way round, and the second direction's grading
// is inverted.
func mirrored(p Plan, body int, rename func(string) string) Plan {
	flip := func(q Point) Point { return Point{q.X, 0 - q.Z} }
	var out Plan
	for _, v := range p.Vertices {
		out.Vertices = append(out.Vertices, flip(v))
	}
	for _, c := range p.Curves {
		at := c.At
		c.At = func(t float64) Point { return flip(at(t)) }
		out.Curves = append(out.Curves, c)
	}
	for _, b := range p.Blocks {
		c, s := b.Corners, b.Sides
		b.Corners = [4]int{c[3], c[2], c[1], c[0]}
		b.Sides = [4]string{rename(s[2]), rename(s[1]), rename(s[0]), rename(s[3])}
		if b.Grading[1] != 0 {
			b.Grading[1] = 1 / b.Grading[1]
		}
		b.Region = rename(b.Region)
		b.Body = body
		out.Blocks = append(out.Blocks, b)
	}
	for _, s := range p.Sets {
		s.Name = rename(s.Name)
		out.Sets = append(out.Sets, s)
	}
	for _, r := range p.Regions {
		r.Name = rename(r.Name)
		out.Regions = append(out.Regions, r)
	}
	return out
}
