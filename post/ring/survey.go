package ring

import (
	"cmp"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// MaxSurveySize bounds a survey file, bytes: a ring of a few hundred
// measuring positions is a few kilobytes.
const MaxSurveySize = 1 << 20

// MaxGap is the largest gap a survey may give, mm: a flatness deviation
// of a machined flange face is tenths of a millimetre; more than this is
// a unit mistake (µm for mm) or a joint that is not a flange pair at all.
const MaxGap = 5.0

// The survey's columns, units in their names.
const (
	ColBolt       = "bolt"           // bolt number, 1 … n
	ColAngle      = "angle_deg"      // angle of the position, deg
	ColGapInner   = "gap_inner_mm"   // gap between the faces at the inner edge
	ColGapOuter   = "gap_outer_mm"   // gap between the faces at the outer edge
	ColUpperInner = "upper_inner_mm" // the upper face's own depth below flat, inner edge
	ColUpperOuter = "upper_outer_mm"
	ColLowerInner = "lower_inner_mm"
	ColLowerOuter = "lower_outer_mm"
)

// Point is one measuring position of a survey: the gap between the two
// faces at the inner and at the outer edge of the face before tightening
// (the two faces' depths summed where the survey gives each face).
type Point struct {
	Line         int     // line of the file
	Angle        float64 // deg, [0, 360)
	Inner, Outer float64 // mm, ≥ 0
}

// Survey is a flatness survey of the ring: its positions in order of
// angle. Between them the gaps are interpolated linearly in the angle,
// around the circle (the last position joins the first).
type Survey struct {
	Points []Point
	// ByBolt: the positions were given as bolt numbers; EachFace: the
	// survey gave each face's depth, summed into the gap.
	ByBolt, EachFace bool
}

// SurveyError is a survey that breaks a rule: the file, and the line,
// column, value and rule of the first problem.
type SurveyError struct {
	File string
	Line int // 0 for the file as a whole
	Msg  string
}

func (e *SurveyError) Error() string {
	if e.Line == 0 {
		return fmt.Sprintf("survey %s: %s", e.File, e.Msg)
	}
	return fmt.Sprintf("survey %s: line %d: %s", e.File, e.Line, e.Msg)
}

// ReadSurvey reads a survey (CSV, # comments, the header naming the
// columns with their units) for a ring of n bolts; name is the file as
// messages call it. The header has one position column, bolt or
// angle_deg, and either gap_inner_mm and gap_outer_mm (the gap between
// the faces, e.g. by feeler gauge) or upper_inner_mm, upper_outer_mm,
// lower_inner_mm and lower_outer_mm (each face's depth below a flat
// plane, e.g. by laser, summed into the gap). Bolt k stands at
// (k − 1)·360/n degrees.
func ReadSurvey(r io.Reader, name string, n int) (*Survey, error) {
	fail := func(line int, format string, args ...any) error {
		return &SurveyError{File: name, Line: line, Msg: fmt.Sprintf(format, args...)}
	}
	if n < 1 {
		return nil, fail(0, "tower.bolts = %d: must be ≥ 1", n)
	}
	data, err := io.ReadAll(io.LimitReader(r, MaxSurveySize+1))
	if err != nil {
		return nil, fail(0, "%v", err)
	}
	if len(data) > MaxSurveySize {
		return nil, fail(0, "file size = %d bytes or more: must be at most %d bytes (a survey is a few kilobytes)", MaxSurveySize+1, MaxSurveySize)
	}
	cr := csv.NewReader(strings.NewReader(string(data)))
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	head, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fail(0, "no header: want a position column (%s or %s) and the gaps (%s, %s; or %s, %s, %s, %s)",
			ColBolt, ColAngle, ColGapInner, ColGapOuter, ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter)
	}
	if err != nil {
		return nil, csvError(name, err)
	}
	line, _ := cr.FieldPos(0)
	col := map[string]int{}
	for i, h := range head {
		h = strings.TrimSpace(h)
		if _, dup := col[h]; dup {
			return nil, fail(line, "header: column %q appears twice", h)
		}
		switch h {
		case ColBolt, ColAngle, ColGapInner, ColGapOuter, ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter:
		default:
			return nil, fail(line, "header: column %q is not a survey column: want %s or %s, then %s and %s, or %s, %s, %s and %s (units in the names: mm, deg)",
				h, ColBolt, ColAngle, ColGapInner, ColGapOuter, ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter)
		}
		col[h] = i
	}
	_, byBolt := col[ColBolt]
	_, byAngle := col[ColAngle]
	if byBolt == byAngle {
		return nil, fail(line, "header: give exactly one position column, %s (1 … %d) or %s (0 ≤ angle < 360)", ColBolt, n, ColAngle)
	}
	gapCols := []string{ColGapInner, ColGapOuter}
	faceCols := []string{ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter}
	has := func(cs []string) (all, any bool) {
		all = true
		for _, c := range cs {
			_, ok := col[c]
			all, any = all && ok, any || ok
		}
		return all, any
	}
	gapAll, gapAny := has(gapCols)
	faceAll, faceAny := has(faceCols)
	switch {
	case gapAny && faceAny:
		return nil, fail(line, "header: give the gap between the faces (%s, %s) or each face's depth (%s, %s, %s, %s), not both",
			ColGapInner, ColGapOuter, ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter)
	case gapAny && !gapAll:
		return nil, fail(line, "header: %s and %s go together: the gap at both edges of the face", ColGapInner, ColGapOuter)
	case faceAny && !faceAll:
		return nil, fail(line, "header: %s, %s, %s and %s go together: each face's depth at both edges", ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter)
	case !gapAny && !faceAny:
		return nil, fail(line, "header: the gaps are missing: give %s and %s, or %s, %s, %s and %s",
			ColGapInner, ColGapOuter, ColUpperInner, ColUpperOuter, ColLowerInner, ColLowerOuter)
	}
	s := &Survey{ByBolt: byBolt, EachFace: faceAll}
	seen := map[float64]int{}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, csvError(name, err)
		}
		line, _ := cr.FieldPos(0)
		if len(rec) != len(head) {
			return nil, fail(line, "%d fields: the header has %d", len(rec), len(head))
		}
		num := func(c string) (float64, error) {
			text := strings.TrimSpace(rec[col[c]])
			x, err := strconv.ParseFloat(text, 64)
			switch {
			case err != nil:
				return 0, fail(line, "%s = %q: must be a number", c, text)
			case math.IsNaN(x) || math.IsInf(x, 0):
				return 0, fail(line, "%s = %s: must be finite", c, text)
			}
			return x, nil
		}
		var p Point
		p.Line = line
		if byBolt {
			b, err := num(ColBolt)
			if err != nil {
				return nil, err
			}
			if b != math.Trunc(b) || b < 1 || b > float64(n) {
				return nil, fail(line, "%s = %s: must be a whole number from 1 to %d (tower.bolts)", ColBolt, strings.TrimSpace(rec[col[ColBolt]]), n)
			}
			p.Angle = (b - 1) * 360 / float64(n)
		} else {
			a, err := num(ColAngle)
			if err != nil {
				return nil, err
			}
			if a < 0 || a >= 360 {
				return nil, fail(line, "%s = %s: must be ≥ 0 and < 360 (degrees around the circle)", ColAngle, strings.TrimSpace(rec[col[ColAngle]]))
			}
			p.Angle = a
		}
		if first, dup := seen[p.Angle]; dup {
			return nil, fail(line, "this position (%s°) is also on line %d: give each position once", formatNumber(p.Angle), first)
		}
		seen[p.Angle] = line
		gaps := gapCols
		if s.EachFace {
			gaps = faceCols
		}
		v := make([]float64, len(gaps))
		for i, c := range gaps {
			x, err := num(c)
			if err != nil {
				return nil, err
			}
			if x < 0 || x > MaxGap {
				rule := fmt.Sprintf("must be ≥ 0 and at most %s mm (a gap before tightening, in mm)", formatNumber(MaxGap))
				if s.EachFace {
					rule = fmt.Sprintf("must be ≥ 0 and at most %s mm (the face's depth below a flat plane through its highest points, in mm)", formatNumber(MaxGap))
				}
				return nil, fail(line, "%s = %s: %s", c, strings.TrimSpace(rec[col[c]]), rule)
			}
			v[i] = x
		}
		p.Inner, p.Outer = v[0], v[1]
		if s.EachFace {
			p.Inner, p.Outer = v[0]+v[2], v[1]+v[3]
		}
		s.Points = append(s.Points, p)
	}
	if len(s.Points) == 0 {
		return nil, fail(0, "no measuring positions: give at least one data line under the header")
	}
	slices.SortStableFunc(s.Points, func(a, b Point) int { return cmp.Compare(a.Angle, b.Angle) })
	return s, nil
}

