package fatigue_test

import (
	"fmt"

	"flangeseg/post/fatigue"
)

// Cycles of a short segment-force history (kN) through an invented
// bolt-force function onto an M48 bolt, checked on the EN 1993-1-9 curve.
func Example() {
	f, _ := fatigue.NewBoltForceFunction(
		[]float64{0, 150e3, 300e3, 600e3},         // Z, N
		[]float64{1000e3, 1015e3, 1060e3, 1600e3}, // F_s, N
		nil)
	tr, _ := fatigue.NewTransfer(f, 1473, fatigue.Axial) // A_s of M48, mm²
	curve, _ := fatigue.Bolt(48)
	miner, _ := fatigue.NewMiner(curve, 1.15)
	var d float64
	c := fatigue.NewCounter(func(cy fatigue.Cycle) error {
		ds, err := tr.Range(cy)
		fmt.Printf("Z %4.0f → %4.0f kN  ×%.1f  Δσ = %5.1f MPa\n", cy.From/1e3, cy.To/1e3, cy.Count, ds)
		d += miner.Damage(ds, cy.Count)
		return err
	})
	for _, z := range []float64{100, 250, 120, 420, 60, 380, 100} {
		_ = c.Add(z * 1e3)
	}
	_ = c.Finish()
	fmt.Printf("D = %.3g\n", d)
	// Output:
	// Z  250 →  120 kN  ×1.0  Δσ =  22.4 MPa
	// Z  100 →  420 kN  ×0.5  Δσ = 180.6 MPa
	// Z  420 →   60 kN  ×0.5  Δσ = 183.3 MPa
	// Z   60 →  380 kN  ×0.5  Δσ = 134.4 MPa
	// Z  380 →  100 kN  ×0.5  Δσ = 131.7 MPa
	// D = 7.26e-05
}
