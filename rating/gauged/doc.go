// Package gauged works with discharge measurements (gaugings) at a gauge:
// their comparison with a section's hydraulic rating, the calibration of
// Manning's n on them, power-law rating fits with their bands and lookup
// tables extended on the section's hydraulics.
//
// A gauging's stage is a gauge height; a HydraulicCurve (package rating)
// relates gauge heights to the surveyed section through its datum.
// Discharges are in the unit system's discharge unit. Gaugings are never
// modified and reports keep them in input order.
//
// Two rating engines live here. The controls engine, which Analyze (the
// report of the fit command) runs, builds a rating from one to
// MaxControls controls, each Q = A·(h − B)^C with its own offset, joined
// by Replace or Add (NewRating); fits it by weighted least squares
// (FitControls) or by Bayesian inference with priors from the survey
// (FitBayes, HydraulicPrior, TablePrior, CrestPrior, BankStage); tests it
// (Johnson's zero-flow estimate, the ISO tests of a relation, an F test
// of one more control); and lays it out as a table with a parametric and
// a total 95 % band on every row, the conveyance-slope extension above
// the gaugings for least squares (ControlTable). A hydraulic rating is a
// section's (rating.HydraulicCurve) or a table's (TableRating, read at
// gauge heights), for comparison, extension and prior alike. The older
// engine, FitPowerLaw and LookupTable, fits segments sharing one gauge
// height of zero flow and extends the table by the scaled hydraulic
// rating; it is kept as an independent check of the new one.
//
// A rating's life after it is built lives here too. RatingTable is a
// gauge's rating as a table (any table of stage and discharge, with its
// gauge height of zero flow), compiled into a TableRating that reads it
// log-linearly in (h − e) between rows. ShiftDiagram is a shift as a
// function of stage; History puts ratings in periods and diagrams in time,
// and compiles into a Rater that prorates shifts between visits, from no
// shift at a rating period's start and never before a diagram's own time,
// and refuses a diagram falling faster than the stage rises. Rater.CheckGaugings
// sets gaugings against the rating in force, proposes a diagram per field
// visit and returns the ShiftCheck report; CompareRatings sets two ratings
// side by side (a revision). Package record turns a stage record into the
// discharge record with a Rater.
package gauged
