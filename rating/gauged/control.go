package gauged

import (
	"errors"
	"math"
	"strings"

	"wetline/rating"
)

// MaxControls is the largest number of controls a rating may have.
const MaxControls = 4

// ControlKind says what physically controls the stage over a control's
// range: it sets the exponents a fit may take without a warning and where
// a Bayesian fit takes its prior from.
type ControlKind int

// Kinds of control. The zero value is an unspecified control.
const (
	// UnknownControl: nothing is said of the control; weak priors.
	UnknownControl ControlKind = iota
	// SectionControl: a riffle, a rock ledge or a weir crest where the flow
	// passes through critical depth.
	SectionControl
	// ChannelControl: friction in the channel reach (Manning).
	ChannelControl
)

// controlKindWords are the words of the kinds, in the order of the constants.
var controlKindWords = [...]string{"unknown", "section", "channel"}

// String returns "unknown", "section" or "channel".
func (k ControlKind) String() string {
	if k < 0 || int(k) >= len(controlKindWords) {
		return "unknown"
	}
	return controlKindWords[k]
}

// ErrControlKind is returned for an unknown control-kind word.
var ErrControlKind = errors.New("control kind must be section, channel or unknown")

// ParseControlKind reads "section", "channel" or "unknown" (any case;
// blank is unknown).
func ParseControlKind(s string) (ControlKind, error) {
	w := strings.ToLower(strings.TrimSpace(s))
	if w == "" {
		return UnknownControl, nil
	}
	for k, word := range controlKindWords {
		if w == word {
			return ControlKind(k), nil
		}
	}
	return UnknownControl, errorf("%q: %w", s, ErrControlKind)
}

// Exponent ranges of the controls (see ExponentRange).
const (
	// ExponentMargin widens the closed-form exponent ranges of prismatic
	// power-shape sections to allow for real sections and approach
	// velocity (a project choice).
	ExponentMargin = 0.2
	// UnknownExponentLow and UnknownExponentHigh bound the exponent of an
	// unspecified control: the union of the section and channel ranges
	// (a project choice).
	UnknownExponentLow, UnknownExponentHigh = 1.0, 3.0
)

// ExponentRange returns the exponents c a control of kind k may take
// without a warning. For a section whose width grows as depth^p with
// 0 ≤ p ≤ 1 (rectangle to triangle):
//
//	section control (critical flow over the crest):  Q ∝ E^(3/2 + p),  c from 3/2 to 5/2
//	channel control (Manning, wide section):         Q ∝ y^(5/3 + p),  c from 5/3 to 8/3
//
// and a deep narrow channel tends to c = 1 (R tends to a constant). Both
// follow from critical flow, Q² = g·A³/T, and Manning's equation
// (Chow, 1959, Open-Channel Hydraulics, sections 4-2 and 5-6); the
// section range is widened by ExponentMargin on both sides, the channel
// range from 1 to 8/3 + ExponentMargin. Kennedy (1984) quotes the same
// typical values (from memory): about 1.5–2.5 for section controls, near
// 5/3 for a wide channel control, more for a triangular one.
//
// References:
//
//	Chow, V. T. (1959). Open-Channel Hydraulics. McGraw-Hill.
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	Techniques of Water-Resources Investigations, book 3, chapter A10.
func ExponentRange(k ControlKind) (lo, hi float64) {
	switch k {
	case SectionControl:
		return 1.5 - ExponentMargin, 2.5 + ExponentMargin
	case ChannelControl:
		return 1.0, 8.0/3 + ExponentMargin
	}
	return UnknownExponentLow, UnknownExponentHigh
}

// Joint says how a control joins the control below it at its breakpoint.
type Joint int

// Joints. The zero value is Replace.
const (
	// Replace: the control takes over from the one below (a riffle drowned
	// by the channel); continuity at the breakpoint fixes its offset.
	Replace Joint = iota
	// Add: the control's discharge adds to that of the controls below (a
	// floodplain joining the channel); its offset is the breakpoint.
	Add
)

// String returns "replace" or "add".
func (j Joint) String() string {
	if j == Add {
		return "add"
	}
	return "replace"
}

// ErrJoint is returned for an unknown joint word.
var ErrJoint = errors.New("a control joins the one below by replace or add")

// ParseJoint reads "replace" or "add" (any case; blank is replace).
func ParseJoint(s string) (Joint, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "replace":
		return Replace, nil
	case "add":
		return Add, nil
	}
	return Replace, errorf("%q: %w", s, ErrJoint)
}

