// Package sweep runs the cases of a plan (package plan) and gathers their
// results: each case is an ordinary run (segment.Run, then the run
// directory of post/results and the note of post/note) in its own folder
// cases/NAME, K cases side by side, finished by a record (case.json) that
// names the SHA-256 of the case's resolved model. A case whose record
// matches its model is not run again, so an interrupted sweep, run again,
// does only what is missing; a shard runs every N-th case, so that the
// shards of a batch array job share the cases without talking to each
// other. Collect reads the case folders back and WriteTables writes
// sweep.csv, sweep.json, the plots and the sweep page from them — the
// same files whether the cases ran in one process or in many.
package sweep
