package main

import (
	"bytes"
	"errors"
	"flangeseg/material"
	"fmt"
	"math"
	"os"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"

	"flangeseg/material/bolt"
)

// Spec is a flange-segment model as its file states it: one struct per
// table, one field per key, lengths in mm, forces in N, stresses in MPa,
// angles in degrees. decodeSpec fills in every default, so a decoded Spec
// is complete; optional values without a default (a second way of giving
// the bolt, the preload keys not chosen, the reference loads) are nil
// pointers or empty strings when the file leaves them out.
type Spec struct {
	Title     string                  `toml:"title"`
	Tower     TowerSpec               `toml:"tower"`
	Shell     ShellSpec               `toml:"shell"`
	Flange    FlangeSpec              `toml:"flange"`
	Bolt      BoltSpec                `toml:"bolt"`
	Contact   ContactSpec             `toml:"contact"`
	Preload   PreloadSpec             `toml:"preload"`
	Load      LoadSpec                `toml:"load"`
	Mesh      MeshSpec                `toml:"mesh"`
	Analysis  AnalysisSpec            `toml:"analysis"`
	Fatigue   FatigueSpec             `toml:"fatigue"`
	Materials map[string]MaterialSpec `toml:"materials,omitempty"`
}

// FatigueSpec holds what the bolt fatigue check (flangeseg fatigue) takes
// from the model: the partial factor γ_Mf on the fatigue strength
// (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35 by assessment method and
// consequence of failure; the National Annex and the project decide).
type FatigueSpec struct {
	GammaMf float64 `toml:"gamma_mf"`
}

// TowerSpec is the tower at the joint.
type TowerSpec struct {
	Diameter float64 `toml:"diameter"` // D, shell mid-surface diameter at the joint
	Bolts    int     `toml:"bolts"`    // n, number of bolts around the circumference
}

// ShellSpec is the tower wall on each side of the joint.
type ShellSpec struct {
	Thickness float64 `toml:"thickness"` // t
	Length    float64 `toml:"length"`    // L, modelled wall length on each side
	Material  string  `toml:"material"`
}

// FlangeSpec is each of the two L-flanges.
type FlangeSpec struct {
	Thickness  float64 `toml:"thickness"` // t_f
	A          float64 `toml:"a"`         // a, bolt axis → flange free edge
	B          float64 `toml:"b"`         // b, bolt axis → shell mid-surface
	Material   string  `toml:"material"`
	NeckRadius float64 `toml:"neck_radius"` // fillet radius between flange and shell
}

// BoltSpec is the bolt with its washers and nut. The thread is either an
// ISO 261 coarse Size or a Diameter with a Pitch.
type BoltSpec struct {
	Size     string   `toml:"size,omitempty"`     // "M12" … "M72"
	Diameter *float64 `toml:"diameter,omitempty"` // d, with Pitch instead of Size
	Pitch    *float64 `toml:"pitch,omitempty"`    // P
	Grade    string   `toml:"grade"`              // property class "8.8", "10.9" or "12.9"
	Thread   string   `toml:"thread"`             // "partial" (shank and thread) or "full"

	// ThreadLength is the threaded length inside the clamp of a partially
	// threaded bolt; nil for a full thread, which runs the whole clamp.
	ThreadLength *float64 `toml:"thread_length,omitempty"`

	Hole            float64 `toml:"hole"`             // d_h
	WasherOuter     float64 `toml:"washer_outer"`     // d_w
	WasherThickness float64 `toml:"washer_thickness"` // t_w, each of the two washers
	HeadHeight      float64 `toml:"head_height"`
	NutHeight       float64 `toml:"nut_height"`

	// Material, if set, names the law of the bolt in the analysis instead
	// of the grade's; the grade still sets f_ub and f_yb for the preload
	// and the hand checks.
	Material string `toml:"material,omitempty"`
}

// ContactSpec is the interface between the two flange faces. x is the
// radial coordinate from the bolt axis (positive towards the shell), so the
// face spans x ∈ [−a, b + t/2].
type ContactSpec struct {
	Friction float64 `toml:"friction"` // Coulomb coefficient

	// Zones are the x ranges that touch; nil means the whole face does.
	// Outside them each face recedes by Recess (faces per RecessOn).
	Zones    []ZoneSpec `toml:"zones,omitempty"`
	Recess   float64    `toml:"recess"`
	RecessOn string     `toml:"recess_on"` // "both", "upper" or "lower"

	// Taper tilts each face by this angle (degrees). Positive: the faces
	// touch at the shell-side corner x = b + t/2 and open towards the free
	// edge, a gap of 2·tan(taper)·(b + t/2 − x) between them. Negative: they
	// touch at the free edge x = −a and open towards the shell, a gap of
	// 2·tan(−taper)·(x + a).
	Taper float64 `toml:"taper"`

	// ParallelGap is a uniform gap between the faces, added to the rest.
	ParallelGap float64 `toml:"parallel_gap"`
}

