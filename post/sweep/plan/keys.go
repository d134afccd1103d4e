package plan

import (
	"fmt"
	"maps"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"

	"flangeseg/fem/segment/modelfile"
)

// keyType is what a model-file key takes.
type keyType int

const (
	numberKey keyType = iota
	wholeKey
	textKey
	boolKey
	tableKey
	listKey
)

func (k keyType) String() string {
	return [...]string{"a number", "a whole number", "a string", "true or false", "a table", "an array"}[k]
}

// segmentRule is one part of a dotted key: a name, optionally indexed.
var segmentRule = regexp.MustCompile(`^([A-Za-z0-9_-]+)(?:\[([0-9]+)\])?$`)

// keyKind checks a dotted model-file key ("contact.recess",
// "contact.zones[1].from", "materials.mine.E") against the model file's
// schema and says what it takes.
func keyKind(key string) (keyType, error) {
	t := reflect.TypeOf(modelfile.Spec{})
	done := ""
	for _, seg := range strings.Split(key, ".") {
		m := segmentRule.FindStringSubmatch(seg)
		if m == nil {
			return 0, fmt.Errorf("%q is not a key part: write keys as table.key, an array entry as key[i] (from 0)", seg)
		}
		for t.Kind() == reflect.Pointer {
			t = t.Elem()
		}
		switch t.Kind() {
		case reflect.Struct:
			f, ok := fieldByTag(t, m[1])
			if !ok {
				return 0, fmt.Errorf("the model file has no key %q (keys of %s: %s)", join(done, m[1]), tableName(done), strings.Join(modelfile.TableKeys(t), ", "))
			}
			t = f
		case reflect.Map:
			t = t.Elem()
		default:
			return 0, fmt.Errorf("%s is not a table", done)
		}
		done = join(done, m[1])
		if m[2] != "" {
			if t.Kind() != reflect.Slice {
				return 0, fmt.Errorf("%s is not an array: it takes no index", done)
			}
			t = t.Elem()
			done += "[" + m[2] + "]"
		}
	}
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	switch t.Kind() {
	case reflect.Float64:
		return numberKey, nil
	case reflect.Int:
		return wholeKey, nil
	case reflect.String:
		return textKey, nil
	case reflect.Bool:
		return boolKey, nil
	case reflect.Slice:
		return listKey, nil
	}
	return tableKey, nil
}

func tableName(path string) string {
	if path == "" {
		return "the top level"
	}
	return "[" + path + "]"
}

func fieldByTag(t reflect.Type, name string) (reflect.Type, bool) {
	for i := range t.NumField() {
		tag, _, _ := strings.Cut(t.Field(i).Tag.Get("toml"), ",")
		if tag == name {
			return t.Field(i).Type, true
		}
	}
	return nil, false
}

// Show writes a TOML value as a model file would, on one line: strings
// quoted, numbers the shortest way that reads back exactly.
func Show(v any) string {
	switch x := v.(type) {
	case string:
		return strconv.Quote(x)
	case nil:
		return "(nothing)"
	case map[string]any:
		parts := make([]string, 0, len(x))
		for _, k := range slices.Sorted(maps.Keys(x)) {
			parts = append(parts, k+" = "+Show(x[k]))
		}
		return "{" + strings.Join(parts, ", ") + "}"
	}
	return Text(v)
}

// Text writes a TOML value for a table cell: as Show, but a string bare.
func Text(v any) string {
	switch x := v.(type) {
	case string:
		return x
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return modelfile.FormatNumber(x)
	case bool:
		return strconv.FormatBool(x)
	case time.Time:
		return x.Format(time.RFC3339)
	case map[string]any:
		return Show(x)
	}
	if rv := reflect.ValueOf(v); v != nil && rv.Kind() == reflect.Slice {
		parts := make([]string, rv.Len())
		for i := range parts {
			parts[i] = Show(rv.Index(i).Interface())
		}
		return "[" + strings.Join(parts, ", ") + "]"
	}
	return fmt.Sprint(v)
}
