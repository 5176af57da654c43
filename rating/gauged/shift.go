package gauged

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"time"
)

// ShiftPoint is one point of a shift diagram.
type ShiftPoint struct {
	// Stage is the gauge height (length unit). NaN is allowed only in a
	// diagram of one point and no taper: a shift constant in stage.
	Stage float64
	// Shift is the stage shift at Stage (length unit): what is added to the
	// gauge height before the rating is read.
	Shift float64
}

// ShiftDiagram is a shift-adjustment diagram: the shift as a function of
// stage from a given time. It is linear in stage between its points and
// constant beyond its end points, unless a taper stage is given: then the
// shift runs linearly from the nearest end point to zero at the taper
// stage and stays zero beyond it (a full shift at low flow fading out where
// the control changes, say).
//
// The zero value has no points; Validate rejects it.
type ShiftDiagram struct {
	// Time is when the diagram applies (from a field visit).
	Time time.Time
	// Points are by strictly ascending stage.
	Points []ShiftPoint
	// HasTaper says whether Taper holds the gauge height at which the shift
	// reaches zero (length unit); it lies below the first point or above
	// the last.
	HasTaper bool
	Taper    float64
	// Abrupt says the diagram takes effect at once at Time, with the
	// previous diagram holding until then (a flood changed the control),
	// instead of being prorated in time from the previous one.
	Abrupt bool
	// Source says where the diagram came from ("shifts.csv:12"), for
	// messages; empty when built in code.
	Source string
}

// MinShiftSlope is the limit of a shift diagram's slope ds/dh: at −1 or
// steeper the effective stage h + s(h), and so the discharge, would fall
// as the stage rises (Kennedy, 1983, USGS TWRI 3-A13).
const MinShiftSlope = -1.0

// Shift diagram errors, for errors.Is.
var (
	ErrShiftSlope     = errors.New("shift diagram refused: its slope ds/dh is −1 or steeper, so discharge would fall as the stage rises")
	ErrShiftEmpty     = errors.New("a shift diagram needs at least one point")
	ErrShiftNotFinite = errors.New("stage and shift must be finite numbers")
	ErrShiftStages    = errors.New("two points of one shift diagram are at the same stage")
	ErrShiftNoStage   = errors.New("a stage is needed in a diagram of several points or with a taper")
	ErrTaperInside    = errors.New("the taper stage must lie below the diagram's first point or above its last")
	ErrShiftTime      = errors.New("shift diagrams must be in time order, one diagram per time")
	ErrShiftConflict  = errors.New("rows of one diagram disagree")
)

// A ShiftError reports a shift diagram that cannot be used.
type ShiftError struct {
	// Point is the 0-based index of the offending point; -1 when the error
	// concerns the whole diagram. Taper says the taper stage is at fault
	// (the segment from the end point to the taper, for a slope).
	Point int
	Taper bool
	Err   error
}

func (e *ShiftError) Error() string {
	switch {
	case e.Taper:
		return "taper: " + e.Err.Error()
	case e.Point < 0:
		return e.Err.Error()
	}
	return fmt.Sprintf("point %d: %v", e.Point+1, e.Err)
}

func (e *ShiftError) Unwrap() error { return e.Err }

