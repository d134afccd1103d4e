package fem

import (
	"fmt"

	"flangeseg/contact"
	"flangeseg/mesh"
)

// NewContactPair builds a contact pair between two edge sets of a mesh:
// the slave set's sides are integrated, the master set's sides are
// projected on; gap0 and weight as in contact.NewPair.
func NewContactPair(name string, msh *mesh.Mesh, slave, master string, s contact.Settings,
	gap0, weight func(x, z float64) float64) (*contact.Pair, error) {
	sl, err := surfaceOf(msh, slave)
	if err != nil {
		return nil, err
	}
	ms, err := surfaceOf(msh, master)
	if err != nil {
		return nil, err
	}
	ref := make([]contact.Point, len(msh.Nodes))
	for i, p := range msh.Nodes {
		ref[i] = contact.Point{X: p.X, Z: p.Z}
	}
	p, err := contact.NewPair(name, sl, ms, ref, s, gap0, weight)
	if err != nil {
		return nil, fmt.Errorf("fem: contact %s: %w", name, err)
	}
	return p, nil
}

// surfaceOf turns an edge set into a contact surface.
func surfaceOf(msh *mesh.Mesh, set string) (contact.Surface, error) {
	edges, ok := msh.EdgeSets[set]
	if !ok || len(edges) == 0 {
		return contact.Surface{}, fmt.Errorf("fem: edge set %q is missing or empty", set)
	}
	var s contact.Surface
	for _, e := range edges {
		s.Segments = append(s.Segments, e.Nodes)
	}
	return s, nil
}
