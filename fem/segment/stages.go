package segment

import (
	"errors"
	"fmt"
	"math"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/fem/sparse"
)

// state is a converged state kept for field output.
type state struct {
	label    string
	row      figures.Row
	solution *fem.Solution
	contacts map[string][]contact.NodeResult
	history  pointScalars // plastic strain and damage per point (nil when elastic)
}

// analysis is what a run produced, up to its last converged increment.
type analysis struct {
	rows    []figures.Row
	states  []state
	preload fem.PreloadResult
	ending  string // why the tension stage ended
	failure error  // non-nil if the analysis stopped before its end
	// diagnosis says in words what stopped it and what to try.
	diagnosis string
	// retried: made a second time with the washers held sticking while
	// the bolt was tightened.
	retried bool
	// closing is what the separate tightening with the shell end free
	// found of the bolt force the closing of an initial gap took
	// (findClosing); it plays no part in the analysis.
	closing closingSearch
	// plastic holds the plastic strains of the last recorded state;
	// giving is the point whose strain grew most in reaching it (found:
	// one grew), for the diagnosis of a joint that gives way.
	plastic pointScalars
	giving  yielding
	found   bool

	timing   fem.Timing
	equation int
}

type analyseOptions struct {
	inspect  func(k *sparse.Matrix, rhs []float64) error // sees the first tangent (--dump-matrix)
	log      func(string)                                // per-iteration log (--verbose), or nil
	progress func(done, all int)                         // after each increment, or nil
	keep     func(inc int) bool                          // which increments to keep fields of
	stop     func() error                                // before and after the preload and after each increment: non-nil before the preload ends the run with it, later it ends the analysis as interrupted (analysis.interrupt)
}

// halt is the stop callback's verdict (nil without one).
func (o analyseOptions) halt() error {
	if o.stop == nil {
		return nil
	}
	return o.stop()
}

// analyse runs the preload and tension stages. A failure to converge ends
// the analysis but keeps every converged increment; it is reported in
// analysis.failure, while setup errors are returned.
func (g *segment) analyse(opt analyseOptions) (*analysis, error) {
	s, err := fem.NewSolver(g.model, g.pairs(), fem.NewtonOptions{Log: opt.log, ForceScale: g.der.DesignPreload, Tolerance: 1e-7,
		Inspect: opt.inspect})
	if err != nil {
		return nil, err
	}
	res := &analysis{equation: g.model.Equations()}
	if err := opt.halt(); err != nil {
		return nil, err
	}
	v0, err := g.preload(s, res)
	if err != nil {
		if fem.IsNotConverged(err) {
			res.failure = fmt.Errorf("preload: %w", err)
			res.ending = "the preload stage did not converge"
			res.diagnosis = g.diagnose("preload", "the unloaded state", err, nil)
			res.timing = s.Timing
			return res, nil
		}
		return nil, err
	}
	row, err := g.record(s, 0, "preload", v0, 0)
	if err != nil {
		return nil, err
	}
	if err := g.observe(s, res, "preload", &row, true); err != nil {
		return nil, err
	}
	res.rows = append(res.rows, row)
	if short, why := g.preloadFailed(row, res.preload); why != "" {
		res.failure = errors.New("preload: " + short)
		res.ending = "the preload stage did not reach a usable state"
		res.diagnosis = why
		res.timing = s.Timing
		return res, nil
	}
	if err := opt.halt(); err != nil {
		res.interrupt(err)
		res.timing = s.Timing
		return res, nil
	}
	ld := g.spec.Load
	peak := 0.0
	res.ending = "maximum displacement reached"
	var halted error // the stop callback's verdict, once it ends the ramp
	err = s.Ramp(g.edge.Axial, v0+ld.MaxDisplacement, fem.RampOptions{Increments: ld.Increments, Budget: incrementBudget, BudgetCuts: budgetCuts}, func(inc fem.Increment) (bool, error) {
		row, err := g.record(s, inc.Index, "tension", v0, inc.Iterations)
		if err != nil {
			return true, err
		}
		row.Cuts = inc.Cuts
		keep := opt.keep == nil || opt.keep(inc.Index) || inc.Fraction >= 1
		if err := g.observe(s, res, fmt.Sprintf("increment %d", inc.Index), &row, keep); err != nil {
			return true, err
		}
		res.rows = append(res.rows, row)
		if opt.progress != nil {
			opt.progress(int(math.Round(inc.Fraction*float64(ld.Increments))), ld.Increments)
		}
		if err := opt.halt(); err != nil {
			halted = err
			return true, nil
		}
		peak = math.Max(peak, row.Z)
		if peak > 0 && row.Z < (1-ld.StopDrop)*peak {
			res.ending = fmt.Sprintf("segment force fell %.0f %% below its peak", 100*ld.StopDrop)
			return true, nil
		}
		if row.BoltDamage >= 1 {
			res.ending = fmt.Sprintf("bolt rupture: damage indicator D = %.2f ≥ 1 in the %s", row.BoltDamage, row.BoltDamageWhere)
			return true, nil
		}
		// A wall that tears is as much an end as a bolt that ruptures: past
		// it the material law describes nothing real (the same ductile
		// damage indicator, with the structural steel's constants).
		if row.WallDamage >= 1 {
			res.ending = fmt.Sprintf("rupture of the %s: damage indicator D = %.2f ≥ 1", row.WallDamageWhere, row.WallDamage)
			return true, nil
		}
		return false, nil
	})
	res.timing = s.Timing
	if halted != nil {
		res.interrupt(halted)
		return res, nil
	}
	if err != nil {
		var nc *fem.NotConvergedError
		if !errors.As(err, &nc) {
			return nil, err
		}
		res.failure = err
		res.ending = "the tension stage did not converge"
		res.diagnosis = g.diagnose("tension", lastState(res.rows), err, &tensionPath{rows: res.rows, giving: res.giving, found: res.found})
	}
	return res, nil
}

