package gauged

import (
	"errors"
	"fmt"
	"math"
)

// RatingPoint is one row of a stage–discharge table.
type RatingPoint struct {
	// Stage is the gauge height (length unit).
	Stage float64
	// Discharge is the rated discharge at Stage (discharge unit), ≥ 0.
	Discharge float64
}

// RatingTable is a gauge's stage–discharge rating given as a table, as a
// rating fit or a hydraulic rating writes it, or as any office keeps it.
// It is a plain value; Compile checks it and prepares it for lookups.
//
// The zero value is an empty table, which Compile rejects.
type RatingTable struct {
	// Name identifies the rating in reports (a file name, a rating number).
	Name string
	// Points are the table's rows by strictly ascending stage.
	Points []RatingPoint
	// HasZeroFlow says whether ZeroFlow holds the gauge height of zero
	// flow e (length unit). At or below e the discharge is zero; between
	// rows above e the table is interpolated log-linearly in (h − e).
	HasZeroFlow bool
	ZeroFlow    float64
	// ZeroFlowSource says where ZeroFlow came from, for reports ("given
	// by --zero-flow", "the table's depth column", "the table's last dry
	// row"; "" when not said).
	ZeroFlowSource string
	// HasHighGauging says whether HighGauging holds the gauge height of the
	// highest gauging the rating rests on (length unit); effective stages
	// above it are flagged.
	HasHighGauging bool
	HighGauging    float64
	// Extrapolate allows discharges outside the table's rows (the end
	// intervals' laws carried on); by default a stage outside the table has
	// no discharge.
	Extrapolate bool
}

// Lookup says how a discharge was found at a stage.
type Lookup uint8

// Lookups. Only InTable and ZeroFlow are within the rating as given.
const (
	// InTable: interpolated between two rows of the table.
	InTable Lookup = iota
	// ZeroFlow: the stage is at or below the gauge height of zero flow;
	// the discharge is zero.
	ZeroFlow
	// Extrapolated: the stage lies outside the table and extrapolation was
	// asked for.
	Extrapolated
	// OutsideTable: the stage lies outside the table; no discharge (NaN).
	OutsideTable
	// NoRating: no rating is in force at the time (outside every rating
	// period, or in a period without a rating); no discharge (NaN).
	NoRating
)

func (l Lookup) String() string {
	switch l {
	case ZeroFlow:
		return "zero flow"
	case Extrapolated:
		return "extrapolated"
	case OutsideTable:
		return "outside the rating"
	case NoRating:
		return "no rating in force"
	}
	return "in table"
}

// Rating table errors, for errors.Is.
var (
	ErrRatingTooFew      = errors.New("a rating table needs at least two rows")
	ErrRatingNotFinite   = errors.New("stage and discharge must be finite numbers")
	ErrRatingNegative    = errors.New("discharge must not be negative")
	ErrRatingStages      = errors.New("stages of a rating table must increase from row to row")
	ErrRatingNotRising   = errors.New("discharge must rise with stage once it is above zero")
	ErrZeroFlowAbove     = errors.New("the gauge height of zero flow is at or above a row with flow")
	ErrDryAboveZeroFlow  = errors.New("a row without flow lies above the gauge height of zero flow")
	ErrBeyondTable       = errors.New("outside the rating table")
	ErrNoCommonRange     = errors.New("the two ratings share no range of stage")
	ErrRatingNoDischarge = errors.New("no stage of the rating carries this discharge")
)

// A RatingError reports a rating table that cannot be used.
type RatingError struct {
	// Point is the 0-based index of the offending row, or -1 when the error
	// concerns the whole table.
	Point int
	// Field names the value at fault: "stage", "discharge" or "zero_flow".
	Field string
	Err   error
}

func (e *RatingError) Error() string {
	if e.Point < 0 {
		return e.Field + ": " + e.Err.Error()
	}
	return fmt.Sprintf("row %d: %s: %v", e.Point+1, e.Field, e.Err)
}

func (e *RatingError) Unwrap() error { return e.Err }

