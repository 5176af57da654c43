package rating

import (
	"errors"
	"fmt"
	"math"

	"wetline/subdivide"
)

// ErrNoN is returned when a wetted subsection has no Manning's n.
var ErrNoN = errors.New("no Manning's n for a wetted subsection (give an n column or --n)")

// ErrSlope is returned for a friction slope that is not a positive number.
var ErrSlope = errors.New("slope must be a positive number")

// Row is the hydraulics of a section at one stage. Units follow the
// package's unit system; undefined values are NaN.
type Row struct {
	// Stage is the water-surface elevation; Depth is Stage minus the
	// lowest ground elevation.
	Stage, Depth float64
	// Geometry of the whole section (see subdivide.Wetted).
	Area, WettedPerimeter, TopWidth, HydraulicRadius, HydraulicDepth float64
	// Conveyance K = ΣKi; Discharge Q = K·√S; MeanVelocity Q/A.
	Conveyance, Discharge, MeanVelocity float64
	// Alpha and Beta are the energy and momentum coefficients.
	Alpha, Beta float64
	// Froude is √(α·Q²·T/(g·A³)).
	Froude float64
	// ShearStress is the mean boundary shear γ·R·S.
	ShearStress float64
	// Subs is each subsection's share.
	Subs []SubRow
	// ExtendedLeft and ExtendedRight are the wall heights added above the ends.
	ExtendedLeft, ExtendedRight float64
	// Pools is the number of separate wetted reaches counted.
	Pools int
	// PondedArea is the area of water standing in pockets behind higher
	// ground that was not counted as flowing (area unit), and PondedPools
	// the number of those pockets (see subdivide.Options).
	PondedArea  float64
	PondedPools int
	// Full reports a closed conduit flowing full.
	Full bool
	// Flags are short quality notes on the row (see the Flag constants).
	Flags []string
}

// Row quality flags.
const (
	// FlagAboveEnd: the stage is above an end of the section, which was
	// extended with a vertical wall.
	FlagAboveEnd = "above_end"
	// FlagPools: the water stands in more than one separate pool: pockets
	// behind higher ground were left out as not flowing (PondedArea), or,
	// when every pool is counted, several pools were counted.
	FlagPools = "pools"
	// FlagNearCritical: Froude number above NearCriticalFroude; a Manning
	// rating is doubtful where the flow is near critical.
	FlagNearCritical = "near_critical"
	// FlagSupercritical: Froude number above 1 by more than CriticalBand
	// (Regime "supercritical"), so that a row at critical depth, whose
	// Froude number is 1 to rounding, is near critical, not supercritical.
	FlagSupercritical = "supercritical"
	// FlagConveyanceDrop: conveyance is lower than at a lower stage of the
	// same table, a sign that the subdivision does not suit the section
	// (Chow, 1959, section 6-8).
	FlagConveyanceDrop = "conveyance_drop"
	// FlagFull: a closed conduit flows full.
	FlagFull = "full"
)

// NearCriticalFroude is the Froude number above which a row is flagged as
// near critical (common practice: 0.9).
const NearCriticalFroude = 0.9

// SubRow is one subsection's hydraulics at a stage.
type SubRow struct {
	subdivide.SubWetted
	// Conveyance is (k/n)·A·R^(2/3); Discharge its share Ki·√S; Velocity
	// Discharge/Area (NaN when dry).
	Conveyance, Discharge, Velocity float64
}

