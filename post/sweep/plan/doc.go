// Package plan reads a sweep's plan file: a base model file, the keys to
// vary (each by a list of values or a range), how they combine (a full
// grid or zipped) and optional named cases. It numbers the cases
// deterministically and turns each into a model file and its validated
// Spec, reporting every problem of the plan and of every case at once,
// each naming its key, value and rule — before anything runs.
package plan
