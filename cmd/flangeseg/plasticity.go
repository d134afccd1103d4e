package main

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"flangeseg/fem"
	"flangeseg/material"
)

// A site is a part of the joint where a failure mechanism can form, with
// the regions of the strip model that make it up.
type site struct {
	name    string // as the mechanism names it
	regions []string
}

// sites of the failure mechanisms: the bolt (thread or shank; head, nut
// and washers are bearing parts, not a failure site), the shell hinge and
// the flange hinge (Petersen's modes A, B and C combine them).
var sites = []site{
	{"bolt thread", []string{"bolt_thread"}},
	{"bolt shank", []string{"bolt_shank", "bolt_preload"}},
	{"plastic hinge in the shell", []string{"upper_shell", "lower_shell"}},
	{"plastic hinge in the flange", []string{"upper_flange", "upper_flange_hole", "lower_flange", "lower_flange_hole"}},
}

// The thresholds of the mechanism: a site takes part when its largest
// equivalent plastic strain reaches mechanismStrain and at least
// mechanismShare of the largest site's. A hinge or a necking bolt strains
// by several per cent where it forms; 0.5 % is well past local yielding at
// a notch, a third of the leading site keeps incidental yielding out.
const (
	mechanismStrain = 0.005
	mechanismShare  = 1.0 / 3
)

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
}

func (g *segment) readPlastic(pts [][]fem.PointResult) plasticState {
	var ps plasticState
	ps.site = map[string]float64{}
	siteOf := map[string]string{}
	for _, s := range sites {
		for _, r := range s.regions {
			siteOf[r] = s.name
		}
	}
	ps.points.plastic = make([][]float64, len(pts))
	ps.points.damage = make([][]float64, len(pts))
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
			if name, ok := siteOf[region.Name]; ok {
				ps.site[name] = math.Max(ps.site[name], ep)
				if strings.HasPrefix(name, "bolt") && d > ps.boltDamage {
					ps.boltDamage, ps.boltDamageWhere = d, name
				}
			}
		}
	}
	return ps
}

// mechanism names the failure mechanism from the largest plastic strain per
// site, with the Petersen mode it matches; prying is the ratio of bolt
// force to segment force at the end, which tells a bolt failing alone
// (mode A, no prying, F_s ≈ Z) from one failing under prying with no
// hinge formed, a case the three modes do not name.
func mechanism(site map[string]float64, prying float64) string {
	lead := 0.0
	for _, v := range site {
		lead = math.Max(lead, v)
	}
	if lead < mechanismStrain {
		return fmt.Sprintf("no mechanism formed: largest plastic strain at a failure site %.2g %%", 100*lead)
	}
	var parts []string
	for _, s := range sites {
		if v := site[s.name]; v >= mechanismStrain && v >= mechanismShare*lead {
			parts = append(parts, s.name)
		}
	}
	sort.SliceStable(parts, func(i, j int) bool { return site[parts[i]] > site[parts[j]] })
	bolt, shell, flange := false, false, false
	for _, p := range parts {
		switch {
		case strings.HasPrefix(p, "bolt"):
			bolt = true
		case strings.Contains(p, "shell"):
			shell = true
		case strings.Contains(p, "flange"):
			flange = true
		}
	}
	mode := ""
	switch {
	case shell && flange:
		mode = " (Petersen mode C)"
	case bolt && shell:
		mode = " (Petersen mode B)"
	case bolt && !flange && prying <= 1.1:
		mode = " (Petersen mode A)"
	case bolt && !flange:
		mode = fmt.Sprintf(" (bolt failure under prying, F_s/Z = %.2f, before a hinge formed)", prying)
	}
	var b strings.Builder
	for i, p := range parts {
		if i > 0 {
			b.WriteString(" + ")
		}
		fmt.Fprintf(&b, "%s (ε̄p %.1f %%)", p, 100*site[p])
	}
	return b.String() + mode
}
