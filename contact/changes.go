package contact

// Change is a Gauss point whose contact status changed between the last
// two evaluations (a sliding point whose slip turned round counts): the
// trace of a Newton iteration that has not settled which points touch or
// slide.
type Change struct {
	X, Z     float64 // reference position of the point, mm
	From, To string  // status words: "unpaired", "open", "pressed", "sticking", "sliding"
	Pressure float64 // pressure at the last evaluation, MPa
}

func (s status) String() string {
	return [...]string{"unpaired", "open", "pressed", "sticking", "sliding"}[s]
}

// Changes lists the points whose status changed in the last Evaluate with
// respect to the Evaluate before it, in the order of the slave points.
// The slice is fresh.
func (p *Pair) Changes() []Change {
	var out []Change
	for i, c := range p.changed {
		if c {
			gp := &p.points[i]
			out = append(out, Change{X: gp.ref.X, Z: gp.ref.Z, From: p.before[i].String(), To: p.trial[i].status.String(), Pressure: p.lastPressure[i]})
		}
	}
	return out
}
