package segment

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/mesh"
	"flangeseg/post"
	"flangeseg/post/handcalc"
	"flangeseg/post/report"
)

// This file fills the calculation note, report.html (package post/report),
// of a run and of a comparison. A run's note is built from the analysis in
// memory; a comparison rebuilds each run's note from its run directory
// (history.csv, summary.json) and the model, so it needs no analysis in
// memory. Field pictures and contact pressures need the solution and stay
// in each run's own note.

// Sources as the notes name them.
const (
	srcFE      = "FE, this run"
	srcFile    = "model file"
	srcDerived = "derived from the model file"
	srcHand    = "post/handcalc"
)

// writeRunReport writes dir/report.html, the calculation note of one run,
// replaced atomically.
func writeRunReport(dir, path string, text []byte, g *segment, res *analysis, sum summary) error {
	n := runNote{path: path, text: text, g: g, rows: res.rows, sum: sum}
	r, err := n.report()
	if err != nil {
		return err
	}
	r.ContactPressure = notePressure(res)
	fields, err := noteFields(g, res)
	if err != nil {
		return fmt.Errorf("report: field pictures: %w", err)
	}
	r.Fields = fields
	return report.Write(filepath.Join(dir, "report.html"), r)
}

// writeCompareReport writes dir/report.html, one note for the runs of a
// comparison (names, jobs and sums in the same order, the first the
// reference of every ratio), from their run directories.
func writeCompareReport(dir string, names []string, jobs []ModelJob, sums []summary) error {
	if len(names) != len(jobs) || len(sums) != len(jobs) {
		return fmt.Errorf("report: comparison of %d names, %d models and %d summaries: want one of each per model", len(names), len(jobs), len(sums))
	}
	if len(jobs) == 0 {
		return fmt.Errorf("report: comparison without models")
	}
	var notes []runNote
	c := report.Compare{Caution: caution}
	var titles, sha []string
	for i, j := range jobs {
		g, err := buildSegment(j.Spec, j.Spec.Derive())
		if err != nil {
			return fmt.Errorf("report: %s: %w", j.Path, err)
		}
		rows, err := historyRows(filepath.Join(j.Dir, "history.csv"), g.zones)
		if err != nil {
			return fmt.Errorf("report: %s: %w", j.Path, err)
		}
		n := runNote{path: j.Path, text: j.Text, g: g, rows: rows, sum: sums[i]}
		r, err := n.report()
		if err != nil {
			return err
		}
		own := filepath.Join(j.Dir, "report.html")
		if rel, err := filepath.Rel(dir, own); err == nil {
			own = filepath.ToSlash(rel)
		}
		r.Notes = append(r.Notes, fmt.Sprintf("The field pictures and the contact pressure along the interface of this run are in its own calculation note, %s.", own))
		notes = append(notes, n)
		c.Runs = append(c.Runs, r)
		titles = append(titles, r.Title)
		h, err := resolvedHash(j.Spec)
		if err != nil {
			return err
		}
		sha = append(sha, names[i]+" "+h)
	}
	c.Title = fmt.Sprintf("Comparison of %d models: %s", len(jobs), strings.Join(titles, "; "))
	c.Generated = fmt.Sprintf("flangeseg %s; model.resolved.toml sha256 of the runs: %s", version, strings.Join(sha, ", "))
	c.Comparison = comparisonTable(names, sums)
	c.Overlays = compareOverlays(names, notes)
	c.Notes = []string{
		"Run 1 is the reference of every ratio. A ratio is left empty where either value is not reached or is zero.",
		"Each run's model file, history.csv and summary.json are in its own folder beside this note.",
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	return report.WriteCompare(filepath.Join(dir, "report.html"), c)
}

// runNote is what the note of one run is built from.
type runNote struct {
	path string // the model file as the user named it
	text []byte // the model's text when it is not on disk at path, else nil
	g    *segment
	rows []figures.Row
	sum  summary
}

func (n *runNote) report() (report.Report, error) {
	s := n.g.spec
	joint, err := jointDrawing(s, n.g.mesh)
	if err != nil {
		return report.Report{}, err
	}
	h, err := resolvedHash(s)
	if err != nil {
		return report.Report{}, err
	}
	title := s.Title
	if strings.TrimSpace(title) == "" {
		title = filepath.Base(n.path)
	}
	return report.Report{
		Title:        title,
		Model:        filepath.Base(n.path),
		Generated:    fmt.Sprintf("flangeseg %s; model.resolved.toml sha256 %s", version, h),
		Caution:      caution,
		Joint:        joint,
		Inputs:       append(n.inputs(), n.derived()),
		Preload:      n.preload(),
		Results:      n.results(),
		Curves:       noteCurves(n.g, n.rows, n.sum.Joint),
		HandVersusFE: n.handVersusFE(),
		Convergence:  n.convergence(),
		Notes:        n.notes(),
	}, nil
}

// resolvedHash is the start of the SHA-256 of the resolved model: it
// names the input exactly without reading a clock or the file system.
func resolvedHash(s *Spec) (string, error) {
	b, err := s.ResolvedTOML()
	if err != nil {
		return "", err
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:8]), nil
}

// inputKey describes a model-file key for the inputs table.
type inputKey struct {
	symbol, name string
	unit         string  // of the value as shown; "" for text values
	scale        float64 // file value × scale = shown value; 0 means 1
}

