package results

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
)

// RecordTables chooses the tables of a discharge-record report.
type RecordTables uint8

// Tables of a discharge record. The zero value means DailyTable in CSV
// and text and both tables in JSON and workbooks (see DefaultTables).
const (
	// UnitTable is the unit values, one row per reading.
	UnitTable RecordTables = 1 << iota
	// DailyTable is the daily values, one row per calendar day.
	DailyTable
)

// ErrOneTable is returned by WriteRecordCSV when asked for both tables: a
// CSV file holds one.
var ErrOneTable = errors.New("a CSV file holds one table: choose the unit or the daily values")

// DefaultTables resolves the zero choice of tables for a format ("text",
// "csv", "json" or "xlsx"): the daily values in text and CSV, both tables
// in JSON and workbooks. A non-zero choice is returned as it is.
func DefaultTables(t RecordTables, format string) RecordTables {
	if t != 0 {
		return t
	}
	switch format {
	case "json", "xlsx":
		return UnitTable | DailyTable
	}
	return DailyTable
}

// RecordUnitColumns returns the columns of the unit values as CSV, in
// order. They are a contract with scripts; add columns after them.
func RecordUnitColumns() []string {
	return []string{"time", "stage", "shift", "effective_stage", "discharge", "flags", "rating_period", "quality"}
}

// RecordDailyColumns returns the columns of the daily values as CSV, in
// order. They are a contract with scripts; add columns after them.
func RecordDailyColumns() []string {
	return []string{"date", "mean", "min", "max", "max_time", "coverage", "flags", "min_time", "readings"}
}

// recordInfo lays out a record's periods and diagrams for the history
// writers.
func recordInfo(res *record.Result) ([]periodInfo, []shiftInfo) {
	ps := make([]periodInfo, len(res.Periods))
	for i, p := range res.Periods {
		ps[i] = periodInfo{from: p.From, to: p.To, rating: p.Rating, readings: p.Readings}
	}
	ss := make([]shiftInfo, len(res.Shifts))
	for i, d := range res.Shifts {
		ss[i] = shiftInfo{ShiftDiagram: d.ShiftDiagram, period: d.Period}
	}
	return ps, ss
}

// rowWriter appends the cells of one row into a buffer it reuses, so that
// a record of a million readings is written without a string per cell.
type rowWriter struct {
	w     *bufio.Writer
	b     []byte   // the row
	cell  []byte   // one cell, for padding
	words []string // record.FlagWords()
	// qualities holds the record's quality words as JSON values ("null"
	// for a blank one), by index, made once for the unit rows.
	qualities [][]byte
}

func newRowWriter(w io.Writer) *rowWriter {
	return &rowWriter{w: bufio.NewWriterSize(w, 1<<16), b: make([]byte, 0, 256), cell: make([]byte, 0, 64), words: record.FlagWords()}
}

// appendFloat6 appends v as FormatFloat writes it: six significant
// digits, nothing when undefined.
func appendFloat6(b []byte, v float64) []byte {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return b
	}
	if v == 0 {
		return append(b, '0')
	}
	return strconv.AppendFloat(b, v, 'g', 6, 64)
}

// appendLength appends v as FormatLength writes it: LengthDecimals
// decimals, trailing zeros dropped, nothing when undefined.
func appendLength(b []byte, v float64) []byte {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return b
	}
	if math.Abs(v) >= 1e12 {
		return appendFloat6(b, v)
	}
	start := len(b)
	b = strconv.AppendFloat(b, v, 'f', LengthDecimals, 64)
	for b[len(b)-1] == '0' {
		b = b[:len(b)-1]
	}
	if b[len(b)-1] == '.' {
		b = b[:len(b)-1]
	}
	if string(b[start:]) == "-0" {
		b = append(b[:start], '0')
	}
	return b
}

// appendFlags appends the words of f separated by sep.
func (rw *rowWriter) appendFlags(b []byte, f record.Flag, sep string, quote bool) []byte {
	first := true
	for i, w := range rw.words {
		if f&(1<<i) == 0 {
			continue
		}
		if !first {
			b = append(b, sep...)
		}
		first = false
		if quote {
			b = append(b, '"')
		}
		b = append(b, w...)
		if quote {
			b = append(b, '"')
		}
	}
	return b
}