// ZoneSpec is a band of the face that touches, From < To.
type ZoneSpec struct {
	From float64 `toml:"from"`
	To   float64 `toml:"to"`
}

// PreloadSpec gives the bolt's preload in exactly one way.
type PreloadSpec struct {
	Force    *float64 `toml:"force,omitempty"`    // F_p, N
	Fraction *float64 `toml:"fraction,omitempty"` // F_p/F_p,C, F_p,C = 0.7·f_ub·A_s
	NutTurn  *float64 `toml:"nut_turn,omitempty"` // degrees; shortens the bolt by angle/360·P
}

// LoadSpec is the tension stage: the loaded shell end moves up by
// displacement control.
type LoadSpec struct {
	MaxDisplacement float64 `toml:"max_displacement"`
	Increments      int     `toml:"increments"`
	StopDrop        float64 `toml:"stop_drop"`    // fraction below the peak load that ends the run
	EndRotation     string  `toml:"end_rotation"` // "fixed" or "free" loaded shell end

	// ServiceForce is the reference segment force of the secant stiffness
	// (N); nil leaves it to the analysis (40 % of the hand-method ultimate
	// load). DesignForce is a design segment force to check against (N).
	ServiceForce *float64 `toml:"service_force,omitempty"`
	DesignForce  *float64 `toml:"design_force,omitempty"`
}

// MeshSpec sets the element size.
type MeshSpec struct {
	Size    float64 `toml:"size"`    // target element size
	Refine  float64 `toml:"refine"`  // size factor near bolt, hole and zone edges, in (0, 1]
	Element string  `toml:"element"` // "quad8" or "quad4"
}

// AnalysisSpec chooses the idealisation.
type AnalysisSpec struct {
	Plane            string `toml:"plane"` // "stress" or "strain"
	LargeDeformation bool   `toml:"large_deformation"`
	RingSprings      bool   `toml:"ring_springs"` // hoop stiffness of the ring as springs on the wall
	// Materials is "elastoplastic" (von Mises plasticity with the curves
	// of the grades or of [materials]) or "elastic" (every material
	// linear elastic: the service range only).
	Materials string `toml:"materials"`
	// BoltStrength picks the bolt curve: "minimum" (ISO 898-1 minimum
	// values) or "nominal" (EN 1993-1-8 Table 3.1 f_yb, f_ub).
	BoltStrength string `toml:"bolt_strength"`
	// NeckingWeight is Ling's (1996) weight w between the linear and the
	// power-law extension of a curve past necking, in [0, 1].
	NeckingWeight *float64 `toml:"necking_weight,omitempty"`
	// The ductile damage indicator's fracture strain ε_f = α·exp(−β·η)
	// per material family: structural steels (shell, flange) and bolt
	// steels. Zero values take the family defaults of package material.
	DamageAlphaSteel float64 `toml:"damage_alpha_steel,omitempty"`
	DamageBetaSteel  float64 `toml:"damage_beta_steel,omitempty"`
	DamageAlphaBolt  float64 `toml:"damage_alpha_bolt,omitempty"`
	DamageBetaBolt   float64 `toml:"damage_beta_bolt,omitempty"`
}

// MaterialSpec is a material the file defines. Without Curve it is linear
// elastic. Curve lists [total strain, stress] points of the uniaxial curve
// beyond the elastic range, as CurveKind says ("true" or "engineering").
type MaterialSpec struct {
	E         float64     `toml:"E"`
	Nu        float64     `toml:"nu"`
	Curve     [][]float64 `toml:"curve,omitempty"`
	CurveKind string      `toml:"curve_kind,omitempty"`
}

// The words the enumerated keys take.
const (
	threadPartial    = "partial"
	threadFull       = "full"
	recessBoth       = "both"
	recessUpper      = "upper"
	recessLower      = "lower"
	rotationFixed    = "fixed"
	rotationFree     = "free"
	elementQuad8     = "quad8"
	elementQuad4     = "quad4"
	planeStress      = "stress"
	planeStrain      = "strain"
	elastoplastic    = "elastoplastic"
	elasticOnly      = "elastic"
	boltMinimum      = "minimum"
	boltNominal      = "nominal"
	curveTrue        = "true"
	curveEngineering = "engineering"
)

