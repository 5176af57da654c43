package results

import (
	"errors"
	"fmt"
	"io"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
	"wetline/survey/workbook"
)

// Sheet names of a record or shifts workbook (besides SheetSummary,
// SheetGaugings and SheetPlots).
const (
	SheetDaily     = "daily values"
	SheetUnit      = "unit values"
	SheetRatings   = survey.SheetResultsRatings
	SheetShifts    = "shifts"
	SheetProposals = "proposed shifts"
)

// MaxSheetRows is the most data rows a workbook sheet holds under its
// header (a sheet has 1 048 576 rows).
const MaxSheetRows = 1_048_575

// ErrSheetRows is the cause of a table too long for a workbook sheet.
var ErrSheetRows = errors.New("too many rows for a workbook sheet")

// CheckRecordWorkbook reports whether the tables asked for of a record of
// readings readings and days days fit a workbook's sheets: an error
// wrapping ErrSheetRows, saying what to do instead, or nil. A command
// calls it before computing the record.
func CheckRecordWorkbook(readings, days int, tables RecordTables) error {
	tables = DefaultTables(tables, "xlsx")
	if tables&UnitTable != 0 && readings > MaxSheetRows {
		return fmt.Errorf("%w: %d unit values, a sheet holds %d: write the unit values as CSV, and only the daily values to the workbook",
			ErrSheetRows, readings, MaxSheetRows)
	}
	if tables&DailyTable != 0 && days > MaxSheetRows {
		return fmt.Errorf("%w: %d days, a sheet holds %d", ErrSheetRows, days, MaxSheetRows)
	}
	return nil
}

// wallClock is the wall-clock reading of t in zone z as a UTC time, so
// that a workbook's date cell shows the time in z.
func wallClock(t time.Time, z *time.Location) time.Time {
	l := t.In(z)
	return time.Date(l.Year(), l.Month(), l.Day(), l.Hour(), l.Minute(), l.Second(), 0, time.UTC)
}

// WriteRecordWorkbook writes the results workbook of a record to w.
// Sheets:
//
//   - summary: the stage record, the files read, program, site, the input
//     notes (a rating table naming no unit), units, the zone of the days,
//     the maximum gap, every rating period and shift diagram used, the
//     flag counts, the provisional note, the warnings and the caution;
//   - daily values: RecordDailyColumns(), dates and times in the record's
//     zone;
//   - unit values: RecordUnitColumns(), when asked for;
//   - ratings: every period's table (period, valid_from, rating, stage,
//     discharge, tz), the period's start a date cell with its zone, for
//     reading: it does not read back as a rating file (see
//     writeRatingsSheet);
//   - shifts: the diagrams used in the columns of a shift table
//     (survey.ShiftColumns(), times as date cells), the rating period,
//     the source and the times' zone (tz), so the sheet reads back as
//     shift diagrams;
//   - gaugings: each gauging within the record's span against the record,
//     when given, its recorded stage and the difference stage − recorded
//     after the columns of the shifts workbook's gaugings sheet
//     (recorded_stage, stage_difference, beyond_stage_tolerance);
//   - plots: the figures, when drawn.
//
// A table too long for a sheet is refused before anything is written
// (CheckRecordWorkbook). Table sheets are streamed.
func WriteRecordWorkbook(w io.Writer, res *record.Result, tables RecordTables) error {
	tables = DefaultTables(tables, "xlsx")
	if err := CheckRecordWorkbook(res.UnitRowCount(), len(res.Daily), tables); err != nil {
		return err
	}
	b := newBook("record", res.Provenance.Site, res.Name)
	defer b.Close()
	steps := []func(*workbook.Book, *record.Result) error{writeRecordSummary}
	if tables&DailyTable != 0 {
		steps = append(steps, writeDailySheet)
	}
	if tables&UnitTable != 0 {
		steps = append(steps, writeUnitSheet)
	}
	steps = append(steps, func(b *workbook.Book, res *record.Result) error {
		ps, ss := recordInfo(res)
		if err := writeRatingsSheet(b, ps, res.Zone, res.UnitSystem); err != nil {
			return err
		}
		return writeShiftsSheet(b, SheetShifts, ss, res.Zone, res.UnitSystem)
	})
	if res.Gaugings != nil {
		steps = append(steps, func(b *workbook.Book, res *record.Result) error {
			return writeShiftGaugingsSheet(b, res.Gaugings, res.Zone, res.GaugeStages)
		})
	}
	if err := writeSheets(b, res, steps...); err != nil {
		return err
	}
	return finishBook(w, b, res.Figures)
}

