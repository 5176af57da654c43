package results

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey"
	"wetline/survey/workbook"
)

// Sheet names of a fit results workbook that a rating workbook does not
// have (it shares SheetSummary, SheetLookup and SheetPlots).
const (
	// SheetGaugings is the field workbook's gaugings sheet name, so that
	// a fit workbook's gaugings read back as gaugings.
	SheetGaugings  = survey.FieldSheetGaugings
	SheetFitTable  = survey.SheetResultsFitted
	SheetBands     = "bands"
	SheetPosterior = "posterior"
	SheetNByStage  = "n by stage"
)

// fitLookupCells turns a report's lookup rows into cells of a lookup
// sheet, marking the extrapolated ones.
func fitLookupCells(r *gauged.Report) []LookupCell {
	out := make([]LookupCell, len(r.Lookup))
	for i, row := range r.Lookup {
		out[i] = LookupCell{Stage: row.Stage, Discharge: row.Discharge, Marked: row.Extrapolated()}
	}
	return out
}

// WriteFitWorkbook writes the results workbook of a gaugings report to w.
// Sheets:
//
//   - summary: site, sources, program version, units, gauge datum, slope,
//     the zone of every time in the workbook (the report's offset, else UTC),
//     the method and the uncertainty convention, gauging counts, each
//     control with its parameters and uncertainties, the standard error of
//     estimate, the F test of one more control, the ISO tests with their
//     p-values, Johnson's check, the calibration factor on n, what the
//     rows above the gaugings rest on, the warnings and the caution;
//   - gaugings: every measurement (time, stage, discharge, quality, note,
//     uncertainty and exclude: the columns of a field workbook's gaugings
//     sheet, so it reads back as gaugings) with its uncertainty as used,
//     its departure from the hydraulic rating and from the fit, its stage
//     shift, band flag, fitted discharge, residual and weight, why it was
//     left out of the fit, and its back-calculated n;
//   - fitted rating: the table (FitTableColumns()), the extrapolated rows
//     in the marked style (Book.MarkStyle) and flagged "yes";
//   - bands: at each stage of the table the discharge, both 95 % bands
//     and their half-widths in percent, and the multiple of the largest
//     gauged discharge, extrapolated rows marked;
//   - posterior: a Bayesian fit's parameters (mean, sd, quantiles, prior,
//     R̂, effective sample size) and the sampling's diagnostics;
//   - lookup: the report's Lookup in the printed layout (WriteLookupCells),
//     extrapolated cells marked;
//   - n by stage: the back-calculated n of each gauging, by stage, when
//     there is a calibration;
//   - plots: the pictures, when given.
//
// Stages are gauge heights throughout.
func WriteFitWorkbook(w io.Writer, r *gauged.Report) error {
	b := newBook("fit", r.Provenance.Site, r.Site)
	defer b.Close()
	if err := writeFitSummary(b, r); err != nil {
		return err
	}
	if err := writeGaugingsSheet(b, r); err != nil {
		return err
	}
	if r.Table != nil {
		if err := writeFitTableSheet(b, r.Units, r.Table); err != nil {
			return err
		}
		if err := writeBandsSheet(b, r.Units, r.Table); err != nil {
			return err
		}
	}
	if r.Fit != nil && r.Fit.Posterior != nil {
		if err := writePosteriorSheet(b, r.Fit.Posterior); err != nil {
			return err
		}
	}
	if len(r.Lookup) > 0 {
		if err := WriteLookupCells(b, SheetLookup, r.Units, fitLookupCells(r)); err != nil {
			return err
		}
	}
	if r.Calibration != nil {
		if err := writeNByStageSheet(b, r); err != nil {
			return err
		}
	}
	return finishBook(w, b, r.Figures)
}

// fitClock is a gauging's time for a date cell of a fit workbook: the wall
// clock at the report's UTC offset, UTC when none was chosen, whatever
// offset the time was read with (a date cell shows the clock it is given
// and keeps no zone; the summary's "times in" names the zone).
func fitClock(t time.Time, r *gauged.Report) time.Time {
	return wallClock(t, zoneOf(r.UTCOffset))
}

