package mesh

import (
	"fmt"
	"math"
	"strings"
)

// FlangeSegment describes the section through one bolt of a bolted L-flange
// joint: the upper flange with its shell stub, the lower one as its mirror
// image in z, and the bolt with washers, head and nut. All lengths are mm.
// The origin is on the bolt axis in the contact plane z = 0, x runs radially
// towards the shell and z up; the free edge of the flange is at x = −a and
// the shell's outer face at x = b + t/2.
type FlangeSegment struct {
	ShellThickness  float64 // t
	ShellLength     float64 // L, modelled wall length above (and below) the flange
	FlangeThickness float64 // t_f
	A               float64 // a: bolt axis → flange free edge
	B               float64 // b: bolt axis → shell mid-surface
	SegmentWidth    float64 // c
	NeckRadius      float64 // r, concave fillet between shell and flange top; 0 = sharp corner
	BoltDiameter    float64 // d
	HoleDiameter    float64 // d_h
	WasherOuter     float64 // d_w
	WasherThickness float64 // t_w
	HeadHeight      float64 // k
	NutHeight       float64 // m
	StressArea      float64 // A_s
	FullThread      bool
	ThreadInClamp   float64   // l_t, threaded length inside the clamp (partial thread only), measured from the nut
	FaceLines       []float64 // extra x positions on the flange faces that must be node lines (contact-zone edges), within (−a, b + t/2)
	ElementSize     float64   // target element size away from refinement, mm
	Refine          float64   // size factor (≤ 1) near the bolt, hole edges, washer edges, zone edges and the corners of the face
	Kind            Kind
}

// FlangeMaterials names the materials of the regions: the shell stubs take
// Shell, the flanges (with their neck) Flange, and all parts of the bolt
// (shank, thread, head, nut and washers) Bolt.
type FlangeMaterials struct{ Shell, Flange, Bolt string }

// Bodies of the flange-segment mesh, the values of Element.Body.
const (
	UpperBody = 0 // upper flange and shell
	LowerBody = 1 // lower flange and shell
	BoltBody  = 2 // bolt, washers, head and nut
)

// maxElements bounds the size of a flange-segment mesh.
const maxElements = 1_000_000

// BuildFlangeSegment meshes the section of g into three bodies that share
// no nodes (Element.Body: UpperBody, LowerBody, BoltBody), so the flange
// faces at z = 0 and the washers on the flanges have coincident nodes of
// different bodies. The lower flange and shell mirror the upper ones, so
// the two faces have the same node positions. Regions carry the strip
// model's out-of-plane thicknesses:
//
//   - upper_shell, lower_shell, upper_flange, lower_flange: c. With a neck
//     fillet the whole neck up to where the fillet ends (z = t_f + r)
//     belongs to the flange regions, so a shell region starts there; a
//     region boundary along the shell's inner face would meet the fillet
//     at a zero angle.
//   - upper_flange_hole, lower_flange_hole: the band |x| < d_h/2 through
//     the flange, c − d_h.
//   - bolt_shank, bolt_thread: a strip of width h = (√3/2)·d and thickness
//     A/h (A = πd²/4) or A_s/h. Its area is the bolt's, and h² = 12·I/A of
//     a round bar, so the strip has the bar's bending stiffness too.
//   - bolt_preload: a slice 0.25·d long where a shortening is imposed,
//     centred in the unthreaded shank if that is at least twice as long,
//     else in the thread about z = −t_f/2; its thickness is that of the
//     part it lies in.
//   - bolt_head, head_washer, nut, nut_washer: t_b = π(d_w² − d_h²)/(4(d_w −
//     d_h)), so that the two bearing lines of total length d_w − d_h carry
//     the true bearing area. Head and nut take the same t_b across their
//     whole width, which approximates their stiffness.
//
// Edge sets, each along the boundary with the body on its left, and the
// node sets of the same names: upper_face, lower_face (the flange faces at
// z = 0); upper_top, lower_bottom (the flange's outer surface from the free
// edge to the shell's inner face, the fillet included); upper_end, lower_end
// (the shell ends); upper_shell_inner, upper_shell_outer, lower_shell_inner,
// lower_shell_outer (the faces of the shell regions, which with a neck
// fillet start at ±(t_f + r)); head_bearing, nut_bearing (the washers'
// faces on the flanges); bolt_interface and bolt_under_head, the sections
// across the shank at z = 0 and z = t_f + t_w, as the top sides of the
// elements below them.
//
// Node lines run through the flanges at the face lines, x = ±d_h/2 and
// ±d_w/2, the free edge, the shell's outer face, its inner face (or the
// start of the fillet) and the flange surfaces; in the bolt at x = ±d_w/2,
// ±d_h/2, ±h/2 and the axis, and at z = 0, ±t_f, ±(t_f + t_w), the thread
// end and the preload slice's ends. Lines closer than
// 1e-6 of the model's size merge. Elements are about ElementSize·Refine
// long at the lines and grow away from them by a factor of about 1.4 per
// element (neighbours stay within 1.5 where the lines leave room) up to
// ElementSize; across a narrow column, rows stay within six times its
// width, but not below ElementSize·Refine. Along the shell stubs elements
// grow from the flange to twice ElementSize at the ends. With a neck fillet
// a ring of elements round the fillet joins flange and shell; the flange
// top and the shell face next to it take the fillet's element length.
//
// BuildFlangeSegment validates g first; the error then wraps FieldErrors.
func BuildFlangeSegment(g FlangeSegment, mat FlangeMaterials) (*Mesh, error) {
	if err := g.Validate(); err != nil {
		return nil, fmt.Errorf("mesh: flange segment: %w", err)
	}
	m, err := Build(newSection(g).plan(mat), g.Kind)
	if err != nil {
		return nil, fmt.Errorf("mesh: flange segment: %w", err)
	}
	for i, p := range m.Nodes {
		m.Nodes[i] = Point{p.X + 0, p.Z + 0} // −0 → +0, for tidy output
	}
	return m, nil
}