// appendCSVText appends a text cell, quoted when it needs it.
func appendCSVText(b []byte, s string) []byte {
	return append(b, fitCSVText(s)...)
}

// appendTime appends Unix seconds in zone z (RecordTimeLayout).
func appendTime(b []byte, sec int64, z *time.Location) []byte {
	return time.Unix(sec, 0).In(z).AppendFormat(b, RecordTimeLayout)
}

// WriteRecordCSV writes one table of a record: the unit values
// (RecordUnitColumns()) or the daily values (RecordDailyColumns()). Times
// are ISO 8601 with the record's offset, flags are words separated by
// spaces, the rating period is 1-based; undefined values are empty cells.
// Rows are written one at a time from the record's arrays, so memory does
// not grow with the record. Asking for both tables is ErrOneTable. The CSV
// has no comment lines: the ratings, diagrams, warnings and caution are
// stated by the other formats and the console summary.
func WriteRecordCSV(w io.Writer, res *record.Result, tables RecordTables) error {
	tables = DefaultTables(tables, "csv")
	if tables == UnitTable|DailyTable {
		return ErrOneTable
	}
	rw := newRowWriter(w)
	if tables == UnitTable {
		writeRecord(rw.w, RecordUnitColumns())
		for u := range res.UnitRows() {
			if err := rw.unitCSV(res, u); err != nil {
				return err
			}
		}
		return rw.w.Flush()
	}
	writeRecord(rw.w, RecordDailyColumns())
	for _, d := range res.Daily {
		if err := rw.dailyCSV(d, res.Zone); err != nil {
			return err
		}
	}
	return rw.w.Flush()
}

// unitCSV writes unit value u of res as a CSV row.
func (rw *rowWriter) unitCSV(res *record.Result, u record.UnitValue) error {
	b := appendTime(rw.b[:0], u.Time, res.Zone)
	b = append(b, ',')
	b = appendLength(b, u.Stage)
	b = append(b, ',')
	b = appendLength(b, u.Shift)
	b = append(b, ',')
	b = appendLength(b, u.Effective)
	b = append(b, ',')
	b = appendFloat6(b, u.Discharge)
	b = append(b, ',')
	b = rw.appendFlags(b, u.Flags, " ", false)
	b = append(b, ',')
	if u.Period >= 0 {
		b = strconv.AppendInt(b, int64(u.Period)+1, 10)
	}
	b = append(b, ',')
	if int(u.Quality) < len(res.Qualities) {
		b = appendCSVText(b, res.Qualities[u.Quality])
	}
	b = append(b, '\n')
	rw.b = b
	_, err := rw.w.Write(b)
	return err
}

// dailyCSV writes a daily value as a CSV row.
func (rw *rowWriter) dailyCSV(d record.DailyValue, z *time.Location) error {
	b := d.Date.In(z).AppendFormat(rw.b[:0], RecordDateLayout)
	b = append(b, ',')
	b = appendFloat6(b, d.Mean)
	b = append(b, ',')
	b = appendFloat6(b, d.Min)
	b = append(b, ',')
	b = appendFloat6(b, d.Max)
	b = append(b, ',')
	if !d.MaxTime.IsZero() {
		b = d.MaxTime.In(z).AppendFormat(b, RecordTimeLayout)
	}
	b = append(b, ',')
	b = appendFloat6(b, d.Coverage)
	b = append(b, ',')
	b = rw.appendFlags(b, d.Flags, " ", false)
	b = append(b, ',')
	if !d.MinTime.IsZero() {
		b = d.MinTime.In(z).AppendFormat(b, RecordTimeLayout)
	}
	b = append(b, ',')
	b = strconv.AppendInt(b, int64(d.Readings), 10)
	b = append(b, '\n')
	rw.b = b
	_, err := rw.w.Write(b)
	return err
}

