package sweep

import (
	"fmt"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"flangeseg/post"
	"flangeseg/post/results"
	"flangeseg/post/sweep/plan"
)

// maxLegend is the most series a plot names in its legend; with more the
// curves are drawn without names (the table says which is which).
const maxLegend = 10

// FigurePlot is a plot of one joint figure against one varied key.
type FigurePlot struct {
	Stem string // file name without extension, under plots/
	Plot post.Plot
}

// figurePlots plots each compared figure against each key that takes
// numbers, one series for each combination of the other keys.
func figurePlots(p *plan.Plan, recs []Record) []FigurePlot {
	var out []FigurePlot
	keys := Keys(p)
	for _, key := range keys {
		if !numeric(recs, key) {
			continue
		}
		for _, f := range results.ComparedFigures() {
			pl := post.Plot{Title: capital(f.Name), XLabel: key, YLabel: unitLabel(f)}
			pl.Series = figureSeries(keys, key, f, recs)
			if len(pl.Series) > 0 {
				out = append(out, FigurePlot{Stem: f.Column + "__" + fileName(key), Plot: pl})
			}
		}
	}
	return out
}

func figureSeries(keys []string, key string, f results.ComparedFigure, recs []Record) []post.Series {
	var groups []string
	series := map[string]*post.Series{}
	for _, r := range recs {
		x, err := strconv.ParseFloat(r.value(key), 64)
		if err != nil || r.Summary == nil {
			continue
		}
		y, ok := f.Get(*r.Summary)
		if !ok {
			continue
		}
		g := others(keys, key, r)
		s, seen := series[g]
		if !seen {
			s = &post.Series{Name: g, Points: true}
			series[g] = s
			groups = append(groups, g)
		}
		s.X, s.Y = append(s.X, x), append(s.Y, y)
	}
	var out []post.Series
	for _, g := range groups {
		s := series[g]
		sortByX(s)
		if len(groups) > maxLegend || len(groups) == 1 {
			s.Name = ""
		}
		out = append(out, *s)
	}
	return out
}

// others names the values of the keys other than key, e.g.
// "contact.friction = 0.2" (the series of a figure plot).
func others(keys []string, key string, r Record) string {
	var parts []string
	for _, k := range keys {
		if v := r.value(k); k != key && v != "" {
			parts = append(parts, k+" = "+v)
		}
	}
	if len(parts) == 0 {
		return "base"
	}
	return strings.Join(parts, ", ")
}

func sortByX(s *post.Series) {
	idx := make([]int, len(s.X))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return s.X[idx[a]] < s.X[idx[b]] })
	x, y := make([]float64, len(idx)), make([]float64, len(idx))
	for i, j := range idx {
		x[i], y[i] = s.X[j], s.Y[j]
	}
	s.X, s.Y = x, y
}

// numeric reports whether key takes numbers in at least two cases.
func numeric(recs []Record, key string) bool {
	n := 0
	for _, r := range recs {
		if _, err := strconv.ParseFloat(r.value(key), 64); err == nil {
			n++
		}
	}
	return n >= 2
}

func unitLabel(f results.ComparedFigure) string {
	if f.Unit == "1" {
		return f.Name + " [-]"
	}
	return f.Name + " [" + f.Unit + "]"
}

func capital(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// fileName makes a key a file name: "contact.zones[1].from" →
// "contact.zones1.from".
func fileName(key string) string {
	return strings.Map(func(r rune) rune {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '.', r == '_', r == '-':
			return r
		}
		return -1
	}, key)
}

// curvePlots overlays the bolt-force and load–displacement curves of the
// cases that have a history.
func curvePlots(dir string, recs []Record) ([]FigurePlot, error) {
	fsz := post.Plot{Title: "Bolt force against segment force, every case", XLabel: "Z [kN]", YLabel: "F_s [kN]"}
	zu := post.Plot{Title: "Segment force against displacement, every case", XLabel: "u [mm]", YLabel: "Z [kN]"}
	n := 0
	for _, r := range recs {
		if r.Summary != nil {
			n++
		}
	}
	for _, r := range recs {
		if r.Summary == nil {
			continue
		}
		h, err := results.ReadHistoryColumns(filepath.Join(dir, "cases", r.Name, "history.csv"))
		if err != nil {
			return nil, fmt.Errorf("case %d (%s): %w", r.Index, r.Name, err)
		}
		name := r.Name
		if n > maxLegend {
			name = ""
		}
		fsz.Series = append(fsz.Series, post.Series{Name: name, X: h["Z_kN"], Y: h["bolt_force_kN"]})
		zu.Series = append(zu.Series, post.Series{Name: name, X: h["u_mm"], Y: h["Z_kN"]})
	}
	if n == 0 {
		return nil, nil
	}
	return []FigurePlot{{Stem: "cases_Fs_Z", Plot: fsz}, {Stem: "cases_Z_u", Plot: zu}}, nil
}
