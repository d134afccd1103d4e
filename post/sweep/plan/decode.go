package plan

import (
	"flangeseg/fem/segment/modelfile"
	"fmt"
	"maps"
	"math"
	"regexp"
	"slices"
	"strconv"

	"github.com/BurntSushi/toml"
)

// Spacings of a range.
const (
	Linear = "linear"
	Log    = "log"
)

// MaxCases bounds the cases of one plan: a grid multiplies quickly, and
// every case is held in memory with its model (some 10 kB each) from the
// plan's loading on; a study of more is split into several plans.
const MaxCases = 10000

// decoder checks a parsed plan key by key, collecting every problem.
type decoder struct{ errs []error }

func (d *decoder) fail(format string, args ...any) {
	d.errs = append(d.errs, fmt.Errorf(format, args...))
}

// known reports keys of table (at path) that are not in keys.
func (d *decoder) known(path string, table map[string]any, keys ...string) {
	for _, k := range slices.Sorted(maps.Keys(table)) {
		found := false
		for _, w := range keys {
			found = found || k == w
		}
		if !found {
			d.fail("unknown key %q (known here: %s)", join(path, k), quoteList(keys))
		}
	}
}

// str reads an optional string key.
func (d *decoder) str(path string, table map[string]any, key string) (string, bool) {
	raw, ok := table[key]
	if !ok {
		return "", false
	}
	s, isStr := raw.(string)
	if !isStr {
		d.fail("%s = %s: wrong type: %s where a string belongs", join(path, key), Show(raw), modelfile.TypeName(raw))
		return "", false
	}
	return s, true
}

// decode checks and copies the plan's text into a Plan.
func decode(text []byte) (*Plan, []error) {
	p := &Plan{Combine: Grid}
	var raw map[string]any
	if _, err := toml.Decode(string(text), &raw); err != nil {
		return p, []error{modelfile.SyntaxError(err)}
	}
	d := &decoder{}
	d.known("", raw, "title", "base", "combine", "set", "vary", "case")
	p.Title, _ = d.str("", raw, "title")
	if base, ok := d.str("", raw, "base"); ok {
		if base == "" {
			d.fail("base = \"\": must name the base model file")
		}
		p.Base = base
	} else if _, given := raw["base"]; !given {
		d.fail("base: missing: the plan must name its base model file (base = \"joint.toml\", relative to the plan's folder)")
	}
	if c, ok := d.str("", raw, "combine"); ok {
		if c != Grid && c != Zip {
			d.fail("combine = %q: must be %q (every combination) or %q (the i-th values together)", c, Grid, Zip)
		}
		p.Combine = c
	}
	if set, given := raw["set"]; given {
		p.Set = d.settings("set", set)
	}
	p.Vary = d.varies(raw["vary"])
	p.Named = d.named(raw["case"])
	d.counts(p)
	return p, d.errs
}

// tables reads an array of tables (nil when absent).
func (d *decoder) tables(key string, raw any) []map[string]any {
	switch x := raw.(type) {
	case nil:
		return nil
	case []map[string]any:
		return x
	case []any:
		out := make([]map[string]any, 0, len(x))
		for i, e := range x {
			m, ok := e.(map[string]any)
			if !ok {
				d.fail("%s[%d] = %s: wrong type: %s where a table belongs", key, i, Show(e), modelfile.TypeName(e))
				continue
			}
			out = append(out, m)
		}
		return out
	}
	d.fail("%s = %s: wrong type: %s where an array of tables belongs ([[%s]])", key, Show(raw), modelfile.TypeName(raw), key)
	return nil
}

func (d *decoder) varies(raw any) []Vary {
	var out []Vary
	seen := map[string]string{}
	for i, t := range d.tables("vary", raw) {
		at := fmt.Sprintf("vary[%d]", i)
		d.known(at, t, "key", "values", "range")
		key, ok := d.str(at, t, "key")
		if !ok {
			if _, given := t["key"]; !given {
				d.fail("%s.key: missing: each [[vary]] names the model-file key it varies", at)
			}
			continue
		}
		kind, err := keyKind(key)
		if err != nil {
			d.fail("%s.key = %q: %v", at, key, err)
			continue
		}
		if prev, dup := seen[key]; dup {
			d.fail("%s.key = %q: already varied by %s: vary each key once", at, key, prev)
			continue
		}
		seen[key] = at
		v := Vary{Key: key}
		_, hasValues := t["values"]
		_, hasRange := t["range"]
		switch {
		case hasValues && hasRange:
			d.fail("%s: gives both values and range: give one", at)
		case hasValues:
			v.Values = d.values(at+".values", t["values"])
		case hasRange:
			v.Values = d.rangeValues(at+".range", t["range"], kind)
		default:
			d.fail("%s: neither values nor range: give values = […] or range = {from, to, steps}", at)
		}
		if len(v.Values) > 0 {
			out = append(out, v)
		}
	}
	return out
}

