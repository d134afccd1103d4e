package segment

import (
	"fmt"
	"math"
	"strings"
	"time"

	"flangeseg/fem"
)

// preloadLevels is the number of equal levels of the bolt shortening in
// which the closing search tightens the bolt up to the preload.
const preloadLevels = 10

// tighteningState is a state of the closing search, with the shell end
// free of force: the bolt force and the largest gap left inside the zones
// of the face that are meant to touch.
type tighteningState struct {
	force float64 // N
	gap   float64 // mm
	// shortening is the bolt shortening locked in the slice, mm.
	shortening float64
}

// closingSearch is what the search for the bolt force the closing of an
// initial gap took found (findClosing).
type closingSearch struct {
	ran bool
	// states are the levels from the unloaded state on, the last one the
	// first whose gap is closed, if found.
	states []tighteningState
	// failed says why no closed level was found (nil: found, or not run).
	failed error
	cost   searchCost
}

// searchCost is what the closing search cost, apart from the analysis.
type searchCost struct {
	levels, iterations, halvings int
}

// facesStartApart reports whether the flange faces start apart where
// they are meant to touch (a taper or a parallel gap).
func (g *segment) facesStartApart() bool {
	c := g.spec.Contact
	return c.Taper != 0 || c.ParallelGap > 0
}

// findClosing looks for the bolt force at which the faces of a joint that
// start apart came together. On site the nut is turned with the shell end
// free, and the force the closing takes is the force of bending the
// flanges (and, in a ring, the neighbouring segments) until the faces
// meet. The analysis's preload reaches its state with the shell end held
// while the bolt is shortened, which stretches the shell stubs as the
// faces approach, so its path tells nothing about the closing. The search
// therefore runs on a model of its own, built afresh from the same spec,
// and leaves the analysis as it is: the bolt is tightened in levels of a
// tenth of the preload's shortening, each released to a free shell end,
// and stops at the first level whose gap is closed. A failure of the
// search is reported in closingSearch.failed, never as a failure of the
// run; only stop's verdict (a cancelled run) is returned.
func (g *segment) findClosing(preload float64, stop func() error, log func(string)) (closingSearch, error) {
	out := closingSearch{ran: true}
	started := time.Now()
	p, err := buildSegment(g.spec, g.der)
	if err != nil {
		out.failed = fmt.Errorf("building its model: %w", err)
		return out, nil
	}
	// The washers are held sticking while the bolt is tightened, as in
	// Run's second try: at the small bolt forces of the first levels whole
	// washers otherwise flip between sticking and sliding through every
	// release (dozens of step halvings a level on the coarse demo joint),
	// while the force that bends the flanges shut hardly depends on them.
	p.stickWashers, p.searchingClosing = true, true
	note := func(line string) {
		if strings.Contains(line, "step halved") {
			out.cost.halvings++
		}
		if log != nil {
			log("closing search: " + line)
		}
	}
	s, err := fem.NewSolver(p.model, p.pairs(), fem.NewtonOptions{Log: note, ForceScale: p.der.DesignPreload, Tolerance: 1e-7})
	if err != nil {
		out.failed = fmt.Errorf("setting up its solver: %w", err)
		return out, nil
	}
	out.states, out.failed, err = p.tightenUntilClosed(s, preload, stop)
	out.cost.levels = len(out.states) - 1
	out.cost.iterations = s.Timing.Iterations
	if log != nil {
		log(fmt.Sprintf("closing search: %d levels, %d Newton iterations, %d step halvings, %.1f s",
			out.cost.levels, out.cost.iterations, out.cost.halvings, time.Since(started).Seconds()))
	}
	return out, err
}

// tightenUntilClosed shortens the bolt in levels, each with the edge held
// and then released to zero reaction (release), so each level ends in an
// equilibrium with the shell end free, until the largest gap inside the
// zones is closed. A level that the last one's closing rate says would
// close the gap is cut to end as it closes (levelStep). The washers stay
// held sticking (see findClosing). The search gives up once the bolt
// force has passed the analysis's preload by a level with the gap still
// open: the analysis, whose shell end is held while the bolt is
// shortened, can leave the faces closed at a bolt force at which a free
// tightening leaves them a few µm apart, so the search looks a level
// further (closingForce gives such a force as the preload). It returns
// the states noted, why it found no closed level (failed), and stop's
// verdict.
func (g *segment) tightenUntilClosed(s *fem.Solver, preload float64, stop func() error) (states []tighteningState, failed, err error) {
	total := g.der.PreloadShortening
	if g.der.PreloadForce > 0 {
		total = -g.preloadEstimate(g.der.PreloadForce) * g.slice
	}
	step := total / preloadLevels
	g.tighteningWashers(true)
	gap, _ := g.largestGap(s.Current())
	states = []tighteningState{{gap: gap}}
	v, done := 0.0, 0.0
	for level := 1; level <= 3*preloadLevels; level++ {
		if stop != nil {
			if err := stop(); err != nil {
				return states, nil, err
			}
		}
		done += g.levelStep(states, step)
		if _, err := s.Shorten("bolt_preload", done, g.slice, 1, g.boltForce(s)); err != nil {
			return states, fmt.Errorf("level %d, shortening the bolt by %.4g mm with the shell end held: %w", level, done, err), nil
		}
		if v, err = g.release(s, v); err != nil {
			return states, fmt.Errorf("level %d, freeing the shell end: %w", level, err), nil
		}
		st, err := g.noteLevel(s)
		if err != nil {
			return states, fmt.Errorf("level %d: %w", level, err), nil
		}
		states = append(states, st)
		if st.gap <= closedGap {
			return states, nil, nil
		}
		if st.force >= (1+1.0/preloadLevels)*preload {
			return states, fmt.Errorf("the faces were still %.3g mm apart at a bolt force of %.1f kN, a level past the preload reached, %.1f kN", st.gap, st.force/1e3, preload/1e3), nil
		}
	}
	return states, fmt.Errorf("the faces were still apart after %d levels", 3*preloadLevels), nil
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

// noteLevel reads the bolt force, the largest gap inside the zones and
// the bolt shortening of the current state.
func (g *segment) noteLevel(s *fem.Solver) (tighteningState, error) {
	f, err := g.boltForce(s)()
	if err != nil {
		return tighteningState{}, fmt.Errorf("the bolt force: %w", err)
	}
	gap, _ := g.largestGap(s.Current())
	return tighteningState{force: f, gap: gap,
		shortening: -s.Model().Eigenstrain("bolt_preload")[1] * g.slice}, nil
}

// boltForce measures the bolt force at the contact plane.
func (g *segment) boltForce(s *fem.Solver) func() (float64, error) {
	return func() (float64, error) {
		f, _, _, err := s.SectionForce(g.cut.elems, g.cut.nodes, 0)
		return f, err
	}
}
