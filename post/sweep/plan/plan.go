package plan

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"flangeseg/fem/segment/modelfile"
)

// Ways of combining the varied keys.
const (
	Grid = "grid" // every combination, the first key varying slowest
	Zip  = "zip"  // the i-th value of every key together; the lists have one length
)

// Plan is a plan file as decoded: a base model and what to vary.
type Plan struct {
	Path    string // the plan file as the user named it
	Title   string
	Base    string // the base model file as the plan names it (relative to the plan's folder)
	Combine string // Grid or Zip
	// Set are keys set in every case, before its own values: the base
	// as the sweep runs it (a coarser mesh for a trial, say).
	Set   []Setting
	Vary  []Vary
	Named []Named
	// BaseText is the base model file's text; Text the plan's.
	BaseText, Text []byte
}

// Vary is one varied key and its values, in order.
type Vary struct {
	Key    string // a model-file key, e.g. "contact.recess" or "contact.zones[1].from"
	Values []any  // TOML values: int64, float64, string, bool, arrays, tables
}

// Named is a case the plan names, run after the combined ones: the base
// with its own values set.
type Named struct {
	Name string
	Set  []Setting
}

// Setting is one key set to one value.
type Setting struct {
	Key   string
	Value any
}

// Case is one model of the sweep.
type Case struct {
	Index int    // 1, 2, … in plan order: the combined cases, then the named ones
	Name  string // its folder name under cases/
	Set   []Setting
	Text  []byte // its model file: the base with Set applied
	Spec  *modelfile.Spec
}

// Error lists every problem of a plan and its cases, one per line, each
// prefixed with the plan file's name: the model file's error type, so a
// plan's problems read like a model's.
type Error = modelfile.Error

// Load reads the plan file at path and its base model, and makes its
// cases. Every problem is reported at once in a *Error: of the plan
// (unknown keys, wrong types, broken rules) and, when the plan itself is
// sound, of each case whose model breaks a rule of the model file.
func Load(path string) (*Plan, []Case, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, nil, fmt.Errorf("read plan file: %w", err)
	}
	p, errs := decode(text)
	p.Path, p.Text = path, text
	if p.Base != "" {
		base := p.Base
		if !filepath.IsAbs(base) {
			base = filepath.Join(filepath.Dir(path), base)
		}
		if p.BaseText, err = os.ReadFile(base); err != nil {
			errs = append(errs, fmt.Errorf("base = %q: cannot read the base model: %w", p.Base, errors.Unwrap(err)))
		}
	}
	if len(errs) > 0 {
		return nil, nil, &Error{File: path, Errs: errs}
	}
	cases, errs := p.Cases()
	if len(errs) > 0 {
		return nil, nil, &Error{File: path, Errs: errs}
	}
	return p, cases, nil
}
