package segment

import (
	"math"

	"flangeseg/fem"
)

// preloadLevels is the number of equal levels of the bolt shortening in
// which the bolt of a joint whose faces start apart is tightened.
const preloadLevels = 10

// tighteningState is a state on the way to the preload, with the shell
// end free of force: the bolt force and the largest gap left inside the
// zones of the face that are meant to touch.
type tighteningState struct {
	force float64 // N
	gap   float64 // mm
	// shortening is the bolt shortening locked in the slice, mm.
	shortening float64
}

// facesStartApart reports whether the flange faces start apart where
// they are meant to touch (a taper or a parallel gap).
func (g *segment) facesStartApart() bool {
	c := g.spec.Contact
	return c.Taper != 0 || c.ParallelGap > 0
}

// tightenInLevels is the first round of a preload for a joint whose faces
// start apart. On site the nut is turned with the shell end free, and the
// force the closing takes is the force of bending the flanges (and, in a
// ring, the neighbouring segments) until the faces meet. A strip tightened
// with the shell end held reaches the same bolt force only by stretching
// the shell stubs as the faces approach, so that path tells nothing about
// the closing. Here the slice is shortened in levels of a tenth of the
// nut-turn shortening, or of the estimate of the shortening that gives
// the target force, each with the edge held and then released to zero
// reaction (release), so each level ends in an equilibrium with the shell
// end free; a level that is predicted to close the gap is cut so as to
// end just as it closes, which keeps the force read at closing from being
// that of a whole level. A preload by force stops the levels a level
// short of the target and leaves the rest to the correcting rounds
// (settlePreload), with the washers still glued. It returns the edge
// position.
func (g *segment) tightenInLevels(s *fem.Solver, res *analysis) (float64, error) {
	total := g.der.PreloadShortening
	byForce := g.der.PreloadForce > 0
	if byForce {
		total = -g.preloadEstimate(g.der.PreloadForce) * g.slice
	}
	step := total / preloadLevels
	gap, _ := g.largestGap(s.Current())
	res.tightening = append(res.tightening, tighteningState{gap: gap})
	v, done := 0.0, 0.0
	for level := 1; level <= 3*preloadLevels; level++ {
		next := done + g.levelStep(res.tightening, step)
		if !byForce {
			next = math.Min(next, total)
		}
		pr, err := s.Shorten("bolt_preload", next, g.slice, 1, g.boltForce(s))
		pr.Iterations += res.preload.Iterations
		res.preload = pr
		if err != nil {
			return 0, err
		}
		if v, err = g.releaseAndNote(s, res, v); err != nil {
			return 0, err
		}
		done = next
		if !byForce && done >= total {
			break
		}
		if byForce && g.nearTarget(res.tightening, step) {
			// The washers are let go at the target force, as on the
			// path of a joint whose faces start closed.
			return g.settlePreload(s, res, v)
		}
	}
	return v, nil
}

// levelStep is the shortening of the next level: a whole level, or, where
// the gap left is predicted to close within it (by the rate at which the
// last level closed it), the part that closes it to half the closed gap,
// but not less than a quarter level, so the levels do not crowd
// towards a gap that closes ever more slowly.
func (g *segment) levelStep(states []tighteningState, step float64) float64 {
	n := len(states)
	if n < 2 {
		return step
	}
	last, before := states[n-1], states[n-2]
	if last.gap <= closedGap {
		return step
	}
	rate := (before.gap - last.gap) / (last.shortening - before.shortening)
	if !(rate > 0) {
		return step
	}
	toClose := (last.gap - closedGap/2) / rate
	return math.Max(math.Min(step, toClose), step/4)
}

// nearTarget reports whether the next level would bring a preload by
// force past its target, by the bolt force's rise over the last level.
func (g *segment) nearTarget(states []tighteningState, step float64) bool {
	n := len(states)
	if n == 0 {
		return false
	}
	last := states[n-1]
	rise := 0.0
	if n >= 2 {
		before := states[n-2]
		rise = (last.force - before.force) / (last.shortening - before.shortening) * step
	}
	return last.force+rise >= g.der.PreloadForce
}

// releaseAndNote releases the loaded edge (release) and, for a joint whose
// faces start apart, notes the state it reaches.
func (g *segment) releaseAndNote(s *fem.Solver, res *analysis, v float64) (float64, error) {
	v, err := g.release(s, v)
	if err != nil || !g.facesStartApart() {
		return v, err
	}
	f, err := g.boltForce(s)()
	if err != nil {
		return 0, err
	}
	gap, _ := g.largestGap(s.Current())
	res.tightening = append(res.tightening, tighteningState{force: f, gap: gap,
		shortening: -s.Model().Eigenstrain("bolt_preload")[1] * g.slice})
	return v, nil
}