// csvError turns a CSV syntax error into a SurveyError with its line.
func csvError(name string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &SurveyError{File: name, Line: pe.Line, Msg: pe.Err.Error()}
	}
	return &SurveyError{File: name, Msg: err.Error()}
}

// At is the gap at the inner and outer edge at angle theta (deg): linear
// in the angle between the neighbouring positions, around the circle.
func (s *Survey) At(theta float64) (inner, outer float64) {
	pts := s.Points
	if len(pts) == 1 {
		return pts[0].Inner, pts[0].Outer
	}
	theta = math.Mod(theta, 360)
	if theta < 0 {
		theta += 360
	}
	// The position at or after theta, and the one before it, wrapping.
	j, _ := slices.BinarySearchFunc(pts, theta, func(p Point, t float64) int { return cmp.Compare(p.Angle, t) })
	if j < len(pts) && pts[j].Angle == theta {
		return pts[j].Inner, pts[j].Outer
	}
	hi := j % len(pts)
	lo := (j - 1 + len(pts)) % len(pts)
	a0, a1 := pts[lo].Angle, pts[hi].Angle
	if a1 <= a0 {
		a1 += 360
	}
	t := theta
	if t < a0 {
		t += 360
	}
	w := (t - a0) / (a1 - a0)
	return pts[lo].Inner + w*(pts[hi].Inner-pts[lo].Inner), pts[lo].Outer + w*(pts[hi].Outer-pts[lo].Outer)
}

// formatNumber writes a number as the survey or the model file would.
func formatNumber(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

// parseNumber reads a number this package has formatted.
func parseNumber(s string) (float64, error) { return strconv.ParseFloat(s, 64) }