// Validate checks a table and returns the first problem as a *RatingError,
// or nil. Stages must strictly increase; discharges must be finite and
// ≥ 0, and once above zero must strictly rise (rows of zero discharge may
// repeat at the foot of the table, below the control); e may not lie at or
// above a row with flow (ErrZeroFlowAbove), nor below a row without flow
// (ErrDryAboveZeroFlow): above e the control passes flow, so a dry row
// there contradicts e as a row with flow at or below it does, and the
// table's foot could not be read log-linearly in (h − e).
func (t RatingTable) Validate() error {
	if len(t.Points) < 2 {
		return &RatingError{Point: -1, Field: "points", Err: ErrRatingTooFew}
	}
	if t.HasZeroFlow && !finiteNumber(t.ZeroFlow) {
		return &RatingError{Point: -1, Field: "zero_flow", Err: ErrRatingNotFinite}
	}
	if t.HasHighGauging && !finiteNumber(t.HighGauging) {
		return &RatingError{Point: -1, Field: "high_gauging", Err: ErrRatingNotFinite}
	}
	for i, p := range t.Points {
		switch {
		case !finiteNumber(p.Stage):
			return &RatingError{Point: i, Field: "stage", Err: ErrRatingNotFinite}
		case !finiteNumber(p.Discharge):
			return &RatingError{Point: i, Field: "discharge", Err: ErrRatingNotFinite}
		case p.Discharge < 0:
			return &RatingError{Point: i, Field: "discharge", Err: ErrRatingNegative}
		}
		if t.HasZeroFlow && p.Discharge > 0 && !(p.Stage > t.ZeroFlow) {
			return &RatingError{Point: i, Field: "stage", Err: fmt.Errorf("%w: %g carries %g but e is %g", ErrZeroFlowAbove, p.Stage, p.Discharge, t.ZeroFlow)}
		}
		if t.HasZeroFlow && p.Discharge == 0 && p.Stage > t.ZeroFlow {
			return &RatingError{Point: i, Field: "stage", Err: fmt.Errorf("%w: %g has no flow but e is %g", ErrDryAboveZeroFlow, p.Stage, t.ZeroFlow)}
		}
		if i == 0 {
			continue
		}
		prev := t.Points[i-1]
		if !(p.Stage > prev.Stage) {
			return &RatingError{Point: i, Field: "stage", Err: fmt.Errorf("%w: %g follows %g", ErrRatingStages, p.Stage, prev.Stage)}
		}
		if p.Discharge > 0 && !(p.Discharge > prev.Discharge) || p.Discharge == 0 && prev.Discharge > 0 {
			return &RatingError{Point: i, Field: "discharge", Err: fmt.Errorf("%w: %g at stage %g follows %g at stage %g",
				ErrRatingNotRising, p.Discharge, p.Stage, prev.Discharge, prev.Stage)}
		}
	}
	return nil
}

// interval is the law of the rating between two rows: log-linear,
// Q = exp(y0 + b·(ln(h − e) − x0)), or linear, Q = y0 + b·(h − x0).
type interval struct {
	log       bool
	x0, y0, b float64
}

// TableRating is a compiled rating table, ready for fast lookups. It is safe
// for concurrent use; build it with RatingTable.Compile.
type TableRating struct {
	table RatingTable
	h, q  []float64
	iv    []interval
}

// Compile validates a rating table and prepares its interpolation laws.
// Errors are *RatingError. The table is copied.
func (t RatingTable) Compile() (*TableRating, error) {
	if err := t.Validate(); err != nil {
		return nil, err
	}
	t.Points = append([]RatingPoint(nil), t.Points...)
	r := &TableRating{table: t, h: make([]float64, len(t.Points)), q: make([]float64, len(t.Points)), iv: make([]interval, len(t.Points)-1)}
	for i, p := range t.Points {
		r.h[i], r.q[i] = p.Stage, p.Discharge
	}
	for i := range r.iv {
		h0, h1, q0, q1 := r.h[i], r.h[i+1], r.q[i], r.q[i+1]
		if t.HasZeroFlow && t.ZeroFlow < h0 && q0 > 0 {
			r.iv[i] = r.logLaw(i)
			continue
		}
		r.iv[i] = interval{x0: h0, y0: q0, b: (q1 - q0) / (h1 - h0)}
	}
	// The stretch from a dry row at or below e up to the first row with
	// flow: the next stretch's power law carried down to e, anchored at
	// the first row with flow, so that the table's foot follows the
	// control in (h − e) rather than a straight line to zero.
	for i := range r.iv {
		if !t.HasZeroFlow || r.q[i] != 0 || !(r.q[i+1] > 0) || r.h[i] > t.ZeroFlow || i+1 >= len(r.iv) {
			continue
		}
		next := r.logLaw(i + 1)
		r.iv[i] = interval{log: true, x0: next.x0, y0: next.y0, b: next.b}
	}
	return r, nil
}

// logLaw is the log-linear law in (h − e) through rows i and i+1, which
// both carry flow above e.
func (r *TableRating) logLaw(i int) interval {
	e := r.table.ZeroFlow
	x0, x1 := math.Log(r.h[i]-e), math.Log(r.h[i+1]-e)
	y0, y1 := math.Log(r.q[i]), math.Log(r.q[i+1])
	return interval{log: true, x0: x0, y0: y0, b: (y1 - y0) / (x1 - x0)}
}

// Name returns the rating's name.
func (r *TableRating) Name() string { return r.table.Name }

// Table returns a copy of the table the rating was compiled from.
func (r *TableRating) Table() RatingTable {
	t := r.table
	t.Points = append([]RatingPoint(nil), t.Points...)
	return t
}

// ZeroFlow returns the table's gauge height of zero flow (length unit) and
// whether the table has one.
func (r *TableRating) ZeroFlow() (float64, bool) { return r.table.ZeroFlow, r.table.HasZeroFlow }

// Range returns the stages of the table's first and last rows.
func (r *TableRating) Range() (lo, hi float64) { return r.h[0], r.h[len(r.h)-1] }

