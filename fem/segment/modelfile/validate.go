package modelfile

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"flangeseg/material/bolt"
)

// Validate checks a complete Spec (one with its defaults filled in, as
// Decode returns it, or built in code) and returns a *Error that
// lists every broken rule, or nil.
func (s *Spec) Validate() error {
	c := &checker{bad: map[string]bool{}}
	s.check(c)
	if len(c.errs) == 0 {
		return nil
	}
	return &Error{Errs: c.errs}
}

// checker collects broken rules. A key in bad (missing, of the wrong type,
// or already found wrong) is not checked again, nor are the rules that
// combine it with others, so one mistake gives one message.
type checker struct {
	bad  map[string]bool
	errs []error
}

// usable reports whether none of the keys is known to be wrong.
func (c *checker) usable(keys ...string) bool {
	for _, k := range keys {
		if c.bad[k] {
			return false
		}
	}
	return true
}

// fail records a broken rule of key.
func (c *checker) fail(key, format string, args ...any) {
	c.bad[key] = true
	c.errs = append(c.errs, fmt.Errorf(format, args...))
}

// number checks that x is finite and ok holds, else records
// "key = x: rule".
func (c *checker) number(key string, x float64, ok bool, rule string) bool {
	switch {
	case !c.usable(key):
		return false
	case math.IsNaN(x) || math.IsInf(x, 0):
		c.fail(key, "%s = %s: must be a finite number", key, FormatNumber(x))
		return false
	case !ok:
		c.fail(key, "%s = %s: %s", key, FormatNumber(x), rule)
		return false
	}
	return true
}

func (c *checker) positive(key string, x float64) bool { return c.number(key, x, x > 0, "must be > 0") }

// maxLength bounds every length of the model, mm: a joint is metres, not
// kilometres, and a larger value only makes a mesh without end.
const maxLength = 100_000

// length checks a length: > 0 and at most maxLength.
func (c *checker) length(key string, x float64) bool {
	return c.positive(key, x) && c.number(key, x, x <= maxLength, fmt.Sprintf("must be at most %d mm (100 m)", maxLength))
}

func (c *checker) nonNegative(key string, x float64) bool {
	return c.number(key, x, x >= 0, "must be ≥ 0")
}

// oneOf checks an enumerated value.
func (c *checker) oneOf(key, value string, allowed ...string) bool {
	if !c.usable(key) {
		return false
	}
	for _, a := range allowed {
		if value == a {
			return true
		}
	}
	quoted := make([]string, len(allowed))
	for i, a := range allowed {
		quoted[i] = fmt.Sprintf("%q", a)
	}
	c.fail(key, "%s = %q: must be one of %s", key, value, strings.Join(quoted, ", "))
	return false
}

// check applies every rule of the model to s.
func (s *Spec) check(c *checker) {
	s.checkTower(c)
	s.checkShell(c)
	s.checkFlange(c)
	th, threadOK := s.checkBolt(c)
	s.checkMaterials(c)
	d := s.Derive()
	if threadOK {
		s.checkBoltFit(c, th.D)
		s.checkPreload(c, d)
	}
	s.checkRoom(c, d)
	s.checkContact(c)
	s.checkLoad(c)
	s.checkMesh(c)
	s.checkOutput(c)
}

func (s *Spec) checkTower(c *checker) {
	c.length("tower.diameter", s.Tower.Diameter)
	if c.usable("tower.bolts") && s.Tower.Bolts < 3 {
		c.fail("tower.bolts", "tower.bolts = %d: must be ≥ 3", s.Tower.Bolts)
	}
}

func (s *Spec) checkShell(c *checker) {
	c.length("shell.thickness", s.Shell.Thickness)
	c.length("shell.length", s.Shell.Length)
	s.checkMaterialName(c, "shell.material", s.Shell.Material, false)
	s.checkSteelThickness(c, "shell", s.Shell.Material, s.Shell.Thickness)
}

