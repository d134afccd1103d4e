package segment

// The words for a tension stage that stops because the joint itself has
// no stiffness left: a zone that yields on while the segment force falls
// (a neck in the shell, a necking bolt, a hinge mechanism that softens
// under large deformation).

import (
	"errors"
	"fmt"
	"strings"

	"flangeseg/fem"
	"flangeseg/fem/segment/figures"
)

// tensionPath is what the tension stage had done when it stopped: its
// rows (the preload row first) and the point whose plastic strain grew
// most in the last increment (found: one grew).
type tensionPath struct {
	rows   []figures.Row
	giving yielding
	found  bool
}

// givesWay reports whether a failed solve of the tension stage is the
// joint giving way while a zone yields on: the tangent lost positive
// definiteness, or the steps shrank to nothing while the segment force
// was falling from its peak. Without yielding (elastic laws) that tells
// nothing about where, and the general words serve; steps that shrink
// while the force still rises are the solver's trouble, not the joint's.
func (p *tensionPath) givesWay(nc *fem.NotConvergedError, err error) bool {
	if p == nil || !p.found || len(p.tension()) == 0 {
		return false
	}
	var re *fem.RampError
	stalled := errors.As(err, &re) && re.Stalled
	return nc.Indefinite || stalled && p.rows[len(p.rows)-1].Z < p.peak().Z
}

// tension returns the rows of the tension stage.
func (p *tensionPath) tension() []figures.Row {
	var out []figures.Row
	for _, r := range p.rows {
		if r.Stage == "tension" {
			out = append(out, r)
		}
	}
	return out
}

// peak returns the tension row with the largest segment force.
func (p *tensionPath) peak() figures.Row {
	rows := p.tension()
	best := rows[0]
	for _, r := range rows[1:] {
		if r.Z > best.Z {
			best = r
		}
	}
	return best
}

// turnsBack reports whether the force–displacement path was turning
// back when the run stopped: the segment force fell over the last
// increment more steeply than snapBackSlope times the joint's first
// stiffness in tension. Displacement control cannot follow a path that
// turns back (a snap-back): the rest of the joint, unloading elastically,
// gives back more length than the yielding zone takes up.
func (p *tensionPath) turnsBack() bool {
	rows := p.rows
	n := len(rows)
	if n < 3 || rows[1].U <= rows[0].U || rows[n-1].U <= rows[n-2].U {
		return false
	}
	first := (rows[1].Z - rows[0].Z) / (rows[1].U - rows[0].U)
	last := (rows[n-1].Z - rows[n-2].Z) / (rows[n-1].U - rows[n-2].U)
	return first > 0 && last < -snapBackSlope*first
}

// snapBackSlope: a fall ten times steeper than the joint's first
// stiffness is a path close to vertical, where it turns back; a joint
// that merely softens falls at a fraction of that.
const snapBackSlope = 10

// givingWay says how the solve failed, where the joint gives way and what
// the path did. The place is the point whose plastic strain grew most in
// the last increment, not the largest out-of-balance force of the last
// try (a step barely off the converged state has only rounding-level
// forces, anywhere) nor the failing pivot (where the elimination order
// noticed the lost stiffness).
func (g *segment) givingWay(p *tensionPath, nc *fem.NotConvergedError, err error) string {
	var b strings.Builder
	b.WriteString(lastTry(nc, err, g.spec.Load.MaxDisplacement/float64(g.spec.Load.Increments)))
	y := p.giving
	part, _, _ := g.partOf(y.region)
	fmt.Fprintf(&b, " The joint has no stiffness left against more end displacement: it gives way in the %s at x = %.1f, z = %.1f mm, where the equivalent plastic strain grew most in the last increment (by %.2g %% to %.3g %%).",
		part, y.x, y.z, 100*y.increase, 100*y.strain)
	peak, last := p.peak(), p.rows[len(p.rows)-1]
	if last.Z >= peak.Z {
		fmt.Fprintf(&b, " The segment force, %.1f kN, is at its largest: a limit point of the force–displacement curve.", last.Z/1e3)
		return b.String()
	}
	fmt.Fprintf(&b, " Since its peak of %.1f kN at u = %.4g mm the segment force fell to %.1f kN while the end moved on by %.2g mm",
		peak.Z/1e3, peak.U, last.Z/1e3, last.U-peak.U)
	if p.turnsBack() {
		b.WriteString(": the force–displacement path turns back on itself (the rest of the joint, unloading elastically, gives back more length than the yielding zone takes up), so no state lies at a larger end displacement.")
	} else {
		b.WriteString(".")
	}
	return b.String()
}

