package mesh

// Rect meshes the rectangle [x0, x1] × [z0, z1] with nx × nz elements of one
// region. Its edge sets (and node sets) "bottom", "right", "top" and "left"
// are sides 0 to 3 of the block, each running counter-clockwise.
func Rect(x0, z0, x1, z1 float64, nx, nz int, region Region, kind Kind) (*Mesh, error) {
	return Build(Plan{
		Vertices: []Point{{x0, z0}, {x1, z0}, {x1, z1}, {x0, z1}},
		Blocks: []Block{{
			Corners:   [4]int{0, 1, 2, 3},
			Divisions: [2]int{nx, nz},
			Region:    region.Name,
			Sides:     [4]string{"bottom", "right", "top", "left"},
		}},
		Regions: []Region{region},
	}, kind)
}
