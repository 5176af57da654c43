package results

import (
	"bufio"
	"fmt"
	"math"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey"
)

// The rating periods and shift diagrams a record or a shift check used,
// as every format of those reports states them.

// periodInfo is a rating period as a report states it.
type periodInfo struct {
	from, to time.Time // zero: from the beginning, to the end
	rating   *gauged.RatingTable
	readings int // readings rated in it; -1 when not counted
}

// shiftInfo is a shift diagram as a report states it.
type shiftInfo struct {
	gauged.ShiftDiagram
	period int // rating period whose shifts include it; -1 when not used
}

// historyPeriods lays out a history's periods, each ending where the next
// begins.
func historyPeriods(h gauged.History) []periodInfo {
	out := make([]periodInfo, len(h.Periods))
	for i, p := range h.Periods {
		out[i] = periodInfo{from: p.From, rating: p.Rating, readings: -1}
		if i+1 < len(h.Periods) {
			out[i].to = h.Periods[i+1].From
		}
	}
	return out
}

// historyShifts pairs a history's diagrams with the period using each.
func historyShifts(h gauged.History, periods []int) []shiftInfo {
	out := make([]shiftInfo, len(h.Shifts))
	for i, d := range h.Shifts {
		out[i] = shiftInfo{ShiftDiagram: d, period: -1}
		if i < len(periods) {
			out[i].period = periods[i]
		}
	}
	return out
}

// zoneOf is the fixed zone of a UTC offset, named as ISO 8601 writes it.
func zoneOf(off time.Duration) *time.Location {
	if off == 0 {
		return time.UTC
	}
	return time.FixedZone("UTC"+record.FormatOffset(off), int(off/time.Second))
}

// zoneName names a zone for a report line.
func zoneName(z *time.Location) string {
	if z == nil || z == time.UTC {
		return "UTC"
	}
	return z.String()
}

// RecordTimeLayout is how the times of a record, its shift diagrams and its
// rating periods are written: ISO 8601 with the offset, so that every time
// reads back as the same instant.
const RecordTimeLayout = time.RFC3339

// RecordDateLayout is how the date of a daily value is written.
const RecordDateLayout = time.DateOnly

// fromText words a period's start.
func fromText(t time.Time, z *time.Location) string {
	if t.IsZero() {
		return "the beginning"
	}
	return t.In(z).Format(RecordTimeLayout)
}

// toText words a period's end.
func toText(t time.Time, z *time.Location) string {
	if t.IsZero() {
		return "the end"
	}
	return t.In(z).Format(RecordTimeLayout)
}

// ratingWords describes a rating table in one line: its name, rows, zero
// flow, highest gauging and extrapolation.
func ratingWords(rt *gauged.RatingTable, u rating.Units) string {
	if rt == nil {
		return "no rating: no discharge is computed"
	}
	L := u.Length()
	lo, hi := rt.Points[0].Stage, rt.Points[len(rt.Points)-1].Stage
	parts := []string{fmt.Sprintf("%s, %s from %s to %s %s", rt.Name, rating.Counted(len(rt.Points), "row", "rows"), comparedStage(lo), comparedStage(hi), L)}
	if rt.HasZeroFlow {
		parts = append(parts, fmt.Sprintf("zero flow at %s %s (%s; log-linear in h − e between rows)", comparedStage(rt.ZeroFlow), L, zeroFlowSource(rt)))
	} else {
		parts = append(parts, "no zero-flow stage (linear between rows)")
	}
	if rt.HasHighGauging {
		parts = append(parts, fmt.Sprintf("highest gauging %s %s", FormatLength(rt.HighGauging), L))
	}
	if rt.Extrapolate {
		parts = append(parts, "extrapolated beyond its rows")
	} else {
		parts = append(parts, "no discharge outside its rows")
	}
	return strings.Join(parts, "; ")
}

