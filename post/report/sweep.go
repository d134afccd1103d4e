package report

import (
	"fmt"
	"io"

	"flangeseg/post"
)

// Sweep is the page of a parameter sweep: its plan, one row a case, the
// cases that did not finish, the joint figures against the varied values
// and the curves of every case overlaid. Each case has its own note.
type Sweep struct {
	Title     string // what the sweep studies
	Plan      string // plan file name
	Generated string // fixed text given by the caller; see Report.Generated
	Caution   string // the design-aid caution; required

	Setup    Quantities  // base model, how the keys combine, each varied key with its values
	Cases    Table       // one row a case: index, name, values, figures, ending
	NotDone  Table       // the cases that stopped, failed or are missing, with the reason
	Figures  []post.Plot // a joint figure against a varied key
	Overlays []post.Plot // curves of every case overlaid
	Notes    []string
}

func (s Sweep) validate() error {
	errs := headErrors(s.Title, s.Caution, "page")
	errs = append(errs, s.Setup.check("Setup")...)
	errs = append(errs, s.Cases.check("Cases")...)
	errs = append(errs, s.NotDone.check("NotDone")...)
	return joinErrors(errs)
}

// EncodeSweep writes s as an HTML document to w.
func EncodeSweep(w io.Writer, s Sweep) error {
	if err := s.validate(); err != nil {
		return err
	}
	b, err := renderSweep(s)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// WriteSweep writes s as an HTML document to path, replaced atomically;
// see Write.
func WriteSweep(path string, s Sweep) error {
	if err := s.validate(); err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	b, err := renderSweep(s)
	if err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	return writeBytes(path, b)
}

func renderSweep(s Sweep) ([]byte, error) {
	var d doc
	parts := []part{
		{"Plan", func(d *doc) error { return quantitiesOrNone(d, s.Setup, "No plan was given.") }},
		{"Cases", func(d *doc) error { return tableOrNone(d, s.Cases, "No cases.") }},
		{"Cases that did not finish", func(d *doc) error {
			return tableOrNone(d, s.NotDone, "Every case ran to its end.")
		}},
		{"Joint figures against the varied values", func(d *doc) error {
			return d.plots(s.Figures, "No varied key takes numbers in two or more finished cases.")
		}},
		{"Curves of every case", func(d *doc) error { return d.plots(s.Overlays, "No case has a history.") }},
		{"Notes", func(d *doc) error {
			if len(s.Notes) == 0 {
				d.none("No notes.")
			}
			for _, n := range s.Notes {
				d.para(n)
			}
			return nil
		}},
		limits(s.Caution),
	}
	if err := d.sections("", 2, parts); err != nil {
		return nil, err
	}
	meta := [][2]string{
		{"document", "Parameter sweep — nonlinear finite-element checks of bolt segments of an L-flange joint"},
		{"plan file", s.Plan},
		{"generated", s.Generated},
	}
	return page(s.Title, meta, s.Caution, &d), nil
}

func tableOrNone(d *doc, t Table, empty string) error {
	if len(t.Rows) == 0 {
		d.none(empty)
		return nil
	}
	d.table(t)
	return nil
}
