package rating

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"wetline/subdivide"
)

// NormalRoot is a normal stage with the hydraulics there.
type NormalRoot struct {
	Root
	// Row is the hydraulics at the normal stage (its Discharge is the
	// target discharge to the solver's accuracy).
	Row Row
	// Regime is Regime(Row.Froude).
	Regime string
}

// CriticalRoot is a critical stage with the energy coefficient and
// specific energy there.
type CriticalRoot struct {
	Root
	// Alpha is the energy coefficient at the stage; Energy the specific
	// energy of the discharge there (length unit).
	Alpha, Energy float64
	// Extremum says what the specific energy does at the stage:
	// EnergyMinimum or EnergyMaximum where it is lower or higher there
	// than ExtremumProbe of the depth below and above, else
	// EnergyNoExtremum (α changing with stage moves the extremum off the
	// stage where the Froude number is 1).
	Extremum string
	// Least reports the critical stage at which the specific energy is
	// least (Solution.MinEnergy lies within ExtremumProbe of the depth).
	Least bool
}

// What the specific energy does at a critical stage (CriticalRoot.Extremum).
const (
	EnergyMinimum    = "minimum"
	EnergyMaximum    = "maximum"
	EnergyNoExtremum = "none"
)

// ExtremumProbe is the distance below and above a critical stage, as a
// fraction of its depth, at which the specific energy is compared with
// that at the stage to tell a local minimum or maximum: a hundred times
// DepthTolerance, so that the error of the stage cannot decide.
const ExtremumProbe = 1e-4

