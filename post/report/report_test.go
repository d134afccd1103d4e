package report

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"flangeseg/post"
)

// reportSections are the numbered sections of a one-run note, in order.
var reportSections = []string{
	"1 Joint section and dimensions",
	"2 Inputs",
	"3 Preload",
	"4 Key results",
	"5 Load–response curves",
	"6 Hand methods and finite-element results",
	"7 Contact pressure along the interface",
	"8 Stress and strain fields",
	"9 Convergence",
	"10 Notes",
	"11 Limits of use",
}

// compareSections are the sections of the example comparison, with the
// subsections of each run.
func compareSections() []string {
	out := []string{"1 Models compared", "2 Comparison", "3 Overlaid curves"}
	for i, title := range []string{"Tower joint T3 — flat contact face", "Tower joint T3 — defined contact bands"} {
		n := strconv.Itoa(4 + i)
		out = append(out, n+" Run "+strconv.Itoa(1+i)+" — "+title)
		for k, s := range reportSections[:10] {
			_, name, _ := strings.Cut(s, " ")
			out = append(out, n+"."+strconv.Itoa(k+1)+" "+name)
		}
	}
	return append(out, "6 Notes", "7 Limits of use")
}

var headingRE = regexp.MustCompile(`<h([23]) id="([^"]+)"><span class="num">([^<]+)</span> ([^<]+)</h[23]>`)

// headings returns "num title" of each numbered heading of an HTML page.
func headings(page string) []string {
	var out []string
	for _, m := range headingRE.FindAllStringSubmatch(page, -1) {
		out = append(out, m[3]+" "+htmlUnescape(m[4]))
	}
	return out
}

func htmlUnescape(s string) string {
	return strings.NewReplacer("&amp;", "&", "&lt;", "<", "&gt;", ">", "&#39;", "'", "&#34;", `"`).Replace(s)
}

