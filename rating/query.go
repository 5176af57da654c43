package rating

import (
	"errors"
	"fmt"
	"math"

	"wetline/subdivide"
)

// Query is what the solve report asks of a section: exactly one of
// Discharge (its normal and critical stages), Area (the stage holding that
// flow area) or Stage (the critical and uniform-flow discharges there) is
// a number; the others are NaN.
type Query struct {
	// Discharge in the discharge unit; Area in the area unit; Stage in the
	// length unit.
	Discharge, Area, Stage float64
}

// ErrQuery is returned for a query that asks for none or several things.
var ErrQuery = errors.New("ask for one of a discharge, a flow area or a stage")

// AreaAnswer is the stage that holds a flow area, with the geometry there.
type AreaAnswer struct {
	// Area is the flow area asked for (area unit).
	Area float64
	// Root is the stage holding it.
	Root Root
	// TopWidth, WettedPerimeter and HydraulicRadius are the geometry at
	// the stage (length unit).
	TopWidth, WettedPerimeter, HydraulicRadius float64
	// Full reports a closed conduit flowing full.
	Full bool
}

// StageAnswer is what flows at a stage: the critical discharge, and with a
// slope the uniform-flow discharge (discharge unit; NaN without a slope).
type StageAnswer struct {
	Stage, CriticalDischarge, UniformDischarge float64
}

// SolveReport is the report of one query of a section.
type SolveReport struct {
	Provenance Provenance
	// Section names the section (its file or a shape's spec).
	Section string
	// Units, Slope (0 when none was given) and Composite echo the inputs.
	Units     Units
	Slope     float64
	Composite Composite
	// NUnset reports a section given no Manning's n, which the answer
	// does not use (a flow area, or critical flow in one region).
	NUnset bool
	// Exactly one of Discharge, Area and Stage is set, as asked.
	Discharge *Solution
	Area      *AreaAnswer
	Stage     *StageAnswer
	// Warnings gathers the section's and the solution's warnings.
	Warnings []string
}

// Answer solves query q in geometry g: Solve for a discharge, StageForArea
// for an area, CriticalDischarge (and the uniform-flow discharge at
// opt.Slope when it is positive) for a stage, with a warning when the
// stage is at or below the lowest point (both discharges are then 0). The
// report's Section,
// Provenance and Warnings from reading the section are left for the
// caller. Errors are those of the solvers, or ErrQuery.
func Answer(g subdivide.Geometry, q Query, opt Options) (SolveReport, error) {
	rep := SolveReport{Units: opt.Units, Slope: opt.Slope, Composite: opt.Composite}
	asked := 0
	for _, v := range []float64{q.Discharge, q.Area, q.Stage} {
		if !math.IsNaN(v) {
			asked++
		}
	}
	if asked != 1 {
		return rep, ErrQuery
	}
	switch {
	case !math.IsNaN(q.Discharge):
		sol, err := Solve(g, q.Discharge, opt)
		if err != nil {
			return rep, err
		}
		rep.Discharge = &sol
		rep.Warnings = append(rep.Warnings, sol.Warnings...)
	case !math.IsNaN(q.Area):
		r, err := StageForArea(g, q.Area, opt)
		if err != nil {
			return rep, err
		}
		w, err := CompositeGeometry(g, opt.Composite).At(r.Stage, opt.Geometry)
		if err != nil {
			return rep, err
		}
		rep.Area = &AreaAnswer{Area: q.Area, Root: r, TopWidth: w.TopWidth, WettedPerimeter: w.WettedPerimeter,
			HydraulicRadius: w.HydraulicRadius, Full: w.Full}
		rep.Warnings = append(rep.Warnings, aboveEndWarning("stage", r.Stage, w.ExtendedLeft, w.ExtendedRight, opt.Units)...)
	default:
		qc, err := CriticalDischarge(g, q.Stage, opt)
		if errors.Is(err, ErrNoFreeSurface) {
			// At the crown a conduit flows full: no free surface, so no
			// critical flow, while uniform flow is the full-flow discharge.
			qc = math.NaN()
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("stage %.4f %s is at the crown: the conduit flows full, with no free surface, so no discharge is critical there; a uniform discharge at a slope is the full-flow discharge",
				q.Stage, opt.Units.Length()))
		} else if err != nil {
			return rep, err
		}
		a := &StageAnswer{Stage: q.Stage, CriticalDischarge: qc, UniformDischarge: math.NaN()}
		w, err := CompositeGeometry(g, opt.Composite).At(q.Stage, opt.Geometry)
		if err != nil {
			return rep, err
		}
		rep.Warnings = append(rep.Warnings, aboveEndWarning("stage", q.Stage, w.ExtendedLeft, w.ExtendedRight, opt.Units)...)
		if b := g.Bottom(); q.Stage <= b {
			rep.Warnings = append(rep.Warnings, fmt.Sprintf("stage %.4f %s is %s the lowest point of the section (%.4f %s): no water stands there, so nothing flows; check the stage's datum",
				q.Stage, opt.Units.Length(), map[bool]string{true: "at", false: "below"}[q.Stage == b], b, opt.Units.Length()))
		}
		if opt.Slope > 0 {
			t, err := Compute(g, []float64{q.Stage}, opt)
			if err != nil {
				return rep, err
			}
			a.UniformDischarge = t.Rows[0].Discharge
		}
		rep.Stage = a
	}
	return rep, nil
}