// loadSpec reads and decodes the model file at path. A *modelError names
// the file on every line.
func loadSpec(path string) (*Spec, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("read model file: %w", err)
	}
	s, err := decodeSpec(data)
	var me *modelError
	if errors.As(err, &me) {
		me.file = path
	}
	return s, err
}

// decodeSpec decodes a model file strictly, fills in the defaults and
// validates the result. It reports every problem at once in a *modelError:
// unknown keys, values of the wrong type, missing keys and broken rules.
//
// The toml package parses the text; the tables are then matched against
// the Spec's tags here rather than by toml's struct decoding, which accepts
// keys in any letter case and stops at the first value of the wrong type.
func decodeSpec(data []byte) (*Spec, error) {
	var raw map[string]any
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		return nil, &modelError{errs: []error{syntaxError(err)}}
	}
	d := newDecoder(md)
	var s Spec
	d.table("", "", raw, reflect.ValueOf(&s).Elem())
	d.requireKeys(&s)
	s.fillDefaults(d.given)
	c := &checker{bad: d.bad}
	s.check(c)
	if errs := append(d.errs, c.errs...); len(errs) > 0 {
		return nil, &modelError{errs: errs}
	}
	return &s, nil
}

// modelError lists every problem of a model, one per line, each prefixed
// with the file name when it is known.
type modelError struct {
	file string
	errs []error
}

func (e *modelError) Error() string {
	var b strings.Builder
	for i, err := range e.errs {
		if i > 0 {
			b.WriteByte('\n')
		}
		if e.file != "" {
			b.WriteString(e.file + ": ")
		}
		b.WriteString(err.Error())
	}
	return b.String()
}

func (e *modelError) Unwrap() []error { return e.errs }

func syntaxError(err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("line %d: TOML syntax: %s", pe.Position.Line, pe.Message)
	}
	return fmt.Errorf("TOML syntax: %w", err)
}

// decoder copies parsed TOML tables into a Spec, checking every key and
// type against the struct tags.
type decoder struct {
	order map[string]int  // key path as toml writes it (no indices) → first position in the file
	given map[string]bool // paths of the keys the file gives, e.g. "contact.zones[1].from"
	bad   map[string]bool // paths whose value is missing or of the wrong type
	errs  []error
}

func newDecoder(md toml.MetaData) *decoder {
	d := &decoder{order: map[string]int{}, given: map[string]bool{}, bad: map[string]bool{}}
	for i, k := range md.Keys() {
		if _, ok := d.order[k.String()]; !ok {
			d.order[k.String()] = i
		}
	}
	return d
}

// joinKey appends one key to a dotted path, quoted as TOML needs.
func joinKey(path, key string) string {
	k := toml.Key{key}.String()
	if path == "" {
		return k
	}
	return path + "." + k
}

// sortedKeys returns the keys of a table in file order.
func (d *decoder) sortedKeys(ord string, raw map[string]any) []string {
	keys := make([]string, 0, len(raw))
	for k := range raw {
		keys = append(keys, k)
	}
	pos := func(k string) int {
		if p, ok := d.order[joinKey(ord, k)]; ok {
			return p
		}
		return math.MaxInt
	}
	sort.Slice(keys, func(i, j int) bool {
		pi, pj := pos(keys[i]), pos(keys[j])
		if pi != pj {
			return pi < pj
		}
		return keys[i] < keys[j]
	})
	return keys
}

// tomlFields returns the key names of a struct type and their field indices.
func tomlFields(t reflect.Type) ([]string, map[string]int) {
	var names []string
	index := map[string]int{}
	for i := range t.NumField() {
		name, _, _ := strings.Cut(t.Field(i).Tag.Get("toml"), ",")
		names = append(names, name)
		index[name] = i
	}
	return names, index
}

func (d *decoder) table(path, ord string, raw map[string]any, v reflect.Value) {
	names, index := tomlFields(v.Type())
	for _, k := range d.sortedKeys(ord, raw) {
		p := joinKey(path, k)
		i, ok := index[k]
		if !ok {
			d.errs = append(d.errs, fmt.Errorf("unknown key %q%s", p, suggest(k, names)))
			continue
		}
		d.given[p] = true
		d.value(p, joinKey(ord, k), raw[k], v.Field(i))
	}
}

