package fem

import (
	"errors"
	"fmt"
	"math"
	"time"

	"flangeseg/contact"
	"flangeseg/fem/sparse"
)

// ContactPair is what the solver needs of a contact pair; *contact.Pair
// implements it.
type ContactPair interface {
	Name() string
	Evaluate(cur []contact.Point, tangent bool, add func(dofs []int, f, k []float64) error) error
	Couplings(cur []contact.Point) [][]int
	Augment(cur []contact.Point) (maxPenetration float64, again bool)
	Commit()
	Revert()
	// SlidingCouplings is the part of the tangent left out of Evaluate's
	// (see contact.Settings.NoSlidingStiffness), nil when none.
	SlidingCouplings() []contact.Block
	// Changes lists the points whose status changed in the last Evaluate.
	Changes() []contact.Change
	// ResetFlips, Freeze and Thaw hold points whose status keeps
	// changing within a solve (see contact.Pair.Freeze).
	ResetFlips()
	Flipping(minFlips int) int
	Freeze(minFlips int) int
	Cycling() int
	FreezeCycling() int
	Thaw(cur []contact.Point) float64
	Correct(cur []contact.Point, tol float64) (worst float64, changed int)
	// MaxPenetration is the largest penetration at cur, mm.
	MaxPenetration(cur []contact.Point) float64
}

// NewtonOptions tune the equilibrium iterations.
type NewtonOptions struct {
	MaxIterations int     // per equilibrium solve (default 30)
	Tolerance     float64 // ‖residual‖ ≤ Tolerance·‖internal force‖ (default 1e-8)
	MaxAugments   int     // augmented-Lagrangian updates per solve (default 25)
	// ForceScale is a force (N) that the residual is also measured
	// against, so that a state with almost no load (rounding-level contact
	// forces) counts as converged: ‖residual‖ ≤ Tolerance·max(‖internal
	// force‖, ‖load‖, ForceScale). Zero means none.
	ForceScale float64
	// Log, if set, receives one line per iteration (the --verbose log).
	Log func(line string)
	// Inspect, if set, sees the first assembled tangent and residual (in
	// equation space) before it is factorized, e.g. to write them in
	// Matrix Market form. An error from it stops the solve.
	Inspect func(k *sparse.Matrix, rhs []float64) error
}

func (o *NewtonOptions) defaults() {
	if o.MaxIterations == 0 {
		o.MaxIterations = 30
	}
	if o.Tolerance == 0 {
		o.Tolerance = 1e-8
	}
	if o.MaxAugments == 0 {
		o.MaxAugments = 25
	}
}

// Timing splits the solver's work time.
type Timing struct {
	Assembly, Contact, Factorization, Analysis time.Duration
	Iterations, Factorizations, Analyses       int
	// Solve is the time of the triangular solves and GMRES steps
	// (Factorization excluded); KrylovSteps counts the GMRES steps.
	Solve       time.Duration
	KrylovSteps int
	// ContactFactorizations counts the factorizations of the contact
	// equations' block alone (see contactspace.go), in Factorization's
	// time but not in Factorizations.
	ContactFactorizations int
}

