package segment

import (
	"errors"
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
// apart (figures.Closure), and the bolt force the closing took: the
// whole preload where the gap stays open, else what the closing search
// found (findClosing).
func (g *segment) closure(res *analysis) *figures.Closure {
	gapLeft, at, ok := g.gapAfterPreload(res)
	if !ok {
		return nil
	}
	out := &figures.Closure{GapLeftMM: gapLeft, GapLeftAtXMM: at}
	for _, n := range res.states[0].contacts["faces"] {
		if g.inZone(n.X) && n.Paired {
			out.InitialGapMM = math.Max(out.InitialGapMM, g.faceGap(n.X))
		}
	}
	if out.GapLeftMM > closedGap {
		out.Note = fmt.Sprintf("the preload leaves the faces %.3g mm apart at x = %.1f mm (initially up to %.3g mm apart)", out.GapLeftMM, out.GapLeftAtXMM, out.InitialGapMM)
	} else {
		out.Note = fmt.Sprintf("the preload closes the initial gap of up to %.3g mm", out.InitialGapMM)
	}
	preload := res.preload.Force
	c := closingForce(res.closing, preload, out.GapLeftMM)
	if c.missing == nil {
		force := c.force / 1e3
		out.ClosingForceKN = &force
		if preload > 0 {
			share := c.force / preload
			out.ClosingShare = &share
		}
		if !c.open && !c.none {
			out.ClosingBetweenKN = []float64{c.from / 1e3, c.to / 1e3}
		}
	}
	if res.closing.ran {
		k := res.closing.cost
		out.ClosingSearch = &figures.ClosingSearch{Levels: k.levels, NewtonIterations: k.iterations, StepHalvings: k.halvings}
	}
	out.Note += "; " + g.closingWords(c, preload)
	out.Note += "; a 2D strip has no neighbouring segments to hold the gap open, so a ring closes less of it for the same preload"
	return out
}

// gapAfterPreload is the largest gap inside the zones after the preload,
// and where it is, for a model whose faces start apart and whose preload
// converged (ok).
func (g *segment) gapAfterPreload(res *analysis) (gap, x float64, ok bool) {
	if !g.facesStartApart() || len(res.states) == 0 || res.states[0].label != "preload" {
		return 0, 0, false
	}
	gap, x = largestGapOf(res.states[0].contacts["faces"], g.inZone)
	return gap, x, true
}

// closing is the bolt force the closing of the gap took, N, and the bolt
// forces of the two levels of the closing search that bracket it.
type closing struct {
	force, from, to float64
	open            bool  // the preload leaves the gap open: all of it went into closing
	capped          bool  // the search closed the faces only past the preload reached
	none            bool  // the faces touched before any tightening: nothing to close
	missing         error // why no force was found
}

// closingForce is the bolt force the closing took: the whole preload where
// the gap stays open; else where the largest gap inside the zones of the
// closing search falls to closedGap, linearly in the gap between its last
// open level and the closed one after it (resolution: one level), at
// most the preload reached, at which the analysis had the faces closed.
func closingForce(search closingSearch, preload, gapLeft float64) closing {
	if gapLeft > closedGap {
		return closing{force: preload, from: preload, to: preload, open: true}
	}
	if !search.ran {
		return closing{missing: errors.New("no closing search ran")}
	}
	if search.failed != nil {
		return closing{missing: search.failed}
	}
	st := search.states
	n := len(st)
	if n == 0 || st[n-1].gap > closedGap {
		return closing{missing: errors.New("the closing search ended with the faces apart")}
	}
	if n == 1 {
		// Closed in the unloaded state: nothing to close (a gap smaller
		// than closedGap).
		return closing{none: true}
	}
	a, b := st[n-2], st[n-1]
	t := (a.gap - closedGap) / (a.gap - b.gap)
	c := closing{force: a.force + t*(b.force-a.force), from: a.force, to: b.force}
	if c.force > preload {
		c.force, c.capped = preload, true
	}
	return c
}

// closingWords says what the closing took, how it was found, at what
// resolution, and what a ring would need beside it.
func (g *segment) closingWords(c closing, preload float64) string {
	if c.open {
		return fmt.Sprintf("the whole preload of %.1f kN went into closing the gap", preload/1e3)
	}
	if c.missing != nil {
		return fmt.Sprintf("the bolt force the closing took was not found: a separate tightening with the shell end free did not give it (%v)", c.missing)
	}
	if c.none {
		return "closing it took no bolt force: with the shell end free the faces touch within 1 µm before any tightening"
	}
	w := fmt.Sprintf("closing it took a bolt force of %.1f kN (%.0f %% of the preload), found by a separate tightening of the joint in levels with the shell end free, stopped once the faces closed, and read linearly in the gap between its levels at %.1f and %.1f kN (resolution: one level; the analysis's own preload path is not changed)",
		c.force/1e3, 100*c.force/preload, c.from/1e3, c.to/1e3)
	if c.capped {
		w += "; that tightening closed the faces only past the preload reached, so the force is given as the preload"
	}
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
