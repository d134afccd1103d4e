package contact

// Augment performs one augmented-Lagrangian update of the multipliers at
// cur (Uzawa's iteration: λ_N ← max(0, λ_N − ε_N·g), with g the gap,
// negative when penetrating; with friction also λ_T ← t_T) and reports the
// largest penetration BEFORE the update and whether it exceeds Tolerance
// (another equilibrium iteration + update is needed).
//
// The update is made only when the penetration exceeds Tolerance: a state
// already within it is left exactly as the equilibrium iterations found
// it, so forces, reactions and results read after the last solve belong to
// that equilibrium. Multipliers carry over to the next increment through
// Commit.
//
// The tangential update follows Simo & Laursen (1992): a sticking point
// keeps its anchor, so the next equilibrium pulls it back towards zero
// elastic slip; a sliding point's anchor moves to its current projection.
func (p *Pair) Augment(cur []Point) (maxPenetration float64, again bool) {
	if p.checkCurrent(cur) != nil {
		return 0, false
	}
	evals := make([]pointEval, len(p.points))
	for i := range p.points {
		evals[i] = p.evalPoint(i, cur, &p.working[i])
		if evals[i].status != unpaired {
			maxPenetration = max(maxPenetration, -evals[i].g)
		}
	}
	if maxPenetration <= p.set.Tolerance {
		return maxPenetration, false
	}
	for i := range evals {
		e := &evals[i]
		st := &p.working[i]
		proj := location{seg: e.seg, r: e.m.r}
		here := e.keep // the master point the slave point is at (s = 0)
		if e.frictional() {
			here = p.slidAnchor(e, cur, 0)
		}
		switch e.status {
		case unpaired:
			st.lambdaN, st.lambdaT = 0, 0
		case open:
			st.lambdaN, st.lambdaT, st.anchor = 0, 0, here
		case pressed:
			st.lambdaN, st.anchor = e.pN, here
		case sticking:
			st.lambdaN, st.lambdaT = e.pN, e.tT
		case sliding:
			// With λ_T = t_T the slid anchor sits where s = 0: at the
			// projection itself (or, sliding small, where it now is).
			st.lambdaN, st.lambdaT, st.anchor = e.pN, e.tT, here
		}
		keep := st.anchor
		if e.status == unpaired {
			keep = nowhere
		}
		p.trial[i] = trialState{status: e.status, proj: proj, anchor: keep}
	}
	p.hasTrial = true
	return maxPenetration, true
}

// Commit accepts the increment: the multipliers of the working state and
// the slip history (anchors) of the last Evaluate or Augment become the
// committed state, and the last projections become the start of the next
// contact search.
func (p *Pair) Commit() {
	for i := range p.points {
		c := p.working[i]
		if p.hasTrial {
			t := p.trial[i]
			switch t.status {
			case unpaired:
				c.lambdaN, c.lambdaT, c.anchor = 0, 0, nowhere
			case open:
				c.lambdaT, c.anchor, c.hint = 0, t.anchor, t.proj.seg
			default:
				c.anchor, c.hint = t.anchor, t.proj.seg
			}
		}
		p.committed[i], p.working[i] = c, c
	}
	p.hasTrial = false
}

// Revert drops the working and trial state back to the last commit (step
// cutting).
func (p *Pair) Revert() {
	copy(p.working, p.committed)
	p.hasTrial = false
}
