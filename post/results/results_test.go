package results

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
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

// output.field_states chooses the states that get a field file: the key
// states by default, all, or every N-th with the preload and the last.
func TestFieldStates(t *testing.T) {
	res := coarseRun(t)
	increments := func() []int {
		var out []int
		for _, st := range res.FieldStates() {
			out = append(out, st.Row.Increment)
		}
		return out
	}
	var key, all, every3 []int
	for _, i := range figures.KeyRows(res.History) {
		key = append(key, res.History[i].Increment)
	}
	last := res.History[len(res.History)-1].Increment
	for _, st := range res.States {
		all = append(all, st.Row.Increment)
		if n := st.Row.Increment; n%3 == 0 || n == last {
			every3 = append(every3, n)
		}
	}
	if len(all) < 5 || len(all) != len(res.History) {
		t.Fatalf("%d states of %d rows: the test needs every row of at least 4 increments kept", len(all), len(res.History))
	}
	for _, c := range []struct {
		value string
		want  []int
	}{{"key", key}, {"all", all}, {"every 3", every3}, {"every 1", all}, {"every 99", []int{0, last}}} {
		res.Segment.Spec().Output.FieldStates = c.value
		if got := increments(); !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s: increments %v, want %v", c.value, got, c.want)
		}
	}
	if len(key) < 2 || key[0] != 0 || key[len(key)-1] != last {
		t.Errorf("key states %v: want the preload (0) first and the last increment (%d) last", key, last)
	}
	// The files and the series follow the choice.
	res.Segment.Spec().Output.FieldStates = "every 3"
	dir := t.TempDir()
	if _, err := Write(dir, "flat.toml", res); err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(dir, "fields", "*.vtu"))
	for i, f := range files {
		files[i] = filepath.Base(f)
	}
	var want []string
	for _, n := range every3 {
		want = append(want, fmt.Sprintf("state_%03d.vtu", n))
	}
	if !reflect.DeepEqual(files, want) {
		t.Errorf("field files %v, want %v", files, want)
	}
	pvd, err := os.ReadFile(filepath.Join(dir, "fields.pvd"))
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if !strings.Contains(string(pvd), `file="fields/`+f+`"`) {
			t.Errorf("fields.pvd does not list %s", f)
		}
	}
}
