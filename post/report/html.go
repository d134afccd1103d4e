package report

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"

	"flangeseg/post"
)

// doc collects the body of a note with its table of contents and its
// figure and table numbers.
type doc struct {
	body     bytes.Buffer
	toc      []tocEntry
	fig, tab int
}

type tocEntry struct {
	id, num, title string
	level          int // 2 for a section, 3 for a subsection
}

// part is one section of a note: its title and what it holds.
type part struct {
	title  string
	render func(d *doc) error
}

func (d *doc) printf(format string, args ...any) { fmt.Fprintf(&d.body, format, args...) }

// heading opens a numbered section, e.g. num "3" or "5.2".
func (d *doc) heading(level int, num, title string) {
	id := "s" + strings.ReplaceAll(num, ".", "-")
	d.toc = append(d.toc, tocEntry{id: id, num: num, title: title, level: level})
	d.printf("<h%d id=\"%s\"><span class=\"num\">%s</span> %s</h%d>\n", level, id, num, esc(title), level)
}

// sections renders parts as numbered sections under prefix ("" for top
// level sections, "4." for the subsections of section 4).
func (d *doc) sections(prefix string, level int, parts []part) error {
	for i, p := range parts {
		num := prefix + strconv.Itoa(i+1)
		d.heading(level, num, p.title)
		if err := p.render(d); err != nil {
			return fmt.Errorf("report: section %s %s: %w", num, p.title, err)
		}
	}
	return nil
}

func (d *doc) none(what string) {
	d.printf("<p class=\"none\">%s</p>\n", esc(what))
}

func (d *doc) para(s string) { d.printf("<p>%s</p>\n", esc(s)) }

// quantities writes q as a numbered table: symbol, quantity, value, unit,
// source.
func (d *doc) quantities(q Quantities) {
	d.tab++
	d.printf("<table class=\"quantities\">\n<caption><span class=\"num\">Table %d</span> %s</caption>\n", d.tab, esc(q.Caption))
	d.printf("<thead><tr><th>symbol</th><th>quantity</th><th class=\"value\">value</th><th>unit</th><th>source</th></tr></thead>\n<tbody>\n")
	for _, r := range q.Rows {
		sym := ""
		if r.Symbol != "" {
			sym = symbolHTML(r.Symbol)
		}
		unit := ""
		if !r.Value.IsText {
			unit = esc(unitText(r.Value.Unit))
		}
		cls := "value"
		if r.Value.IsText {
			cls = "text"
		}
		d.printf("<tr><td class=\"sym\">%s</td><td>%s</td><td class=\"%s\">%s</td><td class=\"unit\">%s</td><td class=\"src\">%s</td></tr>\n",
			sym, esc(r.Name), cls, cellHTML(r.Value, false), unit, esc(r.Source))
	}
	d.printf("</tbody>\n</table>\n")
}

// table writes t as a numbered table. A number whose unit is its column's
// is written bare, the unit standing in the heading; any other unit is
// written after the number.
func (d *doc) table(t Table) {
	d.tab++
	d.printf("<table class=\"grid\">\n<caption><span class=\"num\">Table %d</span> %s</caption>\n<thead><tr>", d.tab, esc(t.Caption))
	for _, c := range t.Columns {
		h := esc(c.Heading)
		if c.Unit != "" {
			h += " [" + esc(unitText(c.Unit)) + "]"
		}
		d.printf("<th>%s</th>", h)
	}
	d.printf("</tr></thead>\n<tbody>\n")
	for _, row := range t.Rows {
		d.printf("<tr>")
		for j, c := range row {
			cls := "value"
			if c.IsText {
				cls = "text"
			}
			own := c.Unit != "" && c.Unit != t.Columns[j].Unit
			d.printf("<td class=\"%s\">%s</td>", cls, cellHTML(c, own))
		}
		d.printf("</tr>\n")
	}
	d.printf("</tbody>\n</table>\n")
	if t.Source != "" {
		d.printf("<p class=\"source\">Source: %s</p>\n", esc(t.Source))
	}
}

