package modelfile

import (
	"fmt"
	"strconv"
	"strings"
)

// FieldChoice is output.field_states read: All for "all", Every = N for
// "every N", neither for "key".
type FieldChoice struct {
	All   bool
	Every int
}

// fieldStatesRule is the rule output.field_states breaks, as its error
// states it.
const fieldStatesRule = `must be "key", "all" or "every N" with N a whole number ≥ 1`

// ParseFieldStates reads a value of output.field_states.
func ParseFieldStates(v string) (FieldChoice, error) {
	switch v {
	case FieldStatesKey:
		return FieldChoice{}, nil
	case FieldStatesAll:
		return FieldChoice{All: true}, nil
	}
	word, num, ok := strings.Cut(v, " ")
	if !ok || word != FieldStatesEvery {
		return FieldChoice{}, fmt.Errorf("output.field_states = %q: %s", v, fieldStatesRule)
	}
	n, err := strconv.Atoi(num)
	if err != nil || n < 1 || strconv.Itoa(n) != num {
		return FieldChoice{}, fmt.Errorf("output.field_states = %q: %s", v, fieldStatesRule)
	}
	return FieldChoice{Every: n}, nil
}

// FieldChoice returns output.field_states read; a Spec that Validate
// passed always has a readable one.
func (o OutputSpec) FieldChoice() FieldChoice {
	f, _ := ParseFieldStates(o.FieldStates)
	return f
}

func (s *Spec) checkOutput(c *checker) {
	if !c.usable("output.field_states") {
		return
	}
	if _, err := ParseFieldStates(s.Output.FieldStates); err != nil {
		c.fail("output.field_states", "%v", err)
	}
}
