package segment

import (
	"errors"
	"strings"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/mesh"
)

// inputError turns the mesh's broken rules (mesh.FieldErrors) into the
// model file's form, "key = value: rule", in a *modelfile.Error, so that
// a model that the model file's rules let through and the mesh refuses
// is reported like an invalid model file. Other errors pass unchanged.
func inputError(err error) error {
	var fe mesh.FieldErrors
	if !errors.As(err, &fe) {
		return err
	}
	out := &modelfile.Error{}
	for _, e := range fe {
		key, ok := modelKey(e.Field)
		if !ok {
			out.Errs = append(out.Errs, errors.New("mesh: "+e.Error()))
			continue
		}
		out.Errs = append(out.Errs, errors.New(key+" = "+modelfile.FormatNumber(e.Value)+": "+plainRule(e.Rule)))
	}
	return out
}

// modelKey is the model-file key whose value a mesh.FlangeSegment field
// carries as it is; the fields derived from several keys have none.
func modelKey(field string) (string, bool) {
	switch field {
	case "ShellThickness":
		return "shell.thickness", true
	case "ShellLength":
		return "shell.length", true
	case "FlangeThickness":
		return "flange.thickness", true
	case "A":
		return "flange.a", true
	case "B":
		return "flange.b", true
	case "NeckRadius":
		return "flange.neck_radius", true
	case "HoleDiameter":
		return "bolt.hole", true
	case "WasherOuter":
		return "bolt.washer_outer", true
	case "WasherThickness":
		return "bolt.washer_thickness", true
	case "HeadHeight":
		return "bolt.head_height", true
	case "NutHeight":
		return "bolt.nut_height", true
	case "ThreadInClamp":
		return "bolt.thread_length", true
	case "ElementSize":
		return "mesh.size", true
	case "Refine":
		return "mesh.refine", true
	}
	return "", false
}

// plainRule writes the mesh's field names in a rule as model-file keys.
func plainRule(rule string) string {
	return strings.NewReplacer("ElementSize·Refine", "mesh.size·mesh.refine", "refinement factor", "mesh.refine").Replace(rule)
}
