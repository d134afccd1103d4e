// Package mesh turns the geometry of an x–z section into a conforming mesh of
// 4-node or 8-node quadrilaterals: blocks mapped from the unit square by
// transfinite interpolation, regions carrying an out-of-plane thickness, and
// named node and edge sets for supports, loads and contact. BuildFlangeSegment
// plans and builds the section of one bolt segment of an L-flange joint.
//
// A Mesh is plain data. Build numbers nodes and elements deterministically,
// so the same Plan gives an identical Mesh; blocks that share a side share
// its nodes exactly, and blocks of different bodies share none, so parts in
// contact may have coincident nodes. Edges in an edge set keep the body on
// their left and lie in order along the boundary. Check and Quality inspect
// any Mesh, also one assembled by hand. Lengths are in mm; input arguments
// are never modified.
package mesh