// values reads a list of values: not empty, none repeated.
func (d *decoder) values(at string, raw any) []any {
	list, ok := raw.([]any)
	if !ok {
		if m, isTables := raw.([]map[string]any); isTables {
			for _, e := range m {
				list = append(list, e)
			}
		} else {
			d.fail("%s = %s: wrong type: %s where an array belongs", at, Show(raw), modelfile.TypeName(raw))
			return nil
		}
	}
	if len(list) == 0 {
		d.fail("%s = []: must give at least one value", at)
		return nil
	}
	shown := map[string]int{}
	for i, v := range list {
		s := Show(v)
		if j, dup := shown[s]; dup {
			d.fail("%s[%d] = %s: repeats %s[%d]: each value once", at, i, s, at, j)
			return nil
		}
		shown[s] = i
	}
	return list
}

// rangeValues reads {from, to, steps, spacing} into its values.
func (d *decoder) rangeValues(at string, raw any, kind keyType) []any {
	t, ok := raw.(map[string]any)
	if !ok {
		d.fail("%s = %s: wrong type: %s where a table belongs ({from, to, steps})", at, Show(raw), modelfile.TypeName(raw))
		return nil
	}
	d.known(at, t, "from", "to", "steps", "spacing")
	from, okF := d.number(at, t, "from")
	to, okT := d.number(at, t, "to")
	steps, okS := d.steps(at, t)
	spacing := Linear
	if s, given := d.str(at, t, "spacing"); given {
		if s != Linear && s != Log {
			d.fail("%s.spacing = %q: must be %q or %q", at, s, Linear, Log)
			return nil
		}
		spacing = s
	}
	if !okF || !okT || !okS {
		return nil
	}
	if kind != numberKey && kind != wholeKey {
		d.fail("%s: a range needs a number key; this key takes %s (give values = […] instead)", at, kind)
		return nil
	}
	if spacing == Log && (from <= 0 || to <= 0) {
		d.fail("%s: spacing = \"log\" with from = %s and to = %s: both must be > 0", at, modelfile.FormatNumber(from), modelfile.FormatNumber(to))
		return nil
	}
	if from == to {
		d.fail("%s.to = %s: equals from: a range needs two different ends", at, modelfile.FormatNumber(to))
		return nil
	}
	out := make([]any, steps)
	for i := range steps {
		x := rangeValue(from, to, i, steps, spacing)
		if kind == wholeKey {
			if x != math.Trunc(x) {
				d.fail("%s: value %d is %s, but the key takes whole numbers: choose from, to and steps that give whole steps", at, i+1, modelfile.FormatNumber(x))
				return nil
			}
			out[i] = int64(x)
			continue
		}
		out[i] = x
	}
	return out
}

// rangeValue is the i-th of steps values from from to to, rounded to 12
// significant digits so that 0.1 + 2·0.1 reads 0.3.
func rangeValue(from, to float64, i, steps int, spacing string) float64 {
	t := float64(i) / float64(steps-1)
	var x float64
	switch {
	case i == steps-1:
		x = to
	case spacing == Log:
		x = from * math.Pow(to/from, t)
	default:
		x = from + t*(to-from)
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 12, 64), 64)
	return r
}

func (d *decoder) number(at string, t map[string]any, key string) (float64, bool) {
	switch x := t[key].(type) {
	case nil:
		d.fail("%s.%s: missing: a range has from, to and steps", at, key)
	case int64:
		return float64(x), true
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			d.fail("%s.%s = %s: must be a finite number", at, key, Show(x))
			return 0, false
		}
		return x, true
	default:
		d.fail("%s.%s = %s: wrong type: %s where a number belongs", at, key, Show(x), modelfile.TypeName(x))
	}
	return 0, false
}