// FoldWalls returns the subsections as they convey by the split method.
// A subsection of no width (a vertical wall whose n differs from the
// ground beside it, Subsection.Wall ≠ 0) holds no water, so it cannot
// convey on its own: its wetted perimeter joins the subsection its wall
// faces, whose Manning's n becomes the Horton–Einstein composite of the
// two,
//
//	n = ((P·n^1.5 + Pw·nw^1.5) / (P + Pw))^(2/3),
//
// and the wall keeps no perimeter. Without this the wall's perimeter, and
// so its friction, would be lost, and a rougher wall would raise the
// discharge. A wall without n takes the n of the subsection it joins.
// subs is returned as it is (not copied) when no wall is wet.
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, section 6-7
//	(composite roughness, Horton–Einstein).
func FoldWalls(subs []subdivide.SubWetted) []subdivide.SubWetted {
	var out []subdivide.SubWetted
	for i, s := range subs {
		j := i + s.Wall
		if s.Wall == 0 || !(s.WettedPerimeter > 0) || j < 0 || j >= len(subs) || !(subs[j].Area > 0) {
			continue
		}
		if out == nil {
			out = append([]subdivide.SubWetted(nil), subs...)
		}
		t, pw, nw := &out[j], s.WettedPerimeter, s.N
		if nw > 0 && t.N > 0 {
			sum := t.WettedPerimeter*math.Pow(t.N, 1.5) + pw*math.Pow(nw, 1.5)
			t.N = math.Pow(sum/(t.WettedPerimeter+pw), 2.0/3)
		}
		t.WettedPerimeter += pw
		out[i].WettedPerimeter = 0
	}
	if out == nil {
		return subs
	}
	return out
}

// FoldedWallWarnings words, for each vertical wall with its own n (a
// subsection of no width, Subsection.Wall ≠ 0) that water up to maxStage
// reaches, that the split does not make it a subsection: FoldWalls counts
// its wetted perimeter in the subsection it faces, with the
// Horton–Einstein composite of the two n. pts is the ground line the
// subsections were cut from (the wall's foot and top are its lowest and
// highest points at the wall's station); nil when there is none.
//
// Reference:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, section 6-7
//	(composite roughness, Horton–Einstein).
func FoldedWallWarnings(subs []subdivide.Subsection, pts []subdivide.Point, maxStage float64, u Units) []string {
	var out []string
	for i, s := range subs {
		j := i + s.Wall
		if s.Wall == 0 || j < 0 || j >= len(subs) {
			continue
		}
		foot, top := math.Inf(1), math.Inf(-1)
		for _, p := range pts {
			if p.Station == s.From {
				foot, top = math.Min(foot, p.Elevation), math.Max(top, p.Elevation)
			}
		}
		if !(maxStage > foot) {
			continue
		}
		t := subs[j]
		out = append(out, fmt.Sprintf("the vertical wall at station %g %s (elevation %g to %g %s, n %g) holds no water of its own, so it is not a subsection: "+
			"its wetted perimeter is counted in the subsection it faces (stations %g to %g %s, n %g), whose n becomes the Horton–Einstein composite of the two by wetted perimeter (Chow 1959, section 6-7)",
			s.From, u.Length(), foot, top, u.Length(), s.N, t.From, t.To, u.Length(), t.N))
	}
	return out
}

// Conveyance returns Manning's conveyance K = (k/n)·A·R^(2/3) of a single
// subsection with area a, wetted perimeter p and roughness n; zero when dry.
//
// Reference: Chow (1959), Open-Channel Hydraulics, section 6-4 and eq. 6-9.
func Conveyance(a, p, n float64, u Units) float64 {
	if a <= 0 || p <= 0 {
		return 0
	}
	return u.ManningK() / n * a * math.Pow(a/p, 2.0/3.0)
}

