package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"text/tabwriter"

	"flangeseg/material/bolt"
)

// validate checks a complete Spec (one with its defaults filled in, as
// decodeSpec returns it, or built in code) and returns a *modelError that
// lists every broken rule, or nil.
func (s *Spec) validate() error {
	c := &checker{bad: map[string]bool{}}
	s.check(c)
	if len(c.errs) == 0 {
		return nil
	}
	return &modelError{errs: c.errs}
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
		c.fail(key, "%s = %s: must be a finite number", key, fnum(x))
		return false
	case !ok:
		c.fail(key, "%s = %s: %s", key, fnum(x), rule)
		return false
	}
	return true
}

func (c *checker) positive(key string, x float64) bool { return c.number(key, x, x > 0, "must be > 0") }

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
	d := s.derive()
	if threadOK {
		s.checkBoltFit(c, th.D)
		s.checkPreload(c, d)
	}
	s.checkRoom(c, d)
	s.checkContact(c)
	s.checkLoad(c)
	s.checkMesh(c)
}

func (s *Spec) checkTower(c *checker) {
	c.positive("tower.diameter", s.Tower.Diameter)
	if c.usable("tower.bolts") && s.Tower.Bolts < 3 {
		c.fail("tower.bolts", "tower.bolts = %d: must be ≥ 3", s.Tower.Bolts)
	}
}

func (s *Spec) checkShell(c *checker) {
	c.positive("shell.thickness", s.Shell.Thickness)
	c.positive("shell.length", s.Shell.Length)
	s.checkMaterialName(c, "shell.material", s.Shell.Material, false)
	s.checkSteelThickness(c, "shell", s.Shell.Material, s.Shell.Thickness)
}

func (s *Spec) checkFlange(c *checker) {
	c.positive("flange.thickness", s.Flange.Thickness)
	c.positive("flange.a", s.Flange.A)
	c.positive("flange.b", s.Flange.B)
	c.nonNegative("flange.neck_radius", s.Flange.NeckRadius)
	s.checkMaterialName(c, "flange.material", s.Flange.Material, false)
	s.checkSteelThickness(c, "flange", s.Flange.Material, s.Flange.Thickness)
	if c.usable("flange.neck_radius", "shell.length") && s.Flange.NeckRadius >= s.Shell.Length {
		c.fail("flange.neck_radius", "flange.neck_radius = %s: must be less than shell.length = %s mm",
			fnum(s.Flange.NeckRadius), fnum(s.Shell.Length))
	}
	if c.usable("tower.diameter", "flange.a", "flange.b") && s.Tower.Diameter/2-s.Flange.B-s.Flange.A <= 0 {
		c.fail("tower.diameter", "tower.diameter = %s: too small for the flange: the free edge would lie at radius D/2 − b − a = %s mm",
			fnum(s.Tower.Diameter), fnum(s.Tower.Diameter/2-s.Flange.B-s.Flange.A))
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
			c.fail(key, "%s = %q: [%s] has no curve, so no yield strength for the hand methods; give it a curve, or use a built-in grade with analysis.materials = %q for a linear elastic analysis", key, name, joinKey("materials", name), elasticOnly)
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
			key, fnum(t), name)
	}
}

