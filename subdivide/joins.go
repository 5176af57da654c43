package subdivide

import "math"

// Join is a stage at which water standing in a pocket behind higher ground
// (a levee, a back-swamp) joins the wetted reach of the main channel as the
// stage rises. Without Options.AllPools, At leaves the pocket's water out
// up to and including Stage, the crest of the ground between, and counts
// it at every stage above: the flow area, and with it the conveyance,
// steps there by the pocket's area at the crest.
type Join struct {
	// Stage is the elevation of the crest that is overtopped.
	Stage float64
	// Crest is the station of the crest; From and To (From < To) bound the
	// ground that joins the flow just above Stage: from the crest to the
	// next ground higher than it on the far side, or to the end of the
	// section when there is none.
	Crest, From, To float64
	// Above is a stage just above Stage, the first at which At counts
	// the pocket (the next float64 up, or a few bits above where the
	// section's elevations are large): the wetted geometry there is the
	// limit from above at the crest.
	Above float64
}

// Joins returns the stages at which pockets join the main channel's
// wetted reach (see Join), in ascending order of stage; none when the
// ground holds no pocket.
//
// Method. The wetted reach holding the main channel's lowest point ends,
// on each side, at the first point outward whose elevation is at or above
// the stage. Walking outward from the lowest point, the points higher than
// every point before them (the running maxima r₀, r₁, …) are where it
// ends: for stages in (z(rₖ₋₁), z(rₖ)] it ends at rₖ, and just above z(rₖ)
// it reaches rₖ₊₁ (or the section's end). Every point between rₖ and rₖ₊₁
// is at most z(rₖ); if one is lower, water stands there at the stage
// z(rₖ) apart from the channel, and joins it just above: a Join at the
// stage z(rₖ), exactly the crest's surveyed elevation.
func (p *Profile) Joins() []Join {
	return append([]Join(nil), p.joins...)
}

// findJoins finds the joins of a compiled profile (see Joins); pts are its
// points as surveyed (bank points inserted), whose elevations and stations
// the joins report exactly.
func (p *Profile) findJoins(pts []Point) []Join {
	if !p.pockets {
		return nil
	}
	var out []Join
	n := len(p.zs)
	for _, dir := range []int{-1, 1} {
		b := p.chanLow
		for {
			nb := b + dir
			for nb >= 0 && nb < n && !(p.zs[nb] > p.zs[b]) {
				nb += dir
			}
			end := nb // the far bound, or one past the section's end
			if end < 0 {
				end = 0
			} else if end >= n {
				end = n - 1
			}
			lower := false
			for i := b + dir; i != end+dir && i >= 0 && i < n; i += dir {
				if i != nb && p.zs[i] < p.zs[b] {
					lower = true
				}
			}
			if lower {
				lo, hi := pts[b].Station, pts[end].Station
				if lo > hi {
					lo, hi = hi, lo
				}
				out = append(out, Join{Stage: pts[b].Elevation, Crest: pts[b].Station, From: lo, To: hi, Above: p.above(b, pts[b].Elevation)})
			}
			if nb < 0 || nb >= n {
				break
			}
			b = nb
		}
	}
	// Two walks give ascending stages each: merge them.
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j].Stage < out[j-1].Stage; j-- {
			out[j], out[j-1] = out[j-1], out[j]
		}
	}
	return out
}

// above returns a stage just above z, the elevation of point k, whose
// shifted value lies above the point's shifted elevation: the first stage
// at which At takes the point as wet, to the rounding of the shift (the
// next float64 above z when the shift is exact).
func (p *Profile) above(k int, z float64) float64 {
	s := math.Nextafter(z, math.Inf(1))
	// Where the shift rounds coarser than z's last bit, step by growing
	// multiples of the coarser bit instead of bit by bit.
	step := math.Max(math.Abs(z), math.Abs(p.z0)) * 0x1p-52
	for i := 0; !(s-p.z0 > p.zs[k]); i++ {
		if i < 4 {
			s = math.Nextafter(s, math.Inf(1))
			continue
		}
		s += step
		step *= 2
	}
	return s
}