func (s *Spec) checkFlange(c *checker) {
	c.length("flange.thickness", s.Flange.Thickness)
	c.length("flange.a", s.Flange.A)
	c.length("flange.b", s.Flange.B)
	c.nonNegative("flange.neck_radius", s.Flange.NeckRadius)
	s.checkMaterialName(c, "flange.material", s.Flange.Material, false)
	s.checkSteelThickness(c, "flange", s.Flange.Material, s.Flange.Thickness)
	if c.usable("flange.neck_radius", "shell.length") && s.Flange.NeckRadius >= s.Shell.Length {
		c.fail("flange.neck_radius", "flange.neck_radius = %s: must be less than shell.length = %s mm",
			FormatNumber(s.Flange.NeckRadius), FormatNumber(s.Shell.Length))
	}
	if c.usable("tower.diameter", "flange.a", "flange.b") && s.Tower.Diameter/2-s.Flange.B-s.Flange.A <= 0 {
		c.fail("tower.diameter", "tower.diameter = %s: too small for the flange: the free edge would lie at radius D/2 − b − a = %s mm",
			FormatNumber(s.Tower.Diameter), FormatNumber(s.Tower.Diameter/2-s.Flange.B-s.Flange.A))
	}
}

// checkMaterialName checks that a material key names a known material.
func (s *Spec) checkMaterialName(c *checker, key, name string, grades bool) {
	if !c.usable(key) {
		return
	}
	if m, ok := s.Materials[name]; ok {
		// The hand methods, which every run reports, need the shell's and
		// the flange's yield strength: the first point of the curve.
		if !grades && len(m.Curve) == 0 {
			c.fail(key, "%s = %q: [%s] has no curve, so no yield strength for the hand methods; give it a curve, or use a built-in grade with analysis.materials = %q for a linear elastic analysis", key, name, joinKey("materials", name), ElasticOnly)
		}
		return
	}
	_, gradeErr := bolt.NominalGrade(name)
	if grades && gradeErr == nil {
		return
	}
	if isSteel(name) {
		return
	}
	known := strings.Join(builtinSteels(), ", ")
	if grades {
		known += ", and the bolt grades 8.8, 10.9, 12.9"
	}
	c.fail(key, "%s = %q: unknown material (built in: %s; or define [%s])", key, name, known, joinKey("materials", name))
}

// checkSteelThickness checks that a built-in steel's yield table covers
// the plate.
func (s *Spec) checkSteelThickness(c *checker, part, name string, t float64) {
	key := part + ".thickness"
	if _, user := s.Materials[name]; user || !isSteel(name) || !c.usable(key, part+".material") {
		return
	}
	if _, err := steelYield(name, t); err != nil {
		c.fail(key, "%s = %s: beyond the yield table of %s (t ≤ 150 mm); define [materials.NAME] for a thicker plate",
			key, FormatNumber(t), name)
	}
}

// checkBolt checks the bolt's own keys and returns its thread.
func (s *Spec) checkBolt(c *checker) (bolt.Thread, bool) {
	b := s.Bolt
	th, ok := s.checkThread(c)
	c.oneOf("bolt.grade", b.Grade, "8.8", "10.9", "12.9")
	c.oneOf("bolt.thread", b.Thread, ThreadPartial, ThreadFull)
	c.nonNegative("bolt.washer_thickness", b.WasherThickness)
	s.checkBoltLength(c)
	c.length("bolt.head_height", b.HeadHeight)
	c.length("bolt.nut_height", b.NutHeight)
	if b.Material != "" {
		s.checkMaterialName(c, "bolt.material", b.Material, true)
	}
	return th, ok && c.usable("bolt.grade")
}

// checkBoltLength checks that head and nut, each on its washer, stay
// beside the modelled shell stubs: the bolt cannot reach out of the model.
func (s *Spec) checkBoltLength(c *checker) {
	b := s.Bolt
	if !c.usable("shell.length", "bolt.washer_thickness") || !(s.Shell.Length > 0) || !(b.WasherThickness >= 0) {
		return
	}
	for _, part := range []struct {
		key, what string
		height    float64
	}{{"bolt.head_height", "head", b.HeadHeight}, {"bolt.nut_height", "nut", b.NutHeight}} {
		if c.usable(part.key) && b.WasherThickness+part.height > s.Shell.Length {
			c.fail(part.key, "%s = %s: the %s on its washer (t_w + height = %s mm) reaches past the shell stub, shell.length = %s mm; the bolt must fit inside the model",
				part.key, FormatNumber(part.height), part.what, FormatNumber(b.WasherThickness+part.height), FormatNumber(s.Shell.Length))
		}
	}
}

