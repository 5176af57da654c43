package reach

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"wetline/rating"
)

// Table returns the backwater rating as a rating table: the full
// hydraulics of the rating section (rating.Hydraulics, exact geometry by
// Geometry.At) at the stage of every read, with the friction slope there,
// Sf = (Q/K)², so that each row's Discharge is the read's discharge and
// its ShearStress γ·R·Sf. Rows keep the order of the reads. The table's
// Slope is NaN: there is no single slope, each row has its own. Rows of
// critical reads carry FlagCriticalStage and never
// rating.FlagSupercritical (the stage is critical depth: near critical,
// whatever the rounding of its Froude number), unsettled ones
// FlagUnsettled; the table's warnings say so, and where stages are above
// an end of the section or water stands in several pools. Each row's
// Discharge is the read's, exactly, and each subsection's its share by
// conveyance.
//
// Errors are those of the geometry at a read's stage.
func (r BackwaterRating) Table() (rating.Table, error) {
	g := r.Geometry
	t := rating.Table{Units: r.Units, Slope: math.NaN(), Bottom: g.Bottom(), Top: g.Top(),
		Subsections: g.Subsections(), Rows: make([]rating.Row, 0, len(r.Rows))}
	if n, ok := g.(interface{ Name() string }); ok {
		t.Name = n.Name()
	}
	if t.Name == "" {
		t.Name = r.Section
	}
	var maxL, maxR, maxStage float64
	pools, crit, unsettled := 0, 0, 0
	maxStage = math.Inf(-1)
	for _, rd := range r.Rows {
		w, err := g.At(rd.Stage, r.GeometryOptions)
		if err != nil {
			return t, fmt.Errorf("discharge %g, stage %g: %w", rd.Discharge, rd.Stage, err)
		}
		k, err := rating.Hydraulics(w, t.Bottom, 1, r.Units)
		if err != nil {
			return t, fmt.Errorf("discharge %g, stage %g: %w", rd.Discharge, rd.Stage, err)
		}
		sf := rd.Discharge / k.Conveyance
		row, err := rating.Hydraulics(w, t.Bottom, sf*sf, r.Units)
		if err != nil {
			return t, fmt.Errorf("discharge %g, stage %g: %w", rd.Discharge, rd.Stage, err)
		}
		// K·√((Q/K)²) is Q only to rounding: the row carries the discharge
		// the profile was computed for, shared among the subsections by
		// their conveyance (all of it in a subsection conveying alone).
		row.Discharge = rd.Discharge
		if row.Area > 0 {
			row.MeanVelocity = rd.Discharge / row.Area
		}
		for i := range row.Subs {
			if sr := &row.Subs[i]; sr.Area > 0 && row.Conveyance > 0 {
				sr.Discharge = rd.Discharge * (sr.Conveyance / row.Conveyance)
				sr.Velocity = sr.Discharge / sr.Area
			}
		}
		if rd.Critical {
			// The stage is critical depth: near critical, whatever the
			// rounding of its Froude number (or its side of a jump).
			if i := slices.Index(row.Flags, rating.FlagSupercritical); i >= 0 {
				row.Flags[i] = rating.FlagNearCritical
			}
			row.Flags = append(row.Flags, FlagCriticalStage)
			crit++
		}
		if rd.Unsettled {
			row.Flags = append(row.Flags, FlagUnsettled)
			unsettled++
		}
		maxL, maxR = math.Max(maxL, row.ExtendedLeft), math.Max(maxR, row.ExtendedRight)
		maxStage = math.Max(maxStage, row.Stage)
		pools = max(pools, row.Pools)
		t.Rows = append(t.Rows, row)
	}
	if crit > 0 {
		t.Warnings = append(t.Warnings, fmt.Sprintf("%s %s critical depth (flagged %s): no subcritical stage balances the energy equation there",
			rating.Counted(crit, "stage", "stages"), rating.Agree(crit, "is", "are"), FlagCriticalStage))
	}
	if unsettled > 0 {
		t.Warnings = append(t.Warnings, fmt.Sprintf("%s still %s on the downstream boundary by more than %g %s (flagged %s): the reach is too short for the boundary to be forgotten",
			rating.Counted(unsettled, "stage", "stages"), rating.Agree(unsettled, "depends", "depend"), r.Tolerance, r.Units.Length(), FlagUnsettled))
	}
	t.Warnings = append(t.Warnings, rating.ExtensionWarnings(maxL, maxR, maxStage, r.Units)...)
	if pools > 1 && r.GeometryOptions.AllPools {
		t.Warnings = append(t.Warnings, fmt.Sprintf("at some stages the water stands in %d separate pools; all are counted", pools))
	}
	return t, nil
}

// Verification sets a computed profile against the high-water marks of a
// flood of known discharge.
type Verification struct {
	// Discharge is the flood's discharge; Profile its computed profile.
	Discharge float64
	Profile   SurfaceProfile
	// Marks holds every section with at least one mark, upstream first.
	Marks []MarkDeparture
	// MeanDeparture is the mean of the sections' departures; MaxDeparture
	// the departure largest in size, with its sign (length unit).
	MeanDeparture, MaxDeparture float64
	// Warnings are the computation's.
	Warnings []string
}

