package figures

// Row is one converged state of a segment analysis: the measurements that
// history.csv lists and the joint figures are read from. Forces in N,
// moments in N·mm, lengths in mm.
type Row struct {
	Increment       int
	Stage           string    // "preload" or "tension"
	Z               float64   // segment force Z, N
	U               float64   // loaded-edge displacement from the preloaded state, mm
	Fs              float64   // bolt force at the contact plane, N
	MomentInterface float64   // bolt bending moment at the contact plane, N·mm
	MomentHead      float64   // bolt bending moment under the head, N·mm
	GapEdge         float64   // opening at the shell-side corner, mm
	ZoneForce       []float64 // contact force per contact zone of the face, N
	ShellSide       float64   // contact force between bolt axis and shell face (x ≥ 0), N
	Penetration     float64   // largest penetration of any pair, mm
	ZFixed          float64   // z reaction at the fixed shell end, N (equilibrium check)
	Iterations      int
	// Cuts is how often the increment's step was halved before it converged
	// (not written to history.csv).
	Cuts int
	// Yielding (zero with elastic laws): largest equivalent plastic
	// strain and damage indicator anywhere, per failure site (the names
	// of Sites; a hinge site only where a cut has yielded through its
	// depth, see HingeStrain), and the largest damage in the bolt with
	// where it is.
	MaxPlastic, MaxDamage float64
	SitePlastic           map[string]float64
	BoltDamage            float64
	BoltDamageWhere       string
	// WallDamage is the largest damage indicator in the shells and
	// flanges, at WallDamageWhere (the part and the point, in words).
	WallDamage      float64
	WallDamageWhere string
}
