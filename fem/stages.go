package fem

import (
	"fmt"
	"math"
)

// Increment is one converged step of a ramp.
type Increment struct {
	Index      int     // 1-based count of converged increments in the ramp
	Value      float64 // prescribed value reached
	Fraction   float64 // of the ramp, 0…1
	Iterations int     // Newton iterations of this increment
	Cuts       int     // step halvings needed on the way to it
}

// RampError reports a ramp that found no equilibrium even for its
// smallest step: Reached is the last converged value, Step the last
// change of the prescribed value tried from it, after Cuts halvings in a
// row; Stalled says the step had fallen below minRampStep of the nominal
// increment. Err is the last try's failure.
type RampError struct {
	Reached, Target, Step float64
	Cuts                  int
	Stalled               bool
	Err                   error
}

// minRampStep is the smallest step a ramp tries, as a fraction of its
// nominal increment: a ramp that has come down to a millionth of it is
// not advancing.
const minRampStep = 1e-6

func (e *RampError) Error() string {
	if e.Stalled {
		return fmt.Sprintf("fem: ramp stopped at %.4g of %.4g: its step fell below %g of an increment: %v", e.Reached, e.Target, minRampStep, e.Err)
	}
	return fmt.Sprintf("fem: ramp stopped at %.4g of %.4g after %d step halvings: %v", e.Reached, e.Target, e.Cuts, e.Err)
}

func (e *RampError) Unwrap() error { return e.Err }

// RampOptions control a displacement-controlled ramp.
type RampOptions struct {
	Increments int // equal steps to the target (≥ 1)
	MaxCuts    int // halvings of a failing step before giving up (default 6)
	// MinStep, if positive, is the smallest step, as a fraction of the
	// nominal increment, that a failing step may be halved to, whatever
	// the halvings in a row: where a caller can use the positions short of
	// an end that cannot be reached, this gives up on it long before
	// minRampStep does.
	MinStep float64
	// Budget is the Newton iterations an increment may take, multiplier
	// updates included, before its step is halved, while it has been
	// halved fewer than BudgetCuts times (0: no budget; the solver's
	// MaxIterations per update). A contact solve that has not converged
	// in some fifteen iterations is as a rule cycling between contact
	// states, and half the step costs less than the cycling; an increment
	// that two halvings did not help gets the solver's full iterations
	// before it is halved again, and so does any increment whose step is
	// that small already, so the budget never ends a run.
	Budget, BudgetCuts int
}

// Ramp moves the prescribed dof d from its current value to target in
// equal increments, halving a step that does not converge (at most
// MaxCuts times in a row) and growing it back after success. After every
// converged increment the state is committed and done is called; done may
// stop the ramp by returning true. A ramp that cannot go on returns a
// *RampError wrapping the last *NotConvergedError and leaves the solver
// at the last converged increment.
func (s *Solver) Ramp(d Dof, target float64, opt RampOptions, done func(Increment) (stop bool, err error)) error {
	if opt.Increments < 1 {
		return fmt.Errorf("fem: ramp with %d increments: need at least 1", opt.Increments)
	}
	if opt.MaxCuts == 0 {
		opt.MaxCuts = 6
	}
	s.budgeted = opt.Budget > 0
	defer func() { s.budgeted = false }()
	start := s.m.Value(d)
	span := target - start
	step := 1.0 / float64(opt.Increments)
	at, count, cuts := 0.0, 0, 0
	for at < 1-1e-12 {
		next := math.Min(1, at+step)
		if err := s.m.SetValue(d, start+next*span); err != nil {
			return err
		}
		// In units of the prescribed value, not of this ramp's span: the
		// increment extrapolated may be the last of another ramp.
		if err := s.predict((next - at) * span); err != nil {
			return err
		}
		s.log(fmt.Sprintf("increment %d: %.6g → %.6g", count+1, start+at*span, start+next*span))
		// The budget holds while the step is larger than the nominal one
		// halved BudgetCuts times: an increment that needs more than the
		// budget at every size (a slowly converging yielding zone) would
		// otherwise be halved again after every success, down to nothing.
		s.budget = 0
		if cuts < opt.BudgetCuts && step*float64(opt.Increments) > math.Ldexp(1, -opt.BudgetCuts)*(1+1e-9) {
			s.budget = opt.Budget
		}
		its, err := s.Equilibrium()
		s.budget = 0
		if err != nil {
			s.log(fmt.Sprintf("  not converged (%v); step halved", err))
			s.Revert()
			if err := s.m.SetValue(d, start+at*span); err != nil {
				return err
			}
			if !IsNotConverged(err) {
				return err
			}
			// The halvings in a row are bounded, and so is the step: after
			// a success at the cut size the count starts afresh, so a
			// state the solver cannot leave (a path that turns back,
			// approached ever more closely) would otherwise be met with
			// ever smaller increments that all converge, without end.
			stalled := step/2 < minRampStep/float64(opt.Increments)
			if cuts == opt.MaxCuts || stalled || step/2 < opt.MinStep/float64(opt.Increments) {
				return &RampError{Reached: start + at*span, Target: target, Step: (next - at) * span, Cuts: cuts, Stalled: stalled, Err: err}
			}
			cuts++
			step /= 2
			continue
		}
		s.Commit()
		at = next
		count++
		stop, err := done(Increment{Index: count, Value: start + at*span, Fraction: at, Iterations: its, Cuts: cuts})
		if err != nil || stop {
			return err
		}
		// A step that went through at once may grow back towards the
		// nominal one; after a cut, one success at the cut size first.
		// Under a budget, a step that needed more than half of it
		// is not grown: the contact state is still changing fast, and a
		// doubled step would be halved again (iteration-count step
		// control, Crisfield, Non-linear Finite Element Analysis of Solids
		// and Structures, vol. 1, 1991, §9.5).
		if cuts == 0 && (opt.Budget == 0 || 2*its <= opt.Budget) {
			step = math.Min(1.0/float64(opt.Increments), 2*step)
		}
		cuts = 0
	}
	return nil
}

