package note

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/mesh"
	"flangeseg/post"
	"flangeseg/post/results"
)

// reportRun is a coarse demo run written as far as a comparison reads
// it: history.csv and summary.json in its run directory.
type reportRun struct {
	res *segment.Result
	sum results.Summary
	job ModelJob
}

func newReportRun(t *testing.T, i int) reportRun {
	t.Helper()
	res := coarseRun(t, i)
	name := demoModels()[i].Name
	dir := filepath.Join(t.TempDir(), name)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	path := name + ".toml"
	sum := results.NewSummary(path, res)
	tab, err := results.HistoryTable(res)
	if err != nil {
		t.Fatal(err)
	}
	if err := post.WriteCSV(filepath.Join(dir, "history.csv"), tab); err != nil {
		t.Fatal(err)
	}
	if err := post.WriteJSON(filepath.Join(dir, "summary.json"), sum); err != nil {
		t.Fatal(err)
	}
	return reportRun{res: res, sum: sum, job: ModelJob{Spec: res.Segment.Spec(), Path: path, Dir: dir, Text: demoModels()[i].Data}}
}

func readFile(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// checkPage checks what every note holds: its sections, the design-aid
// caution (top and last section), and nothing fetched from elsewhere.
func checkPage(t *testing.T, page string, sections []string) {
	t.Helper()
	for _, s := range sections {
		if !strings.Contains(page, s) {
			t.Errorf("no section %q", s)
		}
	}
	if n := strings.Count(page, "flangeseg is a design aid."); n < 2 {
		t.Errorf("design-aid caution shown %d times, want at the top and in the last section", n)
	}
	for _, bad := range []string{"http://", "https://", "<script", "src=", "url(", "@import", "<link"} {
		if strings.Contains(page, bad) {
			t.Errorf("page holds %q: it must be self-contained", bad)
		}
	}
}

var runSections = []string{"Joint section and dimensions", "Inputs", "Preload", "Key results", "Load–response curves",
	"Hand methods and finite-element results", "Contact pressure along the interface", "Stress and strain fields",
	"Convergence", "Notes", "Limits of use"}

// The note of a run and of a comparison of the demo's two contact
// variants: written, with every section, self-contained and the same
// bytes when written again.
func TestReportRunAndCompare(t *testing.T) {
	runs := []reportRun{newReportRun(t, 0), newReportRun(t, 1)}
	var jobs []ModelJob
	var sums []results.Summary
	for _, r := range runs {
		if err := WriteRun(r.job.Dir, r.job.Path, r.job.Text, r.res, r.sum); err != nil {
			t.Fatal(err)
		}
		first := readFile(t, filepath.Join(r.job.Dir, "report.html"))
		if err := WriteRun(r.job.Dir, r.job.Path, r.job.Text, r.res, r.sum); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(first, readFile(t, filepath.Join(r.job.Dir, "report.html"))) {
			t.Errorf("%s: report.html differs between two writes", r.job.Path)
		}
		page := string(first)
		checkPage(t, page, runSections)
		for _, want := range []string{
			r.res.Segment.Spec().Title,
			"flangeseg " + post.Version,
			"flange thickness (flange.thickness)", // every key with its path
			"EN 1993-1-8, 3.9",                    // F_p,C with its source
			"ISO 898-1",                           // A_s with its source
			"trilinear (Schmidt/Neuper)",          // hand bolt-force model overlaid
			"Contact pressure along the flange face",
			"von Mises stress at the last converged state",
			"not assessed: linear elastic materials", // the demo is elastic: no FE ultimate load
		} {
			if !strings.Contains(page, want) {
				t.Errorf("%s: report.html lacks %q", r.job.Path, want)
			}
		}
		if strings.Contains(page, "Equivalent plastic strain") {
			t.Errorf("%s: plastic strain pictured for an elastic run", r.job.Path)
		}
		jobs, sums = append(jobs, r.job), append(sums, r.sum)
	}

	dir := filepath.Join(t.TempDir(), "cmp")
	names := []string{"flat", "bands"}
	if err := WriteCompare(dir, names, jobs, sums); err != nil {
		t.Fatal(err)
	}
	first := readFile(t, filepath.Join(dir, "report.html"))
	if err := WriteCompare(dir, names, jobs, sums); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(first, readFile(t, filepath.Join(dir, "report.html"))) {
		t.Error("compare report.html differs between two writes")
	}
	page := string(first)
	checkPage(t, page, append([]string{"Models compared", "Comparison", "Overlaid curves", "Run 1 — ", "Run 2 — "}, runSections...))
	for _, want := range []string{"run 2 / run 1", "Bolt force against segment force, all runs", "run 2, bands", runs[1].res.Segment.Spec().Title} {
		if !strings.Contains(page, want) {
			t.Errorf("compare report.html lacks %q", want)
		}
	}
}

// A comparison needs one name, model and summary per run.
func TestReportCompareMismatch(t *testing.T) {
	if err := WriteCompare(t.TempDir(), []string{"a"}, nil, nil); err == nil {
		t.Error("no error for one name and no models")
	}
}

// Every key of the model file's tables has a row description, with a
// unit for every number, and no description names a key that is gone.
func TestReportInputKeysCoverSpec(t *testing.T) {
	keys := inputKeys()
	seen := map[string]bool{}
	v := reflect.TypeOf(modelfile.Spec{})
	for i := range v.NumField() {
		f := v.Field(i)
		if f.Type.Kind() != reflect.Struct {
			continue
		}
		sec, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if _, ok := inputCaptions()[sec]; !ok {
			t.Errorf("table [%s] has no caption", sec)
		}
		names := modelfile.TableKeys(f.Type)
		for j, key := range names {
			path := sec + "." + key
			seen[path] = true
			k, ok := keys[path]
			if !ok {
				t.Errorf("key %s has no inputKeys entry", path)
				continue
			}
			kind := f.Type.Field(j).Type.Kind()
			if kind == reflect.Pointer {
				kind = f.Type.Field(j).Type.Elem().Kind()
			}
			if (kind == reflect.Float64 || kind == reflect.Int) && k.unit == "" {
				t.Errorf("key %s is a number without a unit", path)
			}
		}
	}
	for path := range keys {
		if !seen[path] {
			t.Errorf("inputKeys describes %s, which Spec does not have", path)
		}
	}
}

// Sources of the inputs: the demo model as embedded gives flange.a and
// leaves load.stop_drop to its default; an edited Spec is not claimed for
// either.
func TestReportKeySources(t *testing.T) {
	m := demoModels()[1]
	s, err := modelfile.Decode(m.Data)
	if err != nil {
		t.Fatal(err)
	}
	src := modelKeys(filepath.Join(t.TempDir(), m.Name+".toml"), m.Data, s)
	if got := src.source("flange.a"); got != srcFile {
		t.Errorf("flange.a: source %q, want %q", got, srcFile)
	}
	if got := src.source("load.stop_drop"); !strings.HasPrefix(got, "default") {
		t.Errorf("load.stop_drop: source %q, want the default", got)
	}
	s.Flange.A++
	if got := modelKeys(m.Name+".toml", m.Data, s).source("flange.a"); got != "model file or default" {
		t.Errorf("edited Spec: source %q", got)
	}
}

// Plastic strain to the nodes: each element's mean over its points,
// averaged over the elements at a node; elastic elements count as zero.
func TestReportNodalPlastic(t *testing.T) {
	m := &mesh.Mesh{Kind: mesh.Quad4,
		Nodes:    []mesh.Point{{X: 0, Z: 0}, {X: 1, Z: 0}, {X: 2, Z: 0}, {X: 0, Z: 1}, {X: 1, Z: 1}, {X: 2, Z: 1}},
		Elements: []mesh.Element{{Nodes: []int{0, 1, 4, 3}}, {Nodes: []int{1, 2, 5, 4}}}}
	got := nodalPlastic(m, [][]float64{{0.01, 0.03, 0.01, 0.03}, nil})
	want := []float64{0.02, 0.01, 0, 0.02, 0.01, 0}
	for i := range want {
		if d := got[i] - want[i]; d > 1e-15 || d < -1e-15 {
			t.Errorf("node %d: %g, want %g", i, got[i], want[i])
		}
	}
	if nodalPlastic(m, [][]float64{nil, nil}) != nil {
		t.Error("elastic elements only: want no picture")
	}
}

// A run that stopped in the preload stage still gets its note; the
// sections without data say so.
func TestReportPreloadFailed(t *testing.T) {
	spec, err := modelfile.Decode(demoModels()[0].Data)
	if err != nil {
		t.Fatal(err)
	}
	spec.Mesh.Size, spec.Mesh.Refine = 16, 0.5
	g, err := segment.Build(spec)
	if err != nil {
		t.Fatal(err)
	}
	res := &segment.Result{Segment: g, Failure: errors.New("preload: not converged"), Ending: "the preload stage did not converge"}
	dir := t.TempDir()
	if err := WriteRun(dir, "flat.toml", demoModels()[0].Data, res, results.NewSummary("flat.toml", res)); err != nil {
		t.Fatal(err)
	}
	page := string(readFile(t, filepath.Join(dir, "report.html")))
	checkPage(t, page, runSections)
	for _, want := range []string{"No preload data", "No curves", "No field pictures", "preload: not converged"} {
		if !strings.Contains(page, want) {
			t.Errorf("report.html lacks %q", want)
		}
	}
}

// coarseRun runs demo model i on a coarse mesh, in six increments to
// 0.6 mm.
func coarseRun(t *testing.T, i int) *segment.Result {
	t.Helper()
	spec, err := modelfile.Decode(demoModels()[i].Data)
	if err != nil {
		t.Fatal(err)
	}
	spec.Mesh.Size, spec.Mesh.Refine = 16, 0.5
	spec.Load.Increments, spec.Load.MaxDisplacement = 6, 0.6
	if err := spec.Validate(); err != nil {
		t.Fatal(err)
	}
	res, err := segment.Run(context.Background(), spec, segment.Options{})
	if err != nil || res.Failure != nil {
		t.Fatal(err, res.Failure)
	}
	return res
}

// demoModel is a demo model as the binary embeds it; the tests read the
// files from cmd/flangeseg/demo, so there is one copy.
type demoModel struct {
	Name string // "flat", "bands"
	Data []byte
}

func demoModels() []demoModel {
	var out []demoModel
	for _, name := range []string{"flat", "bands"} {
		data, err := os.ReadFile(filepath.Join("..", "..", "cmd", "flangeseg", "demo", name+".toml"))
		if err != nil {
			panic(err) // a test needs them; the checkout lacks them
		}
		out = append(out, demoModel{Name: name, Data: data})
	}
	return out
}

// The note's comparison rows are those of the printed table and
// comparison.csv (results.ComparedFigures), in the same order, then the
// mechanism and the reference load.
func TestReportComparedFiguresMatch(t *testing.T) {
	figs := results.ComparedFigures()
	tab := comparisonTable([]string{"a", "b"}, []results.Summary{{}, {}})
	if len(tab.Rows) != len(figs)+2 {
		t.Fatalf("%d rows in the note, %d figures in the table", len(tab.Rows), len(figs))
	}
	for i, f := range figs {
		if got := tab.Rows[i][0]; !got.IsText || got.Text != f.Name {
			t.Errorf("row %d: note %q, table %s", i, got.Text, f.Column)
		}
	}
}