// section holds the dimensions of a FlangeSegment and the quantities
// derived from them, mm.
type section struct {
	g                    FlangeSegment
	t, tf, a, b, c, r, l float64 // symbols as in FlangeSegment; l is L
	d, dh, dw, tw        float64
	h                    float64 // width of the bolt strip, (√3/2)·d
	x1                   float64 // end of the flat flange top: start of the fillet, or x2
	x2, x3               float64 // shell inner and outer face, b ∓ t/2
	z2                   float64 // start of the shell region, t_f + r
	zu                   float64 // head underside, t_f + t_w
	dl, xr               float64 // with a neck fillet: depth δ of the ring round it, and its outer side x2 + δ
	hf, hmax             float64 // element length at node lines and away from them
	tol                  float64 // node lines closer than this are one
}

func newSection(g FlangeSegment) *section {
	s := &section{
		g: g, t: g.ShellThickness, tf: g.FlangeThickness, a: g.A, b: g.B,
		c: g.SegmentWidth, r: g.NeckRadius, l: g.ShellLength,
		d: g.BoltDiameter, dh: g.HoleDiameter, dw: g.WasherOuter, tw: g.WasherThickness,
	}
	s.h = math.Sqrt(3) / 2 * s.d
	s.x2, s.x3 = s.b-s.t/2, s.b+s.t/2
	s.x1 = s.x2 - s.r
	s.z2 = s.tf + s.r
	s.zu = s.tf + s.tw
	s.tol = 1e-6 * (s.a + s.x3 + 2*(s.tf+s.l) + g.HeadHeight + g.NutHeight)
	s.hmax = g.ElementSize
	s.hf = g.ElementSize * g.Refine
	if s.r > 0 {
		s.dl = min(s.t, s.tf/2, 1.5*s.r)
		s.xr = s.x2 + s.dl
		if s.x3-s.xr <= s.tol {
			s.xr = s.x3
		}
	}
	return s
}

// bearingThickness is t_b, the thickness of head, nut and washers.
func (s *section) bearingThickness() float64 {
	return math.Pi * (s.dw*s.dw - s.dh*s.dh) / (4 * (s.dw - s.dh))
}

// shankArea is A = πd²/4.
func (s *section) shankArea() float64 { return math.Pi * s.d * s.d / 4 }

// plan assembles the three bodies.
func (s *section) plan(mat FlangeMaterials) Plan {
	upper := s.upperHalf()
	lower := mirrored(upper, LowerBody, lowerName)
	var p Plan
	p.append(upper)
	p.append(lower)
	p.append(s.bolt())
	p.Regions = usedRegions(p.Blocks, s.regions(mat))
	return p
}

// regions lists every region the builder may use, in a fixed order.
func (s *section) regions(mat FlangeMaterials) []Region {
	tb := s.bearingThickness()
	shank := s.shankArea() / s.h
	thread := s.g.StressArea / s.h
	preload := thread
	if _, _, inThread := s.preloadSlice(); !inThread {
		preload = shank
	}
	var out []Region
	for _, side := range []string{"upper_", "lower_"} {
		out = append(out,
			Region{side + "shell", s.c, mat.Shell},
			Region{side + "flange", s.c, mat.Flange},
			Region{side + "flange_hole", s.c - s.dh, mat.Flange})
	}
	return append(out,
		Region{"bolt_head", tb, mat.Bolt},
		Region{"head_washer", tb, mat.Bolt},
		Region{"bolt_shank", shank, mat.Bolt},
		Region{"bolt_thread", thread, mat.Bolt},
		Region{"bolt_preload", preload, mat.Bolt},
		Region{"nut", tb, mat.Bolt},
		Region{"nut_washer", tb, mat.Bolt})
}

// usedRegions keeps the regions that some block names.
func usedRegions(blocks []Block, all []Region) []Region {
	used := make(map[string]bool)
	for _, b := range blocks {
		used[b.Region] = true
	}
	var out []Region
	for _, r := range all {
		if used[r.Name] {
			out = append(out, r)
		}
	}
	return out
}

// lowerName is the name of the lower flange's counterpart of an upper
// region or set.
func lowerName(name string) string {
	if name == "upper_top" {
		return "lower_bottom"
	}
	if rest, ok := strings.CutPrefix(name, "upper_"); ok {
		return "lower_" + rest
	}
	return name
}
