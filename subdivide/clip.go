package subdivide

import (
	"fmt"
	"math"
)

// Options control how a section is wetted at a stage. The zero value
// counts only the water connected to the main channel and extends the
// section's ends with vertical walls.
//
// By default only the wetted reach that holds the main channel counts:
// the reach containing the lowest point between the bank stations, or the
// lowest point of the section when it has no banks. Water standing in a
// pocket behind higher ground (a levee, a back-swamp) stores but does not
// convey in steady flow until the ground between is overtopped, and is
// left out (its pool is still counted in Wetted.Pools).
type Options struct {
	// AllPools counts every wetted pocket, connected to the main channel
	// or not.
	AllPools bool
	// NoExtend makes a stage above either end of the section an error
	// (ErrAboveEnds) instead of extending that end with a vertical wall.
	NoExtend bool
}

// Geometry is anything that yields its wetted geometry at a stage: a
// surveyed Profile, or a built shape such as a circular conduit.
type Geometry interface {
	// At returns the wetted geometry at a stage (water-surface elevation).
	At(stage float64, opt Options) (Wetted, error)
	// Bottom is the elevation of the lowest point (the thalweg or invert).
	Bottom() float64
	// Top is the highest stage the geometry holds without extension: the
	// lower of the two end elevations of a section, or a conduit's crown.
	Top() float64
	// Subsections lists the subsections, in the order of Wetted.Subs.
	Subsections() []Subsection
}

// Wetted is the hydraulic geometry of a section at one stage. Lengths are
// in the section's unit, areas in that unit squared.
type Wetted struct {
	// Stage is the water-surface elevation.
	Stage float64
	// Area is the flow area; WettedPerimeter the length of wetted ground
	// (never the water surface, never a subsection divider); TopWidth the
	// width of the water surface.
	Area, WettedPerimeter, TopWidth float64
	// HydraulicRadius is Area/WettedPerimeter and HydraulicDepth is
	// Area/TopWidth; both are NaN where undefined (a dry section, a full
	// conduit's zero top width).
	HydraulicRadius, HydraulicDepth float64
	// CentroidDepth is the depth of the area's centroid below the water
	// surface; NaN when dry.
	CentroidDepth float64
	// Subs holds each subsection's share, in the order of Subsections().
	Subs []SubWetted
	// ExtendedLeft and ExtendedRight are the heights of the vertical walls
	// added above the section's ends (zero when the stage is below the end).
	ExtendedLeft, ExtendedRight float64
	// Pools is the number of separate wetted reaches that were counted.
	Pools int
	// Ponded is the flow area of water standing in pockets that were not
	// counted (behind higher ground, not connected to the main channel),
	// and PondedPools the number of those pockets; both zero with
	// Options.AllPools.
	Ponded      float64
	PondedPools int
	// Full reports a closed conduit flowing full.
	Full bool
}

// SubWetted is one subsection's share of the wetted geometry.
type SubWetted struct {
	Subsection
	Area, WettedPerimeter, TopWidth float64
}

// Profile is a validated section prepared for repeated wetting. It is safe
// for concurrent use; build it with Compile.
type Profile struct {
	name string
	// x0 and z0 are subtracted from every station and elevation so that
	// sums over large survey coordinates keep their precision.
	x0, z0 float64
	xs, zs []float64 // shifted points, bank stations inserted
	seg    []int     // subsection index of segment i (xs[i]→xs[i+1])
	subs   []Subsection
	// chanLow is the index of the lowest point of the main channel.
	chanLow int
	// pockets reports a ground line on which water can stand apart from
	// the main channel (see Sweep).
	pockets bool
	// joins are the stages at which pockets join the main channel's reach.
	joins []Join
}