// Solution gathers what is known of one discharge in one section.
type Solution struct {
	// Name is the geometry's name, if it has one.
	Name string
	// Units, Slope, Discharge and Composite echo the inputs.
	Units     Units
	Slope     float64
	Discharge float64
	Composite Composite
	// Bottom and Top are the geometry's lowest point and top (crown).
	Bottom, Top float64
	// Normal holds every normal stage, ascending; empty without a slope.
	Normal []NormalRoot
	// Critical holds every critical stage, ascending.
	Critical []CriticalRoot
	// MinEnergy is the least specific energy and its stage; EnergyMinima
	// every local minimum of specific energy, ascending (see
	// SpecificEnergyMinima).
	MinEnergy    EnergyPoint
	EnergyMinima []EnergyPoint
	// Closed reports a closed conduit; then FullDischarge is its discharge
	// flowing just full and PeakDischarge (at PeakStage) the largest it
	// carries part full, both at Slope (NaN without a slope).
	Closed                                  bool
	FullDischarge, PeakStage, PeakDischarge float64
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// Solve finds what a discharge q > 0 does in geometry g: every normal
// stage at friction slope opt.Slope (when positive), with the hydraulics
// and flow regime there, every critical stage with its energy
// coefficient and specific energy, and the least specific energy; for a
// closed conduit also its full-flow and peak part-full discharges.
// Stages are elevations in the length unit of opt.Units, discharges in
// its discharge unit, each stage to DepthTolerance of its depth.
//
//	normal:   K(h)·√S = q          (Manning's equation, subdivided conveyance)
//	critical: α·q²·T / (g·A³) = 1   (Froude number with α equal to 1)
//	energy:   E(h) = (h − z₀) + α·q²/(2g·A²)
//
// Several roots are reported with a warning (a conduit near full, a
// compound section). Errors: ErrTarget for q not positive and finite,
// ErrNoRoot when no stage of the section (extended up to
// MaxSearchDoublings times its depth) carries q, with the conduit's peak
// when q exceeds it, or the geometry's own errors.
//
// References:
//
//	Chow, V.T. (1959), Open-Channel Hydraulics, McGraw-Hill: sections 3-2
//	(specific energy), 4-2 and eq. 4-4 (critical flow in a compound
//	section), 6-4 (normal depth by Manning's equation).
func Solve(g subdivide.Geometry, q float64, opt Options) (Solution, error) {
	sol := Solution{Units: opt.Units, Slope: opt.Slope, Discharge: q, Composite: opt.Composite,
		Bottom: g.Bottom(), Top: g.Top(), FullDischarge: math.NaN(), PeakStage: math.NaN(), PeakDischarge: math.NaN()}
	if n, ok := g.(interface{ Name() string }); ok {
		sol.Name = n.Name()
	}
	if err := checkTarget(q, "discharge"); err != nil {
		return sol, err
	}
	s := newSolver(g, opt)
	closed, err := s.closed()
	if err != nil {
		return sol, err
	}
	sol.Closed = closed
	if opt.Slope > 0 {
		if err := sol.solveNormal(g, &s, opt); err != nil {
			return sol, err
		}
	}
	if err := sol.solveCritical(g, &s, opt); err != nil {
		return sol, err
	}
	if sol.MinEnergy, sol.EnergyMinima, err = scanSpecificEnergy(g, sol.Discharge, opt); err != nil {
		return sol, err
	}
	for i := range sol.Critical {
		c := &sol.Critical[i]
		c.Least = math.Abs(c.Stage-sol.MinEnergy.Stage) <= ExtremumProbe*c.Depth
	}
	return sol, nil
}

// solveNormal fills the normal stages of the solution's discharge, and a
// conduit's full and greatest part-full discharges.
func (sol *Solution) solveNormal(g subdivide.Geometry, s *solver, opt Options) error {
	q, u := sol.Discharge, opt.Units
	if sol.Closed {
		full, err := s.row(s.g.Top())
		if err != nil {
			return err
		}
		sol.FullDischarge = full.Discharge
		if sol.PeakStage, sol.PeakDischarge, err = PeakDischarge(g, opt); err != nil {
			return err
		}
	}
	roots, err := NormalStages(g, q, opt)
	if errors.Is(err, ErrNoRoot) && sol.Closed {
		// No normal stage: the critical stage is still reported.
		sol.Warnings = append(sol.Warnings, fmt.Sprintf(
			"discharge %g %s is more than the conduit carries part full at slope %g (at most %.4g %s, at stage %.4f %s): there is no normal stage; in uniform flow it would run full under pressure",
			q, u.Discharge(), opt.Slope, sol.PeakDischarge, u.Discharge(), sol.PeakStage, u.Length()))
		return nil
	}
	if err != nil {
		return err
	}
	for _, r := range roots {
		row, err := s.row(r.Stage)
		if err != nil {
			return err
		}
		sol.Normal = append(sol.Normal, NormalRoot{Root: r, Row: row, Regime: Regime(row.Froude)})
		sol.Warnings = append(sol.Warnings, aboveEndWarning("normal stage", r.Stage, row.ExtendedLeft, row.ExtendedRight, u)...)
	}
	switch {
	case len(roots) > 1 && sol.Closed:
		sol.Warnings = append(sol.Warnings, pipeBranchesWarning(sol, roots, u))
	case len(roots) > 1:
		sol.Warnings = append(sol.Warnings, fmt.Sprintf(
			"discharge does not grow steadily with stage here: %d normal stages carry %g %s; on a falling branch a higher stage carries less",
			len(roots), q, u.Discharge()))
	}
	return nil
}

// pipeBranchesWarning words the warning for a discharge carried at more
// than one normal stage in a closed conduit: its conveyance, and with it
// the discharge at the slope, is greatest at the solution's PeakStage
// (about 0.94 of the diameter in a circular pipe) and falls above it as
// the crown closes, so every discharge between the full-flow one and the
// greatest has a stage on each side of the peak.
func pipeBranchesWarning(sol *Solution, roots []Root, u Units) string {
	L, Q := u.Length(), u.Discharge()
	stages := make([]string, len(roots))
	for i, r := range roots {
		stages[i] = fmt.Sprintf("%.4f %s on the %s branch", r.Stage, L, r.Branch())
	}
	return fmt.Sprintf("%d normal stages carry %g %s, %s: the conduit's conveyance, and with it the discharge at slope %g, is greatest at stage %.4f %s "+
		"(%.3f of the height; %.4g %s) and falls above it as the crown closes (the wetted perimeter grows faster than the area), "+
		"so every discharge between %.4g %s (flowing just full) and %.4g %s is carried at one stage below %.4f %s and one above",
		len(roots), sol.Discharge, Q, strings.Join(stages, " and "), sol.Slope, sol.PeakStage, L,
		(sol.PeakStage-sol.Bottom)/(sol.Top-sol.Bottom), sol.PeakDischarge, Q, sol.FullDischarge, Q, sol.PeakDischarge, Q, sol.PeakStage, L)
}

// solveCritical fills the critical stages of the solution's discharge
// with their α and specific energy.
func (sol *Solution) solveCritical(g subdivide.Geometry, s *solver, opt Options) error {
	q := sol.Discharge
	crit, err := CriticalStages(g, q, opt)
	if err != nil {
		return err
	}
	for _, c := range crit {
		row, err := s.row(c.Stage)
		if err != nil {
			return err
		}
		e, err := s.energy(c.Stage, q)
		if err != nil {
			return err
		}
		ext, err := energyExtremum(s, c, e, q)
		if err != nil {
			return err
		}
		sol.Critical = append(sol.Critical, CriticalRoot{Root: c, Alpha: row.Alpha, Energy: e, Extremum: ext})
		sol.Warnings = append(sol.Warnings, aboveEndWarning("critical stage", c.Stage, row.ExtendedLeft, row.ExtendedRight, opt.Units)...)
	}
	if len(crit) > 1 {
		sol.Warnings = append(sol.Warnings, fmt.Sprintf("%d critical stages: the section is compound, so flow can pass through critical more than once", len(crit)))
	}
	return nil
}

// energyExtremum tells whether the specific energy e of q at critical
// root c is a local minimum, a local maximum or neither, against the
// energy ExtremumProbe of the depth below and above (above at most at the
// top, where the geometry refuses a stage above it).
func energyExtremum(s *solver, c Root, e, q float64) (string, error) {
	d := ExtremumProbe * c.Depth
	below, err := s.energy(c.Stage-d, q)
	if err != nil {
		return "", err
	}
	// No stage above a conduit's crown, nor above an end of a survey with
	// Options.NoExtend: the probe stops at the top.
	up, err := s.ceiling(c.Stage + d)
	if err != nil {
		return "", err
	}
	above, err := s.energy(up, q)
	if err != nil {
		return "", err
	}
	switch {
	case below > e && above > e:
		return EnergyMinimum, nil
	case below < e && above < e:
		return EnergyMaximum, nil
	}
	return EnergyNoExtremum, nil
}

// aboveEndWarning warns, when left or right (the heights of the walls
// added at the section's ends, length unit) is positive, that what (a
// stage named for the reader) at stage lies above an end of the section.
func aboveEndWarning(what string, stage, left, right float64, u Units) []string {
	if !(left > 0 || right > 0) {
		return nil
	}
	return []string{fmt.Sprintf("%s %.4f %s is above an end of the section: vertical walls were added there (up to %.4f %s high)",
		what, stage, u.Length(), math.Max(left, right), u.Length())}
}
