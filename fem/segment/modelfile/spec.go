package modelfile

// Spec is a flange-segment model as its file states it: one struct per
// table, one field per key, lengths in mm, forces in N, stresses in MPa,
// angles in degrees. Decode fills in every default, so a decoded Spec
// is complete; optional values without a default (a second way of giving
// the bolt, the preload keys not chosen, the reference loads) are nil
// pointers or empty strings when the file leaves them out.
type Spec struct {
	Title     string                  `toml:"title"`
	Tower     TowerSpec               `toml:"tower"`
	Shell     ShellSpec               `toml:"shell"`
	Flange    FlangeSpec              `toml:"flange"`
	Bolt      BoltSpec                `toml:"bolt"`
	Contact   ContactSpec             `toml:"contact"`
	Preload   PreloadSpec             `toml:"preload"`
	Load      LoadSpec                `toml:"load"`
	Mesh      MeshSpec                `toml:"mesh"`
	Analysis  AnalysisSpec            `toml:"analysis"`
	Fatigue   FatigueSpec             `toml:"fatigue"`
	Output    OutputSpec              `toml:"output"`
	Materials map[string]MaterialSpec `toml:"materials,omitempty"`
}

// FatigueSpec holds what the bolt fatigue check (flangeseg fatigue) takes
// from the model: the partial factor γ_Mf on the fatigue strength
// (EN 1993-1-9 Table 3.1 recommends 1.00 to 1.35 by assessment method and
// consequence of failure; the National Annex and the project decide).
type FatigueSpec struct {
	GammaMf float64 `toml:"gamma_mf"`
}

// OutputSpec chooses what a run writes beside its tables and plots.
type OutputSpec struct {
	// FieldStates chooses the converged states that get a field file
	// (fields/state_NNN.vtu): "key" (the end of the preload, the opening,
	// the decompression, the peak and the last state), "all", or
	// "every N" (the end of the preload, every N-th increment of the
	// tension stage and the last state). Read it with FieldChoice.
	FieldStates string `toml:"field_states"`
}

// TowerSpec is the tower at the joint.
type TowerSpec struct {
	Diameter float64 `toml:"diameter"` // D, shell mid-surface diameter at the joint
	Bolts    int     `toml:"bolts"`    // n, number of bolts around the circumference
}

// ShellSpec is the tower wall on each side of the joint.
type ShellSpec struct {
	Thickness float64 `toml:"thickness"` // t
	Length    float64 `toml:"length"`    // L, modelled wall length on each side
	Material  string  `toml:"material"`
}

// FlangeSpec is each of the two L-flanges.
type FlangeSpec struct {
	Thickness  float64 `toml:"thickness"` // t_f
	A          float64 `toml:"a"`         // a, bolt axis → flange free edge
	B          float64 `toml:"b"`         // b, bolt axis → shell mid-surface
	Material   string  `toml:"material"`
	NeckRadius float64 `toml:"neck_radius"` // fillet radius between flange and shell
}

// BoltSpec is the bolt with its washers and nut. The thread is either an
// ISO 261 coarse Size or a Diameter with a Pitch.
type BoltSpec struct {
	Size     string   `toml:"size,omitempty"`     // "M12" … "M72"
	Diameter *float64 `toml:"diameter,omitempty"` // d, with Pitch instead of Size
	Pitch    *float64 `toml:"pitch,omitempty"`    // P
	Grade    string   `toml:"grade"`              // property class "8.8", "10.9" or "12.9"
	Thread   string   `toml:"thread"`             // "partial" (shank and thread) or "full"

	// ThreadLength is the threaded length inside the clamp of a partially
	// threaded bolt; nil for a full thread, which runs the whole clamp.
	ThreadLength *float64 `toml:"thread_length,omitempty"`

	Hole            float64 `toml:"hole"`             // d_h
	WasherOuter     float64 `toml:"washer_outer"`     // d_w
	WasherThickness float64 `toml:"washer_thickness"` // t_w, each of the two washers
	HeadHeight      float64 `toml:"head_height"`
	NutHeight       float64 `toml:"nut_height"`

	// Material, if set, names the law of the bolt in the analysis instead
	// of the grade's; the grade still sets f_ub and f_yb for the preload
	// and the hand checks.
	Material string `toml:"material,omitempty"`
}

// ContactSpec is the interface between the two flange faces. x is the
// radial coordinate from the bolt axis (positive towards the shell), so the
// face spans x ∈ [−a, b + t/2].
type ContactSpec struct {
	Friction float64 `toml:"friction"` // Coulomb coefficient

	// Zones are the x ranges that touch; nil means the whole face does.
	// Outside them each face recedes by Recess (faces per RecessOn).
	Zones    []ZoneSpec `toml:"zones,omitempty"`
	Recess   float64    `toml:"recess"`
	RecessOn string     `toml:"recess_on"` // "both", "upper" or "lower"

	// Taper tilts each face by this angle (degrees). Positive: the faces
	// touch at the shell-side corner x = b + t/2 and open towards the free
	// edge, a gap of 2·tan(taper)·(b + t/2 − x) between them. Negative: they
	// touch at the free edge x = −a and open towards the shell, a gap of
	// 2·tan(−taper)·(x + a).
	Taper float64 `toml:"taper"`

	// ParallelGap is a uniform gap between the faces, added to the rest.
	ParallelGap float64 `toml:"parallel_gap"`

	// GapSpring (N/mm) stands in for the neighbouring segments of the
	// ring, which a strip lacks: a spring between the two flanges, under
	// the washers, that resists the flanges' approach from their places
	// before tightening and pushes them apart by GapSpring times that
	// approach (never pulls them together), so that the preload spends
	// the force that closing a parallel gap against the ring's bending
	// takes. Zero: none. Only with ParallelGap > 0. flangeseg ring sets
	// it per bolt from the ring's bending over the gap's length.
	GapSpring float64 `toml:"gap_spring"`
}

