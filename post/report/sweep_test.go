package report

import (
	"bytes"
	"io"
	"regexp"
	"strings"
	"testing"

	"flangeseg/post"
)

// exampleSweep is a sweep page of three invented cases, one of which
// stopped.
func exampleSweep() Sweep {
	s := Sweep{Title: "Tower joint T3 — recess depth", Plan: "t3-recess.toml", Generated: "flangeseg test", Caution: "Design aid: check it.",
		Setup: Quantities{Caption: "What the sweep varies", Rows: []Quantity{
			{Name: "base model", Value: Text("t3-bands.toml"), Source: "plan file"},
			{Name: "contact.recess", Value: Text("0.1, 0.2, 0.3"), Source: "plan file, vary[0]"},
		}},
		Cases: Table{Caption: "One row a case", Source: "the case runs",
			Columns: []Column{{Heading: "case"}, {Heading: "contact.recess"}, {Heading: "opening load", Unit: "kN"}}},
		NotDone: Table{Caption: "Cases that did not run to their end", Source: "case.json",
			Columns: []Column{{Heading: "case"}, {Heading: "reason"}},
			Rows:    [][]Cell{{Text("3"), Text("preload: the gap did not close")}}},
	}
	for i, r := range []float64{0.1, 0.2, 0.3} {
		open := Num(300-400*r, "kN")
		if i == 2 {
			open = Missing("kN")
		}
		s.Cases.Rows = append(s.Cases.Rows, []Cell{Text(strings.Repeat("I", i+1)), Num(r, "mm"), open})
	}
	s.Figures = []post.Plot{{Title: "Opening load against contact.recess", XLabel: "contact.recess", YLabel: "opening load [kN]",
		Series: []post.Series{{X: []float64{0.1, 0.2}, Y: []float64{260, 220}, Points: true}}}}
	return s
}

// sweepSections are the numbered sections of a sweep page, in order.
var sweepSections = []string{
	"1 Plan",
	"2 Cases",
	"3 Cases that did not finish",
	"4 Joint figures against the varied values",
	"5 Curves of every case",
	"6 Notes",
	"7 Limits of use",
}

func TestSweepPage(t *testing.T) {
	var a, b bytes.Buffer
	if err := EncodeSweep(&a, exampleSweep()); err != nil {
		t.Fatal(err)
	}
	if err := EncodeSweep(&b, exampleSweep()); err != nil || !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Errorf("two encodings of one sweep differ (%v)", err)
	}
	page := a.String()
	heads := regexp.MustCompile(`<h2 id="s[0-9-]+"><span class="num">([0-9]+)</span> ([^<]+)</h2>`).FindAllStringSubmatch(page, -1)
	if len(heads) != len(sweepSections) {
		t.Fatalf("%d sections, want %d: %v", len(heads), len(sweepSections), heads)
	}
	for i, h := range heads {
		if got := h[1] + " " + h[2]; got != sweepSections[i] {
			t.Errorf("section %q, want %q", got, sweepSections[i])
		}
	}
	for _, w := range []string{"preload: the gap did not close", "No case has a history.", "Design aid: check it.", "t3-recess.toml"} {
		if !strings.Contains(page, w) {
			t.Errorf("the page lacks %q", w)
		}
	}
}

func TestSweepValidate(t *testing.T) {
	for _, tc := range []struct {
		name string
		edit func(s *Sweep)
		want string
	}{
		{"no caution", func(s *Sweep) { s.Caution = " " }, "Caution is empty"},
		{"no title", func(s *Sweep) { s.Title = "" }, "Title is empty"},
		{"no source", func(s *Sweep) { s.Cases.Source = "" }, "Cases"},
		{"short row", func(s *Sweep) { s.NotDone.Rows[0] = s.NotDone.Rows[0][:1] }, "NotDone"},
		{"setup without source", func(s *Sweep) { s.Setup.Rows[1].Source = "" }, "Setup"},
	} {
		s := exampleSweep()
		tc.edit(&s)
		if err := EncodeSweep(io.Discard, s); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one naming %q", tc.name, err, tc.want)
		}
	}
}