func (s *Spec) checkThread(c *checker) (bolt.Thread, bool) {
	b := s.Bolt
	switch {
	case !c.usable("bolt.size", "bolt.diameter", "bolt.pitch"):
		return bolt.Thread{}, false
	case b.Size != "" && (b.Diameter != nil || b.Pitch != nil):
		c.fail("bolt.size", "bolt.size = %q with bolt.diameter or bolt.pitch: give bolt.size or bolt.diameter and bolt.pitch, not both", b.Size)
		return bolt.Thread{}, false
	case b.Size != "":
		th, err := bolt.CoarseThread(b.Size)
		if err != nil {
			c.fail("bolt.size", "bolt.size = %q: not an ISO 261 coarse size (known: %s)", b.Size, strings.Join(bolt.CoarseSizes(), ", "))
		}
		return th, err == nil
	case b.Diameter == nil && b.Pitch == nil:
		c.fail("bolt.size", `bolt.size: missing (give bolt.size, e.g. "M48", or bolt.diameter and bolt.pitch)`)
		return bolt.Thread{}, false
	case b.Pitch == nil:
		c.fail("bolt.pitch", "bolt.pitch: missing (bolt.diameter needs a pitch)")
		return bolt.Thread{}, false
	case b.Diameter == nil:
		c.fail("bolt.diameter", "bolt.diameter: missing (bolt.pitch needs a diameter)")
		return bolt.Thread{}, false
	}
	d, p := *b.Diameter, *b.Pitch
	ok := c.positive("bolt.diameter", d)
	ok = c.number("bolt.pitch", p, p > 0 && d-1.2269*p > 0, "must be > 0 and leave a minor diameter d − 1.2269·P > 0") && ok
	return bolt.Thread{D: d, Pitch: p}, ok
}

// checkBoltFit checks hole, washer and thread against the bolt diameter d.
func (s *Spec) checkBoltFit(c *checker, d float64) {
	b := s.Bolt
	holeOK := c.number("bolt.hole", b.Hole, b.Hole > d, fmt.Sprintf("must exceed the bolt diameter %s mm", FormatNumber(d)))
	if holeOK {
		c.number("bolt.washer_outer", b.WasherOuter, b.WasherOuter > b.Hole,
			fmt.Sprintf("must exceed the hole diameter %s mm", FormatNumber(b.Hole)))
	}
	if !c.usable("bolt.thread", "bolt.thread_length") {
		return
	}
	switch {
	case b.Thread == ThreadFull && b.ThreadLength != nil:
		c.fail("bolt.thread_length", "bolt.thread_length = %s: applies only to thread = %q; a full thread runs the whole clamp length",
			FormatNumber(*b.ThreadLength), ThreadPartial)
	case b.Thread == ThreadPartial && b.ThreadLength == nil:
		c.fail("bolt.thread_length", "bolt.thread_length: missing (threaded length inside the clamp)")
	case b.Thread == ThreadPartial && c.usable("flange.thickness", "bolt.washer_thickness"):
		lk := 2 * (s.Flange.Thickness + b.WasherThickness)
		c.number("bolt.thread_length", *b.ThreadLength, *b.ThreadLength > 0 && *b.ThreadLength <= lk,
			fmt.Sprintf("must lie in (0, l_k = %s mm], l_k = 2(t_f + t_w)", FormatNumber(lk)))
	}
}

