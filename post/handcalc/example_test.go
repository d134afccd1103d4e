package handcalc_test

import (
	"fmt"

	"flangeseg/post/handcalc"
)

// An invented tower-flange segment (not a published case): shell 30 mm,
// flange 80 mm, both S355, one M48 10.9 every 120 mm.
func ExampleAnalyze() {
	j := handcalc.Joint{
		T: 30, Tf: 80, A: 70, B: 80, C: 120,
		Size: "M48", Grade: "10.9",
		Hole: 52, Washer: 92, WasherThickness: 8, FreeThread: 20,
		ShellFy: 345, FlangeFy: 325, Preload: 1000e3, E: 210000,
	}
	r, err := handcalc.Analyze(j, handcalc.DefaultParams())
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("A_s = %.1f mm², F_t,Rd = %.1f kN\n", r.Bolt.StressArea, r.Bolt.TensionResistance/1e3)
	for _, u := range r.Ultimate {
		fmt.Printf("%-26s Petersen %s %6.1f kN   Seidel %s %6.1f kN\n", u.Basis,
			u.Petersen.Governing, u.Petersen.Z/1e3, u.Seidel.Governing, u.Seidel.Z/1e3)
	}
	fmt.Printf("Φ = %.4f, opening at %.1f kN\n", r.JointDiagram.LoadFactor, r.JointDiagram.Opening/1e3)
	for _, p := range r.TrilinearPoints {
		fmt.Printf("trilinear %-7s Z = %6.1f kN  F_s = %7.1f kN\n", p.Name, p.Z/1e3, p.Fs/1e3)
	}
	// Output:
	// A_s = 1473.1 mm², F_t,Rd = 1060.7 kN
	// design                     Petersen B  557.1 kN   Seidel C  536.7 kN
	// design_without_k2          Petersen C  558.4 kN   Seidel C  536.7 kN
	// characteristic             Petersen C  558.4 kN   Seidel C  536.7 kN
	// characteristic_without_k2  Petersen C  558.4 kN   Seidel C  536.7 kN
	// Φ = 0.0679, opening at 481.9 kN
	// trilinear preload Z =    0.0 kN  F_s =  1000.0 kN
	// trilinear z_1     Z =  200.0 kN  F_s =  1058.2 kN
	// trilinear z_2     Z =  439.6 kN  F_s =  1157.2 kN
	// trilinear end     Z =  536.7 kN  F_s =  1412.9 kN
}

// The trilinear model on its own, sampled over the service range.
func ExampleTrilinear() {
	m, err := handcalc.NewTrilinear(500e3, 0.13, 70, 80, 0.7)
	if err != nil {
		fmt.Println(err)
		return
	}
	for z := 0.0; z <= 300e3; z += 50e3 {
		fmt.Printf("Z = %5.0f kN  F_s = %6.1f kN  dF_s/dZ = %.3f\n", z/1e3, m.Force(z)/1e3, m.Slope(z))
	}
	// Output:
	// Z =     0 kN  F_s =  500.0 kN  dF_s/dZ = 0.279
	// Z =    50 kN  F_s =  513.9 kN  dF_s/dZ = 0.279
	// Z =   100 kN  F_s =  527.9 kN  dF_s/dZ = 0.396
	// Z =   150 kN  F_s =  547.7 kN  dF_s/dZ = 0.396
	// Z =   200 kN  F_s =  567.5 kN  dF_s/dZ = 0.396
	// Z =   250 kN  F_s =  658.2 kN  dF_s/dZ = 2.633
	// Z =   300 kN  F_s =  789.8 kN  dF_s/dZ = 2.633
}
