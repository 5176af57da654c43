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

	"wetline/rating"
	"wetline/survey/workbook"
)

// FormatFloat writes v with 6 significant digits, and "" for NaN or ±Inf
// (an undefined value).
func FormatFloat(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	if v == 0 {
		return "0"
	}
	return strconv.FormatFloat(v, 'g', 6, 64)
}

// LengthDecimals is the number of decimals written for stages, depths and
// other lengths: 0.1 mm or 0.0001 ft, finer than any survey.
const LengthDecimals = 4

// LengthResolution is 10^−LengthDecimals, the step of the lengths
// written: a step of stages at least this large writes each apart.
const LengthResolution = 1e-4

// ErrStagesAlike is the cause of two stages of a table that would be
// written alike (closer than LengthResolution).
var ErrStagesAlike = errors.New("stages closer than the table's precision")

// CheckStagesApart returns nil when FormatLength writes each of stages, in
// increasing order, differently from the one before (a table written so is
// read back with its stages increasing from row to row); else an error
// wrapping ErrStagesAlike naming the first two written alike.
func CheckStagesApart(stages []float64) error {
	for i := 1; i < len(stages); i++ {
		if a, b := FormatLength(stages[i-1]), FormatLength(stages[i]); a == b {
			return fmt.Errorf("%w: %g and %g would both be written %s (stages are written to %d decimals)",
				ErrStagesAlike, stages[i-1], stages[i], a, LengthDecimals)
		}
	}
	return nil
}

// FormatLength writes a length (stage, depth, width) with LengthDecimals
// decimals, trailing zeros dropped, and "" when undefined.
func FormatLength(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	if math.Abs(v) >= 1e12 {
		return FormatFloat(v) // no survey is this large; keep the cell short
	}
	s := strconv.FormatFloat(v, 'f', LengthDecimals, 64)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		s = "0"
	}
	return s
}

// lengthDecimals returns the decimals a column of lengths (distances
// along a reach) needs so that no value loses a figure it has to
// LengthDecimals decimals: at least one, at most LengthDecimals. 165 and
// 165.001 need three, or both would read 165.0.
func lengthDecimals(vals ...float64) int {
	d := 1
	for _, v := range vals {
		s := FormatLength(v)
		if i := strings.IndexByte(s, '.'); i >= 0 && !strings.ContainsAny(s, "eE") {
			d = max(d, len(s)-i-1)
		}
	}
	return min(d, LengthDecimals)
}

func writeRecord(w *bufio.Writer, rec []string) {
	for i, s := range rec {
		if i > 0 {
			w.WriteByte(',')
		}
		w.WriteString(s)
	}
	w.WriteByte('\n')
}

// Float is a float64 that encodes NaN and ±Inf as JSON null.
type Float float64

// MarshalJSON writes null for undefined values, and a number as
// encoding/json does: the shortest decimal that reads back to it, without
// an exponent from 1e-6 up to 1e21 (a northing of 5210040.12 stays
// 5210040.12), and 0 for negative zero.
func (f Float) MarshalJSON() ([]byte, error) {
	v := float64(f)
	switch a := math.Abs(v); {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return []byte("null"), nil
	case v == 0:
		return []byte("0"), nil
	case a < 1e-6 || a >= 1e21:
		b := strconv.AppendFloat(nil, v, 'e', -1, 64)
		// 1e-07 as 1e-7, as encoding/json writes it.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b = append(b[:n-2], b[n-1])
		}
		return b, nil
	}
	return strconv.AppendFloat(nil, v, 'f', -1, 64), nil
}

// JSONUnits is the units block of a JSON report: the unit of each
// quantity, its keys in the order every report has written them since the
// first release.
type JSONUnits struct {
	Area        string `json:"area"`
	Discharge   string `json:"discharge"`
	Length      string `json:"length"`
	ShearStress string `json:"shear_stress"`
	System      string `json:"system"`
	Velocity    string `json:"velocity"`
}

// UnitNames lists the unit of each quantity for a report header.
func UnitNames(u rating.Units) JSONUnits {
	return JSONUnits{System: u.String(), Length: u.Length(), Area: u.Area(),
		Discharge: u.Discharge(), Velocity: u.Velocity(), ShearStress: u.Stress()}
}

// writeJSON writes v as indented JSON.
func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// sig formats v to n significant figures in plain decimal
// (rating.PlainFigures: 13620, not 1.362e+04), "-" when undefined.
func sig(v float64, n int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return unsignedZero(rating.PlainFigures(v, n))
}

// fixed formats v with n decimals, "-" when undefined; a value that rounds
// to zero is written without a sign (0.000, not -0.000).
func fixed(v float64, n int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return unsignedZero(fmt.Sprintf("%.*f", n, v))
}

// unsignedZero drops the minus sign of a formatted number whose digits are
// all zero ("-0.000" from a small negative value, or "-0").
func unsignedZero(s string) string {
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.") == "" {
		return s[1:]
	}
	return s
}