// WriteRecordJSON writes a record as one JSON object whose keys are, in
// order,
//
//	{"unit": [{"time", "stage", "shift", "effective_stage", "discharge", "flags", "rating_period", "quality"}],
//	 "daily": [{"date", "mean", "min", "max", "max_time", "coverage", "flags", "min_time", "readings"}],
//	 "ratings", "shifts", "warnings", "caution", "site", "units", "input_notes"}
//
// unit or daily is null when the table was not asked for; input_notes,
// the notes of the inputs (a rating table naming no unit, read as the
// units decided), is left out when there are none. Times are ISO
// 8601 with the record's offset and flags lists of words; undefined values
// are null. ratings lists the rating periods used (period, from, to — null
// at an open end —, rating, zero_flow, highest_gauging, extrapolate,
// readings, table, zero_flow_source) and shifts the diagrams (time, rating_period, abrupt,
// taper, points, source). caution is the project's caution and the note
// that a computed record is provisional; site is null when nothing is
// known of it; units names the unit system and its units (as shifts and
// fit give them; nothing is converted). Unit and daily rows are written
// one at a time, so memory does not grow with the record; stages and
// shifts have LengthDecimals decimals, discharges six significant digits.
func WriteRecordJSON(w io.Writer, res *record.Result, tables RecordTables) error {
	tables = DefaultTables(tables, "json")
	rw := newRowWriter(w)
	for _, q := range res.Qualities {
		v := []byte("null")
		if q != "" {
			var err error
			if v, err = json.Marshal(q); err != nil {
				return err
			}
		}
		rw.qualities = append(rw.qualities, v)
	}
	rw.w.WriteString("{\n  \"unit\": ")
	if tables&UnitTable == 0 {
		rw.w.WriteString("null")
	} else {
		rw.w.WriteString("[")
		first := true
		for u := range res.UnitRows() {
			if err := rw.unitJSON(res, u, first); err != nil {
				return err
			}
			first = false
		}
		rw.w.WriteString(listEnd(res.UnitRowCount()))
	}
	rw.w.WriteString(",\n  \"daily\": ")
	if tables&DailyTable == 0 {
		rw.w.WriteString("null")
	} else {
		rw.w.WriteString("[")
		for i, d := range res.Daily {
			if err := rw.dailyJSON(d, res.Zone, i == 0); err != nil {
				return err
			}
		}
		rw.w.WriteString(listEnd(len(res.Daily)))
	}
	ps, ss := recordInfo(res)
	tail := []tailItem{
		{"ratings", jsonPeriods(ps, res.Zone)},
		{"shifts", jsonShifts(ss, res.Zone)},
		{"warnings", nonNil(res.Warnings)},
		{"caution", recordCaution(record.ProvisionalNote)},
		{"site", siteJSON(res.Provenance.Site)},
		{"units", UnitNames(res.UnitSystem)},
	}
	if len(res.Provenance.Notes) > 0 {
		tail = append(tail, tailItem{"input_notes", res.Provenance.Notes})
	}
	return writeJSONTail(rw.w, tail)
}

// listEnd closes a list written row by row.
func listEnd(n int) string {
	if n == 0 {
		return "]"
	}
	return "\n  ]"
}

// tailItem is a key of a JSON object written after its streamed lists.
type tailItem struct {
	key   string
	value any
}

// writeJSONTail writes the remaining keys of an object whose first keys
// were streamed, indented as writeJSON indents, and closes it.
func writeJSONTail(bw *bufio.Writer, items []tailItem) error {
	for _, it := range items {
		v, err := json.MarshalIndent(it.value, "  ", "  ")
		if err != nil {
			return err
		}
		fmt.Fprintf(bw, ",\n  %q: %s", it.key, v)
	}
	bw.WriteString("\n}\n")
	return bw.Flush()
}

// appendJSONNumber appends a number cell's text, or null when it has none.
func appendJSONNumber(b []byte, start int) []byte {
	if len(b) == start {
		return append(b, "null"...)
	}
	return b
}

