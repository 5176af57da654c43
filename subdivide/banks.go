package subdivide

import "math"

// Bankfull returns the bankfull stage of a section: the lower of the
// ground elevations at its two bank stations, where water first leaves
// the main channel. On a vertical wall standing at a bank station the
// higher end of the wall counts. It reports false for a section without
// banks or with fewer than two points.
func (s Section) Bankfull() (float64, bool) {
	if !s.HasBanks || len(s.Points) < 2 {
		return 0, false
	}
	l, r := GroundAt(s.Points, s.LeftBank), GroundAt(s.Points, s.RightBank)
	if math.IsNaN(l) || math.IsNaN(r) {
		return 0, false
	}
	return math.Min(l, r), true
}

// GroundAt returns the ground elevation of a ground line at station x,
// interpolated linearly between points; on a vertical wall at x the higher
// point. It returns NaN outside the ground line.
func GroundAt(pts []Point, x float64) float64 {
	best := math.Inf(-1)
	for i := 0; i+1 < len(pts); i++ {
		a, b := pts[i], pts[i+1]
		if a.Station <= x && x <= b.Station {
			if a.Station == b.Station {
				best = math.Max(best, math.Max(a.Elevation, b.Elevation))
				continue
			}
			t := (x - a.Station) / (b.Station - a.Station)
			best = math.Max(best, a.Elevation+t*(b.Elevation-a.Elevation))
		}
	}
	if math.IsInf(best, -1) {
		return math.NaN()
	}
	return best
}

// ChannelLimits returns the stations bounding the main channel in a
// subsection layout: the outer stations of its Channel subsections. It
// reports false when the layout has no overbank (the whole section is
// channel).
func ChannelLimits(subs []Subsection) (left, right float64, ok bool) {
	left, right = math.Inf(1), math.Inf(-1)
	over := false
	for _, s := range subs {
		if s.Region == Channel {
			left, right = math.Min(left, s.From), math.Max(right, s.To)
		} else {
			over = true
		}
	}
	return left, right, over && left < right
}
