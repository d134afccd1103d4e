package bolt

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Thread is an ISO metric thread.
type Thread struct {
	D     float64 `json:"d"`     // d, nominal (major) diameter, mm
	Pitch float64 `json:"pitch"` // P, pitch, mm
}

// Thread profile constants of the ISO basic profile (ISO 68-1, H = (√3/2)·P):
// d₂ = d − (3/4)·H and d₃ = d₁ − H/6 = d − (17/12)·H. The rounded forms
// 0.6495·P and 1.2269·P are what ISO 898-1 prints.
const (
	pitchDiameterFactor = 0.6495190528383290 // 3√3/8
	// MinorDiameterFactor is d₃ = d − MinorDiameterFactor·P (17√3/24).
	MinorDiameterFactor = 1.2268693220279547
)

// CoarseThread returns the ISO 261 coarse thread of a size name such as
// "M36". Sizes M12 to M72 are known.
//
// Source: ISO 261, coarse pitch series. The first-choice sizes and M27 are
// the ones CHECKS.md lists; the second-choice sizes (M14, M18, M22, M33, M39,
// M45, M52, M60, M68) are from memory.
func CoarseThread(size string) (Thread, error) {
	digits, ok := strings.CutPrefix(size, "M")
	d, err := strconv.ParseFloat(digits, 64)
	if !ok || err != nil {
		return Thread{}, fmt.Errorf("bolt: size %q: want M<diameter>, e.g. M36", size)
	}
	p := coarsePitch(d)
	if p == 0 {
		return Thread{}, fmt.Errorf("bolt: size %q: not an ISO 261 coarse size in M12…M72 (known: %s)",
			size, strings.Join(CoarseSizes(), ", "))
	}
	return Thread{D: d, Pitch: p}, nil
}

// CoarseSizes returns the size names CoarseThread knows, in ascending order.
func CoarseSizes() []string {
	return []string{"M12", "M14", "M16", "M18", "M20", "M22", "M24", "M27", "M30", "M33",
		"M36", "M39", "M42", "M45", "M48", "M52", "M56", "M60", "M64", "M68", "M72"}
}

// coarsePitch returns the ISO 261 coarse pitch of nominal diameter d, or 0.
func coarsePitch(d float64) float64 {
	switch d {
	case 12:
		return 1.75
	case 14, 16:
		return 2
	case 18, 20, 22:
		return 2.5
	case 24, 27:
		return 3
	case 30, 33:
		return 3.5
	case 36, 39:
		return 4
	case 42, 45:
		return 4.5
	case 48, 52:
		return 5
	case 56, 60:
		return 5.5
	case 64, 68, 72:
		return 6
	}
	return 0
}

// PitchDiameter returns d₂ = d − 0.6495·P (ISO 898-1), mm.
func (t Thread) PitchDiameter() float64 { return t.D - pitchDiameterFactor*t.Pitch }

// MinorDiameter returns d₃ = d − 1.2269·P, the minor diameter of the bolt
// thread (ISO 898-1), mm.
func (t Thread) MinorDiameter() float64 { return t.D - MinorDiameterFactor*t.Pitch }

// NominalArea returns A = π·d²/4, the shank area, mm².
func (t Thread) NominalArea() float64 { return math.Pi / 4 * t.D * t.D }

// MinorArea returns A_d3 = π·d₃²/4, the core area VDI 2230 Part 1 uses for
// the resilience of the thread, mm².
func (t Thread) MinorArea() float64 {
	d3 := t.MinorDiameter()
	return math.Pi / 4 * d3 * d3
}

// StressArea returns A_s = π/4·((d₂ + d₃)/2)², mm² (ISO 898-1).
func (t Thread) StressArea() float64 {
	m := (t.PitchDiameter() + t.MinorDiameter()) / 2
	return math.Pi / 4 * m * m
}

// Valid reports a thread without a positive diameter, pitch and minor
// diameter.
func (t Thread) Valid() error {
	if !(t.D > 0) || !(t.Pitch > 0) || !(t.MinorDiameter() > 0) {
		return fmt.Errorf("bolt: thread d = %g, P = %g: want d > 0, P > 0 and d − 1.2269·P > 0", t.D, t.Pitch)
	}
	return nil
}