// The tension stage's increments have incrementBudget Newton iterations
// (fem.RampOptions.Budget) while halved fewer than budgetCuts times. Over
// the robustness family (testdata/robust), the solves that took longer
// were cycling between contact states — whole washers between sticking
// and sliding, the face slipping and sticking as the flange begins to
// turn — until the frozen-point corrections caught them, and a half step
// needed fewer iterations than the rest of the cycling.
const (
	incrementBudget = 15
	budgetCuts      = 2
)

// preload brings the bolt to its target with the loaded edge free of
// force: the slice is shortened in load steps (fem.Preload) with the edge
// held, then the edge is moved to where it carries no force, and the two
// are repeated until the bolt force holds its target within 0.5 %. It
// returns the edge position.
//
// While the bolt is tightened the washers are held pressed
// (contact.Pair.Glue), so a Newton iterate cannot lift the bolt off both
// and leave it floating; after the first round they follow their own law.
// Where that preload fails, Segment.Run tries once more with the washers
// also held sticking while tightened (stickWashers), which keeps whole
// washers from flipping between sticking and sliding at the low pressures
// of the first steps, at the price of a locked-in friction state that
// differs a little from a tightening with sliding washers.
func (g *segment) preload(s *fem.Solver, res *analysis) (float64, error) {
	force := g.boltForce(s)
	g.tighteningWashers(true)
	target := g.der.PreloadForce
	v := 0.0
	for round := 0; round < 8; round++ {
		var pr fem.PreloadResult
		var err error
		if target > 0 {
			pr, err = s.Preload("bolt_preload", target, force, fem.PreloadOptions{Estimate: g.preloadEstimate(target), Gaps: g.faceGaps(s), Slope: res.preload.Slope})
		} else {
			pr, err = s.Shorten("bolt_preload", g.der.PreloadShortening, g.slice, 4, force)
		}
		pr.Iterations += res.preload.Iterations
		res.preload = pr
		if err != nil {
			return 0, err
		}
		if v, err = g.release(s, v); err != nil {
			return 0, err
		}
		if round == 0 {
			// The bolt is tight: from here on the washers follow their own
			// law, and the next rounds correct the preload for it.
			g.tighteningWashers(false)
			if _, err := s.Equilibrium(); err != nil {
				s.Revert()
				return 0, fmt.Errorf("preload: the washers, let go after tightening: %w", err)
			}
			s.Commit()
			if v, err = g.release(s, v); err != nil {
				return 0, err
			}
		}
		f, err := force()
		if err != nil {
			return 0, err
		}
		res.preload.Force = f
		if target == 0 || math.Abs(f-target) <= 0.005*target {
			break
		}
		if round == 7 {
			return 0, fmt.Errorf("preload: the bolt force did not settle at %.1f kN with the shell end free", target/1e3)
		}
	}
	return v, nil
}

