package report

import (
	"html"
	"math"
	"strconv"
	"strings"
)

// defaultDigits is the number of significant digits of a number that
// does not ask for another: enough to read a result, few enough that
// rounding noise does not show.
const defaultDigits = 4

// formatNumber writes v to the given significant digits in fixed-point
// form, never rounding away digits of the integer part, and in
// scientific form (1.234×10⁻⁵) for magnitudes below 10⁻³ or from 10⁹ on.
// NaN is written as "—".
func formatNumber(v float64, digits int) string {
	if digits <= 0 {
		digits = defaultDigits
	}
	switch a := math.Abs(v); {
	case math.IsNaN(v):
		return "—"
	case a == 0:
		return "0"
	case a < 1e-3 || a >= 1e9:
		return scientific(v, digits)
	}
	mag := int(math.Floor(math.Log10(math.Abs(v))))
	dec := max(0, digits-1-mag)
	s := trimZeros(strconv.FormatFloat(v, 'f', dec, 64))
	if strings.Trim(s, "-0.") == "" {
		return "0" // -0.000 after rounding
	}
	return s
}

// trimZeros drops trailing zeros after the decimal point: a note shows
// "26 mm", not "26.00 mm".
func trimZeros(s string) string {
	if !strings.Contains(s, ".") {
		return s
	}
	return strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
}

func scientific(v float64, digits int) string {
	s := strconv.FormatFloat(v, 'e', digits-1, 64) // e.g. 1.234e-05
	mant, exp, _ := strings.Cut(s, "e")
	n, _ := strconv.Atoi(exp)
	return trimZeros(mant) + "×10" + superscript(n)
}

func superscript(n int) string {
	const digits = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	sup := []rune(digits)
	var b strings.Builder
	if n < 0 {
		b.WriteRune('⁻')
		n = -n
	}
	for _, c := range strconv.Itoa(n) {
		b.WriteRune(sup[c-'0'])
	}
	return b.String()
}

// unitText is the unit as shown: "–" for a pure number.
func unitText(u string) string {
	if u == Dimensionless {
		return "–"
	}
	return u
}

// cellHTML is the escaped text of a cell. withUnit adds the cell's own
// unit after the number, "[–]" for a pure number.
func cellHTML(c Cell, withUnit bool) string {
	if c.IsText {
		return esc(c.Text)
	}
	s := esc(formatNumber(c.Value, c.Digits))
	switch {
	case !withUnit || math.IsNaN(c.Value) || c.Unit == "":
	case c.Unit == Dimensionless:
		s += "&#8239;[–]" // a bare number would read as one whose unit was forgotten
	default:
		s += "&#8239;" + esc(c.Unit) // narrow no-break space keeps number and unit together
	}
	return s
}

// symbolHTML sets the part of a trade symbol after its first '_' as a
// subscript: "F_p,C" → F<sub>p,C</sub>.
func symbolHTML(s string) string {
	base, sub, ok := strings.Cut(s, "_")
	if !ok {
		return "<i>" + esc(s) + "</i>"
	}
	return "<i>" + esc(base) + "</i><sub>" + esc(sub) + "</sub>"
}

func esc(s string) string { return html.EscapeString(s) }
