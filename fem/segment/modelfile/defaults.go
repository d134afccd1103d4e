package modelfile

import (
	"fmt"
	"math"
	"sort"

	"flangeseg/material"
)

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

// KeyDefault is the value a key takes when the file leaves it out.
type KeyDefault struct {
	Key  string
	Text string      // the default, as --help states it
	set  func(*Spec) // nil when the zero value is the default or the key stays unset
}

// KeyDefaults lists the keys a file may leave out with their defaults, in
// the order --help states them.
func KeyDefaults() []KeyDefault {
	return []KeyDefault{
		{"title", `""`, nil},
		{"flange.neck_radius", "0 mm", nil},
		{"bolt.thread_length", `0.5·d (thread = "partial" only)`, func(s *Spec) {
			if th, err := s.Thread(); err == nil && s.Bolt.Thread == ThreadPartial {
				s.Bolt.ThreadLength = ptr(0.5 * th.D)
			}
		}},
		{"bolt.material", "the grade's own curve", nil},
		{"contact.friction", "0", nil},
		{"contact.zones", "none: the whole face touches", nil},
		{"contact.recess", "0 mm", nil},
		{"contact.recess_on", `"both"`, func(s *Spec) { s.Contact.RecessOn = RecessBoth }},
		{"contact.taper", "0°", nil},
		{"contact.parallel_gap", "0 mm", nil},
		{"contact.gap_spring", "0 N/mm: no spring (the strip alone resists closing a parallel gap)", nil},
		{"preload.fraction", "1.0 (F_p = F_p,C = 0.7·f_ub·A_s) when none of force, fraction, nut_turn is given", func(s *Spec) {
			p := &s.Preload
			if p.Force == nil && p.NutTurn == nil {
				p.Fraction = ptr(1.0)
			}
		}},
		{"load.increments", "40", func(s *Spec) { s.Load.Increments = 40 }},
		{"load.stop_drop", "0.2", func(s *Spec) { s.Load.StopDrop = 0.2 }},
		{"load.end_rotation", `"free"`, func(s *Spec) { s.Load.EndRotation = RotationFree }},
		{"load.service_force", "40 % of the hand-method ultimate load, set by the analysis", nil},
		{"load.design_force", "none", nil},
		{"mesh.size", "t/3 rounded to whole mm, at least 1 mm", func(s *Spec) { s.Mesh.Size = defaultMeshSize(s.Shell.Thickness) }},
		{"mesh.refine", "0.3", func(s *Spec) { s.Mesh.Refine = 0.3 }},
		{"mesh.element", `"quad8"`, func(s *Spec) { s.Mesh.Element = ElementQuad8 }},
		{"analysis.plane", `"stress"`, func(s *Spec) { s.Analysis.Plane = PlaneStress }},
		{"analysis.large_deformation", "false", nil},
		{"analysis.ring_springs", "true", func(s *Spec) { s.Analysis.RingSprings = true }},
		{"fatigue.gamma_mf", "1.15", func(s *Spec) { s.Fatigue.GammaMf = 1.15 }},
		{"output.field_states", `"key": the end of the preload, the opening, the decompression, the peak and the last state`, func(s *Spec) { s.Output.FieldStates = FieldStatesKey }},
		{"analysis.materials", `"elastoplastic"`, func(s *Spec) { s.Analysis.Materials = Elastoplastic }},
		{"analysis.bolt_strength", `"minimum"`, func(s *Spec) { s.Analysis.BoltStrength = BoltMinimum }},
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
	for _, k := range KeyDefaults() {
		if k.set != nil && !given[k.Key] {
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
