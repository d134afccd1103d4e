package plan

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"flangeseg/fem/segment/modelfile"
)

// demoBase is the flat demo model, read where the binary embeds it.
func demoBase(t *testing.T) string {
	t.Helper()
	p, err := filepath.Abs(filepath.Join("..", "..", "..", "cmd", "flangeseg", "demo", "bands.toml"))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// writePlan writes a plan whose base is the demo model and loads it.
func writePlan(t *testing.T, body string) (*Plan, []Case, error) {
	t.Helper()
	path := filepath.Join(t.TempDir(), "plan.toml")
	text := "base = " + quote(demoBase(t)) + "\n" + body
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return Load(path)
}

func quote(s string) string { return `"` + strings.ReplaceAll(s, `\`, `\\`) + `"` }

func TestPlanGridOrder(t *testing.T) {
	_, cases, err := writePlan(t, `
[[vary]]
key = "contact.recess"
values = [0.1, 0.2]
[[vary]]
key = "contact.zones[1].from"
range = { from = 60, to = 70, steps = 3 }
[[case]]
name = "wide"
set = { "contact.zones[0].to" = -40 }
`)
	if err != nil {
		t.Fatal(err)
	}
	recess := []float64{0.1, 0.2}
	from := []float64{60, 65, 70}
	if len(cases) != len(recess)*len(from)+1 {
		t.Fatalf("%d cases, want %d", len(cases), len(recess)*len(from)+1)
	}
	for i, c := range cases[:6] {
		wantR, wantF := recess[i/len(from)], from[i%len(from)]
		if c.Index != i+1 || c.Spec.Contact.Recess != wantR || c.Spec.Contact.Zones[1].From != wantF {
			t.Errorf("case %d (index %d): recess %v, zones[1].from %v; want %v, %v (the first key varies slowest)",
				i, c.Index, c.Spec.Contact.Recess, c.Spec.Contact.Zones[1].From, wantR, wantF)
		}
		if want := "case-0" + string(rune('1'+i)); c.Name != want {
			t.Errorf("case %d named %q, want %q", i, c.Name, want)
		}
	}
	base, err := modelfile.Load(demoBase(t))
	if err != nil {
		t.Fatal(err)
	}
	named := cases[6]
	if named.Name != "wide" || named.Spec.Contact.Zones[0].To != -40 || named.Spec.Contact.Recess != base.Contact.Recess {
		t.Errorf("named case %q: zones[0].to %v, recess %v; want -40 and the base's %v", named.Name, named.Spec.Contact.Zones[0].To, named.Spec.Contact.Recess, base.Contact.Recess)
	}
}

func TestPlanZipAndSet(t *testing.T) {
	_, cases, err := writePlan(t, `
combine = "zip"
set = { mesh = { size = 16 }, "load.increments" = 5 }
[[vary]]
key = "contact.friction"
values = [0.1, 0.3]
[[vary]]
key = "flange.thickness"
values = [80, 100]
`)
	if err != nil {
		t.Fatal(err)
	}
	want := [][2]float64{{0.1, 80}, {0.3, 100}}
	if len(cases) != len(want) {
		t.Fatalf("%d cases, want %d", len(cases), len(want))
	}
	for i, c := range cases {
		if c.Spec.Contact.Friction != want[i][0] || c.Spec.Flange.Thickness != want[i][1] {
			t.Errorf("case %d: friction %v thickness %v, want %v", i+1, c.Spec.Contact.Friction, c.Spec.Flange.Thickness, want[i])
		}
		if c.Spec.Mesh.Size != 16 || c.Spec.Load.Increments != 5 {
			t.Errorf("case %d: mesh.size %v, load.increments %d: the plan's set did not reach it", i+1, c.Spec.Mesh.Size, c.Spec.Load.Increments)
		}
		if !strings.Contains(string(c.Text), "flange.thickness = ") {
			t.Errorf("case %d: its model file does not say what the sweep set:\n%s", i+1, c.Text)
		}
	}
}

func TestPlanRanges(t *testing.T) {
	for _, tc := range []struct {
		name, rng string
		want      []any
	}{
		{"linear", `{ from = 0.1, to = 0.3, steps = 3 }`, []any{0.1, 0.2, 0.3}},
		{"log", `{ from = 0.01, to = 1, steps = 3, spacing = "log" }`, []any{0.01, 0.1, 1.0}},
		{"descending", `{ from = 1, to = 0, steps = 5 }`, []any{1.0, 0.75, 0.5, 0.25, 0.0}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, _, err := writePlan(t, "[[vary]]\nkey = \"contact.recess\"\nrange = "+tc.rng+"\n")
			if err != nil {
				t.Fatal(err)
			}
			if got := p.Vary[0].Values; Text(got) != Text(tc.want) {
				t.Errorf("values %s, want %s", Text(got), Text(tc.want))
			}
		})
	}
	t.Run("whole key", func(t *testing.T) {
		p, _, err := writePlan(t, "[[vary]]\nkey = \"load.increments\"\nrange = { from = 10, to = 30, steps = 3 }\n")
		if err != nil {
			t.Fatal(err)
		}
		for _, v := range p.Vary[0].Values {
			if _, ok := v.(int64); !ok {
				t.Errorf("value %s of a whole-number key is %T", Show(v), v)
			}
		}
	})
}

// Every problem of a plan is reported at once, each naming its key, its
// value and the rule.
func TestPlanErrors(t *testing.T) {
	for _, tc := range []struct {
		name, body string
		want       []string
	}{
		{"unknown top key", "colour = 1\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1]\n", []string{`unknown key "colour"`}},
		{"unknown model key", "[[vary]]\nkey = \"flange.thicknes\"\nvalues = [1]\n", []string{`vary[0].key = "flange.thicknes"`, `no key "flange.thicknes"`, "thickness"}},
		{"index on a table", "[[vary]]\nkey = \"flange[0].a\"\nvalues = [1]\n", []string{"flange is not an array"}},
		{"wrong type", "[[vary]]\nkey = 3\nvalues = [1]\n", []string{"vary[0].key = 3: wrong type"}},
		{"values and range", "[[vary]]\nkey = \"contact.recess\"\nvalues = [1]\nrange = { from = 0, to = 1, steps = 2 }\n", []string{"both values and range"}},
		{"empty values", "[[vary]]\nkey = \"contact.recess\"\nvalues = []\n", []string{"vary[0].values = []"}},
		{"repeated value", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, 0.1]\n", []string{"vary[0].values[1] = 0.1: repeats"}},
		{"one step", "[[vary]]\nkey = \"contact.recess\"\nrange = { from = 0, to = 1, steps = 1 }\n", []string{"vary[0].range.steps = 1"}},
		{"log through zero", "[[vary]]\nkey = \"contact.recess\"\nrange = { from = 0, to = 1, steps = 3, spacing = \"log\" }\n", []string{`spacing = "log"`, "from = 0"}},
		{"range of text", "[[vary]]\nkey = \"bolt.grade\"\nrange = { from = 1, to = 2, steps = 2 }\n", []string{"a range needs a number key", "a string"}},
		{"uneven whole steps", "[[vary]]\nkey = \"load.increments\"\nrange = { from = 10, to = 20, steps = 4 }\n", []string{"whole numbers"}},
		{"twice", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1]\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.2]\n", []string{"already varied by vary[0]"}},
		{"zip lengths", "combine = \"zip\"\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, 0.2]\n[[vary]]\nkey = \"contact.friction\"\nvalues = [0.1]\n", []string{"contact.friction has 1 values"}},
		{"combine", "combine = \"cross\"\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1]\n", []string{`combine = "cross"`}},
		{"no cases", "title = \"nothing\"\n", []string{"no cases"}},
		{"bad name", "[[case]]\nname = \"a/b\"\nset = { \"contact.recess\" = 0.1 }\n", []string{`case[0].name = "a/b"`}},
		{"same name", "[[case]]\nname = \"a\"\nset = { \"contact.recess\" = 0.1 }\n[[case]]\nname = \"a\"\nset = { \"contact.recess\" = 0.2 }\n", []string{`case[1].name = "a": case[0] has that name`}},
		{"named like a combined case", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1]\n[[case]]\nname = \"case-01\"\nset = { \"contact.recess\" = 0.2 }\n", []string{`"case-01"`, "choose another name"}},
		{"index past the end", "[[vary]]\nkey = \"contact.zones[5].from\"\nvalues = [1]\n", []string{"contact.zones has 2 entries: index 5"}},
		{"invalid case", "[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, -0.5]\n", []string{"case 2 (case-02: contact.recess = -0.5)", "contact.recess = -0.5"}},
		{"several at once", "colour = 1\n[[vary]]\nkey = \"contact.recess\"\nvalues = []\n[[vary]]\nkey = \"nope\"\nvalues = [1]\n", []string{`unknown key "colour"`, "vary[0].values = []", `vary[1].key = "nope"`}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, _, err := writePlan(t, tc.body)
			var pe *Error
			if !errors.As(err, &pe) {
				t.Fatalf("error %v, want a *plan.Error", err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error does not say %q:\n%v", w, err)
				}
			}
			if !strings.HasPrefix(err.Error(), pe.File+": ") {
				t.Errorf("error does not start with the plan file's name:\n%v", err)
			}
		})
	}
}