// MarkDeparture is the departure of a computed water surface from the
// marks at one section: computed minus marked, so positive where the
// computed profile stands above the marks (length unit).
type MarkDeparture struct {
	ID string
	// Index is the section's position in the reach; Distance its distance.
	Index    int
	Distance float64
	// Left and Right are the marks (NaN where missing); Mark is their mean
	// (or the one present).
	Left, Right, Mark float64
	// WaterSurface is the computed stage.
	WaterSurface float64
	// Departure is WaterSurface − Mark; LeftDeparture and RightDeparture
	// those from each mark (NaN where missing).
	Departure, LeftDeparture, RightDeparture float64
	// Band is the elevation band of the marks' quality rating
	// (rating.Quality.MarkSD; NaN when unrated, length unit); Outside
	// reports a departure larger than it.
	Band    float64
	Outside bool
}

// VerifyBackwater computes the profile of discharge q through the reach
// as ComputeBackwater does and returns its departure from the high-water
// marks of each section (Section.Left and Section.Right): a reach is
// verified when the marks of a flood of known discharge lie on its
// computed profile within their uncertainty (Davidian, 1984, USGS TWRI
// 3-A15, verified reaches).
//
// Each departure is set against the band of the section's mark quality
// (Section.Quality; rating.Quality.MarkSD), where rated. The warnings are
// the computation's, except that a profile still depending on the
// boundary is warned at the marked sections where it does (spread above
// the tolerance) rather than at the rating section; the last section,
// where the profile starts, is left out of that warning, since the check
// starts differ from the boundary there by construction and its stage is
// the boundary's. When that section is marked and the boundary is an
// assumed one (normal or critical depth), a warning says its departure
// checks the boundary, not the reach's n.
//
// Errors are ComputeBackwater's, or ErrNoMarks when no section has a mark.
//
// References:
//
//	Davidian, J., 1984, Computation of water-surface profiles in open
//	channels: USGS TWRI, book 3, chap. A15 (verification of a reach against
//	the marks of a flood of known discharge).
func VerifyBackwater(secs []Section, q float64, b Boundary, opt BackwaterOptions) (Verification, error) {
	v := Verification{Discharge: q, MeanDeparture: math.NaN(), MaxDeparture: math.NaN()}
	marked := false
	for _, s := range secs {
		marked = marked || finite(s.Left) || finite(s.Right)
	}
	if !marked {
		return v, ErrNoMarks
	}
	bw, err := ComputeBackwater(secs, []float64{q}, b, opt)
	if err != nil {
		return v, err
	}
	v.Profile = bw.Profiles[0]
	unsettled := unsettledWarning(bw.Rating, opt.Units)
	for _, w := range bw.Warnings {
		if w != unsettled { // said below, at the marks rather than at the rating section
			v.Warnings = append(v.Warnings, w)
		}
	}
	v.Warnings = append(v.Warnings, v.Profile.Warnings...)
	var sum float64
	var loose []string
	tol := opt.spreadTolerance()
	for i, s := range secs {
		mark, used, _ := saWaterSurface(s, MeanSide)
		if used == 0 {
			continue
		}
		ws := v.Profile.Sections[i].WaterSurface
		d := MarkDeparture{ID: s.ID, Index: i, Distance: s.Distance, Left: s.Left, Right: s.Right, Mark: mark,
			WaterSurface: ws, Departure: ws - mark, LeftDeparture: math.NaN(), RightDeparture: math.NaN()}
		if finite(s.Left) {
			d.LeftDeparture = ws - s.Left
		}
		if finite(s.Right) {
			d.RightDeparture = ws - s.Right
		}
		if sp := v.Profile.Sections[i].Spread; sp > tol && i < len(secs)-1 {
			loose = append(loose, fmt.Sprintf("%s (%.3f %s)", s.ID, sp, opt.Units.Length()))
		}
		d.Band = math.NaN()
		if band, ok := s.Quality.MarkSD(opt.Units); ok {
			d.Band = band
			d.Outside = math.Abs(d.Departure) > band*(1+MarkSpreadEpsilon)
		}
		v.Marks = append(v.Marks, d)
		sum += d.Departure
		if !(math.Abs(d.Departure) <= math.Abs(v.MaxDeparture)) {
			v.MaxDeparture = d.Departure
		}
	}
	v.MeanDeparture = sum / float64(len(v.Marks))
	if last := len(secs) - 1; (b.Kind == NormalDepth || b.Kind == CriticalDepth) && len(v.Marks) > 0 && v.Marks[len(v.Marks)-1].Index == last {
		v.Warnings = append(v.Warnings, fmt.Sprintf("at %s, where the profile starts, the stage is the boundary's (%s), an assumption: its departure checks the boundary, not the reach's n",
			secs[last].ID, b.Words(opt.Units)))
	}
	if len(loose) > 0 {
		v.Warnings = append(v.Warnings, fmt.Sprintf("the profile of %g %s still depends on the downstream boundary at the marks of %s "+
			"(difference between the profiles from the boundary and from the check starts): the departures there are uncertain by as much",
			q, opt.Units.Discharge(), strings.Join(loose, ", ")))
	}
	return v, nil
}