// Solver finds equilibrium of a model with contact, increment by
// increment, from its last converged state.
type Solver struct {
	m      *Model
	opt    NewtonOptions
	a      *assembler
	pairs  []ContactPair
	groups [][]int // element groups, then contact groups seen so far
	seen   map[string]bool
	k      *sparse.Matrix
	sym    *sparse.Symbolic
	chol   sparse.Cholesky
	// pre: chol rounded to float32, GMRES's preconditioner after its first
	// step (see preconditioner); preOK: it is the rounding of chol's
	// current factorization.
	pre     sparse.Cholesky32
	preOK   bool
	u       []float64 // current (trial) dof values
	done    []float64 // last converged
	fint    []float64
	cur     []contact.Point
	Timing  Timing
	lastRes float64
	// before, lastStep: the state before the last ramp increment and that
	// increment's change of the prescribed value (signed), for the
	// predictor; pendingStep that of the
	// increment being solved (0: none).
	before                []float64
	lastStep, pendingStep float64
	// forcesValid: fint holds the internal and contact forces at u (set by
	// assemble, cleared whenever u changes), so reactions and section
	// forces after a solve need no second assembly.
	forcesValid bool
	// couplings: the sliding-friction couplings of the last tangent, in
	// equation space, which the symmetric matrix k does not hold.
	couplings []coupling
	// factorOK: chol holds a factorization for the current pattern;
	// factorStale: of an earlier tangent than the one in k.
	factorOK, factorStale bool
	// coupled: the Newton steps include the sliding couplings.
	coupled bool
	krylov  krylovSpace
	// cs: the contact equations of a model linear apart from contact,
	// pivoted last in the factorization (see contactspace.go); nil where
	// the whole tangent changes.
	cs *contactSpace
	// unanalysed: the pattern has not been analysed yet (NewSolver).
	unanalysed bool
	// klin: the elements' part of the tangent where there is a contact
	// space; kFull: k holds the whole tangent of the last assembly.
	klin  *sparse.Matrix
	kFull bool
	// oldFactorFailed: GMRES with an older factor did not converge in
	// this equilibrium solve, so its steps factorize without trying it.
	oldFactorFailed bool
	// corrections counts the active-set corrections of frozen contact
	// points in the current equilibrium solve.
	corrections int
	anyFrozen   bool
	// patient: the solves of a preload stage, where a contact edge may
	// have to creep far along a lightly pressed face, get more iterations
	// and corrections (see patience).
	patient bool
	watch   watch
	// budget: the Newton iterations the equilibrium solve under way may
	// take in all (RampOptions.Budget), 0 for none.
	budget int
	// budgeted: the solves of a ramp that has an iteration budget (the
	// tension stage), at every step size; only they freeze late
	// (freezeStalled).
	budgeted bool
}

// coupling is a dense unsymmetric block over equations (−1: none).
type coupling struct {
	eqs []int
	k   []float64
}

// NewSolver numbers the model; its sparsity pattern is built at the first
// solve.
// Supports, rigid edges and loads must be in place; prescribed values may
// change later through Model.SetValue.
func NewSolver(m *Model, pairs []ContactPair, opt NewtonOptions) (*Solver, error) {
	opt.defaults()
	m.Number()
	s := &Solver{m: m, opt: opt, a: newAssembler(m), pairs: pairs, seen: map[string]bool{}}
	for _, g := range s.a.eqIdx {
		s.groups = append(s.groups, g)
	}
	s.u = make([]float64, m.nDof)
	s.done = make([]float64, m.nDof)
	s.fint = make([]float64, m.nDof)
	s.cur = make([]contact.Point, len(m.mesh.Nodes))
	s.applyPrescribed()
	copy(s.done, s.u)
	// The pattern is analysed at the first solve, when the contact
	// couplings of the starting position are known: analysed now, it would
	// be analysed again at once.
	s.unanalysed = true
	return s, nil
}

// Model returns the solver's model.
func (s *Solver) Model() *Model { return s.m }

// U is the current dof vector (read only).
func (s *Solver) U() []float64 { return s.u }

// Current returns the deformed node positions.
func (s *Solver) Current() []contact.Point {
	s.updateCurrent()
	return s.cur
}

func (s *Solver) applyPrescribed() {
	s.forcesValid = false
	for d, f := range s.m.fixed {
		if f {
			s.u[d] = s.m.value[d]
		}
	}
	s.m.expand(s.u)
}

func (s *Solver) updateCurrent() {
	for n, p := range s.m.mesh.Nodes {
		s.cur[n] = contact.Point{X: p.X + s.u[2*n], Z: p.Z + s.u[2*n+1]}
	}
}

