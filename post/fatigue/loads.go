package fatigue

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Tower is the tower section at the joint, for turning its bending moment
// and normal force into the segment force of the most loaded bolt.
type Tower struct {
	Diameter float64 // D_t, shell mid-surface diameter, mm
	Bolts    int     // n, bolts around the circumference
}

// SegmentForce returns Z = 4·M/(n·D_t) − N/n (N) for a bending moment M
// (N·mm) and a normal force N (N), common practice for ring flanges: the
// beam stress M/(π·R²·t) and N/(2π·R·t) over one segment width 2π·R/n.
// Signs: M positive puts the segment in tension (the segment on the
// tension side of the bending, the one a fatigue check looks at); N
// positive in compression, as the tower's own weight acts; Z positive in
// tension.
func (t Tower) SegmentForce(m, n float64) float64 {
	b := float64(t.Bolts)
	return 4*m/(b*t.Diameter) - n/b
}

func (t Tower) validate() error {
	if !(t.Diameter > 0) || math.IsInf(t.Diameter, 0) {
		return fmt.Errorf("tower diameter D_t = %v mm: must be a finite number > 0", t.Diameter)
	}
	if t.Bolts < 1 {
		return fmt.Errorf("tower bolts n = %d: must be ≥ 1", t.Bolts)
	}
	return nil
}

// LoadKind is the layout of a load file.
type LoadKind int

// The layouts ReadLoads knows, by their header columns (in any order).
const (
	// SegmentSeries: "Z_kN", optionally "time_s" — a segment-force time series.
	SegmentSeries LoadKind = iota
	// TowerSeries: "moment_kNm,normal_force_kN", optionally "time_s" — a
	// time series of the tower section, turned into Z by Tower.
	TowerSeries
	// SegmentTable: "Z_range_kN,Z_mean_kN,cycles" — a range–mean–cycles
	// table of the segment force.
	SegmentTable
	// TowerTable: "moment_range_kNm,moment_mean_kNm,normal_force_kN,cycles"
	// — a moment spectrum with the normal force that goes with each row.
	TowerTable
)

type layout struct {
	kind     LoadKind
	required []string
	optional []string
	text     string
}

func layouts() []layout {
	return []layout{
		{SegmentSeries, []string{"Z_kN"}, []string{"time_s"}, "segment-force time series"},
		{TowerSeries, []string{"moment_kNm", "normal_force_kN"}, []string{"time_s"}, "tower-section time series (moment and normal force)"},
		{SegmentTable, []string{"Z_range_kN", "Z_mean_kN", "cycles"}, nil, "segment-force range–mean–cycles table"},
		{TowerTable, []string{"moment_range_kNm", "moment_mean_kNm", "normal_force_kN", "cycles"}, nil, "tower-section moment range–mean–cycles table"},
	}
}

// String describes the layout in words.
func (k LoadKind) String() string {
	for _, l := range layouts() {
		if l.kind == k {
			return l.text
		}
	}
	return fmt.Sprintf("LoadKind(%d)", int(k))
}

// Series reports whether the layout is a time series (counted by rainflow).
func (k LoadKind) Series() bool { return k == SegmentSeries || k == TowerSeries }

// LoadHeaders returns the header of each layout, for help texts.
func LoadHeaders() []string {
	var out []string
	for _, l := range layouts() {
		h := strings.Join(l.required, ",")
		if len(l.optional) > 0 {
			h = strings.Join(l.optional, ",") + "," + h + "   (" + strings.Join(l.optional, ", ") + " optional)"
		}
		out = append(out, h)
	}
	return out
}

// LoadInfo describes a load file that ReadLoads has read.
type LoadInfo struct {
	Kind       LoadKind
	Rows       int     // data lines
	Cycles     float64 // cycles counted or listed (half cycles count 0.5)
	ZMin, ZMax float64 // extremes of the segment force over all cycles, N
	MaxStack   int     // largest rainflow stack of a time series, turning points
}

