package report

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// validate reports every rule r breaks, each naming the field, the value
// and the rule. Plots are checked when they are drawn.
func (r Report) validate() error {
	var errs []error
	if strings.TrimSpace(r.Caution) == "" {
		errs = append(errs, errors.New("Caution is empty: the note must carry the design-aid caution"))
	}
	errs = append(errs, r.validateBody("")...)
	return joinErrors(errs)
}

func (c Compare) validate() error {
	errs := headErrors(c.Title, c.Caution, "note")
	if len(c.Runs) == 0 {
		errs = append(errs, errors.New("Runs is empty: a comparison needs at least one run"))
	}
	errs = append(errs, c.Comparison.check("Comparison")...)
	for i, r := range c.Runs {
		errs = append(errs, r.validateBody(fmt.Sprintf("Runs[%d].", i))...)
	}
	return joinErrors(errs)
}

// validateBody checks everything of r but its caution; at prefixes the
// field names, for the runs of a Compare.
func (r Report) validateBody(at string) []error {
	var errs []error
	if strings.TrimSpace(r.Title) == "" {
		errs = append(errs, fmt.Errorf("%sTitle is empty", at))
	}
	for i, q := range r.Inputs {
		errs = append(errs, q.check(fmt.Sprintf("%sInputs[%d]", at, i))...)
	}
	errs = append(errs, r.Preload.check(at+"Preload")...)
	errs = append(errs, r.Results.check(at+"Results")...)
	errs = append(errs, r.HandVersusFE.check(at+"HandVersusFE")...)
	errs = append(errs, r.Convergence.check(at+"Convergence")...)
	for i, f := range r.Fields {
		errs = append(errs, f.check(fmt.Sprintf("%sFields[%d]", at, i))...)
	}
	if r.Joint != nil {
		errs = append(errs, r.Joint.check(at+"Joint")...)
	}
	return errs
}

func joinErrors(errs []error) error {
	if len(errs) == 0 {
		return nil
	}
	msg := make([]string, len(errs))
	for i, e := range errs {
		msg[i] = e.Error()
	}
	return fmt.Errorf("report: %s", strings.Join(msg, "; "))
}

func (q Quantities) check(at string) []error {
	var errs []error
	for i, row := range q.Rows {
		where := fmt.Sprintf("%s (%q) row %d %q", at, q.Caption, i, row.Name)
		if strings.TrimSpace(row.Name) == "" {
			errs = append(errs, fmt.Errorf("%s: Name is empty", where))
		}
		if strings.TrimSpace(row.Source) == "" {
			errs = append(errs, fmt.Errorf("%s: Source is empty: every value names where it comes from", where))
		}
		if err := row.Value.check(""); err != nil {
			errs = append(errs, fmt.Errorf("%s: %w", where, err))
		}
	}
	return errs
}

func (t Table) check(at string) []error {
	var errs []error
	where := fmt.Sprintf("%s (%q)", at, t.Caption)
	if len(t.Rows) > 0 && strings.TrimSpace(t.Source) == "" {
		errs = append(errs, fmt.Errorf("%s: Source is empty: a table of results names where they come from", where))
	}
	if len(t.Rows) > 0 && len(t.Columns) == 0 {
		errs = append(errs, fmt.Errorf("%s: %d rows but no columns", where, len(t.Rows)))
	}
	for j, c := range t.Columns {
		if strings.TrimSpace(c.Heading) == "" {
			errs = append(errs, fmt.Errorf("%s: column %d has no heading", where, j))
		}
	}
	for i, row := range t.Rows {
		if len(row) != len(t.Columns) {
			errs = append(errs, fmt.Errorf("%s: row %d has %d cells, the table has %d columns", where, i, len(row), len(t.Columns)))
			continue
		}
		for j, c := range row {
			if err := c.check(t.Columns[j].Unit); err != nil {
				errs = append(errs, fmt.Errorf("%s: row %d, column %q: %w", where, i, t.Columns[j].Heading, err))
			}
		}
	}
	return errs
}

// check enforces a unit on every number: its own or, in a table, its
// column's.
func (c Cell) check(columnUnit string) error {
	if c.IsText {
		return nil
	}
	switch {
	case math.IsInf(c.Value, 0):
		return fmt.Errorf("value %v is not finite (use Missing for a value that does not exist)", c.Value)
	case c.Unit == "" && columnUnit == "":
		return fmt.Errorf("number %v has no unit (use Dimensionless for a pure number)", c.Value)
	case c.Digits < 0 || c.Digits > 17:
		return fmt.Errorf("Digits = %d is outside 0…17", c.Digits)
	}
	return nil
}

