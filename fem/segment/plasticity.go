package segment

import (
	"fmt"
	"math"

	"flangeseg/fem"
	"flangeseg/fem/segment/figures"
	"flangeseg/material"
)

// cutKey names a cut across a hinge site: a flange column at x, or a shell
// row at z, in the upper or lower body (reference coordinates).
type cutKey struct {
	site  string
	upper bool
	at    float64
}

// pointScalars are the history values a state keeps per element and
// integration point: equivalent plastic strain and damage indicator.
type pointScalars struct {
	plastic, damage [][]float64
}

// plasticState reads equivalent plastic strain and damage from the
// integration points (nil without a path-dependent law), with the largest
// value per site and overall, and the largest damage in the bolt.
type plasticState struct {
	points             pointScalars
	site               map[string]float64 // largest ε̄_p per site name
	maxPlastic, maxDmg float64
	boltDamage         float64
	boltDamageWhere    string
	wallDamage         float64
	wallDamageWhere    string
}

// damageSite is where the largest damage of a wall was found.
type damageSite struct {
	region string
	x, z   float64
}

func (g *segment) readPlastic(pts [][]fem.PointResult) plasticState {
	var ps plasticState
	ps.site = map[string]float64{}
	siteOf := figures.SiteRegions()
	cuts := map[cutKey][]figures.CutPoint{}
	ps.points.plastic = make([][]float64, len(pts))
	ps.points.damage = make([][]float64, len(pts))
	var wall damageSite
	for e, pe := range pts {
		region := g.mesh.Regions[g.mesh.Elements[e].Region]
		law, ok := g.laws[region.Material].(material.History)
		if !ok {
			continue
		}
		ps.points.plastic[e] = make([]float64, len(pe))
		ps.points.damage[e] = make([]float64, len(pe))
		for ip, p := range pe {
			if p.History == nil {
				continue
			}
			ep, d := law.EquivalentPlasticStrain(p.History), law.Damage(p.History)
			ps.points.plastic[e][ip], ps.points.damage[e][ip] = ep, d
			ps.maxPlastic, ps.maxDmg = math.Max(ps.maxPlastic, ep), math.Max(ps.maxDmg, d)
			name, ok := siteOf[region.Name]
			if ok && (name == figures.SiteShell || name == figures.FlangeSite) && d > ps.wallDamage {
				ps.wallDamage, wall = d, damageSite{region.Name, p.X, p.Z}
			}
			switch {
			case !ok:
			case name == figures.SiteShell:
				k := cutKey{name, p.Z > 0, roundCut(p.Z)}
				cuts[k] = append(cuts[k], figures.CutPoint{Depth: p.X, Strain: ep})
			case name == figures.FlangeSite:
				k := cutKey{g.flangeSite(p.X), p.Z > 0, roundCut(p.X)}
				cuts[k] = append(cuts[k], figures.CutPoint{Depth: p.Z, Strain: ep})
			default: // the bolt: it necks where it yields most
				ps.site[name] = math.Max(ps.site[name], ep)
				if d > ps.boltDamage {
					ps.boltDamage, ps.boltDamageWhere = d, name
				}
			}
		}
	}
	if ps.wallDamage > 0 {
		part, _, _ := g.partOf(wall.region)
		ps.wallDamageWhere = fmt.Sprintf("%s at x = %.1f mm, z = %.1f mm", part, wall.x, wall.z)
	}
	for k, c := range cuts {
		if h := figures.HingeStrain(c); h > 0 {
			ps.site[k.site] = math.Max(ps.site[k.site], h)
		}
	}
	return ps
}

// roundCut rounds a coordinate so that the integration points of one row
// or column of rectangular elements share it.
func roundCut(v float64) float64 { return math.Round(v*1e6) / 1e6 }

// flangeSite names the flange hinge of a cut at x: at the bolt line when
// the cut is nearer the bolt axis than the shell's inner face, else at the
// shell.
func (g *segment) flangeSite(x float64) string {
	inner := g.spec.Flange.B - g.spec.Shell.Thickness/2
	if x < inner/2 {
		return figures.SiteFlangeBolt
	}
	return figures.SiteFlangeJoint
}

// yielding is the integration point whose equivalent plastic strain grew
// most in an increment: where the joint gives way when it loses its
// stiffness. The place of the largest strain would not do: the corners of
// the strip (the prying pivot, the washer edges) hold the largest strains
// from early on while a neck or hinge forms elsewhere.
type yielding struct {
	region   string  // mesh region of the point
	x, z     float64 // its reference position, mm
	strain   float64 // equivalent plastic strain at the end of the increment
	increase float64 // its growth in the increment
}

// fastestYielding compares the plastic strains of two states (before may
// be empty: everything grew from zero) and returns the point that grew
// most; ok is false where nothing grew.
func (g *segment) fastestYielding(before, now pointScalars, pts [][]fem.PointResult) (y yielding, ok bool) {
	for e, pe := range now.plastic {
		for ip, ep := range pe {
			grew := ep
			if e < len(before.plastic) && ip < len(before.plastic[e]) {
				grew -= before.plastic[e][ip]
			}
			if grew <= y.increase {
				continue
			}
			p := pts[e][ip]
			y = yielding{region: g.mesh.Regions[g.mesh.Elements[e].Region].Name, x: p.X, z: p.Z, strain: ep, increase: grew}
			ok = true
		}
	}
	return y, ok
}
