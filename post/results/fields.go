package results

import (
	"fmt"
	"path/filepath"

	"flangeseg/contact"
	"flangeseg/fem/segment"
	"flangeseg/post"
)

// writeFields writes a .vtu for each state that output.field_states
// chooses, named after its increment, and the fields.pvd series of them.
func writeFields(dir string, r *segment.Result) error {
	var series []post.SeriesEntry
	if err := r.EvaluateFieldPoints(); err != nil {
		return err
	}
	for _, st := range r.FieldStates() {
		name := fmt.Sprintf("state_%03d.vtu", st.Row.Increment)
		if err := writeState(filepath.Join(dir, "fields", name), st); err != nil {
			return err
		}
		series = append(series, post.SeriesEntry{Time: float64(st.Row.Increment), File: filepath.Join("fields", name)})
	}
	return post.WritePVD(filepath.Join(dir, "fields.pvd"), series)
}

// writeState writes the field file of one state: displacement, nodal
// stresses, contact pressure and gap as point data; region, plastic
// strain and damage as cell data.
func writeState(path string, st segment.State) error {
	m := st.Solution.Model().Mesh()
	point, cell, err := post.SolutionFields(st.Solution)
	if err != nil {
		return err
	}
	point = append(point, contactFields(len(m.Nodes), st.Contacts)...)
	cell = append(cell, historyFields(st.Plastic, st.Damage, len(m.Elements))...)
	return post.WriteVTU(path, post.GridFromMesh(m), point, cell)
}

// historyFields are the cell means of equivalent plastic strain and damage
// indicator over each element's integration points (zero where elastic).
func historyFields(plasticPts, damagePts [][]float64, cells int) []post.Field {
	plastic, damage := make([]float64, cells), make([]float64, cells)
	for e := range plasticPts {
		if n := len(plasticPts[e]); n > 0 {
			for ip := range plasticPts[e] {
				plastic[e] += plasticPts[e][ip] / float64(n)
				damage[e] += damagePts[e][ip] / float64(n)
			}
		}
	}
	return []post.Field{{Name: "plastic_strain", Components: 1, Values: plastic}, {Name: "damage", Components: 1, Values: damage}}
}

// contactFields carries contact pressure and gap to point data (zero away
// from the contact surfaces; each surface's slave nodes carry its values).
func contactFields(nodes int, pairs map[string][]contact.NodeResult) []post.Field {
	pressure := make([]float64, nodes)
	gap := make([]float64, nodes)
	for _, name := range []string{"faces", "head", "nut"} {
		for _, r := range pairs[name] {
			if r.Paired { // an unpaired node has no gap (it faces nothing)
				pressure[r.Node], gap[r.Node] = r.Pressure, r.Gap
			}
		}
	}
	return []post.Field{{Name: "contact_pressure", Components: 1, Values: pressure}, {Name: "gap", Components: 1, Values: gap}}
}