// checkBolt checks the bolt's own keys and returns its thread.
func (s *Spec) checkBolt(c *checker) (bolt.Thread, bool) {
	b := s.Bolt
	th, ok := s.checkThread(c)
	c.oneOf("bolt.grade", b.Grade, "8.8", "10.9", "12.9")
	c.oneOf("bolt.thread", b.Thread, threadPartial, threadFull)
	c.nonNegative("bolt.washer_thickness", b.WasherThickness)
	c.positive("bolt.head_height", b.HeadHeight)
	c.positive("bolt.nut_height", b.NutHeight)
	if b.Material != "" {
		s.checkMaterialName(c, "bolt.material", b.Material, true)
	}
	return th, ok && c.usable("bolt.grade")
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
	holeOK := c.number("bolt.hole", b.Hole, b.Hole > d, fmt.Sprintf("must exceed the bolt diameter %s mm", fnum(d)))
	if holeOK {
		c.number("bolt.washer_outer", b.WasherOuter, b.WasherOuter > b.Hole,
			fmt.Sprintf("must exceed the hole diameter %s mm", fnum(b.Hole)))
	}
	if !c.usable("bolt.thread", "bolt.thread_length") {
		return
	}
	switch {
	case b.Thread == threadFull && b.ThreadLength != nil:
		c.fail("bolt.thread_length", "bolt.thread_length = %s: applies only to thread = %q; a full thread runs the whole clamp length",
			fnum(*b.ThreadLength), threadPartial)
	case b.Thread == threadPartial && b.ThreadLength == nil:
		c.fail("bolt.thread_length", "bolt.thread_length: missing (threaded length inside the clamp)")
	case b.Thread == threadPartial && c.usable("flange.thickness", "bolt.washer_thickness"):
		lk := 2 * (s.Flange.Thickness + b.WasherThickness)
		c.number("bolt.thread_length", *b.ThreadLength, *b.ThreadLength >= 0 && *b.ThreadLength <= lk,
			fmt.Sprintf("must lie in [0, l_k = %s mm], l_k = 2(t_f + t_w)", fnum(lk)))
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
			fmt.Sprintf("leaves b − t/2 − neck_radius = %s mm between bolt axis and shell, less than the washer radius d_w/2 = %s mm", fnum(room), fnum(dw/2)))
	}
	if c.usable("flange.a") {
		c.number("flange.a", f.A, f.A >= dw/2,
			fmt.Sprintf("must be at least the washer radius d_w/2 = %s mm", fnum(dw/2)))
	}
	if c.usable("tower.diameter", "tower.bolts", "flange.b") && d.SegmentWidth < dw {
		c.fail("tower.bolts", "tower.bolts = %d: segment width c = 2π·R_b/n = %.1f mm is smaller than the washer outer diameter %s mm",
			s.Tower.Bolts, d.SegmentWidth, fnum(dw))
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
				fmt.Sprintf("above the bolt's yield force A_s·f_yb = %s N (%.1f kN)", fnum(math.Round(d.YieldForce)), d.YieldForce/1e3))
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
	c.nonNegative("contact.recess", ct.Recess)
	c.oneOf("contact.recess_on", ct.RecessOn, recessBoth, recessUpper, recessLower)
	c.number("contact.taper", ct.Taper, math.Abs(ct.Taper) <= 5, "must lie within ±5° (a taper is a small tilt of the face)")
	c.nonNegative("contact.parallel_gap", ct.ParallelGap)
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
		c.fail(p, "%s: from %s > to %s", p, fnum(z.From), fnum(z.To))
		return false
	case z.From == z.To:
		c.fail(p, "%s: from %s = to %s: a zone needs from < to", p, fnum(z.From), fnum(z.To))
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
			c.fail(p, "%s: %s %s lies outside the face x ∈ [%s, %s] = [−a, b + t/2]", p, e.name, fnum(e.x), fnum(lo), fnum(hi))
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
			c.fail(fmt.Sprintf("contact.zones[%d]", hi), "contact.zones[%d] and contact.zones[%d] overlap: [%s, %s] and [%s, %s]",
				lo, hi, fnum(z[lo].From), fnum(z[lo].To), fnum(z[hi].From), fnum(z[hi].To))
		}
	}
}