// Equilibrium iterates to equilibrium at the model's current prescribed
// values and loads, starting from the current state, with
// augmented-Lagrangian updates of the contact pairs until every pair's
// penetration is within its tolerance. It returns the Newton iterations
// used. On failure the state is left as it is: call Revert.
func (s *Solver) Equilibrium() (int, error) {
	s.applyPrescribed()
	s.updateCurrent()
	fext, err := s.m.externalForces()
	if err != nil {
		return 0, err
	}
	total := 0
	for aug := 0; ; aug++ {
		limit := s.opt.MaxIterations
		if s.budget > 0 {
			// A multiplier update after a converged round moves the state
			// little; it gets a few iterations whatever is left.
			limit = min(limit, max(s.budget-total, min(augmentFloor, s.budget)))
		}
		n, err := s.newton(fext, limit)
		total += n
		if err != nil {
			return total, err
		}
		again := false
		for _, p := range s.pairs {
			if _, more := p.Augment(s.cur); more {
				again = true
			}
		}
		if !again {
			return total, nil
		}
		if aug == s.opt.MaxAugments {
			return total, &NotConvergedError{Iterations: total, Residual: s.lastRes,
				Reason: fmt.Sprintf("contact penetration still above its tolerance after %d multiplier updates", aug)}
		}
	}
}

