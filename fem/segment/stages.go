package segment

import (
	"errors"
	"fmt"
	"math"

	"flangeseg/contact"
	"flangeseg/fem"
	"flangeseg/fem/sparse"
)

// historyRow is one converged state of the analysis.
type historyRow struct {
	increment   int
	stage       string
	z           float64 // segment force Z, N
	u           float64 // loaded-edge displacement from the preloaded state, mm
	fs          float64 // bolt force at the contact plane, N
	mInterface  float64 // bolt bending moment at the contact plane, N·mm
	mHead       float64 // bolt bending moment under the head, N·mm
	gapEdge     float64 // opening at the shell-side corner, mm
	zoneForce   []float64
	shellSide   float64 // contact force between bolt axis and shell face (x ≥ 0), N
	penetration float64 // largest penetration of any pair, mm
	zFixed      float64 // z reaction at the fixed shell end, N (equilibrium check)
	iterations  int
	// Yielding (zero with elastic laws): largest equivalent plastic
	// strain and damage indicator anywhere, per failure site, and the
	// largest damage in the bolt with where it is.
	maxPlastic, maxDamage float64
	sitePlastic           map[string]float64
	boltDamage            float64
	boltDamageWhere       string
}

// state is a converged state kept for field output.
type state struct {
	label    string
	row      historyRow
	solution *fem.Solution
	contacts map[string][]contact.NodeResult
	history  pointScalars // plastic strain and damage per point (nil when elastic)
}

// analysis is what a run produced, up to its last converged increment.
type analysis struct {
	rows     []historyRow
	states   []state
	preload  fem.PreloadResult
	ending   string // why the tension stage ended
	failure  error  // non-nil if the analysis stopped before its end
	timing   fem.Timing
	equation int
}

