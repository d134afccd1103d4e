package fatigue

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// Branch is one straight line of an S–N curve on log–log axes,
//
//	N_R = Cycles·(Range/Δσ)^Slope,
//
// which holds for stress ranges Δσ ≥ Lower, down to where the next branch
// takes over.
type Branch struct {
	Slope  float64 // m
	Range  float64 // Δσ of a point on the line, MPa
	Cycles float64 // N_R at Range
	Lower  float64 // the branch's lower end, MPa; below the last branch's the endurance is infinite (cut-off)
}

// Curve is an S–N curve: endurance N_R against stress range Δσ, made of
// branches from the highest stress range down. The first branch extends
// to any Δσ above its Lower; below the last branch's Lower (the cut-off
// limit) a stress range does no damage.
type Curve struct {
	name     string
	branches []Branch
}

// NewCurve returns the curve of the given branches, highest first. Each
// needs a positive slope, range and cycle number; the Lower ends must fall
// strictly from branch to branch, the last may be 0 (no cut-off).
func NewCurve(name string, branches []Branch) (*Curve, error) {
	if len(branches) == 0 {
		return nil, fmt.Errorf("fatigue: S–N curve %q: no branches", name)
	}
	var errs []error
	for i, b := range branches {
		bad := func(field string, v float64, rule string) {
			errs = append(errs, fmt.Errorf("fatigue: S–N curve %q: branch %d: %s = %v: %s", name, i, field, v, rule))
		}
		if !(b.Slope > 0) || math.IsInf(b.Slope, 0) {
			bad("slope", b.Slope, "must be a finite number > 0")
		}
		if !(b.Range > 0) || math.IsInf(b.Range, 0) {
			bad("range", b.Range, "must be a finite number > 0")
		}
		if !(b.Cycles > 0) || math.IsInf(b.Cycles, 0) {
			bad("cycles", b.Cycles, "must be a finite number > 0")
		}
		switch {
		case !(b.Lower >= 0) || math.IsInf(b.Lower, 0):
			bad("lower", b.Lower, "must be a finite number ≥ 0")
		case i > 0 && !(b.Lower < branches[i-1].Lower):
			bad("lower", b.Lower, fmt.Sprintf("must be below the lower end %v of branch %d", branches[i-1].Lower, i-1))
		case i < len(branches)-1 && b.Lower == 0:
			bad("lower", b.Lower, "only the last branch may reach down to 0")
		}
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	return &Curve{name: name, branches: append([]Branch(nil), branches...)}, nil
}

// Name returns the name the curve was made with.
func (c *Curve) Name() string { return c.name }

// Branches returns a copy of the branches, highest first.
func (c *Curve) Branches() []Branch { return append([]Branch(nil), c.branches...) }

// CutOff returns the stress range below which the curve gives infinite
// endurance (0 if none), MPa.
func (c *Curve) CutOff() float64 { return c.branches[len(c.branches)-1].Lower }

// Cycles returns the endurance N_R at the stress range ds (MPa): +Inf
// below the cut-off and for ds ≤ 0.
func (c *Curve) Cycles(ds float64) float64 {
	for _, b := range c.branches {
		if ds >= b.Lower && ds > 0 {
			return b.Cycles * math.Pow(b.Range/ds, b.Slope)
		}
	}
	return math.Inf(1)
}

// Range returns the stress range (MPa) at which the curve reaches the
// endurance n, the inverse of Cycles; 0 if n lies beyond the cut-off.
func (c *Curve) Range(n float64) float64 {
	for _, b := range c.branches {
		ds := b.Range * math.Pow(b.Cycles/n, 1/b.Slope)
		if ds >= b.Lower && ds > 0 {
			return ds
		}
	}
	return 0
}

// The EN 1993-1-9 constants of Figure 7.1 for direct stress ranges.
const (
	cyclesC = 2e6 // N_C, where the detail category Δσ_C is defined
	cyclesD = 5e6 // N_D, constant-amplitude fatigue limit
	cyclesL = 1e8 // N_L, cut-off limit

	// BoltCategory is Δσ_C of bolts in tension, EN 1993-1-9 Table 8.1,
	// detail 14, MPa.
	BoltCategory = 50
)

// KneeD returns Δσ_D/Δσ_C = (2/5)^(1/3) ≈ 0.737, where the m = 3 line
// through (2·10⁶, Δσ_C) reaches 5·10⁶ cycles (EN 1993-1-9, Figure 7.1).
func KneeD() float64 { return math.Cbrt(cyclesC / cyclesD) }

// KneeL returns Δσ_L/Δσ_D = (5/100)^(1/5) ≈ 0.549, where the m = 5 line
// through (5·10⁶, Δσ_D) reaches 10⁸ cycles (EN 1993-1-9, Figure 7.1).
func KneeL() float64 { return math.Pow(cyclesD/cyclesL, 0.2) }

// Category returns the EN 1993-1-9 (Figure 7.1) curve of a direct-stress
// detail category dsc = Δσ_C (MPa): m = 3 down to Δσ_D = 0.737·Δσ_C at
// 5·10⁶ cycles, m = 5 down to the cut-off Δσ_L = 0.549·Δσ_D at 10⁸
// cycles, no damage below. The curve is continuous at both knees.
func Category(dsc float64) (*Curve, error) {
	if !(dsc > 0) || math.IsInf(dsc, 0) {
		return nil, fmt.Errorf("fatigue: detail category Δσ_C = %v MPa: must be a finite number > 0", dsc)
	}
	dsd := KneeD() * dsc
	dsl := KneeL() * dsd
	return NewCurve(fmt.Sprintf("EN 1993-1-9 detail category %g", dsc), []Branch{
		{Slope: 3, Range: dsc, Cycles: cyclesC, Lower: dsd},
		{Slope: 5, Range: dsd, Cycles: cyclesD, Lower: dsl},
	})
}

// SizeFactor returns the size factor of bolts in tension, k_s =
// (30/d)^0.25 for a diameter d > 30 mm and 1 up to 30 mm (EN 1993-1-9,
// Table 8.1, detail 14).
func SizeFactor(d float64) float64 {
	if d <= 30 {
		return 1
	}
	return math.Pow(30/d, 0.25)
}

// Bolt returns the curve of a bolt of diameter d (mm) in tension: detail
// category 50 reduced by the size factor, Δσ_C = k_s·50 MPa, with the
// knees of Category (EN 1993-1-9, Table 8.1 detail 14 and Figure 7.1).
// The stress ranges it takes are those on the stress area A_s, with the
// bending from prying included where it arises (Table 8.1 asks for it).
func Bolt(d float64) (*Curve, error) {
	if !(d > 0) || math.IsInf(d, 0) {
		return nil, fmt.Errorf("fatigue: bolt diameter d = %v mm: must be a finite number > 0", d)
	}
	c, err := Category(SizeFactor(d) * BoltCategory)
	if err != nil {
		return nil, err
	}
	c.name = fmt.Sprintf("EN 1993-1-9 bolt in tension, d = %g mm: Δσ_C = %.4g MPa (category 50, k_s = %.4f)",
		d, c.branches[0].Range, SizeFactor(d))
	return c, nil
}

// Point is a point of an S–N curve given by the user.
type Point struct {
	Cycles float64 // N_R
	Range  float64 // Δσ, MPa
}

// FromPoints returns the piecewise curve through pts, joined by straight
// lines on log–log axes: the cycle numbers must rise and the stress ranges
// fall from point to point. Above the first point the first line goes on;
// below the last point's stress range the endurance is infinite (the last
// point is the cut-off; put it at a very large N for a curve without one).
func FromPoints(name string, pts []Point) (*Curve, error) {
	if len(pts) < 2 {
		return nil, fmt.Errorf("fatigue: S–N curve %q: %d points: need at least 2", name, len(pts))
	}
	var errs []error
	for i, p := range pts {
		if !(p.Cycles > 0) || math.IsInf(p.Cycles, 0) || !(p.Range > 0) || math.IsInf(p.Range, 0) {
			errs = append(errs, fmt.Errorf("fatigue: S–N curve %q: point %d (N = %v, Δσ = %v MPa): both must be finite numbers > 0", name, i, p.Cycles, p.Range))
			continue
		}
		if i > 0 && !(p.Cycles > pts[i-1].Cycles && p.Range < pts[i-1].Range) {
			errs = append(errs, fmt.Errorf("fatigue: S–N curve %q: point %d (N = %v, Δσ = %v MPa): must have more cycles and a smaller range than point %d (N = %v, Δσ = %v MPa)",
				name, i, p.Cycles, p.Range, i-1, pts[i-1].Cycles, pts[i-1].Range))
		}
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	branches := make([]Branch, len(pts)-1)
	for i := range branches {
		p, q := pts[i], pts[i+1]
		m := math.Log(q.Cycles/p.Cycles) / math.Log(p.Range/q.Range)
		if !(m > 0) || math.IsInf(m, 0) {
			errs = append(errs, fmt.Errorf("fatigue: S–N curve %q: point %d (N = %v, Δσ = %v MPa): the line from point %d has slope m = %v: must be a finite number > 0 (the points lie too far apart or too close)",
				name, i+1, q.Cycles, q.Range, i, m))
		}
		branches[i] = Branch{Slope: m, Range: p.Range, Cycles: p.Cycles, Lower: q.Range}
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	return NewCurve(name, branches)
}

// MaxCurvePoints bounds the points of an S–N curve file.
const MaxCurvePoints = 10_000

// ReadCurve reads an S–N curve as CSV points with the header
// "cycles,stress_range_MPa" (columns in either order; lines starting with
// # are comments; at most MaxCurvePoints points, no line longer than
// MaxLine) and returns FromPoints of them.
func ReadCurve(r io.Reader, name string) (*Curve, error) {
	cr := csv.NewReader(limitLines(r))
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	head, err := cr.Read()
	if err != nil {
		return nil, fmt.Errorf("fatigue: S–N curve %q: header: %w", name, err)
	}
	col := map[string]int{}
	for i, h := range head {
		col[strings.TrimSpace(h)] = i
	}
	ic, okc := col["cycles"]
	ir, okr := col["stress_range_MPa"]
	if !okc || !okr || len(head) != 2 {
		return nil, fmt.Errorf("fatigue: S–N curve %q: header %q: want the two columns cycles,stress_range_MPa", name, strings.Join(head, ","))
	}
	var pts []Point
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("fatigue: S–N curve %q: %w", name, err)
		}
		line, _ := cr.FieldPos(0)
		n, err1 := strconv.ParseFloat(strings.TrimSpace(rec[ic]), 64)
		ds, err2 := strconv.ParseFloat(strings.TrimSpace(rec[ir]), 64)
		if err := errors.Join(err1, err2); err != nil {
			return nil, fmt.Errorf("fatigue: S–N curve %q: line %d: %q, %q: both must be numbers", name, line, rec[ic], rec[ir])
		}
		if len(pts) == MaxCurvePoints {
			return nil, fmt.Errorf("fatigue: S–N curve %q: line %d: more than %d points: a curve has a few", name, line, MaxCurvePoints)
		}
		pts = append(pts, Point{Cycles: n, Range: ds})
	}
	return FromPoints(name, pts)
}
