package ring

import (
	"bytes"
	"cmp"
	"fmt"
	"slices"

	"flangeseg/fem/segment/modelfile"
	"flangeseg/post/sweep/plan"
)

// The model-file keys each class sets.
const (
	KeyTaper       = "contact.taper"
	KeyParallelGap = "contact.parallel_gap"
	KeyGapSpring   = "contact.gap_spring"
)

// Class is a set of bolts whose segments share one analysis: the same
// taper, parallel gap and ring spring after rounding to the tolerances.
type Class struct {
	Name                    string // its case's name, class-01 …
	Taper, Parallel, Spring float64
	Bolts                   []int // bolt numbers
}

// Plan is the ring's analyses: the bolts with their classes, and the
// classes as the cases of a sweep (named cases of the model file), so that
// they run side by side, in shards and resumably as any sweep does.
type Plan struct {
	Model   string // the model file as the user named it
	Survey  string // the survey file as the user named it
	Options Options
	Spec    *modelfile.Spec
	Bolts   []Bolt
	Classes []Class
	Sweep   *plan.Plan
	Cases   []plan.Case // one per class, in class order
}

// NewPlan groups the bolts into classes (ordered by parallel gap, taper
// and spring, the flat class first) and makes each class a case: the
// model file text with the class's keys set. The bolts' Class fields are
// set in the returned plan's copy.
func NewPlan(spec *modelfile.Spec, model string, text []byte, survey string, opt Options, bolts []Bolt) (*Plan, error) {
	opt.defaults()
	type key struct{ taper, parallel, spring float64 }
	byKey := map[key]int{}
	var classes []Class
	for _, b := range bolts {
		k := key{b.Taper, b.Parallel, b.Spring}
		if _, ok := byKey[k]; !ok {
			byKey[k] = len(classes)
			classes = append(classes, Class{Taper: b.Taper, Parallel: b.Parallel, Spring: b.Spring})
		}
	}
	slices.SortFunc(classes, func(a, b Class) int {
		return cmp.Or(cmp.Compare(a.Parallel, b.Parallel), cmp.Compare(a.Taper, b.Taper), cmp.Compare(a.Spring, b.Spring))
	})
	width := max(2, len(fmt.Sprint(len(classes))))
	for i := range classes {
		classes[i].Name = fmt.Sprintf("class-%0*d", width, i+1)
		byKey[key{classes[i].Taper, classes[i].Parallel, classes[i].Spring}] = i
	}
	out := slices.Clone(bolts)
	for i := range out {
		c := byKey[key{out[i].Taper, out[i].Parallel, out[i].Spring}]
		out[i].Class = c
		classes[c].Bolts = append(classes[c].Bolts, out[i].Number)
	}
	sp := &plan.Plan{Path: "ring_plan.toml", Title: "ring check of " + model + ": one case per class of bolts", Base: model,
		Combine: plan.Grid, BaseText: text}
	for _, c := range classes {
		sp.Named = append(sp.Named, plan.Named{Name: c.Name, Set: []plan.Setting{
			{Key: KeyTaper, Value: c.Taper}, {Key: KeyParallelGap, Value: c.Parallel}, {Key: KeyGapSpring, Value: c.Spring},
		}})
	}
	cases, errs := sp.Cases()
	if len(errs) > 0 {
		return nil, &modelfile.Error{File: model, Errs: errs}
	}
	return &Plan{Model: model, Survey: survey, Options: opt, Spec: spec, Bolts: out, Classes: classes, Sweep: sp, Cases: cases}, nil
}

// Text is the plan as a plan file (ring_plan.toml in the output
// directory): `flangeseg sweep` runs the same cases from it, with base
// naming the model as seen from that directory.
func (p *Plan) Text(base string) []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "# The ring check's classes of bolts as a sweep plan, written by flangeseg ring.\n")
	fmt.Fprintf(&b, "# Each case is the model with the taper, parallel gap and ring spring of one class.\n")
	fmt.Fprintf(&b, "title = %q\nbase = %q\n", p.Sweep.Title, base)
	for _, c := range p.Classes {
		fmt.Fprintf(&b, "\n[[case]]   # bolts %s\nname = %q\nset = { %q = %s, %q = %s, %q = %s }\n", boltList(c.Bolts), c.Name,
			KeyTaper, plan.Show(c.Taper), KeyParallelGap, plan.Show(c.Parallel), KeyGapSpring, plan.Show(c.Spring))
	}
	return b.Bytes()
}

// boltList writes bolt numbers as ranges: "1–4, 7, 9–12".
func boltList(ns []int) string {
	var b bytes.Buffer
	for i := 0; i < len(ns); {
		j := i
		for j+1 < len(ns) && ns[j+1] == ns[j]+1 {
			j++
		}
		if b.Len() > 0 {
			b.WriteString(", ")
		}
		if j > i {
			fmt.Fprintf(&b, "%d–%d", ns[i], ns[j])
		} else {
			fmt.Fprintf(&b, "%d", ns[i])
		}
		i = j + 1
	}
	return b.String()
}
