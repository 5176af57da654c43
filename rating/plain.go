package rating

import (
	"fmt"
	"math"
	"strings"
	"unicode/utf8"
)

// plainFloat is a float64 that a message writes in plain decimal, never
// with an exponent: under %g (and %v) to the precision's significant
// figures by PlainFigures, the shortest that reads back without a
// precision, one figure for precision 0 as fmt; width in characters, the
// flags -, + and 0 as fmt reads them; NaN and ±Inf as fmt writes them.
// Other verbs are fmt's own.
type plainFloat float64

// Format implements fmt.Formatter.
func (p plainFloat) Format(s fmt.State, verb rune) {
	v := float64(p)
	if (verb != 'g' && verb != 'v') || math.IsNaN(v) || math.IsInf(v, 0) {
		fmt.Fprintf(s, fmt.FormatString(s, verb), v)
		return
	}
	n, ok := s.Precision()
	switch {
	case !ok:
		n = 17 // the shortest decimal that reads back, as %g
	case n == 0:
		n = 1 // as fmt: %.0g is one significant figure
	}
	out := PlainFigures(v, n)
	if s.Flag('+') && v >= 0 {
		out = "+" + out
	}
	// The width counts characters, not bytes ("×" is two bytes); the 0
	// flag pads with zeros after the sign, as fmt does, unless - is given.
	if w, ok := s.Width(); ok && utf8.RuneCountInString(out) < w {
		k := w - utf8.RuneCountInString(out)
		switch {
		case s.Flag('-'):
			out += strings.Repeat(" ", k)
		case s.Flag('0'):
			sign := ""
			if out[0] == '+' || out[0] == '-' {
				sign, out = out[:1], out[1:]
			}
			out = sign + strings.Repeat("0", k) + out
		default:
			out = strings.Repeat(" ", k) + out
		}
	}
	fmt.Fprint(s, out)
}

// plainArgs returns a with every float64 (and each element of a
// []float64) made a plainFloat.
func plainArgs(a []any) []any {
	out := make([]any, len(a))
	for i, x := range a {
		switch v := x.(type) {
		case float64:
			out[i] = plainFloat(v)
		case []float64:
			p := make([]plainFloat, len(v))
			for j, f := range v {
				p[j] = plainFloat(f)
			}
			out[i] = p
		default:
			out[i] = x
		}
	}
	return out
}

// Sayf is fmt.Sprintf with the floats of a (and the elements of a
// []float64) written in plain decimal under %g and %v (PlainFigures to
// the precision's significant figures): messages never print e-notation
// (2.971e+04, 7e+02), which few readers of a rating read at a glance.
func Sayf(format string, a ...any) string {
	if len(a) == 0 {
		return fmt.Sprintf(format, a...) // and go vet checks the callers' verbs
	}
	return fmt.Sprintf(format, plainArgs(a)...)
}

// Errorf is fmt.Errorf with the floats of a written in plain decimal, as
// Sayf; %w wraps as with fmt.Errorf.
func Errorf(format string, a ...any) error {
	if len(a) == 0 {
		return fmt.Errorf(format, a...) // and go vet checks the callers' verbs
	}
	return fmt.Errorf(format, plainArgs(a)...)
}
