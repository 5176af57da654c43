package results

import (
	"fmt"
	"io"
	"math"
	"sort"
	"strings"

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
	SheetGaugings = survey.FieldSheetGaugings
	SheetFitTable = "fitted rating"
	SheetNByStage = "n by stage"
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
//     gauging counts, the fitted segments with their parameters and
//     standard errors, the standard error of estimate, the calibration
//     factor on n, where the extrapolation's scale factor came from, the
//     warnings and the caution;
//   - gaugings: every measurement (time, stage, discharge, quality, note,
//     the columns of a field workbook's gaugings sheet) with its departure
//     from the hydraulic rating and from the fit, its stage shift, its
//     band flag, fitted discharge and residual, and its back-calculated n;
//   - fitted rating: the fit's lookup table (FitTableColumns()), the
//     extrapolated rows in the marked style (Book.MarkStyle) and flagged
//     "yes" in the extrapolated column;
//   - lookup: the report's Lookup in the printed layout (WriteLookupCells),
//     extrapolated cells marked;
//   - n by stage: the back-calculated n of each gauging, by stage, when
//     there is a calibration;
//   - plots: the pictures, when given.
//
// Stages are gauge heights throughout.
func WriteFitWorkbook(w io.Writer, r *gauged.Report) error {
	b := newBook("wetline fit: " + r.Site)
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
	if len(r.Figures) > 0 {
		if err := b.Pictures(SheetPlots, pictures(r.Figures)); err != nil {
			return err
		}
	}
	return b.Write(w)
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
	add("site", r.Site, "")
	add("read from", strings.Join(r.Provenance.Inputs, "; "), "")
	add("program", programName(r.Provenance), "")
	add("units", fmt.Sprintf("%s: length %s, discharge %s", u, L, Q), "")
	if r.Comparison != nil {
		add("gauge datum", fmt.Sprintf("elevation = gauge height + %s", FormatFloat(r.Datum)), L)
		add("friction slope of the hydraulic rating", num("0.######", r.Slope), L+"/"+L)
	} else {
		add("gauge datum", "stages are gauge heights as read; no section given, so no hydraulic rating", "")
	}
	add("gaugings", len(r.Gaugings), "")
	if f := r.Fit; f != nil {
		add("method", "power law Q = C·(h − e)^b by segment, continuous at the breakpoints, weighted least squares in ln Q (ISO 18320; Kennedy, 1984, USGS TWRI 3-A10)", "")
		add("gaugings fitted", f.N, "")
		add("parameters fitted", f.Params, "")
		add("lowest gauging fitted", num("0.000", f.LowStage), L)
		add("highest gauging fitted", num("0.000", f.HighStage), L)
		add("gauge height of zero flow e", num("0.0000", f.ZeroFlow), L)
		if f.ZeroFlowFixed {
			add("e from", f.ZeroFlowSource, "")
		} else {
			add("standard error of e", num("0.0000", f.ZeroFlowSE), L)
		}
		for i, bk := range f.Breaks {
			add(fmt.Sprintf("breakpoint %d", i+1), num("0.0000", bk), L)
			if f.BreaksFixed {
				add(fmt.Sprintf("breakpoint %d from", i+1), "given", "")
			} else {
				add(fmt.Sprintf("standard error of breakpoint %d", i+1), num("0.0000", f.BreaksSE[i]), L)
			}
		}
		for i, s := range f.Segments {
			p := fmt.Sprintf("segment %d: ", i+1)
			add(p+"stages", fmt.Sprintf("%.3f to %.3f", s.From, s.To), L)
			add(p+"coefficient C", num("0.00000", s.Coefficient), "")
			add(p+"standard error of C", num("0.00000", s.CoefficientSE), "")
			add(p+"exponent b", num("0.0000", s.Exponent), "")
			add(p+"standard error of b", num("0.0000", s.ExponentSE), "")
		}
		add("standard error of estimate", num("0.00", f.StandardErrorPercent), "%")
		add("standard error of estimate in ln Q", num("0.0000", f.StandardErrorLog), "")
		if !math.IsNaN(f.MoreSegmentsP) {
			add("one more segment", fmt.Sprintf("F = %.2f, p = %.3g (poor fit below p = %g)", f.MoreSegmentsF, f.MoreSegmentsP, gauged.PoorFitLevel), "")
		}
	} else {
		add("method", "comparison with the hydraulic rating only: no fit", "")
	}
	if c := r.Comparison; c != nil {
		add("geometric mean departure from the hydraulic rating", num("0.0", c.MeanLogDeparturePercent), "%")
		add("gaugings outside their quality bands (hydraulic rating)", c.Outside, "")
	}
	if c := r.Calibration; c != nil {
		which := "every subsection's n"
		if c.ChannelOnly {
			which = "the channel's n"
		}
		add("calibration factor on "+which, num("0.0000", c.Factor), "")
		add("standard error of the calibrated rating", num("0.00", c.StandardErrorPercent), "%")
	}
	if t := r.Table; t != nil {
		add("extrapolation scale factor", num("0.0000", t.ScaleFactor), "")
		add("extrapolation", t.ScaleNote, "")
		add("fitted rating sheet", "rows outside the gaugings are extrapolated: marked yes and shaded; below the lowest gauging the fit down to e, above the highest the scaled hydraulic rating", "")
	}
	if len(r.Lookup) > 0 {
		add("lookup sheet", "discharge at every hundredth of stage by the fitted rating sheet's rule (not interpolated); extrapolated cells shaded", "")
	}
	if err != nil {
		return err
	}
	return WriteSummarySheet(b, SheetSummary, items, r.Warnings)
}

// writeGaugingsSheet writes one row per gauging, in input order.
func writeGaugingsSheet(b *workbook.Book, r *gauged.Report) error {
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "quality", Width: 10},
		{Name: "note", Width: 24},
	}
	if r.Comparison != nil {
		cols = append(cols,
			workbook.Column{Name: "hydraulic", Unit: Q, Format: workbook.FormatSig3},
			workbook.Column{Name: "hydraulic_departure", Unit: "%", Format: "0.0"},
			workbook.Column{Name: "hydraulic_shift", Unit: L, Format: "0.000"},
			workbook.Column{Name: "hydraulic_outside_band", Width: 12})
	}
	if r.Fit != nil {
		cols = append(cols,
			workbook.Column{Name: "fitted", Unit: Q, Format: workbook.FormatSig3},
			workbook.Column{Name: "departure", Unit: "%", Format: "0.0"},
			workbook.Column{Name: "log_residual", Format: "0.0000"},
			workbook.Column{Name: "shift", Unit: L, Format: "0.000"},
			workbook.Column{Name: "outside_band", Width: 12},
			workbook.Column{Name: "weight", Format: "0.000"},
			workbook.Column{Name: "excluded", Width: 10})
	}
	if r.Calibration != nil {
		cols = append(cols, workbook.Column{Name: "factor_on_n", Format: "0.000"}, workbook.Column{Name: "n", Format: "0.0000"})
	}
	cols = append(cols, workbook.Column{Name: "source", Width: 24})
	s, err := b.Table(SheetGaugings, cols)
	if err != nil {
		return err
	}
	vals := make([]any, 0, len(cols))
	for i, g := range r.Gaugings {
		vals = append(vals[:0], g.Time, g.Stage, g.Discharge, g.Quality.String(), g.Note)
		if c := r.Comparison; c != nil {
			res := c.Residuals[i]
			vals = append(vals, res.Fitted, res.DeparturePercent, res.Shift, yes(res.OutsideBand))
		}
		if f := r.Fit; f != nil {
			res := f.Residuals[i]
			vals = append(vals, res.Fitted, res.DeparturePercent, res.LogResidual, res.Shift, yes(res.OutsideBand), res.Weight, yes(res.Excluded))
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

// writeFitTableSheet writes the fit's lookup table, extrapolated rows marked.
func writeFitTableSheet(b *workbook.Book, u rating.Units, t *gauged.FitTable) error {
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "extrapolated", Width: 13},
		{Name: "basis", Width: 20},
		{Name: "lower_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "upper_95", Unit: Q, Format: workbook.FormatSig3},
		{Name: "hydraulic", Unit: Q, Format: workbook.FormatSig3},
	}
	s, err := b.Table(SheetFitTable, cols)
	if err != nil {
		return err
	}
	vals := make([]any, len(cols))
	for _, row := range t.Rows {
		vals = append(vals[:0], row.Stage, row.Discharge, yes(row.Extrapolated()), row.Basis.String(), row.Lower, row.Upper, row.Hydraulic)
		if row.Extrapolated() {
			for i, v := range vals {
				if vals[i], err = b.Marked(cols[i].Format, v); err != nil {
					return err
				}
			}
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeNByStageSheet writes the back-calculated n of each gauging, by stage.
func writeNByStageSheet(b *workbook.Book, r *gauged.Report) error {
	u := r.Units
	c := r.Calibration
	s, err := b.Table(SheetNByStage, []workbook.Column{
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
		if err := s.Row(p.Stage, p.Discharge, p.Rated, p.Factor, p.N, p.Subsection+1, p.Time); err != nil {
			return err
		}
	}
	return s.Flush()
}
