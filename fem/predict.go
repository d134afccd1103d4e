package fem

// Where an increment starts: the predictors of a ramp.

import (
	"errors"
	"time"
)

// predict starts the next increment of a ramp from the last converged
// state plus the last increment's change, scaled to the new step: a
// linear extrapolation that spares most of the first iteration's
// imbalance. The first increment of a ramp has no change to extrapolate
// and starts from the tangent's response instead (tangentPredict).
func (s *Solver) predict(step float64) error {
	s.pendingStep = step
	if s.lastStep == 0 || s.before == nil {
		return s.tangentPredict()
	}
	was := s.penetration()
	r := step / s.lastStep
	for d, q := range s.m.eq {
		if q >= 0 {
			s.u[d] = s.done[d] + r*(s.done[d]-s.before[d])
		}
	}
	s.m.expand(s.u)
	s.forcesValid = false
	if s.penetration() > was+predictorPenetration {
		// The extrapolation runs into a contact that the last increment
		// did not have (a free edge touching down as the flange pries);
		// the forces of that penetration would throw the first Newton
		// steps far off. Start from the tangent's response instead.
		copy(s.u, s.done)
		s.forcesValid = false
		return s.tangentPredict()
	}
	return nil
}

// predictorPenetration is the new penetration (mm) an extrapolated
// start may make before the increment starts from the tangent's response
// instead: ten times the contact pairs' usual tolerance.
const predictorPenetration = 0.01

// penetration is the largest penetration of any contact pair at u.
func (s *Solver) penetration() float64 {
	s.updateCurrent()
	worst := 0.0
	for _, p := range s.pairs {
		worst = max(worst, p.MaxPenetration(s.cur))
	}
	return worst
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
	err = s.direction(du, r, krylovTolerance, 0)
	s.Timing.Solve += time.Since(start)
	return du, err
}
