package report

import (
	"fmt"

	"flangeseg/post"
)

// Ring is the page of a ring check from a flatness survey: the finding
// (the governing bolt, the bolts over the limits), the inputs, the
// classes of bolts that share an analysis, one row a bolt, the plots
// around the circumference and the bolt-force function of each class.
type Ring struct {
	Title     string
	Survey    string // survey file name
	Generated string // fixed text given by the caller; see Report.Generated
	Caution   string // the design-aid caution; required

	Finding  []string    // the verdict in sentences: governing bolt, bolts over D = 1, over the preload-loss limit
	Setup    Quantities  // model, survey, loads, tolerances, ring spring
	Classes  Table       // one row a class: values, bolts, status
	Bolts    Table       // one row a bolt
	Around   []post.Plot // polar plots around the circumference
	Curves   []post.Plot // bolt-force functions of the classes
	Notes    []string    // conventions and limits
	Warnings []string
	// External: the flange is external (its free edge is the outer edge of
	// the face); the sketch of the survey's conventions follows it.
	External bool
}

func (r Ring) validate() error {
	errs := headErrors(r.Title, r.Caution, "page")
	errs = append(errs, r.Setup.check("Setup")...)
	errs = append(errs, r.Classes.check("Classes")...)
	errs = append(errs, r.Bolts.check("Bolts")...)
	return joinErrors(errs)
}

// WriteRing writes r as an HTML document to path, replaced atomically.
func WriteRing(path string, r Ring) error {
	if err := r.validate(); err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	var d doc
	paras := func(ps []string, empty string) func(d *doc) error {
		return func(d *doc) error {
			if len(ps) == 0 {
				d.none(empty)
			}
			for _, p := range ps {
				d.para(p)
			}
			return nil
		}
	}
	parts := []part{
		{"Finding", paras(r.Finding, "No finding.")},
		{"Inputs", func(d *doc) error { return quantitiesOrNone(d, r.Setup, "No inputs were given.") }},
		{"Classes of bolts (one analysis each)", func(d *doc) error { return tableOrNone(d, r.Classes, "No classes.") }},
		{"Around the circumference", func(d *doc) error { return d.plots(r.Around, "No results to plot.") }},
		{"Bolt-force functions of the classes", func(d *doc) error { return d.plots(r.Curves, "No class has a history.") }},
		{"Every bolt", func(d *doc) error { return tableOrNone(d, r.Bolts, "No bolts.") }},
		{"Conventions and notes", func(d *doc) error {
			d.figure(surveyDrawing(r.External), "The survey's conventions: bolt numbers and angles around the ring, and the gaps at the inner and outer edge of the face.", "")
			return paras(append(append([]string(nil), r.Warnings...), r.Notes...), "No notes.")(d)
		}},
		limits(r.Caution),
	}
	if err := d.sections("", 2, parts); err != nil {
		return fmt.Errorf("%w (writing %s)", err, path)
	}
	meta := [][2]string{
		{"document", "Ring check from a flatness survey — nonlinear finite-element checks of the bolt segments of an L-flange joint"},
		{"survey file", r.Survey},
		{"generated", r.Generated},
	}
	return writeBytes(path, page(r.Title, meta, r.Caution, &d))
}
