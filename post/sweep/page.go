package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"flangeseg/post"
	"flangeseg/post/report"
	"flangeseg/post/results"
	"flangeseg/post/sweep/plan"
)

// WriteTables writes into dir, from the records of every case (Collect):
// sweep.csv, sweep.json, the plots (plots/*.svg and .png: each compared
// joint figure against each numeric varied key, and the curves of every
// case overlaid) and the sweep page, report.html. Missing cases are rows
// without results; they are listed in sweep.json and on the page.
func WriteTables(dir string, p *plan.Plan, recs []Record) error {
	if err := os.MkdirAll(filepath.Join(dir, "plots"), 0o755); err != nil {
		return err
	}
	if err := writeCSV(filepath.Join(dir, "sweep.csv"), p, recs); err != nil {
		return err
	}
	if err := writeJSON(filepath.Join(dir, "sweep.json"), p, recs); err != nil {
		return err
	}
	figs := figurePlots(p, recs)
	curves, err := curvePlots(dir, recs)
	if err != nil {
		return err
	}
	for _, f := range append(figs, curves...) {
		if err := post.WritePlot(filepath.Join(dir, "plots", f.Stem), f.Plot); err != nil {
			return err
		}
	}
	return report.WriteSweep(filepath.Join(dir, "report.html"), page(p, recs, figs, curves))
}

func page(p *plan.Plan, recs []Record, figs, curves []FigurePlot) report.Sweep {
	title := p.Title
	if title == "" {
		title = "Sweep " + filepath.Base(p.Path)
	}
	sum := sha256.Sum256(p.Text)
	base := sha256.Sum256(p.BaseText)
	s := report.Sweep{Title: title, Plan: filepath.Base(p.Path), Caution: post.Caution,
		Generated: fmt.Sprintf("flangeseg %s; plan sha256 %s, base model sha256 %s", post.Version,
			hex.EncodeToString(sum[:8]), hex.EncodeToString(base[:8])),
		Setup: setup(p, len(recs)), Cases: casesTable(p, recs), NotDone: notDone(recs)}
	for _, f := range figs {
		s.Figures = append(s.Figures, f.Plot)
	}
	for _, f := range curves {
		s.Overlays = append(s.Overlays, f.Plot)
	}
	s.Notes = []string{
		"Each case is an ordinary run in cases/NAME beside this page: its model file (model.toml), its resolved model, history.csv, summary.json, plots, fields and its own calculation note (report.html).",
		"sweep.csv and sweep.json beside this page hold every joint figure of each case's summary; the table above shows the main ones, and the failure mechanism only where a case assesses one (elastic runs do not). A blank value of a varied key is the base model's value; an opening load of 0 means the shell-side corner is open after the preload already.",
		"The plots of this page are also in plots/ as SVG and PNG.",
	}
	return s
}

func setup(p *plan.Plan, n int) report.Quantities {
	src := "plan file"
	q := report.Quantities{Caption: "What the sweep varies", Rows: []report.Quantity{
		{Name: "base model", Value: report.Text(p.Base), Source: src},
		{Name: "combination", Value: report.Text(combineText(p)), Source: src},
		{Name: "cases", Value: report.Num(float64(n), report.Dimensionless), Source: src},
	}}
	for i, v := range p.Vary {
		vals := ""
		for j, x := range v.Values {
			if j > 0 {
				vals += ", "
			}
			vals += plan.Text(x)
		}
		q.Rows = append(q.Rows, report.Quantity{Name: v.Key, Value: report.Text(vals), Source: fmt.Sprintf("plan file, vary[%d]", i)})
	}
	for i, c := range p.Named {
		cs := plan.Case{Set: c.Set}
		q.Rows = append(q.Rows, report.Quantity{Name: "named case " + c.Name, Value: report.Text(cs.Describe()), Source: fmt.Sprintf("plan file, case[%d]", i)})
	}
	return q
}

func combineText(p *plan.Plan) string {
	named := ""
	if len(p.Named) > 0 {
		named = fmt.Sprintf(", then %d named cases", len(p.Named))
	}
	if len(p.Vary) == 0 {
		return fmt.Sprintf("%d named cases", len(p.Named))
	}
	if p.Combine == plan.Zip {
		return "zipped: the i-th values of every key together" + named
	}
	return "full grid, the first key varying slowest" + named
}

func casesTable(p *plan.Plan, recs []Record) report.Table {
	keys := Keys(p)
	t := report.Table{Caption: "One row a case: its varied values and joint figures", Source: "the case runs (summary.json of each case)",
		Columns: []report.Column{{Heading: "case"}, {Heading: "name"}}}
	for _, k := range keys {
		t.Columns = append(t.Columns, report.Column{Heading: k})
	}
	figs := pageFigures()
	for _, f := range figs {
		t.Columns = append(t.Columns, report.Column{Heading: f.Name, Unit: f.Unit})
	}
	mechanisms := assessed(recs)
	if mechanisms {
		t.Columns = append(t.Columns, report.Column{Heading: "failure mechanism"})
	}
	t.Columns = append(t.Columns, report.Column{Heading: "status"})
	for _, r := range recs {
		row := []report.Cell{report.Text(strconv.Itoa(r.Index)), report.Text(r.Name)}
		for _, k := range keys {
			row = append(row, report.Text(r.value(k)))
		}
		for _, f := range figs {
			if r.Summary == nil {
				row = append(row, report.Missing(f.Unit))
				continue
			}
			if v, ok := f.Get(*r.Summary); ok {
				row = append(row, report.Num(v, f.Unit))
			} else {
				row = append(row, report.Missing(f.Unit))
			}
		}
		if mechanisms {
			mech := ""
			if r.Summary != nil {
				mech = r.Summary.Joint.FailureLocation
			}
			row = append(row, report.Text(mech))
		}
		row = append(row, report.Text(r.Status))
		t.Rows = append(t.Rows, row)
	}
	return t
}

// pageFigures are the joint figures of the page's table, which has to fit
// a page: the compared figures without the joint-alone stiffness, the
// tangent load factor and the end displacement (sweep.csv has them all).
func pageFigures() []results.ComparedFigure {
	var out []results.ComparedFigure
	for _, f := range results.ComparedFigures() {
		switch f.Column {
		case "joint_stiffness_secant_to_reference_kN_per_mm", "load_factor_tangent_at_zero", "displacement_at_end_mm":
			continue
		}
		out = append(out, f)
	}
	return out
}

// assessed reports whether any case names a failure mechanism (elastic
// runs all say "not assessed").
func assessed(recs []Record) bool {
	for _, r := range recs {
		if r.Summary != nil && !strings.HasPrefix(r.Summary.Joint.FailureLocation, "not assessed") {
			return true
		}
	}
	return false
}

func notDone(recs []Record) report.Table {
	t := report.Table{Caption: "Cases that did not run to their end", Source: "the case records (case.json)",
		Columns: []report.Column{{Heading: "case"}, {Heading: "name"}, {Heading: "status"}, {Heading: "exit status"}, {Heading: "reason"}}}
	for _, r := range recs {
		if r.Status == Finished {
			continue
		}
		exit := "—"
		if r.Status != Missing {
			exit = strconv.Itoa(r.ExitStatus)
		}
		t.Rows = append(t.Rows, []report.Cell{report.Text(strconv.Itoa(r.Index)), report.Text(r.Name), report.Text(r.Status), report.Text(exit), report.Text(r.Reason)})
	}
	return t
}
