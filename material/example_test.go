package material_test

import (
	"fmt"

	"flangeseg/material"
)

// A point of a class 10.9 bolt (ISO 898-1 minimum values) strained in
// plane strain past its yield point, then the history read back.
func ExampleJ2() {
	st, err := material.BoltStrength("10.9", material.BoltMinimum)
	if err != nil {
		fmt.Println(err)
		return
	}
	h, err := st.Hardening(210000, material.DefaultNecking())
	if err != nil {
		fmt.Println(err)
		return
	}
	el, _ := material.NewElastic(210000, 0.3)
	law, err := material.NewJ2(el, h, material.BoltSteelDamage())
	if err != nil {
		fmt.Println(err)
		return
	}
	trial := make([]float64, law.StateSize())
	var s material.Vec4
	var d material.Mat4
	if err := law.Respond(material.PlaneStrain, material.Vec4{-0.003, 0.012, 0, 0}, nil, trial, &s, &d); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("von Mises %.1f MPa, yield %.1f MPa\n", material.VonMises(s), h.InitialYield())
	fmt.Printf("plastic strain %.5f, damage %.5f\n", law.EquivalentPlasticStrain(trial), law.Damage(trial))
	// Output:
	// von Mises 984.2 MPa, yield 944.2 MPa
	// plastic strain 0.00510, damage 0.03204
}
