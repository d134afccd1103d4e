// Package figures reads a segment analysis's history: one Row per
// converged state (segment force, displacement, bolt force and moments,
// gap, contact forces, yielding), and off it the joint figures an engineer
// looks for (Read: preload, stiffness, load factor, opening and
// decompression load, peak, the FE against the hand methods) and the
// failure mechanism (Mechanism, HingeStrain: which bolt part necks and
// where shell and flange form plastic hinges, and the Petersen mode they
// make up). It does no finite-element work; package fem/segment fills the
// rows.
package figures
