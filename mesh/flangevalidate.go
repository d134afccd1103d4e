package mesh

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// FieldError is one broken rule of a FlangeSegment: Field is the Go field
// name (for a program to map onto its own input keys), Value the offending
// value and Rule what it must satisfy, in words.
type FieldError struct {
	Field, Rule string
	Value       float64
}

// Error names the field in plain words, with its value and the rule, as in
// "bolt hole diameter 36 mm: must exceed the bolt diameter 36 mm".
func (e FieldError) Error() string {
	words, unit := fieldWords(e.Field)
	return words + " " + num(e.Value) + unit + ": " + e.Rule
}

// FieldErrors is every broken rule of a FlangeSegment, in field order.
type FieldErrors []FieldError

// Error joins the errors' texts, one per line.
func (es FieldErrors) Error() string {
	s := make([]string, len(es))
	for i, e := range es {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// fieldWords returns a field's name in plain words and the unit of its
// value, with a leading space.
func fieldWords(field string) (words, unit string) {
	switch field {
	case "ShellThickness":
		return "shell thickness", " mm"
	case "ShellLength":
		return "shell length", " mm"
	case "FlangeThickness":
		return "flange thickness", " mm"
	case "A":
		return "distance a from the bolt axis to the flange edge", " mm"
	case "B":
		return "distance b from the bolt axis to the shell mid-surface", " mm"
	case "SegmentWidth":
		return "segment width", " mm"
	case "NeckRadius":
		return "neck radius", " mm"
	case "BoltDiameter":
		return "bolt diameter", " mm"
	case "HoleDiameter":
		return "bolt hole diameter", " mm"
	case "WasherOuter":
		return "washer outer diameter", " mm"
	case "WasherThickness":
		return "washer thickness", " mm"
	case "HeadHeight":
		return "bolt head height", " mm"
	case "NutHeight":
		return "nut height", " mm"
	case "StressArea":
		return "stress area", " mm²"
	case "ThreadInClamp":
		return "threaded length in the clamp", " mm"
	case "FaceLines":
		return "face line", " mm"
	case "ElementSize":
		return "element size", " mm"
	case "Refine":
		return "refinement factor", ""
	case "Kind":
		return "element kind", ""
	}
	return field, ""
}

func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// mm formats a length for a rule's text.
func mm(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) + " mm" }

// checker collects broken rules.
type checker struct {
	errs FieldErrors
	bad  map[string]bool // fields with a broken rule, so dependent rules are skipped
}

func (c *checker) fail(field string, value float64, format string, args ...any) {
	c.errs = append(c.errs, FieldError{Field: field, Rule: fmt.Sprintf(format, args...), Value: value})
	c.bad[field] = true
}

// ok reports whether none of the fields has a broken rule yet.
func (c *checker) ok(fields ...string) bool {
	for _, f := range fields {
		if c.bad[f] {
			return false
		}
	}
	return true
}

func (c *checker) positive(field string, v float64) {
	if !(v > 0) || math.IsInf(v, 1) {
		c.fail(field, v, "must be a positive finite length")
	}
}

// Validate checks every rule on the segment and returns nil or
// FieldErrors listing each broken one. Lengths must be positive and
// finite (the neck radius may be 0), d < d_h < d_w < c, the washer must fit
// between the bolt and the free edge (a > d_w/2) and between the bolt and
// the shell's inner face (b − t/2 > d_w/2; with a neck fillet the fillet
// must start outside it: b − t/2 − r ≥ d_w/2), the shell stub must be
// longer than the fillet radius, a fillet at least as large as the fine
// elements (r ≥ ElementSize·Refine), the shank strip must clear the hole
// (h/2 < d_h/2), A_s < πd²/4, a partial thread needs 0 < l_t ≤ 2(t_f +
// t_w), face lines lie strictly inside the face, 0 < Refine ≤ 1, the kind
// is Quad4 or Quad8, and the mesh stays below a million elements. A rule that involves
// an already broken field is not checked again.
func (g FlangeSegment) Validate() error {
	c := &checker{bad: make(map[string]bool)}
	g.checkLengths(c)
	g.checkBolt(c)
	g.checkFlange(c)
	g.checkMesh(c)
	if len(c.errs) == 0 {
		g.checkSize(c)
	}
	if len(c.errs) == 0 {
		return nil
	}
	return c.errs
}

func (g FlangeSegment) checkLengths(c *checker) {
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"ShellThickness", g.ShellThickness}, {"ShellLength", g.ShellLength},
		{"FlangeThickness", g.FlangeThickness}, {"A", g.A}, {"B", g.B},
		{"SegmentWidth", g.SegmentWidth}, {"BoltDiameter", g.BoltDiameter},
		{"HoleDiameter", g.HoleDiameter}, {"WasherOuter", g.WasherOuter},
		{"WasherThickness", g.WasherThickness}, {"HeadHeight", g.HeadHeight},
		{"NutHeight", g.NutHeight}, {"StressArea", g.StressArea},
		{"ElementSize", g.ElementSize},
	} {
		c.positive(f.name, f.v)
	}
	if r := g.NeckRadius; !(r >= 0) || math.IsInf(r, 1) {
		c.fail("NeckRadius", r, "must be zero (a sharp corner) or a positive finite length")
	}
}

