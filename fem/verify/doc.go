// Package verify holds the verification problems of the finite-element core:
// each is a small model with a published closed-form or benchmark answer,
// run the same way by the tests and by `flangeseg verify`, so a user sees
// the solver checked on their own machine. A case returns rows of
// (quantity, computed, reference, error, tolerance) and the solutions it
// made, for field output.
package verify