func TestPlanBaseMustBeValid(t *testing.T) {
	dir := t.TempDir()
	data, err := os.ReadFile(demoBase(t))
	if err != nil {
		t.Fatal(err)
	}
	broken := strings.Replace(string(data), "friction = 0.2", "friction = -1", 1)
	if err := os.WriteFile(filepath.Join(dir, "base.toml"), []byte(broken), 0o644); err != nil {
		t.Fatal(err)
	}
	plan := "base = \"base.toml\"\n[[vary]]\nkey = \"contact.recess\"\nvalues = [0.1, 0.2]\n"
	if err := os.WriteFile(filepath.Join(dir, "plan.toml"), []byte(plan), 0o644); err != nil {
		t.Fatal(err)
	}
	_, _, err = Load(filepath.Join(dir, "plan.toml"))
	if err == nil || !strings.Contains(err.Error(), "valid by itself") || !strings.Contains(err.Error(), "contact.friction = -1") {
		t.Errorf("a broken base: error %v, want it named once with its rule", err)
	}
	if n := strings.Count(fmt.Sprint(err), "contact.friction = -1"); n != 1 {
		t.Errorf("the base's error is reported %d times, want once", n)
	}
}

// A case never changes the base: each case's model differs from the base
// only by its own settings.
func TestPlanCasesIndependent(t *testing.T) {
	_, cases, err := writePlan(t, "[[case]]\nname = \"a\"\nset = { \"contact.zones[1].from\" = 80 }\n[[case]]\nname = \"b\"\nset = { \"contact.recess\" = 0.1 }\n")
	if err != nil {
		t.Fatal(err)
	}
	if a, b := cases[0].Spec.Contact.Zones[1].From, cases[1].Spec.Contact.Zones[1].From; a != 80 || b == 80 {
		t.Errorf("zones[1].from: case a %v, case b %v: b must keep the base's", a, b)
	}
}
