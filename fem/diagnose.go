package fem

// What a failed solve reports, and the checks of frozen contact points
// before a state is accepted.

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"flangeseg/contact"
)

// NotConvergedError reports an equilibrium solve that failed; the solver
// is back at its last converged state. Besides the reason it carries
// what the iterations showed, for a diagnosis in the user's terms.
type NotConvergedError struct {
	Iterations int
	Residual   float64 // relative residual at the last iteration
	Reason     string
	// First and Best are the relative residuals of the first iteration
	// and the smallest one reached.
	First, Best float64
	// Largest is the largest out-of-balance force at the last iteration
	// (N), Where the node, its position, region and direction.
	Largest float64
	Where   string
	// Cycling lists, per contact pair, the points that changed status in
	// the second half of the iterations.
	Cycling []Cycling
	// Indefinite: the solve stopped because the tangent was not positive
	// definite (a state with no stiffness against some motion); Pivot
	// names the dof where the factorization met a pivot ≤ 0.
	Indefinite bool
	Pivot      string
}

// Cycling describes the contact points of one pair that kept changing
// status while equilibrium was sought.
type Cycling struct {
	Pair       string
	Points     int     // distinct points
	Changes    int     // status changes counted
	XMin, XMax float64 // reference x range of the points, mm
	Between    string  // the statuses they moved between, e.g. "open, sliding"
}

func (e *NotConvergedError) Error() string {
	return fmt.Sprintf("fem: no equilibrium after %d iterations (relative residual %.3g): %s", e.Iterations, e.Residual, e.Reason)
}

// settled checks the frozen contact points of a converged state against
// their laws (contact.Pair.Correct): it reports whether all are within tol
// (N); otherwise those that are not are held at their laws' status and
// the solve goes on. After maxThaws corrections, every frozen point goes
// free instead and freezing stops for the solve.
func (s *Solver) settled(tol float64) bool {
	s.updateCurrent()
	worst, changed := 0.0, 0
	for _, p := range s.pairs {
		w, c := p.Correct(s.cur, tol)
		worst, changed = math.Max(worst, w), changed+c
	}
	if changed == 0 {
		return true
	}
	s.corrections++
	if s.corrections > s.maxCorrections() {
		s.thaw()
		s.anyFrozen = false
		s.log(fmt.Sprintf("  frozen contact points off their law by up to %.3g N: all released", worst))
		return false
	}
	s.log(fmt.Sprintf("  %d frozen contact points off their law (up to %.3g N): held at their law's status", changed, worst))
	s.anyFrozen = true
	return false
}

// thaw releases the frozen contact points of every pair and returns the
// largest force by which one was off its law.
func (s *Solver) thaw() float64 {
	s.updateCurrent()
	v := 0.0
	for _, p := range s.pairs {
		v = math.Max(v, p.Thaw(s.cur))
	}
	return v
}

// iterationNote describes where the residual of the iteration just
// recorded is largest and which contact points changed status, for the
// --verbose log.
func (s *Solver) iterationNote() string {
	var b strings.Builder
	if w := &s.watch; w.at >= 0 {
		fmt.Fprintf(&b, "  largest %.3g N at %s", w.largest, s.m.DescribeDof(Dof(w.at)))
	}
	for _, p := range s.pairs {
		ch := p.Changes()
		if len(ch) == 0 {
			continue
		}
		fmt.Fprintf(&b, "; %s: %d changed", p.Name(), len(ch))
		for i, c := range ch {
			if i == 3 {
				b.WriteString(" …")
				break
			}
			fmt.Fprintf(&b, " [x %.1f %s→%s p %.3g]", c.X, c.From, c.To, c.Pressure)
		}
	}
	return b.String()
}

// watch keeps what a diagnosis of a failed solve needs.
type watch struct {
	its         int // the last iteration recorded
	first, best float64
	largest     float64 // the largest out-of-balance force of the last iteration, N
	at          int     // its dof (−1: none); named only when a solve fails
	cycling     map[string]*Cycling
	seen        map[string]map[[2]float64]bool
	statuses    map[string]map[string]bool
	order       []string
}

// record notes iteration it with relative residual rel and residual r.
func (w *watch) record(s *Solver, it int, rel float64, r []float64) {
	w.its = it
	if it == 1 {
		w.first, w.best = rel, rel
	}
	w.best = math.Min(w.best, rel)
	w.largest, w.at = 0, -1
	for d, q := range s.m.eq {
		if q >= 0 && math.Abs(r[q]) > w.largest {
			w.largest, w.at = math.Abs(r[q]), d
		}
	}
	if it <= s.opt.MaxIterations/2 {
		return
	}
	for _, p := range s.pairs {
		for _, c := range p.Changes() {
			w.addChange(p.Name(), c)
		}
	}
}

func (w *watch) addChange(pair string, c contact.Change) {
	if w.cycling == nil {
		w.cycling, w.seen, w.statuses = map[string]*Cycling{}, map[string]map[[2]float64]bool{}, map[string]map[string]bool{}
	}
	cy, ok := w.cycling[pair]
	if !ok {
		cy = &Cycling{Pair: pair, XMin: math.Inf(1), XMax: math.Inf(-1)}
		w.cycling[pair], w.seen[pair], w.statuses[pair] = cy, map[[2]float64]bool{}, map[string]bool{}
		w.order = append(w.order, pair)
	}
	cy.Changes++
	if key := [2]float64{c.X, c.Z}; !w.seen[pair][key] {
		w.seen[pair][key] = true
		cy.Points++
	}
	cy.XMin, cy.XMax = math.Min(cy.XMin, c.X), math.Max(cy.XMax, c.X)
	w.statuses[pair][c.From], w.statuses[pair][c.To] = true, true
}

// failure builds the error of a failed solve of model m.
func (w *watch) failure(m *Model, its int, rel float64, reason string) *NotConvergedError {
	e := &NotConvergedError{Iterations: its, Residual: rel, Reason: reason, First: w.first, Best: w.best, Largest: w.largest}
	if w.at >= 0 {
		e.Where = m.describePlace(Dof(w.at))
	}
	for _, name := range w.order {
		cy := *w.cycling[name]
		var st []string
		for k := range w.statuses[name] {
			st = append(st, k)
		}
		slices.Sort(st)
		cy.Between = strings.Join(st, ", ")
		e.Cycling = append(e.Cycling, cy)
	}
	return e
}

// IsNotConverged reports whether err is a failed equilibrium solve.
func IsNotConverged(err error) bool {
	var nc *NotConvergedError
	return errors.As(err, &nc)
}
