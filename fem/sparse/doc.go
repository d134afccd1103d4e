// Package sparse solves the symmetric positive definite systems of the
// finite-element code with a supernodal multifrontal Cholesky factorization.
// It owns the compressed-column storage of the stiffness matrix (lower
// triangle, diagonal always present), fill-reducing orderings (approximate
// minimum degree and nested dissection), the symbolic analysis that is done
// once per sparsity pattern, and the numeric factorization and solves that
// are repeated on it.
//
// A nonlinear analysis builds the pattern once, analyses it once and
// refactorizes in every Newton iteration:
//
//	k, err := sparse.NewPattern(n, elementDofs) // dofs of each element; -1 = removed
//	...
//	sym, err := sparse.Analyze(k, sparse.OrderAMD)
//	var chol sparse.Cholesky
//	for iter := 0; ; iter++ {
//		k.Zero()
//		for e := range elements {
//			k.AddDense(elementDofs[e], ke[e]) // row-major element stiffness
//		}
//		if err := chol.Factorize(sym, k); err != nil {
//			return err // a *NotPositiveDefiniteError names the failing dof
//		}
//		chol.SolveVecTo(du, residual)
//		...
//	}
//
// Factorize reuses its memory across calls with the same Symbolic and runs
// on up to GOMAXPROCS goroutines (see Cholesky.SetWorkers), and so do the
// solves, over two parts of the elimination tree fixed by the analysis;
// the factor and every solution are the same bit for bit whatever the
// number of workers. Cholesky32 holds the factor rounded to float32, for
// an iterative solver's preconditioner: half the memory to read. Input arguments are never modified, except the receiver of
// Matrix's mutating methods.
package sparse
