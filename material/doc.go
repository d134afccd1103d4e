// Package material holds the constitutive laws of flangeseg: the response of
// one material point to a strain. It owns linear isotropic elasticity now;
// elastoplastic laws, hardening curves, steel and bolt grades and the damage
// indicator come later behind the same Law interface.
//
// Vectors of strain and stress use the component order of the x–z section:
// xx, zz, yy, xz, where yy is the out-of-plane (circumferential) component and
// the xz strain is the engineering shear strain γ_xz = 2ε_xz. Stresses in MPa.
//
// A Law never changes the committed state it is given; it writes its trial
// state into the slice the caller provides, so the caller decides when an
// increment is accepted.
package material
