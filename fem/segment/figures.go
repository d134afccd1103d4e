package segment

import (
	"flangeseg/fem/segment/figures"
)

// jointFigures reads the joint figures and the failure mechanism off a
// run (package figures).
func jointFigures(g *segment, res *analysis) figures.Joint {
	// Both shell stubs stretch as bars, Z·L/(E·t·c) each.
	stub := 2 * g.spec.Shell.Length / (g.shellE * g.spec.Shell.Thickness * g.der.SegmentWidth)
	return figures.Read(res.rows, figures.Input{PreloadTarget: g.der.PreloadForce, PreloadReached: res.preload.Force,
		PreloadEigenstrain: res.preload.Eigenstrain, Hand: g.hand, ServiceForce: g.spec.Load.ServiceForce,
		StubElongation: stub, Yielding: g.model.HasHistory()})
}
