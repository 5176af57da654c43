package survey

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/record"
)

// Column names of a stage record (matched as table columns are; a unit in
// brackets is allowed).
const (
	ColRecordTime    = "time"
	ColRecordStage   = "stage"
	ColRecordQuality = "quality"
)

// StageRecordOptions configure the reading of a stage record. The zero
// value reads the first visible sheet of a workbook and takes times written
// without an offset as UTC.
type StageRecordOptions struct {
	// Sheet is the workbook sheet to read ("" = the first).
	Sheet string
	// UTCOffset is the offset of times written without one (east
	// positive; default 0, UTC; whole seconds within record.MaxUTCOffset).
	// Workbook date serials are read as times at this offset.
	UTCOffset time.Duration
}

// StageRecord is a stage record read from a file.
type StageRecord struct {
	// Stages holds the readings in compact arrays.
	Stages record.Stages
	// File and Sheet say where the record came from.
	File, Sheet string
	// Blank is the number of rows with a time but no stage (read as
	// missing readings, whose times are Stages.Missing).
	Blank int
	// Units is what the stage header says of the unit system
	// ("stage (ft)"); nothing is converted.
	Units UnitNote
	// Site is the site metadata read above the header ("# site: ..." lines
	// of CSV, key rows of a sheet; see MetaKeys).
	Site rating.Site
	// Warnings are unusual but legal facts about the data.
	Warnings []string
	// Times says how the record writes its times.
	Times TimeForm
}

// TimeForm says how a file writes its times.
type TimeForm struct {
	// Offsets reports times written with a UTC offset of their own
	// (false for times without one and for workbook date cells).
	Offsets bool
	// First is the offset of the first time (east positive): the one
	// written with it, else the offset times without one are read at.
	First time.Duration
}

// OffsetsDiffer returns the warning for a stage record and gaugings of
// which one writes its times with a UTC offset and the other without, both
// read without an offset chosen for times written without one (read as
// UTC); "" when they agree. A clock difference between the two shows as a
// gauge-height difference at every gauging, which a reader would take for
// a fault of the gauge or the logger.
func OffsetsDiffer(sr *StageRecord, gs Gaugings) string {
	if sr.Times.Offsets == gs.Times.Offsets {
		return ""
	}
	with, without, off := gs.File, sr.File, gs.Times.First
	if sr.Times.Offsets {
		with, without, off = sr.File, gs.File, sr.Times.First
	}
	first, give := "in UTC", "their offset from UTC, as --utc-offset ±HH:MM"
	if off != 0 {
		o := record.FormatOffset(off)
		first, give = o, "--utc-offset (such as --utc-offset "+o+")"
	}
	return fmt.Sprintf("%s writes its times with a UTC offset (the first %s) and %s without one, read as UTC: "+
		"if those are local times, give %s; a clock difference between the two files shows as a gauge-height difference at every gauging",
		with, first, without, give)
}

// Causes of stage-record errors, for errors.Is.
var (
	ErrTooManyQualities = errors.New("more than 65535 different quality words")
	ErrBlankTime        = errors.New("time is blank")
)

// recordBytesPerRow is a guess at the bytes of one CSV row of a stage
// record, to size the arrays before reading.
const recordBytesPerRow = 24

