package ring

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestReadSurveyErrors(t *testing.T) {
	for _, c := range []struct{ name, text, want string }{
		{"empty", "", "no header"},
		{"unknown column", "bolt,gap_inner,gap_outer_mm\n", `column "gap_inner" is not a survey column`},
		{"two positions", "bolt,angle_deg,gap_inner_mm,gap_outer_mm\n", "exactly one position column"},
		{"no position", "gap_inner_mm,gap_outer_mm\n", "exactly one position column"},
		{"half the gaps", "bolt,gap_inner_mm\n", "go together"},
		{"both ways", "bolt,gap_inner_mm,gap_outer_mm,upper_inner_mm\n", "not both"},
		{"no rows", "# only a comment\nbolt,gap_inner_mm,gap_outer_mm\n", "no measuring positions"},
		{"bolt not whole", "bolt,gap_inner_mm,gap_outer_mm\n1.5,0,0\n", "line 2: bolt = 1.5: must be a whole number from 1 to 12"},
		{"bolt beyond n", "bolt,gap_inner_mm,gap_outer_mm\n13,0,0\n", "line 2: bolt = 13"},
		{"angle 360", "angle_deg,gap_inner_mm,gap_outer_mm\n360,0,0\n", "line 2: angle_deg = 360: must be ≥ 0 and < 360"},
		{"negative gap", "# c\nbolt,gap_inner_mm,gap_outer_mm\n1,0,-0.1\n", "line 3: gap_outer_mm = -0.1: must be ≥ 0"},
		{"microns", "bolt,gap_inner_mm,gap_outer_mm\n1,150,0\n", "gap_inner_mm = 150: must be ≥ 0 and at most 5 mm"},
		{"not a number", "bolt,gap_inner_mm,gap_outer_mm\n1,x,0\n", `line 2: gap_inner_mm = "x": must be a number`},
		{"NaN", "bolt,gap_inner_mm,gap_outer_mm\n1,NaN,0\n", "gap_inner_mm = NaN: must be finite"},
		{"twice", "bolt,gap_inner_mm,gap_outer_mm\n1,0,0\n2,0,0\n1,0.1,0\n", "line 4: this position (0°) is also on line 2"},
		{"short line", "bolt,gap_inner_mm,gap_outer_mm\n1,0\n", "line 2:"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := ReadSurvey(strings.NewReader(c.text), "s.csv", 12)
			var se *SurveyError
			if !errors.As(err, &se) {
				t.Fatalf("error %v, want a *SurveyError", err)
			}
			if !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "survey s.csv: ") {
				t.Errorf("error %q, want it to name the file and contain %q", err, c.want)
			}
		})
	}
}

func TestSurveyInterpolation(t *testing.T) {
	text := "# angles around the circle\nangle_deg,upper_inner_mm,upper_outer_mm,lower_inner_mm,lower_outer_mm\n350,0.2,0,0.1,0\n10,0,0,0,0\n90,0.4,0.2,0,0\n"
	s, err := ReadSurvey(strings.NewReader(text), "s.csv", 120)
	if err != nil {
		t.Fatal(err)
	}
	if !s.EachFace || s.ByBolt {
		t.Errorf("EachFace %v ByBolt %v, want true false", s.EachFace, s.ByBolt)
	}
	for _, c := range []struct{ at, inner, outer float64 }{
		{350, 0.3, 0}, // the faces' depths summed
		{0, 0.15, 0},  // across 360°: half-way from 350° to 10°
		{10, 0, 0},
		{50, 0.2, 0.1},
		{90, 0.4, 0.2},
		{220, 0.35, 0.1}, // half-way from 90° round to 350°
		{-10, 0.3, 0},
	} {
		in, out := s.At(c.at)
		if math.Abs(in-c.inner) > 1e-12 || math.Abs(out-c.outer) > 1e-12 {
			t.Errorf("At(%g) = %g, %g; want %g, %g", c.at, in, out, c.inner, c.outer)
		}
	}
}
