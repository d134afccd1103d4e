package segment

import (
	"errors"
	"fmt"
	"strings"

	"flangeseg/fem"
)

// diagnose puts a failed stage into the user's words: what happened,
// where, what the out-of-balance force did, and what to try. at describes
// the state the stage was leaving ("the preload", "increment 12 (u =
// 3.2 mm, Z = 410 kN)"); path is what the tension stage had done (nil for
// the preload).
func (g *segment) diagnose(stage, at string, err error, path *tensionPath) string {
	var nc *fem.NotConvergedError
	if !errors.As(err, &nc) {
		return fmt.Sprintf("The %s stage stopped after %s: %v.", stage, at, err)
	}
	var b strings.Builder
	fmt.Fprintf(&b, "The %s stage found no equilibrium for the step after %s. ", stage, at)
	if path.givesWay(nc, err) {
		b.WriteString(g.givingWay(path, nc, err))
		b.WriteString(" What to try: ")
		b.WriteString(g.limitAdvice(path))
		return b.String()
	}
	fmt.Fprintf(&b, "In %d Newton iterations the relative out-of-balance force went from %.2g to %.2g at best and ended at %.2g (equilibrium means below 1e-7).",
		nc.Iterations, nc.First, nc.Best, nc.Residual)
	if nc.Where != "" {
		fmt.Fprintf(&b, " The largest out-of-balance force, %.3g N, acted at %s.", nc.Largest, nc.Where)
	}
	for _, c := range nc.Cycling {
		fmt.Fprintf(&b, " %d contact points of the %s between x = %.1f and %.1f mm kept changing status (%s; %d changes in the later iterations).",
			c.Points, c.Pair, c.XMin, c.XMax, c.Between, c.Changes)
	}
	switch {
	case strings.Contains(nc.Reason, "not positive definite"):
		b.WriteString(" The tangent stiffness lost positive definiteness: the joint has no stiffness left against more load in this state (a mechanism of plastic hinges, a necking bolt, or a part held by nothing but contact). Near the peak this marks the model's ultimate load.")
	case strings.Contains(nc.Reason, "material point"), strings.Contains(nc.Reason, "point "):
		fmt.Fprintf(&b, " A material point found no stress for its strain (%s): the strain went past the end of its curve.", nc.Reason)
	}
	b.WriteString(" What to try: ")
	b.WriteString(g.advice(stage, nc))
	return b.String()
}

// advice suggests the keys to change after a failed solve.
func (g *segment) advice(stage string, nc *fem.NotConvergedError) string {
	var tips []string
	c := g.spec.Contact
	for _, cy := range nc.Cycling {
		switch cy.Pair {
		case "flange faces":
			tips = append(tips, "the faces' contact edge moved from iterate to iterate: a finer mesh along the face (mesh.size, mesh.refine) resolves it, and more increments (load.increments) move it less per step")
		default:
			tips = append(tips, "the washer bearing lifted and pressed in turn: check bolt.washer_outer against the hole and a finer mesh under the bolt (mesh.refine)")
		}
	}
	if stage == "preload" && (c.Taper != 0 || c.ParallelGap > 0) {
		tips = append(tips, fmt.Sprintf("the faces start apart (contact.taper = %g°, contact.parallel_gap = %g mm); in a 2D strip only the flanges' bending and the shell resist closing them, so a taper the preload cannot close leaves a joint that is not in equilibrium at all — check the imperfection against the fabrication tolerance, or model the joint with a smaller taper", c.Taper, c.ParallelGap))
	}
	if stage == "tension" {
		tips = append(tips, "more increments (load.increments); with yielding, a finer mesh where the plastic strain concentrates")
	}
	if len(tips) == 0 {
		tips = append(tips, "a finer mesh (mesh.size) and, in the tension stage, more increments (load.increments)")
	}
	return strings.Join(tips, "; ") + "."
}
