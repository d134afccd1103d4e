package segment

import (
	"fmt"
	"math"

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
// apart (figures.Closure).
func (g *segment) closure(res *analysis) *figures.Closure {
	c := g.spec.Contact
	if (c.Taper == 0 && c.ParallelGap == 0) || len(res.states) == 0 || res.states[0].label != "preload" {
		return nil
	}
	out := &figures.Closure{}
	for _, n := range res.states[0].contacts["faces"] {
		if !g.inZone(n.X) || !n.Paired {
			continue
		}
		out.InitialGapMM = math.Max(out.InitialGapMM, g.faceGap(n.X))
		if n.Gap > out.GapLeftMM {
			out.GapLeftMM, out.GapLeftAtXMM = n.Gap, n.X
		}
	}
	if out.GapLeftMM > closedGap {
		out.Note = fmt.Sprintf("the preload leaves the faces %.3g mm apart at x = %.1f mm (initially up to %.3g mm apart)", out.GapLeftMM, out.GapLeftAtXMM, out.InitialGapMM)
	} else {
		out.Note = fmt.Sprintf("the preload closes the initial gap of up to %.3g mm", out.InitialGapMM)
	}
	out.Note += "; a 2D strip has no neighbouring segments to hold the gap open, so a ring closes less of it for the same preload"
	return out
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