// PreloadResult reports how a preload target was met.
type PreloadResult struct {
	Eigenstrain float64 // zz strain locked into the slice
	Force       float64 // bolt force reached, N
	Iterations  int     // equilibrium solves used
	// Slope is the last secant slope of the bolt force over the strain
	// (N per unit strain, negative: a shortening raises the force), 0
	// before two states are known; a later Preload of the same bolt
	// takes it as PreloadOptions.Slope.
	Slope float64
}

// PreloadOptions tune the preload stage.
type PreloadOptions struct {
	// Tolerance is the relative tolerance on the bolt force (default 0.001).
	Tolerance float64
	// Estimate is a first estimate of the slice strain that reaches the
	// target (negative: a shortening); the stage climbs towards it in
	// Steps load steps. Zero takes −1e-3.
	Estimate float64
	// Steps is the number of load steps to the estimate (default 4).
	Steps int
	// MaxCuts bounds the halvings of a failing step in a row (default 6).
	MaxCuts int
	// Gaps, if set, measures the gaps (mm, positive open) of the contact
	// points that the preload may close, in the same order at every call
	// (+Inf where a point faces nothing). While the faces close, a step
	// that fails is then cut back to the strain at which the first open
	// point would touch, extrapolated from the last two states
	// (touchLimit), where that is nearer than half the step.
	Gaps func() []float64
	// Slope, if negative, is the bolt force's slope over the strain from
	// an earlier Preload of the same bolt (PreloadResult.Slope): the first
	// step is then the root along it rather than a 1/Steps share of the
	// estimate, so a correction of a few per cent is a small step.
	Slope float64
}

func (o *PreloadOptions) defaults() {
	if o.Tolerance == 0 {
		o.Tolerance = 0.001
	}
	if o.Estimate == 0 {
		o.Estimate = -1e-3
	}
	if o.Steps == 0 {
		o.Steps = 4
	}
	if o.MaxCuts == 0 {
		o.MaxCuts = 6
	}
}