// unitJSON writes unit value u of res as a JSON object on a line of its
// own, first of the list or after a comma.
func (rw *rowWriter) unitJSON(res *record.Result, u record.UnitValue, first bool) error {
	b := rw.b[:0]
	if !first {
		b = append(b, ',')
	}
	b = append(b, "\n    {\"time\": \""...)
	b = appendTime(b, u.Time, res.Zone)
	b = append(b, "\", \"stage\": "...)
	b = appendJSONNumber(appendLength(b, u.Stage), len(b))
	b = append(b, ", \"shift\": "...)
	b = appendJSONNumber(appendLength(b, u.Shift), len(b))
	b = append(b, ", \"effective_stage\": "...)
	b = appendJSONNumber(appendLength(b, u.Effective), len(b))
	b = append(b, ", \"discharge\": "...)
	b = appendJSONNumber(appendFloat6(b, u.Discharge), len(b))
	b = append(b, ", \"flags\": ["...)
	b = rw.appendFlags(b, u.Flags, ", ", true)
	b = append(b, "], \"rating_period\": "...)
	if u.Period >= 0 {
		b = strconv.AppendInt(b, int64(u.Period)+1, 10)
	} else {
		b = append(b, "null"...)
	}
	b = append(b, ", \"quality\": "...)
	if int(u.Quality) < len(rw.qualities) {
		b = append(b, rw.qualities[u.Quality]...)
	} else {
		b = append(b, "null"...)
	}
	b = append(b, '}')
	rw.b = b
	_, err := rw.w.Write(b)
	return err
}

// appendJSONTime appends t in zone z as a JSON string in
// RecordTimeLayout, or null for the zero time (none).
func appendJSONTime(b []byte, t time.Time, z *time.Location) []byte {
	if t.IsZero() {
		return append(b, "null"...)
	}
	b = append(b, '"')
	b = t.In(z).AppendFormat(b, RecordTimeLayout)
	return append(b, '"')
}

// dailyJSON writes a daily value as a JSON object on a line of its own.
func (rw *rowWriter) dailyJSON(d record.DailyValue, z *time.Location, first bool) error {
	b := rw.b[:0]
	if !first {
		b = append(b, ',')
	}
	b = append(b, "\n    {\"date\": \""...)
	b = d.Date.In(z).AppendFormat(b, RecordDateLayout)
	b = append(b, "\", \"mean\": "...)
	b = appendJSONNumber(appendFloat6(b, d.Mean), len(b))
	b = append(b, ", \"min\": "...)
	b = appendJSONNumber(appendFloat6(b, d.Min), len(b))
	b = append(b, ", \"max\": "...)
	b = appendJSONNumber(appendFloat6(b, d.Max), len(b))
	b = append(b, ", \"max_time\": "...)
	b = appendJSONTime(b, d.MaxTime, z)
	b = append(b, ", \"coverage\": "...)
	b = appendJSONNumber(appendFloat6(b, d.Coverage), len(b))
	b = append(b, ", \"flags\": ["...)
	b = rw.appendFlags(b, d.Flags, ", ", true)
	b = append(b, "], \"min_time\": "...)
	b = appendJSONTime(b, d.MinTime, z)
	b = append(b, ", \"readings\": "...)
	b = strconv.AppendInt(b, int64(d.Readings), 10)
	b = append(b, '}')
	rw.b = b
	_, err := rw.w.Write(b)
	return err
}

// WriteRecordText writes a record for reading: what it was computed from
// (the stage record, the rating periods and shift diagrams used, the
// maximum gap, the zone of its days), how many readings carry each flag,
// the gaugings against the record when there are any, the tables asked
// for (the daily values by default), the warnings, the caution and the
// note that a computed record is provisional until reviewed.
func WriteRecordText(w io.Writer, res *record.Result, tables RecordTables) error {
	tables = DefaultTables(tables, "text")
	rw := newRowWriter(w)
	bw := rw.w
	writeRecordHead(bw, res)
	if c := res.Gaugings; c != nil {
		writeRecordGaugingsText(bw, res, c)
	}
	if tables&DailyTable != 0 {
		writeDailyText(rw, res)
	}
	if tables&UnitTable != 0 {
		if err := writeUnitText(rw, res); err != nil {
			return err
		}
	}
	writeTextEnd(bw, res.Warnings)
	fmt.Fprintf(bw, "provisional: %s\n", record.ProvisionalNote)
	return bw.Flush()
}

