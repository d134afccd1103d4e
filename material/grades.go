package material

import (
	"fmt"
	"math"
	"strings"

	"flangeseg/material/bolt"
)

// Strength is what a built-in grade gives the curve: yield and tensile
// strength and the strains that shape the engineering curve between them.
type Strength struct {
	Name string  // grade or property class, e.g. "S355", "10.9"
	Fy   float64 // yield strength (R_eH of a steel, R_p0.2 of a bolt), MPa
	Fu   float64 // tensile strength R_m, MPa
	// PlateauEnd is the engineering strain ε_sh at which hardening starts
	// after the yield plateau; 0 for no plateau (bolt steels).
	PlateauEnd float64
	// Uniform is the engineering strain ε_u at the tensile strength (the
	// uniform elongation).
	Uniform float64
	// Elongation is the minimum elongation after fracture A of the grade's
	// standard where the curve uses it (bolt classes), else 0.
	Elongation float64
}

// steelRow is one grade of the thickness table.
type steelRow struct {
	name  string
	reh   [6]float64 // R_eH for t ≤ 16, 40, 63, 80, 100, 150 mm
	rm    float64    // lower bound of R_m for 3 ≤ t ≤ 100 mm
	rm150 float64    // lower bound of R_m for 100 < t ≤ 150 mm
}

// steelBands are the upper ends of the nominal thickness bands, mm.
var steelBands = [6]float64{16, 40, 63, 80, 100, 150}

// steelTable holds the minimum yield strength by thickness band and the
// lower bound of the tensile strength: EN 10025-2 for S235–S355, EN 10025-3/-4
// for S420 and S460 (those two rows from memory; check them before relying
// on them). The R_m values for 100 < t ≤ 150 mm are from memory for all
// grades (the project's check table stops at 100 mm).
func steelTable() []steelRow {
	return []steelRow{
		{"S235", [6]float64{235, 225, 215, 215, 215, 195}, 360, 350},
		{"S275", [6]float64{275, 265, 255, 245, 235, 225}, 410, 400},
		{"S355", [6]float64{355, 345, 335, 325, 315, 295}, 470, 450},
		{"S420", [6]float64{420, 400, 390, 370, 360, 340}, 520, 500},
		{"S460", [6]float64{460, 440, 430, 410, 400, 385}, 540, 530},
	}
}

// SteelGrades lists the built-in structural steels.
func SteelGrades() []string {
	var g []string
	for _, r := range steelTable() {
		g = append(g, r.name)
	}
	return g
}

// SteelStrength is the strength of a structural steel grade ("S235" …
// "S460", an optional quality suffix such as "S355J2" is ignored) at the
// nominal product thickness t in mm: the thickness of the plate or forging
// (the shell thickness t, the flange thickness t_f), not the out-of-plane
// thickness of a strip region. Bands are closed above (t = 16 is in
// "t ≤ 16"); t above 150 mm is outside the table and refused. For t < 3 mm
// the R_m of 3–100 mm is used (the standard's higher value is not needed
// for a conservative curve).
//
// The curve shape follows the predictive model for hot-rolled steels of
// X. Yun and L. Gardner ("Stress-strain curves for hot-rolled steels",
// J. Constr. Steel Res. 133 (2017) 36–46; from memory): the yield plateau
// ends at ε_sh = 0.1·f_y/f_u − 0.055, kept within
// [0.015, 0.03], and the uniform elongation is ε_u = 0.6·(1 − f_y/f_u).
// Applied here to the minimum strengths, which is engineering judgement.
func SteelStrength(grade string, t float64) (Strength, error) {
	if !(t > 0) || math.IsInf(t, 0) {
		return Strength{}, fmt.Errorf("material: steel %q: thickness %g mm: must be positive", grade, t)
	}
	var row *steelRow
	rows := steelTable()
	for i := range rows {
		rest, ok := strings.CutPrefix(strings.ToUpper(grade), rows[i].name)
		if ok && (rest == "" || rest[0] >= 'A' && rest[0] <= 'Z') {
			row = &rows[i]
		}
	}
	if row == nil {
		return Strength{}, fmt.Errorf("material: steel grade %q: not known (known: %s)", grade, strings.Join(SteelGrades(), ", "))
	}
	band := -1
	for i, up := range steelBands {
		if t <= up {
			band = i
			break
		}
	}
	if band < 0 {
		return Strength{}, fmt.Errorf("material: steel %s: thickness %g mm: above 150 mm, outside the EN 10025 table", row.name, t)
	}
	fy, fu := row.reh[band], row.rm
	if t > 100 {
		fu = row.rm150
	}
	ratio := fy / fu
	return Strength{
		Name:       row.name,
		Fy:         fy,
		Fu:         fu,
		PlateauEnd: math.Min(0.03, math.Max(0.015, 0.1*ratio-0.055)),
		Uniform:    0.6 * (1 - ratio),
	}, nil
}

