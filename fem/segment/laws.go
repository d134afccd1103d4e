package segment

import (
	"fmt"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/material"
	"flangeseg/mesh"
)

// Each part gets its own law even where shell and flange share a grade:
// the yield strength of a built-in steel depends on the plate thickness
// (EN 10025-2), so the mesh regions carry the part in their material name.
func partMaterials(s *modelfile.Spec) mesh.FlangeMaterials {
	return mesh.FlangeMaterials{
		Shell:  "shell " + s.Shell.Material,
		Flange: "flange " + s.Flange.Material,
		Bolt:   "bolt " + s.BoltMaterial(),
	}
}

// lawsOf returns the law of every part, keyed as partMaterials names them.
func lawsOf(s *modelfile.Spec) (map[string]material.Law, error) {
	parts := partMaterials(s)
	laws := map[string]material.Law{}
	for _, p := range []struct {
		key, name string
		thickness float64
		bolt      bool
	}{
		{parts.Shell, s.Shell.Material, s.Shell.Thickness, false},
		{parts.Flange, s.Flange.Material, s.Flange.Thickness, false},
		{parts.Bolt, s.BoltMaterial(), 0, true},
	} {
		law, err := law(s, p.name, p.thickness, p.bolt)
		if err != nil {
			return nil, fmt.Errorf("material %s: %w", p.name, err)
		}
		laws[p.key] = law
	}
	return laws, nil
}

// law is the constitutive law of a material name: linear elastic when the
// analysis asks for it or a [materials] entry has no curve; otherwise von
// Mises plasticity (material.J2) on the entry's curve, the steel grade's
// curve at the plate thickness t (EN 10025-2), or the bolt property
// class's curve (ISO 898-1 minimum or EN 1993-1-8 nominal values), with
// the ductile damage indicator of its family.
func law(s *modelfile.Spec, name string, t float64, bolt bool) (material.Law, error) {
	info, err := s.Material(name, t)
	if err != nil {
		return nil, err
	}
	el := material.Elastic{E: info.E, Nu: info.Nu}
	if s.Analysis.Materials == modelfile.ElasticOnly {
		return el, nil
	}
	necking := material.DefaultNecking()
	if w := s.Analysis.NeckingWeight; w != nil {
		necking.Weight = *w
	}
	alpha, beta := s.Analysis.DamageAlphaSteel, s.Analysis.DamageBetaSteel
	if bolt {
		alpha, beta = s.Analysis.DamageAlphaBolt, s.Analysis.DamageBetaBolt
	}
	damage, err := material.NewDuctileDamage(alpha, beta)
	if err != nil {
		return nil, err
	}
	var h material.Hardening
	switch m, user := s.Materials[name]; {
	case user && len(m.Curve) == 0:
		return el, nil
	case user:
		kind, err := material.ParseCurveKind(m.CurveKind)
		if err != nil {
			return nil, err
		}
		pts := make([][2]float64, len(m.Curve))
		for i, p := range m.Curve {
			pts[i] = [2]float64{p[0], p[1]}
		}
		if h, err = material.HardeningFromCurve(info.E, pts, kind, necking); err != nil {
			return nil, err
		}
	case bolt:
		values := material.BoltMinimum
		if s.Analysis.BoltStrength == modelfile.BoltNominal {
			values = material.BoltNominal
		}
		st, err := material.BoltStrength(name, values)
		if err != nil {
			return nil, err
		}
		if h, err = st.Hardening(info.E, necking); err != nil {
			return nil, err
		}
	default:
		st, err := material.SteelStrength(name, t)
		if err != nil {
			return nil, err
		}
		if h, err = st.Hardening(info.E, necking); err != nil {
			return nil, err
		}
	}
	return material.NewJ2(el, h, damage)
}