// Preload finds the axial eigenstrain of region that makes force() equal
// target, as a load-stepped stage: the slice is shortened in steps of at
// most a 1/Steps share of the estimate, each started from the last two
// converged states extrapolated, a failing step halved. Once the bolt
// force responds, each next strain is the secant root through the last two
// states, kept inside the bracket of strains known to give too little and
// too much force (regula falsi, so a gap that closes on the way — the force
// rising late and steeply — cannot make it jump back and forth), and no
// larger than the step allowed, which doubles while the force barely
// responds (a gap still closing). force measures the bolt force in the
// current state; every converged state is committed.
func (s *Solver) Preload(region string, target float64, force func() (float64, error), opt PreloadOptions) (PreloadResult, error) {
	if !(target > 0) {
		return PreloadResult{}, fmt.Errorf("fem: preload target %g N: must be positive", target)
	}
	opt.defaults()
	res := PreloadResult{Eigenstrain: s.m.Eigenstrain(region)[1], Slope: math.Min(opt.Slope, 0)}
	path := eigenPath{s: s, region: region, maxCuts: opt.MaxCuts, res: &res, force: force}
	f := 0.0
	if res.Eigenstrain != 0 {
		var err error
		if f, err = force(); err != nil {
			return res, err
		}
	}
	res.Force = f
	limit := math.Abs(opt.Estimate) / float64(opt.Steps)
	lo, hi := math.Inf(1), math.Inf(-1) // strains known to give too little / too much force (strains are negative)
	var e0, f0 float64
	var g0, g1 []float64
	have0 := false
	if opt.Gaps != nil {
		g1 = opt.Gaps()
	}
	for solve := 0; solve < 60; solve++ {
		e1, f1 := res.Eigenstrain, res.Force
		if math.Abs(f1-target) <= opt.Tolerance*target {
			return res, nil
		}
		if f1 < target {
			lo = math.Min(lo, e1)
		} else {
			hi = math.Max(hi, e1)
		}
		next := e1 - limit
		if f1 > target {
			next = e1 + limit
		}
		slope := opt.Slope
		if have0 && f1 != f0 {
			slope = (f1 - f0) / (e1 - e0)
			res.Slope = slope
		}
		if slope < 0 {
			want := e1 + (target-f1)/slope
			next = e1 + math.Copysign(math.Min(math.Abs(want-e1), limit), want-e1)
		}
		if !math.IsInf(lo, 0) && !math.IsInf(hi, 0) && !(next < lo && next > hi) {
			next = (lo + hi) / 2 // the secant left the bracket
		}
		touch := math.NaN()
		if have0 && g0 != nil {
			touch = touchLimit(e0, e1, next, g0, g1)
		}
		if err := path.moveTo(next, touch); err != nil {
			return res, err
		}
		if math.Abs(res.Force-f1) < 0.5*target/float64(opt.Steps) {
			limit *= 2 // the force barely responds: a gap is still closing
		}
		e0, f0, have0 = e1, f1, true
		if opt.Gaps != nil {
			g0, g1 = g1, opt.Gaps()
		}
	}
	return res, fmt.Errorf("fem: preload: %g N not reached within 60 steps (last %g N)", target, res.Force)
}

// touchLimit is where a step of the eigenstrain from e1 to next would
// pass the strain at which the first open contact point touches, each
// point's gap extrapolated linearly from its gaps g0 at e0 and g1 at e1
// (next if it passes none): a step far past a new contact starts the
// solve from deep penetration, and the active-set search that follows
// cycles (a slender flange's taper), so a failing step is cut back to it
// (eigenPath.moveTo). It lies a twentieth past the predicted touch, so
// that the contact is made. Points already touching (gap ≤ touchGap) and
// points not closing set no limit. Steps that converge are not limited:
// creeping through a closing taper in such small steps changed the
// friction locked in enough to let whole washers slip when let go.
func touchLimit(e0, e1, next float64, g0, g1 []float64) float64 {
	if len(g0) != len(g1) || e1 == e0 {
		return next
	}
	best := next
	for i := range g1 {
		a, b := g0[i], g1[i]
		if math.IsInf(a, 0) || math.IsInf(b, 0) || b <= touchGap || b >= a {
			continue
		}
		touch := e1 + b*(e1-e0)/(a-b) // gap a at e0, b at e1: zero here
		if (touch-e1)*(next-e1) <= 0 {
			continue
		}
		touch = e1 + 1.05*(touch-e1)
		if math.Abs(touch-e1) < math.Abs(best-e1) {
			best = touch
		}
	}
	return best
}

// touchGap is the gap (mm) below which a contact point counts as touching
// for touchLimit.
const touchGap = 1e-3

