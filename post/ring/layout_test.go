package ring

import (
	"math"
	"os"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

const demoModel = "../../cmd/flangeseg/demo/flat.toml"

func demoSpec(t *testing.T) *modelfile.Spec {
	t.Helper()
	spec, err := modelfile.Load(demoModel)
	if err != nil {
		t.Fatal(err)
	}
	return spec
}

func survey(t *testing.T, text string, n int) *Survey {
	t.Helper()
	s, err := ReadSurvey(strings.NewReader(text), "s.csv", n)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestBoltsFromSurvey checks the conventions of the survey: the taper's
// sign (contact.taper > 0 opens towards the free edge, the inner edge of
// an internal flange), the gap the ring rests on taken off, the runs of
// open bolts and their springs, the classes.
func TestBoltsFromSurvey(t *testing.T) {
	spec := demoSpec(t)
	w := spec.Flange.A + spec.Flange.B + spec.Shell.Thickness/2
	// Everywhere 0.05 mm at the outer edge (the ring rests there), the
	// inner edge open by 0.3 mm more at bolt 10; bolts 40–44 open by
	// 0.2 mm over the whole face.
	s := survey(t, "bolt,gap_inner_mm,gap_outer_mm\n1,0.05,0.05\n9,0.05,0.05\n10,0.35,0.05\n11,0.05,0.05\n39,0.05,0.05\n40,0.25,0.25\n44,0.25,0.25\n45,0.05,0.05\n", 120)
	bolts, err := Bolts(spec, s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	wantTaper := roundTo(math.Atan(0.3/(2*w))*180/math.Pi, DefaultTaperTolerance)
	if b := bolts[9]; b.Taper != wantTaper || b.Taper <= 0 || b.Parallel != 0 || b.Spring != 0 {
		t.Errorf("bolt 10: taper %g° parallel %g mm spring %g, want taper %g° (> 0: open at the free edge), no parallel gap, no spring", b.Taper, b.Parallel, b.Spring, wantTaper)
	}
	ext, err := Bolts(spec, s, Options{Flange: External})
	if err != nil {
		t.Fatal(err)
	}
	if ext[9].Taper != -wantTaper {
		t.Errorf("external flange: bolt 10 taper %g°, want %g° (open at the shell side)", ext[9].Taper, -wantTaper)
	}
	for i, b := range bolts {
		open := b.Number >= 40 && b.Number <= 44
		if (b.Parallel > 0) != open || (open && (b.Parallel != 0.2 || b.Run != 5 || b.Span != 6*spec.Derive().SegmentWidth || !(b.Spring > 0))) {
			t.Errorf("bolt %d: parallel %g run %d span %g spring %g; want open = %v (0.2 mm, run 5, span 6c)", i+1, b.Parallel, b.Run, b.Span, b.Spring, open)
		}
	}
	if !(bolts[39].Spring > bolts[41].Spring) || bolts[39].Spring != bolts[43].Spring {
		t.Errorf("run 40–44: springs %g, %g, %g: want the ends alike and stiffer than the middle", bolts[39].Spring, bolts[41].Spring, bolts[43].Spring)
	}
	p, err := NewPlan(spec, demoModel, nil, "s.csv", Options{}, bolts)
	if err == nil {
		t.Fatal("a plan without the model's text: no error")
	}
	text := []byte(mustRead(t, demoModel))
	p, err = NewPlan(spec, demoModel, text, "s.csv", Options{}, bolts)
	if err != nil {
		t.Fatal(err)
	}
	// flat; taper at bolt 10; the run's ends, its second and fourth bolts, its middle.
	if len(p.Classes) != 5 || p.Classes[0].Parallel != 0 || p.Classes[0].Taper != 0 || len(p.Classes[0].Bolts) != 114 {
		t.Fatalf("classes %+v, want 5 with the flat one first (114 bolts)", p.Classes)
	}
	for _, c := range p.Cases {
		if c.Spec.Contact.GapSpring > 0 != (c.Spec.Contact.ParallelGap > 0) {
			t.Errorf("%s: gap_spring %g with parallel_gap %g", c.Name, c.Spec.Contact.GapSpring, c.Spec.Contact.ParallelGap)
		}
	}
}

// TestZeroSurveyIsTheFlatModel: an all-zero survey makes one class whose
// model resolves to the model file itself, so every bolt gets exactly the
// flat segment's analysis (the FE run is checked in cmd/flangeseg).
func TestZeroSurveyIsTheFlatModel(t *testing.T) {
	spec := demoSpec(t)
	bolts, err := Bolts(spec, survey(t, "angle_deg,gap_inner_mm,gap_outer_mm\n0,0,0\n", 120), Options{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := NewPlan(spec, demoModel, []byte(mustRead(t, demoModel)), "s.csv", Options{}, bolts)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Cases) != 1 {
		t.Fatalf("%d classes, want 1", len(p.Cases))
	}
	a, _ := p.Cases[0].Spec.ResolvedTOML()
	b, _ := spec.ResolvedTOML()
	if string(a) != string(b) {
		t.Errorf("the zero class's resolved model differs from the model file's:\n%s\n---\n%s", a, b)
	}
}

func mustRead(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}