// Compile validates a section, inserts points at the bank stations and
// splits it into subsections at the banks and wherever Manning's n changes.
// Errors are *ValidationError.
func Compile(s Section) (*Profile, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	pts := make([]Point, 0, len(s.Points)+2)
	ns := make([]float64, 0, len(s.Points)+1)
	nAt := func(i int) float64 {
		if s.N == nil {
			return 0
		}
		return s.N[i]
	}
	pts = append(pts, s.Points[0])
	for i := 1; i < len(s.Points); i++ {
		a, b := s.Points[i-1], s.Points[i]
		if s.HasBanks && a.Station < b.Station {
			for _, bank := range []float64{s.LeftBank, s.RightBank} {
				if a.Station < bank && bank < b.Station {
					t := (bank - a.Station) / (b.Station - a.Station)
					pts = append(pts, Point{bank, a.Elevation + t*(b.Elevation-a.Elevation)})
					ns = append(ns, nAt(i-1))
				}
			}
		}
		pts = append(pts, b)
		ns = append(ns, nAt(i-1))
	}
	p := &Profile{
		name: s.Name,
		x0:   pts[0].Station,
		z0:   pts[0].Elevation,
		xs:   make([]float64, len(pts)),
		zs:   make([]float64, len(pts)),
		seg:  make([]int, len(pts)-1),
	}
	for _, q := range pts {
		p.z0 = math.Min(p.z0, q.Elevation)
	}
	for i, q := range pts {
		p.xs[i] = q.Station - p.x0
		p.zs[i] = q.Elevation - p.z0
	}
	for i := range p.seg {
		reg := s.region(pts[i], pts[i+1])
		n := ns[i]
		if v := s.NByRegion.Of(reg); v > 0 {
			n = v
		}
		last := len(p.subs) - 1
		if last < 0 || p.subs[last].N != n || p.subs[last].Region != reg {
			p.subs = append(p.subs, Subsection{From: pts[i].Station, To: pts[i+1].Station, N: n, Region: reg})
		} else {
			p.subs[last].To = pts[i+1].Station
		}
		if sub := &p.subs[len(p.subs)-1]; sub.From != sub.To {
			sub.Wall = 0
		} else if sub.Wall == 0 {
			sub.Wall = -1 // rising left to right: the water stands to its left
			if pts[i+1].Elevation < pts[i].Elevation {
				sub.Wall = 1
			}
		}
		p.seg[i] = len(p.subs) - 1
	}
	// The main channel's lowest point anchors the connected reach.
	p.chanLow = -1
	for i, q := range pts {
		if s.HasBanks && (q.Station < s.LeftBank || q.Station > s.RightBank) {
			continue
		}
		if p.chanLow < 0 || q.Elevation < pts[p.chanLow].Elevation {
			p.chanLow = i
		}
	}
	// Water can be left out where the ground holds separate pools, or
	// where ground outside the channel is lower than the channel's bed.
	p.pockets = hasPockets(p.zs) || p.zs[p.chanLow] > 0
	p.joins = p.findJoins(pts)
	return p, nil
}

// Name returns the section's name as given to Compile.
func (p *Profile) Name() string { return p.name }

// Points returns a copy of the ground line with bank points inserted.
func (p *Profile) Points() []Point {
	out := make([]Point, len(p.xs))
	for i := range p.xs {
		out[i] = Point{p.xs[i] + p.x0, p.zs[i] + p.z0}
	}
	return out
}

// Bottom returns the lowest ground elevation.
func (p *Profile) Bottom() float64 { return p.z0 }

// Top returns the lower of the two end elevations: the highest stage the
// section holds without extending an end.
func (p *Profile) Top() float64 {
	return math.Min(p.zs[0], p.zs[len(p.zs)-1]) + p.z0
}

// Subsections returns a copy of the subsection layout.
func (p *Profile) Subsections() []Subsection {
	return append([]Subsection(nil), p.subs...)
}