// lastTry says how small a step still failed (nominal: the nominal
// increment, mm) and what its Newton iterations did.
func lastTry(nc *fem.NotConvergedError, err error, nominal float64) string {
	var b strings.Builder
	var re *fem.RampError
	switch {
	case errors.As(err, &re) && re.Stalled:
		fmt.Fprintf(&b, "The increments had shrunk from %.3g mm to steps of %.2g mm, and even that found none: ", nominal, re.Step)
	case re != nil:
		fmt.Fprintf(&b, "Even a step of %.2g mm (the increment halved %d times) found none: ", re.Step, re.Cuts)
	}
	switch {
	case nc.Indefinite && nc.Iterations == 0:
		fmt.Fprintf(&b, "the last try stopped at its first Newton iteration, with a relative out-of-balance force of %.2g (equilibrium means below 1e-7), because the tangent stiffness there is not positive definite.", nc.Residual)
	case nc.Indefinite:
		fmt.Fprintf(&b, "the last try stopped after %d Newton iterations (relative out-of-balance force from %.2g to %.2g at best, %.2g at the end; equilibrium means below 1e-7) on a tangent stiffness that is not positive definite.",
			nc.Iterations, nc.First, nc.Best, nc.Residual)
	default:
		fmt.Fprintf(&b, "in %d Newton iterations the relative out-of-balance force went from %.2g to %.2g at best and ended at %.2g (equilibrium means below 1e-7).",
			nc.Iterations, nc.First, nc.Best, nc.Residual)
	}
	return b.String()
}

// limitAdvice says what to try when the joint gives way: the peak is the
// model's answer; going on past it takes a different model, not a
// different solve. The necking condition is Considère's (A. Considère,
// Annales des Ponts et Chaussées, 1885): a bar in tension necks where
// the true stress–strain curve's slope falls to the stress.
func (g *segment) limitAdvice(p *tensionPath) string {
	peak := p.peak()
	tips := []string{fmt.Sprintf("read the largest segment force, %.1f kN at u = %.4g mm, as the model's ultimate load; more increments (load.increments) will not carry the run past it", peak.Z/1e3, peak.U)}
	part, key, value := g.partOf(p.giving.region)
	if key != "" {
		tips = append(tips, fmt.Sprintf("to follow the joint further, the material of the %s (%s = %q) must harden more: where the true curve's slope falls below its stress (dσ/dε < σ, Considère's criterion) a zone in tension necks under large deformation", part, key, value))
	}
	if p.turnsBack() {
		tips = append(tips, fmt.Sprintf("a shorter modelled wall (shell.length = %g mm) gives back less length as it unloads, so the path turns back later or not at all", g.spec.Shell.Length))
	}
	return strings.Join(tips, "; ") + "."
}

// partOf names a mesh region of the strip as the part the user knows,
// with the model-file key and value that set its material ("" where the
// region is not one of the strip's).
func (g *segment) partOf(region string) (part, key, value string) {
	s := g.spec
	bolt := func(name string) (string, string, string) {
		if s.Bolt.Material != "" {
			return name, "bolt.material", s.Bolt.Material
		}
		return name, "bolt.grade", s.Bolt.Grade
	}
	side, rest, sided := strings.Cut(region, "_")
	if sided && (side == "upper" || side == "lower") {
		switch rest {
		case "shell":
			return side + " shell", "shell.material", s.Shell.Material
		case "flange":
			return side + " flange", "flange.material", s.Flange.Material
		case "flange_hole":
			return side + " flange beside the bolt hole", "flange.material", s.Flange.Material
		}
	}
	switch region {
	case "bolt_thread":
		return bolt("bolt thread")
	case "bolt_shank", "bolt_preload":
		return bolt("bolt shank")
	case "bolt_head":
		return bolt("bolt head")
	case "nut":
		return bolt("nut")
	case "head_washer":
		return bolt("washer under the head")
	case "nut_washer":
		return bolt("washer under the nut")
	}
	return region, "", ""
}