// ReadStageRecord reads a stage record from a CSV file, streaming it row
// by row, or from a workbook sheet (by extension). See ParseStageRecord.
func ReadStageRecord(path string, opt StageRecordOptions) (*StageRecord, error) {
	if IsWorkbook(path) {
		return readStageWorkbook(path, opt)
	}
	if opt.Sheet != "" {
		return nil, &ParseError{File: path, Err: errors.New("a sheet can be named only for a workbook (.xlsx)")}
	}
	f, n, err := openInput(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return parseStageCSV(f, path, opt, int(max(n, 0)/recordBytesPerRow))
}

// ParseStageRecord reads a stage record from CSV text, row by row into
// compact arrays (a million rows are never held as text); name is used in
// messages. The header needs a time and a stage (or gauge_height) column;
// a quality column is optional and other columns are ignored.
//
// Times are ISO 8601 (see ParseISOTime), all with an offset or all
// without; a time-zone column (TimeZoneColumns) gives each row's time its
// offset (see zonedTime). Every bad cell is reported with its position (file:row:column),
// at most MaxReported of them: an unreadable time or stage, a year outside
// MinYear to MaxYear (ErrYear), a time whose offset, or lack of one,
// differs from the first time's (ErrMixedOffsets), a stage beyond
// ±MaxElevation (ErrImplausible), a time that repeats or goes back (naming
// the row before), a value after the header's last named column
// (ErrBeyondHeader), a CSV row with more fields than a header line ending
// in a named column (ErrSpilledRow); a first time of day alone beside a
// date column, said once (ErrDateApart). A quality column right after the
// stage holding a bare digit string after a whole stage on most rows (1,05
// split by an unquoted decimal comma?) is warned of (see
// stageBuilder.splitWarning). A header naming a column twice is refused
// (ErrDuplicateColumn), and so is one with both stage and gauge_height
// (ErrAliasColumns). Text that is not UTF-8 is refused at the line and
// field of the first byte that is not (ErrNotUTF8), as ParseCSV refuses
// it. A row with a time and a blank stage is a missing reading: its time
// is kept in Stages.Missing (its quality in Stages.MissingQuality) and
// counted in Blank. Times written without an offset that jump
// ahead one hour more than the record's interval, as a clock set forward
// for daylight saving does early on a Sunday, are warned of (see
// clockAhead).
func ParseStageRecord(r io.Reader, name string, opt StageRecordOptions) (*StageRecord, error) {
	return parseStageCSV(r, name, opt, 0)
}

func parseStageCSV(r io.Reader, name string, opt StageRecordOptions, sizeHint int) (*StageRecord, error) {
	b, err := newStageBuilder(name, "", opt, false, false)
	if err != nil {
		return nil, err
	}
	cs := newCSVStream(r, name)
	b.quoted = cs.fieldQuoted
	for {
		fields, line, err := cs.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		if b.header == nil {
			h := make([]string, len(fields))
			for i, f := range fields {
				h[i] = string(f)
			}
			if len(h) == 1 && strings.Contains(h[0], ";") {
				return nil, &ParseError{File: name, Row: line, Err: ErrSemicolon}
			}
			if m, extra, ok := siteRow(cs.meta, h, false, false); ok { // a site block's key row saved as CSV
				cs.meta = m
				if len(extra) > 0 {
					b.out.Warnings = append(b.out.Warnings, siteExtrasWarning(name, fieldNames(line, extra)))
				}
				continue
			}
			if err := b.setHeader(h, line, sizeHint); err != nil {
				return nil, err
			}
			cs.header = h
			continue
		}
		if b.row(fields, line); b.full() {
			break
		}
	}
	b.out.Site = siteOf(cs.meta)
	return b.finish()
}

// readStageWorkbook streams a stage record from a workbook sheet.
func readStageWorkbook(path string, opt StageRecordOptions) (*StageRecord, error) {
	f, err := openWorkbook(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	sheet, warnings, err := chooseSheet(f, path, opt.Sheet)
	if err != nil {
		return nil, err
	}
	unsaved := f.scans.done[sheet].unsaved
	b, err := newStageBuilder(path, sheet, opt, true, f.date1904)
	if err != nil {
		return nil, err
	}
	b.out.Warnings = append(b.out.Warnings, warnings...)
	var fields [][]byte
	meta, rowWarnings, err := f.sheetRows(path, sheet, nil, func(n int, rec []string, header bool) (bool, error) {
		if header {
			if err := b.setHeader(trimAll(rec), n, 0); err != nil {
				return false, err
			}
			// A formula with no saved value is refused in the header,
			// above it and in the columns read, as sheetTable and
			// Table.unsavedIn refuse it.
			if err := unsavedError(path, sheet, nil, unsaved, 1, int64(n), nil, "in the header and above it"); err != nil {
				return false, err
			}
			return false, unsavedError(path, sheet, b.header, unsaved, int64(n)+1, MaxSheetRows, []int{b.ct, b.cs, b.cq, b.cz}, "in the columns read")
		}
		fields = fields[:0]
		for _, c := range rec {
			fields = append(fields, []byte(strings.TrimSpace(c)))
		}
		b.row(fields, n)
		return b.full(), nil
	})
	if err != nil {
		return nil, err
	}
	b.out.Warnings = append(b.out.Warnings, rowWarnings...)
	b.out.Site = siteOf(meta)
	return b.finish()
}

// stageBuilder turns the rows of a stage record into compact arrays.
type stageBuilder struct {
	file, sheet          string
	inWorkbook, date1904 bool
	off                  int64
	header               []string
	headerRow            int
	width                int // columns up to the header's last named one
	ct, cs, cq           int
	cz                   int // the time-zone column, -1 for none
	out                  *StageRecord
	quality              map[string]uint16
	lastSec              int64 // time of the last row with a usable time
	lastRow              int   // its row; 0 before the first
	form                 offsetForm
	ahead                clockAhead
	errs                 cappedErrors
	rows, maxRows        int // data rows read; the limit (Limits.Readings)
	split                splitRun
	// quoted reports that a field of the row being read was quoted in
	// CSV (nil in a sheet).
	quoted func(int) bool
	// cd is the date column, -1 for none (see dateColumn); apart tells
	// that the first time, timeSeen, was a time of day alone beside it
	// (ErrDateApart), said once: the rows after it are not read.
	cd              int
	timeSeen, apart bool
}

func newStageBuilder(file, sheet string, opt StageRecordOptions, inWorkbook, date1904 bool) (*stageBuilder, error) {
	off, err := checkOffset(opt.UTCOffset)
	if err != nil {
		return nil, &ParseError{File: file, Sheet: sheet, Err: err}
	}
	lim, err := EnvLimits()
	if err != nil {
		return nil, err
	}
	return &stageBuilder{file: file, sheet: sheet, inWorkbook: inWorkbook, date1904: date1904, off: off, maxRows: lim.Readings,
		out: &StageRecord{File: file, Sheet: sheet, Stages: record.Stages{Name: file}}}, nil
}

// setHeader finds the columns; sizeHint is the expected number of rows.
func (b *stageBuilder) setHeader(h []string, row, sizeHint int) error {
	if err := duplicateColumn(b.file, b.sheet, h, row); err != nil {
		return err
	}
	t := &Table{File: b.file, Sheet: b.sheet, Header: h, HeaderRow: row}
	if title, ok := oneCell(h); ok && t.Column(ColRecordTime, ColRecordStage, ColGaugeHeight) < 0 {
		// A record needs a time and a stage: a header of one cell naming
		// neither is a title above the header.
		return titleRowError(b.file, b.sheet, row, title, 0)
	}
	var err error
	if b.ct, err = t.Require(ColRecordTime); err != nil {
		return err
	}
	if b.cs, err = t.Require(ColRecordStage, ColGaugeHeight); err != nil {
		return err
	}
	b.cq = t.Column(ColRecordQuality)
	b.cd = dateColumn(h, b.ct)
	if b.cz, err = zoneColumn(t); err != nil {
		return err
	}
	if b.out.Units, err = t.HeaderUnits(b.cs); err != nil {
		return err
	}
	b.header, b.headerRow = h, row
	b.width = len(h)
	for b.width > 0 && h[b.width-1] == "" {
		b.width--
	}
	st := &b.out.Stages
	st.Time = make([]int64, 0, sizeHint)
	st.Stage = make([]float64, 0, sizeHint)
	if b.cq >= 0 {
		st.Quality = make([]uint16, 0, sizeHint)
		st.Qualities = []string{""}
		b.quality = map[string]uint16{"": 0}
	}
	return nil
}

// oneCell returns the only filled cell of a row (ok false unless exactly
// one is filled).
func oneCell(h []string) (string, bool) {
	var only string
	n := 0
	for _, c := range h {
		if strings.TrimSpace(c) != "" {
			only, n = c, n+1
		}
	}
	return only, n == 1
}

// fail records a bad cell.
func (b *stageBuilder) fail(row, col int, text []byte, err error) {
	b.errs.add(&ParseError{File: b.file, Sheet: b.sheet, Row: row, Column: col + 1, Name: b.header[col], Text: string(text), Err: err})
}

// full reports that the record holds as many rows as the limit allows;
// a row beyond it is an error (ErrTooManyRows) and reading stops.
func (b *stageBuilder) full() bool { return b.rows > b.maxRows }

// headerFields is the number of fields of a CSV header line whose last
// field is named, 0 in a sheet or when the line ends in blank fields: a
// row with more fields is refused (ErrSpilledRow), as ParseCSV does.
func (b *stageBuilder) headerFields() int {
	if b.sheet != "" || b.width < len(b.header) {
		return 0
	}
	return b.width
}

// takeSplit counts the cells of the stage and the quality column, when
// it comes right after the stage, for splitWarning; a column the record
// does not read (a logger's temperature) is not counted.
func (b *stageBuilder) takeSplit(fields [][]byte, row int) {
	c := b.cs + 1
	if c != b.cq {
		return
	}
	var whole, digits []byte
	if b.cs < len(fields) {
		whole = fields[b.cs]
	}
	if c < len(fields) {
		digits = fields[c]
	}
	takeSplit(&b.split, row, whole, digits, b.quoted != nil && b.quoted(c))
}

// splitWarning is the warning, "" for none, of a quality column right
// after the stage holding a bare digit string after a whole stage on most
// rows, as Table.splitNumbers finds it in a survey: an unquoted decimal
// comma (1,05) that split the stage without adding a field? A logger in
// centimetres records whole stages, and a quality code may be a digit,
// so it is no error (see the policy in splitnumbers.go); a stage header
// naming US units, and quoted quality cells, pass. A record holds no
// running numbers, so increasing digit strings are warned of too.
func (b *stageBuilder) splitWarning() string {
	if !b.split.split(false) || b.out.Units.Found && b.out.Units.Units == rating.US {
		return ""
	}
	c := b.cs + 1
	return (&ParseError{File: b.file, Sheet: b.sheet, Row: b.split.row, Column: c + 1, Name: b.header[c], Text: b.split.digits,
		Err: errors.New(b.split.evidence(b.header[b.cs], b.header[c], b.sheet == ""))}).Error()
}

// row reads one data row; a value after the header's last named column
// is an error (ErrBeyondHeader) at its cell, and so is a CSV row with more
// fields than a header line ending in a named column (ErrSpilledRow). The row after the limit's
// last is an error at its row, wrapping ErrTooManyRows (see full).
func (b *stageBuilder) row(fields [][]byte, row int) {
	if b.rows++; b.full() {
		b.errs.add(&ParseError{File: b.file, Sheet: b.sheet, Row: row,
			Err: fmt.Errorf("the stage record %w of %d readings: raise it with %s=ROWS", ErrTooManyRows, b.maxRows, EnvMaxReadings)})
		return
	}
	if b.apart {
		return
	}
	if pe := extraFieldsError(b.file, b.sheet, fields, row, b.width, b.headerFields()); pe != nil {
		b.errs.add(pe)
		return
	}
	b.takeSplit(fields, row)
	cell := func(c int) []byte {
		if c < 0 || c >= len(fields) {
			return nil
		}
		return fields[c]
	}
	ts, hs := cell(b.ct), cell(b.cs)
	if len(ts) == 0 {
		b.fail(row, b.ct, nil, ErrBlankTime)
		return
	}
	if !b.timeSeen {
		b.timeSeen = true
		if err := dateApartError(b.header, b.cd, string(ts), string(cell(b.cd))); err != nil {
			b.fail(row, b.ct, ts, err)
			b.apart = true
			return
		}
	}
	var sec, zone int64
	var zoned bool
	var err error
	if b.cz >= 0 {
		// A time-zone column gives every time an offset: its own, else
		// the zone cell's.
		zs := cell(b.cz)
		var atZone bool
		if sec, zone, atZone, err = zonedTime(ts, zs, b.inWorkbook, b.date1904); atZone {
			b.fail(row, b.cz, zs, err)
			return
		}
		zoned = true
	} else {
		sec, zone, zoned, err = cellTimeZone(ts, b.inWorkbook, b.date1904, b.off)
	}
	if err == nil {
		if b.form.row == 0 {
			b.out.Times = TimeForm{Offsets: zoned, First: time.Duration(zone) * time.Second}
		}
		err = b.form.check(row, zoned)
	}
	if err != nil {
		b.fail(row, b.ct, ts, err)
		return
	}
	if b.lastRow > 0 && sec <= b.lastSec {
		if sec == b.lastSec {
			b.fail(row, b.ct, ts, fmt.Errorf("%w: the same time as row %d", ErrRepeatedTime, b.lastRow))
		} else {
			hint := ""
			if !zoned && b.off != 0 && b.lastSec-sec <= 3600 {
				// Local times (an offset given for them) stepping back
				// an hour at most: most likely the clock change.
				hint = " (a clock set back an hour, as for daylight saving, repeats times: write each time with its UTC offset, or its zone in a tz column)"
			}
			b.fail(row, b.ct, ts, fmt.Errorf("%w: %s is before %s, the time of row %d%s", ErrTimeOrder,
				formatUnixAt(sec, b.off), formatUnixAt(b.lastSec, b.off), b.lastRow, hint))
		}
		return
	}
	if b.lastRow > 0 && !zoned {
		b.ahead.take(b.lastSec, sec, b.off, row)
	}
	b.lastSec, b.lastRow = sec, row
	st := &b.out.Stages
	if len(hs) == 0 {
		q, ok := b.qualityOf(row, cell(b.cq))
		if !ok {
			return
		}
		b.out.Blank++
		st.Missing = append(st.Missing, sec)
		if b.cq >= 0 {
			st.MissingQuality = append(st.MissingQuality, q)
		}
		return
	}
	h, err := parseDecimal(hs)
	if err != nil {
		b.fail(row, b.cs, hs, err)
		return
	}
	if math.Abs(h) > MaxElevation {
		b.fail(row, b.cs, hs, implausible("stage", h, MaxElevation))
		return
	}
	q, ok := b.qualityOf(row, cell(b.cq))
	if !ok {
		return
	}
	st.Time = append(st.Time, sec)
	st.Stage = append(st.Stage, h)
	if b.cq >= 0 {
		st.Quality = append(st.Quality, q)
	}
}

// qualityOf is the index into the record's qualities of the quality
// cell qs of row (0 for a blank cell), a new word added; ok is false, the
// error gathered, when the record already holds the most words an index
// holds (ErrTooManyQualities).
func (b *stageBuilder) qualityOf(row int, qs []byte) (q uint16, ok bool) {
	if len(qs) == 0 {
		return 0, true
	}
	st := &b.out.Stages
	k, seen := b.quality[string(qs)]
	if !seen {
		if len(st.Qualities) > math.MaxUint16 {
			b.fail(row, b.cq, qs, ErrTooManyQualities)
			return 0, false
		}
		k = uint16(len(st.Qualities))
		st.Qualities = append(st.Qualities, string(qs))
		b.quality[string(qs)] = k
	}
	return k, true
}

// finish returns the record or every error found.
func (b *stageBuilder) finish() (*StageRecord, error) {
	if b.header == nil {
		return nil, &ParseError{File: b.file, Sheet: b.sheet, Err: errors.New("empty file: no header row")}
	}
	if err := b.errs.err(b.file); err != nil {
		return nil, err
	}
	if len(b.out.Stages.Time) == 0 {
		err := ErrEmpty
		if b.out.Blank > 0 {
			err = fmt.Errorf("%w: the stage of %s with a time is blank", ErrEmpty, rating.Agree(b.out.Blank, "its one row", "each of its "+strconv.Itoa(b.out.Blank)+" rows"))
		}
		return nil, &ParseError{File: b.file, Sheet: b.sheet, Row: b.headerRow, Err: err}
	}
	if n := b.out.Blank; n > 0 {
		b.out.Warnings = append(b.out.Warnings, fmt.Sprintf("%s: %s with a time but no stage, read as missing readings (flagged missing in the unit values)", b.file, rating.Counted(n, "row", "rows")))
	}
	if w := b.ahead.warning(b.file, b.off); w != "" {
		b.out.Warnings = append(b.out.Warnings, w)
	}
	if w := b.splitWarning(); w != "" {
		b.out.Warnings = append(b.out.Warnings, w)
	}
	return b.out, nil
}

// clockAhead finds the places where the times of a regular record written
// without a UTC offset jump ahead by exactly one hour more than the
// interval before and after the jump (the interval d, one hour at most,
// then d + 1 h, then d again), where the hour skipped starts at a time
// clocks are set forward (see setForward): the hour a clock set forward
// for daylight saving skips, the mirror of the repeated times of a clock
// set back (an error, with its hint). A fixed offset does not follow the
// change, so the readings after it are read an hour off and the skipped
// hour is bridged as if read. The times of every row with a time count, a
// blank stage's too.
type clockAhead struct {
	prev     int64 // the interval ending at the last time; 0 before two
	pending  int64 // d of a jump just seen, awaiting the interval after it
	pendFrom int64 // the jump's times and row
	pendTo   int64
	pendRow  int
	count    int   // jumps found
	from, to int64 // the first jump's times
	row      int   // and the row after it
}

// take counts the interval from time t0 to time t1 at row, times written
// without an offset having been read at off seconds.
func (c *clockAhead) take(t0, t1, off int64, row int) {
	gap := t1 - t0
	if c.pending > 0 && gap == c.pending {
		if c.count++; c.count == 1 {
			c.from, c.to, c.row = c.pendFrom, c.pendTo, c.pendRow
		}
	}
	c.pending = 0
	if c.prev > 0 && c.prev <= 3600 && gap == c.prev+3600 && setForward(t0+off, c.prev) {
		c.pending, c.pendFrom, c.pendTo, c.pendRow = c.prev, t0, t1, row
	}
	c.prev = gap
}

// setForward reports that a clock set forward for daylight saving may
// have skipped the hour after the reading at local time t0 (Unix seconds
// of the time as written), whose next reading was due d seconds later
// (one hour at most): the first whole hour after t0, at most t0 + d, is
// 01:00, 02:00 or 03:00 on a Sunday. Clocks are set forward on a Sunday
// between 01:00 and 03:00 local time nearly everywhere daylight saving is
// kept (common practice: 01:00 to 02:00 in the United Kingdom, 02:00 to
// 03:00 in central Europe, North America and Australia, 03:00 to 04:00 in
// eastern Europe; a few countries change at midnight or on another day,
// and are not warned of). One lost reading at any other time is an outage.
func setForward(t0, d int64) bool {
	at := time.Unix(t0, 0).UTC().Truncate(time.Hour).Add(time.Hour)
	return at.Unix() <= t0+d && at.Weekday() == time.Sunday && at.Hour() >= 1 && at.Hour() <= 3
}

// warning words the jumps found in file, read at an offset of off
// seconds; "" when none.
func (c *clockAhead) warning(file string, off int64) string {
	if c.count == 0 {
		return ""
	}
	read := "as UTC"
	if off != 0 {
		read = "at the one offset " + record.FormatOffset(time.Duration(off)*time.Second)
	}
	return fmt.Sprintf("%s: %s where the times, written without a UTC offset and read %s, jump ahead one hour more than the record's interval "+
		"(the first from %s to %s, row %d): most likely a clock set forward for daylight saving, which a fixed offset does not follow, "+
		"so the readings after it are an hour off and the skipped hour is bridged as if read; write each time with its UTC offset, or its zone in a tz column",
		file, rating.Counted(c.count, "place", "places"), read, formatUnixAt(c.from, off), formatUnixAt(c.to, off), c.row)
}

// cappedErrors keeps the first MaxReported parse errors and counts the
// rest, so that a file of a million bad rows does not hold a million
// errors.
type cappedErrors struct {
	list  []*ParseError
	extra int
}

func (c *cappedErrors) add(e *ParseError) {
	if len(c.list) < MaxReported {
		c.list = append(c.list, e)
		return
	}
	c.extra++
}

// err joins the errors kept, one per line, and says how many more there
// were.
func (c *cappedErrors) err(file string) error {
	if len(c.list) == 0 {
		return nil
	}
	if c.extra == 0 && len(c.list) == 1 {
		return c.list[0]
	}
	errs := make([]error, 0, len(c.list)+1)
	for _, e := range c.list {
		errs = append(errs, e)
	}
	if c.extra > 0 {
		errs = append(errs, fmt.Errorf("%s: %d more errors not shown", file, c.extra))
	}
	return errors.Join(errs...)
}
