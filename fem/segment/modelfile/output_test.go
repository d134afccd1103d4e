package modelfile

import (
	"strings"
	"testing"
)

func TestParseFieldStates(t *testing.T) {
	for _, c := range []struct {
		value string
		want  FieldChoice
		ok    bool
	}{
		{"key", FieldChoice{}, true},
		{"all", FieldChoice{All: true}, true},
		{"every 1", FieldChoice{Every: 1}, true},
		{"every 12", FieldChoice{Every: 12}, true},
		{"every 0", FieldChoice{}, false},
		{"every -2", FieldChoice{}, false},
		{"every +2", FieldChoice{}, false},
		{"every 02", FieldChoice{}, false},
		{"every  2", FieldChoice{}, false},
		{"every 2.5", FieldChoice{}, false},
		{"every", FieldChoice{}, false},
		{"Every 2", FieldChoice{}, false},
		{"", FieldChoice{}, false},
		{"keys", FieldChoice{}, false},
	} {
		got, err := ParseFieldStates(c.value)
		switch {
		case c.ok && (err != nil || got != c.want):
			t.Errorf("%q: %+v, %v; want %+v", c.value, got, err, c.want)
		case !c.ok && err == nil:
			t.Errorf("%q accepted as %+v", c.value, got)
		case !c.ok && !strings.Contains(err.Error(), `output.field_states = "`+c.value+`": must be "key", "all" or "every N"`):
			t.Errorf("%q: error %q does not name key, value and rule", c.value, err)
		}
	}
}