// checkRoom checks that the washer fits on the flange and in the segment.
func (s *Spec) checkRoom(c *checker, d Derived) {
	f, dw := s.Flange, s.Bolt.WasherOuter
	if !c.usable("bolt.washer_outer") || !(dw > 0) {
		return
	}
	if c.usable("flange.b", "shell.thickness", "flange.neck_radius") {
		room := f.B - s.Shell.Thickness/2 - f.NeckRadius
		c.number("flange.b", f.B, room >= dw/2,
			fmt.Sprintf("leaves b − t/2 − neck_radius = %s mm between bolt axis and shell, less than the washer radius d_w/2 = %s mm", FormatNumber(room), FormatNumber(dw/2)))
	}
	if c.usable("flange.a") {
		c.number("flange.a", f.A, f.A >= dw/2,
			fmt.Sprintf("must be at least the washer radius d_w/2 = %s mm", FormatNumber(dw/2)))
	}
	if c.usable("tower.diameter", "tower.bolts", "flange.b") && d.SegmentWidth < dw {
		c.fail("tower.bolts", "tower.bolts = %d: segment width c = 2π·R_b/n = %.1f mm is smaller than the washer outer diameter %s mm",
			s.Tower.Bolts, d.SegmentWidth, FormatNumber(dw))
	}
}

func (s *Spec) checkPreload(c *checker, d Derived) {
	p := s.Preload
	if !c.usable("preload.force", "preload.fraction", "preload.nut_turn") {
		return
	}
	var given []string
	for _, k := range []struct {
		name string
		v    *float64
	}{{"force", p.Force}, {"fraction", p.Fraction}, {"nut_turn", p.NutTurn}} {
		if k.v != nil {
			given = append(given, "preload."+k.name)
		}
	}
	switch {
	case len(given) == 0:
		c.fail("preload", "preload: give one of preload.force, preload.fraction, preload.nut_turn")
	case len(given) > 1:
		c.fail("preload", "%s: give exactly one of preload.force, preload.fraction, preload.nut_turn", strings.Join(given, " and "))
	case p.Force != nil:
		if c.positive("preload.force", *p.Force) {
			c.number("preload.force", *p.Force, *p.Force <= d.YieldForce,
				fmt.Sprintf("above the bolt's yield force A_s·f_yb = %s N (%.1f kN)", FormatNumber(math.Round(d.YieldForce)), d.YieldForce/1e3))
		}
	case p.Fraction != nil:
		if c.positive("preload.fraction", *p.Fraction) {
			c.number("preload.fraction", *p.Fraction, d.PreloadForce <= d.YieldForce,
				fmt.Sprintf("gives F_p = %.1f kN, above the bolt's yield force A_s·f_yb = %.1f kN", d.PreloadForce/1e3, d.YieldForce/1e3))
		}
	default:
		c.positive("preload.nut_turn", *p.NutTurn)
	}
}

// checkContact checks the contact keys and the zones against the face
// x ∈ [−a, b + t/2].
func (s *Spec) checkContact(c *checker) {
	ct := s.Contact
	c.nonNegative("contact.friction", ct.Friction)
	if c.nonNegative("contact.recess", ct.Recess) && c.usable("flange.thickness") && s.Flange.Thickness > 0 {
		c.number("contact.recess", ct.Recess, ct.Recess < s.Flange.Thickness/10,
			fmt.Sprintf("must be less than a tenth of the flange thickness, t_f/10 = %s mm (a recess is a machined relief of a fraction of a millimetre)", FormatNumber(s.Flange.Thickness/10)))
	}
	c.oneOf("contact.recess_on", ct.RecessOn, RecessBoth, RecessUpper, RecessLower)
	c.number("contact.taper", ct.Taper, math.Abs(ct.Taper) <= 5, "must lie within ±5° (a taper is a small tilt of the face)")
	c.nonNegative("contact.parallel_gap", ct.ParallelGap)
	if c.nonNegative("contact.gap_spring", ct.GapSpring) && ct.GapSpring > 0 && c.usable("contact.parallel_gap") {
		c.number("contact.gap_spring", ct.GapSpring, ct.ParallelGap > 0,
			"needs contact.parallel_gap > 0: the spring holds a parallel gap open as the neighbouring segments of the ring do, and without one it has nothing to hold (leave it out, or 0)")
	}
	if ct.Zones != nil && len(ct.Zones) == 0 {
		c.fail("contact.zones", "contact.zones: empty; leave the key out when the whole face touches")
		return
	}
	var good []int
	for i := range ct.Zones {
		if s.checkZone(c, i) {
			good = append(good, i)
		}
	}
	s.checkOverlap(c, good)
}