// tighteningWashers glues the washers while on (see preload) and gives
// them back their own law after.
func (g *segment) tighteningWashers(on bool) {
	g.head.Glue(on, g.stickWashers)
	g.nut.Glue(on, g.stickWashers)
}

// release moves the loaded edge, by secant steps from v, to the position
// where its reaction vanishes. Each step is a ramp of one increment
// (started from the tangent's response, halved where it fails) and at most
// four times the one before, so a first secant estimate far off — the
// joint stiffens or softens as the faces settle — is approached in steps
// rather than in one jump; once two positions with reactions of opposite
// sign are known, a secant step that leaves them is replaced by their
// midpoint (the safeguard of Dekker's method).
func (g *segment) release(s *fem.Solver, v float64) (float64, error) {
	last := 0.0 // the edge position of the step before
	// In the closing search a point of the face can chatter at one
	// position of the edge while the positions just short of it converge:
	// a ramp that cannot reach its secant position ends at the nearest one
	// it reached, rather than halving its way towards it without end. The
	// analysis keeps the plain ramp.
	minStep := 0.0
	if g.searchingClosing {
		minStep = 1.0 / 64
	}
	// reach: how far one ramp increment may move the edge — twice the
	// largest move that has converged without halving. A secant step far
	// beyond what the joint took last time would only be halved down to
	// it, each failed attempt costing a full solve.
	reach := math.Inf(1)
	at := func(x float64) (float64, float64, error) {
		// A secant step that turns back starts from the tangent's
		// response: extrapolating the step before would push the wrong way.
		from := s.Model().Value(g.edge.Axial)
		if (x-from)*(from-last) < 0 {
			s.RestartRamp()
		}
		last = from
		n := 1
		if move := math.Abs(x - from); move > reach {
			n = int(math.Ceil(move / reach))
		}
		done, good := from, 0.0
		err := s.Ramp(g.edge.Axial, x, fem.RampOptions{Increments: n, MinStep: minStep}, func(inc fem.Increment) (bool, error) {
			if inc.Cuts == 0 {
				good = math.Max(good, math.Abs(inc.Value-done))
			}
			done = inc.Value
			return false, nil
		})
		if err != nil {
			reached := s.Model().Value(g.edge.Axial)
			if minStep == 0 || !fem.IsNotConverged(err) || reached == from {
				return 0, 0, err
			}
			x = reached
		}
		if good > 0 {
			reach = 2 * good
		}
		z, err := s.Reaction(g.edge.Axial)
		return x, z, err
	}
	defer s.RestartRamp()
	z0, err := s.Reaction(g.edge.Axial)
	if err != nil {
		return 0, err
	}
	scale := math.Max(math.Abs(g.der.PreloadForce), g.der.DesignPreload)
	type end struct{ v, z float64 }
	var lo, hi *end // the last positions with a reaction below and above zero
	note := func(v, z float64) {
		if z < 0 {
			lo = &end{v, z}
		} else if z > 0 {
			hi = &end{v, z}
		}
	}
	note(v, z0)
	v1, z1 := v-1e-3, 0.0
	for it := 0; it < 60; it++ {
		if math.Abs(z0) <= 1e-7*scale {
			return v, nil
		}
		v1, z1, err = at(v1)
		if err != nil {
			return 0, err
		}
		note(v1, z1)
		if math.Abs(z1) <= 1e-7*scale {
			return v1, nil
		}
		if z1 == z0 {
			return 0, fmt.Errorf("preload: the loaded edge does not respond")
		}
		next := v1 - z1*(v1-v)/(z1-z0)
		if limit := 4 * math.Abs(v1-v); math.Abs(next-v1) > limit {
			next = v1 + math.Copysign(limit, next-v1)
		}
		if lo != nil && hi != nil {
			a, b := math.Min(lo.v, hi.v), math.Max(lo.v, hi.v)
			if !(next > a && next < b) {
				next = (a + b) / 2
			}
		}
		if math.Abs(next-v1) <= 1e-9 {
			// The position is found to a nanometre: what force is left is
			// the stiffness of a very stiff joint times the rounding.
			return v1, nil
		}
		v, v1, z0 = v1, next, z1
	}
	return 0, &fem.NotConvergedError{Iterations: 60, Reason: "the shell end did not come free of force in 60 secant steps"}
}