// LoadFile is a load file in one of the layouts of LoadKind whose header
// has been read; Read streams the rest. Units in the file: kN, kN·m, s.
// Lines starting with # are comments. Errors name the line, the column,
// the value and the rule.
type LoadFile struct {
	cr    *csv.Reader
	names []string
	l     layout
	col   map[string]int
	done  bool
}

// NewLoadFile reads the header of a load file and finds its layout. No
// line may be longer than MaxLine.
func NewLoadFile(r io.Reader) (*LoadFile, error) {
	cr := csv.NewReader(limitLines(r))
	cr.Comment = '#'
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = true
	head, err := cr.Read()
	if err != nil {
		return nil, fmt.Errorf("load file: header: %w", err)
	}
	names := make([]string, len(head))
	for i, h := range head {
		names[i] = strings.TrimSpace(h)
	}
	l, col, err := match(names)
	if err != nil {
		return nil, err
	}
	return &LoadFile{cr: cr, names: names, l: l, col: col}, nil
}

// Kind returns the file's layout.
func (f *LoadFile) Kind() LoadKind { return f.l.kind }

// Read streams the data lines line by line and hands each segment-force
// cycle (N) to sink: a time series through a rainflow Counter (residue as
// half cycles), a table row as Count cycles from Z_mean − Z_range/2 to
// Z_mean + Z_range/2. Tower layouts are turned into Z with t; segment
// layouts do not use it. A file is read once.
func (f *LoadFile) Read(t Tower, sink func(Cycle) error) (LoadInfo, error) {
	if f.done {
		return LoadInfo{}, errors.New("load file: already read")
	}
	f.done = true
	kind := f.l.kind
	if kind == TowerSeries || kind == TowerTable {
		if err := t.validate(); err != nil {
			return LoadInfo{}, fmt.Errorf("load file: %s: %w", f.l.text, err)
		}
	}
	rd := &loadReader{cr: f.cr, names: f.names, info: LoadInfo{Kind: kind, ZMin: math.Inf(1), ZMax: math.Inf(-1)}}
	track := func(c Cycle) error {
		rd.info.Cycles += c.Count
		rd.info.ZMin, rd.info.ZMax = math.Min(rd.info.ZMin, c.Min()), math.Max(rd.info.ZMax, c.Max())
		return sink(c)
	}
	var err error
	if kind.Series() {
		err = rd.series(kind, f.col, t, track)
	} else {
		err = rd.table(kind, f.col, t, track)
	}
	if rd.info.Cycles == 0 {
		rd.info.ZMin, rd.info.ZMax = 0, 0
	}
	return rd.info, err
}

// ReadLoads reads a load file at once: NewLoadFile, then Read.
func ReadLoads(r io.Reader, t Tower, sink func(Cycle) error) (LoadInfo, error) {
	f, err := NewLoadFile(r)
	if err != nil {
		return LoadInfo{}, err
	}
	return f.Read(t, sink)
}

// match finds the layout whose columns the header names.
func match(names []string) (layout, map[string]int, error) {
	col := map[string]int{}
	for i, n := range names {
		if _, dup := col[n]; dup {
			return layout{}, nil, fmt.Errorf("load file: header: column %q appears twice", n)
		}
		col[n] = i
	}
	for _, l := range layouts() {
		known := append(append([]string(nil), l.required...), l.optional...)
		ok := true
		for _, n := range l.required {
			_, has := col[n]
			ok = ok && has
		}
		for _, n := range names {
			ok = ok && slices.Contains(known, n)
		}
		if ok {
			return l, col, nil
		}
	}
	return layout{}, nil, fmt.Errorf("load file: header %q matches no layout; want one of: %s",
		strings.Join(names, ","), strings.Join(LoadHeaders(), "; "))
}

type loadReader struct {
	cr    *csv.Reader
	names []string
	info  LoadInfo
	line  int
}

// next reads the next data line; it returns nil at the end of the file.
func (rd *loadReader) next() ([]string, error) {
	rec, err := rd.cr.Read()
	if err == io.EOF {
		return nil, nil
	}
	if err != nil {
		return nil, fmt.Errorf("load file: %w", err)
	}
	rd.line, _ = rd.cr.FieldPos(0)
	rd.info.Rows++
	return rec, nil
}

