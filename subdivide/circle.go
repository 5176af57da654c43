package subdivide

import (
	"fmt"
	"math"
)

// CrownTolerance is the fraction of the diameter by which a stage may lie
// above or below a conduit's crown and still be taken as flowing full
// (round-off in a stage computed as invert + diameter).
const CrownTolerance = 1e-9

// Conduit is a circular closed conduit (a pipe or culvert barrel) with
// exact geometry. With θ the central angle subtended by the wetted arc at
// depth y in a pipe of diameter D,
//
//	θ = 2·acos(1 − 2y/D)
//	A = (D²/8)·(θ − sin θ)          wetted area
//	P = D·θ/2                       wetted perimeter
//	T = D·sin(θ/2)                  top width (the chord)
//	ȳ = 4·(D/2)·sin³(θ/2) / (3·(θ − sin θ)) − (D/2 − y)
//	                                centroid depth below the surface
//
// At full flow (y = D) the perimeter is the whole circumference πD, the
// area πD²/4, the top width zero and Wetted.Full is set; a stage above the
// crown is an error (ErrAboveCrown).
//
// References: Chow, V.T. (1959), Open-Channel Hydraulics, table 2-1
// (geometric elements of channel sections); the centroid of a circular
// segment is standard plane geometry.
type Conduit struct {
	// Diameter is the inside diameter (length unit), > 0.
	Diameter float64
	// Invert is the elevation of the lowest point of the inside.
	Invert float64
	// N is Manning's n of the barrel.
	N float64
	// Label identifies the conduit in reports (see Name).
	Label string
}

// Name returns the conduit's label.
func (c *Conduit) Name() string { return c.Label }

// Bottom returns the invert elevation.
func (c *Conduit) Bottom() float64 { return c.Invert }

// Top returns the crown elevation.
func (c *Conduit) Top() float64 { return c.Invert + c.Diameter }

// Subsections returns the conduit's one subsection, stations 0 to D.
func (c *Conduit) Subsections() []Subsection {
	return []Subsection{{From: 0, To: c.Diameter, N: c.N, Region: Channel}}
}

// SegmentAngle returns θ − sin θ, accurate for small θ as well (a series
// below 0.01 rad, where the difference cancels).
func SegmentAngle(theta float64) float64 {
	if theta < 0.01 {
		t2 := theta * theta
		return theta * t2 * (1.0/6 - t2*(1.0/120-t2/5040))
	}
	return theta - math.Sin(theta)
}

// At returns the exact wetted geometry at a stage. Options do not apply.
func (c *Conduit) At(stage float64, _ Options) (Wetted, error) {
	nan := math.NaN()
	w := Wetted{Stage: stage, HydraulicRadius: nan, HydraulicDepth: nan, CentroidDepth: nan,
		Subs: []SubWetted{{Subsection: c.Subsections()[0]}}}
	if !finite(stage) {
		return w, fmt.Errorf("stage %v: %w", stage, ErrNotFinite)
	}
	d := c.Diameter
	y := stage - c.Invert
	if y <= 0 {
		return w, nil
	}
	if y > d*(1+CrownTolerance) {
		return w, fmt.Errorf("stage %g is %.4g above the crown at %g: %w", stage, y-d, c.Top(), ErrAboveCrown)
	}
	r := d / 2
	w.Pools = 1
	if y >= d*(1-CrownTolerance) {
		w.Full = true
		w.Area = math.Pi * r * r
		w.WettedPerimeter = math.Pi * d
		w.HydraulicRadius = d / 4
		w.CentroidDepth = r
	} else {
		theta := 2 * math.Acos(1-y/r)
		sa := SegmentAngle(theta)
		s := math.Sin(theta / 2)
		w.Area = d * d / 8 * sa
		w.WettedPerimeter = d * theta / 2
		w.TopWidth = d * s
		w.HydraulicRadius = w.Area / w.WettedPerimeter
		w.HydraulicDepth = w.Area / w.TopWidth
		w.CentroidDepth = 4*r*s*s*s/(3*sa) - (r - y)
	}
	w.Subs[0].Area, w.Subs[0].WettedPerimeter, w.Subs[0].TopWidth = w.Area, w.WettedPerimeter, w.TopWidth
	return w, nil
}