// At computes the exact wetted geometry at a stage. The ground between
// points is straight, so every quantity is a closed-form sum over segments:
// for a segment of horizontal length dx with depths d1, d2 ≥ 0 below the
// stage at its ends,
//
//	area      = dx·(d1+d2)/2
//	moment    = dx·(d1² + d1·d2 + d2²)/6   (first moment about the surface)
//	perimeter = √(dx² + (d1−d2)²)
//
// and a segment crossing the stage contributes its wet part only. A stage
// above an end adds a vertical wall of the wetted height there (an error
// with Options.NoExtend).
func (p *Profile) At(stage float64, opt Options) (Wetted, error) {
	w := Wetted{Stage: stage, Subs: make([]SubWetted, len(p.subs))}
	for i, s := range p.subs {
		w.Subs[i].Subsection = s
	}
	if math.IsNaN(stage) || math.IsInf(stage, 0) {
		return w, fmt.Errorf("stage %v: %w", stage, ErrNotFinite)
	}
	h := stage - p.z0
	n := len(p.xs)
	// Pool numbering: a new pool may start after every dry vertex.
	keep := -1
	if !opt.AllPools {
		if keep = p.poolOf(p.chanLow, h); keep < 0 {
			keep = -2 // the main channel is dry: nothing is counted
		}
	}
	pool, lastPool, lastPond := 0, -1, -1
	var moment float64
	for i := 0; i < n-1; i++ {
		if h-p.zs[i] <= 0 {
			pool++
		}
		a, perim, width, mom := segment(p.xs[i], p.zs[i], p.xs[i+1], p.zs[i+1], h)
		if perim == 0 && a == 0 {
			continue
		}
		if keep != -1 && pool != keep {
			w.Ponded += a
			if pool != lastPond {
				w.PondedPools++
				lastPond = pool
			}
			continue
		}
		if pool != lastPool {
			w.Pools++
			lastPool = pool
		}
		sw := &w.Subs[p.seg[i]]
		sw.Area += a
		sw.WettedPerimeter += perim
		sw.TopWidth += width
		moment += mom
	}
	if keep == -2 {
		return p.finish(w), nil
	}
	// End walls: only where the counted water reaches the end.
	left := keep == -1 || keep == p.poolOfSegment(0, h)
	right := keep == -1 || keep == p.poolOfSegment(n-2, h)
	if err := p.walls(&w, h, stage, left, right, opt.NoExtend); err != nil {
		return w, err
	}
	return p.total(w, moment), nil
}

// total adds up the subsections into the whole and fills the derived
// ratios; moment is the first moment of area about the surface.
func (p *Profile) total(w Wetted, moment float64) Wetted {
	for _, s := range w.Subs {
		w.Area += s.Area
		w.WettedPerimeter += s.WettedPerimeter
		w.TopWidth += s.TopWidth
	}
	w = p.finish(w)
	if w.Area > 0 {
		w.CentroidDepth = moment / w.Area
	}
	return w
}

// finish fills the derived ratios.
func (p *Profile) finish(w Wetted) Wetted {
	w.HydraulicRadius, w.HydraulicDepth, w.CentroidDepth = math.NaN(), math.NaN(), math.NaN()
	if w.WettedPerimeter > 0 && w.Area > 0 {
		w.HydraulicRadius = w.Area / w.WettedPerimeter
	}
	if w.TopWidth > 0 && w.Area > 0 {
		w.HydraulicDepth = w.Area / w.TopWidth
	}
	return w
}

// poolOfSegment returns the pool number of segment i at shifted stage h,
// counted as in At.
func (p *Profile) poolOfSegment(i int, h float64) int {
	pool := 0
	for j := 0; j <= i; j++ {
		if h-p.zs[j] <= 0 {
			pool++
		}
	}
	return pool
}

// poolOf returns the pool number holding point k at shifted stage h, or -1
// when the point is dry.
func (p *Profile) poolOf(k int, h float64) int {
	if k < 0 || h-p.zs[k] <= 0 {
		return -1
	}
	if k == len(p.zs)-1 {
		k--
	}
	return p.poolOfSegment(k, h)
}

// segment returns the wet area, wetted length, top width and first moment
// of area about the surface of the ground from (x1,z1) to (x2,z2) at
// shifted stage h.
func segment(x1, z1, x2, z2, h float64) (area, perim, width, moment float64) {
	d1, d2 := h-z1, h-z2
	if d1 <= 0 && d2 <= 0 {
		return 0, 0, 0, 0
	}
	dx := x2 - x1
	if dx == 0 {
		lo, hi := math.Min(z1, z2), math.Max(z1, z2)
		return 0, math.Min(h, hi) - lo, 0, 0
	}
	length := math.Hypot(dx, z2-z1)
	if d1 > 0 && d2 > 0 {
		return dx * (d1 + d2) / 2, length, dx, dx * (d1*d1 + d1*d2 + d2*d2) / 6
	}
	d := math.Max(d1, d2)
	f := d / (math.Abs(d1) + math.Abs(d2)) // wet fraction of the segment
	return d * f * dx / 2, f * length, f * dx, d * d * f * dx / 6
}

// hasPockets reports whether a ground line can hold separate pools: it
// falls again after rising (an interior high point between two lower
// ones). A line that only falls then rises holds one pool at any stage.
func hasPockets(zs []float64) bool {
	rose := false
	for i := 1; i < len(zs); i++ {
		switch {
		case zs[i] > zs[i-1]:
			rose = true
		case zs[i] < zs[i-1] && rose:
			return true
		}
	}
	return false
}
