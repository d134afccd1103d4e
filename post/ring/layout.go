package ring

import (
	"fmt"
	"math"

	"flangeseg/fem/segment/modelfile"
)

// Flange orientations: which edge of the face is the free edge x = −a.
const (
	Internal = "internal" // the flange inside the shell: its free edge is the inner edge
	External = "external" // outside the shell: its free edge is the outer edge
)

// Options are the choices of the ring check that do not come from the
// model file or the survey.
type Options struct {
	Flange string // Internal (default) or External
	// GapTolerance (mm) and TaperTolerance (deg): bolts whose parallel
	// gaps and tapers round to the same multiples of these share one
	// analysis; a parallel gap that rounds to zero is none.
	GapTolerance, TaperTolerance float64
	// SpringTolerance: ring springs are snapped to a geometric grid of
	// ratio 1 + SpringTolerance (and written to two significant digits),
	// so that the bolts of a long gap, whose springs change little from
	// one to the next, share analyses.
	SpringTolerance float64
	// RingFactor scales every bolt's ring spring (1: as derived), to
	// bracket the ring's stiffness.
	RingFactor float64
}

// Defaults of Options.
const (
	DefaultGapTolerance    = 0.02 // mm
	DefaultTaperTolerance  = 0.02 // deg
	DefaultSpringTolerance = 0.2
)

func (o *Options) defaults() {
	if o.Flange == "" {
		o.Flange = Internal
	}
	if o.GapTolerance == 0 {
		o.GapTolerance = DefaultGapTolerance
	}
	if o.TaperTolerance == 0 {
		o.TaperTolerance = DefaultTaperTolerance
	}
	if o.SpringTolerance == 0 {
		o.SpringTolerance = DefaultSpringTolerance
	}
	if o.RingFactor == 0 {
		o.RingFactor = 1
	}
}

func (o Options) check() error {
	switch {
	case o.Flange != Internal && o.Flange != External:
		return fmt.Errorf("--flange = %q: must be %q or %q", o.Flange, Internal, External)
	case !(o.GapTolerance > 0) || o.GapTolerance > 1:
		return fmt.Errorf("--gap-tolerance = %s mm: must be > 0 and at most 1 mm", formatNumber(o.GapTolerance))
	case !(o.TaperTolerance > 0) || o.TaperTolerance > 1:
		return fmt.Errorf("--taper-tolerance = %s°: must be > 0 and at most 1°", formatNumber(o.TaperTolerance))
	case !(o.SpringTolerance > 0) || o.SpringTolerance > 1:
		return fmt.Errorf("--spring-tolerance = %s: must be > 0 and at most 1", formatNumber(o.SpringTolerance))
	case !(o.RingFactor > 0) || o.RingFactor > 100:
		return fmt.Errorf("--ring-factor = %s: must be > 0 and at most 100", formatNumber(o.RingFactor))
	}
	return nil
}

// Bolt is one bolt of the ring and the imperfection of its segment.
type Bolt struct {
	Number int     // 1 … n
	Angle  float64 // deg: (Number − 1)·360/n
	// Inner and Outer are the survey's gaps at the bolt (interpolated),
	// mm; FreeEdge and ShellSide the same at the strip's free edge
	// x = −a and at its shell-side corner x = b + t/2.
	Inner, Outer        float64
	FreeEdge, ShellSide float64
	// Parallel is the gap common to the whole face width, less the
	// smallest such gap of the ring (on which the ring rests), mm; Taper
	// the tilt of each face that makes the rest, deg (positive: open
	// towards the free edge, as contact.taper).
	Parallel, Taper float64
	// Run is the number of neighbouring bolts, this one included, whose
	// parallel gaps are open (round to more than zero), and Span the
	// length of ring between the nearest closed bolts on either side, mm:
	// (Run + 1)·c. Zero without a parallel gap.
	Run  int
	Span float64
	// Spring is the ring's resistance to closing this bolt's parallel gap,
	// N/mm (contact.gap_spring; RingSpring).
	Spring float64
	Class  int // index into Plan.Classes
}

// boltGeometry is what the ring needs of the model.
type boltGeometry struct {
	n          int
	faceWidth  float64 // a + b + t/2
	spacing    float64 // c, the segment width on the bolt circle
	ring       RingSection
	minGapOpen float64
}