// figure writes an inline SVG with a numbered caption.
func (d *doc) figure(svg, caption, note string) {
	d.fig++
	d.printf("<figure>\n%s\n<figcaption><span class=\"num\">Figure %d</span> %s", svg, d.fig, esc(caption))
	if note != "" {
		d.printf(" %s", esc(note))
	}
	d.printf("</figcaption>\n</figure>\n")
}

func (d *doc) plots(ps []post.Plot, empty string) error {
	if len(ps) == 0 {
		d.none(empty)
		return nil
	}
	for i, p := range ps {
		svg, err := plotSVG(p)
		if err != nil {
			return fmt.Errorf("plot %d %q: %w", i, p.Title, err)
		}
		d.figure(svg, p.Title, "")
	}
	return nil
}

// caution writes the design-aid caution as a box; paragraphs are
// separated by blank lines, single line breaks are spaces.
func (d *doc) caution(text string) {
	d.printf("<aside class=\"caution\" role=\"note\">\n<p class=\"caution-head\">Design aid — read before use</p>\n")
	for _, para := range strings.Split(strings.TrimSpace(text), "\n\n") {
		d.printf("<p>%s</p>\n", esc(strings.Join(strings.Fields(para), " ")))
	}
	d.printf("</aside>\n")
}

// runParts are the sections of one run, in the order of a calculation
// note: what is analysed, with what inputs, then the results and how
// well the analysis converged.
func runParts(r Report) []part {
	return []part{
		{"Joint section and dimensions", func(d *doc) error {
			if r.Joint == nil {
				d.none("No drawing of the section was given for this run.")
				return nil
			}
			cap := r.Joint.Caption
			if cap == "" {
				cap = "Modelled section of one bolt segment, drawn from the mesh outline; dimensions in mm."
			}
			d.figure(jointSVG(r.Joint), cap, "x radial (positive towards the shell), z along the tower axis; origin on the bolt axis in the contact plane.")
			return nil
		}},
		{"Inputs", func(d *doc) error {
			if len(r.Inputs) == 0 {
				d.none("No inputs were given for this run.")
			}
			for _, q := range r.Inputs {
				d.quantities(q)
			}
			return nil
		}},
		{"Preload", func(d *doc) error {
			return quantitiesOrNone(d, r.Preload, "No preload data: the preload stage did not run.")
		}},
		{"Key results", func(d *doc) error {
			return quantitiesOrNone(d, r.Results, "No results: the analysis stopped before the tension stage.")
		}},
		{"Load–response curves", func(d *doc) error {
			return d.plots(r.Curves, "No curves: no increment of the tension stage converged.")
		}},
		{"Hand methods and finite-element results", func(d *doc) error {
			if len(r.HandVersusFE.Rows) == 0 {
				d.none("No comparison with the hand methods for this run.")
				return nil
			}
			d.table(r.HandVersusFE)
			return nil
		}},
		{"Contact pressure along the interface", func(d *doc) error {
			return d.plots(r.ContactPressure, "No contact pressure was recorded for this run.")
		}},
		{"Stress and strain fields", func(d *doc) error {
			if len(r.Fields) == 0 {
				d.none("No field pictures for this run.")
			}
			for _, f := range r.Fields {
				svg, extremes := fieldSVG(f)
				cap := f.Caption
				if cap == "" {
					cap = f.Name
				}
				d.figure(svg, cap, "Each cell is coloured by the mean of its node values. "+extremes)
			}
			return nil
		}},
		{"Convergence", func(d *doc) error {
			return quantitiesOrNone(d, r.Convergence, "No convergence statistics for this run.")
		}},
		{"Notes", func(d *doc) error {
			if len(r.Notes) == 0 {
				d.none("No notes.")
			}
			for _, n := range r.Notes {
				d.para(n)
			}
			return nil
		}},
	}
}