// shiftWords describes a diagram's points, taper and start in one line.
func shiftWords(d gauged.ShiftDiagram, u rating.Units) string {
	L := u.Length()
	var pts []string
	for _, p := range d.Points {
		if math.IsNaN(p.Stage) {
			pts = append(pts, fmt.Sprintf("%s %s at every stage", signedLength(p.Shift), L))
			continue
		}
		pts = append(pts, fmt.Sprintf("%s %s at %s", signedLength(p.Shift), L, FormatLength(p.Stage)))
	}
	s := strings.Join(pts, ", ")
	if d.HasTaper {
		s += fmt.Sprintf(", tapering to zero at %s %s", FormatLength(d.Taper), L)
	}
	if d.Abrupt {
		s += "; starts abruptly"
	}
	return s
}

// signedLength writes a shift with its sign.
func signedLength(v float64) string {
	s := FormatLength(v)
	if v > 0 && s != "0" {
		return "+" + s
	}
	return s
}

// writeHistoryText writes the periods and diagrams used, for reading.
func writeHistoryText(bw *bufio.Writer, periods []periodInfo, shifts []shiftInfo, z *time.Location, u rating.Units) {
	fmt.Fprintf(bw, "\nRating periods (each rating in force from its time until the next begins):\n")
	for i, p := range periods {
		fmt.Fprintf(bw, "  %d. from %s to %s: %s", i+1, fromText(p.from, z), toText(p.to, z), ratingWords(p.rating, u))
		if p.readings >= 0 {
			fmt.Fprintf(bw, "; %s rated", rating.Counted(p.readings, "reading", "readings"))
		}
		fmt.Fprintln(bw)
	}
	if len(shifts) == 0 {
		fmt.Fprintf(bw, "\nShift diagrams: none (no shift is applied to the ratings)\n")
		return
	}
	fmt.Fprintf(bw, "\nShift diagrams (the shift is added to the gauge height; a period starts with no shift; prorated in time from its start, or from the diagram before, unless a diagram starts abruptly or the period has no start time; linear in stage between points, constant beyond them):\n")
	for _, d := range shifts {
		where := "not used: no rating in force at its time"
		if d.period >= 0 {
			where = fmt.Sprintf("rating period %d", d.period+1)
		}
		src := ""
		if d.Source != "" {
			src = " [" + d.Source + "]"
		}
		fmt.Fprintf(bw, "  %s (%s): %s%s\n", d.Time.In(z).Format(RecordTimeLayout), where, shiftWords(d.ShiftDiagram, u), src)
	}
}

// jsonRatingRow is one row of a rating table in JSON.
type jsonRatingRow struct {
	Stage     Float `json:"stage"`
	Discharge Float `json:"discharge"`
}

// jsonPeriod is a rating period in JSON.
type jsonPeriod struct {
	Period         int             `json:"period"`
	From           *string         `json:"from"`
	To             *string         `json:"to"`
	Rating         *string         `json:"rating"`
	ZeroFlow       Float           `json:"zero_flow"`
	HighestGauging Float           `json:"highest_gauging"`
	Extrapolate    bool            `json:"extrapolate"`
	Readings       *int            `json:"readings,omitempty"`
	Table          []jsonRatingRow `json:"table"`
	ZeroFlowSource *string         `json:"zero_flow_source"`
}

// zeroFlowSource says where a rating table's gauge height of zero flow
// came from (gauged.RatingTable.ZeroFlowSource), "given" when the table
// does not say.
func zeroFlowSource(rt *gauged.RatingTable) string {
	if rt.ZeroFlowSource == "" {
		return "given"
	}
	return rt.ZeroFlowSource
}

// jsonShiftPoint is a point of a shift diagram in JSON.
type jsonShiftPoint struct {
	Stage Float `json:"stage"`
	Shift Float `json:"shift"`
}