func (s *Spec) checkLoad(c *checker) {
	l := s.Load
	c.positive("load.max_displacement", l.MaxDisplacement)
	if c.usable("load.increments") && l.Increments < 1 {
		c.fail("load.increments", "load.increments = %d: must be ≥ 1", l.Increments)
	}
	c.number("load.stop_drop", l.StopDrop, l.StopDrop > 0 && l.StopDrop < 1, "must lie in (0, 1)")
	c.oneOf("load.end_rotation", l.EndRotation, rotationFixed, rotationFree)
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
	c.oneOf("mesh.element", m.Element, elementQuad8, elementQuad4)
	c.oneOf("analysis.plane", s.Analysis.Plane, planeStress, planeStrain)
	c.oneOf("analysis.materials", s.Analysis.Materials, elastoplastic, elasticOnly)
	c.number("fatigue.gamma_mf", s.Fatigue.GammaMf, s.Fatigue.GammaMf >= 1, "must be ≥ 1 (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35)")
	c.oneOf("analysis.bolt_strength", s.Analysis.BoltStrength, boltMinimum, boltNominal)
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
		c.fail(kind, "%s: missing (%q or %q, required with %s)", kind, curveTrue, curveEngineering, ck)
	} else {
		c.oneOf(kind, m.CurveKind, curveTrue, curveEngineering)
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
		return fmt.Sprintf("[%s, %s]: strain and stress must be > 0", fnum(eps), fnum(sig))
	case m.E > 0 && sig > m.E*eps*(1+1e-6):
		return fmt.Sprintf("[%s, %s] lies above the elastic line σ = E·ε = %s MPa (strains are total strains)", fnum(eps), fnum(sig), fnum(m.E*eps))
	case i == 0:
		return ""
	}
	prev := m.Curve[i-1]
	if len(prev) != 2 {
		return ""
	}
	switch {
	case eps <= prev[0]:
		return fmt.Sprintf("strain %s must exceed the previous point's %s", fnum(eps), fnum(prev[0]))
	case m.CurveKind == curveTrue && sig < prev[1]:
		return fmt.Sprintf("stress %s falls below the previous point's %s; a true-stress curve must not fall", fnum(sig), fnum(prev[1]))
	}
	return ""
}

// runValidate is `flangeseg validate MODEL.toml`.
func runValidate(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("validate", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { validateUsage(stderr) }
	if err := fs.Parse(args); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg validate: want one model file; run 'flangeseg validate --help'")
		return exitBadInput
	}
	path := fs.Arg(0)
	s, ok := loadOrReport(path, "validate", stderr)
	if !ok {
		return exitBadInput
	}
	if err := printModel(stdout, path, s); err != nil {
		fmt.Fprintf(stderr, "flangeseg validate: %v\n", err)
		return exitBadInput
	}
	return exitOK
}

