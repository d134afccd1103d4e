package modelfile

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"
)

// MaxFileSize bounds the size of a model file, bytes. A model file is a
// few kilobytes; the bound keeps a wrong file (a mesh, a log, a disk
// image) from being read into memory whole.
const MaxFileSize = 1 << 20

// Load reads and decodes the model file at path, reading no more than
// MaxFileSize bytes and one. A *Error names the file on every line.
func Load(path string) (*Spec, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("read model file: %w", err)
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, MaxFileSize+1))
	if err != nil {
		return nil, fmt.Errorf("read model file: %w", err)
	}
	s, err := Decode(data)
	var me *Error
	if errors.As(err, &me) {
		me.File = path
	}
	return s, err
}

// Decode decodes a model file strictly, fills in the defaults and
// validates the result. It reports every problem at once in a *Error:
// unknown keys, values of the wrong type, missing keys and broken rules.
//
// The toml package parses the text; the tables are then matched against
// the Spec's tags here rather than by toml's struct decoding, which accepts
// keys in any letter case and stops at the first value of the wrong type.
func Decode(data []byte) (*Spec, error) {
	if len(data) > MaxFileSize {
		return nil, &Error{Errs: []error{tooLarge(len(data))}}
	}
	var raw map[string]any
	md, err := toml.Decode(string(data), &raw)
	if err != nil {
		return nil, &Error{Errs: []error{SyntaxError(err)}}
	}
	d := newDecoder(md)
	var s Spec
	d.table("", "", raw, reflect.ValueOf(&s).Elem())
	d.requireKeys(&s)
	s.fillDefaults(d.given)
	c := &checker{bad: d.bad}
	s.check(c)
	if errs := append(d.errs, c.errs...); len(errs) > 0 {
		return nil, &Error{Errs: errs}
	}
	return &s, nil
}

// Error lists every problem of a model, one per line, each prefixed
// with the file name when it is known.
type Error struct {
	File string
	Errs []error
}

// Error lists the problems one per line.
func (e *Error) Error() string {
	var b strings.Builder
	for i, err := range e.Errs {
		if i > 0 {
			b.WriteByte('\n')
		}
		if e.File != "" {
			b.WriteString(e.File + ": ")
		}
		b.WriteString(err.Error())
	}
	return b.String()
}

// Unwrap gives the problems, for errors.Is and errors.As.
func (e *Error) Unwrap() []error { return e.Errs }

// tooLarge is the error of a model file of n bytes, more than MaxFileSize
// (n is a lower bound when the file was read only that far).
func tooLarge(n int) error {
	return fmt.Errorf("file size = %d bytes or more: must be at most %d bytes (1 MiB); a model file is a few kilobytes of TOML", n, MaxFileSize)
}

// SyntaxError is a TOML parse error on one line: the parser quotes the
// offending text, which may hold a line break or other control
// characters; they are shown escaped, as Go writes them.
func SyntaxError(err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("line %d: TOML syntax: %s", pe.Position.Line, oneLine(pe.Message))
	}
	return fmt.Errorf("TOML syntax: %s", oneLine(err.Error()))
}