// historyItems are the summary items stating rating periods and diagrams.
func historyItems(ps []periodInfo, ss []shiftInfo, z *time.Location, u rating.Units) []SummaryItem {
	var items []SummaryItem
	for i, p := range ps {
		v := fmt.Sprintf("from %s to %s: %s", fromText(p.from, z), toText(p.to, z), ratingWords(p.rating, u))
		if p.readings >= 0 {
			v += "; " + rating.Counted(p.readings, "reading", "readings") + " rated"
		}
		items = append(items, SummaryItem{fmt.Sprintf("rating period %d", i+1), v, ""})
	}
	if len(ss) == 0 {
		items = append(items, SummaryItem{"shift diagrams", "none: no shift is applied to the ratings", ""})
	}
	for _, d := range ss {
		where := "not used: no rating in force at its time"
		if d.period >= 0 {
			where = fmt.Sprintf("rating period %d", d.period+1)
		}
		items = append(items, SummaryItem{"shift diagram of " + d.Time.In(z).Format(RecordTimeLayout),
			where + ": " + shiftWords(d.ShiftDiagram, u), ""})
	}
	return items
}

// writeRecordSummary writes the summary sheet of a record workbook.
func writeRecordSummary(b *workbook.Book, res *record.Result) error {
	u := res.UnitSystem
	items := []SummaryItem{
		{"stage record", res.Name, ""},
		{"read from", joinInputs(res.Provenance.Inputs), ""},
		{"program", programName(res.Provenance), ""},
		{"site", res.Provenance.Site.String(), ""},
	}
	items = append(items, inputNoteItems(res.Provenance)...)
	items = append(items, []SummaryItem{
		{"units", fmt.Sprintf("%s: gauge heights and shifts in %s, discharge in %s", u, u.Length(), u.Discharge()), ""},
		{"readings", len(res.Units), ""},
		{"missing readings (flagged missing in the unit values)", len(res.Missing), ""},
		{"days", len(res.Daily), ""},
		{"days taken in", zoneName(res.Zone), ""},
		{"longest gap bridged", record.FormatDuration(res.MaxGap), ""},
		{"method", "effective gauge height h + s(t, h), discharge from the rating in force; daily mean time-weighted by the trapezoidal rule over the covered part of the day (Kennedy, 1983, USGS TWRI 3-A13)", ""},
	}...)
	if n := len(res.Units); n > 0 {
		items = append(items,
			SummaryItem{"first reading", time.Unix(res.Units[0].Time, 0).In(res.Zone).Format(RecordTimeLayout), ""},
			SummaryItem{"last reading", time.Unix(res.Units[n-1].Time, 0).In(res.Zone).Format(RecordTimeLayout), ""})
	}
	ps, ss := recordInfo(res)
	items = append(items, historyItems(ps, ss, res.Zone, u)...)
	if c := res.Gaugings; c != nil {
		out := 0
		for _, g := range c.Gaugings {
			if g.OutsideShifted {
				out++
			}
		}
		items = append(items, SummaryItem{"gaugings outside their quality bands from the record", fmt.Sprintf("%d of %d", out, len(c.Gaugings)), ""})
		if n := excludedCount(c); n > 0 {
			items = append(items, SummaryItem{"gaugings excluded (never counted outside their bands)", n, ""})
		}
		beyond := 0
		for _, s := range res.GaugeStages {
			if s.Beyond {
				beyond++
			}
		}
		items = append(items, SummaryItem{"gauge heights differing from the recorded stage by more than the tolerance", fmt.Sprintf("%d of %d", beyond, len(c.Gaugings)), ""},
			SummaryItem{"stage tolerance", res.StageTolerance, u.Length()})
	}
	if res.GaugingsLeftOut > 0 {
		items = append(items, SummaryItem{"gaugings outside the record's span, not checked", res.GaugingsLeftOut, ""})
	}
	items = append(items, SummaryItem{"provisional", record.ProvisionalNote, ""})
	return WriteSummarySheet(b, SheetSummary, items, res.Warnings)
}