// faceGaps measures the gaps of the flange faces' points (+Inf where a
// point faces nothing), for the preload's step control.
func (g *segment) faceGaps(s *fem.Solver) func() []float64 {
	return func() []float64 {
		var out []float64
		for _, r := range g.faces.NodeResults(s.Current()) {
			out = append(out, r.Gap)
		}
		return out
	}
}

// preloadEstimate is a first estimate of the slice strain that gives the
// bolt force F: the bolt and the clamped flanges taken as springs of about
// equal stiffness E·A_s/l_k over the clamp length l_k = 2(t_f + t_w), plus
// the initial gap at the bolt axis that the shortening closes first.
func (g *segment) preloadEstimate(f float64) float64 {
	lk := 2 * (g.spec.Flange.Thickness + g.spec.Bolt.WasherThickness)
	shortening := 2*f*lk/(modelfile.SteelE*g.der.StressArea) + g.faceGap(0)
	return -shortening / g.slice
}

// record measures the current state.
func (g *segment) record(s *fem.Solver, inc int, stage string, v0 float64, its int) (figures.Row, error) {
	row := figures.Row{Increment: inc, Stage: stage, Iterations: its}
	var err error
	if row.Z, err = s.Reaction(g.edge.Axial); err != nil {
		return row, err
	}
	row.U = s.U()[g.edge.Axial] - v0
	if _, row.ZFixed, err = s.NodeSetReaction("lower_end"); err != nil {
		return row, err
	}
	if row.Fs, _, row.MomentInterface, err = s.SectionForce(g.cut.elems, g.cut.nodes, 0); err != nil {
		return row, err
	}
	if _, _, row.MomentHead, err = s.SectionForce(g.under.elems, g.under.nodes, 0); err != nil {
		return row, err
	}
	cur := s.Current()
	corner := g.spec.Flange.B + g.spec.Shell.Thickness/2
	best := math.Inf(1)
	for _, r := range g.faces.NodeResults(cur) {
		// The corner node itself may find no master point beyond the
		// face's end; the nearest paired node stands for it.
		if d := math.Abs(r.X - corner); d < best && r.Paired {
			best, row.GapEdge = d, r.Gap
		}
	}
	for _, z := range g.zones {
		row.ZoneForce = append(row.ZoneForce, g.faces.ForceBetween(cur, z.x0, z.x1))
	}
	row.ShellSide = g.faces.ForceBetween(cur, 0, corner+1)
	for _, p := range []*contact.Pair{g.faces, g.head, g.nut} {
		row.Penetration = math.Max(row.Penetration, p.MaxPenetration(cur))
	}
	return row, nil
}

