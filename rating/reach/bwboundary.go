package reach

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"wetline/rating"
)

// BoundaryKind names how the stage at the downstream end of a reach is
// set for each discharge.
type BoundaryKind int

// The downstream boundaries of a step-backwater computation (Davidian,
// 1984, USGS TWRI 3-A15).
const (
	// NormalDepth: the normal stage at Boundary.Slope (Manning's equation
	// with the subdivided conveyance of the last section).
	NormalDepth BoundaryKind = iota
	// CriticalDepth: the critical stage of the last section.
	CriticalDepth
	// KnownStage: Boundary.Stage at every discharge.
	KnownStage
	// StageRating: the stage of a stage–discharge relation at the last
	// section (Boundary.Rating or Boundary.StageOf).
	StageRating
)

func (k BoundaryKind) String() string {
	switch k {
	case NormalDepth:
		return "normal"
	case CriticalDepth:
		return "critical"
	case KnownStage:
		return "stage"
	case StageRating:
		return "rating"
	}
	return fmt.Sprintf("BoundaryKind(%d)", int(k))
}

// StageDischarge is one point of a stage–discharge relation: a stage
// (length unit) and the discharge there (discharge unit).
type StageDischarge struct {
	Stage, Discharge float64
}

// Boundary is the downstream boundary of a step-backwater computation, at
// the last section of the reach. Only the fields of its Kind are read.
type Boundary struct {
	// Kind selects the boundary (default NormalDepth).
	Kind BoundaryKind
	// Slope is the friction slope of NormalDepth, dimensionless, > 0.
	Slope float64
	// Stage is the water-surface elevation of KnownStage (length unit).
	Stage float64
	// Rating holds the points of a StageRating, both stage and discharge
	// strictly increasing (two or more); without StageOf the stage of a
	// discharge between two points is interpolated linearly, and a
	// discharge outside the points is an error (ErrBoundaryRange), never
	// extrapolated.
	Rating []StageDischarge
	// StageOf, when set, gives the stage of a StageRating at discharge q
	// instead of Rating, which then only describes the rating (String,
	// Words, reports): a table read log-linearly in (h − e), say. An error
	// wrapping ErrBoundaryRange is returned as it is.
	StageOf func(q float64) (float64, error)
	// Warnings are unusual but legal facts of how the boundary is read (a
	// rating table read linearly in stage, say); the computation reports
	// them among its warnings.
	Warnings []string
}

// Errors of the boundary, for errors.Is.
var (
	ErrBoundary      = errors.New("unusable downstream boundary")
	ErrBoundaryRange = errors.New("discharge outside the range of the boundary rating")
)

func (b Boundary) String() string {
	switch b.Kind {
	case NormalDepth:
		return fmt.Sprintf("normal depth at slope %g", b.Slope)
	case CriticalDepth:
		return "critical depth"
	case KnownStage:
		return fmt.Sprintf("stage %g", b.Stage)
	case StageRating:
		if n := len(b.Rating); n > 0 {
			return fmt.Sprintf("stage-discharge rating of %d points, %g to %g", n, b.Rating[0].Discharge, b.Rating[n-1].Discharge)
		}
		if b.StageOf != nil {
			return "stage-discharge rating (function)"
		}
		return "stage-discharge rating"
	}
	return b.Kind.String()
}

// Words describes the boundary for a report, with the units of u: the
// slope of normal depth, the stage of a known stage, the points and
// discharge range of a rating.
func (b Boundary) Words(u rating.Units) string {
	switch b.Kind {
	case KnownStage:
		return fmt.Sprintf("stage %.3f %s", b.Stage, u.Length())
	case StageRating:
		if n := len(b.Rating); n > 0 {
			return fmt.Sprintf("stage–discharge rating of %d points, %.4g to %.4g %s", n, b.Rating[0].Discharge, b.Rating[n-1].Discharge, u.Discharge())
		}
	}
	return b.String()
}

// validate checks the fields the kind reads.
func (b Boundary) validate() error {
	switch b.Kind {
	case NormalDepth:
		if !(b.Slope > 0) || math.IsInf(b.Slope, 0) {
			return fmt.Errorf("%w: normal depth needs a positive slope, not %v", ErrBoundary, b.Slope)
		}
	case CriticalDepth:
	case KnownStage:
		if !finite(b.Stage) {
			return fmt.Errorf("%w: stage %v is not a finite number", ErrBoundary, b.Stage)
		}
	case StageRating:
		if b.StageOf != nil {
			return nil
		}
		if len(b.Rating) < 2 {
			return fmt.Errorf("%w: a stage-discharge rating needs two or more points, not %d", ErrBoundary, len(b.Rating))
		}
		for i, p := range b.Rating {
			if !finite(p.Stage) || !finite(p.Discharge) || p.Discharge < 0 {
				return fmt.Errorf("%w: rating point %d (stage %v, discharge %v) is not usable", ErrBoundary, i+1, p.Stage, p.Discharge)
			}
			if i > 0 && !(p.Stage > b.Rating[i-1].Stage && p.Discharge > b.Rating[i-1].Discharge) {
				return fmt.Errorf("%w: rating point %d: stage and discharge must both increase", ErrBoundary, i+1)
			}
		}
	default:
		return fmt.Errorf("%w: unknown kind %v", ErrBoundary, b.Kind)
	}
	return nil
}

// ratingStage returns the stage of a StageRating at discharge q.
func (b Boundary) ratingStage(q float64) (float64, error) {
	if b.StageOf != nil {
		h, err := b.StageOf(q)
		switch {
		case errors.Is(err, ErrBoundaryRange):
			return math.NaN(), err
		case err != nil:
			return math.NaN(), fmt.Errorf("%w: discharge %g: %w", ErrBoundary, q, err)
		}
		if !finite(h) {
			return math.NaN(), fmt.Errorf("%w: the rating gives stage %v at discharge %g", ErrBoundary, h, q)
		}
		return h, nil
	}
	pts := b.Rating
	n := len(pts)
	if q < pts[0].Discharge || q > pts[n-1].Discharge {
		return math.NaN(), fmt.Errorf("%w: %g is not within %g to %g", ErrBoundaryRange, q, pts[0].Discharge, pts[n-1].Discharge)
	}
	i := sort.Search(n, func(i int) bool { return pts[i].Discharge >= q })
	if i == 0 {
		return pts[0].Stage, nil
	}
	a, c := pts[i-1], pts[i]
	t := (q - a.Discharge) / (c.Discharge - a.Discharge)
	return a.Stage + t*(c.Stage-a.Stage), nil
}
