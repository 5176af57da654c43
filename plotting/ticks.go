package plotting

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
)

// LogTicks125 marks a logarithmic axis at 1, 2 and 5 times each power of
// ten, with unlabelled minor marks at the other integers. Over more than
// Decades125 decades the 2 marks lose their labels, and over more than
// Decades15 the 5 marks too, so the labels do not crowd. Unlike
// plot.LogTicks it labels a range lying inside one decade. Min must be
// > 0; a range with min ≤ 0 yields no ticks.
type LogTicks125 struct{}

// Label density limits of LogTicks125, in decades of range.
const (
	Decades125 = 2.5 // up to this, 1, 2 and 5 are labelled
	Decades15  = 3.0 // up to this, 1 and 5 are labelled; beyond, only 1
)

var _ plot.Ticker = LogTicks125{}

// Ticks implements plot.Ticker.
func (LogTicks125) Ticks(min, max float64) []plot.Tick {
	if !(min > 0) || !(max >= min) || !finite(min, max) {
		return nil
	}
	decades := math.Log10(max / min)
	var out []plot.Tick
	for e := math.Floor(math.Log10(min)); e <= math.Ceil(math.Log10(max)); e++ {
		p := math.Pow(10, e)
		for m := 1; m <= 9; m++ {
			v := float64(m) * p
			if v < min*(1-tickEpsilon) || v > max*(1+tickEpsilon) {
				continue
			}
			t := plot.Tick{Value: v}
			if m == 1 || m == 5 && decades <= Decades15 || m == 2 && decades <= Decades125 {
				t.Label = fmtNum(v)
			}
			out = append(out, t)
		}
	}
	return out
}

// tickEpsilon is the relative slack within which a tick at an axis end
// still counts as inside the range.
const tickEpsilon = 1e-9

// logRange returns axis limits for positive values lo ≤ hi on a log
// scale: rounded outwards to 1, 2 or 5 times a power of ten, and at
// least a factor of 2 wide (a log axis cannot show a single value).
func logRange(lo, hi float64) (float64, float64) {
	if hi/lo < 2 {
		m := math.Sqrt(hi * lo)
		lo, hi = m/math.Sqrt2, m*math.Sqrt2
	}
	return nice125(lo, false), nice125(hi, true)
}

// nice125 rounds v > 0 down (or up) to 1, 2 or 5 times a power of ten.
func nice125(v float64, up bool) float64 {
	p := math.Pow(10, math.Floor(math.Log10(v)))
	steps := []float64{1, 2, 5, 10}
	if up {
		for _, m := range steps {
			if m*p >= v*(1-tickEpsilon) {
				return m * p
			}
		}
		return 10 * p
	}
	for i := len(steps) - 1; i >= 0; i-- {
		if steps[i]*p <= v*(1+tickEpsilon) {
			return steps[i] * p
		}
	}
	return p
}

// linearTicks marks a linear axis at a round step (1, 2 or 5 times a
// power of ten) giving about n labelled marks (0: targetTicks), with one
// unlabelled mark between labelled ones.
type linearTicks struct{ n int }

// targetTicks is the number of labelled marks a linear axis aims for.
const targetTicks = 7

// maxLinearTicks bounds the marks of one linear axis: a step rounded to
// 1, 2 or 5 gives at most about 4n of them, so more means a range the
// step does not divide (one whose span overflows, say).
const maxLinearTicks = 1000

func (lt linearTicks) Ticks(min, max float64) []plot.Tick {
	if !finite(min, max) || !(max > min) {
		return nil
	}
	n := lt.n
	if n <= 0 {
		n = targetTicks
	}
	step := niceStep((max - min) / float64(n))
	half := step / 2
	if !finite(max-min, step) || !(half > 0) || (max-min)/half > maxLinearTicks {
		return nil // a span beyond a float64, or one a step cannot divide
	}
	var out []plot.Tick
	start := math.Ceil(min/half-tickEpsilon) * half
	for i := 0; i <= maxLinearTicks; i++ {
		v := start + float64(i)*half
		if v-max > half*tickEpsilon { // not v > max+…, which overflows near the largest float64
			break
		}
		t := plot.Tick{Value: v}
		if k := v / step; math.Abs(k-math.Round(k)) < stepMultipleTolerance {
			t.Value = math.Round(k) * step
			t.Label = strconv.FormatFloat(t.Value, 'f', decimals(step), 64)
		}
		out = append(out, t)
	}
	return out
}

// stepMultipleTolerance is how close, in steps, a half-step mark must be
// to a whole multiple of the step to be labelled.
const stepMultipleTolerance = 1e-6

// niceStep rounds x > 0 to the nearest of 1, 2 or 5 times a power of ten.
func niceStep(x float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(x)))
	switch m := x / p; {
	case m < 1.5:
		return p
	case m < 3.5:
		return 2 * p
	case m < 7.5:
		return 5 * p
	}
	return 10 * p
}

// decimals is the number of decimals a step needs.
func decimals(step float64) int {
	d := -int(math.Floor(math.Log10(step) + tickEpsilon))
	if d < 0 {
		return 0
	}
	return d
}
