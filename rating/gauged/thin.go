package gauged

import (
	"errors"
	"math"
	"sort"
	"strings"

	"wetline/rating"
)

// ErrThinControl is the cause of given breakpoints that leave a control
// fewer gaugings than the fit needs of it (MinPerSegment): least squares
// asks it of every control, a Bayesian fit of every control on weak
// priors.
var ErrThinControl = errors.New("a control holds too few gaugings")

// thinControls returns the controls (0-based) of a rating of k controls
// that breaks (given, ascending, k−1 of them) leave fewer than
// MinPerSegment of the gaugings d holds, but for those exempt (a
// Bayesian control on priors from the survey; nil exempts none).
func thinControls(d *data, breaks []float64, k int, exempt func(j int) bool) []int {
	var thin []int
	for j := range k {
		lo, hi := controlSpan(breaks, j)
		if d.countIn(lo, hi) < MinPerSegment && (exempt == nil || !exempt(j)) {
			thin = append(thin, j)
		}
	}
	return thin
}

// controlSpan is the stages lo ≤ h < hi that breakpoints give control j
// (0-based): from −Inf for the first, to +Inf for the last.
func controlSpan(breaks []float64, j int) (lo, hi float64) {
	lo, hi = math.Inf(-1), math.Inf(1)
	if j > 0 {
		lo = breaks[j-1]
	}
	if j < len(breaks) {
		hi = breaks[j]
	}
	return lo, hi
}

// thinControlError words the controls thin (0-based, from thinControls)
// that breaks leave too few gaugings: each with its stages, how many of
// the gaugings used it holds and at which stages, then the gauged range
// and what to do. why, when not empty, says why a control needs them
// (its prior, for a Bayesian fit); advice is appended. It wraps
// ErrThinControl.
func thinControlError(d *data, breaks []float64, thin []int, u rating.Units, why func(j int) string, advice string) error {
	L := u.Length()
	parts := make([]string, len(thin))
	for i, j := range thin {
		lo, hi := controlSpan(breaks, j)
		where := sayf("from %s %s up", gh(lo), L)
		switch {
		case j == 0:
			where = sayf("below %s %s", gh(hi), L)
		case j < len(breaks):
			where = sayf("from %s to %s %s", gh(lo), gh(hi), L)
		}
		c := d.countIn(lo, hi)
		held := ""
		switch first := d.firstIn(lo); {
		case c == 1:
			held = sayf(", at %s %s", gh(d.h[first]), L)
		case c > 1:
			held = sayf(", from %s to %s %s", gh(d.h[first]), gh(d.h[first+c-1]), L)
		}
		parts[i] = sayf("control %d (%s) holds %d of the %d gaugings used%s", j+1, where, c, d.n(), held)
		if why != nil {
			if w := why(j); w != "" {
				parts[i] += ", " + w
			}
		}
	}
	each := ""
	if len(thin) > 1 {
		each = " each"
	}
	return errorf("%w: %s: fewer than %d%s (%s; the gaugings used lie from %s to %s %s); %s",
		ErrThinControl, strings.Join(parts, "; "), MinPerSegment, each, breakList(breaks, L), gh(d.lo), gh(d.hi), L, advice)
}

// breakList says where breakpoints were given: "breakpoint given at
// 2.1 m", "breakpoints given at 0.5, 1.2 and 2.1 m".
func breakList(breaks []float64, L string) string {
	s := make([]string, len(breaks))
	for i, b := range breaks {
		s[i] = gh(b)
	}
	if len(s) == 1 {
		return "breakpoint given at " + s[0] + " " + L
	}
	return "breakpoints given at " + rating.JoinAnd(s) + " " + L
}

// firstIn is the index of the first gauging of d (stages ascending) at or
// above lo.
func (d *data) firstIn(lo float64) int { return sort.SearchFloat64s(d.h, lo) }
