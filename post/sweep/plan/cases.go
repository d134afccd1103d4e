package plan

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"flangeseg/fem/segment/modelfile"
)

// Cases makes the plan's cases in order — the combined ones (a grid with
// the first key varying slowest, or the zipped lists), then the named
// ones — each the base model with its values set, decoded and validated.
// It returns every problem: a base model that is not valid by itself, a
// key the base cannot take, and each case whose model breaks a rule,
// named by its index and name.
func (p *Plan) Cases() ([]Case, []error) {
	if _, err := modelfile.Decode(p.BaseText); err != nil {
		return nil, []error{fmt.Errorf("base = %q: the base model must be valid by itself:\n%w", p.Base, err)}
	}
	var base map[string]any
	if _, err := toml.Decode(string(p.BaseText), &base); err != nil {
		return nil, []error{fmt.Errorf("base = %q: %w", p.Base, err)}
	}
	for _, s := range p.Set {
		if err := setKey(base, s.Key, s.Value); err != nil {
			return nil, []error{fmt.Errorf("set: %s = %s: %w", s.Key, Show(s.Value), err)}
		}
	}
	sets := p.settings()
	width := len(strconv.Itoa(len(sets)))
	var cases []Case
	var errs []error
	names := map[string]bool{}
	for _, n := range p.Named {
		names[n.Name] = true
	}
	for i, set := range sets {
		c := Case{Index: i + 1, Set: set}
		if i < len(sets)-len(p.Named) {
			c.Name = fmt.Sprintf("case-%0*d", max(2, width), i+1)
			if names[c.Name] {
				errs = append(errs, fmt.Errorf("case %d: a named case is called %q, the name of this combined case: choose another name", i+1, c.Name))
				continue
			}
		} else {
			c.Name = p.Named[i-(len(sets)-len(p.Named))].Name
		}
		if err := c.build(p, base); err != nil {
			errs = append(errs, err)
			continue
		}
		cases = append(cases, c)
	}
	return cases, errs
}

// settings lists each case's settings in case order.
func (p *Plan) settings() [][]Setting {
	var out [][]Setting
	n := p.combined()
	for i := range n {
		set := make([]Setting, len(p.Vary))
		rest := i
		for k := len(p.Vary) - 1; k >= 0; k-- {
			v := p.Vary[k]
			j := i
			if p.Combine == Grid {
				j = rest % len(v.Values)
				rest /= len(v.Values)
			}
			set[k] = Setting{Key: v.Key, Value: v.Values[j]}
		}
		out = append(out, set)
	}
	for _, named := range p.Named {
		out = append(out, named.Set)
	}
	return out
}

// build makes the case's model text and Spec.
func (c *Case) build(p *Plan, base map[string]any) error {
	model := deepCopy(base).(map[string]any)
	for _, s := range c.Set {
		if err := setKey(model, s.Key, s.Value); err != nil {
			return fmt.Errorf("case %d (%s): %s = %s: %w", c.Index, c.Name, s.Key, Show(s.Value), err)
		}
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, "# case %d (%s) of the sweep %s: the base model %s with\n", c.Index, c.Name, p.Path, p.Base)
	for _, s := range p.Set {
		fmt.Fprintf(&b, "#   %s = %s (every case)\n", s.Key, Show(s.Value))
	}
	for _, s := range c.Set {
		fmt.Fprintf(&b, "#   %s = %s\n", s.Key, Show(s.Value))
	}
	enc := toml.NewEncoder(&b)
	enc.Indent = ""
	if err := enc.Encode(model); err != nil {
		return fmt.Errorf("case %d (%s): write its model: %w", c.Index, c.Name, err)
	}
	spec, err := modelfile.Decode(b.Bytes())
	if err != nil {
		return fmt.Errorf("case %d (%s: %s): its model is not valid:\n%w", c.Index, c.Name, c.Describe(), indent(err))
	}
	c.Text, c.Spec = b.Bytes(), spec
	return nil
}

// Describe lists the case's settings: "contact.recess = 0.2, …".
func (c Case) Describe() string {
	parts := make([]string, len(c.Set))
	for i, s := range c.Set {
		parts[i] = s.Key + " = " + Show(s.Value)
	}
	return strings.Join(parts, ", ")
}

// indent sets each line of an error in by four spaces.
func indent(err error) error {
	return fmt.Errorf("    %s", strings.ReplaceAll(err.Error(), "\n", "\n    "))
}

// setKey sets a dotted key in a parsed model, making missing tables.
func setKey(m map[string]any, key string, v any) error {
	parts := strings.Split(key, ".")
	for i, seg := range parts {
		sm := segmentRule.FindStringSubmatch(seg)
		name, last := sm[1], i == len(parts)-1
		if sm[2] == "" {
			if last {
				m[name] = v
				return nil
			}
			next, ok := m[name].(map[string]any)
			if !ok {
				if _, there := m[name]; there {
					return fmt.Errorf("the base model's %s is not a table", strings.Join(parts[:i+1], "."))
				}
				next = map[string]any{}
				m[name] = next
			}
			m = next
			continue
		}
		k, _ := strconv.Atoi(sm[2])
		list, err := entries(m[name])
		if err != nil || k >= len(list) {
			return fmt.Errorf("the base model's %s has %d entries: index %d is not one of them (indices count from 0)", strings.Join(append(parts[:i:i], name), "."), len(list), k)
		}
		if last {
			list[k] = v
			m[name] = list
			return nil
		}
		next, ok := list[k].(map[string]any)
		if !ok {
			return fmt.Errorf("the base model's %s[%d] is not a table", strings.Join(append(parts[:i:i], name), "."), k)
		}
		m[name] = list
		m = next
	}
	return nil
}

// entries gives an array of the parsed model as []any.
func entries(raw any) ([]any, error) {
	switch x := raw.(type) {
	case []any:
		return x, nil
	case []map[string]any:
		out := make([]any, len(x))
		for i, e := range x {
			out[i] = e
		}
		return out, nil
	}
	return nil, fmt.Errorf("not an array")
}

// deepCopy copies a parsed TOML value, so that a case never changes the
// base.
func deepCopy(v any) any {
	switch x := v.(type) {
	case map[string]any:
		out := make(map[string]any, len(x))
		for k, e := range x {
			out[k] = deepCopy(e)
		}
		return out
	case []map[string]any:
		out := make([]any, len(x))
		for i, e := range x {
			out[i] = deepCopy(e)
		}
		return out
	case []any:
		out := make([]any, len(x))
		for i, e := range x {
			out[i] = deepCopy(e)
		}
		return out
	}
	return v
}
