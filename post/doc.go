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
// A .vtu file holds its arrays in binary (Float64 values, Int64 node
// numbers), zlib-compressed in blocks in the file's appended data section,
// as the VTK XML format documents it, so values read back exactly; text
// files write numbers in the shortest form that reads back to the same
// float64 (strconv 'g', precision −1). Output is byte-for-byte
// deterministic.
package post
