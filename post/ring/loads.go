package ring

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"flangeseg/post/fatigue"
)

// Load file columns beyond the fatigue command's tower layouts.
const (
	ColDirection = "direction_deg" // direction θ_M of the moment's tension side, deg
	ColShare     = "share"         // share of the time in a direction sector
)

// Sector is a direction of the tower moment with its share of the time
// (a row of the directions file).
type Sector struct {
	Direction, Share float64
}

// LoadInfo describes the tower loads read for the ring.
type LoadInfo struct {
	Layout     string  `json:"layout"`
	Rows       int     `json:"rows"`
	Directions string  `json:"directions"`
	Cycles     float64 `json:"cycles_per_bolt"` // cycles counted for each bolt (summed over the sectors)
}

// loadLayout is a tower layout of the fatigue command's load file.
type loadLayout struct {
	series   bool
	required []string
}

var ringLayouts = []loadLayout{
	{true, []string{"moment_kNm", "normal_force_kN"}},
	{false, []string{"moment_range_kNm", "moment_mean_kNm", "normal_force_kN", "cycles"}},
}

// SegmentForce is the segment force of the bolt at angle theta (deg) for
// a tower moment m (N·mm) whose tension side points to thetaM (deg) and a
// normal force nf (N, compression positive): Z = 4·M·cos(θ − θ_M)/(n·D) −
// N/n, the beam stress of the tower section over one segment (common
// practice for ring flanges, as fatigue.Tower.SegmentForce for θ = θ_M).
func SegmentForce(t fatigue.Tower, theta, thetaM, m, nf float64) float64 {
	return t.SegmentForce(m*math.Cos((theta-thetaM)*math.Pi/180), nf)
}

// ReadSectors reads a directions file: header direction_deg,share; each
// direction in [0, 360) once, shares ≥ 0 summing to 1 (within 1e-6).
func ReadSectors(r io.Reader, name string) ([]Sector, error) {
	cr := csv.NewReader(io.LimitReader(r, MaxSurveySize))
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	fail := func(line int, format string, args ...any) error {
		return fmt.Errorf("directions %s: line %d: %s", name, line, fmt.Sprintf(format, args...))
	}
	head, err := cr.Read()
	if err != nil {
		return nil, fmt.Errorf("directions %s: header: %w", name, noEOF(err))
	}
	col, err := columns(head, []string{ColDirection, ColShare}, nil)
	if err != nil {
		return nil, fmt.Errorf("directions %s: header: %w", name, err)
	}
	var out []Sector
	var sum float64
	seen := map[float64]int{}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("directions %s: %w", name, err)
		}
		line, _ := cr.FieldPos(0)
		d, err := cell(rec, col, ColDirection, func(x float64) bool { return x >= 0 && x < 360 }, "must be ≥ 0 and < 360")
		if err != nil {
			return nil, fail(line, "%v", err)
		}
		s, err := cell(rec, col, ColShare, func(x float64) bool { return x >= 0 && x <= 1 }, "must be from 0 to 1")
		if err != nil {
			return nil, fail(line, "%v", err)
		}
		if first, dup := seen[d]; dup {
			return nil, fail(line, "%s = %s is also on line %d: give each direction once", ColDirection, formatNumber(d), first)
		}
		seen[d] = line
		out, sum = append(out, Sector{d, s}), sum+s
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("directions %s: no rows: give at least one direction with its share", name)
	}
	if math.Abs(sum-1) > 1e-6 {
		return nil, fmt.Errorf("directions %s: the shares sum to %s: they must sum to 1 (the whole time)", name, formatNumber(sum))
	}
	return out, nil
}

func noEOF(err error) error {
	if errors.Is(err, io.EOF) {
		return errors.New("the file is empty")
	}
	return err
}

// columns maps a header to column indices: every required name, optional
// ones if there, nothing else.
func columns(head, required, optional []string) (map[string]int, error) {
	col := map[string]int{}
	for i, h := range head {
		h = strings.TrimSpace(h)
		if _, dup := col[h]; dup {
			return nil, fmt.Errorf("column %q appears twice", h)
		}
		known := false
		for _, k := range append(append([]string(nil), required...), optional...) {
			known = known || k == h
		}
		if !known {
			return nil, fmt.Errorf("column %q is not one of %s", h, strings.Join(append(append([]string(nil), required...), optional...), ", "))
		}
		col[h] = i
	}
	for _, k := range required {
		if _, ok := col[k]; !ok {
			return nil, fmt.Errorf("column %q is missing (want %s)", k, strings.Join(required, ","))
		}
	}
	return col, nil
}

// cell parses the named column of a record and checks a rule.
func cell(rec []string, col map[string]int, name string, ok func(float64) bool, rule string) (float64, error) {
	i := col[name]
	if i >= len(rec) {
		return 0, fmt.Errorf("%s: the line has no such field", name)
	}
	text := strings.TrimSpace(rec[i])
	x, err := strconv.ParseFloat(text, 64)
	switch {
	case err != nil:
		return 0, fmt.Errorf("%s = %q: must be a number", name, text)
	case math.IsNaN(x) || math.IsInf(x, 0):
		return 0, fmt.Errorf("%s = %s: must be finite", name, text)
	case ok != nil && !ok(x):
		return 0, fmt.Errorf("%s = %s: %s", name, text, rule)
	}
	return x, nil
}