func (g FlangeSegment) checkBolt(c *checker) {
	d, dh, dw := g.BoltDiameter, g.HoleDiameter, g.WasherOuter
	if c.ok("BoltDiameter", "HoleDiameter") {
		if dh <= d {
			c.fail("HoleDiameter", dh, "must exceed the bolt diameter %s", mm(d))
		} else if h := math.Sqrt(3) / 2 * d; h >= dh {
			c.fail("HoleDiameter", dh, "must exceed the width (√3/2)·d = %s of the bolt strip", mm(h))
		}
	}
	if c.ok("HoleDiameter", "WasherOuter") && dw <= dh {
		c.fail("WasherOuter", dw, "must exceed the bolt hole diameter %s", mm(dh))
	}
	if a := math.Pi * d * d / 4; c.ok("BoltDiameter", "StressArea") && g.StressArea >= a {
		c.fail("StressArea", g.StressArea, "must be less than the shank area πd²/4 = %s²", mm(a))
	}
	if !g.FullThread && c.ok("FlangeThickness", "WasherThickness") {
		clamp := 2 * (g.FlangeThickness + g.WasherThickness)
		if lt := g.ThreadInClamp; !(lt > 0) || lt > clamp {
			c.fail("ThreadInClamp", lt, "must be positive and at most the clamp length 2(t_f + t_w) = %s for a partial thread", mm(clamp))
		}
	}
}

func (g FlangeSegment) checkFlange(c *checker) {
	dh, dw := g.HoleDiameter, g.WasherOuter
	if c.ok("SegmentWidth", "HoleDiameter") && g.SegmentWidth <= dh {
		c.fail("SegmentWidth", g.SegmentWidth, "must exceed the bolt hole diameter %s", mm(dh))
	} else if c.ok("SegmentWidth", "WasherOuter") && g.SegmentWidth <= dw {
		c.fail("SegmentWidth", g.SegmentWidth, "must exceed the washer outer diameter %s (the segment must be wider than the washer)", mm(dw))
	}
	if !c.ok("WasherOuter") {
		return
	}
	if c.ok("A") && g.A <= dw/2 {
		c.fail("A", g.A, "must exceed half the washer outer diameter, %s, so that the washer fits between the bolt and the free edge", mm(dw/2))
	}
	if !c.ok("B", "ShellThickness") {
		return
	}
	inner := g.B - g.ShellThickness/2
	if inner <= dw/2 {
		c.fail("B", g.B, "puts the shell's inner face at b − t/2 = %s, which must lie beyond half the washer outer diameter, %s", mm(inner), mm(dw/2))
	} else if r := g.NeckRadius; c.ok("NeckRadius") && inner-r < dw/2 {
		c.fail("NeckRadius", r, "starts the fillet at b − t/2 − r = %s, which must not lie inside half the washer outer diameter, %s", mm(inner-r), mm(dw/2))
	}
	if r := g.NeckRadius; c.ok("NeckRadius", "ShellLength") && r > 0 && g.ShellLength <= r {
		c.fail("ShellLength", g.ShellLength, "must exceed the neck radius %s", mm(r))
	}
}

func (g FlangeSegment) checkMesh(c *checker) {
	if r := g.Refine; !(r > 0 && r <= 1) {
		c.fail("Refine", r, "must be greater than 0 and at most 1")
	}
	if !g.Kind.valid() {
		c.fail("Kind", float64(g.Kind), "must be Quad4 (4) or Quad8 (8)")
	}
	if hf := g.ElementSize * g.Refine; c.ok("NeckRadius", "ElementSize", "Refine") && g.NeckRadius > 0 && g.NeckRadius < hf {
		c.fail("NeckRadius", g.NeckRadius, "must be 0 (a sharp corner) or at least the fine element length ElementSize·Refine = %s, so that the elements can follow the fillet", mm(hf))
	}
	if !c.ok("A", "B", "ShellThickness") {
		return
	}
	lo, hi := -g.A, g.B+g.ShellThickness/2
	for _, x := range g.FaceLines {
		if !(x > lo && x < hi) {
			c.fail("FaceLines", x, "must lie strictly inside the face, between %s and %s", mm(lo), mm(hi))
		}
	}
}

// checkSize plans the mesh, once everything else holds, and bounds its
// number of elements.
func (g FlangeSegment) checkSize(c *checker) {
	var n float64
	for _, b := range newSection(g).plan(FlangeMaterials{}).Blocks {
		n += float64(b.Divisions[0]) * float64(b.Divisions[1])
	}
	if n > maxElements {
		c.fail("ElementSize", g.ElementSize, "gives about %.3g elements with refinement factor %g, more than %d", n, g.Refine, maxElements)
	}
}