// yes returns "yes" for a set flag and nil (a blank cell) otherwise.
func yes(b bool) any {
	if b {
		return "yes"
	}
	return nil
}

// writeFitSummary writes the summary sheet of a fit workbook.
func writeFitSummary(b *workbook.Book, r *gauged.Report) error {
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	var items []SummaryItem
	add := func(item string, v any, unit string) { items = append(items, SummaryItem{item, v, unit}) }
	var err error
	// num styles a number with a format code (FormatSig3 chooses per
	// value); undefined numbers leave the item out.
	num := func(format string, v float64) any { return b.NumberOnce(format, v, &err) }
	if name := r.Provenance.Site.Name; name != "" {
		add("site", name, "")
		if r.Site != name {
			add("gaugings file", r.Site, "")
		}
	} else {
		add("site", r.Site, "")
	}
	if r.Section != "" {
		add("section", r.Section, "")
	}
	add("read from", strings.Join(r.Provenance.Inputs, "; "), "")
	add("program", programName(r.Provenance), "")
	add("site details", r.Provenance.Site.String(), "")
	items = append(items, inputNoteItems(r.Provenance)...)
	add("units", fmt.Sprintf("%s: length %s, discharge %s", u, L, Q), "")
	switch {
	case r.Hydraulic != nil:
		add("gauge datum", "elevation = gauge height "+rating.DatumTerm(r.Datum), L)
		add("friction slope of the hydraulic rating", num("0.######", r.Slope), L+"/"+L)
	case r.HydraulicTable != nil:
		add("gauge datum", "stages are gauge heights; hydraulic rating from the "+r.HydraulicSource, "")
	default:
		add("gauge datum", "stages are gauge heights as read; no section given, so no hydraulic rating", "")
	}
	add("uncertainty convention", gauged.UncertaintyConvention(), "")
	add("gaugings", len(r.Gaugings), "")
	add("times in", zoneName(zoneOf(r.UTCOffset)), "")
	if s := jsonSelectionOf(r); s.Excluded > 0 || s.From != "" || s.To != "" { // as the text's selection line
		add("selection", fmt.Sprintf("%d of %d gaugings fitted (the others are on the gaugings sheet with their departures)", s.Fitted, len(r.Gaugings)), "")
		if s.From != "" || s.To != "" {
			add("rating period", PeriodWords(s.From, s.To), "")
		}
		if len(s.Exclude) > 0 {
			add("times excluded", strings.Join(s.Exclude, ", "), "")
		}
	}
	if f := r.Fit; f != nil {
		fitSummaryItems(add, num, r, f)
	} else {
		add("method", "comparison with the hydraulic rating only: no fit", "")
	}
	if c := r.Comparison; c != nil {
		add("geometric mean departure from the hydraulic rating", num("0.0", c.MeanLogDeparturePercent), "%")
		add("gaugings outside their quality bands (hydraulic rating)", c.Outside, "")
		if c.LeftOut > 0 {
			add("hydraulic rating compared over", fmt.Sprintf("the gaugings selected only, as the fit and the calibration take them: %d compared, %d left out", c.Compared(), c.LeftOut), "")
		}
	}
	if c := r.Calibration; c != nil {
		which := "every subsection's n"
		if c.ChannelOnly {
			which = "the channel's n"
		}
		add("calibration factor on "+which, num("0.0000", c.Factor), "")
		add("standard error of the factor", num("0.00", c.FactorStandardErrorPercent), "%")
		add("standard error of the calibrated rating", num("0.00", c.StandardErrorPercent), "%")
	}
	if t := r.Table; t != nil {
		add("bands", t.BandNote, "")
		if t.AboveNote != "" {
			add("extrapolation", t.AboveNote, "")
		}
		add("largest gauged discharge", num(workbook.FormatSig3, t.MaxDischarge), Q)
		add("largest multiple of the largest gauged discharge in the table", num("0.00", t.MaxMultiple), "")
		add("fitted rating sheet", "rows outside the gaugings are extrapolated: marked yes and shaded; the basis column says what each row rests on", "")
	}
	if len(r.Lookup) > 0 {
		add("lookup sheet", "discharge at every hundredth of stage by the fitted rating sheet's rule (not interpolated); extrapolated cells shaded", "")
	}
	if err != nil {
		return err
	}
	return WriteSummarySheet(b, SheetSummary, items, r.Warnings)
}