// Control is one control of a rating:
//
//	Q = A·(h − B)^C
//
// with h the gauge height, over the stages where it governs.
type Control struct {
	// Kind is what physically controls the stage.
	Kind ControlKind
	// Joint is how the control joins the one below (ignored for the first).
	Joint Joint
	// A is the coefficient (discharge unit per length unit^C), > 0.
	A float64
	// B is the offset, the control's gauge height of zero flow (length
	// unit). For a later control NewRating sets it: by continuity for
	// Replace, to From for Add.
	B float64
	// C is the exponent (dimensionless), > 0.
	C float64
	// From is the gauge height (length unit) at which the control starts
	// to govern: its breakpoint; for the first control NewRating sets it
	// to B.
	From float64
}

// Rating is a stage–discharge relation built from one to MaxControls
// controls, lowest first (see NewRating). The zero value has no controls
// and carries no discharge.
type Rating struct {
	// Controls are the controls, lowest first, with offsets and
	// breakpoints filled in.
	Controls []Control
}

// ErrControls is returned for controls that do not make a rating.
var ErrControls = errors.New("controls do not make a rating")

// NewRating joins controls into a rating continuous at each breakpoint.
// cs[0] needs A, B and C; every later control A, C, Joint and From, its
// breakpoint, above the one before. A control joined by Replace takes over
// from the rating below; continuity at its breakpoint κ,
//
//	A_k·(κ − B_k)^C_k = Q_{k−1}(κ),   so   B_k = κ − (Q_{k−1}(κ)/A_k)^(1/C_k),
//
// fixes its offset. A control joined by Add has B_k = κ and adds to the
// rating below, which carries on above κ:
//
//	Q(h) = Q_{k−1}(h) + A_k·(h − κ)^C_k.
//
// Errors wrap ErrControls: no controls or more than MaxControls, a
// coefficient or exponent that is not positive and finite, breakpoints not
// ascending above the first offset. The input is not modified.
//
// References:
//
//	Kennedy, E. J. (1984). Discharge ratings at gaging stations. USGS
//	Techniques of Water-Resources Investigations, book 3, chapter A10
//	(controls, gage height of zero flow, logarithmic rating segments).
//	Le Coz, J., Renard, B., Bonnifait, L., Branger, F., Le Boursicaud, R.
//	(2014). Combining hydraulic knowledge and uncertain gaugings in the
//	estimation of hydrometric rating curves: a Bayesian approach.
//	Journal of Hydrology 509, 573–587 (controls added or replaced,
//	continuity at the breakpoints).
func NewRating(cs []Control) (Rating, error) {
	if len(cs) == 0 || len(cs) > MaxControls {
		return Rating{}, errorf("%w: %d controls (1 to %d)", ErrControls, len(cs), MaxControls)
	}
	r := Rating{Controls: append([]Control(nil), cs...)}
	for k := range r.Controls {
		c := &r.Controls[k]
		if !positiveFinite(c.A) || !positiveFinite(c.C) {
			return Rating{}, errorf("%w: control %d has coefficient %g and exponent %g (both must be positive)", ErrControls, k+1, c.A, c.C)
		}
		if k == 0 {
			if math.IsNaN(c.B) || math.IsInf(c.B, 0) {
				return Rating{}, errorf("%w: control 1 has offset %g", ErrControls, c.B)
			}
			c.From = c.B
			continue
		}
		prev := r.Controls[k-1].From
		if !(c.From > prev) || math.IsInf(c.From, 0) {
			return Rating{}, errorf("%w: breakpoint %d at %g is not above %g", ErrControls, k, c.From, prev)
		}
		if c.Joint == Add {
			c.B = c.From
			continue
		}
		below := r.upTo(k-1, c.From)
		c.B = c.From - math.Pow(below/c.A, 1/c.C)
	}
	return r, nil
}

// positiveFinite reports 0 < v < +Inf.
func positiveFinite(v float64) bool { return v > 0 && !math.IsInf(v, 1) }

// segment returns the index of the control that governs at h (−1 at or
// below the first offset).
func (r Rating) segment(h float64) int {
	if len(r.Controls) == 0 || !(h > r.Controls[0].B) {
		return -1
	}
	j := 0
	for j+1 < len(r.Controls) && h >= r.Controls[j+1].From {
		j++
	}
	return j
}

// base returns the control that the controls base+1..j add to: j itself
// unless it joins by Add, else the nearest control below it that replaces
// (or the first control).
func (r Rating) base(j int) int {
	for j > 0 && r.Controls[j].Joint == Add {
		j--
	}
	return j
}

