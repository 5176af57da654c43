package reach

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"wetline/rating"
	"wetline/subdivide"
)

// CurveSamples is the number of equal steps in which every stage band of
// a section is sampled when a function of stage (the critical discharge,
// the conveyance) is split into monotonic pieces; the top band and a
// section evaluated stage by stage take CurveTopSamples over the span
// above the highest vertex (or the whole section). A turning point found
// between samples is located by golden-section search, so two crossings
// of a level closer together than a step are still found.
const (
	CurveSamples    = 4
	CurveTopSamples = rating.ScanSteps
)

// MaxCurveDoublings bounds how often the search above the sampled range is
// doubled in height while looking for the stage at which a growing
// quantity reaches a level (2^40 times the section's height).
const MaxCurveDoublings = 40

// bwKnot is one sample of a curve; jump marks a discontinuity between the
// previous knot (the limit from below at the same stage) and this one
// (the limit from above).
type bwKnot struct {
	h, v float64
	band int
	jump bool
}

// bwCurve is a function of stage of one section, split into pieces on
// which it is monotonic. Beyond the last knot it is taken to grow without
// bound (a section's conveyance and critical discharge do, as the depth
// grows).
type bwCurve struct {
	m     *bwModel
	fn    func(*bwState) float64
	knots []bwKnot
	// spans split the knots into monotonic runs: knots[from..to] never
	// fall (rising) or never rise; consecutive spans share a knot.
	spans []bwSpan
	// refused is the geometry's error at the first stage it refused
	// (Options.NoExtend above an end): the curve ends before it.
	refused error
}

// errAboveTop is the error of a level or a balance not reached up to
// stage top, the top of a section whose ends are not extended
// (Options.NoExtend); it wraps subdivide.ErrAboveEnds.
func errAboveTop(top float64) error {
	return fmt.Errorf("not reached up to the top of the section, stage %.6g (the lower of its ends), "+
		"which is not extended: %w", top, subdivide.ErrAboveEnds)
}

// bwSpan is a monotonic run of knots.
type bwSpan struct {
	from, to int
	rising   bool
}

// bwCrossing is a stage at which a curve passes a level.
type bwCrossing struct {
	h float64
	// rising is true where the curve grows through the level.
	rising bool
}

// newBWCurve samples fn over every band of m.
func newBWCurve(m *bwModel, fn func(*bwState) float64) (*bwCurve, error) {
	c := &bwCurve{m: m, fn: fn}
	var st bwState
	for j, b := range m.bands {
		lo, hi, steps := b.lo, b.hi, CurveSamples
		if math.IsInf(hi, 1) {
			hi, steps = lo+m.span, CurveTopSamples
		}
		start := len(c.knots)
		for i := 0; i <= steps && c.refused == nil; i++ {
			h := lo + (hi-lo)*float64(i)/float64(steps)
			if i == steps {
				h = hi
			}
			v, err := c.value(j, h, &st)
			if errors.Is(err, subdivide.ErrAboveEnds) {
				// The curve ends at the top of the section, sampled there
				// when the refused stage lies beyond it, and a level it
				// does not reach is reported there, not at the refused
				// sample.
				top := m.g.Top()
				if n := len(c.knots); top < h && (n == 0 || top > c.knots[n-1].h) {
					if vt, err := c.value(j, top, &st); err == nil {
						c.knots = append(c.knots, bwKnot{h: top, v: vt, band: j, jump: n == start && j > 0})
					}
				}
				c.refused = errAboveTop(top)
				break
			}
			if err != nil {
				return nil, err
			}
			c.knots = append(c.knots, bwKnot{h: h, v: v, band: j, jump: i == 0 && j > 0})
		}
		if err := c.refineTurns(start); err != nil {
			return nil, err
		}
		if c.refused != nil {
			break
		}
	}
	c.findSpans()
	return c, nil
}

// findSpans splits the knots into maximal monotonic runs.
func (c *bwCurve) findSpans() {
	ks := c.knots
	c.spans = c.spans[:0]
	for i := 0; i+1 < len(ks); {
		sp := bwSpan{from: i, to: i + 1, rising: true}
		dir := 0 // direction of the run once known: +1 rising, -1 falling
		for j := i + 1; j < len(ks); j++ {
			d := 0
			switch {
			case ks[j].v > ks[j-1].v:
				d = 1
			case ks[j].v < ks[j-1].v:
				d = -1
			}
			if d != 0 && dir != 0 && d != dir {
				break
			}
			if d != 0 {
				dir = d
			}
			sp.to = j
		}
		sp.rising = dir >= 0
		c.spans = append(c.spans, sp)
		i = sp.to
	}
}

func (c *bwCurve) value(band int, h float64, st *bwState) (float64, error) {
	if err := c.m.stateIn(band, h, st); err != nil {
		return 0, err
	}
	return c.fn(st), nil
}

// refineTurns inserts the turning points between the knots of one band
// from index start on.
func (c *bwCurve) refineTurns(start int) error {
	ks := c.knots[start:]
	out := make([]bwKnot, 0, len(ks)+2)
	var st bwState
	for i, k := range ks {
		if i > 0 && i+1 < len(ks) {
			d1, d2 := k.v-ks[i-1].v, ks[i+1].v-k.v
			if d1*d2 < 0 {
				h, v, err := rating.GoldenSection(func(h float64) (float64, error) { return c.value(k.band, h, &st) },
					ks[i-1].h, ks[i+1].h, d1 > 0)
				if err != nil {
					return err
				}
				switch {
				case h < k.h:
					out = append(out, bwKnot{h: h, v: v, band: k.band}, k)
					continue
				case h > k.h:
					out = append(out, k, bwKnot{h: h, v: v, band: k.band})
					continue
				}
			}
		}
		out = append(out, k)
	}
	c.knots = append(c.knots[:start], out...)
	return nil
}

