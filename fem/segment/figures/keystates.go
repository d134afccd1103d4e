package figures

import "slices"

// edgeGap is the quantity whose rise past OpenGap is the opening.
func edgeGap(r Row) float64 { return r.GapEdge }

// shellSideRelief is the quantity whose rise past decompressed is the
// decompression: the contact force between the bolt axis and the shell
// face, negated.
func shellSideRelief(r Row) float64 { return -r.ShellSide }

// decompressed is where shellSideRelief counts as decompressed, N: less
// than 1 µN of contact force left on the shell side.
const decompressed = -1e-6

// KeyRows returns the indices of the rows at the key states of a run (the
// preload row first), ascending and each once: the end of the preload
// (row 0); the opening, the first row whose shell-side corner is open
// (row 0 if the preload opened it already); the decompression, the first
// row with no contact left between the bolt axis and the shell face; the
// peak, the first row of the largest segment force; and the last row. The
// opening and the decompression are the rows just past the loads that
// Read interpolates; a state the run did not reach is left out.
func KeyRows(rows []Row) []int {
	if len(rows) == 0 {
		return nil
	}
	opening := crossingRow(rows, edgeGap, OpenGap)
	if rows[0].GapEdge > OpenGap {
		opening = 0
	}
	peak := 0
	for i, r := range rows {
		if r.Z > rows[peak].Z {
			peak = i
		}
	}
	keys := []int{0}
	for _, i := range []int{opening, crossingRow(rows, shellSideRelief, decompressed), peak, len(rows) - 1} {
		if i > 0 {
			keys = append(keys, i)
		}
	}
	slices.Sort(keys)
	return slices.Compact(keys)
}