// writeRecordHead writes what the record is and what it was computed from.
func writeRecordHead(bw *bufio.Writer, res *record.Result) {
	u := res.UnitSystem
	n := len(res.Units)
	fmt.Fprintf(bw, "Discharge record from %s: %s", res.Name, rating.Counted(n, "reading", "readings"))
	if n > 0 {
		fmt.Fprintf(bw, " from %s to %s", time.Unix(res.Units[0].Time, 0).In(res.Zone).Format(RecordTimeLayout),
			time.Unix(res.Units[n-1].Time, 0).In(res.Zone).Format(RecordTimeLayout))
	}
	if k := len(res.Missing); k > 0 {
		fmt.Fprintf(bw, " and %s (flagged missing)", rating.Counted(k, "missing reading", "missing readings"))
	}
	fmt.Fprintf(bw, "\nUnits: %s (gauge heights and shifts in %s, discharge in %s); days taken in %s; gaps longer than %s are not bridged\n",
		u, u.Length(), u.Discharge(), zoneName(res.Zone), record.FormatDuration(res.MaxGap))
	bw.WriteString(siteLine(res.Provenance))
	if len(res.Provenance.Inputs) > 0 {
		fmt.Fprintf(bw, "Read from: %s; computed by %s\n", joinInputs(res.Provenance.Inputs), programName(res.Provenance))
	}
	ps, ss := recordInfo(res)
	writeHistoryText(bw, ps, ss, res.Zone, u)
	counts := make([]int, len(record.FlagWords()))
	for v := range res.UnitRows() {
		for b := range counts {
			if v.Flags&(1<<b) != 0 {
				counts[b]++
			}
		}
	}
	fmt.Fprintf(bw, "\nFlags of the unit values (readings):")
	flagged := false
	for b, k := range counts {
		if k > 0 {
			fmt.Fprintf(bw, " %s %d;", record.FlagWords()[b], k)
			flagged = true
		}
	}
	if !flagged {
		fmt.Fprint(bw, " none")
	}
	fmt.Fprintln(bw)
}

// joinInputs lists the files read.
func joinInputs(in []string) string {
	s := ""
	for i, x := range in {
		if i > 0 {
			s += ", "
		}
		s += x
	}
	return s
}

// writeRecordGaugingsText writes the gaugings set against the computed
// record (the shifted rating at their times) and their gauge heights
// against the recorded stage.
func writeRecordGaugingsText(bw *bufio.Writer, res *record.Result, c *gauged.ShiftCheck) {
	L := res.UnitSystem.Length()
	tol := strconv.FormatFloat(res.StageTolerance, 'g', -1, 64) + " " + L
	fmt.Fprintf(bw, "\nGaugings against the record (record = the rating in force with the shift applied; departure = 100·(measured − record)/record; * outside the gauging's band, its uncertainty or else its quality's; x excluded;"+
		" recorded = the record's stage at the gauging's time, linear between the readings either side, - in a gap not bridged; difference = stage − recorded, ! beyond ±%s):\n", tol)
	fmt.Fprintf(bw, "  %-25s %8s %10s %-9s %10s %8s %10s %9s %10s\n", "time", "stage", "discharge", "quality", "record", "dep. %", "shift used", "recorded", "difference")
	out, beyond := 0, 0
	for i, g := range c.Gaugings {
		rec, diff, mark := math.NaN(), math.NaN(), " "
		if i < len(res.GaugeStages) {
			s := res.GaugeStages[i]
			rec, diff = s.Recorded, s.Difference
			if s.Beyond {
				mark = "!"
				beyond++
			}
		}
		line := fmt.Sprintf("  %-25s %8s %10s %-9s %10s %7s%s %10s %9s %9s%s", g.Time.In(res.Zone).Format(RecordTimeLayout), fixed(g.Stage, 3),
			sig(g.Discharge, 4), g.Quality, sig(g.Shifted, 4), fixed(g.ShiftedDeparture, 1), excludedStar(g), fixed(g.Applied, 3),
			fixed(rec, 3), fixed(diff, 3), mark)
		bw.WriteString(strings.TrimRight(line, " ") + "\n")
		if g.OutsideShifted {
			out++
		}
	}
	excluded := ""
	if n := excludedCount(c); n > 0 {
		excluded = fmt.Sprintf(" (%d excluded)", n)
	}
	band := rating.Agree(out, "its quality band", "their quality bands")
	if len(c.Gaugings) == 1 {
		band = "its quality band"
	}
	fmt.Fprintf(bw, "  %s outside %s from the record\n", partOf(out, len(c.Gaugings), "gauging", "gaugings", excluded, "lies", "lie"), band)
	for _, g := range c.Gaugings {
		if g.Excluded {
			fmt.Fprintf(bw, "  excluded, never counted outside its band: %s, %s%s\n", g.Time.In(res.Zone).Format(RecordTimeLayout), excludeReason(g), sourceNote(g.Source))
		}
	}
	fmt.Fprintf(bw, "  %s from the recorded stage by more than %s\n", partOf(beyond, len(c.Gaugings), "gauge height", "gauge heights", "", "differs", "differ"), tol)
}