// writeDailySheet writes the daily values.
func writeDailySheet(b *workbook.Book, res *record.Result) error {
	Q := res.UnitSystem.Discharge()
	s, err := reportTable(b, SheetDaily, []workbook.Column{
		{Name: "date", Format: "yyyy-mm-dd", Width: 12},
		{Name: "mean", Unit: Q, Format: workbook.FormatSig3},
		{Name: "min", Unit: Q, Format: workbook.FormatSig3},
		{Name: "max", Unit: Q, Format: workbook.FormatSig3},
		{Name: "max_time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "coverage", Format: "0.000"},
		{Name: "flags", Width: 28},
		{Name: "min_time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "readings", Format: "0"},
	})
	if err != nil {
		return err
	}
	for _, d := range res.Daily {
		var maxT, minT any
		if !d.MaxTime.IsZero() {
			maxT, minT = wallClock(d.MaxTime, res.Zone), wallClock(d.MinTime, res.Zone)
		}
		var flags any
		if d.Flags != 0 {
			flags = d.Flags.String()
		}
		if err := s.Row(wallClock(d.Date, res.Zone), d.Mean, d.Min, d.Max, maxT, d.Coverage, flags, minT, d.Readings); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeUnitSheet writes the unit values, row by row.
func writeUnitSheet(b *workbook.Book, res *record.Result) error {
	u := res.UnitSystem
	L, Q := u.Length(), u.Discharge()
	s, err := reportTable(b, SheetUnit, []workbook.Column{
		{Name: "time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "shift", Unit: L, Format: "0.000"},
		{Name: "effective_stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "flags", Width: 28},
		{Name: "rating_period", Format: "0"},
		{Name: "quality", Width: 12},
	})
	if err != nil {
		return err
	}
	vals := make([]any, 8)
	for v := range res.UnitRows() {
		vals = append(vals[:0], wallClock(time.Unix(v.Time, 0), res.Zone), v.Stage, v.Shift, v.Effective, v.Discharge, nil, nil, nil)
		if v.Flags != 0 {
			vals[5] = v.Flags.String()
		}
		if v.Period >= 0 {
			vals[6] = int(v.Period) + 1
		}
		if int(v.Quality) < len(res.Qualities) && res.Qualities[v.Quality] != "" {
			vals[7] = res.Qualities[v.Quality]
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// writeRatingsSheet writes every period's table, the period's start on
// its first row.
//
// A period's start is a date cell at the wall clock of zone z, its zone in
// the tz column after the others (see zoneCell), so that the instant is
// plain whatever zone the reader works in; the first period's open start
// is the text "the beginning", and a period without a rating one row
// without stage or discharge. The sheet states the periods used; it does
// not read back as a rating file (a rating reader wants a time on a
// valid_from column's first row, and a period's zero flow, highest
// gauging and extrapolation are in the summary only): the rating files
// the record read are its ratings.
func writeRatingsSheet(b *workbook.Book, ps []periodInfo, z *time.Location, u rating.Units) error {
	s, err := reportTable(b, SheetRatings, []workbook.Column{
		{Name: "period", Format: "0"},
		{Name: "valid_from", Format: workbook.FormatDateTime, Width: 17},
		{Name: "rating", Width: 30},
		{Name: "stage", Unit: u.Length(), Format: "0.000"},
		{Name: "discharge", Unit: u.Discharge(), Format: workbook.FormatSig3},
		{Name: survey.ColTimeZone, Width: 8},
	})
	if err != nil {
		return err
	}
	for i, p := range ps {
		var from, tz any = fromText(p.from, z), nil
		if !p.from.IsZero() {
			from, tz = wallClock(p.from, z), zoneCell(z)
		}
		if p.rating == nil {
			if err := s.Row(i+1, from, "none: no discharge", nil, nil, tz); err != nil {
				return err
			}
			continue
		}
		for k, r := range p.rating.Points {
			var f, name, zc any
			if k == 0 {
				f, name, zc = from, p.rating.Name, tz
			}
			if err := s.Row(i+1, f, name, r.Stage, r.Discharge, zc); err != nil {
				return err
			}
		}
	}
	return s.Flush()
}

// zoneCell is the time-zone cell of times written at the wall clock of
// zone z: "UTC" for no offset, else its offset as record.FormatOffset
// writes it ("+10:00"), both as survey.ParseZone reads them.
func zoneCell(z *time.Location) string {
	_, off := time.Unix(0, 0).In(z).Zone()
	if off == 0 {
		return "UTC"
	}
	return record.FormatOffset(time.Duration(off) * time.Second)
}

// writeShiftsSheet writes diagrams in the columns of a shift table, times
// as date cells at the wall clock of zone z, and the rating period and
// source of each, then the times' zone (a tz column, see zoneCell) so that
// the sheet reads back as the same diagrams whatever offset the reader is
// given.
func writeShiftsSheet(b *workbook.Book, name string, ss []shiftInfo, z *time.Location, u rating.Units) error {
	L := u.Length()
	names := survey.ShiftColumns()
	cols := []workbook.Column{
		{Name: names[0], Format: workbook.FormatDateTime, Width: 17},
		{Name: names[1], Unit: L, Format: "0.000"},
		{Name: names[2], Unit: L, Format: "0.000"},
		{Name: names[3], Unit: L, Format: "0.000"},
		{Name: names[4], Width: 9},
		{Name: "rating_period", Format: "0"},
		{Name: "source", Width: 24},
		{Name: survey.ColTimeZone, Width: 8},
	}
	s, err := reportTable(b, name, cols)
	if err != nil {
		return err
	}
	for _, d := range ss {
		for _, r := range d.Rows() {
			var taper, period any
			if r.HasTaper {
				taper = r.Taper
			}
			if d.period >= 0 {
				period = d.period + 1
			}
			if err := s.Row(wallClock(r.Time, z), r.Stage, r.Shift, taper, yes(r.Abrupt), period, r.Source, zoneCell(z)); err != nil {
				return err
			}
		}
	}
	return s.Flush()
}

// writeShiftGaugingsSheet writes each gauging against the ratings in
// force, with its shifts, in input order; with stages (a record's, one per
// gauging), its recorded stage, the difference and whether it is beyond
// the tolerance after them; last, the reason an excluded gauging is left
// out (its exclude text, as the CSV's exclude column; empty when kept).
func writeShiftGaugingsSheet(b *workbook.Book, c *gauged.ShiftCheck, z *time.Location, stages []record.GaugeStage) error {
	u := c.Units
	L, Q := u.Length(), u.Discharge()
	cols := []workbook.Column{
		{Name: "time", Format: workbook.FormatDateTime, Width: 17},
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge", Unit: Q, Format: workbook.FormatSig3},
		{Name: "quality", Width: 10},
		{Name: "note", Width: textWidth, Wrap: true},
		{Name: "rating_period", Format: "0"},
		{Name: "rated", Unit: Q, Format: workbook.FormatSig3},
		{Name: "departure", Unit: "%", Format: "0.0"},
		{Name: "outside_band"},
		{Name: "shift", Unit: L, Format: "0.000"},
		{Name: "applied_shift", Unit: L, Format: "0.000"},
		{Name: "residual_shift", Unit: L, Format: "0.000"},
		{Name: "shifted", Unit: Q, Format: workbook.FormatSig3},
		{Name: "shifted_departure", Unit: "%", Format: "0.0"},
		{Name: "outside_band_shifted"},
		{Name: "visit", Format: "0"},
		{Name: "source", Width: textWidth, Wrap: true},
		{Name: "flags", Width: 12},
	}
	if stages != nil {
		cols = append(cols, workbook.Column{Name: "recorded_stage", Unit: L, Format: "0.000"},
			workbook.Column{Name: "stage_difference", Unit: L, Format: "0.000"},
			workbook.Column{Name: "beyond_stage_tolerance"})
	}
	cols = append(cols, workbook.Column{Name: "exclude", Width: textWidth, Wrap: true})
	s, err := reportTable(b, SheetGaugings, cols)
	if err != nil {
		return err
	}
	visit := visitOf(c)
	for i, g := range c.Gaugings {
		var period any
		if g.Period >= 0 {
			period = g.Period + 1
		}
		row := []any{wallClock(g.Time, z), g.Stage, g.Discharge, g.Quality.String(), g.Note, period, g.Rated, g.Departure, yes(g.Outside),
			g.Shift, g.Applied, g.Residual, g.Shifted, g.ShiftedDeparture, yes(g.OutsideShifted), visit[i] + 1, g.Source, gaugingFlags(g).String()}
		if i < len(stages) {
			row = append(row, stages[i].Recorded, stages[i].Difference, yes(stages[i].Beyond))
		} else if stages != nil {
			row = append(row, nil, nil, nil)
		}
		row = append(row, excludeReason(g))
		if err := s.Row(row...); err != nil {
			return err
		}
	}
	return s.Flush()
}

// visitOf returns the 0-based visit of every gauging.
func visitOf(c *gauged.ShiftCheck) []int {
	out := make([]int, len(c.Gaugings))
	for k, v := range c.Visits {
		for _, i := range v.Gaugings {
			out[i] = k
		}
	}
	return out
}
