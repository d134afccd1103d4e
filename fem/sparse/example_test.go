package sparse_test

import (
	"errors"
	"fmt"

	"flangeseg/fem/sparse"
)

// Two springs in series, fixed at the left end: the nodes 1 and 2 carry
// equations 0 and 1; node 0 is supported (equation -1).
func Example() {
	elements := [][]int{{-1, 0}, {0, 1}}
	k, err := sparse.NewPattern(2, elements)
	if err != nil {
		fmt.Println(err)
		return
	}
	ke := []float64{100, -100, -100, 100} // spring stiffness 100 N/mm
	for _, dofs := range elements {
		if err := k.AddDense(dofs, ke); err != nil {
			fmt.Println(err)
			return
		}
	}
	sym, err := sparse.Analyze(k, sparse.OrderAMD)
	if err != nil {
		fmt.Println(err)
		return
	}
	var chol sparse.Cholesky
	if err := chol.Factorize(sym, k); err != nil {
		fmt.Println(err)
		return
	}
	u := make([]float64, 2)
	chol.SolveVecTo(u, []float64{0, 50}) // 50 N at the free end
	fmt.Printf("u = %.2f mm\n", u)
	// Output: u = [0.50 1.00] mm
}

// Without a support the stiffness is singular; Factorize names the
// equation whose pivot vanished.
func ExampleNotPositiveDefiniteError() {
	elements := [][]int{{0, 1}, {1, 2}}
	k, _ := sparse.NewPattern(3, elements)
	for _, dofs := range elements {
		k.AddDense(dofs, []float64{100, -100, -100, 100})
	}
	sym, _ := sparse.Analyze(k, sparse.OrderNatural)
	var chol sparse.Cholesky
	err := chol.Factorize(sym, k)
	var npd *sparse.NotPositiveDefiniteError
	if errors.As(err, &npd) {
		fmt.Println("singular at equation", npd.Index)
	}
	// Output: singular at equation 2
}
