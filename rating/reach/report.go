package reach

import (
	"errors"
	"fmt"

	"wetline/rating"
)

// Report is the report of a flood peak estimated on a reach: the sections
// as given, the slope-area (or slope-conveyance) result, its uncertainty,
// the warnings and the figures.
type Report struct {
	Provenance rating.Provenance
	// Name names the reach (its table's file, or a site).
	Name string
	// Sections are the reach's sections as given, upstream first.
	Sections []Section
	// Result is the computed estimate.
	Result SlopeArea
	// Uncertainty is the Monte Carlo analysis; nil when none was run.
	Uncertainty *Uncertainty
	// Warnings gathers the warnings of the inputs, the result and the
	// analysis.
	Warnings []string
	// Figures are the report's pictures (none until drawn).
	Figures []rating.Figure
}

// EstimateOptions configure Estimate. The zero value computes the
// slope-area estimate with default options and no uncertainty analysis.
type EstimateOptions struct {
	SlopeArea SlopeAreaOptions
	// Slope, for a reach of one section, is the assumed friction slope of
	// the weaker slope-conveyance estimate; it must be zero for two or
	// more sections.
	Slope float64
	// MonteCarlo configures the uncertainty analysis when Draws > 0.
	MonteCarlo MonteCarloOptions
	// Draws is the number of Monte Carlo draws; 0 runs no analysis.
	Draws int
}

// ErrSlopeForReach is returned for a slope given with two or more sections.
var ErrSlopeForReach = errors.New("a slope is only for a reach of one section (the slope-conveyance estimate)")

// FailedDrawsWarn is the fraction of failed Monte Carlo draws above which
// the report warns that the band leaves them out (common practice: one
// draw in a hundred).
const FailedDrawsWarn = 0.01

// failedDrawsWarning returns the warning for the draws of un without a
// solution: none when they are FailedDrawsWarn of the draws or fewer;
// their share when more; and that there is no band when every draw
// failed.
func failedDrawsWarning(un Uncertainty) string {
	switch {
	case un.Draws <= 0 || !(float64(un.Failed) > FailedDrawsWarn*float64(un.Draws)):
		return ""
	case un.Failed >= un.Draws:
		return fmt.Sprintf("no uncertainty band: none of the %d Monte Carlo draws had a solution (a section dry, no fall, or a subreach gaining energy); "+
			"review the n variation and the mark standard deviation", un.Draws)
	}
	return fmt.Sprintf("%d of %d Monte Carlo draws (%.1f %%) had no solution (a section dry, no fall, or a subreach gaining energy): the band leaves them out",
		un.Failed, un.Draws, 100*float64(un.Failed)/float64(un.Draws))
}

// markSDUnused returns a warning when a standard deviation of the marks
// was given (mc.MarkSD > 0) but every section's quality sets its own
// (Section.MarkSD > 0), so that the one given is not used; "" otherwise.
func markSDUnused(secs []Section, mc MonteCarloOptions, u rating.Units) string {
	if !(mc.MarkSD > 0) {
		return ""
	}
	for _, s := range secs {
		if !(s.MarkSD > 0) {
			return ""
		}
	}
	return fmt.Sprintf("the standard deviation of a mark given (%g %s) is not used: every section's quality rating sets that of its own marks",
		mc.MarkSD, u.Length())
}

// Estimate computes the flood peak of a reach: with one section and a
// slope, the slope-conveyance estimate Q = K·√S (SlopeConveyance), with
// no uncertainty analysis (a warning says so when opt.Draws > 0); with
// two or more, the slope-area estimate of all subreaches together
// (SolveSlopeArea) and, when opt.Draws > 0, its Monte Carlo uncertainty
// (MonteCarlo; a warning says when the mark standard deviation given is
// not used because every section's quality sets its own). The report's Name, Provenance and Figures are left for the
// caller. Errors are those of the methods, a *SectionError where one
// section is at fault, ErrTooFewSections for one section without a slope,
// ErrSlopeForReach, or ErrMarkSD. More than FailedDrawsWarn of the draws
// without a solution are warned with their share, and all of them as no
// band.
//
// References:
//
//	Dalrymple, T., and Benson, M.A., 1967, Measurement of peak discharge by
//	the slope-area method: USGS TWRI, book 3, chap. A2.
func Estimate(secs []Section, opt EstimateOptions) (Report, error) {
	rep := Report{Sections: secs}
	if len(secs) == 1 {
		if opt.Slope == 0 {
			return rep, ErrTooFewSections
		}
		res, err := SlopeConveyance(secs[0], opt.Slope, opt.SlopeArea)
		if err != nil {
			return rep, err
		}
		rep.Result = res
		rep.Warnings = append(rep.Warnings, res.Warnings...)
		if opt.Draws > 0 {
			rep.Warnings = append(rep.Warnings, "no uncertainty band: the Monte Carlo analysis (its draws, n variation and mark "+
				"standard deviation) is of the slope-area estimate of two or more sections and does not apply to the slope-conveyance estimate")
		}
		return rep, nil
	}
	if opt.Slope != 0 {
		return rep, fmt.Errorf("%w; this reach has %d", ErrSlopeForReach, len(secs))
	}
	res, err := SolveSlopeArea(secs, opt.SlopeArea)
	if err != nil {
		return rep, err
	}
	rep.Result = res
	rep.Warnings = append(rep.Warnings, res.Warnings...)
	if opt.Draws <= 0 {
		return rep, nil
	}
	mc := opt.MonteCarlo
	mc.Draws = opt.Draws
	un, err := MonteCarlo(secs, opt.SlopeArea, mc)
	if err != nil {
		return rep, err
	}
	rep.Uncertainty = &un
	if w := markSDUnused(secs, mc, opt.SlopeArea.Units); w != "" {
		rep.Warnings = append(rep.Warnings, w)
	}
	if w := failedDrawsWarning(un); w != "" {
		rep.Warnings = append(rep.Warnings, w)
	}
	return rep, nil
}