func quantitiesOrNone(d *doc, q Quantities, empty string) error {
	if len(q.Rows) == 0 {
		d.none(empty)
		return nil
	}
	d.quantities(q)
	return nil
}

// limits is the last section of every note: the caution once more.
func limits(caution string) part {
	return part{"Limits of use", func(d *doc) error {
		d.caution(caution)
		return nil
	}}
}

func renderReport(r Report) ([]byte, error) {
	var d doc
	parts := append(runParts(r), limits(r.Caution))
	if err := d.sections("", 2, parts); err != nil {
		return nil, err
	}
	meta := [][2]string{
		{"document", "Calculation note — nonlinear finite-element check of one bolt segment of an L-flange joint"},
		{"model file", r.Model},
		{"generated", r.Generated},
	}
	return page(r.Title, meta, r.Caution, &d), nil
}

func renderCompare(c Compare) ([]byte, error) {
	var d doc
	parts := []part{
		{"Models compared", func(d *doc) error {
			t := Table{
				Caption: "Runs of this note; run 1 is the reference of every ratio",
				Columns: []Column{{Heading: "run"}, {Heading: "title"}, {Heading: "model file"}},
				Source:  "the model files named",
			}
			for i, r := range c.Runs {
				t.Rows = append(t.Rows, []Cell{Text(strconv.Itoa(i + 1)), Text(r.Title), Text(r.Model)})
			}
			d.table(t)
			return nil
		}},
		{"Comparison", func(d *doc) error {
			if len(c.Comparison.Rows) == 0 {
				d.none("No comparison table was given.")
				return nil
			}
			d.table(c.Comparison)
			return nil
		}},
		{"Overlaid curves", func(d *doc) error {
			return d.plots(c.Overlays, "No overlaid curves were given.")
		}},
	}
	for i, r := range c.Runs {
		prefix := strconv.Itoa(len(parts)+1) + "."
		parts = append(parts, part{fmt.Sprintf("Run %d — %s", i+1, r.Title), func(d *doc) error {
			return d.sections(prefix, 3, runParts(r))
		}})
	}
	parts = append(parts,
		part{"Notes", func(d *doc) error {
			if len(c.Notes) == 0 {
				d.none("No notes.")
			}
			for _, n := range c.Notes {
				d.para(n)
			}
			return nil
		}},
		limits(c.Caution))
	if err := d.sections("", 2, parts); err != nil {
		return nil, err
	}
	var models []string
	for _, r := range c.Runs {
		if r.Model != "" {
			models = append(models, r.Model)
		}
	}
	meta := [][2]string{
		{"document", "Calculation note — comparison of finite-element checks of bolt segments of L-flange joints"},
		{"model files", strings.Join(models, ", ")},
		{"generated", c.Generated},
	}
	return page(c.Title, meta, c.Caution, &d), nil
}

