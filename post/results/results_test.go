package results

import (
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
)

// coarseRun runs the flat demo model on a coarse mesh in four increments.
func coarseRun(t *testing.T) *segment.Result {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "cmd", "flangeseg", "demo", "flat.toml"))
	if err != nil {
		t.Fatal(err)
	}
	spec, err := modelfile.Decode(data)
	if err != nil {
		t.Fatal(err)
	}
	spec.Mesh.Size, spec.Load.Increments = 16, 4
	res, err := segment.Run(context.Background(), spec, segment.Options{})
	if err != nil || res.Failure != nil {
		t.Fatal(err, res.Failure)
	}
	return res
}

// A run directory holds every file, and reads back to the run: the summary
// as written, the history rows to the digits history.csv keeps.
func TestWriteAndReadBack(t *testing.T) {
	res := coarseRun(t)
	dir := t.TempDir()
	sum, err := Write(dir, "flat.toml", res)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"model.resolved.toml", "history.csv", "summary.json", "Z_u.svg", "Fs_Z.png",
		"contact_pressure.svg", "fields.pvd", filepath.Join("fields", "state_000.vtu")} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("%s: %v", f, err)
		}
	}
	back, err := ReadSummary(filepath.Join(dir, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var want Summary
	data, _ := json.Marshal(sum)
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(back, want) {
		t.Error("summary.json does not read back to the summary written")
	}
	rows, err := ReadHistory(filepath.Join(dir, "history.csv"), res.Segment.Zones())
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(res.History) {
		t.Fatalf("%d rows read, %d run", len(rows), len(res.History))
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }
	for i, r := range rows {
		h := res.History[i]
		if r.Increment != h.Increment || r.Stage != h.Stage || !near(r.Z, h.Z) || !near(r.U, h.U) || !near(r.Fs, h.Fs) ||
			!near(r.GapEdge, h.GapEdge) || len(r.ZoneForce) != len(h.ZoneForce) {
			t.Errorf("row %d: read %+v, ran %+v", i, r, h)
		}
	}
}