// value decodes one TOML value into v and reports whether it could.
func (d *decoder) value(path, ord string, raw any, v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Pointer:
		e := reflect.New(v.Type().Elem())
		if !d.value(path, ord, raw, e.Elem()) {
			return false
		}
		v.Set(e)
	case reflect.Float64:
		switch x := raw.(type) {
		case float64:
			v.SetFloat(x)
		case int64:
			v.SetFloat(float64(x))
		default:
			return d.wrongType(path, raw, "a number")
		}
	case reflect.Int:
		x, ok := raw.(int64)
		if !ok {
			return d.wrongType(path, raw, "a whole number")
		}
		v.SetInt(x)
	case reflect.String:
		x, ok := raw.(string)
		if !ok {
			return d.wrongType(path, raw, "a string")
		}
		v.SetString(x)
	case reflect.Bool:
		x, ok := raw.(bool)
		if !ok {
			return d.wrongType(path, raw, "true or false")
		}
		v.SetBool(x)
	case reflect.Struct:
		m, ok := raw.(map[string]any)
		if !ok {
			return d.wrongType(path, raw, "a table")
		}
		d.table(path, ord, m, v)
	case reflect.Slice:
		return d.array(path, ord, raw, v)
	case reflect.Map:
		m, ok := raw.(map[string]any)
		if !ok {
			return d.wrongType(path, raw, "a table")
		}
		d.tableMap(path, ord, m, v)
	default:
		// Only a Spec type without a case above can get here.
		d.errs = append(d.errs, fmt.Errorf("%s: cannot decode into %s", path, v.Type()))
		return false
	}
	return true
}

func (d *decoder) array(path, ord string, raw any, v reflect.Value) bool {
	rv := reflect.ValueOf(raw)
	if raw == nil || rv.Kind() != reflect.Slice {
		return d.wrongType(path, raw, "an array")
	}
	s := reflect.MakeSlice(v.Type(), rv.Len(), rv.Len())
	ok := true
	for i := range rv.Len() {
		ok = d.value(fmt.Sprintf("%s[%d]", path, i), ord, rv.Index(i).Interface(), s.Index(i)) && ok
	}
	v.Set(s)
	if !ok {
		d.bad[path] = true // so that no rule reads the zeros left in it
	}
	return ok
}

// tableMap decodes a table of named entries, e.g. [materials.NAME].
func (d *decoder) tableMap(path, ord string, raw map[string]any, v reflect.Value) {
	m := reflect.MakeMap(v.Type())
	for _, k := range d.sortedKeys(ord, raw) {
		e := reflect.New(v.Type().Elem()).Elem()
		d.value(joinKey(path, k), joinKey(ord, k), raw[k], e)
		m.SetMapIndex(reflect.ValueOf(k), e)
	}
	v.Set(m)
}

func (d *decoder) wrongType(path string, raw any, want string) bool {
	d.bad[path] = true
	d.errs = append(d.errs, fmt.Errorf("%s = %s: wrong type: %s where %s belongs", path, tomlValue(raw), tomlType(raw), want))
	return false
}