// eval applies interval i's law at stage h.
func (r *TableRating) eval(i int, h float64) float64 {
	v := r.iv[i]
	if v.log {
		return math.Exp(v.y0 + v.b*(math.Log(h-r.table.ZeroFlow)-v.x0))
	}
	return math.Max(0, v.y0+v.b*(h-v.x0))
}

// Discharge returns the rated discharge at gauge height h and how it was
// found. Between rows i and i+1 with the zero-flow stage e known and below
// both rows (and flow at both) the table is interpolated log-linearly,
//
//	Q = Qᵢ·((h − e)/(hᵢ − e))^bᵢ,   bᵢ = ln(Qᵢ₊₁/Qᵢ) / ln((hᵢ₊₁ − e)/(hᵢ − e)),
//
// as expanded agency ratings are, and linearly otherwise. Between a row
// without flow at or below e and the first row with flow (stage h₁,
// discharge Q₁) the exponent of the stretch above is carried down,
//
//	Q = Q₁·((h − e)/(h₁ − e))^b₁,
//
// so the foot of the table is log-linear in (h − e) too; a table with a
// single row with flow has no such exponent and stays linear there. At or
// below e the discharge is zero (ZeroFlow). Outside the table the discharge is NaN
// (OutsideTable) unless the table allows extrapolation: then the end
// interval's law is carried on (Extrapolated; never below zero).
//
// References:
//
//	Kennedy, E.J., 1984, Discharge ratings at gaging stations: USGS
//	Techniques of Water-Resources Investigations, book 3, chap. A10.
//	Kennedy, E.J., 1983, Computation of continuous records of streamflow:
//	USGS Techniques of Water-Resources Investigations, book 3, chap. A13.
func (r *TableRating) Discharge(h float64) (float64, Lookup) {
	if math.IsNaN(h) {
		return math.NaN(), OutsideTable
	}
	if r.table.HasZeroFlow && h <= r.table.ZeroFlow {
		return 0, ZeroFlow
	}
	n := len(r.h)
	switch {
	case h < r.h[0]:
		if !r.table.Extrapolate {
			return math.NaN(), OutsideTable
		}
		return r.eval(0, h), Extrapolated
	case h > r.h[n-1]:
		if !r.table.Extrapolate {
			return math.NaN(), OutsideTable
		}
		return r.eval(n-2, h), Extrapolated
	}
	i := searchFloats(r.h, h) // first row with stage ≥ h
	if i == 0 {
		return r.q[0], InTable
	}
	if r.h[i] == h {
		return r.q[i], InTable
	}
	return r.eval(i-1, h), InTable
}

// AboveGaugings reports whether an effective gauge height lies above the
// highest gauging of the rating (false when that is not known).
func (r *TableRating) AboveGaugings(h float64) bool {
	return r.table.HasHighGauging && h > r.table.HighGauging
}

// Stage returns the gauge height at which the rating carries discharge
// q > 0: the inverse of Discharge, exact for both interpolation laws. A
// discharge outside the table's range is an ErrBeyondTable error unless the
// table allows extrapolation; q ≤ 0 (or NaN) is ErrRatingNoDischarge, since
// every stage at or below zero flow carries it.
func (r *TableRating) Stage(q float64) (float64, error) {
	if !(q > 0) || math.IsInf(q, 0) {
		return math.NaN(), fmt.Errorf("%w: %g", ErrRatingNoDischarge, q)
	}
	n := len(r.q)
	i := searchFloats(r.q, q) // first row with discharge ≥ q
	switch {
	case i < n && r.q[i] == q:
		return r.h[i], nil
	case i == 0 || i == n:
		if !r.table.Extrapolate {
			return math.NaN(), fmt.Errorf("%w: discharge %g is outside %g to %g", ErrBeyondTable, q, r.q[0], r.q[n-1])
		}
		if i == 0 {
			return r.invert(0, q)
		}
		return r.invert(n-2, q)
	}
	return r.invert(i-1, q)
}

// invert solves interval i's law for the stage carrying q.
func (r *TableRating) invert(i int, q float64) (float64, error) {
	v := r.iv[i]
	if !(v.b > 0) {
		return math.NaN(), fmt.Errorf("%w: %g (the rating is flat there)", ErrRatingNoDischarge, q)
	}
	if v.log {
		return r.table.ZeroFlow + math.Exp(v.x0+(math.Log(q)-v.y0)/v.b), nil
	}
	return v.x0 + (q-v.y0)/v.b, nil
}

// searchFloats returns the first index i with xs[i] ≥ x (len(xs) when
// none); xs ascends. It is sort.SearchFloat64s without the closure, for the
// record's million lookups.
func searchFloats(xs []float64, x float64) int {
	lo, hi := 0, len(xs)
	for lo < hi {
		m := int(uint(lo+hi) >> 1)
		if xs[m] < x {
			lo = m + 1
		} else {
			hi = m
		}
	}
	return lo
}

func finiteNumber(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
