package fatigue

import (
	"fmt"
	"math"
)

// Miner sums Palmgren–Miner damage D = Σ n_i/N_R,i against an S–N curve
// with the partial factor γ_Mf on the fatigue strength (EN 1993-1-9, 3
// and Annex A). Dividing the curve by γ_Mf is the same as multiplying
// each stress range by it, at every branch and at the cut-off, so the
// endurance is N_R(γ_Mf·Δσ). The stress ranges are taken as given: any
// partial factor on the loads, γ_Ff, belongs in them.
type Miner struct {
	curve   *Curve
	gammaMf float64
}

// NewMiner returns the damage sum on curve with γ_Mf ≥ 1 (EN 1993-1-9
// Table 3.1 recommends 1.00 to 1.35 by assessment method and consequence
// of failure; the National Annex decides).
func NewMiner(curve *Curve, gammaMf float64) (Miner, error) {
	if curve == nil {
		return Miner{}, fmt.Errorf("fatigue: Miner: no S–N curve")
	}
	if !(gammaMf >= 1) || math.IsInf(gammaMf, 0) {
		return Miner{}, fmt.Errorf("fatigue: Miner: γ_Mf = %v: must be a finite number ≥ 1", gammaMf)
	}
	return Miner{curve: curve, gammaMf: gammaMf}, nil
}

// Curve returns the S–N curve.
func (m Miner) Curve() *Curve { return m.curve }

// GammaMf returns γ_Mf.
func (m Miner) GammaMf() float64 { return m.gammaMf }

// Endurance returns N_R at the stress range ds (MPa), γ_Mf included.
func (m Miner) Endurance(ds float64) float64 { return m.curve.Cycles(m.gammaMf * ds) }

// Damage returns the damage n/N_R of n cycles of stress range ds (MPa).
func (m Miner) Damage(ds, n float64) float64 { return n / m.Endurance(ds) }

// Equivalent accumulates the damage-equivalent stress range of a
// spectrum for a reference number of cycles N_ref and one slope m:
//
//	Δσ_eq = (Σ n_i·Δσ_i^m / N_ref)^(1/m),
//
// the constant range that, N_ref times, does the damage of the spectrum
// on a single-slope curve. Every cycle counts, those below a cut-off too.
// With N_ref = 2·10⁶ and m = 3 it is the Δσ_E,2 that EN 1993-1-9 compares
// with Δσ_C/γ_Mf (on a curve with knees only an approximation of it).
type Equivalent struct {
	slope, refCycles float64
	sum              float64 // Σ n·Δσ^m
}

// NewEquivalent returns an empty sum for slope m > 0 and N_ref > 0.
func NewEquivalent(slope, refCycles float64) (*Equivalent, error) {
	if !(slope > 0) || math.IsInf(slope, 0) {
		return nil, fmt.Errorf("fatigue: equivalent range: slope m = %v: must be a finite number > 0", slope)
	}
	if !(refCycles > 0) || math.IsInf(refCycles, 0) {
		return nil, fmt.Errorf("fatigue: equivalent range: reference cycles N_ref = %v: must be a finite number > 0", refCycles)
	}
	return &Equivalent{slope: slope, refCycles: refCycles}, nil
}

// Add counts n cycles of stress range ds (MPa).
func (e *Equivalent) Add(ds, n float64) { e.sum += n * math.Pow(math.Abs(ds), e.slope) }

// Range returns Δσ_eq, MPa.
func (e *Equivalent) Range() float64 { return math.Pow(e.sum/e.refCycles, 1/e.slope) }

// Slope returns m; RefCycles returns N_ref.
func (e *Equivalent) Slope() float64     { return e.slope }
func (e *Equivalent) RefCycles() float64 { return e.refCycles }

// Spectrum tallies cycles and their damage into stress-range bins of one
// width: bin k holds k·width ≤ Δσ < (k+1)·width. Its memory grows with the
// largest range, not with the number of cycles.
type Spectrum struct {
	width          float64
	cycles, damage []float64
	maxRange       float64
}

// maxBins bounds a spectrum's length, so that a nonsensical stress range
// cannot claim the machine's memory.
const maxBins = 1 << 22

// NewSpectrum returns an empty spectrum with bins of width (MPa) > 0.
func NewSpectrum(width float64) (*Spectrum, error) {
	if !(width > 0) || math.IsInf(width, 0) {
		return nil, fmt.Errorf("fatigue: spectrum: bin width = %v MPa: must be a finite number > 0", width)
	}
	return &Spectrum{width: width}, nil
}

// Add tallies n cycles of stress range ds (MPa) that do damage d.
func (s *Spectrum) Add(ds, n, d float64) error {
	if !(ds >= 0) || math.IsInf(ds, 0) {
		return fmt.Errorf("fatigue: spectrum: stress range %v MPa: must be a finite number ≥ 0", ds)
	}
	k := int(ds / s.width)
	if k >= maxBins {
		return fmt.Errorf("fatigue: spectrum: stress range %v MPa: beyond %d bins of %v MPa", ds, maxBins, s.width)
	}
	for len(s.cycles) <= k {
		s.cycles, s.damage = append(s.cycles, 0), append(s.damage, 0)
	}
	s.cycles[k] += n
	s.damage[k] += d
	s.maxRange = math.Max(s.maxRange, ds)
	return nil
}

// Width returns the bin width, MPa.
func (s *Spectrum) Width() float64 { return s.width }

// MaxRange returns the largest stress range added, MPa.
func (s *Spectrum) MaxRange() float64 { return s.maxRange }

// Bin is one stress-range bin of a spectrum.
type Bin struct {
	From, To float64 // From ≤ Δσ < To, MPa
	Cycles   float64
	Damage   float64
}

// Bins returns the bins from 0 up to the last one with cycles, merging
// every k ≥ 1 bins into one of width k·Width (k = 1 keeps them). upTo, if
// larger, extends the list with empty bins to that stress range, so that
// spectra of different ranges list the same bins.
func (s *Spectrum) Bins(k int, upTo float64) []Bin {
	k = max(k, 1)
	w := float64(k) * s.width
	n := (len(s.cycles) + k - 1) / k
	if m := int(math.Ceil(upTo / w)); m > n && m < maxBins {
		n = m
	}
	out := make([]Bin, n)
	for i := range out {
		out[i].From, out[i].To = float64(i)*w, float64(i+1)*w
	}
	for j := range s.cycles {
		out[j/k].Cycles += s.cycles[j]
		out[j/k].Damage += s.damage[j]
	}
	return out
}
