package handcalc

import (
	"testing"

	"flangeseg/material/bolt"
)

// VDI 2230 Part 1 resiliences (formulas from memory) of a simple clamp,
// worked by hand: an M16 (P = 2) through two plates of 20 mm,
// l_K = 40 mm, d_w = 24 mm, d_h = 17 mm, E = 210 000 MPa.
//
// Bolt with a 30 mm shank and 10 mm of free thread in the clamp:
// A = π·16²/4 = 201.06 mm², d₃ = 16 − 1.2269·2 = 13.546 mm,
// A_d3 = π·13.546²/4 = 144.12 mm²;
// E·δ_S = 8/201.06 + 30/201.06 + 10/144.12 + 8/144.12 + 6.4/201.06
//
//	= 0.039789 + 0.149208 + 0.069386 + 0.055509 + 0.031831 = 0.345722 mm⁻¹,
//
// δ_S = 0.345722/210000 = 1.64630e-6 mm/N.
func TestBoltResilienceHandWorked(t *testing.T) {
	b := BoltBody{Thread: bolt.Thread{D: 16, Pitch: 2}, Shank: 30, Free: 10, E: 210000}
	r, err := b.Resilience()
	if err != nil {
		t.Fatal(err)
	}
	const e = 210000
	parts := []struct {
		name      string
		got, want float64
	}{
		{"head", r.Head, 0.039789 / e},
		{"shank", r.Shank, 0.149208 / e},
		{"free", r.Free, 0.069386 / e},
		{"engaged", r.Engaged, 0.055509 / e},
		{"nut", r.Nut, 0.031831 / e},
		{"total", r.Total, 1.64630e-6},
	}
	for _, p := range parts {
		if !near(p.got, p.want, 2e-5) {
			t.Errorf("δ %s = %.6g, hand %.6g", p.name, p.got, p.want)
		}
	}
}

// The clamp of TestBoltResilienceHandWorked with three outer diameters, one
// per body shape. β_L = 40/24 = 1.6667.
//
// D_A' = 40: y = 1.6667, tan φ = 0.362 + 0.032·ln(0.8333) + 0.153·ln(1.6667)
// = 0.362 − 0.005834 + 0.078156 = 0.434322; D_A,Gr = 24 + 40·0.434322 =
// 41.373 > 40, so the cones are cut off: cones 2·ln(41·23/(7·57))/(17·0.434322)
// = 2·0.860105/7.383475 = 0.232981; sleeve 4·(40 − 16/0.434322)/(40² − 17²)
// = 4·3.160975/1311 = 0.009644; δ_P = 0.242626/(π·210000) = 3.67762e-7 mm/N.
//
// D_A' = 60: y = 2.5, tan φ = 0.362 − 0.005834 + 0.140192 = 0.496358;
// D_A,Gr = 24 + 19.854 = 43.854 < 60, cones only:
// δ_P = 2·ln(41·26.854/(7·60.854))/(π·210000·17·0.496358)
// = 2·0.949599/5.566727e6 = 3.41162e-7 mm/N.
//
// D_A' = 20 < d_w: a sleeve, δ_P = 4·40/(π·210000·(20² − 17²)) = 160/7.32305e7
// = 2.18488e-6 mm/N.
func TestClampResilienceHandWorked(t *testing.T) {
	cases := []struct {
		outer  float64
		body   string
		tanPhi float64
		delta  float64
	}{
		{40, BodyConesAndSleeve, 0.434322, 3.67762e-7},
		{60, BodyCones, 0.496358, 3.41162e-7},
		{20, BodySleeve, 0.328271, 2.18488e-6},
	}
	for _, c := range cases {
		cl := Clamp{Length: 40, Bearing: 24, Hole: 17, Outer: c.outer, E: 210000}
		r, err := cl.Resilience()
		if err != nil {
			t.Fatal(err)
		}
		if r.Body != c.body || !near(r.TanPhi, c.tanPhi, 2e-6) || !near(r.Total, c.delta, 2e-5) {
			t.Errorf("D_A' = %g: %s, tan φ %.6f, δ_P %.6g; hand %s, %.6f, %.6g",
				c.outer, r.Body, r.TanPhi, r.Total, c.body, c.tanPhi, c.delta)
		}
	}
}

// The three body shapes join continuously: at D_A' = D_A,Gr the sleeve has
// zero length, and at D_A' = d_w the cones have zero height (exact
// constructions, no outside value).
func TestClampContinuity(t *testing.T) {
	base := Clamp{Length: 40, Bearing: 24, Hole: 17, E: 210000}
	// D_A,Gr depends on D_A' through tan φ; find the fixed point by iteration.
	da := 40.0
	for range 50 {
		c := base
		c.Outer = da
		r, _ := c.Resilience()
		da = r.Limit
	}
	for _, at := range []float64{da, base.Bearing} {
		lo, hi := base, base
		lo.Outer, hi.Outer = at*(1-1e-9), at*(1+1e-9)
		rl, err1 := lo.Resilience()
		rh, err2 := hi.Resilience()
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if rl.Body == rh.Body || !near(rl.Total, rh.Total, 1e-6) {
			t.Errorf("D_A' = %g: %s %.9g vs %s %.9g", at, rl.Body, rl.Total, rh.Body, rh.Total)
		}
	}
}

func TestClampInvalid(t *testing.T) {
	cases := map[string]Clamp{
		"length":  {Length: 0, Bearing: 24, Hole: 17, Outer: 40, E: 1},
		"bearing": {Length: 40, Bearing: 16, Hole: 17, Outer: 40, E: 1},
		"outer":   {Length: 40, Bearing: 24, Hole: 17, Outer: 17, E: 1},
		"e":       {Length: 40, Bearing: 24, Hole: 17, Outer: 40, E: 0},
	}
	for field, c := range cases {
		if _, err := c.Resilience(); err == nil || !contains(err.Error(), field+" =") {
			t.Errorf("%s: %v", field, err)
		}
	}
}

// Φ = n·δ_P/(δ_S + δ_P): n = 0.5, δ_P = 1, δ_S = 3 gives 0.5·1/4 = 0.125.
func TestLoadFactor(t *testing.T) {
	if got := LoadFactor(0.5, 3, 1); got != 0.125 {
		t.Errorf("Φ = %g, want 0.125", got)
	}
}