// partOf words k of n things (one, many) doing something (verb agreeing
// with one or many, many the plain form), with note after the count:
// "2 of 5 gaugings lie", "1 of 5 gaugings lies", and of a single thing
// "the 1 gauging lies" or "the 1 gauging does not lie".
func partOf(k, n int, one, many, note, verbOne, verbMany string) string {
	if n == 1 {
		if k == 1 {
			return "the 1 " + one + note + " " + verbOne
		}
		return "the 1 " + one + note + " does not " + verbMany
	}
	return fmt.Sprintf("%d of %s%s %s", k, rating.Counted(n, one, many), note, rating.Agree(k, verbOne, verbMany))
}

// excludedStar marks a gauging's departure: x excluded (by its exclude
// column, never counted outside its band), * outside its band.
func excludedStar(g gauged.GaugingShift) string {
	if g.Excluded {
		return "x"
	}
	return fitStar(g.OutsideShifted)
}

// writeDailyText writes the daily values as aligned columns.
func writeDailyText(rw *rowWriter, res *record.Result) {
	bw := rw.w
	Q := res.UnitSystem.Discharge()
	fmt.Fprintf(bw, "\nDaily values (discharge in %s: time-weighted mean of the unit values by the trapezoidal rule, least and greatest of the readings, of the discharge at a bridged midnight and on either side of a rating break between readings; coverage = fraction of the day bridged):\n", Q)
	fmt.Fprintf(bw, "  %-10s %10s %10s %10s %-25s %8s  %s\n", "date", "mean", "min", "max", "max time", "coverage", "flags")
	for _, d := range res.Daily {
		mt := "-"
		if !d.MaxTime.IsZero() {
			mt = d.MaxTime.In(res.Zone).Format(RecordTimeLayout)
		}
		line := fmt.Sprintf("  %-10s %10s %10s %10s %-25s %8s  %s", d.Date.In(res.Zone).Format(RecordDateLayout),
			sig(d.Mean, 4), sig(d.Min, 4), sig(d.Max, 4), mt, fixed(d.Coverage, 3), d.Flags)
		bw.WriteString(strings.TrimRight(line, " ") + "\n")
	}
}

