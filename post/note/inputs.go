package note

import (
	"fmt"
	"os"
	"reflect"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/report"
)

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
		"contact.gap_spring":          {"k_g", "ring's resistance to closing the parallel gap (spring between the flanges)", "kN/mm", 1e-3},
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
		"output.field_states":         {"", "states written as field files", "", 0},
	}
}

// inputCaptions name the model file's tables.
func inputCaptions() map[string]string {
	return map[string]string{
		"tower": "Tower", "shell": "Shell", "flange": "Flange", "bolt": "Bolt, washers and nut",
		"contact": "Contact faces", "preload": "Preload", "load": "Load (tension stage)",
		"mesh": "Mesh", "analysis": "Analysis", "fatigue": "Bolt fatigue", "output": "Output",
	}
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
func modelKeys(path string, text []byte, s *modelfile.Spec) keySources {
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
	s := n.seg.Spec()
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
		q := report.Quantities{Caption: inputCaptions()[sec] + " — [" + sec + "]"}
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
			return report.Text(modelfile.FormatNumber(v.Float())), true
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
	if zones, ok := v.Interface().([]modelfile.ZoneSpec); ok && path == "contact.zones" {
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
func signed(x float64) string { return strings.Replace(modelfile.FormatNumber(x), "-", "−", 1) }

func materialInputs(name string, m modelfile.MaterialSpec) report.Quantities {
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
		return "(" + modelfile.FormatNumber(c[0]) + ", " + modelfile.FormatNumber(c[1]) + " MPa)"
	}
	text := fmt.Sprintf("%d points (strain, stress) from %s to %s, %s", len(m.Curve), pt(m.Curve[0]), pt(m.Curve[len(m.Curve)-1]), m.CurveKind)
	q.Rows = append(q.Rows, report.Quantity{Name: "stress–strain curve (" + p + ".curve, .curve_kind)", Value: report.Text(text), Source: srcFile})
	return q
}
