// Package contact owns the contact pairs of the flange segment: the
// flange–flange interface with its initial gap profile (defined contact
// bands, recess, taper, parallel gap) and the washer faces, enforced by a
// penalty with augmented-Lagrangian updates, frictionless or with
// regularised Coulomb friction. It works on node numbers and coordinates
// only and imports nothing else of flangeseg; input arguments are never
// modified, and a Pair changes its committed state only in Commit.
//
// # Surfaces and gap
//
// A Pair integrates over the slave surface: at each Gauss point of a slave
// segment the current position x_s is projected onto the master surface
// (closest point, Newton's method on each segment: the last accepted
// segment and its neighbours first, all master segments when they fail).
// With x_m the projection and n the master's outward normal, the gap is
//
//	g = (x_s − x_m)·n + gap0(X_s),
//
// positive when open, where X_s is the reference position. Each point
// carries the area weight(X_s)·|dX_s/dr|·w_q of its Gauss weight w_q in
// the reference configuration, so pressures are forces per reference area
// and a uniform pressure on non-matching meshes gives exact slave forces.
// Points without a projection are inactive.
//
// # Forces and tangent
//
// The pressure is p_N = max(0, λ_N − ε_N·g). Its forces are the gradient of
// the penalty energy Σ W·⟨λ_N − ε_N·g⟩²/(2ε_N) over the Gauss points, and
// the tangent handed out is the exact second derivative, the change of the
// normal and of the projection point included, for straight and curved
// (3-node) master segments and finite sliding (Wriggers, Computational Contact
// Mechanics, 2006; Laursen, Computational Contact and Impact Mechanics,
// 2002). Settings.FrozenGeometry replaces it by its
// Gauss–Newton part ε_N·∂g⊗∂g, positive semi-definite, for a Cholesky
// solver when high trial pressures make the full tangent indefinite.
//
// # Friction
//
// Coulomb friction is regularised by an elastic stick: each slave point is
// tied to an anchor, a material point of the master, by a tangential
// penalty ε_T; the trial traction λ_T + ε_T·s, with s the tangential offset
// from the anchor, is returned onto |t_T| ≤ μ·p_N, and a sliding point's
// anchor follows it. The tangent is consistent and not symmetric while
// points slide; Settings.SymmetricTangent hands out its symmetric part.
// One exception makes Newton's method robust, not faster near the
// solution: a point whose slip direction turned round since the last
// evaluation gets the sticking tangent for that evaluation (its force
// stays the law's), since its traction swept the whole range ±μ·p_N
// between two iterates; once the slip direction holds, the tangent is the
// sliding one again.
// Augment updates λ_N and λ_T as in Simo & Laursen (1992), "An augmented
// Lagrangian treatment of contact problems involving friction".
//
// # State
//
// Evaluate and Augment leave a trial state that Commit accepts and Revert
// drops: the normal and tangential multipliers, the anchors (the slip
// history) and the master segment where each point's search starts.
//
// The contact patch test of Taylor & Papadopoulos (1991), "On a patch
// test for contact problems in two dimensions", is the check for
// non-matching meshes; this one-pass, point-wise projection passes it
// closely but not exactly — the master's nodal forces are integrated with
// the slave's rule — unlike a mortar method (Puso & Laursen 2004).
package contact
