package fatigue

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// BoltForceFunction is a bolt-force function given by samples: the bolt
// force F_s (N) and, optionally, the bolt bending moment M_s (N·mm)
// against the segment force Z (N), straight between the samples. Below the
// first sample the first segment goes on — a joint pressed further
// together stays closed and linear; above the last sample the function is
// not known and At fails rather than guess.
type BoltForceFunction struct {
	z, fs, ms []float64
}

// NewBoltForceFunction copies the samples: z strictly increasing, at
// least two, all finite; ms is nil or as long as z.
func NewBoltForceFunction(z, fs, ms []float64) (*BoltForceFunction, error) {
	switch {
	case len(z) < 2:
		return nil, fmt.Errorf("fatigue: bolt-force function: %d samples: need at least 2", len(z))
	case len(fs) != len(z):
		return nil, fmt.Errorf("fatigue: bolt-force function: %d values of Z but %d of F_s", len(z), len(fs))
	case ms != nil && len(ms) != len(z):
		return nil, fmt.Errorf("fatigue: bolt-force function: %d values of Z but %d of M_s", len(z), len(ms))
	}
	for i := range z {
		if !finite(z[i]) || !finite(fs[i]) || (ms != nil && !finite(ms[i])) {
			return nil, fmt.Errorf("fatigue: bolt-force function: sample %d (Z = %v N): values must be finite", i, z[i])
		}
		if i > 0 && !(z[i] > z[i-1]) {
			return nil, fmt.Errorf("fatigue: bolt-force function: sample %d: Z = %v N must exceed the previous sample's %v N", i, z[i], z[i-1])
		}
	}
	f := &BoltForceFunction{z: append([]float64(nil), z...), fs: append([]float64(nil), fs...)}
	if ms != nil {
		f.ms = append([]float64(nil), ms...)
	}
	return f, nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// Span returns the segment forces of the first and last sample, N.
func (f *BoltForceFunction) Span() (lo, hi float64) { return f.z[0], f.z[len(f.z)-1] }

// HasMoment reports whether the function carries the bending moment.
func (f *BoltForceFunction) HasMoment() bool { return f.ms != nil }

// ErrBeyond is wrapped by the errors of a segment force above the last
// sample of a bolt-force function.
var ErrBeyond = errors.New("beyond the bolt-force function")

// At returns F_s (N) and M_s (N·mm; 0 without moments) at segment force z
// (N).
func (f *BoltForceFunction) At(z float64) (fs, ms float64, err error) {
	hi := f.z[len(f.z)-1]
	switch {
	case !finite(z):
		return 0, 0, fmt.Errorf("fatigue: bolt-force function at Z = %v N: must be finite", z)
	case z > hi:
		return 0, 0, fmt.Errorf("fatigue: Z = %.6g kN lies %w, which ends at %.6g kN", z/1e3, ErrBeyond, hi/1e3)
	}
	// i is the segment [z[i], z[i+1]] that holds z (the first one below).
	i := max(sort.SearchFloat64s(f.z, z)-1, 0)
	t := (z - f.z[i]) / (f.z[i+1] - f.z[i])
	fs = f.fs[i] + t*(f.fs[i+1]-f.fs[i])
	if f.ms != nil {
		ms = f.ms[i] + t*(f.ms[i+1]-f.ms[i])
	}
	return fs, ms, nil
}

// Basis says which bolt stress a Transfer takes.
type Basis int

const (
	// Axial is the axial stress F_s/A_s.
	Axial Basis = iota
	// AxialBending adds the bending stress on the stress-area diameter,
	// F_s/A_s + M_s/W, W = π·d_s³/32, d_s = √(4·A_s/π), at the fibre that
	// the larger bending moments of the function put in tension.
	AxialBending
)

func (b Basis) String() string {
	if b == AxialBending {
		return "axial + bending"
	}
	return "axial"
}

// SectionModulus returns W = π·d_s³/32 of the circle of area as (mm²):
// the bending section of the bolt on its stress area.
func SectionModulus(as float64) float64 {
	ds := math.Sqrt(4 * as / math.Pi)
	return math.Pi * ds * ds * ds / 32
}

// Transfer maps segment force to bolt stress through a bolt-force
// function, and a segment-force cycle to a bolt stress range: each cycle's
// minimum and maximum are mapped on their own, so the mean load counts
// where the function is nonlinear.
//
// Counting cycles in Z and mapping their extremes gives the same cycles
// as counting the bolt stress itself when the stress does not fall as Z
// rises (rainflow counting depends only on the order of the turning
// points); Monotone tells whether that holds at the samples.
type Transfer struct {
	f     *BoltForceFunction
	basis Basis
	as    float64 // A_s, mm²
	w     float64 // W, mm³
	fibre float64 // +1 or −1: the side whose bending stress is added
}

// NewTransfer returns the transfer through f onto a bolt of stress area
// as (mm²) with the given basis; AxialBending needs a function with
// moments.
func NewTransfer(f *BoltForceFunction, as float64, basis Basis) (*Transfer, error) {
	switch {
	case f == nil:
		return nil, fmt.Errorf("fatigue: transfer: no bolt-force function")
	case !(as > 0) || math.IsInf(as, 0):
		return nil, fmt.Errorf("fatigue: transfer: stress area A_s = %v mm²: must be a finite number > 0", as)
	case basis != Axial && basis != AxialBending:
		return nil, fmt.Errorf("fatigue: transfer: basis %d: must be Axial or AxialBending", int(basis))
	case basis == AxialBending && !f.HasMoment():
		return nil, fmt.Errorf("fatigue: transfer: basis %s needs the bending moment, and the bolt-force function has none", basis)
	}
	t := &Transfer{f: f, basis: basis, as: as, w: SectionModulus(as), fibre: 1}
	if basis == AxialBending {
		var big float64
		for _, m := range f.ms {
			if math.Abs(m) > math.Abs(big) {
				big = m
			}
		}
		if big < 0 {
			t.fibre = -1
		}
	}
	return t, nil
}

// Basis returns the stress basis.
func (t *Transfer) Basis() Basis { return t.basis }

// Function returns the bolt-force function.
func (t *Transfer) Function() *BoltForceFunction { return t.f }

// Stress returns the bolt stress (MPa) at segment force z (N).
func (t *Transfer) Stress(z float64) (float64, error) {
	fs, ms, err := t.f.At(z)
	if err != nil {
		return 0, err
	}
	s := fs / t.as
	if t.basis == AxialBending {
		s += t.fibre * ms / t.w
	}
	return s, nil
}

// Range returns the bolt stress range (MPa) of a segment-force cycle:
// |σ(Z_max) − σ(Z_min)|.
func (t *Transfer) Range(c Cycle) (float64, error) {
	lo, err := t.Stress(c.Min())
	if err != nil {
		return 0, err
	}
	hi, err := t.Stress(c.Max())
	if err != nil {
		return 0, err
	}
	return math.Abs(hi - lo), nil
}

// Monotone reports whether the bolt stress does not fall from sample to
// sample of the function.
func (t *Transfer) Monotone() bool {
	prev := math.Inf(-1)
	for _, z := range t.f.z {
		s, _ := t.Stress(z)
		if s < prev {
			return false
		}
		prev = s
	}
	return true
}