// Shorten locks a prescribed shortening (mm) over a slice of length
// sliceLength into region as an eigenstrain, applied in steps equal
// load steps (halved where one fails): the nut-turn way of preloading.
// force, if not nil, is recorded after each step.
func (s *Solver) Shorten(region string, shortening, sliceLength float64, steps int, force func() (float64, error)) (PreloadResult, error) {
	res := PreloadResult{Eigenstrain: s.m.Eigenstrain(region)[1]}
	if !(sliceLength > 0) {
		return res, fmt.Errorf("fem: preload slice length %g: must be positive", sliceLength)
	}
	if steps < 1 {
		steps = 4
	}
	path := eigenPath{s: s, region: region, maxCuts: 6, res: &res, force: force}
	from, to := res.Eigenstrain, -shortening/sliceLength
	for i := 1; i <= steps; i++ {
		if err := path.moveTo(from+(to-from)*float64(i)/float64(steps), math.NaN()); err != nil {
			return res, err
		}
	}
	return res, nil
}

// eigenPath moves a region's eigenstrain through converged states.
type eigenPath struct {
	s       *Solver
	region  string
	maxCuts int
	res     *PreloadResult
	force   func() (float64, error)
	// prev is the state converged before the last one, and step the
	// eigenstrain change between the two, for the predictor.
	prev []float64
	step float64
}

// moveTo brings the eigenstrain to e through converged states, halving a
// step that does not converge (at most maxCuts times in a row). touch, if
// not NaN, is where the next point of a closing face is expected to touch
// (touchLimit): a failing first try is cut back to it rather than halved,
// where it lies nearer.
func (p *eigenPath) moveTo(e, touch float64) error {
	s := p.s
	defer s.patience()()
	cuts := 0
	for math.Abs(e-p.res.Eigenstrain) > 1e-15 {
		at := p.res.Eigenstrain
		d := e - at
		for k := 0; k < cuts; k++ {
			d /= 2
		}
		if err := s.m.SetEigenstrain(p.region, eigenZZ(at+d)); err != nil {
			return err
		}
		p.predict(d)
		p.res.Iterations++
		s.log(fmt.Sprintf("preload: slice strain %.6g", at+d))
		_, err := s.Equilibrium()
		if err != nil {
			s.Revert()
			if err2 := s.m.SetEigenstrain(p.region, eigenZZ(at)); err2 != nil {
				return err2
			}
			if !IsNotConverged(err) || cuts == p.maxCuts {
				return fmt.Errorf("preload step from slice strain %.4g to %.4g: %w", at, at+d, err)
			}
			if cuts == 0 && (touch-at)*d > 0 && math.Abs(touch-at) < math.Abs(d)/2 {
				// A step past the touch of a closing face: its solve
				// started from deep penetration. Cut back to the touch.
				e, touch = touch, math.NaN()
				s.log(fmt.Sprintf("  not converged (%v); step cut back to where the next point of the face touches", err))
				continue
			}
			cuts++
			s.log(fmt.Sprintf("  not converged (%v); step halved", err))
			continue
		}
		if p.prev == nil {
			p.prev = make([]float64, len(s.done))
		}
		copy(p.prev, s.done)
		p.step = d
		s.Commit()
		p.res.Eigenstrain = at + d
		if p.force != nil {
			if p.res.Force, err = p.force(); err != nil {
				return err
			}
		}
		cuts = max(cuts-1, 0)
	}
	return nil
}

// predict starts the solve of an eigenstrain step d from the last two
// converged states extrapolated (from the last one alone at the first
// step).
func (p *eigenPath) predict(d float64) {
	s := p.s
	copy(s.u, s.done)
	if p.prev != nil && p.step != 0 {
		r := d / p.step
		for q, eq := range s.m.eq {
			if eq >= 0 {
				s.u[q] += r * (s.done[q] - p.prev[q])
			}
		}
	}
	s.applyPrescribed()
}

// RestartRamp makes the next ramp start from the tangent's response to
// its first change, as the first ramp does, instead of extrapolating the
// increment before it.
func (s *Solver) RestartRamp() {
	s.before, s.lastStep, s.pendingStep = nil, 0, 0
}

func eigenZZ(e float64) [4]float64 { return [4]float64{0, e, 0, 0} }

// log hands a line to the --verbose log, if any.
func (s *Solver) log(line string) {
	if s.opt.Log != nil {
		s.opt.Log(line)
	}
}
