// Package fem is the finite-element core of flangeseg: element routines for
// the x–z section (plane stress, plane strain, axisymmetric), the map from
// nodal degrees of freedom to equations (supports, prescribed values,
// rigid edges and ties), assembly into the sparse matrices of fem/sparse,
// loads, reactions, section forces and stress recovery, and the Newton
// solver with contact pairs, displacement-controlled ramps with step
// cutting and the eigenstrain preload of a bolt slice.
//
// The two seams later capabilities plug into are material.Law (the response
// of one integration point) and Kinematics (how nodal displacements become a
// strain and how stress becomes nodal force and tangent). Assembly is written
// once, in residual form, so the same code serves a linear solve and the
// Newton iterations of a nonlinear one: for a linear model one iteration
// converges exactly. Kinematics are SmallStrain (ε = B·u) or FiniteStrain
// (total Lagrangian in logarithmic strain space, Miehe, Apel & Lambrecht
// 2002; Solution.CauchyPoints gives Cauchy stress). Laws with history get
// a committed and a trial state per integration point, committed by
// Solver.Commit.
//
// Units are mm, N and MPa. In plane stress and plane strain every element
// carries its region's out-of-plane thickness; in an axisymmetric model x is
// the radius and forces, reactions and loads are totals over the full
// circumference (the weight of an integration point is 2π·x·dA).
package fem
