package rating

import (
	"math"
	"strconv"
	"strings"
)

// maxDecimalDigits bounds the decimals a stage step may have for the
// stages of a range to be written exactly as decimals.
const maxDecimalDigits = 9

// decimalOf writes v as an integer numerator over 10^p, when v's shortest
// decimal form has at most maxDecimalDigits decimals and the numerator
// fits an exact float64 integer.
func decimalOf(v float64) (num int64, p int, ok bool) {
	s := strconv.FormatFloat(v, 'f', -1, 64)
	whole, frac, _ := strings.Cut(s, ".")
	if len(frac) > maxDecimalDigits {
		return 0, 0, false
	}
	n, err := strconv.ParseInt(whole+frac, 10, 64)
	if err != nil || math.Abs(float64(n)) > maxExactInteger {
		return 0, 0, false
	}
	return n, len(frac), true
}

// steppedStages returns the n+1 stages from + i·step, i = 0 … n. When
// from and step are short decimals each stage is the float64 nearest the
// exact decimal sum (so 100.3 + 33 × 0.1 is 103.6, as typed, not
// 103.60000000000001), and written out it carries no float noise.
func steppedStages(from, step float64, n int) []float64 {
	out := make([]float64, 0, n+1)
	a, pa, okA := decimalOf(from)
	m, pm, okM := decimalOf(step)
	if okA && okM {
		p := max(pa, pm)
		a *= pow10(p - pa)
		m *= pow10(p - pm)
		den := float64(pow10(p))
		if last := a + int64(n)*m; math.Abs(float64(last)) <= maxExactInteger && math.Abs(float64(a)) <= maxExactInteger {
			for i := 0; i <= n; i++ {
				out = append(out, float64(a+int64(i)*m)/den)
			}
			return out
		}
	}
	for i := 0; i <= n; i++ {
		out = append(out, from+float64(i)*step)
	}
	return out
}

// pow10 returns 10^p for 0 ≤ p ≤ 18.
func pow10(p int) int64 {
	r := int64(1)
	for range p {
		r *= 10
	}
	return r
}

// StepMultiple returns k·step, k a whole number, as the float64 nearest
// the exact decimal product when step is a short decimal (6 × 0.1 is 0.6,
// not 0.6000000000000001): a grid stage as a table lays it out.
func StepMultiple(k, step float64) float64 { return multiple(k, step) }

// multiple returns k·step as the float64 nearest the exact decimal
// product when step is a short decimal.
func multiple(k float64, step float64) float64 {
	if m, p, ok := decimalOf(step); ok && math.Abs(k*float64(m)) <= maxExactInteger {
		return k * float64(m) / float64(pow10(p))
	}
	return k * step
}

// DecimalDifference returns a − b, as the float64 nearest the exact
// difference of their shortest decimal forms when both have at most nine
// decimals (an elevation less a gauge datum: 100.7915 − 100 is 0.7915, not
// 0.7914999999999992); otherwise the float64 difference.
func DecimalDifference(a, b float64) float64 {
	na, pa, okA := decimalOf(a)
	nb, pb, okB := decimalOf(b)
	if !okA || !okB {
		return a - b
	}
	p := max(pa, pb)
	na *= pow10(p - pa)
	nb *= pow10(p - pb)
	if d := na - nb; math.Abs(float64(na)) <= maxExactInteger && math.Abs(float64(nb)) <= maxExactInteger && math.Abs(float64(d)) <= maxExactInteger {
		return float64(d) / float64(pow10(p))
	}
	return a - b
}

// DecimalMean returns (a + b)/2, as the float64 nearest the exact mean of
// their shortest decimal forms when both have at most nine decimals (the
// mean of marks at 407.45 and 407.38 is 407.415, not 407.41499999999996);
// otherwise the float64 mean.
func DecimalMean(a, b float64) float64 {
	na, pa, okA := decimalOf(a)
	nb, pb, okB := decimalOf(b)
	if !okA || !okB {
		return (a + b) / 2
	}
	p := max(pa, pb)
	na *= pow10(p - pa)
	nb *= pow10(p - pb)
	if s := na + nb; math.Abs(float64(na)) <= maxExactInteger && math.Abs(float64(nb)) <= maxExactInteger && math.Abs(float64(s)) <= maxExactInteger {
		return float64(s) / float64(2*pow10(p)) // one correctly rounded division
	}
	return (a + b) / 2
}

// PlainFigures writes v rounded to n significant figures (n ≥ 1) in plain
// decimal, never with an exponent: for n = 4, 1362.4 as 1362, 13621 as
// 13620 and 0.052341 as 0.05234. It is the form of a
// discharge in summary lines and figure footnotes, where 1.36e+03 would
// be read by few. Zero is "0" (without a sign); NaN and ±Inf are "-"; a
// value of PlainLimit or more, or of less than PlainSmall but not zero, is
// written with a power of ten: 3.3×10^33, 1.946×10^-300.
func PlainFigures(v float64, n int) string {
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return "-"
	case v == 0:
		return "0"
	}
	// Rounding through the exponent form rounds at the n-th figure
	// whatever the magnitude; the shortest plain form of the result then
	// carries no float noise (1180, not 1179.9999999999998).
	e := strconv.FormatFloat(v, 'e', max(n, 1)-1, 64)
	r, err := strconv.ParseFloat(e, 64)
	if err != nil {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	if a := math.Abs(r); a >= PlainLimit || a < PlainSmall { // no quantity of a river: a degenerate fit's
		mant, exp, _ := strings.Cut(e, "e")
		x, _ := strconv.Atoi(exp)
		if strings.Contains(mant, ".") {
			mant = strings.TrimRight(strings.TrimRight(mant, "0"), ".")
		}
		return mant + "×10^" + strconv.Itoa(x)
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// PlainLimit is the size from which PlainFigures writes a power of ten
// (3.3×10^33) rather than every digit: no quantity the project computes
// comes near it, so such a value is a degenerate estimate (a posterior
// standard deviation without bound), and 34 digits would hide that.
const PlainLimit = 1e15

// PlainSmall is the size below which PlainFigures writes a power of ten
// (1.946×10^-300) rather than the zeros before the figures: the
// coefficient of a degenerate power law, where 300 zeros would hide the
// figures and what they say. Quantities the project reports plainly,
// down to 0.000000001, stay above it.
const PlainSmall = 1e-10
