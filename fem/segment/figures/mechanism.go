package figures

import (
	"fmt"
	"math"
	"sort"
	"strings"

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
	SiteThread      = "bolt thread"
	SiteShank       = "bolt shank"
	SiteShell       = "plastic hinge in the shell"
	SiteFlangeBolt  = "plastic hinge in the flange at the bolt line"
	SiteFlangeJoint = "plastic hinge in the flange at the shell"
	FlangeSite      = "flange" // the flange before a cut settles which hinge it is
)

// sites of the failure mechanisms: the bolt (thread or shank; head, nut
// and washers are bearing parts, not a failure site), the shell hinge and
// the flange hinge (Petersen's modes A, B and C combine them). The flange
// site's name is settled per cut (SiteFlangeBolt or SiteFlangeJoint).
func sites() []site {
	return []site{
		{SiteThread, []string{"bolt_thread"}},
		{SiteShank, []string{"bolt_shank", "bolt_preload"}},
		{SiteShell, []string{"upper_shell", "lower_shell"}},
		{FlangeSite, []string{"upper_flange", "upper_flange_hole", "lower_flange", "lower_flange_hole"}},
	}
}

// SiteRegions maps each mesh region of the strip model that belongs to a
// failure site to the site's name (FlangeSite for the flange, whose cuts
// settle which flange hinge they are).
func SiteRegions() map[string]string {
	out := map[string]string{}
	for _, s := range sites() {
		for _, r := range s.regions {
			out[r] = s.name
		}
	}
	return out
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

// CutPoint is an integration point on a cut: its position across the
// part's depth and its equivalent plastic strain.
type CutPoint struct{ Depth, Strain float64 }

// HingeStrain returns the largest plastic strain on a cut if the cut has
// yielded through hingeDepth of its depth, else 0. Each point stands for
// the depth between the midpoints to its neighbours.
func HingeStrain(pts []CutPoint) float64 {
	if len(pts) < cutPoints {
		return 0
	}
	sort.Slice(pts, func(i, j int) bool { return pts[i].Depth < pts[j].Depth })
	n := len(pts)
	var total, yielded, largest float64
	for i, p := range pts {
		lo, hi := p.Depth, p.Depth
		if i > 0 {
			lo = (pts[i-1].Depth + p.Depth) / 2
		} else {
			lo = p.Depth - (pts[1].Depth-p.Depth)/2
		}
		if i < n-1 {
			hi = (p.Depth + pts[i+1].Depth) / 2
		} else {
			hi = p.Depth + (p.Depth-pts[n-2].Depth)/2
		}
		total += hi - lo
		if p.Strain >= yieldedStrain {
			yielded += hi - lo
		}
		largest = math.Max(largest, p.Strain)
	}
	if total <= 0 || yielded < hingeDepth*total {
		return 0
	}
	return largest
}

// Mechanism names the failure mechanism from the largest plastic strain per
// site (hinges through the depth of a cut, see HingeStrain), with the
// Petersen mode it matches ("" if none); prying is the ratio of bolt force
// to segment force at the end, which tells a bolt failing alone (mode A,
// no prying, F_s ≈ Z) from one failing under prying with no hinge formed,
// a case the three modes do not name. The junction hinge of modes B and C
// is the shell hinge or the flange hinge at the shell, whichever formed;
// mode C's second hinge is the flange hinge at the bolt line.
func Mechanism(site map[string]float64, prying float64) (string, handcalc.Mode) {
	lead, boltLead := 0.0, math.Max(site[SiteThread], site[SiteShank])
	var parts []string
	for _, name := range []string{SiteThread, SiteShank, SiteShell, SiteFlangeBolt, SiteFlangeJoint} {
		v := site[name]
		lead = math.Max(lead, v)
		isBolt := name == SiteThread || name == SiteShank
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
	bolt := has[SiteThread] || has[SiteShank]
	junction := has[SiteShell] || has[SiteFlangeJoint]
	boltLine := has[SiteFlangeBolt]
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
