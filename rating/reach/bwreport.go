package reach

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"wetline/rating"
)

// BackwaterReport is the report of a step-backwater study of a reach: the
// sections as given, the profiles and the rating they give at one
// section, that rating as a table with full hydraulics, the verification
// against the marks of a flood when asked for, the warnings and the
// figures.
type BackwaterReport struct {
	Provenance rating.Provenance
	// Name names the reach (its table's file, or a site).
	Name string
	// Sections are the reach's sections as given, upstream first.
	Sections []Section
	// BoundarySource says where a StageRating boundary was read (a file),
	// for reports; "" when given in code.
	BoundarySource string
	// Result holds the profiles and the rating reads.
	Result Backwater
	// Table is Result.Rating as a rating table (BackwaterRating.Table):
	// the section's full hydraulics at every computed stage.
	Table rating.Table
	// Verification sets the profile of a flood of known discharge against
	// the high-water marks; nil when none was asked for.
	Verification *Verification
	// Warnings gathers the warnings of the inputs, the computation and the
	// verification.
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure
}

// BackwaterReportOptions configure StepBackwater. The zero value computes
// the profiles with default options and no verification.
type BackwaterReportOptions struct {
	// Backwater configures the computation.
	Backwater BackwaterOptions
	// Verify is the discharge of a flood whose high-water marks are in the
	// sections (discharge unit); zero for no verification, otherwise
	// positive.
	Verify float64
}

// StepBackwater computes the water-surface profiles of discharges qs
// through a reach from boundary b (ComputeBackwater), the rating they give
// at the rating section as a table (BackwaterRating.Table) and, when
// opt.Verify is positive, the departures of the profile of that discharge
// from the sections' high-water marks (VerifyBackwater). The report's
// Name, Provenance and Figures are left for the caller. Per-profile
// warnings stay with their profiles; the report's warnings are the
// computation's summary and those of the verification not already given.
//
// Errors are those of ComputeBackwater, BackwaterRating.Table and
// VerifyBackwater (ErrNoMarks when opt.Verify is asked for a reach without
// marks), or wrap ErrDischarge for a negative or non-finite opt.Verify.
//
// References:
//
//	Davidian, J., 1984, Computation of water-surface profiles in open
//	channels: U.S. Geological Survey Techniques of Water-Resources
//	Investigations, book 3, chapter A15.
func StepBackwater(secs []Section, qs []float64, b Boundary, opt BackwaterReportOptions) (BackwaterReport, error) {
	rep := BackwaterReport{Sections: secs}
	if opt.Verify < 0 || math.IsNaN(opt.Verify) || math.IsInf(opt.Verify, 0) {
		return rep, fmt.Errorf("verification %w: %v", ErrDischarge, opt.Verify)
	}
	res, err := ComputeBackwater(secs, qs, b, opt.Backwater)
	if err != nil {
		return rep, err
	}
	rep.Result = res
	rep.Warnings = append(rep.Warnings, res.Warnings...)
	if rep.Table, err = res.Rating.Table(); err != nil {
		return rep, fmt.Errorf("rating at %s: %w", res.Rating.Section, err)
	}
	rep.Warnings = append(rep.Warnings, pondedWarnings(rep.Table, res.Rating)...)
	if opt.Verify == 0 {
		return rep, nil
	}
	v, err := VerifyBackwater(secs, opt.Verify, b, opt.Backwater)
	if err != nil {
		return rep, fmt.Errorf("verification at %g %s: %w", opt.Verify, opt.Backwater.Units.Discharge(), err)
	}
	rep.Verification = &v
	for _, w := range v.Warnings {
		if !slices.Contains(rep.Warnings, w) {
			rep.Warnings = append(rep.Warnings, "verification: "+w)
		}
	}
	if w := outsideWarning(v, opt.Backwater.Units); w != "" {
		rep.Warnings = append(rep.Warnings, w)
	}
	return rep, nil
}

// outsideWarning words the warning for marks the verified profile misses
// by more than their quality band, or returns "".
func outsideWarning(v Verification, u rating.Units) string {
	var ids []string
	for _, m := range v.Marks {
		if m.Outside {
			ids = append(ids, fmt.Sprintf("%s (%+.3f %s, band ±%.3g)", m.ID, m.Departure, u.Length(), m.Band))
		}
	}
	if len(ids) == 0 {
		return ""
	}
	return fmt.Sprintf("at %g %s the computed profile misses the marks by more than their quality band at %s: %s; "+
		"review n, the boundary and the marks before the reach is trusted", v.Discharge, u.Discharge(), rating.Counted(len(ids), "section", "sections"), strings.Join(ids, ", "))
}

// pondedWarnings words the water left out of the flow at the rating
// section as standing in pockets, as a rating table of rate does.
func pondedWarnings(t rating.Table, rt BackwaterRating) []string {
	stages, ponded := 0, 0.0
	for _, r := range t.Rows {
		if r.PondedPools > 0 {
			stages++
			ponded = math.Max(ponded, r.PondedArea)
		}
	}
	var out []string
	for _, w := range rating.PoolWarnings(0, stages, ponded, rt.GeometryOptions, rt.Units) {
		out = append(out, "section "+rt.Section+": "+w)
	}
	return out
}
