// Package post turns results into files: the mesh and its fields as VTK XML
// files (an unstructured grid, .vtu, per state and a collection, .pvd, that
// orders the states in time), CSV tables, JSON documents and line charts
// (SVG and PNG), all deterministic.
//
// Every file is written to a temporary name in its folder and renamed into
// place only when complete, so a reader never sees half a file and a failed
// write leaves an existing file untouched. The x–z section is written as
// VTK points (x, z, 0), so it appears in a viewer's default x–y plane;
// 2-component vector fields (ux, uz) are padded to (ux, uz, 0) to match.
// Numbers are written in the shortest form that reads back to the same
// float64 (strconv 'g', precision −1), so output is byte-for-byte
// deterministic.
package post
