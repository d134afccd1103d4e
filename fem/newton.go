package fem

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
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
	Thaw(cur []contact.Point) float64
	Correct(cur []contact.Point, tol float64) (worst float64, changed int)
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
}

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

// Solver finds equilibrium of a model with contact, increment by
// increment, from its last converged state.
type Solver struct {
	m       *Model
	opt     NewtonOptions
	a       *assembler
	pairs   []ContactPair
	groups  [][]int // element groups, then contact groups seen so far
	seen    map[string]bool
	k       *sparse.Matrix
	sym     *sparse.Symbolic
	chol    sparse.Cholesky
	u       []float64 // current (trial) dof values
	done    []float64 // last converged
	fint    []float64
	cur     []contact.Point
	Timing  Timing
	lastRes float64
	// before, lastStep: the state before the last ramp increment and that
	// increment's size, for the predictor; pendingStep the size of the
	// increment being solved.
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
	// oldFactorFailed: GMRES with an older factor did not converge in
	// this equilibrium solve, so its steps factorize without trying it.
	oldFactorFailed bool
	// corrections counts the active-set corrections of frozen contact
	// points in the current equilibrium solve.
	corrections int
	anyFrozen   bool
	watch       watch
}

// coupling is a dense unsymmetric block over equations (−1: none).
type coupling struct {
	eqs []int
	k   []float64
}

// NewSolver numbers the model and builds the first sparsity pattern.
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
	if err := s.rebuild(); err != nil {
		return nil, err
	}
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

// groupKey identifies a coupling group by its sorted equations.
func groupKey(g []int) string {
	q := slices.Clone(g)
	slices.Sort(q)
	var b strings.Builder
	for _, v := range q {
		if v >= 0 {
			b.WriteString(strconv.Itoa(v))
			b.WriteByte(',')
		}
	}
	return b.String()
}

// ensurePattern adds the contact couplings at the current positions to the
// pattern, rebuilding it (and the symbolic analysis) when one is new.
func (s *Solver) ensurePattern() error {
	s.updateCurrent()
	fresh := false
	for _, p := range s.pairs {
		for _, dofs := range p.Couplings(s.cur) {
			g := s.equations(dofs)
			key := groupKey(g)
			if s.seen[key] {
				continue
			}
			s.seen[key] = true
			s.groups = append(s.groups, g)
			fresh = true
		}
	}
	if !fresh {
		return nil
	}
	return s.rebuild()
}

// equations maps node dofs to equations (tied dofs to their masters).
func (s *Solver) equations(dofs []int) []int {
	var g []int
	for _, d := range dofs {
		if ts := s.m.depends[d]; ts != nil {
			for _, t := range ts {
				g = append(g, s.m.eq[t.master])
			}
			continue
		}
		g = append(g, s.m.eq[d])
	}
	return g
}

func (s *Solver) rebuild() error {
	start := time.Now()
	k, err := sparse.NewPattern(s.m.nEq, s.groups)
	if err != nil {
		return fmt.Errorf("fem: sparsity pattern: %w", err)
	}
	// Nested dissection costs more to compute but halves the work of each
	// factorization on large meshes; a Newton run factors many times.
	ord := sparse.OrderAMD
	if s.m.nEq > 50000 {
		ord = sparse.OrderNestedDissection
	}
	sym, err := sparse.Analyze(k, ord)
	if err != nil {
		return fmt.Errorf("fem: ordering: %w", err)
	}
	s.k, s.sym = k, sym
	s.factorOK = false
	s.Timing.Analysis += time.Since(start)
	s.Timing.Analyses++
	return nil
}

// assemble computes internal and contact forces and, if tangent, the
// tangent at s.u.
func (s *Solver) assemble(tangent bool) error {
	var k *sparse.Matrix
	if tangent {
		k = s.k
	}
	start := time.Now()
	if err := s.a.assemble(s.u, s.fint, k, nil); err != nil {
		return err
	}
	mid := time.Now()
	s.Timing.Assembly += mid.Sub(start)
	s.updateCurrent()
	if tangent {
		s.couplings = s.couplings[:0]
		s.factorStale = true
	}
	for _, p := range s.pairs {
		err := p.Evaluate(s.cur, tangent, func(dofs []int, f, kc []float64) error {
			return s.addContact(dofs, f, kc, k)
		})
		if err != nil {
			return fmt.Errorf("fem: contact %q: %w", p.Name(), err)
		}
		if tangent {
			for _, b := range p.SlidingCouplings() {
				eqs, kb := s.toEquations(b.Dofs, b.K)
				s.couplings = append(s.couplings, coupling{eqs: slices.Clone(eqs), k: slices.Clone(kb)})
			}
		}
	}
	s.Timing.Contact += time.Since(mid)
	s.forcesValid = true
	return nil
}