// jsonShift is a shift diagram in JSON.
type jsonShift struct {
	Time         string           `json:"time"`
	RatingPeriod *int             `json:"rating_period"`
	Abrupt       bool             `json:"abrupt"`
	Taper        Float            `json:"taper"`
	Points       []jsonShiftPoint `json:"points"`
	Source       string           `json:"source"`
}

func timePtr(t time.Time, z *time.Location) *string {
	if t.IsZero() {
		return nil
	}
	s := t.In(z).Format(RecordTimeLayout)
	return &s
}

// jsonPeriods lays out periods for JSON: from and to are null at the open
// ends, rating null for a period without one, zero_flow and
// zero_flow_source (where e came from, as a fit's zero_flow source says
// it) null for a rating without a gauge height of zero flow.
func jsonPeriods(periods []periodInfo, z *time.Location) []jsonPeriod {
	out := make([]jsonPeriod, len(periods))
	for i, p := range periods {
		jp := jsonPeriod{Period: i + 1, From: timePtr(p.from, z), To: timePtr(p.to, z),
			ZeroFlow: Float(math.NaN()), HighestGauging: Float(math.NaN()), Table: []jsonRatingRow{}}
		if p.readings >= 0 {
			n := p.readings
			jp.Readings = &n
		}
		if rt := p.rating; rt != nil {
			name := rt.Name
			jp.Rating, jp.Extrapolate = &name, rt.Extrapolate
			if rt.HasZeroFlow {
				src := zeroFlowSource(rt)
				jp.ZeroFlow, jp.ZeroFlowSource = Float(rt.ZeroFlow), &src
			}
			if rt.HasHighGauging {
				jp.HighestGauging = Float(rt.HighGauging)
			}
			for _, r := range rt.Points {
				jp.Table = append(jp.Table, jsonRatingRow{Float(r.Stage), Float(r.Discharge)})
			}
		}
		out[i] = jp
	}
	return out
}

// jsonShifts lays out diagrams for JSON: rating_period is null for a
// diagram not used, taper null without one, a stage null for a shift
// constant in stage.
func jsonShifts(shifts []shiftInfo, z *time.Location) []jsonShift {
	out := make([]jsonShift, len(shifts))
	for i, d := range shifts {
		js := jsonShift{Time: d.Time.In(z).Format(RecordTimeLayout), Abrupt: d.Abrupt, Taper: Float(math.NaN()), Source: d.Source}
		if d.period >= 0 {
			p := d.period + 1
			js.RatingPeriod = &p
		}
		if d.HasTaper {
			js.Taper = Float(d.Taper)
		}
		for _, p := range d.Points {
			js.Points = append(js.Points, jsonShiftPoint{Float(p.Stage), Float(p.Shift)})
		}
		out[i] = js
	}
	return out
}

// writeShiftRows writes diagrams as rows of a shift table
// (survey.ShiftColumns(), the format the shift-diagram reader takes), the
// stage, shift and taper headers naming their unit u ("stage (ft)") so
// that the file reads back in its own unit system without --units.
func writeShiftRows(bw *bufio.Writer, ds []gauged.ShiftDiagram, z *time.Location, u rating.Units) {
	names := survey.ShiftColumns()
	for i := 1; i <= 3; i++ {
		names[i] += " (" + u.Length() + ")"
	}
	writeRecord(bw, names)
	for _, d := range ds {
		for _, r := range d.Rows() {
			abrupt := ""
			if r.Abrupt {
				abrupt = "yes"
			}
			taper := ""
			if r.HasTaper {
				taper = FormatLength(r.Taper)
			}
			writeRecord(bw, []string{r.Time.In(z).Format(RecordTimeLayout), FormatLength(r.Stage), FormatLength(r.Shift), taper, abrupt})
		}
	}
}

// recordCaution is the caution of a report on a discharge record or its
// shifts: the project's caution and the provisional note.
func recordCaution(provisional string) string {
	return rating.Caution + " " + provisional
}
