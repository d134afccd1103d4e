package contact

import "math"

// Freezing the status of points that keep changing it.
//
// Penalty contact with friction makes the residual only piecewise smooth.
// Where a point sits near a kink of its law — a lightly pressed point at
// the edge of the contact zone, a point under a washer at the limit
// between sticking and sliding — Newton's method can jump between the two
// branches and never settle, although either branch has a solution close
// to the other. Freezing the points that have changed status twice in one
// solve at their last status makes the rest of the solve smooth, and
// Newton's method converges on it; afterwards Thaw measures how far each
// frozen point's forces are from what its own law gives there, and the
// solver accepts the state only when that is negligible. This is the
// active-set strategy for contact constraints (Wriggers, Computational
// Contact Mechanics, 2006; Laursen, Computational Contact and Impact
// Mechanics, 2002; as a semi-smooth Newton method: Hintermüller, Ito &
// Kunisch, SIAM J. Optim. 13, 2003): fix the active set, solve, check the
// inequalities, and correct.

// heldStatus is the status point i is frozen at, or unpaired when free.
func (p *Pair) heldStatus(i int) status {
	if p.held == nil {
		return unpaired
	}
	return p.held[i]
}

func (p *Pair) heldSign(i int) float64 {
	if p.held == nil {
		return 0
	}
	return p.lastSign[i]
}

// ResetFlips starts a new equilibrium solve: no point has changed status
// in it yet and none is frozen.
func (p *Pair) ResetFlips() {
	clear(p.flips)
	clear(p.returns)
	p.held = nil
}

// noteChange counts a change of point i to status st with slip sign
// sign, from the status of its last evaluation.
func (p *Pair) noteChange(i int, st status, sign float64) {
	back := p.flips[i] > 0 && st == p.prior[i] && (st != sliding || sign == p.priorSign[i])
	if back && p.returns[i] < 255 {
		p.returns[i]++
	}
	if p.flips[i] < 255 {
		p.flips[i]++
	}
	p.prior[i], p.priorSign[i] = p.trial[i].status, p.lastSign[i]
}

// Cycling counts the free points that have gone back to an earlier
// status at least once in the current solve.
func (p *Pair) Cycling() int {
	return p.countFree(func(i int) bool { return p.returns[i] > 0 })
}

// FreezeCycling is Freeze for the points that Cycling counts: it holds
// the points that have gone back to an earlier status, not those that a
// moving contact edge has carried through two statuses in one direction
// (sticking, sliding, open), and returns how many points are held in all.
func (p *Pair) FreezeCycling() int {
	return p.hold(func(i int) bool { return p.returns[i] > 0 })
}

// Flipping counts the free points that have changed status at least
// minFlips times in the current solve.
func (p *Pair) Flipping(minFlips int) int {
	return p.countFree(func(i int) bool { return int(p.flips[i]) >= minFlips })
}

// Freeze holds every point that has changed status at least minFlips
// times in the current solve at the status it took in the last Evaluate,
// and returns how many points are held in all. A held point keeps its
// branch of the contact law — open, pressed, sticking, or sliding in the
// same direction — until Thaw, whatever its gap or traction says.
func (p *Pair) Freeze(minFlips int) int {
	return p.hold(func(i int) bool { return int(p.flips[i]) >= minFlips })
}

// countFree counts the free, paired points that pick selects.
func (p *Pair) countFree(pick func(i int) bool) int {
	n := 0
	for i := range p.points {
		if (p.held == nil || p.held[i] == unpaired) && p.trial[i].status != unpaired && pick(i) {
			n++
		}
	}
	return n
}

// hold holds the paired points that pick selects at the status of their
// last Evaluate, and returns how many points are held in all.
func (p *Pair) hold(pick func(i int) bool) int {
	n := 0
	for i := range p.points {
		if p.held != nil && p.held[i] != unpaired {
			n++
			continue
		}
		if p.trial[i].status == unpaired || !pick(i) {
			continue
		}
		if p.held == nil {
			p.held = make([]status, len(p.points))
		}
		p.held[i] = p.trial[i].status
		n++
	}
	return n
}

// Thaw releases every held point and returns the largest force, N, by
// which a held point's contact forces differ at cur from those of its own
// law: |Δp_N| + |Δt_T| times the point's area. Zero when none was held.
func (p *Pair) Thaw(cur []Point) float64 {
	worst := 0.0
	if p.held != nil && p.checkCurrent(cur) == nil {
		for i, h := range p.held {
			if h != unpaired {
				d, _ := p.offLaw(i, cur)
				worst = math.Max(worst, d)
			}
		}
	}
	p.held = nil
	return worst
}

// Correct checks every held point against its own law at cur. When the
// forces of one differ from the law's by more than tol (N), every held
// point whose law gives another status there is held at that status
// instead. It returns the largest difference and how many points it
// changed. This is one step of an active-set iteration over the frozen
// points; when it changes none, the held state satisfies every law to
// within tol and Thaw may release it.
func (p *Pair) Correct(cur []Point, tol float64) (worst float64, changed int) {
	if p.held == nil || p.checkCurrent(cur) != nil {
		return 0, 0
	}
	var disagree []pointEval
	var at []int
	for i, h := range p.held {
		if h == unpaired {
			continue
		}
		d, free := p.offLaw(i, cur)
		worst = math.Max(worst, d)
		if free.status != unpaired && free.status != h {
			disagree, at = append(disagree, free), append(at, i)
		}
	}
	if worst <= tol {
		return worst, 0
	}
	// One active-set step over every held point whose law disagrees, not
	// only the worst: a contact edge that moves along a lightly pressed
	// face otherwise moves one point per step.
	for k, i := range at {
		p.held[i], p.lastSign[i] = disagree[k].status, disagree[k].sign
	}
	return worst, len(at)
}

// offLaw evaluates held point i at cur as held and by its own law, and
// returns the force by which the two differ (N) and the law's answer.
func (p *Pair) offLaw(i int, cur []Point) (float64, pointEval) {
	held := p.held
	frozen := p.evalPoint(i, cur, &p.working[i])
	p.held = nil
	free := p.evalPoint(i, cur, &p.working[i])
	p.held = held
	return (math.Abs(frozen.pN-free.pN) + math.Abs(frozen.tT-free.tT)) * p.points[i].area, free
}

// Glue holds every paired point of the pair on the pressed branch of the
// normal law (a tie that also holds in tension) while on is true, and with
// stick also on the sticking branch of friction (an elastic tie along the
// face; without friction the points stay pressed). A bolt's washers are
// pressed throughout the tightening; held so then, a Newton iterate
// cannot lift the bolt off both and leave it floating, and with stick
// whole washers cannot flip between sticking and sliding at the low
// pressures of the first steps. Check the tractions against the law
// afterwards: let go and find equilibrium.
func (p *Pair) Glue(on, stick bool) {
	switch {
	case !on:
		p.glued = unpaired
	case stick && p.set.Friction > 0:
		p.glued = sticking
	default:
		p.glued = pressed
	}
}
