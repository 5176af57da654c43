// Package rate rates one section from its survey: the survey read and
// prepared (survey.Prepare), the table's stages laid out as a table
// writes them (results.TableStages), the section rated at them
// (rating.Rate) and the discharge computed at its bankfull stage. The
// rate command, for one section, and a batch (survey/batch), for many,
// both rate a section through Section.
package rate

import (
	"math"
	"slices"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/results"
)

// Options configure Section.
type Options struct {
	// Request is the section: a survey file or workbook sheet (from
	// Request.Book when the workbook is already open) or a built shape,
	// with the overrides asked for (n, banks, units, composite roughness,
	// coordinates).
	Request survey.SectionRequest
	// Stages asks for the table's stages. A default step is never finer
	// than a table writes its stages (results.TableStages: the warnings
	// say when it was raised).
	Stages rating.StageSpec
	// Rating holds the slope and the wetting options, whether to rate the
	// lookup table too and whether the stages are gauge heights. Its
	// Units is replaced by the section's unit system as prepared
	// (survey.Prepared.Units: the one asked for, which the headers must
	// match, else the headers').
	Rating rating.RateOptions
	// Calibrate, when not nil, is called with the prepared section and
	// the rating options (in the section's units) before the stages are
	// laid out. It may replace p.Geometry (n calibrated on gaugings) and
	// add to p.Inputs and p.Warnings, and returns the calibration the
	// report states (nil for none). Its error is returned as it is.
	Calibrate func(p *survey.Prepared, opt rating.Options) (*rating.NCalibration, error)
}

// Result is a section rated by Section.
type Result struct {
	// Report is the rating report: the table (named after the section's
	// geometry), with Rating.Lookup the lookup table, the ground, the
	// calibration, and the warnings of the survey (and of Calibrate),
	// of the stages and of the table, in that order. Its Provenance holds
	// the inputs, the site and the notes of the survey; the program and
	// the figures are left to the caller.
	Report rating.RatingReport
	// Prepared is the section as read and prepared (calibrated when
	// Calibrate was given).
	Prepared *survey.Prepared
	// BankfullStage is the section's bankfull stage, the lower of its two
	// bank tops (subdivide.Section.Bankfull), in the table's stages (a
	// gauge height when Rating.GaugeHeights); NaN for a section without
	// two bank marks. BankfullDischarge is the discharge computed at
	// exactly that stage (discharge unit), not read from the table; NaN
	// without a bankfull stage or when the section cannot be rated there.
	BankfullStage, BankfullDischarge float64
}

// StagesError is the error of stages that cannot be laid out in the
// section (results.TableStages). Its text and causes are those of
// TableStages: results.ErrNoDepth for default stages in a section with no
// depth to rate (naming the survey), results.ErrStagesAlike,
// rating.ErrStepTooFine, rating.ErrStages or rating.ErrStageSpec for the
// stages asked for.
type StagesError struct {
	// Units is the section's unit system, for a message giving a step.
	Units rating.Units
	Err   error
}

func (e *StagesError) Error() string { return e.Err.Error() }
func (e *StagesError) Unwrap() error { return e.Err }

// ComputeError is the error of rating the section at its stages
// (rating.Rate): the section's source (survey.Prepared.Source) and the
// cause, such as subdivide.ErrAboveCrown for a stage above a conduit's
// crown or a stage above an end of the section with NoExtend.
type ComputeError struct {
	Source string
	Err    error
}

func (e *ComputeError) Error() string { return e.Source + ": " + e.Err.Error() }
func (e *ComputeError) Unwrap() error { return e.Err }

// Section reads and prepares the section opt.Request asks for, calls
// opt.Calibrate on it when given, lays out the stages opt.Stages asks
// for, rates the section at them (rating.Rate, with opt.Rating) and
// computes the discharge at its bankfull stage. With opt.Rating.Lookup
// (a results workbook, whose lookup sheet it fills) the table is first
// checked to fit the workbook's sheets (results.CheckRatingWorkbook).
//
// Errors, each from its step: survey.Prepare's (a *survey.ParseError or
// one naming the file; an error in the request wraps survey.ErrRequest),
// Calibrate's as it returns them, a *StagesError, one wrapping
// results.ErrWorkbookRows, and a *ComputeError.
func Section(opt Options) (Result, error) {
	nan := math.NaN()
	res := Result{BankfullStage: nan, BankfullDischarge: nan}
	p, err := survey.Prepare(opt.Request)
	if err != nil {
		return res, err
	}
	res.Prepared = p
	ro := opt.Rating
	ro.Units = p.Units // as asked for, which the headers must match, else the headers'
	var cal *rating.NCalibration
	if opt.Calibrate != nil {
		if cal, err = opt.Calibrate(p, ro.Options); err != nil {
			return res, err
		}
	}
	stages, stageWarnings, err := results.TableStages(opt.Stages, p.Geometry, p.Source())
	if err != nil {
		return res, &StagesError{Units: p.Units, Err: err}
	}
	if ro.Lookup {
		if err := results.CheckRatingWorkbook(len(stages), len(p.Geometry.Subsections())); err != nil {
			return res, err
		}
	}
	rep, err := rating.Rate(p.Geometry, stages, ro)
	if err != nil {
		return res, &ComputeError{Source: p.Source(), Err: err}
	}
	rep.Provenance = rating.Provenance{Inputs: p.Inputs, Site: p.Site, Notes: p.Notes}
	rep.Ground = p.Ground
	rep.Calibration = cal
	rep.Warnings = slices.Concat(p.Warnings, stageWarnings, rep.Warnings)
	res.Report = rep
	if hb, ok := p.Ground.Section.Bankfull(); ok {
		res.BankfullStage = hb
		if ro.GaugeHeights {
			res.BankfullStage = rating.DecimalDifference(hb, ro.Datum)
		}
		if bt, err := rating.Compute(p.Geometry, []float64{hb}, ro.Options); err == nil && len(bt.Rows) == 1 {
			res.BankfullDischarge = bt.Rows[0].Discharge
		}
	}
	return res, nil
}