func (s *Solver) newton(fext []float64, limit int) (int, error) {
	du := make([]float64, s.m.nEq)
	// Contact makes the residual piecewise smooth: a point on the edge of
	// the contact zone or on the stick–slip boundary changes status with
	// the step, and Newton's method can fall into a cycle between states.
	// Safeguards:
	//   - a step that leaves the residual about where it was, or raises it
	//     tenfold, is cut back by halves (a backtracking line search on
	//     the residual norm, Dennis & Schnabel 1983, ch. 6); with
	//     path-dependent materials (where a full step can carry yielding
	//     zones far off), or once the sliding couplings are dropped, so is
	//     any step that raises it. Early on, without yielding, a first step
	//     after contact closes rightly overshoots, and cutting it would only
	//     slow the active-set search. The norm compared is the absolute one:
	//     the relative residual saturates at 1 when a step creates large
	//     spurious contact forces.
	//   - after coupledIterations the sliding-friction couplings are left
	//     out, so the steps come from a symmetric positive definite tangent,
	//     which contract steadily, if only linearly;
	//   - from freezeAfter on, contact points that have changed status
	//     twice are frozen at their status (contact.Pair.Freeze); the
	//     converged state is accepted only if the frozen points' forces are
	//     within frozenTolerance of their laws' (Thaw), else they go free
	//     and the iterations go on.
	prev, step := math.Inf(1), 1.0
	last := make([]float64, len(s.u))
	s.coupled, s.oldFactorFailed = true, false
	for _, p := range s.pairs {
		p.ResetFlips()
	}
	s.corrections, s.anyFrozen = 0, false
	s.watch = watch{at: -1}
	for it := 1; ; it++ {
		if err := s.ensurePattern(); err != nil {
			s.thaw()
			return it, err
		}
		if err := s.assemble(true); err != nil {
			s.thaw()
			var pe *PointError
			if errors.As(err, &pe) {
				return it, &NotConvergedError{Iterations: it - 1, Residual: s.lastRes, Reason: err.Error()}
			}
			return it, err
		}
		r := s.m.freeResidual(fext, s.fint)
		ref := math.Max(math.Max(norm(s.fint), norm(fext)), s.opt.ForceScale)
		nr := norm(r)
		rel := 0.0
		if ref > 0 {
			rel = nr / ref
		}
		s.lastRes = rel
		s.Timing.Iterations++
		s.watch.record(s, it, rel, r)
		if s.opt.Log != nil {
			s.opt.Log(fmt.Sprintf("  iteration %2d  relative residual %.3e%s", it, rel, s.iterationNote()))
		}
		if rel <= s.opt.Tolerance {
			if s.settled(frozenTolerance * s.opt.Tolerance * ref) {
				s.thaw()
				return it - 1, nil
			}
			s.forcesValid = false
			prev, step = math.Inf(1), 1
			continue
		}
		// With points frozen, the rest of the solve is smooth and the
		// frozen points' laws can be checked as soon as the residual is
		// small, not only at the tolerance: a point that is clearly off its
		// law (by far more than the residual could move it) is corrected
		// an iteration or two earlier, and the quadratic tail is spent
		// once, on the corrected set.
		if s.anyFrozen && rel < earlyCheckBelow &&
			!s.settled(math.Max(frozenTolerance*s.opt.Tolerance*ref, earlyCheckMargin*nr)) {
			s.forcesValid = false
			prev, step = math.Inf(1), 1
			continue
		}
		// Checked before the line search, so that the steps it cuts back
		// count against the limit too.
		if math.IsNaN(rel) || it > limit {
			s.thaw()
			reason := "the residual does not fall below the tolerance"
			if limit < s.opt.MaxIterations {
				reason += fmt.Sprintf(" within the increment's budget of %d iterations (multiplier updates included)", s.budget)
			}
			return it - 1, s.watch.failure(s.m, it-1, rel, reason)
		}
		// Frozen points keep their branch, so the sliding couplings of the
		// frozen sliding points stay valid: keep them, for quadratic steps.
		s.coupled = it <= coupledIterations || s.anyFrozen
		// A moderate rise (less than double) that comes with contact points
		// changing status, in the first coupledIterations, is the
		// active-set search at work (the step found a better set, its
		// residual is that of the new set); cutting it back would only slow
		// the search. Larger rises, and later ones (by then a set that
		// keeps changing is cycling), are cut back.
		changes := 0
		for _, p := range s.pairs {
			changes += len(p.Changes())
		}
		// A tenfold rise with contact is a step that pushed the bodies far
		// into each other (a large contact force that is no equilibrium of
		// anything); without contact it can be the right step of a large
		// rotation.
		overshoot := len(s.pairs) > 0 && nr > 10*prev
		searching := changes > 0 && s.coupled && nr < 2*prev
		rise := overshoot || ((s.m.HasHistory() || !s.coupled) && nr > prev && !searching)
		// A step that leaves the residual where it was may have jumped to
		// the mirror image of a two-state cycle: cut it twice at most,
		// then take a fresh step; a rise is cut back further.
		stall := math.Abs(nr/prev-1) < 0.05 && step > 1.0/4
		if (rise && step > 1.0/64) || stall {
			step /= 2
			s.retreat(last, du, step)
			continue
		}
		prev, step = nr, 1
		copy(last, s.u)
		// Late in an increment under a budget, points that have gone back
		// to an earlier status are frozen whatever the residual: they
		// cycle, and the budget would halve the step for them.
		early := rel < freezeBelow*s.watch.first
		late := !early && it >= freezeStalled && s.budgeted
		if it >= freezeAfter && (early || late) && s.corrections <= s.maxCorrections() {
			// Freezing suits a few points chattering at a kink; where many
			// flip, the active set is still being found, and freezing it
			// would only fix a wrong guess.
			candidates := 0
			for _, p := range s.pairs {
				if late {
					candidates += p.Cycling()
				} else {
					candidates += p.Flipping(2)
				}
			}
			n := 0
			if candidates <= maxFreeze {
				for _, p := range s.pairs {
					if late {
						n += p.FreezeCycling()
					} else {
						n += p.Freeze(2)
					}
				}
			}
			if n > 0 && !s.anyFrozen {
				s.log(fmt.Sprintf("  %d contact points frozen at their status", n))
			}
			s.anyFrozen = n > 0
		}
		if s.opt.Inspect != nil {
			inspect := s.opt.Inspect
			s.opt.Inspect = nil
			if err := inspect(s.k, r); err != nil {
				return it, err
			}
		}
		// An interior residual far below what convergence asks for is
		// left out of a contact-space solve (see contactDirection).
		start := time.Now()
		err := s.direction(du, r, forcing(rel), interiorShare*s.opt.Tolerance*ref)
		s.Timing.Solve += time.Since(start)
		if err != nil {
			s.thaw()
			return it, err
		}
		s.m.update(s.u, du)
		s.forcesValid = false
	}
}

