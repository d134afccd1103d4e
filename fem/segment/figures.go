package segment

import (
	"fmt"
	"math"

	"flangeseg/contact"
	"flangeseg/fem/segment/figures"
)

// jointFigures reads the joint figures and the failure mechanism off a
// run (package figures).
func jointFigures(g *segment, res *analysis) figures.Joint {
	// Both shell stubs stretch as bars, Z·L/(E·t·c) each.
	stub := 2 * g.spec.Shell.Length / (g.shellE * g.spec.Shell.Thickness * g.der.SegmentWidth)
	j := figures.Read(res.rows, figures.Input{PreloadTarget: g.der.PreloadForce, PreloadReached: res.preload.Force,
		PreloadEigenstrain: res.preload.Eigenstrain, Hand: g.hand, ServiceForce: g.spec.Load.ServiceForce,
		StubElongation: stub, Yielding: g.model.HasHistory()})
	j.Closure = g.closure(res)
	return j
}

// closure reads the face after preload for the models whose faces start
// apart (figures.Closure), and the bolt force the closing took from the
// states on the way to the preload (tightenInLevels).
func (g *segment) closure(res *analysis) *figures.Closure {
	if !g.facesStartApart() || len(res.states) == 0 || res.states[0].label != "preload" {
		return nil
	}
	out := &figures.Closure{}
	for _, n := range res.states[0].contacts["faces"] {
		if g.inZone(n.X) && n.Paired {
			out.InitialGapMM = math.Max(out.InitialGapMM, g.faceGap(n.X))
		}
	}
	out.GapLeftMM, out.GapLeftAtXMM = largestGapOf(res.states[0].contacts["faces"], g.inZone)
	if out.GapLeftMM > closedGap {
		out.Note = fmt.Sprintf("the preload leaves the faces %.3g mm apart at x = %.1f mm (initially up to %.3g mm apart)", out.GapLeftMM, out.GapLeftAtXMM, out.InitialGapMM)
	} else {
		out.Note = fmt.Sprintf("the preload closes the initial gap of up to %.3g mm", out.InitialGapMM)
	}
	if c, ok := closingForce(res.tightening, res.preload.Force, out.GapLeftMM); ok {
		out.ClosingForceKN = c.force / 1e3
		if res.preload.Force > 0 {
			out.ClosingShare = c.force / res.preload.Force
		}
		out.ClosingBetweenKN = []float64{c.from / 1e3, c.to / 1e3}
		out.Note += "; " + g.closingWords(c, res.preload.Force)
	}
	out.Note += "; a 2D strip has no neighbouring segments to hold the gap open, so a ring closes less of it for the same preload"
	return out
}

// closing is the bolt force the closing of the gap took, N, and the bolt
// forces of the two tightening states that bracket it.
type closing struct {
	force, from, to float64
	open            bool // the preload leaves the gap open: all of it went into closing
}

// closingForce reads the bolt force at which the largest gap inside the
// zones falls to closedGap off the tightening states, linearly in the gap
// between the last open state and the closed one after it (resolution:
// one tightening level). Where the preload leaves the gap open the whole
// preload went into closing it. ok is false without tightening states.
func closingForce(states []tighteningState, preload, gapLeft float64) (c closing, ok bool) {
	if len(states) < 2 {
		return closing{}, false
	}
	if gapLeft > closedGap {
		return closing{force: preload, from: preload, to: preload, open: true}, true
	}
	for i := len(states) - 1; i > 0; i-- {
		a, b := states[i-1], states[i]
		if a.gap > closedGap && b.gap <= closedGap {
			t := (a.gap - closedGap) / (a.gap - b.gap)
			return closing{force: a.force + t*(b.force-a.force), from: a.force, to: b.force}, true
		}
	}
	// Closed in every state noted, the unloaded one included: nothing to
	// close (a gap smaller than closedGap).
	return closing{}, true
}

// closingWords says what the closing took, at what resolution, and what
// a ring would need beside it.
func (g *segment) closingWords(c closing, preload float64) string {
	if c.open {
		return fmt.Sprintf("the whole preload of %.1f kN went into closing the gap", preload/1e3)
	}
	w := fmt.Sprintf("closing it took a bolt force of %.1f kN (%.0f %% of the preload), read linearly in the gap between the tightening levels with the shell end free at %.1f and %.1f kN",
		c.force/1e3, 100*c.force/preload, c.from/1e3, c.to/1e3)
	if g.spec.Contact.Taper == 0 {
		w += "; in the strip a parallel gap closes by a rigid approach of the two flanges, which takes almost no force, while a ring must also bend its neighbouring segments to close it"
	} else {
		w += "; in the strip that is the force of bending its own flanges and shell, while a ring must also bend its neighbouring segments"
	}
	return w
}

// largestGap is the largest gap between the faces inside the zones that
// are meant to touch, mm, and where it is, in the current state.
func (g *segment) largestGap(cur []contact.Point) (gap, x float64) {
	return largestGapOf(g.faces.NodeResults(cur), g.inZone)
}

// largestGapOf is the largest gap of the paired face nodes inside the
// zones (0 where every such node is closed).
func largestGapOf(nodes []contact.NodeResult, inZone func(x float64) bool) (gap, x float64) {
	for _, n := range nodes {
		if inZone(n.X) && n.Paired && n.Gap > gap {
			gap, x = n.Gap, n.X
		}
	}
	return gap, x
}

// closedGap is the gap (mm) below which a face counts as closed, as for
// the opening load.
const closedGap = 1e-3

// inZone reports whether x lies in a zone of the face that is meant to
// touch.
func (g *segment) inZone(x float64) bool {
	for _, z := range g.zones {
		if x >= z.x0 && x <= z.x1 {
			return true
		}
	}
	return false
}