// Validate checks a diagram and returns the first problem as a *ShiftError,
// or nil: points must be finite with stages strictly ascending, a taper
// must lie outside the points, and no segment (the taper's included) may
// have a slope ds/dh ≤ MinShiftSlope.
func (d ShiftDiagram) Validate() error {
	if len(d.Points) == 0 {
		return &ShiftError{Point: -1, Err: ErrShiftEmpty}
	}
	constant := len(d.Points) == 1 && !d.HasTaper
	for i, p := range d.Points {
		if math.IsNaN(p.Stage) && !constant {
			return &ShiftError{Point: i, Err: ErrShiftNoStage}
		}
		if math.IsInf(p.Stage, 0) || !finiteNumber(p.Shift) {
			return &ShiftError{Point: i, Err: ErrShiftNotFinite}
		}
		if i == 0 {
			continue
		}
		prev := d.Points[i-1]
		if !(p.Stage > prev.Stage) {
			if p.Stage == prev.Stage {
				return &ShiftError{Point: i, Err: fmt.Errorf("%w (%g)", ErrShiftStages, p.Stage)}
			}
			return &ShiftError{Point: i, Err: fmt.Errorf("%w: stage %g follows %g", ErrShiftStages, p.Stage, prev.Stage)}
		}
		if slope := (p.Shift - prev.Shift) / (p.Stage - prev.Stage); slope <= MinShiftSlope {
			return &ShiftError{Point: i, Err: fmt.Errorf("%w (slope %.4g between stages %g and %g)", ErrShiftSlope, slope, prev.Stage, p.Stage)}
		}
	}
	if !d.HasTaper {
		return nil
	}
	first, last := d.Points[0], d.Points[len(d.Points)-1]
	switch {
	case !finiteNumber(d.Taper):
		return &ShiftError{Point: -1, Taper: true, Err: ErrShiftNotFinite}
	case d.Taper > last.Stage:
		if slope := -last.Shift / (d.Taper - last.Stage); slope <= MinShiftSlope {
			return &ShiftError{Point: -1, Taper: true, Err: fmt.Errorf("%w (slope %.4g between stage %g and the taper at %g)", ErrShiftSlope, slope, last.Stage, d.Taper)}
		}
	case d.Taper < first.Stage:
		if slope := first.Shift / (first.Stage - d.Taper); slope <= MinShiftSlope {
			return &ShiftError{Point: -1, Taper: true, Err: fmt.Errorf("%w (slope %.4g between the taper at %g and stage %g)", ErrShiftSlope, slope, d.Taper, first.Stage)}
		}
	default:
		return &ShiftError{Point: -1, Taper: true, Err: fmt.Errorf("%w (taper %g, points %g to %g)", ErrTaperInside, d.Taper, first.Stage, last.Stage)}
	}
	return nil
}

// curve is a diagram's shift as a piecewise-linear function of stage,
// taper included, constant beyond its ends.
type curve struct {
	h, s []float64
}

// curveOf lays out a valid diagram's points, with the taper as a point of
// zero shift.
func curveOf(d ShiftDiagram) curve {
	c := curve{h: make([]float64, 0, len(d.Points)+1), s: make([]float64, 0, len(d.Points)+1)}
	if d.HasTaper && d.Taper < d.Points[0].Stage {
		c.h, c.s = append(c.h, d.Taper), append(c.s, 0)
	}
	for _, p := range d.Points {
		c.h, c.s = append(c.h, p.Stage), append(c.s, p.Shift)
	}
	if d.HasTaper && d.Taper > d.Points[len(d.Points)-1].Stage {
		c.h, c.s = append(c.h, d.Taper), append(c.s, 0)
	}
	return c
}

// at is the shift at stage h.
func (c curve) at(h float64) float64 {
	n := len(c.h)
	if n == 1 || h <= c.h[0] {
		return c.s[0]
	}
	if h >= c.h[n-1] {
		return c.s[n-1]
	}
	i := 1 // diagrams have a few points: a scan beats a search
	for c.h[i] < h {
		i++
	}
	f := (h - c.h[i-1]) / (c.h[i] - c.h[i-1])
	return c.s[i-1] + f*(c.s[i]-c.s[i-1])
}

// At returns the diagram's shift at gauge height h (length unit). The
// diagram must be valid.
func (d ShiftDiagram) At(h float64) float64 { return curveOf(d).at(h) }

// ShiftRow is one row of a shift-diagram table: the format in which shift
// diagrams are read and in which proposed diagrams are written back. Rows of
// one diagram share a time and follow each other.
type ShiftRow struct {
	// Time is when the row's diagram applies.
	Time time.Time
	// Stage is the gauge height of the point (length unit); NaN for the
	// lone row of a diagram constant in stage.
	Stage float64
	// Shift is the shift at Stage (length unit).
	Shift float64
	// HasTaper and Taper: the diagram's taper stage (length unit), given on
	// any of its rows (rows that give it must agree).
	HasTaper bool
	Taper    float64
	// Abrupt: the diagram takes effect at once (any row may say so).
	Abrupt bool
	// Source says where the row came from, for messages.
	Source string
}

