package segment

import (
	"errors"
	"fmt"
	"testing"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/mesh"
)

// The mesh's broken rules come back in the model file's form, a field
// without a key of its own in the mesh's words; other errors unchanged.
func TestInputError(t *testing.T) {
	err := inputError(fmt.Errorf("mesh: flange segment: %w", mesh.FieldErrors{
		{Field: "NeckRadius", Value: 1, Rule: "must be at least ElementSize·Refine = 2.4 mm"},
		{Field: "SegmentWidth", Value: 80, Rule: "must exceed the washer outer diameter 92 mm"},
	}))
	var me *modelfile.Error
	if !errors.As(err, &me) || len(me.Errs) != 2 {
		t.Fatalf("%T %v", err, err)
	}
	want := []string{
		"flange.neck_radius = 1: must be at least mesh.size·mesh.refine = 2.4 mm",
		"mesh: segment width 80 mm: must exceed the washer outer diameter 92 mm",
	}
	for i, w := range want {
		if got := me.Errs[i].Error(); got != w {
			t.Errorf("line %d: %q, want %q", i, got, w)
		}
	}
	other := errors.New("no memory")
	if inputError(other) != other {
		t.Error("another error changed")
	}
}
