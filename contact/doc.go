// Package contact will own the contact pairs of the flange segment: the
// flange–flange interface with its initial gap profile (defined contact
// bands, recess, taper, parallel gap) and the washer faces, enforced by
// penalty with augmented-Lagrangian updates, frictionless or with Coulomb
// friction. It works on coordinates and dof numbers only and imports
// nothing else of flangeseg. Empty until the flange-segment model lands.
package contact