// checkZone checks one zone and reports whether it is usable.
func (s *Spec) checkZone(c *checker, i int) bool {
	p := fmt.Sprintf("contact.zones[%d]", i)
	z := s.Contact.Zones[i]
	if !c.usable(p, p+".from", p+".to") {
		return false
	}
	if ok := c.number(p+".from", z.From, true, "") && c.number(p+".to", z.To, true, ""); !ok {
		return false
	}
	switch {
	case z.From > z.To:
		c.fail(p, "%s: from %s > to %s", p, FormatNumber(z.From), FormatNumber(z.To))
		return false
	case z.From == z.To:
		c.fail(p, "%s: from %s = to %s: a zone needs from < to", p, FormatNumber(z.From), FormatNumber(z.To))
		return false
	}
	if !c.usable("flange.a", "flange.b", "shell.thickness") {
		return true
	}
	lo, hi := -s.Flange.A, s.Flange.B+s.Shell.Thickness/2
	for _, e := range []struct {
		name string
		x    float64
	}{{"from", z.From}, {"to", z.To}} {
		if e.x < lo || e.x > hi {
			c.fail(p, "%s: %s %s lies outside the face x ∈ [%s, %s] = [−a, b + t/2]", p, e.name, FormatNumber(e.x), FormatNumber(lo), FormatNumber(hi))
			return false
		}
	}
	return true
}

// checkOverlap reports zones that share more than an end point.
func (s *Spec) checkOverlap(c *checker, idx []int) {
	z := s.Contact.Zones
	sort.SliceStable(idx, func(a, b int) bool { return z[idx[a]].From < z[idx[b]].From })
	for k := 1; k < len(idx); k++ {
		i, j := idx[k-1], idx[k]
		if z[j].From < z[i].To {
			lo, hi := min(i, j), max(i, j)
			c.fail(fmt.Sprintf("contact.zones[%d]", hi), "contact.zones[%d] and contact.zones[%d] = [%s, %s] and [%s, %s]: must not overlap",
				lo, hi, FormatNumber(z[lo].From), FormatNumber(z[lo].To), FormatNumber(z[hi].From), FormatNumber(z[hi].To))
		}
	}
}

// maxIncrements bounds load.increments: every increment keeps a history
// row and, by default, its fields.
const maxIncrements = 10_000

func (s *Spec) checkLoad(c *checker) {
	l := s.Load
	c.positive("load.max_displacement", l.MaxDisplacement)
	if c.usable("load.increments") && (l.Increments < 1 || l.Increments > maxIncrements) {
		c.fail("load.increments", "load.increments = %d: must lie in [1, %d]", l.Increments, maxIncrements)
	}
	c.number("load.stop_drop", l.StopDrop, l.StopDrop > 0 && l.StopDrop < 1, "must lie in (0, 1)")
	c.oneOf("load.end_rotation", l.EndRotation, RotationFixed, RotationFree)
	if l.ServiceForce != nil {
		c.positive("load.service_force", *l.ServiceForce)
	}
	if l.DesignForce != nil {
		c.positive("load.design_force", *l.DesignForce)
	}
}