// inputKeys describes every key of the model file's tables (not title and
// [materials], which have their own place). A test checks that it covers
// Spec.
func inputKeys() map[string]inputKey {
	mm, one := "mm", report.Dimensionless
	return map[string]inputKey{
		"tower.diameter":              {"D", "shell mid-surface diameter at the joint", mm, 0},
		"tower.bolts":                 {"n", "number of bolts around the circumference", one, 0},
		"shell.thickness":             {"t", "shell thickness", mm, 0},
		"shell.length":                {"L", "modelled wall length on each side", mm, 0},
		"shell.material":              {"", "shell material", "", 0},
		"flange.thickness":            {"t_f", "flange thickness", mm, 0},
		"flange.a":                    {"a", "bolt axis to flange free edge", mm, 0},
		"flange.b":                    {"b", "bolt axis to shell mid-surface", mm, 0},
		"flange.material":             {"", "flange material", "", 0},
		"flange.neck_radius":          {"r", "fillet radius between flange and shell", mm, 0},
		"bolt.size":                   {"", "bolt size, ISO 261 coarse thread", "", 0},
		"bolt.diameter":               {"d", "bolt diameter", mm, 0},
		"bolt.pitch":                  {"P", "thread pitch", mm, 0},
		"bolt.grade":                  {"", "property class", "", 0},
		"bolt.thread":                 {"", "thread (partial: shank and thread; full)", "", 0},
		"bolt.thread_length":          {"l_t", "threaded length inside the clamp", mm, 0},
		"bolt.hole":                   {"d_h", "hole diameter", mm, 0},
		"bolt.washer_outer":           {"d_w", "washer outer diameter", mm, 0},
		"bolt.washer_thickness":       {"t_w", "washer thickness, each of two", mm, 0},
		"bolt.head_height":            {"k", "head height", mm, 0},
		"bolt.nut_height":             {"m", "nut height", mm, 0},
		"bolt.material":               {"", "material of the bolt in the analysis", "", 0},
		"contact.friction":            {"μ", "friction coefficient between the faces", one, 0},
		"contact.zones":               {"", "defined contact zones (x ranges that touch)", "", 0},
		"contact.recess":              {"", "recess of each face outside the zones", mm, 0},
		"contact.recess_on":           {"", "recessed faces", "", 0},
		"contact.taper":               {"", "taper of each face", "°", 0},
		"contact.parallel_gap":        {"", "uniform gap between the faces", mm, 0},
		"preload.force":               {"F_p", "preload force", "kN", 1e-3},
		"preload.fraction":            {"", "preload as a fraction of F_p,C", one, 0},
		"preload.nut_turn":            {"", "nut turn", "°", 0},
		"load.max_displacement":       {"u_max", "largest displacement of the loaded shell end", mm, 0},
		"load.increments":             {"", "increments of the tension stage", one, 0},
		"load.stop_drop":              {"", "drop below the peak load that ends the run", one, 0},
		"load.end_rotation":           {"", "rotation of the loaded shell end", "", 0},
		"load.service_force":          {"Z_ref", "reference segment force of the secant stiffness", "kN", 1e-3},
		"load.design_force":           {"Z_Ed", "design segment force", "kN", 1e-3},
		"mesh.size":                   {"", "target element size", mm, 0},
		"mesh.refine":                 {"", "size factor near bolt, hole and zone edges", one, 0},
		"mesh.element":                {"", "element type", "", 0},
		"analysis.plane":              {"", "plane condition of the section", "", 0},
		"analysis.large_deformation":  {"", "large deformation", "", 0},
		"analysis.ring_springs":       {"", "ring springs for the hoop stiffness of the tower", "", 0},
		"analysis.materials":          {"", "material behaviour", "", 0},
		"analysis.bolt_strength":      {"", "bolt stress–strain curve (ISO 898-1 minimum or EN 1993-1-8 nominal)", "", 0},
		"analysis.necking_weight":     {"w", "weight of the curve past necking (Ling 1996)", one, 0},
		"analysis.damage_alpha_steel": {"α", "fracture strain factor of the damage indicator, structural steel", one, 0},
		"analysis.damage_beta_steel":  {"β", "triaxiality exponent of the damage indicator, structural steel", one, 0},
		"analysis.damage_alpha_bolt":  {"α", "fracture strain factor of the damage indicator, bolt steel", one, 0},
		"analysis.damage_beta_bolt":   {"β", "triaxiality exponent of the damage indicator, bolt steel", one, 0},
		"fatigue.gamma_mf":            {"γ_Mf", "partial factor on the fatigue strength (EN 1993-1-9)", one, 0},
	}
}

// inputCaptions name the model file's tables.
var inputCaptions = map[string]string{
	"tower": "Tower", "shell": "Shell", "flange": "Flange", "bolt": "Bolt, washers and nut",
	"contact": "Contact faces", "preload": "Preload", "load": "Load (tension stage)",
	"mesh": "Mesh", "analysis": "Analysis", "fatigue": "Bolt fatigue",
}

// keySources says where each key's value comes from: the model file or
// a default.
type keySources struct {
	md    toml.MetaData
	known bool // false: the file the run read could not be found again
}

// modelKeys finds which keys the model file gives. The file at path (or
// text, the model's text when it is not on disk, as the embedded demo
// models) counts only if it decodes to the very Spec that ran, so a file
// changed since, or a Spec edited after decoding, gives "model file or
// default" instead of a wrong answer.
func modelKeys(path string, text []byte, s *Spec) keySources {
	var candidates [][]byte
	if data, err := os.ReadFile(path); err == nil {
		candidates = append(candidates, data)
	}
	if text != nil {
		candidates = append(candidates, text)
	}
	for _, data := range candidates {
		decoded, err := modelfile.Decode(data)
		if err != nil || !reflect.DeepEqual(decoded, s) {
			continue
		}
		var raw map[string]any
		if md, err := toml.Decode(string(data), &raw); err == nil {
			return keySources{md: md, known: true}
		}
	}
	return keySources{}
}

func (k keySources) source(path string) string {
	if !k.known {
		return "model file or default"
	}
	if k.md.IsDefined(strings.Split(path, ".")...) {
		return srcFile
	}
	for _, d := range modelfile.KeyDefaults() {
		if d.Key == path {
			return "default: " + d.Text
		}
	}
	return "default"
}

// inputs are the model file's keys, one table per file table, each value
// with its unit and whether the file or a default gave it.
func (n *runNote) inputs() []report.Quantities {
	s := n.g.spec
	keys := inputKeys()
	src := modelKeys(n.path, n.text, s)
	v := reflect.ValueOf(s).Elem()
	var out []report.Quantities
	for i := range v.NumField() {
		sec, _, _ := strings.Cut(v.Type().Field(i).Tag.Get("toml"), ",")
		table := v.Field(i)
		if table.Kind() != reflect.Struct {
			continue // title is the note's title; [materials] follows
		}
		q := report.Quantities{Caption: inputCaptions[sec] + " — [" + sec + "]"}
		names := modelfile.TableKeys(table.Type())
		for j, key := range names {
			path := sec + "." + key
			cell, ok := inputCell(path, keys[path], table.Field(j))
			if !ok {
				continue
			}
			k, known := keys[path]
			name := k.name + " (" + path + ")"
			if !known {
				name = path
			}
			q.Rows = append(q.Rows, report.Quantity{Symbol: k.symbol, Name: name, Value: cell, Source: src.source(path)})
		}
		out = append(out, q)
	}
	for _, name := range s.MaterialNames() {
		out = append(out, materialInputs(name, s.Materials[name]))
	}
	return out
}

// inputCell shows one key's value; false for an optional key the model
// leaves unset.
func inputCell(path string, k inputKey, v reflect.Value) (report.Cell, bool) {
	if v.Kind() == reflect.Pointer {
		if v.IsNil() {
			return report.Cell{}, false
		}
		v = v.Elem()
	}
	switch v.Kind() {
	case reflect.Float64:
		if k.unit == "" { // a key without a known unit shows as the file writes it
			return report.Text(fnum(v.Float())), true
		}
		scale := k.scale
		if scale == 0 {
			scale = 1
		}
		return report.Num(v.Float()*scale, k.unit), true
	case reflect.Int:
		return report.Num(float64(v.Int()), report.Dimensionless), true
	case reflect.String:
		return report.Text(v.String()), v.String() != ""
	case reflect.Bool:
		return report.Text(strconv.FormatBool(v.Bool())), true
	}
	if zones, ok := v.Interface().([]ZoneSpec); ok && path == "contact.zones" {
		if len(zones) == 0 {
			return report.Text("none: the whole face touches"), true
		}
		parts := make([]string, len(zones))
		for i, z := range zones {
			parts[i] = signed(z.From) + " … " + signed(z.To)
		}
		return report.Text("x = " + strings.Join(parts, "; ") + " mm"), true
	}
	return report.Text(fmt.Sprint(v.Interface())), true
}

// signed writes x with a true minus sign.
func signed(x float64) string { return strings.Replace(fnum(x), "-", "−", 1) }