func (f Field) check(at string) []error {
	where := fmt.Sprintf("%s (%q)", at, f.Name)
	var errs []error
	add := func(format string, args ...any) {
		errs = append(errs, fmt.Errorf("%s: "+format, append([]any{where}, args...)...))
	}
	if strings.TrimSpace(f.Name) == "" {
		add("Name is empty")
	}
	if strings.TrimSpace(f.Unit) == "" {
		add("Unit is empty (use Dimensionless for a strain)")
	}
	if len(f.Values) != len(f.Nodes) {
		add("%d values for %d nodes: one value per node", len(f.Values), len(f.Nodes))
	}
	if len(f.Cells) == 0 {
		add("no cells")
	}
	for i, p := range f.Nodes {
		if !finite(p[0]) || !finite(p[1]) {
			add("node %d at (%v, %v) is not finite", i, p[0], p[1])
			break
		}
	}
	for i, v := range f.Values {
		if !finite(v) {
			add("value %d is %v", i, v)
			break
		}
	}
	for i, c := range f.Cells {
		if err := checkCell(c, len(f.Nodes)); err != nil {
			add("cell %d: %v", i, err)
			break
		}
	}
	if f.View != nil {
		if err := f.View.check(); err != nil {
			add("View: %v", err)
		}
	}
	return errs
}

func checkCell(c []int, nodes int) error {
	switch len(c) {
	case 3, 4, 6, 8:
	default:
		return fmt.Errorf("%d nodes: a cell has 3, 4, 6 or 8", len(c))
	}
	for _, n := range c {
		if n < 0 || n >= nodes {
			return fmt.Errorf("node number %d is outside 0…%d", n, nodes-1)
		}
	}
	return nil
}

func (b Box) check() error {
	for _, v := range [...]float64{b.XMin, b.XMax, b.ZMin, b.ZMax} {
		if !finite(v) {
			return fmt.Errorf("%v is not finite", v)
		}
	}
	if !(b.XMax > b.XMin && b.ZMax > b.ZMin) {
		return fmt.Errorf("x %v…%v, z %v…%v: each range must have max > min", b.XMin, b.XMax, b.ZMin, b.ZMax)
	}
	return nil
}

func (j *JointDrawing) check(at string) []error {
	var errs []error
	if len(j.Regions) == 0 {
		errs = append(errs, fmt.Errorf("%s: no regions", at))
	}
	for i, r := range j.Regions {
		where := fmt.Sprintf("%s.Regions[%d] (%q)", at, i, r.Name)
		if len(r.Loops) == 0 {
			errs = append(errs, fmt.Errorf("%s: no loops", where))
		}
		for k, l := range r.Loops {
			if len(l) < 3 {
				errs = append(errs, fmt.Errorf("%s: loop %d has %d points, at least 3 needed", where, k, len(l)))
			}
			for _, p := range l {
				if !finite(p[0]) || !finite(p[1]) {
					errs = append(errs, fmt.Errorf("%s: loop %d: point (%v, %v) is not finite", where, k, p[0], p[1]))
					break
				}
			}
		}
	}
	for i, d := range j.Dimensions {
		where := fmt.Sprintf("%s.Dimensions[%d] (%q)", at, i, d.Label)
		if strings.TrimSpace(d.Label) == "" {
			errs = append(errs, fmt.Errorf("%s: Label is empty", where))
		}
		for _, v := range [...]float64{d.From[0], d.From[1], d.To[0], d.To[1], d.Offset} {
			if !finite(v) {
				errs = append(errs, fmt.Errorf("%s: %v is not finite", where, v))
				break
			}
		}
		if d.From == d.To {
			errs = append(errs, fmt.Errorf("%s: From and To are the same point (%v, %v)", where, d.From[0], d.From[1]))
		}
	}
	if j.View != nil {
		if err := j.View.check(); err != nil {
			errs = append(errs, fmt.Errorf("%s.View: %v", at, err))
		}
	}
	return errs
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// headErrors checks what every document needs before its body: a title
// and the design-aid caution (doc names the document in the message).
func headErrors(title, caution, doc string) []error {
	var errs []error
	if strings.TrimSpace(caution) == "" {
		errs = append(errs, errors.New("Caution is empty: the "+doc+" must carry the design-aid caution"))
	}
	if strings.TrimSpace(title) == "" {
		errs = append(errs, errors.New("Title is empty"))
	}
	return errs
}
