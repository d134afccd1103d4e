package sweep

import (
	"encoding/csv"
	"io"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"

	"flangeseg/fem/segment/figures"
	"flangeseg/post"
	"flangeseg/post/sweep/plan"
)

// TimeColumn is the column of sweep.csv (and the key of sweep.json) that
// holds each case's wall-clock time: the only one that differs between
// two runs of one sweep.
const TimeColumn = "time_s"

// Keys are the varied keys of a plan, the columns of its table: the
// [[vary]] keys in order, then the keys only named cases set.
func Keys(p *plan.Plan) []string {
	var keys []string
	seen := map[string]bool{}
	add := func(k string) {
		if !seen[k] {
			seen[k] = true
			keys = append(keys, k)
		}
	}
	for _, v := range p.Vary {
		add(v.Key)
	}
	for _, n := range p.Named {
		for _, s := range n.Set {
			add(s.Key)
		}
	}
	return keys
}

// value is the case's value of key, "" where it keeps the base's.
func (r Record) value(key string) string {
	for _, v := range r.Values {
		if v.Key == key {
			return v.Value
		}
	}
	return ""
}

// figureColumn is one joint figure of summary.json as a column.
type figureColumn struct {
	Name string
	get  func(j reflect.Value) string
}

// figureColumns are the joint figures of summary.json (figures.Joint),
// in its order, nested ones as "face_closure.note"; lists are left out.
func figureColumns() []figureColumn {
	return structColumns("", reflect.TypeOf(figures.Joint{}), func(v reflect.Value) reflect.Value { return v })
}

func structColumns(prefix string, t reflect.Type, at func(reflect.Value) reflect.Value) []figureColumn {
	var cols []figureColumn
	for i := range t.NumField() {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if name == "" || name == "-" {
			continue
		}
		name = prefix + name
		field := func(v reflect.Value) reflect.Value {
			v = at(v)
			if !v.IsValid() {
				return v
			}
			return v.Field(i)
		}
		ft := f.Type
		if ft.Kind() == reflect.Pointer && ft.Elem().Kind() == reflect.Struct {
			cols = append(cols, structColumns(name+".", ft.Elem(), func(v reflect.Value) reflect.Value {
				p := field(v)
				if !p.IsValid() || p.IsNil() {
					return reflect.Value{}
				}
				return p.Elem()
			})...)
			continue
		}
		if ft.Kind() == reflect.Slice {
			continue
		}
		cols = append(cols, figureColumn{Name: name, get: func(v reflect.Value) string { return cell(field(v)) }})
	}
	return cols
}

// cell writes a figure: numbers to 10 significant digits, a null pointer
// (not reached) or an absent table as "".
func cell(v reflect.Value) string {
	if !v.IsValid() {
		return ""
	}
	if v.Kind() == reflect.Pointer {
		if v.IsNil() {
			return ""
		}
		v = v.Elem()
	}
	switch v.Kind() {
	case reflect.Float64:
		return strconv.FormatFloat(post.Round10(v.Float()), 'g', 10, 64)
	case reflect.Int:
		return strconv.FormatInt(v.Int(), 10)
	case reflect.Bool:
		return strconv.FormatBool(v.Bool())
	}
	return v.String()
}

// writeCSV writes sweep.csv: one row a case.
func writeCSV(path string, p *plan.Plan, recs []Record) error {
	keys, figs := Keys(p), figureColumns()
	return post.WriteFileAtomic(path, func(w io.Writer) error {
		cw := csv.NewWriter(w)
		head := append([]string{"index", "name"}, keys...)
		for _, f := range figs {
			head = append(head, f.Name)
		}
		head = append(head, "ending", "status", "exit_status", "reason", TimeColumn)
		if err := cw.Write(head); err != nil {
			return err
		}
		for _, r := range recs {
			row := []string{strconv.Itoa(r.Index), r.Name}
			for _, k := range keys {
				row = append(row, r.value(k))
			}
			var joint reflect.Value
			if r.Summary != nil {
				joint = reflect.ValueOf(r.Summary.Joint)
			}
			for _, f := range figs {
				row = append(row, f.get(joint))
			}
			exit := ""
			if r.Status != Missing {
				exit = strconv.Itoa(r.ExitStatus)
			}
			row = append(row, r.Ending, r.Status, exit, r.Reason, timeCell(r))
			if err := cw.Write(row); err != nil {
				return err
			}
		}
		cw.Flush()
		return cw.Error()
	})
}

func timeCell(r Record) string {
	if r.Status == Missing {
		return ""
	}
	return strconv.FormatFloat(r.Seconds, 'f', 3, 64)
}

// sweepJSON is sweep.json.
type sweepJSON struct {
	Title     string     `json:"title"`
	Plan      string     `json:"plan"`
	Base      string     `json:"base"`
	Combine   string     `json:"combine"`
	Caution   string     `json:"caution"`
	Version   string     `json:"flangeseg"`
	Keys      []string   `json:"keys"`
	Counts    Tally      `json:"counts"`
	Missing   []string   `json:"missing"`
	Cases     []caseJSON `json:"cases"`
	TimeNotes string     `json:"time_note"`
}

type caseJSON struct {
	Record
	Joint *figures.Joint `json:"joint"`
}

func writeJSON(path string, p *plan.Plan, recs []Record) error {
	s := sweepJSON{Title: p.Title, Plan: filepath.Base(p.Path), Base: p.Base, Combine: p.Combine, Caution: post.Caution,
		Version: post.Version, Keys: Keys(p), Counts: Count(recs), Missing: []string{},
		TimeNotes: "time_s is each case's wall-clock time, the only value that differs between two runs of one sweep"}
	for _, r := range recs {
		c := caseJSON{Record: r}
		if r.Summary != nil {
			c.Joint = &r.Summary.Joint
		}
		if r.Status == Missing {
			s.Missing = append(s.Missing, r.Name)
		}
		s.Cases = append(s.Cases, c)
	}
	return post.WriteJSON(path, s)
}