// retreat sets u to the state before the last step plus the fraction step
// of it.
func (s *Solver) retreat(before, du []float64, step float64) {
	copy(s.u, before)
	scaled := make([]float64, len(du))
	for i, v := range du {
		scaled[i] = step * v
	}
	s.m.update(s.u, scaled)
	s.forcesValid = false
}

// direction solves the Newton equations K·du = r. The factorization of an
// earlier tangent stays in use as long as it serves: GMRES on the current
// tangent, preconditioned by it, needs only a few products when the
// tangent has changed little (an elastic increment, a few contact points
// changing status), and a factorization costs tens of such products.
// Sliding friction adds couplings that no symmetric factorization holds,
// so while points slide the solve is always GMRES, to the relative
// tolerance tol.
func (s *Solver) direction(du, r []float64, tol, interiorBelow float64) error {
	if s.cs != nil {
		return s.contactDirection(du, r, tol, interiorBelow)
	}
	return s.plainDirection(du, r, tol)
}

// plainDirection is direction with the whole tangent: an old factor
// preconditions GMRES on it.
func (s *Solver) plainDirection(du, r []float64, tol float64) error {
	if err := s.wholeTangent(); err != nil {
		return err
	}
	couplings := len(s.couplings) > 0 && s.coupled
	if s.factorOK && !s.factorStale && !couplings {
		return s.chol.SolveVecTo(du, r)
	}
	if s.factorOK && !s.oldFactorFailed {
		steps, rel, err := s.krylov.gmres(s.mulTangent, s.preconditioner(), r, du, tol, krylovSteps, krylovSteps)
		s.Timing.KrylovSteps += steps
		if err == nil && rel <= tol {
			if steps > krylovSteps/2 {
				s.factorOK = false // cheaper to factorize next time
			}
			return nil
		}
		// While contact statuses keep changing from one iteration to the
		// next, an older factor fails again: for the rest of this solve,
		// factorize directly.
		s.oldFactorFailed = true
	}
	if err := s.factorize(); err != nil {
		return err
	}
	if !couplings {
		return s.chol.SolveVecTo(du, r)
	}
	steps, _, err := s.krylov.gmres(s.mulTangent, s.preconditioner(), r, du, tol, 30, 4*krylovSteps)
	s.Timing.KrylovSteps += steps
	return err
}

// preconditioner returns GMRES's preconditioner for one solve: the
// factorization itself for the first step, its copy rounded to float32
// (rounded once per factorization) for the others, whose solves read half
// the memory. The flexible GMRES allows a preconditioner that changes from
// step to step. The first step alone decides the result where the factor
// is that of the current tangent or nearly so, e.g. in an elastic
// increment (relative residual 1e-12 after one step); rounded, it would
// leave errors of some 6e-8 without the symmetry of the load, enough to
// seed a necking mode in a bar pulled past its Considère point (the
// uniaxial verification row failed so). Later steps correct what the
// first left, and the rounding spoils a correction only in proportion to
// its size.
func (s *Solver) preconditioner() func(dst, v []float64) error {
	first := true
	return func(dst, v []float64) error {
		if first {
			first = false
			return s.chol.SolveVecTo(dst, v)
		}
		if !s.preOK {
			if err := s.pre.Round(&s.chol); err != nil {
				return err
			}
			s.preOK = true
		}
		return s.pre.SolveVecTo(dst, v)
	}
}

// forcing is the inner solve's relative tolerance at the nonlinear
// relative residual rel: proportional to it between krylovTolerance and
// krylovLoose, so a far-off iterate is not solved for more exactly than it
// deserves and the steps still converge quadratically near the solution
// (an inexact Newton method with η = O(‖r‖): Dembo, Eisenstat & Steihaug
// 1982; Eisenstat & Walker 1996).
func forcing(rel float64) float64 { return min(krylovLoose, max(krylovTolerance, rel)) }