// fitSummaryItems adds the fit's items to the summary.
func fitSummaryItems(add func(string, any, string), num func(string, float64) any, r *gauged.Report, f *gauged.ControlFit) {
	L := r.Units.Length()
	add("method", f.Method.String()+": "+methodWords(f), "")
	add("gaugings fitted", f.N, "")
	add("parameters fitted", f.Params, "")
	add("lowest gauging fitted", num("0.000", f.LowStage), L)
	add("highest gauging fitted", num("0.000", f.HighStage), L)
	add("first offset from", f.OffsetSource, "")
	for j, c := range f.Controls {
		p := fmt.Sprintf("control %d: ", j+1)
		lo, hi := exponentBounds(f, j)
		add(p+"kind and joint", fmt.Sprintf("%s, %s (exponents %s to %s expected)", c.Kind, c.Joint, sig(lo, 3), sig(hi, 3)), "")
		add(p+"stages", segmentStages(f, j, ""), L)
		add(p+"coefficient A", num("0.00000", c.A), "")
		add(p+"uncertainty of A", num("0.00000", c.ASE), "")
		add(p+"offset B", num("0.0000", c.B), L)
		add(p+"uncertainty of B", num("0.0000", c.BSE), L)
		add(p+"exponent C", num("0.0000", c.C), "")
		add(p+"uncertainty of C", num("0.0000", c.CSE), "")
		if src := priorSource(f, j); src != "" {
			add(p+"prior", src, "")
		}
	}
	if f.StandardErrorDF <= 0 || math.IsNaN(f.StandardErrorLog) {
		add("weighted standard error of estimate", standardErrorUndefined(f), "")
	} else {
		add("weighted standard error of estimate", num("0.00", f.StandardErrorPercent), "%")
		add("weighted standard error of estimate in ln Q", num("0.0000", f.StandardErrorLog), "")
		add("degrees of freedom of the standard error of estimate", f.StandardErrorDF, "")
	}
	if m := r.MoreControls; m.Made {
		label := "one more control"
		if f.Method == gauged.Bayesian {
			label = "one more control (a least-squares test, not of the Bayesian fit)"
		}
		add(label, fmt.Sprintf("F = %.2f, p = %s (poor fit below p = %s)", m.F, sig(m.P, 3), sig(gauged.PoorFitLevel, shortest)), "")
	}
	for _, t := range []gauged.RelationTest{f.Tests.Sign, f.Tests.Runs, f.Tests.Mean} {
		add("ISO 1100-2 "+t.Name+" test", fmt.Sprintf("n %d, statistic %s, p = %s, failed %v", t.N, sig(t.Statistic, 4), sig(t.P, 3), t.Failed), "")
	}
	if p := f.Posterior; p != nil {
		add("largest R̂ ("+p.RHatParam+")", num("0.000", p.RHatMax), "")
		add("R̂ limit (the chains agree at or below it)", num("0.00", gauged.RHatLimit), "")
		add("least effective sample size ("+p.ESSParam+")", num("0", p.ESSMin), "")
		add("acceptance rate", num("0.000", p.Acceptance), "")
		add("sampling", fmt.Sprintf("%s of %s after %s, seed %d, %s", rating.Counted(p.Chains, "chain", "chains"), rating.Counted(p.Draws, "draw", "draws"),
			rating.Counted(p.Pilot, "pilot iteration", "pilot iterations"), p.Seed, rating.Counted(p.Modes, "local mode", "local modes")), "")
		add("likelihood", p.Likelihood, "")
	}
	if j := f.Johnson; j.OK && j.Undetermined {
		add("Johnson's three-point zero-flow stage", j.Note, "")
	} else if j.OK {
		add("Johnson's three-point zero-flow stage", num("0.0000", j.ZeroFlow), L)
		if !math.IsNaN(j.ZeroFlowSE) {
			add("Johnson's zero-flow stage, uncertainty at 95 % (±)", num("0.000", gauged.CoverageFactor95*j.ZeroFlowSE), L)
		}
	} else {
		add("Johnson's three-point zero-flow stage", "not made: "+j.Note, "")
	}
}