type analyseOptions struct {
	inspect  func(k *sparse.Matrix, rhs []float64) error // sees the first tangent (--dump-matrix)
	log      func(string)                                // per-iteration log (--verbose), or nil
	progress func(done, all int)                         // after each increment, or nil
	keep     func(inc int) bool                          // which increments to keep fields of
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
	v0, err := g.preload(s, res)
	if err != nil {
		if fem.IsNotConverged(err) {
			res.failure = fmt.Errorf("preload: %w", err)
			res.ending = "the preload stage did not converge"
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
	ld := g.spec.Load
	peak := 0.0
	res.ending = "maximum displacement reached"
	err = s.Ramp(g.edge.Axial, v0+ld.MaxDisplacement, fem.RampOptions{Increments: ld.Increments}, func(inc fem.Increment) (bool, error) {
		row, err := g.record(s, inc.Index, "tension", v0, inc.Iterations)
		if err != nil {
			return true, err
		}
		keep := opt.keep == nil || opt.keep(inc.Index) || inc.Fraction >= 1
		if err := g.observe(s, res, fmt.Sprintf("increment %d", inc.Index), &row, keep); err != nil {
			return true, err
		}
		res.rows = append(res.rows, row)
		if opt.progress != nil {
			opt.progress(int(math.Round(inc.Fraction*float64(ld.Increments))), ld.Increments)
		}
		peak = math.Max(peak, row.z)
		if peak > 0 && row.z < (1-ld.StopDrop)*peak {
			res.ending = fmt.Sprintf("segment force fell %.0f %% below its peak", 100*ld.StopDrop)
			return true, nil
		}
		if row.boltDamage >= 1 {
			res.ending = fmt.Sprintf("bolt rupture: damage indicator D = %.2f ≥ 1 in the %s", row.boltDamage, row.boltDamageWhere)
			return true, nil
		}
		return false, nil
	})
	res.timing = s.Timing
	if err != nil {
		var nc *fem.NotConvergedError
		if !errors.As(err, &nc) {
			return nil, err
		}
		res.failure = err
		res.ending = "the tension stage did not converge"
	}
	return res, nil
}

// preload brings the bolt to its target with the loaded edge free of
// force throughout: the slice is shortened in load steps (fem.Preload) while
// the upper flange and shell hang on the bolt and rest on the faces, so a
// gap between the faces closes as the bolt draws them together, as on
// site. Then the edge is held where the preload left it, for the tension
// stage to move it. It returns that position.
func (g *segment) preload(s *fem.Solver, res *analysis) (float64, error) {
	force := func() (float64, error) {
		f, _, _, err := s.SectionForce(g.cut.elems, g.cut.nodes, 0)
		return f, err
	}
	var err error
	if target := g.der.PreloadForce; target > 0 {
		res.preload, err = s.Preload("bolt_preload", target, force, fem.PreloadOptions{Estimate: g.preloadEstimate(target)})
	} else {
		res.preload, err = s.Shorten("bolt_preload", g.der.PreloadShortening, g.slice, 4, force)
	}
	if err != nil {
		return 0, err
	}
	if err := s.Prescribe(g.edge.Axial); err != nil {
		return 0, err
	}
	return s.U()[g.edge.Axial], nil
}

// preloadEstimate is a first estimate of the slice strain that gives the
// bolt force F: the bolt and the clamped flanges taken as springs of about
// equal stiffness E·A_s/l_k over the clamp length l_k = 2(t_f + t_w), plus
// the initial gap at the bolt axis that the shortening closes first.
func (g *segment) preloadEstimate(f float64) float64 {
	lk := 2 * (g.spec.Flange.Thickness + g.spec.Bolt.WasherThickness)
	shortening := 2*f*lk/(steelE*g.der.StressArea) + g.faceGap(0)
	return -shortening / g.slice
}

// record measures the current state.
func (g *segment) record(s *fem.Solver, inc int, stage string, v0 float64, its int) (historyRow, error) {
	row := historyRow{increment: inc, stage: stage, iterations: its}
	var err error
	if row.z, err = s.Reaction(g.edge.Axial); err != nil {
		return row, err
	}
	row.u = s.U()[g.edge.Axial] - v0
	if _, row.zFixed, err = s.NodeSetReaction("lower_end"); err != nil {
		return row, err
	}
	if row.fs, _, row.mInterface, err = s.SectionForce(g.cut.elems, g.cut.nodes, 0); err != nil {
		return row, err
	}
	if _, _, row.mHead, err = s.SectionForce(g.under.elems, g.under.nodes, 0); err != nil {
		return row, err
	}
	cur := s.Current()
	corner := g.spec.Flange.B + g.spec.Shell.Thickness/2
	best := math.Inf(1)
	for _, r := range g.faces.NodeResults(cur) {
		// The corner node itself may find no master point beyond the
		// face's end; the nearest paired node stands for it.
		if d := math.Abs(r.X - corner); d < best && r.Paired {
			best, row.gapEdge = d, r.Gap
		}
	}
	for _, z := range g.zones {
		row.zoneForce = append(row.zoneForce, g.faces.ForceBetween(cur, z.x0, z.x1))
	}
	row.shellSide = g.faces.ForceBetween(cur, 0, corner+1)
	for _, p := range []*contact.Pair{g.faces, g.head, g.nut} {
		row.penetration = math.Max(row.penetration, p.MaxPenetration(cur))
	}
	return row, nil
}

// observe evaluates the integration points once for what a recorded
// increment needs of them: the yielding figures of its row (with a
// path-dependent law) and, if keep, the state for field output.
func (g *segment) observe(s *fem.Solver, res *analysis, label string, row *historyRow, keep bool) error {
	history := g.model.HasHistory()
	if !keep && !history {
		return nil
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
		row.maxPlastic, row.maxDamage, row.sitePlastic = ps.maxPlastic, ps.maxDmg, ps.site
		row.boltDamage, row.boltDamageWhere = ps.boltDamage, ps.boltDamageWhere
	}
	if keep {
		return g.keepState(s, res, label, *row, sol, ps.points)
	}
	return nil
}

// keepState keeps a converged state for field output: its solution (with
// Cauchy stress under large deformation), yielding scalars and contact.
func (g *segment) keepState(s *fem.Solver, res *analysis, label string, row historyRow, sol *fem.Solution, scalars pointScalars) error {
	var err error
	if g.spec.Analysis.LargeDeformation {
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
