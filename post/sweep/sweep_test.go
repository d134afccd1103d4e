package sweep

import (
	"bytes"
	"context"
	"encoding/csv"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"flangeseg/post/results"
	"flangeseg/post/sweep/plan"
)

// loadPlan writes a plan over a model of the repository (a path from the
// repository's root) and loads it.
func loadPlan(t *testing.T, base, body string) (*plan.Plan, []plan.Case) {
	t.Helper()
	abs, err := filepath.Abs(filepath.Join("..", "..", base))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "plan.toml")
	if err := os.WriteFile(path, []byte("base = "+strconv.Quote(abs)+"\n"+body), 0o644); err != nil {
		t.Fatal(err)
	}
	p, cases, err := plan.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	return p, cases
}

// coarseFlat is three cheap elastic cases of the flat demo joint.
const coarseFlat = `
set = { mesh = { size = 16, refine = 0.5 }, load = { increments = 3, max_displacement = 0.3 } }
[[vary]]
key = "flange.thickness"
values = [80, 95]
[[case]]
name = "low-friction"
set = { "contact.friction" = 0.1 }
`

// withoutTime drops the last column, time_s, of a CSV file.
func withoutTime(t *testing.T, path string) string {
	t.Helper()
	rows := readCSV(t, path)
	var b strings.Builder
	for _, r := range rows {
		if r[len(r)-1] != "" && r[len(r)-1] != TimeColumn {
			if _, err := strconv.ParseFloat(r[len(r)-1], 64); err != nil {
				t.Errorf("%s: time_s %q is not a number", path, r[len(r)-1])
			}
		}
		b.WriteString(strings.Join(r[:len(r)-1], "|") + "\n")
	}
	return b.String()
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

func runAll(t *testing.T, cases []plan.Case, opt Options) []Record {
	t.Helper()
	recs, err := Run(context.Background(), cases, opt)
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

func collect(t *testing.T, p *plan.Plan, cases []plan.Case, dir string) []Record {
	t.Helper()
	recs, err := Collect(dir, cases)
	if err != nil {
		t.Fatal(err)
	}
	if err := WriteTables(dir, p, recs); err != nil {
		t.Fatal(err)
	}
	return recs
}

// A sweep run whole, run again (nothing to do), and run as two shards of
// which one is interrupted and resumed, gives the same tables.
func TestSweepLifecycle(t *testing.T) {
	p, cases := loadPlan(t, "cmd/flangeseg/demo/flat.toml", coarseFlat)
	whole := t.TempDir()
	recs := runAll(t, cases, Options{Dir: whole, Jobs: 2})
	for _, r := range recs {
		if r.Status != Finished || r.Summary == nil {
			t.Fatalf("case %s: %s (%s)", r.Name, r.Status, r.Reason)
		}
		for _, f := range []string{"model.toml", "model.resolved.toml", "history.csv", "summary.json", "report.html", RecordFile} {
			if _, err := os.Stat(filepath.Join(whole, "cases", r.Name, f)); err != nil {
				t.Errorf("case %s: %v", r.Name, err)
			}
		}
	}
	// Without AllFields a case keeps the fields of the preload and the
	// last increment only.
	vtu, err := filepath.Glob(filepath.Join(whole, "cases", cases[0].Name, "fields", "*.vtu"))
	if err != nil || len(vtu) != 2 {
		t.Errorf("case %s keeps %d field states (%v), want 2", cases[0].Name, len(vtu), err)
	}
	collect(t, p, cases, whole)
	checkTable(t, whole, p, cases)

	t.Run("done cases are not run again", func(t *testing.T) {
		var ran []string
		runAll(t, cases, Options{Dir: whole, CaseDone: func(r Record, did bool) {
			if did {
				ran = append(ran, r.Name)
			}
		}})
		if len(ran) > 0 {
			t.Errorf("ran %v again", ran)
		}
	})

	t.Run("a case of another model runs again", func(t *testing.T) {
		rec := filepath.Join(whole, "cases", cases[1].Name, RecordFile)
		data, err := os.ReadFile(rec)
		if err != nil {
			t.Fatal(err)
		}
		h := recs[1].ModelSHA256
		if err := os.WriteFile(rec, bytes.Replace(data, []byte(h), []byte(strings.Repeat("0", len(h))), 1), 0o644); err != nil {
			t.Fatal(err)
		}
		c, _ := Collect(whole, cases)
		if c[1].Status != Missing || !strings.Contains(c[1].Reason, "another model") {
			t.Errorf("a record of another model: %s (%s), want missing", c[1].Status, c[1].Reason)
		}
		var ran []string
		runAll(t, cases, Options{Dir: whole, CaseDone: func(r Record, did bool) {
			if did {
				ran = append(ran, r.Name)
			}
		}})
		if !slices.Equal(ran, []string{cases[1].Name}) {
			t.Errorf("ran %v, want only %s", ran, cases[1].Name)
		}
	})

	t.Run("shards, one interrupted and resumed", func(t *testing.T) {
		dir := t.TempDir()
		ctx, cancel := context.WithCancel(context.Background())
		first := Shard{1, 2}
		recs, err := Run(ctx, cases, Options{Dir: dir, Jobs: 1, Shard: first, CaseDone: func(Record, bool) { cancel() }})
		if err == nil {
			t.Fatal("an interrupted shard returned no error")
		}
		if n := Count(recs); n.Finished != 1 || n.Missing != len(recs)-1 {
			t.Fatalf("interrupted shard: %s, want 1 finished and the rest missing", n)
		}
		mid, err := Collect(dir, cases)
		if err != nil {
			t.Fatal(err)
		}
		if n := Count(mid); n.Missing != len(cases)-1 {
			t.Errorf("collected halfway: %s, want %d missing", n, len(cases)-1)
		}
		runAll(t, cases, Options{Dir: dir, Shard: first})
		runAll(t, cases, Options{Dir: dir, Shard: Shard{2, 2}})
		collect(t, p, cases, dir)
		if a, b := withoutTime(t, filepath.Join(whole, "sweep.csv")), withoutTime(t, filepath.Join(dir, "sweep.csv")); a != b {
			t.Errorf("sweep.csv of the shards differs from the whole run's:\n%s\n%s", a, b)
		}
		for _, f := range []string{"report.html", filepath.Join("plots", "cases_Fs_Z.svg")} {
			a, _ := os.ReadFile(filepath.Join(whole, f))
			b, _ := os.ReadFile(filepath.Join(dir, f))
			if len(a) == 0 || !bytes.Equal(a, b) {
				t.Errorf("%s of the shards differs from the whole run's", f)
			}
		}
	})
}

// checkTable checks sweep.csv against the plan and each case's
// summary.json.
func checkTable(t *testing.T, dir string, p *plan.Plan, cases []plan.Case) {
	t.Helper()
	rows := readCSV(t, filepath.Join(dir, "sweep.csv"))
	if len(rows) != len(cases)+1 {
		t.Fatalf("sweep.csv has %d rows, want a header and %d", len(rows), len(cases))
	}
	head := rows[0]
	col := func(name string) int {
		i := slices.Index(head, name)
		if i < 0 {
			t.Fatalf("sweep.csv has no column %q: %v", name, head)
		}
		return i
	}
	if head[len(head)-1] != TimeColumn {
		t.Errorf("last column %q, want %s", head[len(head)-1], TimeColumn)
	}
	for _, k := range Keys(p) {
		col(k)
	}
	for i, c := range cases {
		row := rows[i+1]
		s, err := results.ReadSummary(filepath.Join(dir, "cases", c.Name, "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		if row[col("name")] != c.Name || row[col("status")] != Finished || row[col("exit_status")] != "0" {
			t.Errorf("row %d: name %q status %q exit %q", i+1, row[col("name")], row[col("status")], row[col("exit_status")])
		}
		for _, set := range c.Set {
			if got := row[col(set.Key)]; got != plan.Text(set.Value) {
				t.Errorf("row %d: %s = %q, want %q", i+1, set.Key, got, plan.Text(set.Value))
			}
		}
		for _, f := range results.ComparedFigures() {
			got, err := strconv.ParseFloat(row[col(f.Column)], 64)
			if want, ok := f.Get(s); ok && (err != nil || !near(got, want)) {
				t.Errorf("row %d: %s = %q, the case's summary says %v", i+1, f.Column, row[col(f.Column)], want)
			}
		}
		if row[col("failure_location")] != s.Joint.FailureLocation || row[col("ending")] != s.Ending {
			t.Errorf("row %d: mechanism %q ending %q, want %q %q", i+1, row[col("failure_location")], row[col("ending")], s.Joint.FailureLocation, s.Ending)
		}
	}
}

func near(a, b float64) bool {
	d := a - b
	return d*d <= 1e-18*(a*a+b*b) || d == 0
}

// A case that stops is a row with its reason; the others run; the page
// lists it.
func TestSweepStoppedCaseIsARow(t *testing.T) {
	p, cases := loadPlan(t, "testdata/endings/gap_not_closed.toml", `
set = { mesh = { size = 16 }, load = { increments = 2 } }
[[vary]]
key = "preload.nut_turn"
values = [4, 5]
`)
	dir := t.TempDir()
	recs := runAll(t, cases, Options{Dir: dir})
	for _, r := range recs {
		if r.Status != Stopped || r.ExitStatus != 3 || !strings.Contains(r.Reason, "gap") {
			t.Errorf("case %s: %s, exit %d, reason %q; want stopped, 3 and the reason", r.Name, r.Status, r.ExitStatus, r.Reason)
		}
	}
	if Count(recs).AllFinished() {
		t.Error("the tally says every case finished")
	}
	collect(t, p, cases, dir)
	rows := readCSV(t, filepath.Join(dir, "sweep.csv"))
	reason := slices.Index(rows[0], "reason")
	for i, r := range recs {
		if rows[i+1][reason] != r.Reason {
			t.Errorf("row %d: reason %q, want %q", i+1, rows[i+1][reason], r.Reason)
		}
	}
	page, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(page), "Cases that did not finish") || !strings.Contains(string(page), recs[0].Name) {
		t.Error("the sweep page does not list the stopped cases")
	}
}

// Collecting an empty folder lists every case as missing and still
// writes the tables.
func TestSweepCollectMissing(t *testing.T) {
	p, cases := loadPlan(t, "cmd/flangeseg/demo/flat.toml", coarseFlat)
	dir := t.TempDir()
	recs := collect(t, p, cases, dir)
	if n := Count(recs); n.Missing != len(cases) {
		t.Errorf("%s, want every case missing", n)
	}
	rows := readCSV(t, filepath.Join(dir, "sweep.csv"))
	status := slices.Index(rows[0], "status")
	for _, r := range rows[1:] {
		if r[status] != Missing {
			t.Errorf("row %v: status %q, want missing", r[:2], r[status])
		}
	}
	data, err := os.ReadFile(filepath.Join(dir, "sweep.json"))
	if err != nil || !strings.Contains(string(data), `"missing": [`) {
		t.Errorf("sweep.json does not list the missing cases (%v)", err)
	}
}