// textWidth is the width, in characters, of a wrapped column of text (a
// note, a reason, a source) on a wide sheet.
const textWidth = 16

// writeGaugingsSheet writes one row per gauging, in input order.
func writeGaugingsSheet(b *workbook.Book, r *gauged.Report) error {
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "quality", Width: 10},
		{Name: "note", Width: textWidth, Wrap: true},
		{Name: survey.ColGaugingUncertainty, Unit: "%", Format: "0.0"},
		{Name: survey.ColGaugingExclude, Width: 12, Wrap: true},
		{Name: "uncertainty_used", Unit: "%", Format: "0.0"},
	}
	if r.Comparison != nil {
		cols = append(cols,
			workbook.Column{Name: "hydraulic", Unit: Q, Format: workbook.FormatSig3},
			workbook.Column{Name: "hydraulic_departure", Unit: "%", Format: "0.0"},
			workbook.Column{Name: "hydraulic_shift", Unit: L, Format: "0.000"},
			workbook.Column{Name: "hydraulic_outside_band"})
	}
	if r.Fit != nil {
		cols = append(cols,
			workbook.Column{Name: "fitted", Unit: Q, Format: workbook.FormatSig3},
			workbook.Column{Name: "departure", Unit: "%", Format: "0.0"},
			workbook.Column{Name: "log_residual", Format: "0.0000"},
			workbook.Column{Name: "shift", Unit: L, Format: "0.000"},
			workbook.Column{Name: "outside_band"},
			workbook.Column{Name: "weight", Format: "0.000"},
			workbook.Column{Name: "excluded"},
			workbook.Column{Name: "excluded_reason", Width: textWidth, Wrap: true})
	}
	if r.Calibration != nil {
		cols = append(cols, workbook.Column{Name: "factor_on_n", Format: "0.000"}, workbook.Column{Name: "n", Format: "0.0000"})
	}
	cols = append(cols, workbook.Column{Name: "source", Width: textWidth, Wrap: true})
	s, err := reportTable(b, SheetGaugings, cols)
	if err != nil {
		return err
	}
	vals := make([]any, 0, len(cols))
	for i, g := range r.Gaugings {
		unc := math.NaN()
		if g.Uncertainty > 0 {
			unc = g.Uncertainty
		}
		vals = append(vals[:0], fitClock(g.Time, r), g.Stage, g.Discharge, g.Quality.String(), g.Note, unc, g.Exclude, g.UncertaintyPercent())
		if c := r.Comparison; c != nil {
			res := c.Residuals[i]
			vals = append(vals, res.Fitted, res.DeparturePercent, res.Shift, yes(res.OutsideBand))
		}
		if f := r.Fit; f != nil {
			res := f.Residuals[i]
			vals = append(vals, res.Fitted, res.DeparturePercent, res.LogResidual, res.Shift, yes(res.OutsideBand), res.Weight, yes(res.Excluded), res.ExcludedReason)
		}
		if r.Calibration != nil {
			f, n := calPoint(r, i)
			vals = append(vals, f, n)
		}
		vals = append(vals, g.Source)
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeFitTableSheet writes the fit's table, extrapolated rows marked.
func writeFitTableSheet(b *workbook.Book, u rating.Units, t *gauged.ControlTable) error {
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "extrapolated", Width: 13},
		{Name: "basis", Width: 20},
		{Name: "lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "hydraulic", Unit: Q, Format: workbook.FormatSig3},
		{Name: "parametric_lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "parametric_upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "total_lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "total_upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "gauged_multiple", Format: "0.00"},
	}
	return writeMarkedRows(b, SheetFitTable, cols, t.Rows, func(row gauged.ControlRow) []any {
		return []any{row.Stage, row.Discharge, yes(row.Extrapolated()), row.Basis.String(), row.ParametricLower, row.ParametricUpper, row.Hydraulic,
			row.ParametricLower, row.ParametricUpper, row.TotalLower, row.TotalUpper, row.Multiple}
	})
}