// oneLine escapes the control characters of s (\n, \t, \x00 …).
func oneLine(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r < 0x20 || r == 0x7f || r == 0x85 || r == 0x2028 || r == 0x2029 {
			q := strconv.QuoteRune(r)
			b.WriteString(q[1 : len(q)-1])
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// decoder copies parsed TOML tables into a Spec, checking every key and
// type against the struct tags.
type decoder struct {
	order map[string]int  // key path as toml writes it (no indices) → first position in the file
	given map[string]bool // paths of the keys the file gives, e.g. "contact.zones[1].from"
	bad   map[string]bool // paths whose value is missing or of the wrong type
	errs  []error
}

func newDecoder(md toml.MetaData) *decoder {
	d := &decoder{order: map[string]int{}, given: map[string]bool{}, bad: map[string]bool{}}
	for i, k := range md.Keys() {
		if _, ok := d.order[k.String()]; !ok {
			d.order[k.String()] = i
		}
	}
	return d
}

// joinKey appends one key to a dotted path, quoted as TOML needs.
func joinKey(path, key string) string {
	k := toml.Key{key}.String()
	if path == "" {
		return k
	}
	return path + "." + k
}

// sortedKeys returns the keys of a table in file order.
func (d *decoder) sortedKeys(ord string, raw map[string]any) []string {
	keys := make([]string, 0, len(raw))
	for k := range raw {
		keys = append(keys, k)
	}
	pos := func(k string) int {
		if p, ok := d.order[joinKey(ord, k)]; ok {
			return p
		}
		return math.MaxInt
	}
	sort.Slice(keys, func(i, j int) bool {
		pi, pj := pos(keys[i]), pos(keys[j])
		if pi != pj {
			return pi < pj
		}
		return keys[i] < keys[j]
	})
	return keys
}

// tomlFields returns the key names of a struct type and their field indices.
func tomlFields(t reflect.Type) ([]string, map[string]int) {
	var names []string
	index := map[string]int{}
	for i := range t.NumField() {
		name, _, _ := strings.Cut(t.Field(i).Tag.Get("toml"), ",")
		names = append(names, name)
		index[name] = i
	}
	return names, index
}

func (d *decoder) table(path, ord string, raw map[string]any, v reflect.Value) {
	names, index := tomlFields(v.Type())
	for _, k := range d.sortedKeys(ord, raw) {
		p := joinKey(path, k)
		i, ok := index[k]
		if !ok {
			d.errs = append(d.errs, fmt.Errorf("unknown key %q = %s: not a key of %s%s", p, tomlValue(raw[k]), tableName(path), suggest(k, names)))
			continue
		}
		d.given[p] = true
		d.value(p, joinKey(ord, k), raw[k], v.Field(i))
	}
}

// tableName names the table at path for messages.
func tableName(path string) string {
	if path == "" {
		return "the model file's top level"
	}
	return "[" + path + "]"
}

// value decodes one TOML value into v and reports whether it could.
func (d *decoder) value(path, ord string, raw any, v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Pointer:
		e := reflect.New(v.Type().Elem())
		if !d.value(path, ord, raw, e.Elem()) {
			return false
		}
		v.Set(e)
	case reflect.Float64:
		switch x := raw.(type) {
		case float64:
			v.SetFloat(x)
		case int64:
			v.SetFloat(float64(x))
		default:
			return d.wrongType(path, raw, "a number")
		}
	case reflect.Int:
		x, ok := raw.(int64)
		if !ok {
			return d.wrongType(path, raw, "a whole number")
		}
		v.SetInt(x)
	case reflect.String:
		x, ok := raw.(string)
		if !ok {
			return d.wrongType(path, raw, "a string")
		}
		v.SetString(x)
	case reflect.Bool:
		x, ok := raw.(bool)
		if !ok {
			return d.wrongType(path, raw, "true or false")
		}
		v.SetBool(x)
	case reflect.Struct:
		m, ok := raw.(map[string]any)
		if !ok {
			return d.wrongType(path, raw, "a table")
		}
		d.table(path, ord, m, v)
	case reflect.Slice:
		return d.array(path, ord, raw, v)
	case reflect.Map:
		m, ok := raw.(map[string]any)
		if !ok {
			return d.wrongType(path, raw, "a table")
		}
		d.tableMap(path, ord, m, v)
	default:
		// Only a Spec type without a case above can get here.
		d.errs = append(d.errs, fmt.Errorf("%s: cannot decode into %s", path, v.Type()))
		return false
	}
	return true
}

func (d *decoder) array(path, ord string, raw any, v reflect.Value) bool {
	rv := reflect.ValueOf(raw)
	if raw == nil || rv.Kind() != reflect.Slice {
		return d.wrongType(path, raw, "an array")
	}
	s := reflect.MakeSlice(v.Type(), rv.Len(), rv.Len())
	ok := true
	for i := range rv.Len() {
		ok = d.value(fmt.Sprintf("%s[%d]", path, i), ord, rv.Index(i).Interface(), s.Index(i)) && ok
	}
	v.Set(s)
	if !ok {
		d.bad[path] = true // so that no rule reads the zeros left in it
	}
	return ok
}

// tableMap decodes a table of named entries, e.g. [materials.NAME].
func (d *decoder) tableMap(path, ord string, raw map[string]any, v reflect.Value) {
	m := reflect.MakeMap(v.Type())
	for _, k := range d.sortedKeys(ord, raw) {
		e := reflect.New(v.Type().Elem()).Elem()
		d.value(joinKey(path, k), joinKey(ord, k), raw[k], e)
		m.SetMapIndex(reflect.ValueOf(k), e)
	}
	v.Set(m)
}

func (d *decoder) wrongType(path string, raw any, want string) bool {
	d.bad[path] = true
	d.errs = append(d.errs, fmt.Errorf("%s = %s: wrong type: %s where %s belongs", path, tomlValue(raw), TypeName(raw), want))
	return false
}

// tomlValue shows a parsed value as the file would write it, briefly.
func tomlValue(raw any) string {
	switch x := raw.(type) {
	case string:
		return strconv.Quote(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return FormatNumber(x)
	case bool:
		return strconv.FormatBool(x)
	case map[string]any:
		return "{…}"
	case time.Time:
		return x.Format(time.RFC3339)
	}
	if rv := reflect.ValueOf(raw); raw != nil && rv.Kind() == reflect.Slice {
		return "[…]"
	}
	return fmt.Sprint(raw)
}

// TypeName names the TOML type of a decoded value, for messages.
func TypeName(raw any) string {
	switch raw.(type) {
	case nil:
		return "nothing"
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a float"
	case bool:
		return "a boolean"
	case map[string]any:
		return "a table"
	}
	if rv := reflect.ValueOf(raw); raw != nil && rv.Kind() == reflect.Slice {
		return "an array"
	}
	return "a date or time"
}

// suggest names the known key closest to an unknown one, if any is close.
func suggest(key string, known []string) string {
	best, bestDist := "", 3
	for _, k := range known {
		dist := editDistance(strings.ToLower(key), strings.ToLower(k))
		if dist < bestDist && dist < len(k) {
			best, bestDist = k, dist
		}
	}
	if best == "" {
		return ""
	}
	return fmt.Sprintf(" (did you mean %q?)", best)
}

// editDistance is the Levenshtein distance between two strings.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := range ra {
		cur[0] = i + 1
		for j := range rb {
			cost := 1
			if ra[i] == rb[j] {
				cost = 0
			}
			cur[j+1] = min(prev[j+1]+1, cur[j]+1, prev[j]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// TableKeys returns the key names of a table of the Spec (one of its
// struct types), in the order of the struct's fields.
func TableKeys(t reflect.Type) []string {
	names, _ := tomlFields(t)
	return names
}