func (s *Spec) checkMesh(c *checker) {
	m := s.Mesh
	c.positive("mesh.size", m.Size)
	c.number("mesh.refine", m.Refine, m.Refine > 0 && m.Refine <= 1, "must lie in (0, 1]")
	c.oneOf("mesh.element", m.Element, ElementQuad8, ElementQuad4)
	if r := s.Flange.NeckRadius; c.usable("flange.neck_radius", "mesh.size", "mesh.refine") && r > 0 && r < m.Size*m.Refine {
		c.fail("flange.neck_radius", "flange.neck_radius = %s: must be 0 (a sharp corner) or at least the fine element length mesh.size·mesh.refine = %s mm, so that the elements can follow the fillet",
			FormatNumber(r), FormatNumber(m.Size*m.Refine))
	}
	c.oneOf("analysis.plane", s.Analysis.Plane, PlaneStress, PlaneStrain)
	c.oneOf("analysis.materials", s.Analysis.Materials, Elastoplastic, ElasticOnly)
	c.number("fatigue.gamma_mf", s.Fatigue.GammaMf, s.Fatigue.GammaMf >= 1, "must be ≥ 1 (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35)")
	c.oneOf("analysis.bolt_strength", s.Analysis.BoltStrength, BoltMinimum, BoltNominal)
	for _, k := range []struct {
		key string
		v   float64
	}{{"analysis.damage_alpha_steel", s.Analysis.DamageAlphaSteel}, {"analysis.damage_beta_steel", s.Analysis.DamageBetaSteel},
		{"analysis.damage_alpha_bolt", s.Analysis.DamageAlphaBolt}, {"analysis.damage_beta_bolt", s.Analysis.DamageBetaBolt}} {
		c.positive(k.key, k.v)
	}
	if w := s.Analysis.NeckingWeight; w != nil {
		c.number("analysis.necking_weight", *w, *w >= 0 && *w <= 1, "must lie in [0, 1]")
	}
}

func (s *Spec) checkMaterials(c *checker) {
	for _, name := range sortedNames(s.Materials) {
		p := joinKey("materials", name)
		if !c.usable("materials", p) {
			continue
		}
		m := s.Materials[name]
		c.positive(p+".E", m.E)
		c.number(p+".nu", m.Nu, m.Nu > 0 && m.Nu < 0.5, "must lie in (0, 0.5)")
		s.checkCurve(c, p, m)
	}
}

// checkCurve checks a stress–strain curve: [total strain, stress] pairs
// with rising strain, on or below the elastic line, and, for a true curve,
// a stress that does not fall.
func (s *Spec) checkCurve(c *checker, p string, m MaterialSpec) {
	ck, kind := p+".curve", p+".curve_kind"
	if m.Curve == nil {
		if m.CurveKind != "" && c.usable(kind) {
			c.fail(kind, "%s = %q: applies only with %s", kind, m.CurveKind, ck)
		}
		return
	}
	if m.CurveKind == "" && c.usable(kind) {
		c.fail(kind, "%s: missing (%q or %q, required with %s)", kind, CurveTrue, CurveEngineering, ck)
	} else {
		c.oneOf(kind, m.CurveKind, CurveTrue, CurveEngineering)
	}
	if !c.usable(ck) {
		return
	}
	if len(m.Curve) < 2 {
		c.fail(ck, "%s: needs at least two [strain, stress] points", ck)
		return
	}
	for i, pt := range m.Curve {
		if msg := curvePointRule(m, i, pt); msg != "" {
			c.fail(ck, "%s[%d]: %s", ck, i, msg)
			return
		}
	}
}

// curvePointRule returns the rule point i of the curve breaks, or "".
func curvePointRule(m MaterialSpec, i int, pt []float64) string {
	if len(pt) != 2 {
		return fmt.Sprintf("has %d numbers; a point is [strain, stress]", len(pt))
	}
	eps, sig := pt[0], pt[1]
	for _, x := range pt {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return "must hold finite numbers"
		}
	}
	switch {
	case !(eps > 0) || !(sig > 0):
		return fmt.Sprintf("[%s, %s]: strain and stress must be > 0", FormatNumber(eps), FormatNumber(sig))
	case m.E > 0 && sig > m.E*eps*(1+1e-6):
		return fmt.Sprintf("[%s, %s] lies above the elastic line σ = E·ε = %s MPa (strains are total strains)", FormatNumber(eps), FormatNumber(sig), FormatNumber(m.E*eps))
	case i == 0:
		return ""
	}
	prev := m.Curve[i-1]
	if len(prev) != 2 {
		return ""
	}
	switch {
	case eps <= prev[0]:
		return fmt.Sprintf("strain %s must exceed the previous point's %s", FormatNumber(eps), FormatNumber(prev[0]))
	case m.CurveKind == CurveTrue && sig < prev[1]:
		return fmt.Sprintf("stress %s falls below the previous point's %s; a true-stress curve must not fall", FormatNumber(sig), FormatNumber(prev[1]))
	}
	return ""
}