// StreamLoads reads tower loads — the fatigue command's tower layouts
// (moment_kNm,normal_force_kN time series, optionally time_s; or
// moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles tables), each
// optionally with a direction_deg column — and hands every bolt (index
// into angles, deg) its segment-force cycles (N) through sink. The
// direction comes from the direction_deg column, else from sectors (each
// row in every sector, its cycles times the sector's share), else each
// bolt is taken as the most loaded one (θ_M = θ, as the fatigue command
// does for its one segment). A time series is counted by rainflow
// (ASTM E1049-85) for each bolt and sector.
func StreamLoads(r io.Reader, name string, t fatigue.Tower, angles []float64, sectors []Sector, sink func(bolt int, c fatigue.Cycle) error) (LoadInfo, error) {
	if sink == nil {
		sink = func(int, fatigue.Cycle) error { return nil }
	}
	cr := csv.NewReader(r)
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = true
	head, err := cr.Read()
	if err != nil {
		return LoadInfo{}, fmt.Errorf("loads %s: header: %w", name, noEOF(err))
	}
	var lay loadLayout
	var col map[string]int
	var errs []string
	for _, l := range ringLayouts {
		opt := []string{ColDirection}
		if l.series {
			opt = append(opt, "time_s")
		}
		c, err := columns(head, l.required, opt)
		if err == nil {
			lay, col = l, c
			break
		}
		errs = append(errs, err.Error())
	}
	if col == nil {
		return LoadInfo{}, fmt.Errorf("loads %s: header %q is not a tower layout: want moment_kNm,normal_force_kN (time series, time_s optional) or moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles (table), each with direction_deg optional; a segment-force file (Z_kN …) has no direction and cannot be shared round the ring", name, strings.Join(head, ","))
	}
	_, perRow := col[ColDirection]
	if perRow && len(sectors) > 0 {
		return LoadInfo{}, fmt.Errorf("loads %s: the file has a %s column and --directions gives sectors: give the direction one way", name, ColDirection)
	}
	info := LoadInfo{Layout: "tower-section time series", Directions: "each bolt as the most loaded (θ_M = θ)"}
	if !lay.series {
		info.Layout = "tower-section moment range–mean–cycles table"
	}
	switch {
	case perRow:
		info.Directions = "per row (direction_deg)"
	case len(sectors) > 0:
		info.Directions = fmt.Sprintf("%d sectors with their shares", len(sectors))
	default:
		sectors = nil
	}
	ways := sectors
	if len(ways) == 0 {
		ways = []Sector{{Share: 1}}
	}
	direction := func(rec []string, s Sector, bolt int) (float64, error) {
		switch {
		case perRow:
			return cell(rec, col, ColDirection, func(x float64) bool { return x >= 0 && x < 360 }, "must be ≥ 0 and < 360")
		case len(sectors) > 0:
			return s.Direction, nil
		}
		return angles[bolt], nil
	}
	var counters [][]*fatigue.Counter // [bolt][sector]
	if lay.series {
		counters = make([][]*fatigue.Counter, len(angles))
		for b := range angles {
			for _, s := range ways {
				share := s.Share
				counters[b] = append(counters[b], fatigue.NewCounter(func(c fatigue.Cycle) error {
					c.Count *= share
					if c.Count == 0 {
						return nil
					}
					info.Cycles += c.Count / float64(len(angles))
					return sink(b, c)
				}))
			}
		}
	}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return info, fmt.Errorf("loads %s: %w", name, err)
		}
		line, _ := cr.FieldPos(0)
		info.Rows++
		fail := func(err error) error { return fmt.Errorf("loads %s: line %d: %w", name, line, err) }
		if len(rec) != len(head) {
			return info, fail(fmt.Errorf("%d fields: the header has %d", len(rec), len(head)))
		}
		if _, ok := col["time_s"]; ok {
			if _, err := cell(rec, col, "time_s", nil, ""); err != nil {
				return info, fail(err)
			}
		}
		nf, err := cell(rec, col, "normal_force_kN", nil, "")
		if err != nil {
			return info, fail(err)
		}
		if lay.series {
			m, err := cell(rec, col, "moment_kNm", nil, "")
			if err != nil {
				return info, fail(err)
			}
			for b, th := range angles {
				for k, s := range ways {
					dir, err := direction(rec, s, b)
					if err != nil {
						return info, fail(err)
					}
					if err := counters[b][k].Add(SegmentForce(t, th, dir, m*1e6, nf*1e3)); err != nil {
						return info, fail(err)
					}
				}
			}
			continue
		}
		rng, err := cell(rec, col, "moment_range_kNm", func(x float64) bool { return x >= 0 }, "must be ≥ 0")
		if err != nil {
			return info, fail(err)
		}
		mean, err := cell(rec, col, "moment_mean_kNm", nil, "")
		if err != nil {
			return info, fail(err)
		}
		n, err := cell(rec, col, "cycles", func(x float64) bool { return x > 0 }, "must be > 0")
		if err != nil {
			return info, fail(err)
		}
		for b, th := range angles {
			for _, s := range ways {
				dir, err := direction(rec, s, b)
				if err != nil {
					return info, fail(err)
				}
				c := fatigue.Cycle{From: SegmentForce(t, th, dir, (mean-rng/2)*1e6, nf*1e3),
					To: SegmentForce(t, th, dir, (mean+rng/2)*1e6, nf*1e3), Count: n * s.Share}
				if c.Count == 0 {
					continue
				}
				if math.IsInf(c.From, 0) || math.IsInf(c.To, 0) {
					return info, fail(fmt.Errorf("gives a segment force beyond the range of numbers: a value of the line is far too large"))
				}
				info.Cycles += c.Count / float64(len(angles))
				if err := sink(b, c); err != nil {
					return info, fail(err)
				}
			}
		}
	}
	if lay.series {
		for b := range counters {
			for _, c := range counters[b] {
				if err := c.Finish(); err != nil {
					return info, fmt.Errorf("loads %s: the residue at the end: %w", name, err)
				}
			}
		}
	}
	if info.Rows == 0 {
		return info, fmt.Errorf("loads %s: no data lines", name)
	}
	return info, nil
}
