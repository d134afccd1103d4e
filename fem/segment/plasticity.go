package segment

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"flangeseg/fem"
	"flangeseg/material"
	"flangeseg/post/handcalc"
)

// A site is a part of the joint where a failure mechanism can form, with
// the regions of the strip model that make it up.
type site struct {
	name    string // as the mechanism names it
	regions []string
}

// The names of the failure sites. The flange hinge is told apart by where
// its cut lies: nearer the bolt (Petersen's mode C hinge across the hole)
// or nearer the shell (the junction hinge of modes B and C in its flange
// site).
const (
	siteThread       = "bolt thread"
	siteShank        = "bolt shank"
	siteShell        = "plastic hinge in the shell"
	siteFlangeBolt   = "plastic hinge in the flange at the bolt line"
	siteFlangeJoint  = "plastic hinge in the flange at the shell"
	flangeSiteRegion = "flange"
)

// sites of the failure mechanisms: the bolt (thread or shank; head, nut
// and washers are bearing parts, not a failure site), the shell hinge and
// the flange hinge (Petersen's modes A, B and C combine them). The flange
// site's name is settled per cut (siteFlangeBolt or siteFlangeJoint).
var sites = []site{
	{siteThread, []string{"bolt_thread"}},
	{siteShank, []string{"bolt_shank", "bolt_preload"}},
	{siteShell, []string{"upper_shell", "lower_shell"}},
	{flangeSiteRegion, []string{"upper_flange", "upper_flange_hole", "lower_flange", "lower_flange_hole"}},
}

// The thresholds of the mechanism: a site takes part when its largest
// equivalent plastic strain reaches mechanismStrain; the thread or the
// shank of the bolt also needs at least mechanismShare of the other's, so
// that the part which necks is named, not one that merely yielded. A hinge
// or a necking bolt strains by several per cent where it forms; 0.5 % is
// well past local yielding at a notch. Hinges are not weighed against the
// bolt: a bolt necks to tens of per cent where a formed hinge strains a
// few, and the hinge reading (through the depth of a cut) already keeps
// local yielding out.
const (
	mechanismStrain = 0.005
	mechanismShare  = 1.0 / 3
)

// A plastic hinge is a cut across shell or flange that has yielded through
// most of its depth: a corner that yields alone (the prying pivot at the
// free edge, the hole edge under the washer) is local and carries on. A
// point counts as yielded from yieldedStrain on; a cut is a hinge when the
// yielded points cover hingeDepth of its depth, and it has at least
// cutPoints points (so a cut through a single distorted element does not
// count).
const (
	yieldedStrain = 0.001
	hingeDepth    = 0.75
	cutPoints     = 3
)

// cutKey names a cut across a hinge site: a flange column at x, or a shell
// row at z, in the upper or lower body (reference coordinates).
type cutKey struct {
	site  string
	upper bool
	at    float64
}

// cutPoint is an integration point on a cut: its position across the
// part's depth and its equivalent plastic strain.
type cutPoint struct{ depth, strain float64 }

// hingeStrain returns the largest plastic strain on a cut if the cut has
// yielded through hingeDepth of its depth, else 0. Each point stands for
// the depth between the midpoints to its neighbours.
func hingeStrain(pts []cutPoint) float64 {
	if len(pts) < cutPoints {
		return 0
	}
	sort.Slice(pts, func(i, j int) bool { return pts[i].depth < pts[j].depth })
	n := len(pts)
	var total, yielded, largest float64
	for i, p := range pts {
		lo, hi := p.depth, p.depth
		if i > 0 {
			lo = (pts[i-1].depth + p.depth) / 2
		} else {
			lo = p.depth - (pts[1].depth-p.depth)/2
		}
		if i < n-1 {
			hi = (p.depth + pts[i+1].depth) / 2
		} else {
			hi = p.depth + (p.depth-pts[n-2].depth)/2
		}
		total += hi - lo
		if p.strain >= yieldedStrain {
			yielded += hi - lo
		}
		largest = math.Max(largest, p.strain)
	}
	if total <= 0 || yielded < hingeDepth*total {
		return 0
	}
	return largest
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
	cuts := map[cutKey][]cutPoint{}
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
			name, ok := siteOf[region.Name]
			switch {
			case !ok:
			case name == siteShell:
				k := cutKey{name, p.Z > 0, roundCut(p.Z)}
				cuts[k] = append(cuts[k], cutPoint{p.X, ep})
			case name == flangeSiteRegion:
				k := cutKey{g.flangeSite(p.X), p.Z > 0, roundCut(p.X)}
				cuts[k] = append(cuts[k], cutPoint{p.Z, ep})
			default: // the bolt: it necks where it yields most
				ps.site[name] = math.Max(ps.site[name], ep)
				if d > ps.boltDamage {
					ps.boltDamage, ps.boltDamageWhere = d, name
				}
			}
		}
	}
	for k, c := range cuts {
		if h := hingeStrain(c); h > 0 {
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
		return siteFlangeBolt
	}
	return siteFlangeJoint
}

// mechanism names the failure mechanism from the largest plastic strain per
// site (hinges through the depth of a cut, see hingeStrain), with the
// Petersen mode it matches ("" if none); prying is the ratio of bolt force
// to segment force at the end, which tells a bolt failing alone (mode A,
// no prying, F_s ≈ Z) from one failing under prying with no hinge formed,
// a case the three modes do not name. The junction hinge of modes B and C
// is the shell hinge or the flange hinge at the shell, whichever formed;
// mode C's second hinge is the flange hinge at the bolt line.
func mechanism(site map[string]float64, prying float64) (string, handcalc.Mode) {
	lead, boltLead := 0.0, math.Max(site[siteThread], site[siteShank])
	var parts []string
	for _, name := range []string{siteThread, siteShank, siteShell, siteFlangeBolt, siteFlangeJoint} {
		v := site[name]
		lead = math.Max(lead, v)
		isBolt := name == siteThread || name == siteShank
		if v >= mechanismStrain && (!isBolt || v >= mechanismShare*boltLead) {
			parts = append(parts, name)
		}
	}
	if len(parts) == 0 {
		return fmt.Sprintf("no mechanism formed: largest plastic strain at a failure site %.2g %% (a hinge: a cut yielded through %.0f %% of its depth)", 100*lead, 100*hingeDepth), ""
	}
	sort.SliceStable(parts, func(i, j int) bool { return site[parts[i]] > site[parts[j]] })
	has := map[string]bool{}
	for _, p := range parts {
		has[p] = true
	}
	bolt := has[siteThread] || has[siteShank]
	junction := has[siteShell] || has[siteFlangeJoint]
	boltLine := has[siteFlangeBolt]
	var mode handcalc.Mode
	note := ""
	switch {
	case junction && boltLine:
		mode = handcalc.ModeC
	case bolt && junction:
		mode = handcalc.ModeB
	case bolt && !boltLine && prying <= 1.1:
		mode = handcalc.ModeA
	case bolt && boltLine:
		note = " (bolt failure with a flange hinge at the bolt line and none at the junction: not one of Petersen's modes)"
	case bolt:
		note = fmt.Sprintf(" (bolt failure under prying, F_s/Z = %.2f, before a hinge formed)", prying)
	}
	if mode != "" {
		note = fmt.Sprintf(" (Petersen mode %s)", mode)
	}
	var b strings.Builder
	for i, p := range parts {
		if i > 0 {
			b.WriteString(" + ")
		}
		fmt.Fprintf(&b, "%s (ε̄p %.1f %%)", p, 100*site[p])
	}
	return b.String() + note, mode
}