// writeUnitText writes the unit values as aligned columns, row by row.
func writeUnitText(rw *rowWriter, res *record.Result) error {
	bw := rw.w
	u := res.UnitSystem
	fmt.Fprintf(bw, "\nUnit values (gauge height, shift and effective gauge height in %s, discharge in %s):\n", u.Length(), u.Discharge())
	fmt.Fprintf(bw, "  %-25s %9s %8s %9s %11s %6s  %s\n", "time", "stage", "shift", "effective", "discharge", "period", "flags")
	for v := range res.UnitRows() {
		b := append(rw.b[:0], "  "...)
		c := rw.cell
		c = appendTime(c[:0], v.Time, res.Zone)
		b = appendPadded(b, c, 25, false)
		b = append(b, ' ')
		c = appendLength(c[:0], v.Stage)
		b = appendPadded(b, c, 9, true)
		b = append(b, ' ')
		c = appendLength(c[:0], v.Shift)
		b = appendPadded(b, c, 8, true)
		b = append(b, ' ')
		c = appendLength(c[:0], v.Effective)
		b = appendPadded(b, c, 9, true)
		b = append(b, ' ')
		c = appendFloat6(c[:0], v.Discharge)
		b = appendPadded(b, c, 11, true)
		b = append(b, ' ')
		c = c[:0]
		if v.Period >= 0 {
			c = strconv.AppendInt(c, int64(v.Period)+1, 10)
		}
		b = appendPadded(b, c, 6, true)
		if v.Flags != 0 {
			b = append(b, "  "...)
			b = rw.appendFlags(b, v.Flags, " ", false)
		}
		b = append(b, '\n')
		rw.b, rw.cell = b, c
		if _, err := bw.Write(b); err != nil {
			return err
		}
	}
	return nil
}

// appendPadded appends cell padded to width (right-aligned when right),
// "-" for an empty cell.
func appendPadded(b, cell []byte, width int, right bool) []byte {
	n := max(len(cell), 1)
	if right {
		for pad := width - n; pad > 0; pad-- {
			b = append(b, ' ')
		}
	}
	if len(cell) == 0 {
		b = append(b, '-')
	}
	b = append(b, cell...)
	if !right {
		for pad := width - n; pad > 0; pad-- {
			b = append(b, ' ')
		}
	}
	return b
}

// WriteRecordSummary says that a record was written to path: its
// readings and days, the periods and diagrams used, its flags, the
// warnings, the caution and the provisional note.
func WriteRecordSummary(w io.Writer, res *record.Result, path string) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "wrote %s: %s, %s, %s, %s\n",
		path, rating.Counted(len(res.Units), "reading", "readings"), rating.Counted(len(res.Daily), "day", "days"),
		rating.Counted(len(res.Periods), "rating period", "rating periods"), rating.Counted(len(res.Shifts), "shift diagram", "shift diagrams"))
	peak := record.DailyValue{Max: math.NaN()}
	for _, d := range res.Daily {
		if !math.IsNaN(d.Max) && (math.IsNaN(peak.Max) || d.Max > peak.Max) {
			peak = d
		}
	}
	if !math.IsNaN(peak.Max) {
		fmt.Fprintf(bw, "  greatest unit discharge %s %s at %s", sig(peak.Max, 4), res.UnitSystem.Discharge(), peak.MaxTime.In(res.Zone).Format(RecordTimeLayout))
		writeUnratedCrest(bw, res)
		fmt.Fprintln(bw)
	}
	fmt.Fprintln(bw, "provisional: "+record.ProvisionalNote)
	return endSummary(bw, res.Warnings)
}

// writeUnratedCrest ends the summary's line of the greatest unit discharge
// when the record's highest stage lies above its rating table, with no
// discharge: the greatest discharge is then not the peak, and a second
// line names the highest stage, its time and the readings above the table.
func writeUnratedCrest(bw *bufio.Writer, res *record.Result) {
	above := res.AboveTable
	if above.Readings == 0 {
		return
	}
	for _, u := range res.Units {
		if u.Stage > above.HighestStage {
			return // a higher stage has a discharge
		}
	}
	fmt.Fprintf(bw, ", not the peak:\n  the highest stage, %s %s at %s, ", appendLength(nil, above.HighestStage), res.UnitSystem.Length(),
		time.Unix(above.HighestAt, 0).In(res.Zone).Format(RecordTimeLayout))
	if above.Readings == 1 {
		bw.WriteString("lies above the rating table, with no discharge (--extrapolate rates it)")
		return
	}
	fmt.Fprintf(bw, "is one of %d readings above the rating table, with no discharge (--extrapolate rates them)", above.Readings)
}
