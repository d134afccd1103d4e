// Command flangeseg is a refined, nonlinear 2D finite-element check of one
// bolt segment of a bolted ring-flange (L-flange) joint in a tubular tower.
// It owns the application: the model file (Spec) and its validation, the
// pipeline model file → mesh → solve → output files, the subcommands
// (demo, run, mesh, validate, verify, version), progress and exit codes.
// See `flangeseg help`.
//
// flangeseg is a design aid: its results must be checked against the
// governing codes and signed off under licensed engineering practice.
package main