// loadOrReport loads a model file; if it cannot, it writes every error
// (an invalid model: each broken rule and their count) to stderr and
// reports false.
func loadOrReport(path, command string, stderr io.Writer) (*Spec, bool) {
	s, err := loadSpec(path)
	var me *modelError
	switch {
	case errors.As(err, &me):
		fmt.Fprintln(stderr, err)
		fmt.Fprintf(stderr, "%s: model is invalid (%d %s)\n", path, len(me.errs), plural(len(me.errs), "error", "errors"))
		return nil, false
	case err != nil:
		fmt.Fprintf(stderr, "flangeseg %s: %v\n", command, err)
		return nil, false
	}
	return s, true
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func validateUsage(w io.Writer) {
	fmt.Fprint(w, `Usage: flangeseg validate MODEL.toml

Reads a model file strictly, fills in the defaults and checks every value.
A valid model is printed with all defaults filled in (the form a run keeps
as model.resolved.toml), followed by the quantities derived from it (bolt
areas and strengths, preload, segment width, strip thicknesses, ring-spring
stiffness, shell decay length 3/β) and any warnings. An invalid model gives
every error at once on stderr, one per line, prefixed with the file name:
the key, its value and the rule it breaks. Nothing is written to disk.

Units in the file: mm, N, MPa, degrees. Zones are numbered from 0 in
messages (contact.zones[0] is the first).

Defaults of the keys a file may leave out:
`)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, k := range keyDefaults() {
		fmt.Fprintf(tw, "  %s\t%s\n", k.key, k.text)
	}
	tw.Flush()
	fmt.Fprint(w, `
Built-in materials (no [materials] table needed): S235, S275, S355, S420,
S460 (E = 210000 MPa, ν = 0.3, yield strength by thickness per EN 10025)
and, for bolt.material, the bolt grades 8.8, 10.9, 12.9. A [materials.NAME]
table defines a material (E, nu, optionally curve and curve_kind) and takes
precedence over a built-in one of the same name.

Exit codes: 0 the model is valid, 2 it is invalid or cannot be read.
`)
}

// printModel writes the resolved model, its derived quantities and the
// warnings.
func printModel(w io.Writer, path string, s *Spec) error {
	resolved, err := s.resolvedTOML()
	if err != nil {
		return err
	}
	d := s.derive()
	fmt.Fprintf(w, "%s: %s\n\nResolved model (every default filled in):\n\n%s\n", path, s.Title, resolved)
	fmt.Fprintln(w, "Derived quantities:")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, r := range derivedRows(s, d) {
		fmt.Fprintf(tw, "  %s\t%s\t%s\n", r[0], r[1], r[2])
	}
	tw.Flush()
	fmt.Fprintln(w)
	if len(d.Warnings) == 0 {
		fmt.Fprintln(w, "Warnings: none")
	} else {
		fmt.Fprintln(w, "Warnings:")
		for _, m := range d.Warnings {
			fmt.Fprintf(w, "  - %s\n", m)
		}
	}
	fmt.Fprintln(w, "model is valid")
	return nil
}

// g5 formats a value to five significant digits.
func g5(x float64) string { return fmt.Sprintf("%.5g", x) }

func kN(x float64) string { return fmt.Sprintf("%.1f", x/1e3) }

// derivedRows lists the derived quantities as label, value, unit.
func derivedRows(s *Spec, d Derived) [][3]string {
	rows := [][3]string{
		{"bolt diameter d, pitch P", g5(d.D) + ", " + g5(d.Pitch), "mm"},
		{"nominal area A = π·d²/4", g5(d.NominalArea), "mm²"},
		{"stress area A_s (ISO 898-1)", g5(d.StressArea), "mm²"},
		{"nominal f_ub, f_yb of grade " + s.Bolt.Grade, g5(d.Fub) + ", " + g5(d.Fyb), "MPa"},
		{"design preload F_p,C = 0.7·f_ub·A_s", kN(d.DesignPreload), "kN"},
		{"yield force A_s·f_yb", kN(d.YieldForce), "kN"},
	}
	if s.Preload.NutTurn != nil {
		rows = append(rows, [3]string{fmt.Sprintf("preload shortening (nut turn %s° · P/360°)", fnum(*s.Preload.NutTurn)), g5(d.PreloadShortening), "mm"})
	} else {
		rows = append(rows, [3]string{"target preload F_p", kN(d.PreloadForce), "kN"})
	}
	rows = append(rows, [][3]string{
		{"bolt circle radius R_b = D/2 − b", g5(d.BoltCircleRadius), "mm"},
		{"segment width c = 2π·R_b/n", g5(d.SegmentWidth), "mm"},
		{"clamp length l_k = 2(t_f + t_w)", g5(d.ClampLength), "mm"},
		{"thread, shank inside the clamp", g5(d.ThreadInClamp) + ", " + g5(d.ShankInClamp), "mm"},
		{"strip thickness: shell and flange (c)", g5(d.ShellStrip), "mm"},
		{"strip thickness: hole band (c − d_h)", g5(d.HoleBandStrip), "mm"},
		{"bolt strip width h = (√3/2)·d", g5(d.BoltWidth), "mm"},
		{"strip thickness: shank (A/h), thread (A_s/h)", g5(d.ShankStrip) + ", " + g5(d.ThreadStrip), "mm"},
		{"strip thickness: bearing t_b = π(d_w² − d_h²)/(4(d_w − d_h))", g5(d.BearingStrip), "mm"},
		{"yield strength of shell, flange", yieldText(d.ShellYield) + ", " + yieldText(d.FlangeYield), "MPa"},
		{"ring-spring stiffness E·t/R² (per unit wall area)", g5(d.RingSpring), "N/mm³"},
		{"shell decay length 1/β, 3/β", g5(d.DecayLength) + ", " + g5(d.ThreeDecayLengths), "mm"},
	}...)
	return rows
}

func yieldText(fy float64) string {
	if fy == 0 {
		return "elastic"
	}
	return g5(fy)
}