// observe evaluates the integration points once for what a recorded
// increment needs of them: the yielding figures of its row (with a
// path-dependent law) and, if keep, the state for field output.
func (g *segment) observe(s *fem.Solver, res *analysis, label string, row *figures.Row, keep bool) error {
	history := g.model.HasHistory()
	if !keep && !history {
		return nil
	}
	if !history {
		// Without history the points follow from the displacements: they
		// are evaluated at the end for the states that get a field file
		// (deferPoints), not for every increment.
		return g.keepState(s, res, label, *row, s.Displacements(), pointScalars{})
	}
	sol, err := s.Snapshot()
	if err != nil {
		return err
	}
	var ps plasticState
	if history {
		// The points' history aliases the model's storage, which the next
		// evaluation overwrites: read what the output needs now.
		ps = g.readPlastic(sol.Points)
		row.MaxPlastic, row.MaxDamage, row.SitePlastic = ps.maxPlastic, ps.maxDmg, ps.site
		row.BoltDamage, row.BoltDamageWhere = ps.boltDamage, ps.boltDamageWhere
		row.WallDamage, row.WallDamageWhere = ps.wallDamage, ps.wallDamageWhere
		res.giving, res.found = g.fastestYielding(res.plastic, ps.points, sol.Points)
		res.plastic = ps.points
	}
	if keep {
		return g.keepState(s, res, label, *row, sol, ps.points)
	}
	return nil
}

// keepState keeps a converged state for field output: its solution (with
// Cauchy stress under large deformation), yielding scalars and contact.
func (g *segment) keepState(s *fem.Solver, res *analysis, label string, row figures.Row, sol *fem.Solution, scalars pointScalars) error {
	var err error
	if g.spec.Analysis.LargeDeformation && sol.Points != nil {
		if sol.Points, err = sol.CauchyPoints(); err != nil {
			return err
		}
	}
	cur := s.Current()
	res.states = append(res.states, state{label: label, row: row, solution: sol, history: scalars, contacts: map[string][]contact.NodeResult{
		"faces": g.faces.NodeResults(cur),
		"head":  g.head.NodeResults(cur),
		"nut":   g.nut.NodeResults(cur),
	}})
	return nil
}

// lastState names the last converged state of the rows for a diagnosis.
func lastState(rows []figures.Row) string {
	last := rows[len(rows)-1]
	name := "the preload"
	if last.Increment > 0 {
		name = fmt.Sprintf("increment %d", last.Increment)
	}
	return fmt.Sprintf("%s (u = %.3g mm, Z = %.4g kN)", name, last.U, last.Z/1e3)
}

// preloadFailed says why a converged preload is no state to load (in
// brief and in full), or "":
// a bolt that ruptured while tightened, or a bolt that carries almost
// nothing because its shortening did not close the gap between the faces.
func (g *segment) preloadFailed(row figures.Row, pr fem.PreloadResult) (short, why string) {
	if row.BoltDamage >= 1 {
		return "the bolt ruptured while it was tightened", fmt.Sprintf("The bolt ruptured while it was tightened: the damage indicator reached D = %.2f in the %s at a bolt force of %.1f kN. What to try: a smaller preload (preload.nut_turn, preload.fraction or preload.force), or check the bolt's material curve.",
			row.BoltDamage, row.BoltDamageWhere, pr.Force/1e3)
	}
	if pr.Force < 0.05*g.der.DesignPreload {
		open := g.faceGap(0)
		return "the bolt shortening did not close the gap between the faces", fmt.Sprintf("The preload could not close the gap: after tightening the bolt carries %.1f kN, less than 5 %% of F_p,C = %.1f kN, and the faces start %.3g mm apart at the bolt axis (contact.parallel_gap, contact.taper, contact.recess). What to try: a larger nut turn (it shortens the bolt by nut_turn/360 times the pitch), a preload by force, or a smaller gap.",
			pr.Force/1e3, g.der.DesignPreload/1e3, open)
	}
	return "", ""
}