// BoltValues selects which strengths of a property class a curve uses.
type BoltValues int

const (
	// BoltMinimum: the minimum values of ISO 898-1 (R_m, R_p0.2, A), the
	// best estimate of a real bolt's lower bound.
	BoltMinimum BoltValues = iota
	// BoltNominal: the nominal f_ub and f_yb that EN 1993-1-8 Table 3.1
	// uses for design.
	BoltNominal
)

// String names the choice in plain words.
func (v BoltValues) String() string {
	switch v {
	case BoltMinimum:
		return "minimum"
	case BoltNominal:
		return "nominal"
	}
	return fmt.Sprintf("bolt values(%d)", int(v))
}

// BoltClasses lists the built-in property classes.
func BoltClasses() []string { return bolt.Classes() }

// BoltStrength is the strength of a bolt property class ("8.8", "10.9",
// "12.9") with the values v: the ISO 898-1 minimum values (for 8.8 those
// of d > 16 mm, the sizes of flange bolts) or the nominal values of
// EN 1993-1-8 Table 3.1, both from package material/bolt.
//
// Quenched and tempered bolt steel has no yield plateau: the curve hardens
// from the yield point to R_m. ISO 898-1 specifies no uniform elongation;
// it is taken as half the minimum elongation after fracture A, the rest of
// A being the neck's share (engineering judgement).
func BoltStrength(class string, v BoltValues) (Strength, error) {
	a, err := bolt.MinimumElongation(class)
	if err != nil {
		return Strength{}, fmt.Errorf("material: bolt property class %q: not known (known: %s)", class, strings.Join(BoltClasses(), ", "))
	}
	var g bolt.Grade
	switch v {
	case BoltMinimum:
		g, err = bolt.MinimumGrade(class, math.Inf(1))
	case BoltNominal:
		g, err = bolt.NominalGrade(class)
	default:
		return Strength{}, fmt.Errorf("material: bolt class %s: values %v: not known", class, v)
	}
	if err != nil {
		return Strength{}, fmt.Errorf("material: %w", err)
	}
	return Strength{Name: class, Fy: g.Fyb, Fu: g.Fub, Uniform: a / 2, Elongation: a}, nil
}

// curveSteps is the number of chords of the hardening branch.
const curveSteps = 40

// EngineeringCurve samples the engineering stress–strain curve of the
// grade for Young's modulus e (MPa): elastic to f_y, the yield plateau to
// ε_sh, then
//
//	σ_e = f_y + (f_u − f_y)·[1 − (1 − ξ)³],  ξ = (ε − ε_sh)/(ε_u − ε_sh),
//
// which starts with a finite hardening modulus 3(f_u − f_y)/(ε_u − ε_sh)
// and reaches f_u with zero slope at ε_u, so the tensile strength is the
// necking point. The cubic is engineering judgement (a shape of our own,
// fixed only by f_y, f_u, ε_sh, ε_u). Points are [strain, stress], from the
// yield point.
func (s Strength) EngineeringCurve(e float64) ([][2]float64, error) {
	ey := s.Fy / e
	start := math.Max(s.PlateauEnd, ey)
	if !(e > 0) || !(s.Fy > 0) || !(s.Fu >= s.Fy) || !(s.Uniform > start) {
		return nil, fmt.Errorf("material: grade %s: f_y = %g, f_u = %g MPa, plateau end %g, uniform elongation %g with E = %g: need 0 < f_y ≤ f_u and ε_u above the yield strain and the plateau", s.Name, s.Fy, s.Fu, s.PlateauEnd, s.Uniform, e)
	}
	pts := [][2]float64{{ey, s.Fy}}
	if start > ey {
		pts = append(pts, [2]float64{start, s.Fy})
	}
	for j := 1; j <= curveSteps; j++ {
		xi := float64(j) / curveSteps
		eps := start + xi*(s.Uniform-start)
		pts = append(pts, [2]float64{eps, s.Fy + (s.Fu-s.Fy)*(1-math.Pow(1-xi, 3))})
	}
	return pts, nil
}

// Hardening is the hardening table of the grade's curve for Young's
// modulus e, extended past necking with nk (see HardeningFromCurve).
func (s Strength) Hardening(e float64, nk Necking) (Hardening, error) {
	pts, err := s.EngineeringCurve(e)
	if err != nil {
		return Hardening{}, err
	}
	h, err := HardeningFromCurve(e, pts, EngineeringCurve, nk)
	if err != nil {
		return Hardening{}, fmt.Errorf("material: grade %s: %w", s.Name, err)
	}
	return h, nil
}
