package handcalc

import (
	"errors"
	"fmt"
	"math"
)

// violations collects broken input rules, each as "field = value: rule",
// so that a caller sees all of them at once.
type violations []error

// check records field unless its value is finite and ok holds.
func (v *violations) check(field string, x float64, ok bool, rule string) {
	switch {
	case math.IsNaN(x) || math.IsInf(x, 0):
		*v = append(*v, fmt.Errorf("%s = %g: must be a finite number", field, x))
	case !ok:
		*v = append(*v, fmt.Errorf("%s = %g: %s", field, x, rule))
	}
}

// add records a violation that is not a plain number rule.
func (v *violations) add(format string, args ...any) {
	*v = append(*v, fmt.Errorf(format, args...))
}

// err joins the violations under the name of what was checked, or returns
// nil if there are none.
func (v violations) err(what string) error {
	if err := errors.Join(v...); err != nil {
		return fmt.Errorf("handcalc: %s: %w", what, err)
	}
	return nil
}