func materialInputs(name string, m MaterialSpec) report.Quantities {
	p := "materials." + toml.Key{name}.String()
	q := report.Quantities{Caption: "Material " + name + " — [" + p + "]", Rows: []report.Quantity{
		{Symbol: "E", Name: "Young's modulus (" + p + ".E)", Value: report.Num(m.E, "MPa"), Source: srcFile},
		{Symbol: "ν", Name: "Poisson's ratio (" + p + ".nu)", Value: report.Num(m.Nu, report.Dimensionless), Source: srcFile},
	}}
	if len(m.Curve) == 0 {
		q.Rows = append(q.Rows, report.Quantity{Name: "stress–strain curve (" + p + ".curve)", Value: report.Text("none: linear elastic"), Source: srcFile})
		return q
	}
	pt := func(c []float64) string {
		if len(c) != 2 {
			return "?"
		}
		return "(" + fnum(c[0]) + ", " + fnum(c[1]) + " MPa)"
	}
	text := fmt.Sprintf("%d points (strain, stress) from %s to %s, %s", len(m.Curve), pt(m.Curve[0]), pt(m.Curve[len(m.Curve)-1]), m.CurveKind)
	q.Rows = append(q.Rows, report.Quantity{Name: "stress–strain curve (" + p + ".curve, .curve_kind)", Value: report.Text(text), Source: srcFile})
	return q
}