func (d *decoder) steps(at string, t map[string]any) (int, bool) {
	raw, given := t["steps"]
	if !given {
		d.fail("%s.steps: missing: a range has from, to and steps (the number of values, both ends included)", at)
		return 0, false
	}
	n, ok := raw.(int64)
	if !ok || n < 2 || n > MaxCases {
		d.fail("%s.steps = %s: must be a whole number from 2 to %d (the number of values, both ends included)", at, Show(raw), MaxCases)
		return 0, false
	}
	return int(n), true
}

var nameRule = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$`)

func (d *decoder) named(raw any) []Named {
	var out []Named
	seen := map[string]int{}
	for i, t := range d.tables("case", raw) {
		at := fmt.Sprintf("case[%d]", i)
		d.known(at, t, "name", "set")
		name, ok := d.str(at, t, "name")
		switch {
		case !ok:
			if _, given := t["name"]; !given {
				d.fail("%s.name: missing: a named case has a name (its folder under cases/)", at)
			}
		case !nameRule.MatchString(name):
			d.fail("%s.name = %q: must be 1 to 64 letters, digits, '.', '_' or '-', starting with a letter or digit (it names a folder)", at, name)
		case seen[name] > 0:
			d.fail("%s.name = %q: case[%d] has that name already: names are unique", at, name, seen[name]-1)
		}
		seen[name] = i + 1
		n := Named{Name: name, Set: d.settings(at+".set", t["set"])}
		if len(n.Set) > 0 {
			out = append(out, n)
		}
	}
	return out
}

// settings reads a table of model-file keys and their values, nested
// tables read as dotted keys.
func (d *decoder) settings(at string, raw any) []Setting {
	m, ok := raw.(map[string]any)
	if !ok {
		d.fail("%s = %s: must be a table of model-file keys and their values, e.g. { \"contact.recess\" = 0.2 }", at, Show(raw))
		return nil
	}
	set := flatten("", m)
	for _, s := range set {
		if _, err := keyKind(s.Key); err != nil {
			d.fail("%s.%s = %s: %v", at, s.Key, Show(s.Value), err)
		}
	}
	if len(set) == 0 {
		d.fail("%s = {}: sets nothing: give at least one key", at)
	}
	return set
}

// flatten turns nested tables into dotted keys, sorted by key.
func flatten(prefix string, m map[string]any) []Setting {
	var out []Setting
	for _, k := range slices.Sorted(maps.Keys(m)) {
		key := join(prefix, k)
		if sub, ok := m[k].(map[string]any); ok && len(sub) > 0 {
			out = append(out, flatten(key, sub)...)
			continue
		}
		out = append(out, Setting{Key: key, Value: m[k]})
	}
	return out
}

// counts checks that the plan makes cases, not too many, and that zipped
// lists have one length.
func (d *decoder) counts(p *Plan) {
	if len(d.errs) > 0 {
		return
	}
	if len(p.Vary) == 0 && len(p.Named) == 0 {
		d.fail("no cases: give [[vary]] keys, [[case]] entries or both")
		return
	}
	if p.Combine == Zip {
		for _, v := range p.Vary[min(1, len(p.Vary)):] {
			if len(v.Values) != len(p.Vary[0].Values) {
				d.fail("combine = \"zip\": %s has %d values and %s has %d: zipped keys have as many values each", v.Key, len(v.Values), p.Vary[0].Key, len(p.Vary[0].Values))
			}
		}
	}
	if n := p.combined(); n+len(p.Named) > MaxCases {
		d.fail("the plan makes %d cases, more than %d: split it into several plans", n+len(p.Named), MaxCases)
	}
}

// combined is the number of combined cases (without the named ones),
// saturating above MaxCases.
func (p *Plan) combined() int {
	if len(p.Vary) == 0 {
		return 0
	}
	if p.Combine == Zip {
		return len(p.Vary[0].Values)
	}
	n := 1
	for _, v := range p.Vary {
		n *= len(v.Values)
		if n > MaxCases {
			return MaxCases + 1
		}
	}
	return n
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func quoteList(keys []string) string {
	s := ""
	for i, k := range keys {
		if i > 0 {
			s += ", "
		}
		s += k
	}
	return s
}
