package ring

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// FuzzReadSurvey feeds the survey reader any text: it must return a
// survey whose positions and gaps keep its rules, or a *SurveyError,
// never panic.
func FuzzReadSurvey(f *testing.F) {
	for _, s := range []string{
		"bolt,gap_inner_mm,gap_outer_mm\n1,0,0\n10,0.3,0\n",
		"angle_deg,upper_inner_mm,upper_outer_mm,lower_inner_mm,lower_outer_mm\n0,0.1,0,0,0\n180,0,0.2,0.1,0\n",
		"# c\nbolt,gap_inner_mm,gap_outer_mm\n1,\"0\",0\n",
		"angle_deg,gap_inner_mm,gap_outer_mm\n359.999,5,5\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		s, err := ReadSurvey(strings.NewReader(text), "f.csv", 120)
		if err != nil {
			var se *SurveyError
			if !errors.As(err, &se) {
				t.Fatalf("error %v is not a *SurveyError", err)
			}
			return
		}
		for _, p := range s.Points {
			if !(p.Angle >= 0 && p.Angle < 360) || !(p.Inner >= 0 && p.Inner <= 2*MaxGap) || !(p.Outer >= 0 && p.Outer <= 2*MaxGap) {
				t.Fatalf("point %+v breaks the rules", p)
			}
		}
		for _, a := range []float64{0, 1.5, 359.9} {
			in, out := s.At(a)
			if math.IsNaN(in) || math.IsNaN(out) || in < 0 || out < 0 {
				t.Fatalf("At(%g) = %g, %g", a, in, out)
			}
		}
	})
}