// page wraps the body: head with the style sheet, title block, caution,
// table of contents.
func page(title string, meta [][2]string, caution string, d *doc) []byte {
	var b bytes.Buffer
	b.WriteString("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
	// The policy lets the page load nothing at all, so a reference to
	// anything outside the file fails loudly instead of fetching it.
	b.WriteString("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'\">\n")
	b.WriteString("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
	fmt.Fprintf(&b, "<title>%s</title>\n<style>\n%s</style>\n</head>\n<body>\n<main>\n", esc(title), styleSheet)
	fmt.Fprintf(&b, "<header>\n<h1>%s</h1>\n<table class=\"meta\">\n", esc(title))
	for _, m := range meta {
		if m[1] == "" {
			continue
		}
		fmt.Fprintf(&b, "<tr><th>%s</th><td>%s</td></tr>\n", esc(m[0]), esc(m[1]))
	}
	b.WriteString("</table>\n</header>\n")
	var c doc
	c.caution(caution)
	b.Write(c.body.Bytes())
	b.WriteString("<nav class=\"toc\">\n<h2 id=\"contents\">Contents</h2>\n<ol>\n")
	for i, e := range d.toc {
		if e.level == 3 && (i == 0 || d.toc[i-1].level == 2) {
			b.WriteString("<ol>\n")
		}
		fmt.Fprintf(&b, "<li><a href=\"#%s\"><span class=\"num\">%s</span> %s</a>", e.id, e.num, esc(e.title))
		nextLevel := 2
		if i+1 < len(d.toc) {
			nextLevel = d.toc[i+1].level
		}
		switch {
		case e.level == 2 && nextLevel == 3:
			b.WriteString("\n") // the sub-list follows inside this item
		case e.level == 3 && nextLevel == 2:
			b.WriteString("</li>\n</ol>\n</li>\n")
		default:
			b.WriteString("</li>\n")
		}
	}
	b.WriteString("</ol>\n</nav>\n")
	b.Write(d.body.Bytes())
	b.WriteString("</main>\n</body>\n</html>\n")
	return b.Bytes()
}

// styleSheet is the page's own style: a calculation note on screen and
// on A4 paper.
const styleSheet = `html { background: #f4f4f1; }
body { margin: 0; font: 15px/1.45 'Liberation Sans', Arial, Helvetica, sans-serif; color: #1d1d1d; }
main { max-width: 980px; margin: 0 auto; padding: 24px 36px 48px; background: #fff; }
h1 { font-size: 24px; margin: 8px 0 12px; }
h2 { font-size: 19px; margin: 34px 0 10px; padding-bottom: 4px; border-bottom: 2px solid #0b3d6b; color: #0b3d6b; }
h3 { font-size: 16px; margin: 24px 0 8px; color: #0b3d6b; }
h2 .num, h3 .num { display: inline-block; min-width: 2.4em; }
table { border-collapse: collapse; margin: 10px 0 4px; font-variant-numeric: tabular-nums; }
caption { caption-side: top; text-align: left; font-weight: bold; padding: 4px 0; }
caption .num, figcaption .num { margin-right: 0.5em; }
th, td { border: 1px solid #c4c8cc; padding: 3px 8px; vertical-align: top; }
thead th { background: #e9eef3; text-align: left; font-weight: bold; }
td.value { text-align: right; white-space: nowrap; }
td.unit { white-space: nowrap; }
td.src { color: #444; font-size: 13px; }
td.sym { white-space: nowrap; }
table.meta th { text-align: left; background: #f3f3ef; font-weight: normal; color: #444; }
table.meta { margin-bottom: 16px; }
p.source { font-size: 13px; color: #444; margin: 2px 0 12px; }
p.none { color: #555; font-style: italic; }
figure { margin: 14px 0 18px; }
figure svg { display: block; max-width: 100%; height: auto; border: 1px solid #e0e0dc; }
svg.plot { width: 648px; }
figcaption { font-size: 13px; color: #333; margin-top: 6px; max-width: 760px; }
aside.caution { border: 2px solid #8a4b00; border-left-width: 10px; background: #fff5e1; padding: 8px 16px; margin: 12px 0 20px; }
aside.caution p { margin: 6px 0; }
p.caution-head { font-weight: bold; font-size: 16px; color: #8a4b00; text-transform: uppercase; letter-spacing: 0.04em; }
nav.toc ol { list-style: none; padding-left: 0; margin: 4px 0; }
nav.toc ol ol { padding-left: 2.4em; }
nav.toc a { color: #0b3d6b; text-decoration: none; }
nav.toc .num { display: inline-block; min-width: 2.6em; }
@media print {
  html { background: #fff; }
  main { max-width: none; padding: 0; }
  h2 { break-after: avoid; }
  figure, table { break-inside: avoid; }
  nav.toc a { color: inherit; }
}
`