// tomlValue shows a parsed value as the file would write it, briefly.
func tomlValue(raw any) string {
	switch x := raw.(type) {
	case string:
		return strconv.Quote(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return fnum(x)
	case bool:
		return strconv.FormatBool(x)
	case map[string]any:
		return "{…}"
	case time.Time:
		return x.Format(time.RFC3339)
	}
	if rv := reflect.ValueOf(raw); raw != nil && rv.Kind() == reflect.Slice {
		return "[…]"
	}
	return fmt.Sprint(raw)
}

func tomlType(raw any) string {
	switch raw.(type) {
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a float"
	case bool:
		return "a boolean"
	case map[string]any:
		return "a table"
	}
	if rv := reflect.ValueOf(raw); raw != nil && rv.Kind() == reflect.Slice {
		return "an array"
	}
	return "a date or time"
}

// suggest names the known key closest to an unknown one, if any is close.
func suggest(key string, known []string) string {
	best, bestDist := "", 3
	for _, k := range known {
		dist := editDistance(strings.ToLower(key), strings.ToLower(k))
		if dist < bestDist && dist < len(k) {
			best, bestDist = k, dist
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf(" (did you mean %q?)", best)
}

// editDistance is the Levenshtein distance between two strings.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := range ra {
		cur[0] = i + 1
		for j := range rb {
			cost := 1
			if ra[i] == rb[j] {
				cost = 0
			}
			cur[j+1] = min(prev[j+1]+1, cur[j]+1, prev[j]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// requiredKey is a key the file must give.
type requiredKey struct {
	key  string
	what string
}

func requiredKeys() []requiredKey {
	return []requiredKey{
		{"tower.diameter", "shell mid-surface diameter D at the joint, mm"},
		{"tower.bolts", "number of bolts n around the circumference"},
		{"shell.thickness", "shell thickness t, mm"},
		{"shell.length", "modelled wall length L on each side, mm"},
		{"shell.material", "material name"},
		{"flange.thickness", "flange thickness t_f, mm"},
		{"flange.a", "bolt axis to flange free edge, mm"},
		{"flange.b", "bolt axis to shell mid-surface, mm"},
		{"flange.material", "material name"},
		{"bolt.grade", `property class "8.8", "10.9" or "12.9"`},
		{"bolt.thread", `"partial" or "full"`},
		{"bolt.hole", "hole diameter d_h, mm"},
		{"bolt.washer_outer", "washer outer diameter d_w, mm"},
		{"bolt.washer_thickness", "thickness of each washer, mm"},
		{"bolt.head_height", "head height, mm"},
		{"bolt.nut_height", "nut height, mm"},
		{"load.max_displacement", "largest displacement of the loaded shell end, mm"},
	}
}

// requireKeys reports the required keys the file leaves out, also those
// of each zone and each defined material.
func (d *decoder) requireKeys(s *Spec) {
	missing := func(key, what string) {
		if !d.given[key] {
			d.bad[key] = true
			d.errs = append(d.errs, fmt.Errorf("%s: missing (%s)", key, what))
		}
	}
	for _, r := range requiredKeys() {
		missing(r.key, r.what)
	}
	for i := range s.Contact.Zones {
		p := fmt.Sprintf("contact.zones[%d]", i)
		if d.bad[p] {
			continue // not a table
		}
		missing(p+".from", "start of the zone, mm")
		missing(p+".to", "end of the zone, mm")
	}
	for _, name := range sortedNames(s.Materials) {
		p := joinKey("materials", name)
		if d.bad[p] {
			continue
		}
		missing(p+".E", "Young's modulus, MPa")
		missing(p+".nu", "Poisson's ratio")
	}
}

func sortedNames(m map[string]MaterialSpec) []string {
	names := make([]string, 0, len(m))
	for k := range m {
		names = append(names, k)
	}
	sort.Strings(names)
	return names
}

// keyDefault is the value a key takes when the file leaves it out.
type keyDefault struct {
	key  string
	text string      // the default, as --help states it
	set  func(*Spec) // nil when the zero value is the default or the key stays unset
}

func keyDefaults() []keyDefault {
	return []keyDefault{
		{"title", `""`, nil},
		{"flange.neck_radius", "0 mm", nil},
		{"bolt.thread_length", `0.5·d (thread = "partial" only)`, func(s *Spec) {
			if th, err := s.thread(); err == nil && s.Bolt.Thread == threadPartial {
				s.Bolt.ThreadLength = ptr(0.5 * th.D)
			}
		}},
		{"bolt.material", "the grade's own curve", nil},
		{"contact.friction", "0", nil},
		{"contact.zones", "none: the whole face touches", nil},
		{"contact.recess", "0 mm", nil},
		{"contact.recess_on", `"both"`, func(s *Spec) { s.Contact.RecessOn = recessBoth }},
		{"contact.taper", "0°", nil},
		{"contact.parallel_gap", "0 mm", nil},
		{"preload.fraction", "1.0 (F_p = F_p,C = 0.7·f_ub·A_s) when none of force, fraction, nut_turn is given", func(s *Spec) {
			p := &s.Preload
			if p.Force == nil && p.NutTurn == nil {
				p.Fraction = ptr(1.0)
			}
		}},
		{"load.increments", "40", func(s *Spec) { s.Load.Increments = 40 }},
		{"load.stop_drop", "0.2", func(s *Spec) { s.Load.StopDrop = 0.2 }},
		{"load.end_rotation", `"free"`, func(s *Spec) { s.Load.EndRotation = rotationFree }},
		{"load.service_force", "40 % of the hand-method ultimate load, set by the analysis", nil},
		{"load.design_force", "none", nil},
		{"mesh.size", "t/3 rounded to whole mm, at least 1 mm", func(s *Spec) { s.Mesh.Size = defaultMeshSize(s.Shell.Thickness) }},
		{"mesh.refine", "0.3", func(s *Spec) { s.Mesh.Refine = 0.3 }},
		{"mesh.element", `"quad8"`, func(s *Spec) { s.Mesh.Element = elementQuad8 }},
		{"analysis.plane", `"stress"`, func(s *Spec) { s.Analysis.Plane = planeStress }},
		{"analysis.large_deformation", "false", nil},
		{"analysis.ring_springs", "true", func(s *Spec) { s.Analysis.RingSprings = true }},
		{"fatigue.gamma_mf", "1.15", func(s *Spec) { s.Fatigue.GammaMf = 1.15 }},
		{"analysis.materials", `"elastoplastic"`, func(s *Spec) { s.Analysis.Materials = elastoplastic }},
		{"analysis.bolt_strength", `"minimum"`, func(s *Spec) { s.Analysis.BoltStrength = boltMinimum }},
		{"analysis.damage_alpha_steel", "≈ 2.10 (from a 50 % reduction of area)", func(s *Spec) { defaultDamage(&s.Analysis.DamageAlphaSteel, material.StructuralSteelDamage().Alpha) }},
		{"analysis.damage_beta_steel", "1.5", func(s *Spec) { defaultDamage(&s.Analysis.DamageBetaSteel, material.StructuralSteelDamage().Beta) }},
		{"analysis.damage_alpha_bolt", "≈ 1.76 (from a 44 % reduction of area)", func(s *Spec) { defaultDamage(&s.Analysis.DamageAlphaBolt, material.BoltSteelDamage().Alpha) }},
		{"analysis.damage_beta_bolt", "1.5", func(s *Spec) { defaultDamage(&s.Analysis.DamageBetaBolt, material.BoltSteelDamage().Beta) }},
		{"analysis.necking_weight", "0.5", func(s *Spec) {
			if s.Analysis.NeckingWeight == nil {
				s.Analysis.NeckingWeight = ptr(0.5)
			}
		}},
	}
}

func defaultDamage(v *float64, d float64) {
	if *v == 0 {
		*v = d
	}
}

// fillDefaults sets every key the file did not give to its default.
func (s *Spec) fillDefaults(given map[string]bool) {
	for _, k := range keyDefaults() {
		if k.set != nil && !given[k.key] {
			k.set(s)
		}
	}
}

// defaultMeshSize is t/3 rounded to whole mm: three elements through the
// shell, at least 1 mm.
func defaultMeshSize(t float64) float64 {
	if !(t > 0) || math.IsInf(t, 0) {
		return 1
	}
	return math.Max(1, math.Round(t/3))
}

func ptr[T any](x T) *T { return &x }

// thread returns the bolt's thread from its size or its diameter and pitch.
func (s *Spec) thread() (bolt.Thread, error) {
	if s.Bolt.Size != "" {
		return bolt.CoarseThread(s.Bolt.Size)
	}
	if s.Bolt.Diameter == nil || s.Bolt.Pitch == nil {
		return bolt.Thread{}, errors.New("no bolt size, or no diameter and pitch")
	}
	return bolt.Thread{D: *s.Bolt.Diameter, Pitch: *s.Bolt.Pitch}, nil
}

// Built-in materials: structural steels and bolt grades, E and ν of steel.
const (
	steelE  = 210000.0 // MPa
	steelNu = 0.3
)

func builtinSteels() []string { return []string{"S235", "S275", "S355", "S420", "S460"} }

// steelYield returns the minimum yield strength R_eH (MPa) of a structural
// steel grade at nominal thickness t (mm), for t ≤ 150 mm.
//
// Source: EN 10025-2 for S235–S355; EN 10025-3/-4 for S420 and S460 (those
// two rows from memory), as ../shared/CHECKS.md tabulates them.
func steelYield(grade string, thickness float64) (float64, error) {
	var row [6]float64 // t ≤ 16, ≤ 40, ≤ 63, ≤ 80, ≤ 100, ≤ 150 mm
	switch grade {
	case "S235":
		row = [6]float64{235, 225, 215, 215, 215, 195}
	case "S275":
		row = [6]float64{275, 265, 255, 245, 235, 225}
	case "S355":
		row = [6]float64{355, 345, 335, 325, 315, 295}
	case "S420":
		row = [6]float64{420, 400, 390, 370, 360, 340}
	case "S460":
		row = [6]float64{460, 440, 430, 410, 400, 385}
	default:
		return 0, fmt.Errorf("steel grade %q: not one of %s", grade, strings.Join(builtinSteels(), ", "))
	}
	if !(thickness > 0) {
		return 0, fmt.Errorf("steel %s: thickness %s mm: must be > 0", grade, fnum(thickness))
	}
	for i, limit := range [6]float64{16, 40, 63, 80, 100, 150} {
		if thickness <= limit {
			return row[i], nil
		}
	}
	return 0, fmt.Errorf("steel %s: thickness %s mm: beyond the yield table (t ≤ 150 mm)", grade, fnum(thickness))
}

// materialInfo is what the model needs of a named material.
type materialInfo struct {
	E, Nu float64
	Yield float64 // f_y, MPa; 0 for a linear elastic material
	User  bool    // defined in [materials]
}

// material looks a name up, first in [materials], then among the built-in
// steels (yield strength at the given thickness) and the bolt grades.
func (s *Spec) material(name string, thickness float64) (materialInfo, error) {
	if m, ok := s.Materials[name]; ok {
		info := materialInfo{E: m.E, Nu: m.Nu, User: true}
		if len(m.Curve) > 0 && len(m.Curve[0]) == 2 {
			info.Yield = m.Curve[0][1]
		}
		return info, nil
	}
	if g, err := bolt.NominalGrade(name); err == nil {
		return materialInfo{E: steelE, Nu: steelNu, Yield: g.Fyb}, nil
	}
	fy, err := steelYield(name, thickness)
	if err != nil {
		return materialInfo{}, err
	}
	return materialInfo{E: steelE, Nu: steelNu, Yield: fy}, nil
}

// Derived holds the quantities that follow from a valid Spec, in mm, mm²,
// N, MPa and N/mm³.
type Derived struct {
	D           float64 // d, bolt diameter
	Pitch       float64 // P, thread pitch
	StressArea  float64 // A_s = π/4·((d₂ + d₃)/2)² (ISO 898-1)
	NominalArea float64 // A = π·d²/4
	Fub, Fyb    float64 // f_ub, f_yb, nominal (EN 1993-1-8 Table 3.1)

	DesignPreload float64 // F_p,C = 0.7·f_ub·A_s (EN 1993-1-8, 3.9)
	YieldForce    float64 // A_s·f_yb, the preload's upper bound

	// PreloadForce is the target F_p for a preload given as force or
	// fraction; 0 for a nut turn, which gives PreloadShortening instead
	// (angle/360·P) and leaves the force to the analysis.
	PreloadForce      float64
	PreloadShortening float64

	BoltCircleRadius float64 // R_b = D/2 − b
	SegmentWidth     float64 // c = 2π·R_b/n
	ClampLength      float64 // l_k = 2(t_f + t_w)
	ThreadInClamp    float64 // loaded thread inside the clamp: l_k (full) or thread_length
	ShankInClamp     float64 // l_k − ThreadInClamp

	// Out-of-plane thicknesses of the strip model's regions.
	ShellStrip    float64 // shell: c
	FlangeStrip   float64 // flange away from the hole: c
	HoleBandStrip float64 // flange band |x| < d_h/2: c − d_h
	BoltWidth     float64 // in-plane width of the bolt strip, h = (√3/2)·d
	ShankStrip    float64 // A/h: the shank's area and second moment of area
	ThreadStrip   float64 // A_s/h
	BearingStrip  float64 // head, nut, washers: t_b = π(d_w² − d_h²)/(4(d_w − d_h))

	ShellYield  float64 // f_y of the shell at t, MPa; 0 if linear elastic
	FlangeYield float64 // f_y of the flange at t_f, MPa; 0 if linear elastic

	RingSpring        float64 // E·t/R² per unit wall area, R = D/2, N/mm³
	DecayLength       float64 // 1/β, β = [3(1−ν²)/(R²t²)]^¼
	ThreeDecayLengths float64 // 3/β: a longer stub makes the end condition irrelevant

	Warnings []string
}

// derive computes the derived quantities of a valid Spec; on a Spec that
// failed validation its values are meaningless (but it does not panic).
func (s *Spec) derive() Derived {
	var d Derived
	th, _ := s.thread()
	d.D, d.Pitch = th.D, th.Pitch
	d.StressArea, d.NominalArea = th.StressArea(), th.NominalArea()
	g, _ := bolt.NominalGrade(s.Bolt.Grade)
	d.Fub, d.Fyb = g.Fub, g.Fyb
	d.DesignPreload = bolt.DesignPreload(d.StressArea, d.Fub)
	d.YieldForce = d.StressArea * d.Fyb
	s.derivePreload(&d)
	s.deriveGeometry(&d)
	s.deriveShell(&d)
	d.Warnings = s.warnings(d)
	return d
}

func (s *Spec) derivePreload(d *Derived) {
	p := s.Preload
	switch {
	case p.Force != nil:
		d.PreloadForce = *p.Force
	case p.Fraction != nil:
		d.PreloadForce = *p.Fraction * d.DesignPreload
	case p.NutTurn != nil:
		d.PreloadShortening = *p.NutTurn / 360 * d.Pitch
	}
}

func (s *Spec) deriveGeometry(d *Derived) {
	b := s.Bolt
	d.BoltCircleRadius = s.Tower.Diameter/2 - s.Flange.B
	if s.Tower.Bolts > 0 {
		d.SegmentWidth = 2 * math.Pi * d.BoltCircleRadius / float64(s.Tower.Bolts)
	}
	d.ClampLength = 2 * (s.Flange.Thickness + b.WasherThickness)
	d.ThreadInClamp = d.ClampLength
	if b.Thread == threadPartial && b.ThreadLength != nil {
		d.ThreadInClamp = *b.ThreadLength
	}
	d.ShankInClamp = d.ClampLength - d.ThreadInClamp

	d.ShellStrip, d.FlangeStrip = d.SegmentWidth, d.SegmentWidth
	d.HoleBandStrip = d.SegmentWidth - b.Hole
	// h² = 12·I/A = 0.75·d² gives the strip the round bar's A and I at once.
	d.BoltWidth = math.Sqrt(3) / 2 * d.D
	if d.BoltWidth > 0 {
		d.ShankStrip = d.NominalArea / d.BoltWidth
		d.ThreadStrip = d.StressArea / d.BoltWidth
	}
	// The annulus π/4·(d_w² − d_h²) spread evenly over the two bearing
	// lines of total length d_w − d_h.
	if dw, dh := b.WasherOuter, b.Hole; dw > dh {
		d.BearingStrip = math.Pi * (dw*dw - dh*dh) / (4 * (dw - dh))
	}
}

func (s *Spec) deriveShell(d *Derived) {
	shell, _ := s.material(s.Shell.Material, s.Shell.Thickness)
	flange, _ := s.material(s.Flange.Material, s.Flange.Thickness)
	d.ShellYield, d.FlangeYield = shell.Yield, flange.Yield
	r, t := s.Tower.Diameter/2, s.Shell.Thickness
	if r > 0 && t > 0 {
		d.RingSpring = shell.E * t / (r * r)
		beta := math.Pow(3*(1-shell.Nu*shell.Nu)/(r*r*t*t), 0.25)
		d.DecayLength = 1 / beta
		d.ThreeDecayLengths = 3 / beta
	}
}

// warnings lists what is valid but deserves a second look.
func (s *Spec) warnings(d Derived) []string {
	var w []string
	add := func(format string, args ...any) { w = append(w, fmt.Sprintf(format, args...)) }
	if s.Analysis.RingSprings && s.Shell.Length < d.ThreeDecayLengths {
		add("shell.length = %s mm is shorter than 3/β = %.0f mm: the end condition will influence the prying force",
			fnum(s.Shell.Length), d.ThreeDecayLengths)
	}
	if !s.Analysis.RingSprings {
		add("analysis.ring_springs = false: without the ring's hoop stiffness the end condition (load.end_rotation = %q) decides how much moment the shell carries, and with it the prying force and the ultimate load",
			s.Load.EndRotation)
	}
	if s.Contact.Recess > 0 && len(s.Contact.Zones) == 0 {
		add("contact.recess = %s mm has no effect: there are no contact.zones, so the whole face touches", fnum(s.Contact.Recess))
	}
	for i, z := range s.Contact.Zones {
		if z.From >= -s.Bolt.Hole/2 && z.To <= s.Bolt.Hole/2 {
			add("contact.zones[%d] = [%s, %s] lies inside the bolt hole |x| < %s mm and touches nothing",
				i, fnum(z.From), fnum(z.To), fnum(s.Bolt.Hole/2))
		}
	}
	if s.Mesh.Size > s.Shell.Thickness/2 {
		add("mesh.size = %s mm gives fewer than two elements through the shell thickness t = %s mm",
			fnum(s.Mesh.Size), fnum(s.Shell.Thickness))
	}
	for _, name := range sortedNames(s.Materials) {
		if isBuiltin(name) {
			add("[materials.%s] replaces the built-in material of that name", toml.Key{name}.String())
		}
		if !s.uses(name) {
			add("[materials.%s] is defined but not used", toml.Key{name}.String())
		}
	}
	return w
}

func isBuiltin(name string) bool {
	_, err := bolt.NominalGrade(name)
	return err == nil || isSteel(name)
}

func isSteel(name string) bool {
	for _, n := range builtinSteels() {
		if n == name {
			return true
		}
	}
	return false
}

// uses reports whether a material key names the material.
func (s *Spec) uses(name string) bool {
	return s.Shell.Material == name || s.Flange.Material == name || s.Bolt.Material == name
}

// resolvedTOML writes the model with every default filled in; decodeSpec
// reads it back to an equal Spec.
func (s *Spec) resolvedTOML() ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("# flangeseg model with every default filled in (lengths mm, forces N, stresses MPa, angles degrees)\n")
	enc := toml.NewEncoder(&b)
	enc.Indent = ""
	if err := enc.Encode(s); err != nil {
		return nil, fmt.Errorf("write the resolved model: %w", err)
	}
	return b.Bytes(), nil
}

// fnum formats a number the shortest way that reads back exactly, without
// an exponent for the sizes a model has.
func fnum(x float64) string {
	if a := math.Abs(x); x == 0 || (a >= 1e-6 && a < 1e15) {
		return strconv.FormatFloat(x, 'f', -1, 64)
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}