// derived are the quantities that follow from the inputs, each with the
// rule or standard that gives it.
func (n *runNote) derived() report.Quantities {
	s, d, h := n.g.spec, n.g.der, n.g.hand
	num := report.Num
	mm := "mm"
	thread := "ISO 261 coarse thread, " + s.Bolt.Size
	if s.Bolt.Size == "" {
		thread = srcFile
	}
	rows := []report.Quantity{
		{Symbol: "d", Name: "bolt diameter", Value: num(d.D, mm), Source: thread},
		{Symbol: "P", Name: "thread pitch", Value: num(d.Pitch, mm), Source: thread},
		{Symbol: "A", Name: "shank area π·d²/4", Value: num(d.NominalArea, "mm²"), Source: srcDerived},
		{Symbol: "A_s", Name: "stress area π/4·((d₂ + d₃)/2)²", Value: num(d.StressArea, "mm²"), Source: "ISO 898-1"},
		{Symbol: "f_ub", Name: "bolt tensile strength, nominal", Value: num(d.Fub, "MPa"), Source: "EN 1993-1-8 Table 3.1"},
		{Symbol: "f_yb", Name: "bolt yield strength, nominal", Value: num(d.Fyb, "MPa"), Source: "EN 1993-1-8 Table 3.1"},
		{Symbol: "F_p,C", Name: "design preload 0.7·f_ub·A_s", Value: num(d.DesignPreload/1e3, "kN"), Source: "EN 1993-1-8, 3.9"},
		{Symbol: "F_t,Rd", Name: "tension resistance k₂·f_ub·A_s/γ_M2", Value: num(h.Bolt.TensionResistance/1e3, "kN"),
			Source: fmt.Sprintf("EN 1993-1-8 Table 3.4, k₂ = %s, γ_M2 = %s", fnum(h.Params.K2), fnum(h.Params.GammaM2))},
		{Symbol: "R_b", Name: "bolt circle radius D/2 − b", Value: num(d.BoltCircleRadius, mm), Source: srcDerived},
		{Symbol: "c", Name: "segment width 2π·R_b/n", Value: num(d.SegmentWidth, mm), Source: srcDerived},
		{Symbol: "l_k", Name: "clamp length 2·(t_f + t_w)", Value: num(d.ClampLength, mm), Source: srcDerived},
		{Name: "loaded thread inside the clamp", Value: num(d.ThreadInClamp, mm), Source: "bolt.thread, bolt.thread_length"},
		{Name: "out-of-plane thickness of shell and flange, c", Value: num(d.FlangeStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of the flange across the hole, c − d_h", Value: num(d.HoleBandStrip, mm), Source: "strip model"},
		{Symbol: "h", Name: "in-plane width of the bolt strip (√3/2)·d", Value: num(d.BoltWidth, mm), Source: "strip model: h² = 12·I/A keeps the round bar's A and I"},
		{Name: "out-of-plane thickness of the shank strip A/h", Value: num(d.ShankStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of the thread strip A_s/h", Value: num(d.ThreadStrip, mm), Source: "strip model"},
		{Name: "out-of-plane thickness of head, nut and washers π(d_w² − d_h²)/(4(d_w − d_h))", Value: num(d.BearingStrip, mm), Source: "strip model: keeps the bearing area"},
	}
	if d.PreloadForce > 0 {
		rows = append(rows, report.Quantity{Symbol: "F_p", Name: "target preload", Value: num(d.PreloadForce/1e3, "kN"), Source: preloadRule(s)})
	} else {
		rows = append(rows, report.Quantity{Name: "bolt shortening by the nut turn, angle/360·P", Value: num(d.PreloadShortening, mm), Source: preloadRule(s)})
	}
	for _, p := range []struct {
		symbol, part, mat string
		t, fy             float64
	}{{"f_y", "shell", s.Shell.Material, s.Shell.Thickness, d.ShellYield}, {"f_y", "flange", s.Flange.Material, s.Flange.Thickness, d.FlangeYield}} {
		if p.fy > 0 {
			rows = append(rows, report.Quantity{Symbol: p.symbol, Name: "yield strength of the " + p.part + " (" + p.mat + ")",
				Value: num(p.fy, "MPa"), Source: yieldSource(s, p.mat, p.t)})
		}
	}
	rows = append(rows,
		report.Quantity{Symbol: "k_r", Name: "ring spring stiffness E·t/R² per unit wall area", Value: num(d.RingSpring, "N/mm³"), Source: "strip model: hoop stiffness of the ring"},
		report.Quantity{Symbol: "1/β", Name: "decay length of shell bending, β = [3(1−ν²)/(R²t²)]^¼", Value: num(d.DecayLength, mm), Source: "beam on elastic foundation (Hetényi 1946, from memory)"},
		report.Quantity{Symbol: "3/β", Name: "stub length beyond which the end condition does not matter", Value: num(d.ThreeDecayLengths, mm), Source: "beam on elastic foundation (Hetényi 1946, from memory)"},
	)
	return report.Quantities{Caption: "Derived quantities", Rows: rows}
}

func preloadRule(s *Spec) string {
	p := s.Preload
	switch {
	case p.Force != nil:
		return "preload.force"
	case p.Fraction != nil:
		return "preload.fraction × F_p,C"
	}
	return "preload.nut_turn"
}

// yieldSource names where a part's yield strength comes from.
func yieldSource(s *Spec, name string, t float64) string {
	switch {
	case s.Materials[name].E > 0:
		return "[materials." + name + "], first point of the curve"
	case name == "S420" || name == "S460":
		return fmt.Sprintf("EN 10025-3/-4 at t = %s mm (from memory)", fnum(t))
	}
	return fmt.Sprintf("EN 10025-2 at t = %s mm", fnum(t))
}

func (n *runNote) preload() report.Quantities {
	j, d := n.sum.Joint, n.g.der
	if len(n.rows) == 0 {
		return report.Quantities{}
	}
	num := report.Num
	method := fmt.Sprintf("a slice of the bolt, %s mm long, is shortened until the bolt force reaches the target, then locked", fnum(math.Round(n.g.slice*100)/100))
	if d.PreloadForce == 0 {
		method = fmt.Sprintf("a slice of the bolt, %s mm long, is shortened by the nut turn and locked", fnum(math.Round(n.g.slice*100)/100))
	}
	rows := []report.Quantity{
		{Name: "method", Value: report.Text(method), Source: "flangeseg preload stage"},
		{Symbol: "F_p,C", Name: "design preload 0.7·f_ub·A_s", Value: num(d.DesignPreload/1e3, "kN"), Source: "EN 1993-1-8, 3.9"},
	}
	if j.PreloadTargetKN > 0 {
		rows = append(rows, report.Quantity{Symbol: "F_p", Name: "target preload", Value: num(j.PreloadTargetKN, "kN"), Source: preloadRule(n.g.spec)})
	}
	rows = append(rows, report.Quantity{Symbol: "F_p", Name: "preload reached", Value: report.NumDigits(j.PreloadReachedKN, "kN", 6), Source: srcFE})
	if j.PreloadTargetKN > 0 {
		rows = append(rows, report.Quantity{Name: "preload reached / target − 1", Value: num(j.PreloadReachedKN/j.PreloadTargetKN-1, report.Dimensionless), Source: srcFE + "; the stage holds it within ±0.005"})
	}
	rows = append(rows,
		report.Quantity{Symbol: "ε_0", Name: "locked shortening strain of the slice", Value: num(j.PreloadEigenstrain, report.Dimensionless), Source: srcFE},
		report.Quantity{Symbol: "σ_p", Name: "bolt stress after preload F_p/A_s", Value: num(j.PreloadReachedKN*1e3/d.StressArea, "MPa"), Source: srcDerived + " and the FE preload"},
		report.Quantity{Name: "preload reached / F_p,C", Value: report.NumDigits(j.PreloadReachedKN*1e3/d.DesignPreload, report.Dimensionless, 6), Source: srcDerived + " and the FE preload"},
	)
	return report.Quantities{Caption: "Preload of the bolt", Rows: rows}
}

// orMissing is a number cell, or "—" when the value is not reached.
func orMissing(p *float64, unit string) report.Cell {
	if p == nil {
		return report.Missing(unit)
	}
	return report.Num(*p, unit)
}

func (n *runNote) results() report.Quantities {
	if len(n.rows) < 2 {
		return report.Quantities{}
	}
	j, s := n.sum.Joint, n.sum
	num := report.Num
	stiff := "kN/mm"
	ref := fmt.Sprintf("Z_ref = %.4g kN", j.ReferenceLoadKN)
	opening := report.Quantity{Symbol: "Z_open", Name: "opening load: the shell-side corner x = b + t/2 opens (gap > 1 µm)", Value: orMissing(j.OpeningLoadKN, "kN"), Source: srcFE}
	if j.OpenAfterPreload {
		opening.Source = srcFE + ": the corner is open after preload already"
	} else if j.OpeningLoadKN == nil {
		opening.Source = srcFE + ": not reached"
	}
	dec := report.Quantity{Symbol: "Z_dec", Name: "decompression load: no contact left between bolt axis and shell face", Value: orMissing(j.DecompressionKN, "kN"), Source: srcFE}
	if j.DecompressionKN == nil {
		dec.Source = srcFE + ": not reached"
	}
	rows := []report.Quantity{
		{Symbol: "K_0", Name: "stiffness ΔZ/Δu, tangent at Z = 0, whole model", Value: num(j.StiffnessTangentZero, stiff), Source: srcFE},
		{Symbol: "K_0,j", Name: "stiffness, tangent at Z = 0, joint alone (shell stubs' elongation taken out)", Value: num(j.JointStiffnessTangent, stiff), Source: srcFE},
		{Symbol: "K_open", Name: "stiffness, secant to the opening load, whole model", Value: orMissing(j.StiffnessToOpening, stiff), Source: srcFE},
		{Symbol: "K_open,j", Name: "stiffness, secant to the opening load, joint alone", Value: orMissing(j.JointStiffnessOpening, stiff), Source: srcFE},
		{Symbol: "Z_ref", Name: "reference load of the secants", Value: num(j.ReferenceLoadKN, "kN"), Source: j.ReferenceFrom},
		{Symbol: "K_ref", Name: "stiffness, secant to " + ref + ", whole model", Value: orMissing(j.StiffnessToReference, stiff), Source: srcFE},
		{Symbol: "K_ref,j", Name: "stiffness, secant to " + ref + ", joint alone", Value: orMissing(j.JointStiffnessReference, stiff), Source: srcFE},
		{Name: "elongation of both shell stubs per kN, 2·L/(E·t·c)", Value: num(j.StubElongationPerKN, "mm/kN"), Source: srcDerived},
		{Symbol: "Φ_0", Name: "load factor ΔF_s/ΔZ, tangent at Z = 0", Value: num(j.LoadFactorTangentZero, report.Dimensionless), Source: srcFE},
		{Symbol: "Φ_ref", Name: "load factor, secant to " + ref, Value: orMissing(j.LoadFactorToReference, report.Dimensionless), Source: srcFE},
		opening,
		dec,
		{Symbol: "Z_max", Name: "largest segment force reached", Value: num(j.PeakLoadKN, "kN"), Source: srcFE},
		{Symbol: "u_peak", Name: "displacement at the largest segment force", Value: num(j.DisplacementPeakMM, "mm"), Source: srcFE},
		{Symbol: "u_end", Name: "displacement at the end of the run", Value: num(j.DisplacementEndMM, "mm"), Source: srcFE},
		{Name: "why the run ended", Value: report.Text(s.Ending), Source: srcFE},
		{Name: "failure mechanism", Value: report.Text(j.FailureLocation), Source: srcFE},
		{Name: "largest penetration of any contact pair", Value: num(j.PenetrationMaxMM, "mm"), Source: srcFE},
		{Symbol: "Z_u", Name: "hand-method ultimate load, " + j.HandUltimateBasis, Value: num(j.HandUltimateKN, "kN"), Source: srcHand},
	}
	if s.Failure != "" {
		rows = append(rows, report.Quantity{Name: "analysis stopped", Value: report.Text(s.Failure), Source: srcFE})
	}
	if v := s.Verdict; v != nil {
		rows = append(rows, report.Quantity{Symbol: "Z_Ed", Name: "design segment force", Value: num(v.DesignForceKN, "kN"), Source: "load.design_force"})
		for _, l := range v.Lines {
			rows = append(rows, report.Quantity{Symbol: "η", Name: fmt.Sprintf("utilisation Z_Ed/Z_u, %s, mode %s: %s", l.Method, l.Mode, l.Status),
				Value: report.NumDigits(l.Utilisation, report.Dimensionless, 3), Source: fmt.Sprintf("%s; borderline within 1 ± %s", srcHand, fnum(v.Margin))})
		}
		rows = append(rows, report.Quantity{Name: "verdict of the hand methods", Value: report.Text(verdictText(v)), Source: srcHand})
	}
	return report.Quantities{Caption: "Key results of the joint", Rows: rows}
}

// verdictText is the verdict in a sentence, as `flangeseg hand` prints it.
func verdictText(v *handcalc.Verdict) string {
	switch {
	case v.Borderline:
		return "borderline: a refined check is worth making"
	case v.Exceeded:
		return "exceeded by the hand methods"
	}
	return "the hand methods show a clear reserve"
}

// notAssessed reports whether the run's materials cannot fail: then peak
// load and mechanism are not results.
func (n *runNote) notAssessed() bool {
	return n.g.spec.Analysis.Materials == elasticOnly || strings.HasPrefix(n.sum.Joint.FailureLocation, "not assessed")
}

// basisText names a basis of the hand methods in words.
func basisText(b handcalc.Basis) string {
	switch b {
	case handcalc.BasisDesign:
		return "design, with k₂"
	case handcalc.BasisDesignNoK2:
		return "design, without k₂"
	case handcalc.BasisCharacteristic:
		return "characteristic, with k₂"
	case handcalc.BasisCharacteristicNoK2:
		return "characteristic, without k₂"
	}
	return string(b)
}

// handVersusFE sets the FE peak beside the ultimate loads of the hand
// methods, on every basis and by both mechanism methods.
func (n *runNote) handVersusFE() report.Table {
	h, j := n.g.hand, n.sum.Joint
	t := report.Table{
		Caption: "Ultimate segment force by FE and by the plastic-hinge methods",
		Columns: []report.Column{{Heading: "method"}, {Heading: "basis"}, {Heading: "governing mode"},
			{Heading: "ultimate segment force", Unit: "kN"}, {Heading: "FE / method", Unit: report.Dimensionless}, {Heading: "source"}},
		Source: fmt.Sprintf("FE: this run; hand methods: post/handcalc, each with its source in its row. Modes: A %s; B %s; C %s.",
			handcalc.ModeA.Description(), handcalc.ModeB.Description(), handcalc.ModeC.Description()),
	}
	assessed := !n.notAssessed() && len(n.rows) > 1
	na := report.Text("not assessed: linear elastic materials")
	fe := []report.Cell{report.Text("FE, this run"), report.Text("material curves of the model"), report.Text(j.FailureLocation),
		report.Num(j.PeakLoadKN, ""), report.Num(1, ""), report.Text("largest Z of the tension stage")}
	if !assessed {
		fe[1], fe[3], fe[4] = report.Text("linear elastic"), na, report.Text("not assessed")
		if len(n.rows) < 2 {
			fe[2], fe[3] = report.Text("no tension stage"), report.Text("no tension stage")
		}
	}
	if assessed && n.rows[len(n.rows)-1].Z/1e3 >= j.PeakLoadKN {
		fe[5] = report.Text("largest Z of the tension stage, still rising at its end: a lower bound of the ultimate load")
	}
	t.Rows = append(t.Rows, fe)
	ratio := func(z float64) report.Cell {
		if !assessed || !(z > 0) {
			return report.Text("not assessed")
		}
		return report.Num(j.PeakLoadKN*1e3/z, "")
	}
	if assessed && j.MechanismMode != "" {
		t.Rows = append(t.Rows, []report.Cell{report.Text("the FE mechanism's own mode, by hand"), report.Text(basisText(handcalc.BasisCharacteristicNoK2)),
			report.Text(j.MechanismMode), report.Num(j.ModeHandKN, ""), ratio(j.ModeHandKN * 1e3),
			report.Text("Seidel (2001), the mode the FE mechanism matches, " + srcHand)})
	}
	for _, u := range h.Ultimate {
		for _, m := range []struct {
			name, source string
			mech         handcalc.Mechanisms
		}{
			{"plastic hinges", "Petersen, Stahlbau", u.Petersen},
			{"plastic hinges, shell hinge reduced by its axial force", "Seidel (2001)", u.Seidel},
		} {
			t.Rows = append(t.Rows, []report.Cell{report.Text(m.name), report.Text(basisText(u.Basis)), report.Text(string(m.mech.Governing)),
				report.Num(m.mech.Z/1e3, ""), ratio(m.mech.Z), report.Text(m.source + ", " + srcHand)})
		}
	}
	tr := h.Bolt.TensionResistance
	t.Rows = append(t.Rows, []report.Cell{report.Text("bolt tension resistance F_t,Rd"), report.Text(basisText(handcalc.BasisDesign)),
		report.Text(string(handcalc.ModeA)), report.Num(tr/1e3, ""), ratio(tr),
		report.Text(fmt.Sprintf("EN 1993-1-8 Table 3.4, k₂ = %s, γ_M2 = %s", fnum(h.Params.K2), fnum(h.Params.GammaM2)))})
	return t
}

func (n *runNote) convergence() report.Quantities {
	m, s := n.sum.Mesh, n.sum.Solver
	one := report.Dimensionless
	num := report.Num
	rows := []report.Quantity{
		{Name: "nodes", Value: num(float64(m.Nodes), one), Source: "mesh"},
		{Name: "elements, " + m.Element, Value: num(float64(m.Elements), one), Source: "mesh"},
		{Name: "smallest Jacobian ratio of an element", Value: num(m.MinJacobianRatio, one), Source: "mesh quality check"},
		{Name: "largest aspect ratio of an element", Value: num(m.MaxAspectRatio, one), Source: "mesh quality check"},
		{Name: "equations", Value: num(float64(m.Equations), one), Source: srcFE},
		{Name: "converged increments of the tension stage", Value: num(float64(s.Increments), one), Source: srcFE},
		{Name: "Newton iterations, all stages", Value: num(float64(s.NewtonIterations), one), Source: srcFE},
		{Name: "factorizations of the tangent", Value: num(float64(s.Factorizations), one), Source: srcFE},
		{Name: "Krylov (GMRES) steps", Value: num(float64(s.KrylovSteps), one), Source: srcFE},
		{Name: "preload solves", Value: num(float64(s.PreloadSolves), one), Source: srcFE},
		{Name: "contact penalty", Value: num(s.PenaltyMPaPerMM, "MPa/mm"), Source: "10·E/(mesh.size·mesh.refine)"},
		{Name: "largest penetration of any contact pair", Value: num(n.sum.Joint.PenetrationMaxMM, "mm"), Source: srcFE},
		{Name: "states kept for field output", Value: num(float64(s.FieldStatesWritten), one), Source: srcFE},
	}
	if s.Increments > 0 {
		var tension int
		for _, r := range n.rows {
			if r.Stage != "preload" {
				tension += r.Iterations
			}
		}
		rows = append(rows, report.Quantity{Name: "mean Newton iterations per tension increment", Value: num(float64(tension)/float64(s.Increments), one), Source: srcFE})
	}
	return report.Quantities{Caption: "Solver statistics (times are in summary.json: they differ from machine to machine)", Rows: rows}
}

// notes are the limits of the model, in brief, and the model's warnings.
func (n *runNote) notes() []string {
	s := n.g.spec
	plane := "plane stress"
	if s.Analysis.Plane == planeStrain {
		plane = "plane strain"
	}
	springs := "Ring springs E·t/R² on the wall stand in for the hoop stiffness of the ring."
	if !s.Analysis.RingSprings {
		springs = "Ring springs are off: the end condition of the shell stub decides how much moment the shell carries, and with it the prying force."
	}
	out := []string{
		"Strip model: a 2D " + plane + " section through the bolt axis of one segment, whose out-of-plane thicknesses keep the areas that matter (shell and flange c, flange across the hole c − d_h, bolt A and A_s with the in-plane width (√3/2)·d, bearing parts the washer annulus). " + springs + " What varies around the circumference — the contact pressure between the bolts, the bolt's bending out of plane, ovalisation of the ring — is outside the model.",
	}
	if s.Analysis.LargeDeformation {
		out = append(out, "Kinematics: large deformation (total Lagrangian, logarithmic strain). Contact: finite sliding in the current configuration, penalty with augmented-Lagrangian updates, Coulomb friction.")
	} else {
		out = append(out, "Kinematics: small strain. Contact: small sliding (gap and slip along the reference geometry), penalty with augmented-Lagrangian updates, Coulomb friction; the largest penetration is in the key results.")
	}
	if s.Analysis.Materials == elasticOnly {
		out = append(out, `Materials: every part linear elastic (analysis.materials = "elastic"). The note covers the service range — stiffness, load factor, opening, bolt-force function; the largest segment force is where the displacement ended, not an ultimate load, and no failure mechanism is assessed.`)
	} else {
		out = append(out, "Materials: von Mises plasticity with isotropic hardening on each part's curve; the preload slice of the bolt stays elastic. The failure mechanism is read from where the plastic strain concentrates.")
	}
	out = append(out, "The loaded shell end is a rigid edge moved along the tower axis (rotation "+s.Load.EndRotation+"); the other end is fixed. Z is the segment force per bolt.")
	for _, w := range n.g.der.Warnings {
		out = append(out, "Warning: "+w+".")
	}
	if n.sum.Failure != "" {
		out = append(out, "The analysis stopped before its end ("+n.sum.Failure+"); every result comes from the increments that converged.")
	}
	return out
}

// noteCurves are the load–response curves (the files of curveFiles and
// the report's figures), with the peak marked on Z–u and the opening load
// on the bolt-force function.
func noteCurves(g *segment, rows []figures.Row, j figures.Joint) []post.Plot {
	if len(rows) < 2 {
		return nil
	}
	z := column(rows, func(r figures.Row) float64 { return r.Z / 1e3 })
	u := column(rows, func(r figures.Row) float64 { return r.U })
	fs := column(rows, func(r figures.Row) float64 { return r.Fs / 1e3 })
	zh, diagram, tri := handCurves(g.hand, math.Max(rows[len(rows)-1].Z, 0))
	bolt := post.Plot{Title: "Bolt force function, FE and hand bolt-force models", XLabel: "Z [kN]", YLabel: "F_s [kN]",
		Series: []post.Series{{Name: "FE", X: z, Y: fs},
			{Name: "joint diagram (VDI 2230)", X: zh, Y: diagram, Dashed: true},
			{Name: "trilinear (Schmidt/Neuhaus)", X: zh, Y: tri, Dashed: true}}}
	if o := j.OpeningLoadKN; o != nil && *o > 0 {
		if f, ok := figures.At(rows, *o*1e3, func(r figures.Row) float64 { return r.Fs / 1e3 }); ok {
			bolt.Markers = append(bolt.Markers, post.Marker{Name: "opening", X: *o, Y: f})
		}
	}
	zones := post.Plot{Title: "Contact force per zone", XLabel: "Z [kN]", YLabel: "contact force [kN]"}
	for i, zr := range g.zones {
		zones.Series = append(zones.Series, post.Series{Name: zr.name,
			X: z, Y: column(rows, func(r figures.Row) float64 { return r.ZoneForce[i] / 1e3 })})
	}
	return []post.Plot{
		{Title: "Segment force against loaded-edge displacement", XLabel: "u [mm]", YLabel: "Z [kN]",
			Series: []post.Series{{Name: "FE", X: u, Y: z}}, Markers: peakMarker(rows)},
		bolt,
		{Title: "Bolt bending moment", XLabel: "Z [kN]", YLabel: "M_s [kN·m]",
			Series: []post.Series{
				{Name: "at the contact plane", X: z, Y: column(rows, func(r figures.Row) float64 { return r.MomentInterface / 1e6 })},
				{Name: "under the head", X: z, Y: column(rows, func(r figures.Row) float64 { return r.MomentHead / 1e6 }), Dashed: true}}},
		{Title: "Opening at the shell-side corner", XLabel: "Z [kN]", YLabel: "gap [mm]",
			Series: []post.Series{{Name: "x = b + t/2", X: z, Y: column(rows, func(r figures.Row) float64 { return r.GapEdge })}}},
		zones,
	}
}

// notePressure is pressurePlot without series that have no paired node.
func notePressure(res *analysis) []post.Plot {
	if len(res.states) == 0 {
		return nil
	}
	p := pressurePlot(res)
	kept := p.Series[:0:0]
	for _, s := range p.Series {
		if len(s.X) > 0 {
			kept = append(kept, s)
		}
	}
	if len(kept) == 0 {
		return nil
	}
	p.Series = kept
	return []post.Plot{p}
}

// isBoltPart reports whether a mesh region belongs to the bolt body:
// bolt, head, nut and washers.
func isBoltPart(name string) bool {
	return strings.HasPrefix(name, "bolt_") || name == "nut" || strings.HasSuffix(name, "_washer")
}

// noteFields are the pictures of von Mises stress and, with yielding
// materials, equivalent plastic strain at the last converged state. The
// bolt lies over the flange across the hole in the section, so flanges
// with shell and the bolt body are separate pictures.
func noteFields(g *segment, res *analysis) ([]report.Field, error) {
	if len(res.states) == 0 {
		return nil, nil
	}
	st := res.states[len(res.states)-1]
	m := g.mesh
	point, _, err := post.SolutionFields(st.solution)
	if err != nil {
		return nil, err
	}
	var vm []float64
	for _, f := range point {
		if f.Name == "von_mises" {
			vm = f.Values
		}
	}
	if len(vm) != len(m.Nodes) {
		return nil, fmt.Errorf("von Mises stress: %d values for %d nodes", len(vm), len(m.Nodes))
	}
	nodes := make([][2]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		nodes[i] = [2]float64{p.X, p.Z}
	}
	var body, bolt [][]int
	for _, e := range m.Elements {
		if isBoltPart(m.Regions[e.Region].Name) {
			bolt = append(bolt, e.Nodes)
		} else {
			body = append(body, e.Nodes)
		}
	}
	s := g.spec
	top := s.Flange.Thickness + s.Bolt.WasherThickness + math.Max(s.Bolt.HeadHeight, s.Bolt.NutHeight) + 20
	view := &report.Box{XMin: -s.Flange.A - 10, XMax: s.Flange.B + s.Shell.Thickness/2 + 10, ZMin: -top, ZMax: top}
	at := fmt.Sprintf("at the last converged state (%s, Z = %.4g kN), undeformed shape", st.label, st.row.Z/1e3)
	out := []report.Field{
		{Caption: "von Mises stress " + at + ": flanges and shell near the joint.", Name: "von Mises stress", Unit: "MPa",
			Nodes: nodes, Cells: body, Values: vm, View: view},
		{Caption: "von Mises stress " + at + ": bolt, head, nut and washers. The re-entrant corners where the shank meets head and nut carry local peaks of the strip model.", Name: "von Mises stress", Unit: "MPa",
			Nodes: nodes, Cells: bolt, Values: vm},
	}
	if ep := nodalPlastic(m, st.history.plastic); ep != nil {
		cap := "Equivalent plastic strain " + at + " (cell means of the integration points, averaged to the nodes)"
		out = append(out,
			report.Field{Caption: cap + ": flanges and shell near the joint.", Name: "equivalent plastic strain", Unit: report.Dimensionless,
				Nodes: nodes, Cells: body, Values: ep, View: view},
			report.Field{Caption: cap + ": bolt, head, nut and washers.", Name: "equivalent plastic strain", Unit: report.Dimensionless,
				Nodes: nodes, Cells: bolt, Values: ep})
	}
	return out, nil
}

// nodalPlastic averages each element's mean equivalent plastic strain
// over the elements that share a node; nil when no element keeps a
// plastic strain (elastic laws).
func nodalPlastic(m *mesh.Mesh, plastic [][]float64) []float64 {
	some := false
	for _, p := range plastic {
		some = some || len(p) > 0
	}
	if !some || len(plastic) != len(m.Elements) {
		return nil
	}
	sum := make([]float64, len(m.Nodes))
	count := make([]int, len(m.Nodes))
	for e, el := range m.Elements {
		mean := 0.0
		for _, v := range plastic[e] {
			mean += v / float64(len(plastic[e]))
		}
		for _, n := range el.Nodes {
			sum[n] += mean
			count[n]++
		}
	}
	for n := range sum {
		if count[n] > 0 {
			sum[n] /= float64(count[n])
		}
	}
	return sum
}

// jointParts groups the mesh regions into the parts the drawing names, in
// drawing order: the bolt after the flange it passes through.
func jointParts() []struct{ name, regions string } {
	return []struct{ name, regions string }{
		{"flange", "upper_flange lower_flange"},
		{"flange, hole band", "upper_flange_hole lower_flange_hole"},
		{"shell", "upper_shell lower_shell"},
		{"bolt", "bolt_shank bolt_thread bolt_preload"},
		{"head and washer", "bolt_head head_washer"},
		{"nut and washer", "nut nut_washer"},
	}
}

// jointDrawing draws the section from the mesh outline, cut off a little
// beyond head and nut, with the main dimensions.
func jointDrawing(s *Spec, m *mesh.Mesh) (*report.JointDrawing, error) {
	parts := jointParts()
	group := map[string]int{}
	names := make([]string, len(parts))
	for i, p := range parts {
		names[i] = p.name
		for _, r := range strings.Fields(p.regions) {
			group[r] = i
		}
	}
	nodes := make([][2]float64, len(m.Nodes))
	for i, p := range m.Nodes {
		nodes[i] = [2]float64{p.X, p.Z}
	}
	cells := make([][]int, 0, len(m.Elements))
	var cellPart []int
	for _, e := range m.Elements {
		i, ok := group[m.Regions[e.Region].Name]
		if !ok {
			return nil, fmt.Errorf("report: joint drawing: mesh region %q belongs to no part", m.Regions[e.Region].Name)
		}
		cells = append(cells, e.Nodes)
		cellPart = append(cellPart, i)
	}
	regions, err := report.Outlines(nodes, cells, cellPart, names)
	if err != nil {
		return nil, err
	}
	tf, a, b, t := s.Flange.Thickness, s.Flange.A, s.Flange.B, s.Shell.Thickness
	dh, dw, tw := s.Bolt.Hole, s.Bolt.WasherOuter, s.Bolt.WasherThickness // t_w: washer thickness
	head := regionBox(m, "bolt_head")
	nut := regionBox(m, "nut")
	headTop, nutBottom := tf+tw+s.Bolt.HeadHeight, -tf-tw-s.Bolt.NutHeight
	if head != nil {
		headTop = head.ZMax
	}
	if nut != nil {
		nutBottom = nut.ZMin
	}
	top := math.Max(headTop, -nutBottom) + 50
	shellZ := tf + 0.35*(top-tf)
	mmText := func(sym string, v float64) string { return sym + " = " + fnum(math.Round(v*10)/10) + " mm" }
	below := nutBottom + tf - 18 // offset of the a and b lines from the lower flange's bottom face
	return &report.JointDrawing{
		Caption: fmt.Sprintf("Modelled section of one bolt segment, drawn from the mesh outline and cut off at z = ±%s mm; the shell stubs run on to z = ±%s mm. Dimensions in mm.",
			fnum(math.Round(top)), fnum(tf+s.Shell.Length)),
		Regions:  regions,
		BoltAxis: true,
		View:     &report.Box{XMin: -a - 45, XMax: b + t/2 + 45, ZMin: -top, ZMax: top},
		Dimensions: []report.Dimension{
			{From: [2]float64{-a, 0}, To: [2]float64{-a, tf}, Label: mmText("t_f", tf), Offset: 16},
			{From: [2]float64{-a, -tf}, To: [2]float64{0, -tf}, Label: mmText("a", a), Offset: below},
			{From: [2]float64{0, -tf}, To: [2]float64{b, -tf}, Label: mmText("b", b), Offset: below},
			{From: [2]float64{b + t/2, shellZ}, To: [2]float64{b - t/2, shellZ}, Label: mmText("t", t), Offset: -10},
			{From: [2]float64{-dh / 2, -tf / 2}, To: [2]float64{dh / 2, -tf / 2}, Label: mmText("d_h", dh), Offset: 0},
			{From: [2]float64{-dw / 2, headTop}, To: [2]float64{dw / 2, headTop}, Label: mmText("d_w", dw), Offset: 12},
		},
	}, nil
}

// regionBox is the box around a mesh region's nodes; nil if the mesh has
// no such region.
func regionBox(m *mesh.Mesh, name string) *report.Box {
	r, ok := m.RegionIndex(name)
	if !ok {
		return nil
	}
	b := report.Box{XMin: math.Inf(1), XMax: math.Inf(-1), ZMin: math.Inf(1), ZMax: math.Inf(-1)}
	for _, e := range m.Elements {
		if e.Region != r {
			continue
		}
		for _, n := range e.Nodes {
			p := m.Nodes[n]
			b.XMin, b.XMax = math.Min(b.XMin, p.X), math.Max(b.XMax, p.X)
			b.ZMin, b.ZMax = math.Min(b.ZMin, p.Z), math.Max(b.ZMax, p.Z)
		}
	}
	if math.IsInf(b.XMin, 0) {
		return nil
	}
	return &b
}

// historyRows reads a run's history.csv back into rows (forces in N,
// moments in N·mm), as far as the note needs them.
func historyRows(path string, zones []zoneRange) ([]figures.Row, error) {
	cols, err := ReadHistoryColumns(path)
	if err != nil {
		return nil, err
	}
	n := len(cols["Z_kN"])
	need := []string{"increment", "stage", "Z_kN", "u_mm", "bolt_force_kN", "bolt_moment_interface_kNm", "bolt_moment_head_kNm", "gap_edge_mm", "iterations"}
	for _, z := range zones {
		need = append(need, "contact_force_"+z.name+"_kN")
	}
	for _, c := range need {
		if len(cols[c]) != n {
			return nil, fmt.Errorf("%s: column %s missing or incomplete", path, c)
		}
	}
	rows := make([]figures.Row, n)
	for i := range rows {
		r := &rows[i]
		r.Increment, r.Stage = int(cols["increment"][i]), "tension"
		if cols["stage"][i] == 0 {
			r.Stage = "preload"
		}
		r.Z, r.U, r.Fs = cols["Z_kN"][i]*1e3, cols["u_mm"][i], cols["bolt_force_kN"][i]*1e3
		r.MomentInterface, r.MomentHead = cols["bolt_moment_interface_kNm"][i]*1e6, cols["bolt_moment_head_kNm"][i]*1e6
		r.GapEdge, r.Iterations = cols["gap_edge_mm"][i], int(cols["iterations"][i])
		for _, z := range zones {
			r.ZoneForce = append(r.ZoneForce, cols["contact_force_"+z.name+"_kN"][i]*1e3)
		}
	}
	return rows, nil
}

// comparedFigure is one row of the comparison note: a joint figure and
// whether a run reached it. comparedFigures matches comparedQuantities
// (the printed table and comparison.csv) row for row; a test checks it.
type comparedFigure struct {
	name, column, unit string
	get                func(s summary) (float64, bool)
}

func comparedFigures() []comparedFigure {
	val := func(f func(j figures.Joint) float64) func(s summary) (float64, bool) {
		return func(s summary) (float64, bool) { return f(s.Joint), true }
	}
	opt := func(f func(j figures.Joint) *float64) func(s summary) (float64, bool) {
		return func(s summary) (float64, bool) {
			if p := f(s.Joint); p != nil {
				return *p, true
			}
			return 0, false
		}
	}
	one := report.Dimensionless
	return []comparedFigure{
		{"stiffness, tangent at Z = 0", "stiffness_tangent_at_zero_kN_per_mm", "kN/mm", val(func(j figures.Joint) float64 { return j.StiffnessTangentZero })},
		{"stiffness, secant to the reference load", "stiffness_secant_to_reference_kN_per_mm", "kN/mm", opt(func(j figures.Joint) *float64 { return j.StiffnessToReference })},
		{"joint alone, secant to the reference load", "joint_stiffness_secant_to_reference_kN_per_mm", "kN/mm", opt(func(j figures.Joint) *float64 { return j.JointStiffnessReference })},
		{"load factor at Z = 0", "load_factor_tangent_at_zero", one, val(func(j figures.Joint) float64 { return j.LoadFactorTangentZero })},
		{"load factor, secant to the reference load", "load_factor_secant_to_reference", one, opt(func(j figures.Joint) *float64 { return j.LoadFactorToReference })},
		{"opening load", "opening_load_kN", "kN", opt(func(j figures.Joint) *float64 { return j.OpeningLoadKN })},
		{"decompression load", "decompression_load_kN", "kN", opt(func(j figures.Joint) *float64 { return j.DecompressionKN })},
		{"largest segment force", "peak_load_kN", "kN", val(func(j figures.Joint) float64 { return j.PeakLoadKN })},
		{"displacement at the end", "displacement_at_end_mm", "mm", val(func(j figures.Joint) float64 { return j.DisplacementEndMM })},
	}
}

// comparisonTable has a row per joint figure and, per run, its value and
// (from run 2 on) its ratio to run 1.
func comparisonTable(names []string, sums []summary) report.Table {
	t := report.Table{Caption: "Joint figures of the runs, with the ratio of each to run 1", Columns: []report.Column{{Heading: "figure"}},
		Source: "FE runs of this note (summary.json of each run)"}
	for i, n := range names {
		t.Columns = append(t.Columns, report.Column{Heading: fmt.Sprintf("run %d, %s", i+1, n)})
		if i > 0 {
			t.Columns = append(t.Columns, report.Column{Heading: fmt.Sprintf("run %d / run 1", i+1), Unit: report.Dimensionless})
		}
	}
	for _, f := range comparedFigures() {
		row := []report.Cell{report.Text(f.name)}
		base, baseOK := f.get(sums[0])
		for i, s := range sums {
			v, ok := f.get(s)
			if ok {
				row = append(row, report.Num(v, f.unit))
			} else {
				row = append(row, report.Missing(f.unit))
			}
			if i > 0 {
				if ok && baseOK && base != 0 {
					row = append(row, report.Num(v/base, ""))
				} else {
					row = append(row, report.Missing(""))
				}
			}
		}
		t.Rows = append(t.Rows, row)
	}
	mech := []report.Cell{report.Text("failure mechanism")}
	for i, s := range sums {
		mech = append(mech, report.Text(s.Joint.FailureLocation))
		if i > 0 {
			same := "differs"
			if s.Joint.FailureLocation == sums[0].Joint.FailureLocation {
				same = "same"
			}
			mech = append(mech, report.Text(same))
		}
	}
	t.Rows = append(t.Rows, mech)
	ref := []report.Cell{report.Text("reference load of the secants")}
	for i, s := range sums {
		ref = append(ref, report.Num(s.Joint.ReferenceLoadKN, "kN"))
		if i > 0 {
			ref = append(ref, report.Missing(""))
		}
	}
	t.Rows = append(t.Rows, ref)
	return t
}

// compareOverlays overlay the runs' curves, one series per run.
func compareOverlays(names []string, notes []runNote) []post.Plot {
	plots := []post.Plot{
		{Title: "Bolt force against segment force, all runs", XLabel: "Z [kN]", YLabel: "F_s [kN]"},
		{Title: "Segment force against displacement, all runs", XLabel: "u [mm]", YLabel: "Z [kN]"},
		{Title: "Bolt bending moment at the contact plane, all runs", XLabel: "Z [kN]", YLabel: "M_s [kN·m]"},
		{Title: "Opening at the shell-side corner, all runs", XLabel: "Z [kN]", YLabel: "gap [mm]"},
	}
	for i, n := range notes {
		if len(n.rows) == 0 {
			continue
		}
		z := column(n.rows, func(r figures.Row) float64 { return r.Z / 1e3 })
		ys := [][]float64{
			column(n.rows, func(r figures.Row) float64 { return r.Fs / 1e3 }),
			z,
			column(n.rows, func(r figures.Row) float64 { return r.MomentInterface / 1e6 }),
			column(n.rows, func(r figures.Row) float64 { return r.GapEdge }),
		}
		u := column(n.rows, func(r figures.Row) float64 { return r.U })
		for k := range plots {
			x := z
			if k == 1 {
				x = u
			}
			plots[k].Series = append(plots[k].Series, post.Series{Name: fmt.Sprintf("run %d, %s", i+1, names[i]), X: x, Y: ys[k]})
		}
	}
	if len(plots[0].Series) == 0 {
		return nil
	}
	return plots
}