// Hydraulics computes the hydraulics of wetted geometry w with friction
// slope s by the subdivided Manning method: conveyance is summed over
// subsections, and
//
//	α = Σ(Ki³/Ai²) / (Kt³/At²)      β = Σ(Ki²/Ai) / (Kt²/At)
//
// (Chow, 1959, section 2-7; the conveyance-weighted form used in the
// slope-area method, Dalrymple & Benson, 1967, USGS TWRI 3-A2).
// bottom is the lowest ground elevation, from which Depth is counted. A
// vertical wall with its own n, a subsection of no width, conveys with the
// subsection it faces (FoldWalls); the rows report the folded subsections.
//
// Errors: ErrSlope for a slope that is not positive and finite; ErrNoN for
// a wetted subsection without Manning's n (naming its stations).
//
// References:
//
//	Chow, V.T., 1959, Open-Channel Hydraulics: McGraw-Hill, sections 2-7
//	(energy and momentum coefficients) and 6-4 (subdivided conveyance).
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge by
//	the slope-area method: USGS TWRI, book 3, chap. A2.
func Hydraulics(w subdivide.Wetted, bottom, s float64, u Units) (Row, error) {
	if !(s > 0) || math.IsInf(s, 0) {
		return Row{}, fmt.Errorf("slope %v: %w", s, ErrSlope)
	}
	r := Row{
		Stage: w.Stage, Depth: w.Stage - bottom,
		Area: w.Area, WettedPerimeter: w.WettedPerimeter, TopWidth: w.TopWidth,
		HydraulicRadius: w.HydraulicRadius, HydraulicDepth: w.HydraulicDepth,
		Subs:         make([]SubRow, len(w.Subs)),
		ExtendedLeft: w.ExtendedLeft, ExtendedRight: w.ExtendedRight,
		Pools: w.Pools, Full: w.Full, PondedArea: w.Ponded, PondedPools: w.PondedPools,
	}
	if r.Depth < 0 {
		r.Depth = 0
	}
	root := math.Sqrt(s)
	var k3a2, k2a float64
	for i, sw := range FoldWalls(w.Subs) {
		sr := SubRow{SubWetted: sw, Velocity: math.NaN()}
		if sw.Area > 0 {
			if !(sw.N > 0) {
				return r, fmt.Errorf("stations %g to %g: %w", sw.From, sw.To, ErrNoN)
			}
			sr.Conveyance = Conveyance(sw.Area, sw.WettedPerimeter, sw.N, u)
			sr.Discharge = sr.Conveyance * root
			sr.Velocity = sr.Discharge / sw.Area
			k3a2 += sr.Conveyance * sr.Conveyance * sr.Conveyance / (sw.Area * sw.Area)
			k2a += sr.Conveyance * sr.Conveyance / sw.Area
		}
		r.Conveyance += sr.Conveyance
		r.Subs[i] = sr
	}
	r.Discharge = r.Conveyance * root
	nan := math.NaN()
	r.MeanVelocity, r.Alpha, r.Beta, r.Froude, r.ShearStress = nan, nan, nan, nan, nan
	if r.Area > 0 && r.Conveyance > 0 {
		kt, at := r.Conveyance, r.Area
		r.MeanVelocity = r.Discharge / at
		r.Alpha = k3a2 / (kt * kt * kt / (at * at))
		r.Beta = k2a / (kt * kt / at)
		if r.TopWidth > 0 {
			r.Froude = FroudeNumber(r.Discharge, at, r.TopWidth, r.Alpha, u)
		}
	}
	if !math.IsNaN(r.HydraulicRadius) {
		r.ShearStress = u.UnitWeight() * r.HydraulicRadius * s
	}
	if r.ExtendedLeft > 0 || r.ExtendedRight > 0 {
		r.Flags = append(r.Flags, FlagAboveEnd)
	}
	if r.Pools > 1 || r.PondedPools > 0 {
		r.Flags = append(r.Flags, FlagPools)
	}
	switch {
	case Regime(r.Froude) == RegimeSupercritical:
		r.Flags = append(r.Flags, FlagSupercritical)
	case r.Froude > NearCriticalFroude:
		r.Flags = append(r.Flags, FlagNearCritical)
	}
	if r.Full {
		r.Flags = append(r.Flags, FlagFull)
	}
	return r, nil
}

// FroudeNumber returns √(α·Q²·T/(g·A³)) for discharge q, area a, top width t
// and energy coefficient alpha: 1 at critical flow (Chow, 1959, eq. 4-4,
// with α as in section 4-2). NaN when a or t is not positive.
func FroudeNumber(q, a, t, alpha float64, u Units) float64 {
	if !(a > 0) || !(t > 0) {
		return math.NaN()
	}
	return math.Sqrt(alpha * q * q * t / (u.Gravity() * a * a * a))
}
