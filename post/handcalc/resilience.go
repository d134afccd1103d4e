package handcalc

import (
	"fmt"
	"math"

	"flangeseg/material/bolt"
)

// Lengths, as multiples of d, that VDI 2230 Part 1 uses for the parts of a
// bolt outside its free length: the deformation of the head (hexagon head),
// of the engaged thread, and of the nut (a through-bolted joint with a nut).
const (
	headLength    = 0.5 // l_SK/d, hexagon head
	engagedLength = 0.5 // l_G/d
	nutLength     = 0.4 // l_M/d, nut (0.33 would be a tapped thread)
)

// BoltBody is the part of a bolt that a clamp loads.
type BoltBody struct {
	Thread bolt.Thread `json:"thread"`
	Shank  float64     `json:"shank"` // l_1, unthreaded shank inside the clamp, mm
	Free   float64     `json:"free"`  // l_Gew, free loaded thread inside the clamp, mm
	E      float64     `json:"e"`     // E_S, Young's modulus of bolt and nut, MPa
}

// BoltResilience holds the elastic resiliences δ (mm/N) of a bolt's parts.
type BoltResilience struct {
	Head    float64 `json:"head"`    // δ_SK = 0.5·d/(E·A)
	Shank   float64 `json:"shank"`   // δ_1 = l_1/(E·A)
	Free    float64 `json:"free"`    // δ_Gew = l_Gew/(E·A_d3)
	Engaged float64 `json:"engaged"` // δ_G = 0.5·d/(E·A_d3)
	Nut     float64 `json:"nut"`     // δ_M = 0.4·d/(E·A)
	Total   float64 `json:"total"`   // δ_S, the sum
}

// Resilience returns the bolt's resilience δ_S as the sum of head, shank,
// free thread, engaged thread and nut, each a bar l/(E·area): the head,
// shank and nut on the nominal area A = π·d²/4, the free and the engaged
// thread on the core area A_d3 = π·d₃²/4. The substitute lengths are those
// of VDI 2230 Part 1 (from memory): head 0.5·d (hexagon head), engaged
// thread 0.5·d, nut 0.4·d.
func (b BoltBody) Resilience() (BoltResilience, error) {
	if err := b.Thread.Valid(); err != nil {
		return BoltResilience{}, err
	}
	var v violations
	v.check("shank", b.Shank, b.Shank >= 0, "must be ≥ 0")
	v.check("free", b.Free, b.Free >= 0, "must be ≥ 0")
	v.check("e", b.E, b.E > 0, "must be > 0")
	if err := v.err("bolt body"); err != nil {
		return BoltResilience{}, err
	}
	d, an, a3 := b.Thread.D, b.Thread.NominalArea(), b.Thread.MinorArea()
	r := BoltResilience{
		Head:    headLength * d / (b.E * an),
		Shank:   b.Shank / (b.E * an),
		Free:    b.Free / (b.E * a3),
		Engaged: engagedLength * d / (b.E * a3),
		Nut:     nutLength * d / (b.E * an),
	}
	r.Total = r.Head + r.Shank + r.Free + r.Engaged + r.Nut
	return r, nil
}

// Clamp is the stack of clamped parts of a through-bolted joint (bolt and
// nut), taken as one body of revolution about the bolt axis.
type Clamp struct {
	Length  float64 `json:"length"`  // l_K, clamp length, mm
	Bearing float64 `json:"bearing"` // d_w, outer diameter of the bearing face, mm
	Hole    float64 `json:"hole"`    // d_h, hole diameter, mm
	Outer   float64 `json:"outer"`   // D_A', outer diameter of the substitute body, mm
	E       float64 `json:"e"`       // E_P, Young's modulus of the clamped parts, MPa
}

// The shapes of the deformation body of a clamp.
const (
	BodyCones          = "cones"            // two cones that stay inside D_A'
	BodyConesAndSleeve = "cones_and_sleeve" // cones cut off at D_A', a sleeve between
	BodySleeve         = "sleeve"           // D_A' ≤ d_w: a plain sleeve
)

