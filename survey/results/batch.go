package results

import (
	"encoding/csv"
	"io"
	"strconv"
	"strings"

	"wetline/rating"
)

// IndexEntry is one section's line in the index of a batch rating.
type IndexEntry struct {
	// Section is the section's name; Source the file (and ['sheet']) it
	// was read from; Output the file its table was written to ("" when
	// none was).
	Section, Source, Output string
	// Rows is the number of stages rated.
	Rows int
	// StageMin and StageMax bound the stages rated (length unit; NaN when
	// no row was rated).
	StageMin, StageMax float64
	// BankfullStage is the lower of the two bank-top elevations and
	// BankfullDischarge the discharge there (length unit, discharge unit);
	// NaN when the section has no banks.
	BankfullStage, BankfullDischarge float64
	// Warnings are the section's warnings; Err its error ("" when rated).
	Warnings []string
	Err      string
	// Skipped says why the section was not rated though it did not fail
	// ("" when it was rated or failed); the index writes it, after
	// "skipped: ", first among the warnings.
	Skipped string
}

// IndexColumns returns the column names of a batch index table, in order.
func IndexColumns() []string {
	return []string{"section", "source", "output", "rows", "stage_min", "stage_max",
		"bankfull_stage", "bankfull_discharge", "warnings", "error"}
}

// WarningSeparator joins several warnings in one cell.
const WarningSeparator = " | "

// WriteIndexCSV writes the index of a batch rating: a header row
// (IndexColumns()) and one row per entry, in the order given. Undefined
// numbers are empty cells; stages are written as lengths (FormatLength),
// as in the rating tables; a skipped section's note leads its warnings.
func WriteIndexCSV(w io.Writer, entries []IndexEntry) error {
	cw := csv.NewWriter(w)
	cw.Write(IndexColumns())
	for _, e := range entries {
		warnings := e.Warnings
		if e.Skipped != "" {
			warnings = append([]string{"skipped: " + e.Skipped}, warnings...)
		}
		cw.Write([]string{e.Section, e.Source, e.Output, strconv.Itoa(e.Rows),
			FormatLength(e.StageMin), FormatLength(e.StageMax),
			FormatLength(e.BankfullStage), FormatFloat(e.BankfullDischarge),
			strings.Join(warnings, WarningSeparator), e.Err})
	}
	cw.Flush()
	return cw.Error()
}

// LongRatingWriter writes the rating tables of many sections as one long
// CSV table: a "section" column, then RatingColumns(), ExtraRatingColumns()
// and the row flags ("flags", as in WriteRatingCSV), each number as
// WriteRatingCSV writes it. Per-subsection
// discharges are left out, as sections differ in their subsections.
type LongRatingWriter struct {
	cw  *csv.Writer
	rec []string
}

// NewLongRatingWriter writes the header row and returns the writer.
func NewLongRatingWriter(w io.Writer) *LongRatingWriter {
	l := &LongRatingWriter{cw: csv.NewWriter(w)}
	cols := append(append(append([]string{"section"}, RatingColumns()...), ExtraRatingColumns()...), "flags")
	l.cw.Write(cols)
	l.rec = make([]string, len(cols))
	return l
}

// Write appends the rows of one section's table.
func (l *LongRatingWriter) Write(section string, t rating.Table) error {
	for _, r := range t.Rows {
		l.rec[0] = section
		vals := append(mainValues(r), extraValues(r)...)
		for i, v := range vals {
			if lengthColumn[i] {
				l.rec[i+1] = FormatLength(v)
			} else {
				l.rec[i+1] = FormatFloat(v)
			}
		}
		l.rec[len(vals)+1] = strings.Join(r.Flags, " ")
		if err := l.cw.Write(l.rec); err != nil {
			return err
		}
	}
	return l.cw.Error()
}

// Flush writes any buffered rows and reports a write error.
func (l *LongRatingWriter) Flush() error {
	l.cw.Flush()
	return l.cw.Error()
}