// number parses the named column of rec and checks the rule ok.
func (rd *loadReader) number(rec []string, col map[string]int, name string, ok func(float64) bool, rule string) (float64, error) {
	s := strings.TrimSpace(rec[col[name]])
	x, err := strconv.ParseFloat(s, 64)
	switch {
	case err != nil:
		return 0, fmt.Errorf("load file: line %d: %s = %q: must be a number", rd.line, name, s)
	case !finite(x):
		return 0, fmt.Errorf("load file: line %d: %s = %s: must be finite", rd.line, name, s)
	case ok != nil && !ok(x):
		return 0, fmt.Errorf("load file: line %d: %s = %s: %s", rd.line, name, s, rule)
	}
	return x, nil
}

// overflow is the error of a line whose finite numbers give a segment
// force beyond the range of float64 (from lo to hi, N).
func (rd *loadReader) overflow(lo, hi float64) error {
	return fmt.Errorf("load file: line %d: gives a segment force from %g to %g N: must be finite (a number of the line is far too large)", rd.line, lo, hi)
}

func (rd *loadReader) series(kind LoadKind, col map[string]int, t Tower, sink func(Cycle) error) error {
	c := NewCounter(sink)
	for {
		rec, err := rd.next()
		if err != nil {
			return err
		}
		if rec == nil {
			break
		}
		if _, has := col["time_s"]; has {
			if _, err := rd.number(rec, col, "time_s", nil, ""); err != nil {
				return err
			}
		}
		var z float64
		if kind == SegmentSeries {
			zk, err := rd.number(rec, col, "Z_kN", nil, "")
			if err != nil {
				return err
			}
			z = zk * 1e3
		} else {
			m, err1 := rd.number(rec, col, "moment_kNm", nil, "")
			n, err2 := rd.number(rec, col, "normal_force_kN", nil, "")
			if err := errors.Join(err1, err2); err != nil {
				return err
			}
			z = t.SegmentForce(m*1e6, n*1e3)
		}
		if !finite(z) {
			return rd.overflow(z, z)
		}
		if err := c.Add(z); err != nil {
			return fmt.Errorf("load file: line %d: %w", rd.line, err)
		}
	}
	rd.info.MaxStack = c.MaxStack()
	if err := c.Finish(); err != nil {
		return fmt.Errorf("load file: the residue at the end: %w", err)
	}
	return nil
}

func (rd *loadReader) table(kind LoadKind, col map[string]int, t Tower, sink func(Cycle) error) error {
	nonNegative := func(x float64) bool { return x >= 0 }
	positive := func(x float64) bool { return x > 0 }
	for {
		rec, err := rd.next()
		if err != nil {
			return err
		}
		if rec == nil {
			return nil
		}
		n, err := rd.number(rec, col, "cycles", positive, "must be > 0")
		if err != nil {
			return err
		}
		var lo, hi float64
		if kind == SegmentTable {
			r, err1 := rd.number(rec, col, "Z_range_kN", nonNegative, "must be ≥ 0")
			m, err2 := rd.number(rec, col, "Z_mean_kN", nil, "")
			if err := errors.Join(err1, err2); err != nil {
				return err
			}
			lo, hi = (m-r/2)*1e3, (m+r/2)*1e3
		} else {
			r, err1 := rd.number(rec, col, "moment_range_kNm", nonNegative, "must be ≥ 0")
			m, err2 := rd.number(rec, col, "moment_mean_kNm", nil, "")
			nf, err3 := rd.number(rec, col, "normal_force_kN", nil, "")
			if err := errors.Join(err1, err2, err3); err != nil {
				return err
			}
			lo, hi = t.SegmentForce((m-r/2)*1e6, nf*1e3), t.SegmentForce((m+r/2)*1e6, nf*1e3)
		}
		if !finite(lo) || !finite(hi) {
			return rd.overflow(lo, hi)
		}
		if err := sink(Cycle{From: lo, To: hi, Count: n}); err != nil {
			return fmt.Errorf("load file: line %d: %w", rd.line, err)
		}
	}
}
