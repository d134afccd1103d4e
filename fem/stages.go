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

// RampOptions control a displacement-controlled ramp.
type RampOptions struct {
	Increments int // equal steps to the target (≥ 1)
	MaxCuts    int // halvings of a failing step before giving up (default 6)
}

// Ramp moves the prescribed dof d from its current value to target in
// equal increments, halving a step that does not converge (at most
// MaxCuts times in a row) and growing it back after success. After every
// converged increment the state is committed and done is called; done may
// stop the ramp by returning true. A ramp that cannot go on returns a
// *NotConvergedError and leaves the solver at the last converged
// increment.
func (s *Solver) Ramp(d Dof, target float64, opt RampOptions, done func(Increment) (stop bool, err error)) error {
	if opt.Increments < 1 {
		return fmt.Errorf("fem: ramp with %d increments: need at least 1", opt.Increments)
	}
	if opt.MaxCuts == 0 {
		opt.MaxCuts = 6
	}
	start := s.m.Value(d)
	span := target - start
	step := 1.0 / float64(opt.Increments)
	at, count, cuts := 0.0, 0, 0
	for at < 1-1e-12 {
		next := math.Min(1, at+step)
		if err := s.m.SetValue(d, start+next*span); err != nil {
			return err
		}
		if err := s.predict(next - at); err != nil {
			return err
		}
		s.log(fmt.Sprintf("increment %d: %.6g → %.6g", count+1, start+at*span, start+next*span))
		its, err := s.Equilibrium()
		if err != nil {
			s.log(fmt.Sprintf("  not converged (%v); step halved", err))
			s.Revert()
			if err := s.m.SetValue(d, start+at*span); err != nil {
				return err
			}
			if !IsNotConverged(err) {
				return err
			}
			if cuts == opt.MaxCuts {
				return fmt.Errorf("fem: ramp stopped at %.4g of %.4g after %d step halvings: %w", start+at*span, target, cuts, err)
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
		if cuts == 0 {
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
}

// Preload finds the axial eigenstrain of region that makes force() equal
// target within rel (relative). A small probe gives the slope; the
// eigenstrain is then ramped to its estimate in steps (halved when one
// fails), and secant steps correct the rest. force measures the bolt force
// in the current state; every converged state is committed.
func (s *Solver) Preload(region string, target, rel float64, force func() (float64, error)) (PreloadResult, error) {
	if !(target > 0) {
		return PreloadResult{}, fmt.Errorf("fem: preload target %g N: must be positive", target)
	}
	res := PreloadResult{Eigenstrain: s.m.Eigenstrain(region)[1]}
	solveAt := func(e float64) (float64, error) {
		if err := s.m.SetEigenstrain(region, eigenZZ(e)); err != nil {
			return 0, err
		}
		res.Iterations++
		s.log(fmt.Sprintf("preload: slice strain %.6g", e))
		if _, err := s.Equilibrium(); err != nil {
			s.Revert()
			if err := s.m.SetEigenstrain(region, eigenZZ(res.Eigenstrain)); err != nil {
				return 0, err
			}
			return 0, err
		}
		s.Commit()
		f, err := force()
		res.Eigenstrain, res.Force = e, f
		return f, err
	}
	// rampTo moves the eigenstrain to e in steps of at most step, halving
	// a step that fails.
	rampTo := func(e, step float64) error {
		for math.Abs(e-res.Eigenstrain) > 1e-15 {
			d := math.Copysign(math.Min(step, math.Abs(e-res.Eigenstrain)), e-res.Eigenstrain)
			if _, err := solveAt(res.Eigenstrain + d); err != nil {
				if !IsNotConverged(err) || step < 1e-9 {
					return err
				}
				step /= 2
			}
		}
		return nil
	}
	e0, f0 := res.Eigenstrain, 0.0
	if e0 != 0 {
		var err error
		if f0, err = force(); err != nil {
			return res, err
		}
	}
	probe := e0 - 1e-5
	f1, err := solveAt(probe)
	if err != nil {
		return res, err
	}
	for it := 0; it < 30; it++ {
		if math.Abs(f1-target) <= rel*target {
			return res, nil
		}
		if f1 == f0 {
			return res, fmt.Errorf("fem: preload: bolt force does not respond to the shortening of %q", region)
		}
		e1 := res.Eigenstrain
		next := e1 + (target-f1)*(e1-e0)/(f1-f0)
		e0, f0 = e1, f1
		// Ramp in fifths of the way, or of the shortening reached when the
		// correction is smaller: a secant correction of a few per cent is
		// one step, as an increment of the ramp would be.
		if err := rampTo(next, math.Max(math.Abs(next-e1), math.Abs(e1))/5); err != nil {
			return res, err
		}
		f1 = res.Force
	}
	return res, fmt.Errorf("fem: preload: %g N not reached within 30 secant steps (last %g N)", target, f1)
}

// Shorten locks a prescribed shortening (mm) over a slice of length
// sliceLength into region as an eigenstrain and finds equilibrium: the
// nut-turn way of preloading.
func (s *Solver) Shorten(region string, shortening, sliceLength float64) error {
	if !(sliceLength > 0) {
		return fmt.Errorf("fem: preload slice length %g: must be positive", sliceLength)
	}
	if err := s.m.SetEigenstrain(region, eigenZZ(-shortening/sliceLength)); err != nil {
		return err
	}
	if _, err := s.Equilibrium(); err != nil {
		s.Revert()
		return err
	}
	s.Commit()
	return nil
}

func eigenZZ(e float64) [4]float64 { return [4]float64{0, e, 0, 0} }

// log hands a line to the --verbose log, if any.
func (s *Solver) log(line string) {
	if s.opt.Log != nil {
		s.opt.Log(line)
	}
}