// writeBandsSheet writes both bands of the table with their half-widths
// in percent of the discharge.
func writeBandsSheet(b *workbook.Book, u rating.Units, t *gauged.ControlTable) error {
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "parametric_lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "parametric_upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "parametric_half_width", Unit: "%", Format: "0.0"},
		{Name: "total_lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "total_upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "total_half_width", Unit: "%", Format: "0.0"},
		{Name: "gauged_multiple", Format: "0.00"},
		{Name: "basis", Width: 20},
	}
	half := func(lo, hi, q float64) float64 {
		if !(q > 0) {
			return math.NaN()
		}
		return 50 * (hi - lo) / q
	}
	return writeMarkedRows(b, SheetBands, cols, t.Rows, func(row gauged.ControlRow) []any {
		return []any{row.Stage, row.Discharge, row.ParametricLower, row.ParametricUpper, half(row.ParametricLower, row.ParametricUpper, row.Discharge),
			row.TotalLower, row.TotalUpper, half(row.TotalLower, row.TotalUpper, row.Discharge), row.Multiple, row.Basis.String()}
	})
}

// writeMarkedRows writes one row per table row, extrapolated rows in the
// marked style.
func writeMarkedRows(b *workbook.Book, name string, cols []workbook.Column, rows []gauged.ControlRow, values func(gauged.ControlRow) []any) error {
	s, err := reportTable(b, name, cols)
	if err != nil {
		return err
	}
	for _, row := range rows {
		vals := values(row)
		if row.Extrapolated() {
			if err := markCells(b, cols, vals); err != nil {
				return err
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// PosteriorColumns returns the columns of the posterior sheet of a fit
// workbook.
func PosteriorColumns() []string {
	return []string{"name", "mean", "sd", "p2_5", "p50", "p97_5", "prior_mean", "prior_sd", "rhat", "ess", "derived"}
}

// writePosteriorSheet writes a Bayesian fit's parameters (the diagnostics
// of the sampling are in the summary).
func writePosteriorSheet(b *workbook.Book, p *gauged.Posterior) error {
	names := PosteriorColumns()
	cols := make([]workbook.Column, len(names))
	for i, n := range names {
		cols[i] = workbook.Column{Name: n, Format: workbook.FormatSig3}
	}
	cols[0].Width, cols[len(cols)-1].Width = 36, 10
	cols[0].Format, cols[len(cols)-1].Format = workbook.FormatText, workbook.FormatText
	s, err := reportTable(b, SheetPosterior, cols)
	if err != nil {
		return err
	}
	for _, q := range p.Parameters {
		if err := s.Row(q.Name, q.Mean, q.SD, q.P2_5, q.P50, q.P97_5, q.PriorMean, q.PriorSD, q.RHat, q.ESS, yes(q.Derived)); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeNByStageSheet writes the back-calculated n of each gauging, by stage.
func writeNByStageSheet(b *workbook.Book, r *gauged.Report) error {
	u := r.Units
	c := r.Calibration
	s, err := reportTable(b, SheetNByStage, []workbook.Column{
		{Name: "stage", Unit: u.Length(), Format: "0.000"},
		{Name: "discharge", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: "rated", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: "factor_on_n", Format: "0.000"},
		{Name: "n", Format: "0.0000"},
		{Name: "subsection", Format: "0"},
		{Name: "time", Format: workbook.FormatDateTime, Width: 17},
	})
	if err != nil {
		return err
	}
	pts := append([]gauged.NPoint(nil), c.Points...)
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].Stage < pts[j].Stage })
	for _, p := range pts {
		if err := s.Row(p.Stage, p.Discharge, p.Rated, p.Factor, p.N, p.Subsection+1, fitClock(p.Time, r)); err != nil {
			return err
		}
	}
	return s.Flush()
}