// nonNil returns s, or an empty list for nil (JSON [] rather than null).
func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

// programName states the program of a report, "wetline unknown" when the
// report does not say.
func programName(p rating.Provenance) string {
	if p.Program == "" {
		return "wetline unknown"
	}
	return p.Program
}

// pictures turns a report's figures into workbook pictures captioned by
// what they show.
func pictures(figs []rating.Figure) []workbook.Picture {
	out := make([]workbook.Picture, len(figs))
	for i, f := range figs {
		out[i] = workbook.Picture{Name: f.Caption, PNG: f.PNG}
	}
	return out
}

// writeTextEnd writes the warnings and the caution at the end of a text
// report.
func writeTextEnd(bw *bufio.Writer, warnings []string) {
	if len(warnings) > 0 {
		bw.WriteString("\n")
		for _, s := range warnings {
			fmt.Fprintf(bw, "warning: %s\n", s)
		}
	}
	fmt.Fprintf(bw, "\ncaution: %s\n", rating.Caution)
}

// markCells puts the cells of a sheet row, vals from its first column on,
// in the marked style, each keeping its column's number format (cols): a
// row the sheet singles out (extrapolated, unsettled, outside its band,
// failing a check).
func markCells(b *workbook.Book, cols []workbook.Column, vals []any) error {
	for i, v := range vals {
		m, err := b.Marked(cols[i].Format, v)
		if err != nil {
			return err
		}
		vals[i] = m
	}
	return nil
}

// jsonSite is a site in JSON; absent (null) when nothing is known.
type jsonSite struct {
	Name     string `json:"name"`
	ID       string `json:"id"`
	Surveyed string `json:"surveyed"`
	Datum    string `json:"datum"`
	Crew     string `json:"crew"`
}

// siteLine is the text line naming the site of a report ("" when nothing
// is known of it), followed by a line for each of the inputs' notes
// (see inputNoteLines).
func siteLine(p rating.Provenance) string {
	out := inputNoteLines(p)
	if s := p.Site.String(); s != "" {
		return "Site: " + s + "\n" + out
	}
	return out
}

// inputNoteLines is a text line "Input: NOTE" for each note of a report's
// inputs (how a coordinate survey's stations were made): facts of the
// inputs, given with them rather than among the warnings.
func inputNoteLines(p rating.Provenance) string {
	var b strings.Builder
	for _, n := range p.Notes {
		b.WriteString("Input: " + n + "\n")
	}
	return b.String()
}

// inputNoteItems are the summary items of the notes of a report's inputs.
func inputNoteItems(p rating.Provenance) []SummaryItem {
	var out []SummaryItem
	for _, n := range p.Notes {
		out = append(out, SummaryItem{"input note", n, ""})
	}
	return out
}

// siteJSON returns the JSON of a site, nil when nothing is known.
func siteJSON(s rating.Site) *jsonSite {
	if !s.Known() {
		return nil
	}
	return &jsonSite{Name: s.Name, ID: s.ID, Surveyed: s.Surveyed, Datum: s.Datum, Crew: s.Crew}
}

// gaugeDatum is a table's gauge datum in JSON: null when its stages are
// elevations.
func gaugeDatum(t rating.Table) Float {
	if !t.GaugeHeights {
		return Float(math.NaN())
	}
	return Float(t.Datum)
}

// jsonField is one key of a JSON object written by writeJSONObject: a
// value, or, with item set, an array of n items made one at a time.
type jsonField struct {
	key   string
	value any
	n     int
	item  func(i int) any
}

// writeJSONObject writes an object's fields in order, indented as
// writeJSON indents, streaming array fields item by item so that a long
// table is never held whole as JSON.
func writeJSONObject(w io.Writer, fields []jsonField) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("{\n")
	for k, f := range fields {
		key, _ := json.Marshal(f.key)
		bw.WriteString("  ")
		bw.Write(key)
		bw.WriteString(": ")
		if f.item == nil {
			v, err := json.MarshalIndent(f.value, "  ", "  ")
			if err != nil {
				return err
			}
			bw.Write(v)
		} else if f.n == 0 {
			bw.WriteString("[]")
		} else {
			bw.WriteString("[\n")
			for i := range f.n {
				v, err := json.MarshalIndent(f.item(i), "    ", "  ")
				if err != nil {
					return err
				}
				bw.WriteString("    ")
				bw.Write(v)
				if i < f.n-1 {
					bw.WriteByte(',')
				}
				bw.WriteByte('\n')
			}
			bw.WriteString("  ]")
		}
		if k < len(fields)-1 {
			bw.WriteByte(',')
		}
		bw.WriteByte('\n')
	}
	bw.WriteString("}\n")
	return bw.Flush()
}

// plainf writes to w as fmt.Fprintf does, with floats in plain decimal
// (rating.Sayf): a report line never prints 2.971e+04.
func plainf(w io.Writer, format string, a ...any) {
	io.WriteString(w, rating.Sayf(format, a...))
}