// ClampResilience is the resilience of a clamp and how it was found.
type ClampResilience struct {
	TanPhi float64 `json:"tan_phi"` // tan φ of the substitution cone
	Limit  float64 `json:"limit"`   // D_A,Gr = d_w + l_K·tan φ, mm
	Body   string  `json:"body"`    // BodyCones, BodyConesAndSleeve or BodySleeve
	Total  float64 `json:"total"`   // δ_P, mm/N
}

// Resilience returns δ_P of the clamp from the substitution cone of VDI 2230
// Part 1 (2003 edition; formulas from memory) for a through-bolted joint: a
// cone from each bearing face towards the interface, with
//
//	tan φ = 0.362 + 0.032·ln(β_L/2) + 0.153·ln y,  β_L = l_K/d_w, y = D_A'/d_w,
//
// reaching the diameter D_A,Gr = d_w + l_K·tan φ at the interface. A cone of
// outer diameter D(z) = d_w + 2z·tan φ around a hole d_h integrates to
// ∫ 4 dz/(π·E·(D² − d_h²)), so two cones, each of height l_K/2, give
//
//	δ_P = 2·ln[(d_w + d_h)(D_A,Gr − d_h)/((d_w − d_h)(D_A,Gr + d_h))] / (π·E·d_h·tan φ).
//
// When the available width cuts the cones off (d_w < D_A' < D_A,Gr), each
// cone stops at D_A', (D_A' − d_w)/(2·tan φ) from its bearing face, and a
// sleeve of outer diameter D_A' fills the rest:
//
//	δ_P = [2·ln[(d_w + d_h)(D_A' − d_h)/((d_w − d_h)(D_A' + d_h))]/(d_h·tan φ)
//	       + 4·(l_K − (D_A' − d_w)/tan φ)/(D_A'² − d_h²)] / (π·E).
//
// When D_A' ≤ d_w the body is the sleeve alone, δ_P = 4·l_K/(π·E·(D_A'² − d_h²)).
func (c Clamp) Resilience() (ClampResilience, error) {
	if err := c.valid(); err != nil {
		return ClampResilience{}, err
	}
	dw, dh, da, lk := c.Bearing, c.Hole, c.Outer, c.Length
	tanPhi := 0.362 + 0.032*math.Log(lk/dw/2) + 0.153*math.Log(da/dw)
	r := ClampResilience{TanPhi: tanPhi, Limit: dw + lk*tanPhi}
	if da <= dw {
		r.Body = BodySleeve
		r.Total = 4 * lk / (math.Pi * c.E * (da*da - dh*dh))
		return r, nil
	}
	if !(tanPhi > 0) {
		return ClampResilience{}, fmt.Errorf("handcalc: clamp l_K = %g, d_w = %g, D_A' = %g: cone angle tan φ = %g must be positive",
			lk, dw, da, tanPhi)
	}
	cone := func(d float64) float64 { // ln of the two cones up to diameter d
		return math.Log((dw + dh) * (d - dh) / ((dw - dh) * (d + dh)))
	}
	if da >= r.Limit {
		r.Body = BodyCones
		r.Total = 2 * cone(r.Limit) / (math.Pi * c.E * dh * tanPhi)
		return r, nil
	}
	r.Body = BodyConesAndSleeve
	sleeve := lk - (da-dw)/tanPhi
	r.Total = (2*cone(da)/(dh*tanPhi) + 4*sleeve/(da*da-dh*dh)) / (math.Pi * c.E)
	return r, nil
}

func (c Clamp) valid() error {
	var v violations
	v.check("length", c.Length, c.Length > 0, "must be > 0")
	v.check("hole", c.Hole, c.Hole > 0, "must be > 0")
	v.check("bearing", c.Bearing, c.Bearing > c.Hole, "must exceed the hole diameter")
	v.check("outer", c.Outer, c.Outer > c.Hole, "must exceed the hole diameter")
	v.check("e", c.E, c.E > 0, "must be > 0")
	return v.err("clamp")
}

// LoadFactor returns Φ = n·δ_P/(δ_S + δ_P), the share of an axial load that
// a closed joint passes into the bolt when the load enters the clamped parts
// at the fraction n of their length (VDI 2230 Part 1 — from memory).
func LoadFactor(n, deltaS, deltaP float64) float64 {
	return n * deltaP / (deltaS + deltaP)
}