// crossings returns every stage at which the curve passes level y,
// ascending: within a monotonic piece refined by Brent's method, at a
// discontinuity the stage of the jump, and above the sampled range by
// doubling the height until the curve reaches y.
func (c *bwCurve) crossings(y float64, out []bwCrossing) ([]bwCrossing, error) {
	out = out[:0]
	var st bwState
	ks := c.knots
	for _, sp := range c.spans {
		// The piece (i-1, i) of the span that crosses y, if any: the
		// first knot on the other side of y.
		first, last := ks[sp.from].v < y, ks[sp.to].v < y
		if first == last {
			continue
		}
		n := sp.to - sp.from
		i := sp.from + 1 + sort.Search(n, func(k int) bool { return (ks[sp.from+1+k].v < y) != first })
		a, b := ks[i-1], ks[i]
		if b.jump {
			out = append(out, bwCrossing{h: b.h, rising: b.v > a.v})
			continue
		}
		band := b.band
		h, err := brentRoot(func(h float64) (float64, error) {
			v, err := c.value(band, h, &st)
			return v - y, err
		}, a.h, b.h, a.v-y, b.v-y, bwStageTol(a.h-c.m.bottom))
		if err != nil {
			return out, err
		}
		out = append(out, bwCrossing{h: h, rising: b.v > a.v})
	}
	last := ks[len(ks)-1]
	if last.v < y && c.refused != nil {
		return out, c.refused
	}
	if last.v < y {
		lo, vlo := last.h, last.v
		step := last.h - c.m.bottom
		for k := 0; k < MaxCurveDoublings; k++ {
			hi := lo + step
			v, err := c.value(last.band, hi, &st)
			if err != nil {
				return out, err
			}
			if v >= y {
				band := last.band
				h, err := brentRoot(func(h float64) (float64, error) {
					v, err := c.value(band, h, &st)
					return v - y, err
				}, lo, hi, vlo-y, v-y, bwStageTol(hi-c.m.bottom))
				if err != nil {
					return out, err
				}
				return append(out, bwCrossing{h: h, rising: true}), nil
			}
			lo, vlo, step = hi, v, 2*step
		}
		return out, errNoCrossing
	}
	return out, nil
}

// criticalCurve returns the section's critical discharge (squared)
// against stage.
func (m *bwModel) criticalCurve() (*bwCurve, error) {
	if m.crit == nil {
		u := m.u
		c, err := newBWCurve(m, func(s *bwState) float64 { return s.critical2(u) })
		if err != nil {
			return nil, err
		}
		m.crit = c
	}
	return m.crit, nil
}

// conveyanceCurve returns the section's conveyance against stage.
func (m *bwModel) conveyanceCurve() (*bwCurve, error) {
	if m.conv == nil {
		c, err := newBWCurve(m, func(s *bwState) float64 { return s.k })
		if err != nil {
			return nil, err
		}
		m.conv = c
	}
	return m.conv, nil
}

// BackwaterStageTolerance is the accuracy to which the step-backwater
// solver finds a stage, as a fraction of the depth there: far inside
// rating.DepthTolerance, so that the energy equation balances to
// rounding.
const BackwaterStageTolerance = 1e-12

// minDepthScale is the least depth (length unit) by which relative
// stage tolerances and steps are scaled, so that they stay positive at a
// section's lowest point.
const minDepthScale = 1e-6

// bwStageTol is the absolute stage tolerance at depth d.
func bwStageTol(d float64) float64 {
	return BackwaterStageTolerance * math.Max(d, minDepthScale)
}

// brentRoot finds a zero of f between a and b, where fa = f(a) and
// fb = f(b) differ in sign (or one is zero), to within tol, by Brent's
// method: inverse quadratic interpolation or the secant step where they
// make progress, bisection otherwise, so that it never converges more
// slowly than bisection. Where f jumps past zero the stage of the jump is
// returned.
//
// References:
//
//	Brent, R.P., 1973, Algorithms for Minimization without Derivatives:
//	Prentice-Hall, chapter 4.
//	Press, W.H., and others, 2007, Numerical Recipes, 3rd ed., section 9.3.
func brentRoot(f func(float64) (float64, error), a, b, fa, fb, tol float64) (float64, error) {
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	c, fc := a, fa
	d := b - a
	e := d
	for range 200 {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 2*0x1p-52*math.Abs(b) + 0.5*tol
		xm := 0.5 * (c - b)
		if math.Abs(xm) <= tol1 || fb == 0 {
			return b, nil
		}
		if math.Abs(e) >= tol1 && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c {
				p = 2 * xm * s
				q = 1 - s
			} else {
				q0, r := fa/fc, fb/fc
				p = s * (2*xm*q0*(q0-r) - (b-a)*(r-1))
				q = (q0 - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*xm*q-math.Abs(tol1*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = xm, xm
			}
		} else {
			d, e = xm, xm
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else {
			b += math.Copysign(tol1, xm)
		}
		var err error
		if fb, err = f(b); err != nil {
			return b, err
		}
	}
	return b, nil
}
