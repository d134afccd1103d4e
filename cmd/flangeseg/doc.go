// Command flangeseg is a refined, nonlinear 2D finite-element check of one
// bolt segment of a bolted ring-flange (L-flange) joint in a tubular tower.
// It parses flags, prints to the terminal, shows progress and maps errors
// to exit codes; every subcommand (compare, demo, fatigue, hand, mesh,
// run, validate, verify, version) calls the library packages: the model
// file (fem/segment/modelfile), the segment analysis (fem/segment), the
// run directory (post/results), the calculation note (post/note), the
// hand methods (post/handcalc) and the fatigue job (post/fatigue/assess).
// See `flangeseg help`.
//
// flangeseg is a design aid: its results must be checked against the
// governing codes and signed off under licensed engineering practice.
package main