// upTo evaluates the rating of controls 0..j at h, carrying control j's
// formula on beyond its range (h above the first offset).
func (r Rating) upTo(j int, h float64) float64 {
	base := r.base(j)
	c := r.Controls[base]
	q := 0.0
	if h > c.B {
		q = c.A * math.Pow(h-c.B, c.C)
	}
	for m := base + 1; m <= j; m++ {
		if c := r.Controls[m]; h > c.From {
			q += c.A * math.Pow(h-c.From, c.C)
		}
	}
	return q
}

// logUpTo is ln of upTo(j, h), computed from ln A + C·ln(h − B) and
// summed in logarithms, so that it stays finite where (h − B)^C
// overflows; −Inf where upTo is zero.
func (r Rating) logUpTo(j int, h float64) float64 {
	base := r.base(j)
	c := r.Controls[base]
	l := math.Inf(-1)
	if h > c.B {
		l = math.Log(c.A) + c.C*math.Log(h-c.B)
	}
	for m := base + 1; m <= j; m++ {
		if c := r.Controls[m]; h > c.From {
			t := math.Log(c.A) + c.C*math.Log(h-c.From)
			hi, lo := math.Max(l, t), math.Min(l, t)
			l = hi + math.Log1p(math.Exp(lo-hi))
		}
	}
	return l
}

// Discharge returns the rating's discharge at gauge height h (discharge
// unit): 0 at or below the first control's offset, and above the last
// breakpoint the last control carried on.
func (r Rating) Discharge(h float64) float64 {
	j := r.segment(h)
	if j < 0 {
		return 0
	}
	return r.upTo(j, h)
}

// ErrNoStage is returned when no gauge height of a rating carries a discharge.
var ErrNoStage = errors.New("no gauge height of the rating carries this discharge")

// ratingBisect bounds the bisection steps of Rating.Stage.
const ratingBisect = 200

// Stage returns the gauge height at which the rating carries q > 0: in
// closed form on a control that stands alone, h = B + (q/A)^(1/C), and by
// bisection to rating.ShiftTolerance where a control adds to the ones
// below. The rating rises with stage (positive coefficients and exponents),
// so the root is unique. q ≤ 0 or not finite is ErrNoStage.
func (r Rating) Stage(q float64) (float64, error) {
	if !positiveFinite(q) || len(r.Controls) == 0 {
		return math.NaN(), errorf("discharge %g: %w", q, ErrNoStage)
	}
	j := 0
	for j+1 < len(r.Controls) && r.upTo(j, r.Controls[j+1].From) < q {
		j++
	}
	c := r.Controls[j]
	if j == 0 || c.Joint == Replace {
		return c.B + math.Pow(q/c.A, 1/c.C), nil
	}
	lo, hi := c.From, c.From+1
	for i := 0; r.upTo(j, hi) < q; i++ {
		if i == ratingBisect {
			return math.NaN(), errorf("discharge %g: %w", q, ErrNoStage)
		}
		hi = lo + 2*(hi-lo)
	}
	for i := 0; i < ratingBisect && hi-lo > rating.ShiftTolerance; i++ {
		mid := 0.5 * (lo + hi)
		if r.upTo(j, mid) < q {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi), nil
}

// ExponentBounds are the exponents a control may take without a warning.
type ExponentBounds struct {
	// Low and High bound the exponent (dimensionless).
	Low, High float64
	// Survey reports bounds widened to the survey's own rating.
	Survey bool
}

// ExponentWarnings returns a sentence for every control whose exponent
// lies outside ExponentRange of its kind.
func (r Rating) ExponentWarnings() []string { return r.exponentWarnings(nil) }

// exponentWarnings returns a sentence for every control whose exponent
// lies outside its bounds (nil: ExponentRange of its kind).
func (r Rating) exponentWarnings(bounds []ExponentBounds) []string {
	var out []string
	for k, c := range r.Controls {
		lo, hi := ExponentRange(c.Kind)
		what := "such a control allows"
		if k < len(bounds) {
			lo, hi = bounds[k].Low, bounds[k].High
			if bounds[k].Survey {
				what = "such a control and the section's own rating allow"
			}
		}
		if c.C < lo || c.C > hi {
			out = append(out, sayf("control %d (%s) has exponent %.3g, outside %.3g to %.3g that %s: check the control or its breakpoints",
				k+1, c.Kind, c.C, lo, hi, what))
		}
	}
	return out
}