func encode(t *testing.T, r Report) string {
	t.Helper()
	var b bytes.Buffer
	if err := Encode(&b, r); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func encodeCompare(t *testing.T, c Compare) string {
	t.Helper()
	var b bytes.Buffer
	if err := EncodeCompare(&b, c); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func TestStructure(t *testing.T) {
	for _, tc := range []struct {
		name     string
		page     string
		sections []string
		svgs     int // inline SVG pictures expected
	}{
		{"report", encode(t, exampleReport()), reportSections, 1 + 4 + 1 + 2},
		{"compare", encodeCompare(t, exampleCompare()), compareSections(), 2 + (1 + 1 + 1 + 1) + (1 + 4 + 1 + 2)},
	} {
		t.Run(tc.name, func(t *testing.T) {
			page := tc.page
			if !strings.HasPrefix(page, "<!DOCTYPE html>\n") {
				t.Errorf("page does not start with the HTML doctype: %.40q", page)
			}
			got := headings(page)
			if strings.Join(got, "\n") != strings.Join(tc.sections, "\n") {
				t.Errorf("headings:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(tc.sections, "\n"))
			}
			checkTOC(t, page)
			checkCaution(t, page, exCaution)
			checkSelfContained(t, page)
			svgs := inlineSVGs(t, page)
			if len(svgs) != tc.svgs {
				t.Errorf("%d inline SVG pictures, want %d", len(svgs), tc.svgs)
			}
			for i, s := range svgs {
				if err := wellFormed(s); err != nil {
					t.Errorf("SVG %d is not well-formed XML: %v\n%.200s", i, err, s)
				}
			}
			checkUnits(t, page)
		})
	}
}

// checkTOC checks that every numbered heading is listed in the table of
// contents and every entry points at a heading.
func checkTOC(t *testing.T, page string) {
	t.Helper()
	nav := page[strings.Index(page, `<nav class="toc">`):strings.Index(page, "</nav>")]
	links := regexp.MustCompile(`href="#([^"]+)"`).FindAllStringSubmatch(nav, -1)
	ids := headingRE.FindAllStringSubmatch(page, -1)
	if len(links) != len(ids) {
		t.Fatalf("table of contents has %d entries for %d headings", len(links), len(ids))
	}
	for i := range links {
		if links[i][1] != ids[i][2] {
			t.Errorf("contents entry %d points at #%s, heading %d has id %q", i, links[i][1], i, ids[i][2])
		}
	}
}

// checkCaution checks that the caution stands twice: before the table of
// contents and in the last section.
func checkCaution(t *testing.T, page, caution string) {
	t.Helper()
	text := strings.Join(strings.Fields(caution), " ")
	if n := strings.Count(page, text); n != 2 {
		t.Fatalf("caution appears %d times, want 2 (top and end)", n)
	}
	first, last := strings.Index(page, text), strings.LastIndex(page, text)
	if toc := strings.Index(page, `<nav class="toc">`); first > toc {
		t.Errorf("first caution at byte %d, after the table of contents at %d", first, toc)
	}
	if end := strings.LastIndex(page, "<h2 "); last < end {
		t.Errorf("last caution at byte %d, before the last section at %d", last, end)
	}
}

// checkSelfContained rejects anything that would load from outside the
// file: links, scripts, style imports, external images or fonts.
func checkSelfContained(t *testing.T, page string) {
	t.Helper()
	for _, bad := range []string{"http://", "https://", "<script", "<link", "@import", "url(", "src=", "@font-face", "<img", "<iframe", "<object"} {
		if i := strings.Index(page, bad); i >= 0 {
			t.Errorf("page holds %q at byte %d: %.80q", bad, i, page[max(0, i-30):])
		}
	}
}

// inlineSVGs returns each outermost svg element of page.
func inlineSVGs(t *testing.T, page string) []string {
	t.Helper()
	var out []string
	depth, start := 0, 0
	for i := 0; i < len(page); i++ {
		switch {
		case strings.HasPrefix(page[i:], "<svg"):
			if depth == 0 {
				start = i
			}
			depth++
		case strings.HasPrefix(page[i:], "</svg>"):
			depth--
			if depth == 0 {
				out = append(out, page[start:i+len("</svg>")])
			}
			if depth < 0 {
				t.Fatalf("</svg> without <svg at byte %d", i)
			}
		}
	}
	if depth != 0 {
		t.Fatalf("%d svg elements not closed", depth)
	}
	return out
}

func wellFormed(s string) error {
	d := xml.NewDecoder(strings.NewReader(s))
	for {
		_, err := d.Token()
		if errors.Is(err, io.EOF) {
			return nil
		}
		if err != nil {
			return err
		}
	}
}

var (
	tableRE  = regexp.MustCompile(`(?s)<table class="(quantities|grid)">(.*?)</table>`)
	rowRE    = regexp.MustCompile(`(?s)<tr>(.*?)</tr>`)
	cellRE   = regexp.MustCompile(`(?s)<t([dh])(?: class="([a-z]+)")?>(.*?)</t[dh]>`)
	numberRE = regexp.MustCompile(`^-?[0-9][0-9.]*(×10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)?`)
)

// checkUnits checks that every number of every table carries its unit:
// in the unit column of a quantities table, after the number, or in its
// column's heading.
func checkUnits(t *testing.T, page string) {
	t.Helper()
	tables := tableRE.FindAllStringSubmatch(page, -1)
	if len(tables) == 0 {
		t.Fatal("no tables")
	}
	numbers := 0
	for ti, tb := range tables {
		var header []string
		for _, row := range rowRE.FindAllStringSubmatch(tb[2], -1) {
			cells := cellRE.FindAllStringSubmatch(row[1], -1)
			if cells[0][1] == "h" {
				for _, c := range cells {
					header = append(header, c[3])
				}
				continue
			}
			for j, c := range cells {
				if c[2] != "value" || !numberRE.MatchString(c[3]) {
					continue
				}
				numbers++
				var ok bool
				switch tb[1] {
				case "quantities":
					ok = cells[j+1][2] == "unit" && cells[j+1][3] != ""
				case "grid":
					ok = strings.Contains(c[3], "&#8239;") || strings.Contains(header[j], "[")
				}
				if !ok {
					t.Errorf("table %d: number %q in column %q has no unit", ti, c[3], header[j])
				}
			}
		}
	}
	if numbers < 20 {
		t.Errorf("only %d numbers found in the tables: the check found too little to judge", numbers)
	}
}

func TestDeterministic(t *testing.T) {
	a, b := encode(t, exampleReport()), encode(t, exampleReport())
	if a != b {
		t.Error("two encodings of the same report differ")
	}
	c, d := encodeCompare(t, exampleCompare()), encodeCompare(t, exampleCompare())
	if c != d {
		t.Error("two encodings of the same comparison differ")
	}
	dir := t.TempDir()
	p := filepath.Join(dir, "report.html")
	if err := Write(p, exampleReport()); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	if string(got) != a {
		t.Error("Write and Encode give different bytes")
	}
}

func TestInputNotModified(t *testing.T) {
	r := exampleReport()
	before := encode(t, r)
	nodes := append([][2]float64(nil), r.Fields[0].Nodes...)
	_ = encode(t, r)
	for i := range nodes {
		if nodes[i] != r.Fields[0].Nodes[i] {
			t.Fatalf("node %d changed from %v to %v", i, nodes[i], r.Fields[0].Nodes[i])
		}
	}
	if encode(t, r) != before {
		t.Error("encoding changed the input")
	}
}

// TestWriteInvalidKeepsFile: a failed write leaves the existing file as
// it was and no temporary file behind.
func TestWriteInvalidKeepsFile(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "report.html")
	if err := os.WriteFile(p, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	bad := exampleReport()
	bad.Caution = ""
	if err := Write(p, bad); err == nil {
		t.Fatal("a report without caution was written")
	}
	bad = exampleReport()
	bad.Curves = []post.Plot{{Title: "empty"}}
	if err := Write(p, bad); err == nil || !strings.Contains(err.Error(), "empty") {
		t.Fatalf("a plot without series: error %v, want one naming the plot", err)
	}
	got, _ := os.ReadFile(p)
	if string(got) != "old" {
		t.Errorf("file now holds %.40q, want the old content", got)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("%d files in the folder, want 1", len(entries))
	}
}

func TestValidateRejects(t *testing.T) {
	for _, tc := range []struct {
		name   string
		change func(r *Report)
		want   string // part of the error
	}{
		{"no caution", func(r *Report) { r.Caution = " \n" }, "Caution is empty"},
		{"no title", func(r *Report) { r.Title = "" }, "Title is empty"},
		{"number without unit", func(r *Report) { r.Inputs[0].Rows[0].Value.Unit = "" }, `"shell mid-surface diameter at the joint": number 4100 has no unit`},
		{"no source", func(r *Report) { r.Preload.Rows[1].Source = "" }, `"preload reached": Source is empty`},
		{"infinite value", func(r *Report) { r.Results.Rows[0].Value.Value = math.Inf(1) }, "not finite"},
		{"table cell without unit", func(r *Report) { r.HandVersusFE.Columns[2].Unit = "" }, `column "ultimate segment force": number 410 has no unit`},
		{"table without source", func(r *Report) { r.HandVersusFE.Source = "" }, "HandVersusFE"},
		{"ragged table", func(r *Report) { r.HandVersusFE.Rows[1] = r.HandVersusFE.Rows[1][:2] }, "row 1 has 2 cells, the table has 5 columns"},
		{"field values", func(r *Report) { r.Fields[0].Values = r.Fields[0].Values[:3] }, "3 values for"},
		{"field node number", func(r *Report) { r.Fields[1].Cells = [][]int{{0, 1, 2, 1 << 30}} }, "outside"},
		{"field unit", func(r *Report) { r.Fields[0].Unit = "" }, "Unit is empty"},
		{"field NaN", func(r *Report) { r.Fields[0].Values = append([]float64{math.NaN()}, r.Fields[0].Values[1:]...) }, "value 0 is NaN"},
		{"empty view", func(r *Report) { r.Fields[0].View = &Box{0, 0, 0, 1} }, "max > min"},
		{"dimension label", func(r *Report) { r.Joint.Dimensions[0].Label = "" }, "Label is empty"},
		{"dimension points", func(r *Report) { r.Joint.Dimensions[1].To = r.Joint.Dimensions[1].From }, "same point"},
		{"region loop", func(r *Report) { r.Joint.Regions[0].Loops[0] = r.Joint.Regions[0].Loops[0][:2] }, "at least 3"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := exampleReport()
			tc.change(&r)
			err := Encode(io.Discard, r)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want one containing %q", err, tc.want)
			}
		})
	}
}

func TestCompareValidate(t *testing.T) {
	c := exampleCompare()
	c.Runs = nil
	if err := EncodeCompare(io.Discard, c); err == nil || !strings.Contains(err.Error(), "Runs is empty") {
		t.Errorf("error %v, want one for no runs", err)
	}
	c = exampleCompare()
	c.Runs[1].Inputs[0].Rows[0].Source = ""
	if err := EncodeCompare(io.Discard, c); err == nil || !strings.Contains(err.Error(), "Runs[1].Inputs[0]") {
		t.Errorf("error %v, want one naming Runs[1].Inputs[0]", err)
	}
	c = exampleCompare()
	c.Runs[0].Caution = "" // the runs' cautions are not shown; the Compare's is
	if err := EncodeCompare(io.Discard, c); err != nil {
		t.Errorf("a run without its own caution: %v", err)
	}
}

func TestFormatNumber(t *testing.T) {
	for _, tc := range []struct {
		v      float64
		digits int
		want   string
	}{
		{784.6, 0, "784.6"},
		{784.634, 6, "784.634"},
		{20946, 0, "20946"}, // integer digits are never rounded away
		{26, 0, "26"},
		{0.2, 0, "0.2"},
		{0.06123, 0, "0.06123"},
		{-0.0612, 0, "-0.0612"},
		{0, 0, "0"},
		{math.Copysign(0, -1), 0, "0"},
		{-0.00001, 3, "-1×10⁻⁵"},
		{4.12e-5, 0, "4.12×10⁻⁵"},
		{2.5e9, 0, "2.5×10⁹"},
		{math.NaN(), 0, "—"},
		{1.23456, 2, "1.2"},
	} {
		if got := formatNumber(tc.v, tc.digits); got != tc.want {
			t.Errorf("formatNumber(%v, %d) = %q, want %q", tc.v, tc.digits, got, tc.want)
		}
	}
}

func TestSymbolHTML(t *testing.T) {
	for in, want := range map[string]string{
		"F_p,C": "<i>F</i><sub>p,C</sub>",
		"t":     "<i>t</i>",
		"a<b":   "<i>a&lt;b</i>",
	} {
		if got := symbolHTML(in); got != want {
			t.Errorf("symbolHTML(%q) = %q, want %q", in, got, want)
		}
	}
	if got, want := svgLabel("t_f = 84 mm"), `t<tspan baseline-shift="sub" font-size="9">f</tspan> = 84 mm`; got != want {
		t.Errorf("svgLabel = %q, want %q", got, want)
	}
}

// TestScaleColour: the scale's lightness falls strictly from step to step
// (the property doc.go promises), and its ends are the first and last
// stops.
func TestScaleColour(t *testing.T) {
	prev := math.Inf(1)
	for k := range fieldLevels {
		c := levelColour(k)
		var rgb [3]uint8
		for i := range rgb {
			var v uint8
			for _, ch := range c[1+2*i : 3+2*i] {
				v = v*16 + uint8(strings.IndexRune("0123456789abcdef", ch))
			}
			rgb[i] = v
		}
		l := oklab(rgb)[0]
		if !(l < prev) {
			t.Errorf("step %d %s: lightness %.4f does not fall below %.4f", k, c, l, prev)
		}
		prev = l
	}
	if got, want := scaleColour(0), "#f3efe0"; got != want {
		t.Errorf("scale start %s, want the first stop %s", got, want)
	}
	if got, want := scaleColour(1), "#3e1f47"; got != want {
		t.Errorf("scale end %s, want the last stop %s", got, want)
	}
}

// TestFieldPicture: the cell holding the largest values is drawn in the
// darkest step and the one holding the smallest in the lightest; a view
// that leaves a cell out leaves its colour out.
func TestFieldPicture(t *testing.T) {
	f := Field{Name: "von Mises stress", Unit: "MPa",
		Nodes:  [][2]float64{{0, 0}, {10, 0}, {20, 0}, {30, 0}, {0, 10}, {10, 10}, {20, 10}, {30, 10}},
		Cells:  [][]int{{0, 1, 5, 4}, {1, 2, 6, 5}, {2, 3, 7, 6}},
		Values: []float64{0, 100, 200, 300, 0, 100, 200, 300},
	}
	svg, extremes := fieldSVG(f)
	// Cell means: 50, 150, 250 of 0…300 → steps 10, 32, 53.
	for _, k := range []int{10, 32, 53} {
		if !strings.Contains(svg, `<path fill="`+levelColour(k)+`"`) {
			t.Errorf("no cell drawn in step %d", k)
		}
	}
	if !strings.Contains(extremes, "0 MPa to 300 MPa") || !strings.Contains(extremes, "x = 30 mm, z = 0 mm") {
		t.Errorf("extremes %q", extremes)
	}
	f.View = &Box{-1, 15, -1, 11} // the first two cells only
	svg, extremes = fieldSVG(f)
	if strings.Contains(svg, `<path fill="`+levelColour(53)+`"`) {
		t.Error("a cell outside the view is drawn")
	}
	if !strings.Contains(extremes, "0 MPa to 200 MPa") {
		t.Errorf("extremes in the view %q, want 0 MPa to 200 MPa", extremes)
	}
	if err := wellFormed(svg); err != nil {
		t.Error(err)
	}
	f.View = &Box{100, 200, 100, 200}
	if _, extremes = fieldSVG(f); extremes != "No cell lies in the view." {
		t.Errorf("empty view: %q", extremes)
	}
}

// TestOutlines: the outline of each region of a mesh encloses the
// region's area (shoelace formula, common practice), runs
// counter-clockwise, and a quadratic mesh's outline passes through its
// midside nodes.
func TestOutlines(t *testing.T) {
	// 3 × 2 quads of 10 mm; the right column is region 1.
	var nodes [][2]float64
	for j := range 3 {
		for i := range 4 {
			nodes = append(nodes, [2]float64{10 * float64(i), 10 * float64(j)})
		}
	}
	id := func(i, j int) int { return j*4 + i }
	var cells [][]int
	var reg []int
	for j := range 2 {
		for i := range 3 {
			cells = append(cells, []int{id(i, j), id(i+1, j), id(i+1, j+1), id(i, j+1)})
			reg = append(reg, i/2)
		}
	}
	regions, err := Outlines(nodes, cells, reg, []string{"flange", "shell", "unused"})
	if err != nil {
		t.Fatal(err)
	}
	if len(regions) != 2 {
		t.Fatalf("%d regions, want 2 (the unused one left out)", len(regions))
	}
	for k, want := range []struct {
		name   string
		area   float64
		points int
	}{{"flange", 400, 8}, {"shell", 200, 6}} {
		r := regions[k]
		if r.Name != want.name || len(r.Loops) != 1 {
			t.Fatalf("region %d: %q with %d loops, want %q with 1", k, r.Name, len(r.Loops), want.name)
		}
		if a := shoelace(r.Loops[0]); math.Abs(a-want.area) > 1e-9 {
			t.Errorf("%s: loop area %v mm², want %v mm² (positive: counter-clockwise)", r.Name, a, want.area)
		}
		if n := len(r.Loops[0]); n != want.points {
			t.Errorf("%s: %d loop points, want %d", r.Name, n, want.points)
		}
	}

	// One Quad8 cell: the loop has 8 points, the midside nodes between the corners.
	q8 := [][2]float64{{0, 0}, {2, 0}, {2, 2}, {0, 2}, {1, -0.5}, {2.5, 1}, {1, 2}, {0, 1}}
	regions, err = Outlines(q8, [][]int{{0, 1, 2, 3, 4, 5, 6, 7}}, []int{0}, []string{"bolt"})
	if err != nil {
		t.Fatal(err)
	}
	loop := regions[0].Loops[0]
	want := [][2]float64{{0, 0}, {1, -0.5}, {2, 0}, {2.5, 1}, {2, 2}, {1, 2}, {0, 2}, {0, 1}}
	for i := range want {
		if loop[i] != want[i] {
			t.Fatalf("quad8 loop %v, want %v", loop, want)
		}
	}

	if _, err := Outlines(nodes, cells, reg[:2], nil); err == nil {
		t.Error("region numbers of the wrong length accepted")
	}
	reg[0] = 5
	if _, err := Outlines(nodes, cells, reg, []string{"a", "b"}); err == nil || !strings.Contains(err.Error(), "region 5") {
		t.Errorf("region out of range: error %v", err)
	}
}

// TestOutlinesExampleMesh: the outline of every region of the example
// mesh encloses exactly the area of its cells.
func TestOutlinesExampleMesh(t *testing.T) {
	m := exampleMesh()
	regions, err := Outlines(m.nodes, m.cells, m.region, m.names)
	if err != nil {
		t.Fatal(err)
	}
	for k, r := range regions {
		var cellArea float64
		for i, c := range m.cells {
			if m.region[i] == k {
				cellArea += shoelace(cellPolygon(m.nodes, c))
			}
		}
		var loopArea float64
		for _, l := range r.Loops {
			loopArea += shoelace(l)
		}
		if math.Abs(loopArea-cellArea) > 1e-6*cellArea {
			t.Errorf("%s: outline encloses %v mm², cells cover %v mm²", r.Name, loopArea, cellArea)
		}
	}
}

func shoelace(pts [][2]float64) float64 {
	var a float64
	for i, p := range pts {
		q := pts[(i+1)%len(pts)]
		a += p[0]*q[1] - q[0]*p[1]
	}
	return a / 2
}