// The inner solve's relative residual: at the least krylovTolerance, far
// below the nonlinear residual's tolerance relative to the first residual,
// so the inexact Newton steps converge as exact ones would, and at the
// most krylovLoose; and the GMRES steps allowed with an old factorization
// before a new one is made.
const (
	// interiorShare: the share of the Newton tolerance that an interior
	// residual left out of a contact-space solve may reach; it stays in
	// the residual, a thousandth of what convergence allows.
	interiorShare   = 1e-3
	krylovTolerance = 1e-6
	krylovLoose     = 1e-3
	krylovSteps     = 12
	// coupledIterations: Newton iterations of one solve with the full
	// tangent before the sliding couplings are dropped.
	coupledIterations = 8
	// freezeAfter: the Newton iteration of a solve from which points that
	// have changed status twice are frozen, once the residual is below
	// freezeBelow times the solve's first; maxThaws: how often frozen
	// points may be released for violating their law before freezing
	// stops; frozenTolerance: the force by which a frozen point may be off
	// its law, in units of the residual's tolerance (Tolerance·reference
	// force): ten times what equilibrium is checked to, some 0.6 N on a
	// 570 kN preload.
	freezeAfter = 4
	freezeBelow = 1e-2
	// earlyCheckBelow: the relative residual below which the laws of
	// frozen points are checked before convergence, against the larger of
	// the converged check's tolerance and earlyCheckMargin times the
	// residual's norm.
	earlyCheckBelow  = 1e-4
	earlyCheckMargin = 10
	freezeStalled    = 8
	maxFreeze        = 64
	maxThaws         = 6
	// patientIterations, patientCorrections: the limits under patience.
	patientIterations  = 60
	patientCorrections = 20
	frozenTolerance    = 10
	// augmentFloor: the Newton iterations a multiplier update may take
	// even where an increment's budget (RampOptions.Budget) is spent.
	augmentFloor = 3
)

// Commit accepts the current state as converged.
func (s *Solver) Commit() {
	if s.pendingStep != 0 {
		if s.before == nil {
			s.before = make([]float64, len(s.done))
		}
		copy(s.before, s.done)
		s.lastStep, s.pendingStep = s.pendingStep, 0
	}
	copy(s.done, s.u)
	s.m.CommitHistory()
	for _, p := range s.pairs {
		p.Commit()
	}
}

// Revert returns to the last converged state.
func (s *Solver) Revert() {
	copy(s.u, s.done)
	s.forcesValid = false
	for _, p := range s.pairs {
		p.Revert()
	}
	s.updateCurrent()
}

// unstable turns a tangent that is not positive definite into a failed
// equilibrium solve where that is a state of the structure, not a missing
// support: with yielding or large deformation the tangent of an iterate,
// or past a limit point, can be indefinite, and the step is to be cut.
// The error carries what the solve's iterations showed, like any other
// failed solve. The failing pivot is named for the log only: under a
// fill-reducing ordering it is where the elimination noticed the lost
// stiffness, which need not be where the joint gives way.
func (s *Solver) unstable(err error) error {
	if !s.m.HasHistory() {
		if _, small := s.m.kin.(SmallStrain); small {
			return err
		}
	}
	e := s.watch.failure(s.m, max(s.watch.its-1, 0), s.lastRes, "the tangent is not positive definite")
	e.Indefinite = true
	var ue *UnsupportedError
	if errors.As(err, &ue) {
		e.Pivot = s.m.describePlace(ue.Dof)
		e.Reason += " (the factorization met a pivot ≤ 0 at " + e.Pivot + ")"
	} else {
		e.Reason += ": " + err.Error()
	}
	return e
}

// patience lets the solves until the returned function is called take
// patientIterations Newton iterations and patientCorrections corrections
// of frozen contact points: the preload of a slender flange starts from
// faces that touch everywhere without pressure, and the contact edge on
// the shell side creeps along them a few points per correction.
func (s *Solver) patience() (restore func()) {
	was, wasIts := s.patient, s.opt.MaxIterations
	s.patient = true
	s.opt.MaxIterations = max(wasIts, patientIterations)
	return func() { s.patient, s.opt.MaxIterations = was, wasIts }
}

// maxCorrections is how many corrections of frozen points a solve may make.
func (s *Solver) maxCorrections() int {
	if s.patient {
		return patientCorrections
	}
	return maxThaws
}
