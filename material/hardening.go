package material

import (
	"fmt"
	"math"
)

// Hardening is isotropic multilinear hardening: the true yield stress σ_y as
// a piecewise-linear function of the equivalent plastic strain ε̄_p, given at
// points. Past the last point σ_y goes on with the slope of the last
// segment (zero for a single point: perfectly plastic). A Hardening is
// immutable once made and safe to share between goroutines.
type Hardening struct {
	strain []float64 // ε̄_p at the points, strictly increasing, strain[0] = 0
	stress []float64 // true yield stress at the points, MPa, non-decreasing
	// slopes holds the hardening modulus of each segment (n − 1 values),
	// found once: a return mapping asks for it at every iteration.
	slopes []float64
}

// NewHardening validates and copies a hardening table: the first plastic
// strain is 0, plastic strains increase strictly, yield stresses are
// positive and do not fall. Softening is refused: in a local (unregularised)
// model it makes the result depend on the mesh.
func NewHardening(plasticStrain, stress []float64) (Hardening, error) {
	n := len(plasticStrain)
	if n == 0 || n != len(stress) {
		return Hardening{}, fmt.Errorf("material: hardening table with %d strains and %d stresses: need the same number, at least one", n, len(stress))
	}
	if plasticStrain[0] != 0 {
		return Hardening{}, fmt.Errorf("material: hardening point 1: plastic strain %g: the table starts at 0", plasticStrain[0])
	}
	for i := 0; i < n; i++ {
		e, s := plasticStrain[i], stress[i]
		if math.IsNaN(e) || math.IsInf(e, 0) || math.IsNaN(s) || math.IsInf(s, 0) {
			return Hardening{}, fmt.Errorf("material: hardening point %d: (%g, %g): not finite", i+1, e, s)
		}
		if !(s > 0) {
			return Hardening{}, fmt.Errorf("material: hardening point %d: yield stress %g MPa: must be positive", i+1, s)
		}
		if i == 0 {
			continue
		}
		if !(e > plasticStrain[i-1]) {
			return Hardening{}, fmt.Errorf("material: hardening point %d: plastic strain %g: must exceed the previous point's %g", i+1, e, plasticStrain[i-1])
		}
		if s < stress[i-1] {
			return Hardening{}, fmt.Errorf("material: hardening point %d: yield stress %g MPa below the previous point's %g: softening is not supported", i+1, s, stress[i-1])
		}
	}
	h := Hardening{
		strain: append([]float64(nil), plasticStrain...),
		stress: append([]float64(nil), stress...),
		slopes: make([]float64, n-1),
	}
	for i := range h.slopes {
		h.slopes[i] = (h.stress[i+1] - h.stress[i]) / (h.strain[i+1] - h.strain[i])
	}
	return h, nil
}

// PerfectlyPlastic is hardening with a constant yield stress fy (MPa).
func PerfectlyPlastic(fy float64) (Hardening, error) {
	return NewHardening([]float64{0}, []float64{fy})
}

// Len is the number of points of the table.
func (h Hardening) Len() int { return len(h.strain) }

// Point returns the i-th point: equivalent plastic strain and true yield
// stress in MPa.
func (h Hardening) Point(i int) (plasticStrain, stress float64) {
	return h.strain[i], h.stress[i]
}

// InitialYield is the yield stress at ε̄_p = 0, MPa.
func (h Hardening) InitialYield() float64 { return h.stress[0] }

// segment returns the index i of the segment that holds ε̄_p = ep: the
// point at or below ep; at a point the segment to its right is taken.
// A binary search written out (sort.SearchFloat64s calls a closure per
// probe, and a return mapping asks at every point).
func (h Hardening) segment(ep float64) int {
	lo, hi := 0, len(h.strain) // strain[lo] <= ep < strain[hi], hi = n meaning +∞
	for hi-lo > 1 {
		mid := int(uint(lo+hi) >> 1)
		if h.strain[mid] <= ep {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo
}

// onSegment is the yield stress on the line of segment i at ε̄_p = ep
// (the table's value if ep lies on the segment).
func (h Hardening) onSegment(i int, ep float64) float64 {
	return h.stress[i] + h.slope(i)*(ep-h.strain[i])
}

// slope is the hardening modulus of segment i; the last segment continues
// the one before it.
func (h Hardening) slope(i int) float64 {
	n := len(h.slopes)
	if n == 0 {
		return 0
	}
	return h.slopes[min(i, n-1)]
}

// Yield returns the yield stress σ_y(ε̄_p) in MPa and the hardening modulus
// dσ_y/dε̄_p there (the right-hand slope at a point of the table).
func (h Hardening) Yield(ep float64) (sy, slope float64) {
	i := h.segment(ep)
	return h.onSegment(i, ep), h.slope(i)
}

// radialReturn solves the von Mises consistency condition of the radial
// return, q_tr − 3G(ε̄ − ε̄_n) = σ_y(ε̄), exactly for the multilinear
// table: the left side falls and σ_y does not, so the root is unique and a
// walk over the segments from ε̄_n finds it without iteration. It returns
// ε̄_{n+1} and the hardening modulus at it.
func (h Hardening) radialReturn(qtr, threeG, ep0 float64) (ep, slope float64) {
	n := len(h.strain)
	for i := h.segment(ep0); ; i++ {
		k := h.slope(i)
		x := (qtr + threeG*ep0 - h.stress[i] + k*h.strain[i]) / (threeG + k)
		if i >= n-1 || x <= h.strain[i+1] {
			return math.Max(x, ep0), k
		}
	}
}