// ZoneSpec is a band of the face that touches, From < To.
type ZoneSpec struct {
	From float64 `toml:"from"`
	To   float64 `toml:"to"`
}

// PreloadSpec gives the bolt's preload in exactly one way.
type PreloadSpec struct {
	Force    *float64 `toml:"force,omitempty"`    // F_p, N
	Fraction *float64 `toml:"fraction,omitempty"` // F_p/F_p,C, F_p,C = 0.7·f_ub·A_s
	NutTurn  *float64 `toml:"nut_turn,omitempty"` // degrees; shortens the bolt by angle/360·P
}

// LoadSpec is the tension stage: the loaded shell end moves up by
// displacement control.
type LoadSpec struct {
	MaxDisplacement float64 `toml:"max_displacement"`
	Increments      int     `toml:"increments"`
	StopDrop        float64 `toml:"stop_drop"`    // fraction below the peak load that ends the run
	EndRotation     string  `toml:"end_rotation"` // "fixed" or "free" loaded shell end

	// ServiceForce is the reference segment force of the secant stiffness
	// (N); nil leaves it to the analysis (40 % of the hand-method ultimate
	// load). DesignForce is a design segment force to check against (N).
	ServiceForce *float64 `toml:"service_force,omitempty"`
	DesignForce  *float64 `toml:"design_force,omitempty"`
}

// MeshSpec sets the element size.
type MeshSpec struct {
	Size    float64 `toml:"size"`    // target element size
	Refine  float64 `toml:"refine"`  // size factor near bolt, hole and zone edges, in (0, 1]
	Element string  `toml:"element"` // "quad8" or "quad4"
}

// AnalysisSpec chooses the idealisation.
type AnalysisSpec struct {
	Plane            string `toml:"plane"` // "stress" or "strain"
	LargeDeformation bool   `toml:"large_deformation"`
	RingSprings      bool   `toml:"ring_springs"` // hoop stiffness of the ring as springs on the wall
	// Materials is "elastoplastic" (von Mises plasticity with the curves
	// of the grades or of [materials]) or "elastic" (every material
	// linear elastic: the service range only).
	Materials string `toml:"materials"`
	// BoltStrength picks the bolt curve: "minimum" (ISO 898-1 minimum
	// values) or "nominal" (EN 1993-1-8 Table 3.1 f_yb, f_ub).
	BoltStrength string `toml:"bolt_strength"`
	// NeckingWeight is Ling's (1996) weight w between the linear and the
	// power-law extension of a curve past necking, in [0, 1].
	NeckingWeight *float64 `toml:"necking_weight,omitempty"`
	// The ductile damage indicator's fracture strain ε_f = α·exp(−β·η)
	// per material family: structural steels (shell, flange) and bolt
	// steels. Zero values take the family defaults of package material.
	DamageAlphaSteel float64 `toml:"damage_alpha_steel,omitempty"`
	DamageBetaSteel  float64 `toml:"damage_beta_steel,omitempty"`
	DamageAlphaBolt  float64 `toml:"damage_alpha_bolt,omitempty"`
	DamageBetaBolt   float64 `toml:"damage_beta_bolt,omitempty"`
}

// MaterialSpec is a material the file defines. Without Curve it is linear
// elastic. Curve lists [total strain, stress] points of the uniaxial curve
// beyond the elastic range, as CurveKind says ("true" or "engineering").
type MaterialSpec struct {
	E         float64     `toml:"E"`
	Nu        float64     `toml:"nu"`
	Curve     [][]float64 `toml:"curve,omitempty"`
	CurveKind string      `toml:"curve_kind,omitempty"`
}

// The words the enumerated keys take.
const (
	ThreadPartial    = "partial"
	ThreadFull       = "full"
	RecessBoth       = "both"
	RecessUpper      = "upper"
	RecessLower      = "lower"
	RotationFixed    = "fixed"
	RotationFree     = "free"
	ElementQuad8     = "quad8"
	ElementQuad4     = "quad4"
	PlaneStress      = "stress"
	PlaneStrain      = "strain"
	Elastoplastic    = "elastoplastic"
	ElasticOnly      = "elastic"
	BoltMinimum      = "minimum"
	BoltNominal      = "nominal"
	CurveTrue        = "true"
	CurveEngineering = "engineering"
	FieldStatesKey   = "key"
	FieldStatesAll   = "all"
	FieldStatesEvery = "every" // followed by a space and N
)