func geometryOf(spec *modelfile.Spec) (boltGeometry, error) {
	d := spec.Derive()
	flange, err := spec.Material(spec.Flange.Material, spec.Flange.Thickness)
	if err != nil {
		return boltGeometry{}, fmt.Errorf("flange.material: %w", err)
	}
	return boltGeometry{
		n:         spec.Tower.Bolts,
		faceWidth: spec.Flange.A + spec.Flange.B + spec.Shell.Thickness/2,
		spacing:   d.SegmentWidth,
		ring: RingSection{
			FlangeWidth: spec.Flange.A + spec.Flange.B + spec.Shell.Thickness/2, FlangeThickness: spec.Flange.Thickness,
			ShellThickness: spec.Shell.Thickness, E: flange.E, Nu: flange.Nu,
		},
	}, nil
}

// Bolts gives every bolt of the ring its segment's imperfection from the
// survey: the gaps at the bolt, its parallel gap and taper, the run of
// open bolts it belongs to and its ring spring.
func Bolts(spec *modelfile.Spec, s *Survey, opt Options) ([]Bolt, error) {
	opt.defaults()
	if err := opt.check(); err != nil {
		return nil, err
	}
	g, err := geometryOf(spec)
	if err != nil {
		return nil, err
	}
	bolts := make([]Bolt, g.n)
	rest := math.Inf(1) // the smallest parallel gap: the ring rests there
	for i := range bolts {
		b := &bolts[i]
		b.Number = i + 1
		b.Angle = float64(i) * 360 / float64(g.n)
		b.Inner, b.Outer = s.At(b.Angle)
		b.FreeEdge, b.ShellSide = b.Inner, b.Outer
		if opt.Flange == External {
			b.FreeEdge, b.ShellSide = b.Outer, b.Inner
		}
		rest = math.Min(rest, math.Min(b.FreeEdge, b.ShellSide))
	}
	for i := range bolts {
		b := &bolts[i]
		lo := math.Min(b.FreeEdge, b.ShellSide)
		b.Parallel = roundTo(lo-rest, opt.GapTolerance)
		// contact.taper tilts each face: a gap of 2·tan(taper) times the
		// face width between the edges.
		b.Taper = roundTo(math.Atan((b.FreeEdge-b.ShellSide)/(2*g.faceWidth))*180/math.Pi, opt.TaperTolerance)
	}
	runs(bolts, g, opt.RingFactor, opt.SpringTolerance)
	return bolts, nil
}

// roundTo rounds x to a multiple of step, the tolerance of the classes.
// The result is written with the step's decimals, so that a model file
// shows 0.12, not 0.12000000000000001.
func roundTo(x, step float64) float64 {
	q := math.Round(x/step) * step
	v, _ := parseNumber(fmt.Sprintf("%.*f", decimals(step), q))
	if v == 0 {
		return 0 // no −0
	}
	return v
}

// decimals is how many decimals a multiple of step needs (up to 9).
func decimals(step float64) int {
	for k := 0; k < 9; k++ {
		p := math.Pow(10, float64(k))
		if math.Abs(step*p-math.Round(step*p)) < 1e-9*p {
			return k
		}
	}
	return 9
}

// runs finds the runs of neighbouring bolts with open parallel gaps
// around the ring and gives each bolt of a run its ring spring.
func runs(bolts []Bolt, g boltGeometry, factor, tol float64) {
	n := len(bolts)
	open := func(i int) bool { return bolts[((i%n)+n)%n].Parallel > 0 }
	start := -1
	for i := range n {
		if !open(i) {
			start = i
			break
		}
	}
	if start < 0 {
		return // every bolt open by the same rounding: cannot be, the ring rests on one
	}
	for i := 1; i <= n; i++ {
		if !open(start+i) || open(start+i-1) {
			continue
		}
		// A run begins at start+i.
		m := 0
		for open(start + i + m) {
			m++
		}
		span := float64(m+1) * g.spacing
		for j := range m {
			b := &bolts[(start+i+j)%n]
			b.Run, b.Span = m, span
			b.Spring = snapSpring(factor*g.ring.BoltSpring(m, j, g.spacing), tol)
		}
	}
}

// snapSpring snaps a spring to the nearest power of 1 + tol, written to
// two significant digits.
func snapSpring(k, tol float64) float64 {
	step := math.Log(1 + tol)
	return roundSignificant(math.Exp(math.Round(math.Log(k)/step)*step), 2)
}

// roundSignificant rounds x to k significant digits: the spring of a
// class, which the tolerance of the classes does not need finer.
func roundSignificant(x float64, k int) float64 {
	if x == 0 {
		return 0
	}
	e := math.Floor(math.Log10(math.Abs(x))) - float64(k-1)
	v, _ := parseNumber(fmt.Sprintf("%.0fe%d", math.Round(x/math.Pow(10, e)), int(e)))
	return v
}
