package note

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/figures"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
	"flangeseg/post/report"
	"flangeseg/post/results"
)

// WriteCompare writes dir/report.html, one note for the runs of a
// comparison (names, jobs and sums in the same order, the first the
// reference of every ratio), from their run directories.
func WriteCompare(dir string, names []string, jobs []ModelJob, sums []results.Summary) error {
	if len(names) != len(jobs) || len(sums) != len(jobs) {
		return fmt.Errorf("report: comparison of %d names, %d models and %d summaries: want one of each per model", len(names), len(jobs), len(sums))
	}
	if len(jobs) == 0 {
		return fmt.Errorf("report: comparison without models")
	}
	var notes []runNote
	c := report.Compare{Caution: post.Caution}
	var titles, sha []string
	for i, j := range jobs {
		g, err := segment.Build(j.Spec)
		if err != nil {
			return fmt.Errorf("report: %s: %w", j.Path, err)
		}
		rows, err := results.ReadHistory(filepath.Join(j.Dir, "history.csv"), g.Zones())
		if err != nil {
			return fmt.Errorf("report: %s: %w", j.Path, err)
		}
		n := runNote{path: j.Path, text: j.Text, seg: g, rows: rows, sum: sums[i]}
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
	c.Generated = fmt.Sprintf("flangeseg %s; model.resolved.toml sha256 of the runs: %s", post.Version, strings.Join(sha, ", "))
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

// comparisonTable has a row per joint figure and, per run, its value and
// (from run 2 on) its ratio to run 1.
func comparisonTable(names []string, sums []results.Summary) report.Table {
	t := report.Table{Caption: "Joint figures of the runs, with the ratio of each to run 1", Columns: []report.Column{{Heading: "figure"}},
		Source: "FE runs of this note (summary.json of each run)"}
	for i, n := range names {
		t.Columns = append(t.Columns, report.Column{Heading: fmt.Sprintf("run %d, %s", i+1, n)})
		if i > 0 {
			t.Columns = append(t.Columns, report.Column{Heading: fmt.Sprintf("run %d / run 1", i+1), Unit: report.Dimensionless})
		}
	}
	for _, f := range results.ComparedFigures() {
		row := []report.Cell{report.Text(f.Name)}
		base, baseOK := f.Get(sums[0])
		for i, s := range sums {
			v, ok := f.Get(s)
			if ok {
				row = append(row, report.Num(v, f.Unit))
			} else {
				row = append(row, report.Missing(f.Unit))
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
		z := results.Column(n.rows, func(r figures.Row) float64 { return r.Z / 1e3 })
		ys := [][]float64{
			results.Column(n.rows, func(r figures.Row) float64 { return r.Fs / 1e3 }),
			z,
			results.Column(n.rows, func(r figures.Row) float64 { return r.MomentInterface / 1e6 }),
			results.Column(n.rows, func(r figures.Row) float64 { return r.GapEdge }),
		}
		u := results.Column(n.rows, func(r figures.Row) float64 { return r.U })
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

// ModelJob is one model of a demo or compare run.
type ModelJob struct {
	Spec *modelfile.Spec
	Path string // as the user named it, for messages
	Dir  string // its run directory
	Text []byte // the model's text when it is not on disk at Path (the embedded demo models), else nil
}