// A ShiftRowError reports the row of a shift table at fault.
type ShiftRowError struct {
	// Row is the 0-based index of the row in the rows given.
	Row int
	// Field names the value at fault: "time", "stage", "shift", "taper" or
	// "abrupt".
	Field string
	Err   error
}

func (e *ShiftRowError) Error() string {
	return fmt.Sprintf("row %d: %s: %v", e.Row+1, e.Field, e.Err)
}

func (e *ShiftRowError) Unwrap() error { return e.Err }

// DiagramsFromRows gathers shift rows into diagrams: consecutive rows with
// the same time (as an instant) make one diagram, its points sorted by
// stage. Diagram times must increase. Every diagram is validated; the
// errors (as *ShiftRowError naming the row and field at fault, one per
// diagram at most) are joined.
func DiagramsFromRows(rows []ShiftRow) ([]ShiftDiagram, error) {
	var out []ShiftDiagram
	var errs []error
	for start := 0; start < len(rows); {
		end := start + 1
		for end < len(rows) && rows[end].Time.Equal(rows[start].Time) {
			end++
		}
		if start > 0 && !rows[start].Time.After(rows[start-1].Time) {
			errs = append(errs, &ShiftRowError{Row: start, Field: "time", Err: fmt.Errorf("%w: %s is not after the diagram before it (%s)",
				ErrShiftTime, rows[start].Time.Format(time.RFC3339), rows[start-1].Time.Format(time.RFC3339))})
		}
		d, err := diagramOf(rows, start, end)
		if err != nil {
			errs = append(errs, err)
		} else {
			out = append(out, d)
		}
		start = end
	}
	return out, errors.Join(errs...)
}

// diagramOf builds the diagram of rows[start:end].
func diagramOf(rows []ShiftRow, start, end int) (ShiftDiagram, error) {
	d := ShiftDiagram{Time: rows[start].Time, Source: rows[start].Source}
	order := make([]int, 0, end-start)
	taperRow := -1
	for i := start; i < end; i++ {
		r := rows[i]
		if r.HasTaper {
			if taperRow >= 0 && r.Taper != d.Taper {
				other := fmt.Sprintf("the row at stage %g", rows[taperRow].Stage)
				if math.IsNaN(rows[taperRow].Stage) {
					other = "an earlier row"
				}
				return d, &ShiftRowError{Row: i, Field: "taper", Err: fmt.Errorf("%w: taper %g, %s says %g", ErrShiftConflict, r.Taper, other, d.Taper)}
			}
			if taperRow < 0 {
				taperRow, d.HasTaper, d.Taper = i, true, r.Taper
			}
		}
		d.Abrupt = d.Abrupt || r.Abrupt
		order = append(order, i)
	}
	sort.SliceStable(order, func(a, b int) bool { return rows[order[a]].Stage < rows[order[b]].Stage })
	for _, i := range order {
		d.Points = append(d.Points, ShiftPoint{Stage: rows[i].Stage, Shift: rows[i].Shift})
	}
	err := d.Validate()
	var se *ShiftError
	if err == nil || !errors.As(err, &se) {
		return d, err
	}
	switch {
	case se.Taper:
		return d, &ShiftRowError{Row: taperRow, Field: "taper", Err: se.Err}
	case se.Point < 0:
		return d, &ShiftRowError{Row: start, Field: "shift", Err: se.Err}
	}
	field := "shift"
	if errors.Is(se.Err, ErrShiftStages) || errors.Is(se.Err, ErrShiftNoStage) {
		field = "stage"
	}
	return d, &ShiftRowError{Row: order[se.Point], Field: field, Err: se.Err}
}

// Rows returns the diagram as rows of a shift table, one per point, each
// carrying the taper and the abrupt mark: the form in which a diagram is
// written to be edited and read back.
func (d ShiftDiagram) Rows() []ShiftRow {
	out := make([]ShiftRow, len(d.Points))
	for i, p := range d.Points {
		out[i] = ShiftRow{Time: d.Time, Stage: p.Stage, Shift: p.Shift, HasTaper: d.HasTaper, Taper: d.Taper, Abrupt: d.Abrupt, Source: d.Source}
	}
	return out
}
