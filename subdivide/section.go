package subdivide

import (
	"errors"
	"fmt"
	"math"
)

// Point is one surveyed ground point: Station is the horizontal distance
// from the section's origin, increasing left to right looking downstream;
// Elevation is the ground elevation. Both are in the section's length unit.
type Point struct {
	Station, Elevation float64
}

// Region says which part of a section a subsection lies in.
type Region int

// The regions of a section. A section without bank stations is all Channel.
const (
	Channel Region = iota
	LeftOverbank
	RightOverbank
)

func (r Region) String() string {
	switch r {
	case LeftOverbank:
		return "left overbank"
	case RightOverbank:
		return "right overbank"
	}
	return "channel"
}

// Section is a surveyed cross-section: a ground line with Manning's n and,
// optionally, the two bank stations that bound the main channel.
//
// The zero value is an empty section; Compile rejects it.
type Section struct {
	// Name identifies the section in reports (a site or section id).
	Name string
	// Points is the ground line, left to right looking downstream.
	Points []Point
	// N holds Manning's n (s/m^(1/3) or its US equivalent, the same number)
	// of the ground from Points[i] to Points[i+1]: len(Points)-1 values.
	// Nil means no n is known; NByRegion or a later override must supply it.
	N []float64
	// NByRegion, where a region's value is > 0, replaces N for every
	// segment in that region.
	NByRegion PerRegion
	// HasBanks says whether LeftBank and RightBank hold the stations of the
	// main-channel limits. Both must lie within the section, LeftBank < RightBank.
	HasBanks            bool
	LeftBank, RightBank float64
}

// PerRegion holds one value for each region of a section: the left
// overbank, the main channel and the right overbank (a Manning's n, a
// flow length, ...). A zero value means none is given for that region. A
// section without banks is all channel.
type PerRegion struct {
	Left, Channel, Right float64
}

// Uniform returns v for every region.
func Uniform(v float64) PerRegion { return PerRegion{Left: v, Channel: v, Right: v} }

// Of returns the value of region r.
func (p PerRegion) Of(r Region) float64 {
	switch r {
	case LeftOverbank:
		return p.Left
	case RightOverbank:
		return p.Right
	}
	return p.Channel
}

// Array returns the values indexed by Region (Channel, LeftOverbank,
// RightOverbank), for loops over the regions.
func (p PerRegion) Array() [3]float64 {
	var a [3]float64
	a[Channel], a[LeftOverbank], a[RightOverbank] = p.Channel, p.Left, p.Right
	return a
}

// Subsection describes one part of a section between vertical dividers:
// at the bank stations and wherever Manning's n changes.
type Subsection struct {
	// From and To are the station range (length unit).
	From, To float64
	// N is Manning's n of the subsection's ground.
	N float64
	// Region is the part of the section it lies in.
	Region Region
	// Wall is 0 for a subsection with width. A subsection of no width is a
	// vertical wall whose n differs from the ground beside it: it holds no
	// water, only wetted perimeter, and Wall is -1 when the wall faces the
	// subsection on its left (the ground is lower there, so that is where
	// the water against it stands) or +1 when it faces the one on its
	// right.
	Wall int
}

// A ValidationError reports a section that cannot be used.
type ValidationError struct {
	// Point is the 0-based index of the offending point, or -1 when the
	// error concerns the whole section.
	Point int
	// Field names what is wrong: "station", "elevation", "n", "banks", "points".
	Field string
	Err   error
}

func (e *ValidationError) Error() string {
	if e.Point < 0 {
		return e.Field + ": " + e.Err.Error()
	}
	return fmt.Sprintf("point %d: %s: %v", e.Point+1, e.Field, e.Err)
}

func (e *ValidationError) Unwrap() error { return e.Err }

// Validation causes, for errors.Is.
var (
	ErrTooFewPoints = errors.New("a section needs at least two points")
	ErrNotFinite    = errors.New("value is not a finite number")
	ErrOverhang     = errors.New("station decreases (an overhang): stations must not decrease left to right")
	ErrZeroWidth    = errors.New("all points are at one station: the section has no width")
	ErrBadN         = errors.New("roughness (Manning's n) must be a positive number")
	ErrNLength      = errors.New("one n per segment is needed (points minus one)")
	ErrBanks        = errors.New("bank stations must lie within the section, left before right")
	ErrAboveEnds    = errors.New("stage is above an end of the section")
)

// Validate checks a section's points, roughness and banks and returns the
// first problem found as a *ValidationError, or nil.
func (s Section) Validate() error {
	if len(s.Points) < 2 {
		return &ValidationError{Point: -1, Field: "points", Err: ErrTooFewPoints}
	}
	for i, p := range s.Points {
		if !finite(p.Station) {
			return &ValidationError{Point: i, Field: "station", Err: ErrNotFinite}
		}
		if !finite(p.Elevation) {
			return &ValidationError{Point: i, Field: "elevation", Err: ErrNotFinite}
		}
		if i > 0 && p.Station < s.Points[i-1].Station {
			return &ValidationError{Point: i, Field: "station", Err: ErrOverhang}
		}
	}
	first, last := s.Points[0].Station, s.Points[len(s.Points)-1].Station
	if last == first {
		return &ValidationError{Point: -1, Field: "points", Err: ErrZeroWidth}
	}
	if s.N != nil {
		if len(s.N) != len(s.Points)-1 {
			return &ValidationError{Point: -1, Field: "n", Err: ErrNLength}
		}
		for i, n := range s.N {
			if !(n > 0) || math.IsInf(n, 0) {
				return &ValidationError{Point: i, Field: "n", Err: ErrBadN}
			}
		}
	}
	for _, n := range []float64{s.NByRegion.Left, s.NByRegion.Channel, s.NByRegion.Right} {
		if n < 0 || math.IsNaN(n) || math.IsInf(n, 0) {
			return &ValidationError{Point: -1, Field: "n", Err: ErrBadN}
		}
	}
	if s.HasBanks {
		l, r := s.LeftBank, s.RightBank
		if !finite(l) || !finite(r) || l < first || r > last || !(l < r) {
			return &ValidationError{Point: -1, Field: "banks", Err: ErrBanks}
		}
	}
	return nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// region returns the region of the segment from a to b (a.Station <= b.Station).
// A vertical wall standing exactly on a bank station belongs to the side its
// wet face looks into: a rising wall (ground higher on the right) holds water
// on its left, a falling wall on its right.
func (s Section) region(a, b Point) Region {
	if !s.HasBanks {
		return Channel
	}
	l, r := s.LeftBank, s.RightBank
	if a.Station == b.Station {
		x := a.Station
		rising := b.Elevation > a.Elevation
		switch {
		case x < l:
			return LeftOverbank
		case x > r:
			return RightOverbank
		case x == l && rising:
			return LeftOverbank
		case x == r && !rising:
			return RightOverbank
		}
		return Channel
	}
	mid := 0.5 * (a.Station + b.Station)
	switch {
	case mid < l:
		return LeftOverbank
	case mid > r:
		return RightOverbank
	}
	return Channel
}

// XZ builds a ground line from station, elevation pairs:
// XZ(0, 2, 5, 0, 10, 2) is three points. It panics on an odd count, a
// programmer's mistake.
func XZ(pairs ...float64) []Point {
	if len(pairs)%2 != 0 {
		panic("subdivide: XZ needs station, elevation pairs")
	}
	out := make([]Point, len(pairs)/2)
	for i := range out {
		out[i] = Point{Station: pairs[2*i], Elevation: pairs[2*i+1]}
	}
	return out
}