// forces makes fint hold the forces at the current u.
func (s *Solver) forces() error {
	if s.forcesValid {
		return nil
	}
	return s.assemble(false)
}

func (s *Solver) addContact(dofs []int, f, kc []float64, k *sparse.Matrix) error {
	for i, d := range dofs {
		s.fint[d] += f[i]
	}
	if k == nil || kc == nil {
		return nil
	}
	if s.a.dup != nil {
		addProduct(s.a.kdup, s.a.dup, dofs, kc)
	}
	return k.AddDense(s.toEquations(dofs, kc))
}

// toEquations maps a dense block over node dofs to the equations, folding
// tied dofs onto their masters; the slices may be the assembler's buffers.
func (s *Solver) toEquations(dofs []int, kc []float64) ([]int, []float64) {
	ds := make([]Dof, len(dofs))
	tied := false
	for i, d := range dofs {
		ds[i] = Dof(d)
		tied = tied || s.m.depends[d] != nil
	}
	idx := make([]int, 0, len(dofs))
	if !tied {
		for _, d := range dofs {
			idx = append(idx, s.m.eq[d])
		}
		return idx, kc
	}
	indep, t := s.m.tieMap(ds)
	em := elementMap{dofs: ds, indep: indep, t: t}
	for _, d := range indep {
		idx = append(idx, s.m.eq[d])
	}
	return idx, s.a.transform(&em, kc)
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
		n, err := s.newton(fext)
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

func (s *Solver) newton(fext []float64) (int, error) {
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
	s.watch = watch{}
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
			s.opt.Log(fmt.Sprintf("  iteration %2d  relative residual %.3e%s", it, rel, s.iterationNote(r)))
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
		if math.IsNaN(rel) || it > s.opt.MaxIterations {
			s.thaw()
			return it - 1, s.watch.failure(it-1, rel, "the residual does not fall below the tolerance")
		}
		if it >= freezeAfter && rel < freezeBelow*s.watch.first && s.corrections <= maxThaws {
			// Freezing suits a few points chattering at a kink; where many
			// flip, the active set is still being found, and freezing it
			// would only fix a wrong guess.
			candidates := 0
			for _, p := range s.pairs {
				candidates += p.Flipping(2)
			}
			n := 0
			if candidates <= maxFreeze {
				for _, p := range s.pairs {
					n += p.Freeze(2)
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
		start := time.Now()
		err := s.direction(du, r, forcing(rel))
		s.Timing.Solve += time.Since(start)
		if err != nil {
			s.thaw()
			return it, err
		}
		s.m.update(s.u, du)
		s.forcesValid = false
	}
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
	if s.corrections > maxThaws {
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
func (s *Solver) direction(du, r []float64, tol float64) error {
	couplings := len(s.couplings) > 0 && s.coupled
	if s.factorOK && !s.factorStale && !couplings {
		return s.chol.SolveVecTo(du, r)
	}
	if s.factorOK && !s.oldFactorFailed {
		steps, rel, err := s.krylov.gmres(s.mulTangent, s.chol.SolveVecTo, r, du, tol, krylovSteps, krylovSteps)
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
	start := time.Now()
	err := s.chol.Factorize(s.sym, s.k)
	s.Timing.Factorization += time.Since(start)
	s.Timing.Solve -= time.Since(start)
	if err != nil {
		s.factorOK = false
		return s.unstable(s.m.factorError(err))
	}
	s.Timing.Factorizations++
	s.factorOK, s.factorStale = true, false
	if !couplings {
		return s.chol.SolveVecTo(du, r)
	}
	steps, _, err := s.krylov.gmres(s.mulTangent, s.chol.SolveVecTo, r, du, tol, 30, 4*krylovSteps)
	s.Timing.KrylovSteps += steps
	return err
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
	krylovTolerance = 1e-6
	krylovLoose     = 1e-3
	krylovSteps     = 12
	// coupledIterations: Newton iterations of one solve with the full
	// tangent before the sliding couplings are dropped.
	coupledIterations = 8
	// freezeAfter: the Newton iteration of a solve from which points that
	// have changed status twice are frozen; maxThaws: how often frozen
	// points may be released for violating their law before freezing
	// stops; frozenTolerance: the force by which a frozen point may be off
	// its law, in units of the residual's tolerance (Tolerance·reference
	// force): ten times what equilibrium is checked to, some 0.6 N on a
	// 570 kN preload.
	freezeAfter     = 4
	freezeBelow     = 1e-2
	maxFreeze       = 64
	maxThaws        = 6
	frozenTolerance = 10
)

// mulTangent is dst = K·v for the full current tangent: the symmetric
// matrix plus the sliding-friction couplings.
func (s *Solver) mulTangent(dst, v []float64) error {
	s.k.MulVecTo(dst, v)
	if !s.coupled {
		return nil
	}
	for _, c := range s.couplings {
		n := len(c.eqs)
		for i, ei := range c.eqs {
			if ei < 0 {
				continue
			}
			sum := 0.0
			for j, ej := range c.eqs {
				if ej >= 0 {
					sum += c.k[i*n+j] * v[ej]
				}
			}
			dst[ei] += sum
		}
	}
	return nil
}

// predict starts the next increment of a ramp from the last converged
// state plus the last increment's change, scaled to the new step: a
// linear extrapolation that spares most of the first iteration's
// imbalance. The first increment of a ramp has no change to extrapolate
// and starts from the tangent's response instead (tangentPredict).
func (s *Solver) predict(step float64) error {
	s.pendingStep = step
	if s.lastStep <= 0 || s.before == nil {
		return s.tangentPredict()
	}
	r := step / s.lastStep
	for d, q := range s.m.eq {
		if q >= 0 {
			s.u[d] = s.done[d] + r*(s.done[d]-s.before[d])
		}
	}
	s.m.expand(s.u)
	s.forcesValid = false
	return nil
}

// tangentPredict moves the free dofs by the tangent's response to the
// change of the prescribed values, u_f += K_ff⁻¹·(r₀ − K_fp·Δu_p). The
// prescribed values alone would strain only the elements next to them, by
// the whole increment: under a loaded edge that is far past yield, and
// Newton's method starts from a state it may not find its way back from.
// K_fp·Δu_p is summed from the element and contact tangents at the
// converged state as they are assembled; K_ff is solved as a Newton step
// is. Where the tangent is of no use (a point without an answer, an
// indefinite tangent), the increment starts from the prescribed values
// alone.
func (s *Solver) tangentPredict() error {
	dup := make([]float64, s.m.nDof)
	change := false
	for d, f := range s.m.fixed {
		if f && s.m.value[d] != s.done[d] {
			dup[d], change = s.m.value[d]-s.done[d], true
		}
	}
	if !change {
		return nil
	}
	s.m.expand(dup)
	du, err := s.tangentResponse(dup)
	copy(s.u, s.done)
	s.applyPrescribed()
	var pe *PointError
	switch {
	case errors.As(err, &pe) || IsNotConverged(err):
		s.factorOK = false
		return nil
	case err != nil:
		return err
	}
	s.m.update(s.u, du)
	s.forcesValid = false
	return nil
}

// tangentResponse assembles the tangent at the converged state, with the
// product K·dup beside it, and solves K_ff·du = r₀ − K_fp·Δu_p.
func (s *Solver) tangentResponse(dup []float64) ([]float64, error) {
	copy(s.u, s.done)
	s.m.expand(s.u)
	s.forcesValid = false
	if err := s.ensurePattern(); err != nil {
		return nil, err
	}
	fext, err := s.m.externalForces()
	if err != nil {
		return nil, err
	}
	s.a.dup, s.a.kdup = dup, make([]float64, s.m.nDof)
	err = s.assemble(true)
	kdup := s.a.kdup
	s.a.dup, s.a.kdup = nil, nil
	if err != nil {
		return nil, err
	}
	r := s.m.freeResidual(fext, s.fint)
	change := s.m.freeResidual(make([]float64, s.m.nDof), kdup) // −K_fp·Δu_p
	for i := range r {
		r[i] += change[i]
	}
	du := make([]float64, s.m.nEq)
	s.coupled, s.oldFactorFailed = true, false
	start := time.Now()
	err = s.direction(du, r, krylovTolerance)
	s.Timing.Solve += time.Since(start)
	return du, err
}

// Commit accepts the current state as converged.
func (s *Solver) Commit() {
	if s.pendingStep > 0 {
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

// Reaction is the generalised force the constraints exert at dof d in the
// current state (after Equilibrium; a model change since then, such as a new
// eigenstrain, needs an Equilibrium first): a rigid edge's master collects
// its nodes' forces.
func (s *Solver) Reaction(d Dof) (float64, error) {
	if err := s.forces(); err != nil {
		return 0, err
	}
	fext, err := s.m.externalForces()
	if err != nil {
		return 0, err
	}
	r := make([]float64, s.m.nDof)
	for i := range r {
		r[i] = s.fint[i] - fext[i]
	}
	s.m.reduce(r)
	return r[d], nil
}

// NodeSetReaction sums the constraint forces (x, z) over a node set.
func (s *Solver) NodeSetReaction(set string) (rx, rz float64, err error) {
	nodes, ok := s.m.mesh.NodeSets[set]
	if !ok {
		return 0, 0, fmt.Errorf("fem: node set %q does not exist", set)
	}
	if err := s.forces(); err != nil {
		return 0, 0, err
	}
	fext, err := s.m.externalForces()
	if err != nil {
		return 0, 0, err
	}
	for _, n := range nodes {
		rx += s.fint[2*n] - fext[2*n]
		rz += s.fint[2*n+1] - fext[2*n+1]
	}
	return rx, rz, nil
}

// SectionForce cuts a body along the node line nodes and returns the
// resultant that the elements elems (one side of the cut) carry there:
// the normal force in z (tension positive when elems lie above the cut),
// the shear in x, and the moment about x = x0 (positive when the side
// x > x0 carries more tension). The nodal internal forces of the elements
// are the consistent integral of their section stresses.
func (s *Solver) SectionForce(elems []int, nodes []int, x0 float64) (normal, shear, moment float64, err error) {
	on := map[int]bool{}
	for _, n := range nodes {
		on[n] = true
	}
	sc := newScratch()
	for _, e := range elems {
		el := s.m.mesh.Elements[e]
		nd := 2 * len(el.Nodes)
		ue, fe := sc.ue[:nd], sc.fe[:nd]
		for a, n := range el.Nodes {
			ue[2*a], ue[2*a+1] = s.u[2*n], s.u[2*n+1]
		}
		if err := s.m.elementResponse(e, ue, fe, nil, nil, sc); err != nil {
			return 0, 0, 0, err
		}
		for a, n := range el.Nodes {
			if !on[n] {
				continue
			}
			normal -= fe[2*a+1]
			shear -= fe[2*a]
			moment -= fe[2*a+1] * (s.m.mesh.Nodes[n].X - x0)
		}
	}
	return normal, shear, moment, nil
}

// Points returns the integration point results in the current state.
func (s *Solver) Points() ([][]PointResult, error) {
	pts := s.m.newPointResults()
	s.forcesValid = false // fint is used for element forces alone here
	if err := s.a.assemble(s.u, s.fint, nil, pts); err != nil {
		return nil, err
	}
	return pts, nil
}

// Snapshot returns the current state as a Solution (for stresses and
// field output).
func (s *Solver) Snapshot() (*Solution, error) {
	pts, err := s.Points()
	if err != nil {
		return nil, err
	}
	return &Solution{model: s.m, U: slices.Clone(s.u), Points: pts, Equations: s.m.nEq, FactorNonzeros: s.sym.FactorNNZ()}, nil
}

// unstable turns a tangent that is not positive definite into a failed
// equilibrium solve where that is a state of the structure, not a missing
// support: with yielding or large deformation the tangent of an iterate,
// or past a limit point, can be indefinite, and the step is to be cut.
func (s *Solver) unstable(err error) error {
	if !s.m.HasHistory() {
		if _, small := s.m.kin.(SmallStrain); small {
			return err
		}
	}
	return &NotConvergedError{Iterations: s.Timing.Iterations, Residual: s.lastRes, Reason: "the tangent is not positive definite: " + err.Error()}
}

// IsNotConverged reports whether err is a failed equilibrium solve.
func IsNotConverged(err error) bool {
	var nc *NotConvergedError
	return errors.As(err, &nc)
}

// iterationNote describes where the residual r is largest and which
// contact points changed status, for the --verbose log.
func (s *Solver) iterationNote(r []float64) string {
	worst, at := 0.0, -1
	for d, q := range s.m.eq {
		if q >= 0 && math.Abs(r[q]) > worst {
			worst, at = math.Abs(r[q]), d
		}
	}
	var b strings.Builder
	if at >= 0 {
		fmt.Fprintf(&b, "  largest %.3g N at %s", worst, s.m.DescribeDof(Dof(at)))
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
	first, best float64
	largest     float64
	where       string
	cycling     map[string]*Cycling
	seen        map[string]map[[2]float64]bool
	statuses    map[string]map[string]bool
	order       []string
}

// record notes iteration it with relative residual rel and residual r.
func (w *watch) record(s *Solver, it int, rel float64, r []float64) {
	if it == 1 {
		w.first, w.best = rel, rel
	}
	w.best = math.Min(w.best, rel)
	w.largest, w.where = 0, ""
	at := -1
	for d, q := range s.m.eq {
		if q >= 0 && math.Abs(r[q]) > w.largest {
			w.largest, at = math.Abs(r[q]), d
		}
	}
	if at >= 0 {
		w.where = s.m.describePlace(Dof(at))
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

// failure builds the error of a failed solve.
func (w *watch) failure(its int, rel float64, reason string) *NotConvergedError {
	e := &NotConvergedError{Iterations: its, Residual: rel, Reason: reason, First: w.first, Best: w.best, Largest: w.largest, Where: w.where}
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
