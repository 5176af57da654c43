package results

import (
	"bufio"
	"fmt"
	"io"
	"strings"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/rating/record"
	"wetline/survey/workbook"
)

// ShiftGaugingColumns returns the columns of a shift check as CSV, one row
// per gauging, in order. They are a contract with scripts; add columns
// after them.
func ShiftGaugingColumns() []string {
	return []string{"time", "stage", "discharge", "quality", "rating_period", "rated", "departure_percent", "outside_band",
		"shift", "applied_shift", "residual_shift", "shifted", "shifted_departure_percent", "outside_band_shifted", "visit", "source", "flags",
		"exclude"}
}

// noShiftFlag is the flag of a gauging whose shift could not be measured
// on the rating in force (gauged.GaugingShift.NoShift), excludedFlag of a
// gauging left out by its exclude column (gauged.GaugingShift.Excluded).
const (
	noShiftFlag  = "no_shift"
	excludedFlag = "excluded"
)

// flagList is a gauging's flags, written space-separated.
type flagList []string

func (l flagList) String() string { return strings.Join(l, " ") }

// gaugingFlags marks a gauging, with the record's flags, above the
// highest gauging of its rating, rated by extrapolation beyond its
// rating's rows or at or below the zero-flow stage (each on the base or
// the shifted rating), at a gauge height outside the rating, or under no
// rating; then no_shift when its shift could not be measured, and excluded
// when its exclude column leaves it out. Each but the last is warned of
// when the gaugings are checked.
func gaugingFlags(g gauged.GaugingShift) flagList {
	var f record.Flag
	if g.AboveGaugings || g.ShiftedAboveGaugings {
		f |= record.AboveGaugings
	}
	if g.Lookup == gauged.Extrapolated || g.ShiftedLookup == gauged.Extrapolated {
		f |= record.Extrapolated
	}
	if g.Lookup == gauged.ZeroFlow || g.ShiftedLookup == gauged.ZeroFlow {
		f |= record.BelowZeroFlow
	}
	if g.Lookup == gauged.OutsideTable {
		f |= record.OutsideRating
	}
	if g.Lookup == gauged.NoRating {
		f |= record.NoRating
	}
	l := flagList(f.Words())
	if g.NoShift {
		l = append(l, noShiftFlag)
	}
	if g.Excluded {
		l = append(l, excludedFlag)
	}
	return l
}

// shiftInfoOf lays out a check's periods and diagrams.
func shiftInfoOf(c *gauged.ShiftCheck) ([]periodInfo, []shiftInfo) {
	return historyPeriods(c.History), historyShifts(c.History, c.ShiftPeriods)
}

// WriteShiftsCSV writes a shift check, one row per gauging in input order
// (ShiftGaugingColumns()): the rating period in force (1-based), the base
// rating's discharge at the gauge height, the departure from it and
// whether it lies outside the gauging's quality band; the measured shift,
// the shift the diagrams apply and the residual between them; the
// discharge of the shifted rating and the departure from it; the visit
// (1-based); the flags (gaugingFlags: above_gaugings, extrapolated,
// below_zero_flow, outside_rating, no_rating, no_shift, excluded),
// space-separated; the reason an excluded gauging is left out (its
// exclude text; empty when kept). Times are ISO 8601 with the check's
// offset; undefined values are empty cells.
func WriteShiftsCSV(w io.Writer, c *gauged.ShiftCheck) error {
	bw := bufio.NewWriter(w)
	z := zoneOf(c.UTCOffset)
	visit := visitOf(c)
	writeRecord(bw, ShiftGaugingColumns())
	for i, g := range c.Gaugings {
		period := ""
		if g.Period >= 0 {
			period = fmt.Sprint(g.Period + 1)
		}
		writeRecord(bw, []string{g.Time.In(z).Format(RecordTimeLayout), FormatLength(g.Stage), FormatFloat(g.Discharge), g.Quality.String(),
			period, FormatFloat(g.Rated), FormatFloat(g.Departure), fmt.Sprint(g.Outside),
			FormatLength(g.Shift), FormatLength(g.Applied), FormatLength(g.Residual),
			FormatFloat(g.Shifted), FormatFloat(g.ShiftedDeparture), fmt.Sprint(g.OutsideShifted), fmt.Sprint(visit[i] + 1), fitCSVText(g.Source),
			gaugingFlags(g).String(), fitCSVText(excludeReason(g))})
	}
	return bw.Flush()
}

// WriteProposedShifts writes the diagram each visit proposes as a shift
// table (survey.ShiftColumns(): time, stage, shift, taper, abrupt; the
// lengths' headers with their unit, "stage (ft)"), after
// comment lines saying where it came from, so that the user can edit it
// (add a taper, mark a diagram abrupt, drop one) and read it back as shift
// diagrams. Visits that propose no diagram are left out.
func WriteProposedShifts(w io.Writer, c *gauged.ShiftCheck) error {
	bw := bufio.NewWriter(w)
	z := zoneOf(c.UTCOffset)
	fmt.Fprintf(bw, "# Proposed shift diagrams, one per field visit, through the visit's measured shifts (%s).\n", programName(c.Provenance))
	if len(c.Provenance.Inputs) > 0 {
		fmt.Fprintf(bw, "# Measured against: %s.\n", joinInputs(c.Provenance.Inputs))
	}
	fmt.Fprintf(bw, "# Shifts in %s, added to the gauge height. Edit before use: a taper stage, abrupt=yes after a flood that changed the control.\n", c.Units.Length())
	fmt.Fprintf(bw, "# %s\n", recordCaution(record.ProvisionalNote))
	var ds []gauged.ShiftDiagram
	for _, v := range c.Visits {
		if len(v.Proposal.Points) > 0 {
			ds = append(ds, v.Proposal)
		}
	}
	writeShiftRows(bw, ds, z, c.Units)
	return bw.Flush()
}

type jsonShiftGauging struct {
	Time             string   `json:"time"`
	Stage            Float    `json:"stage"`
	Discharge        Float    `json:"discharge"`
	Quality          string   `json:"quality"`
	RatingPeriod     *int     `json:"rating_period"`
	Rated            Float    `json:"rated"`
	Departure        Float    `json:"departure_percent"`
	Outside          bool     `json:"outside_band"`
	Shift            Float    `json:"shift"`
	Applied          Float    `json:"applied_shift"`
	Residual         Float    `json:"residual_shift"`
	Shifted          Float    `json:"shifted"`
	ShiftedDeparture Float    `json:"shifted_departure_percent"`
	OutsideShifted   bool     `json:"outside_band_shifted"`
	Visit            int      `json:"visit"`
	Source           string   `json:"source"`
	Flags            []string `json:"flags"`
	Exclude          string   `json:"exclude"`
}

// excludeReason is why a gauging is left out: its exclude text, "" when
// it is kept.
func excludeReason(g gauged.GaugingShift) string {
	if !g.Excluded {
		return ""
	}
	return strings.TrimSpace(g.Exclude)
}

type jsonVisit struct {
	Visit    int              `json:"visit"`
	Time     string           `json:"time"`
	Gaugings []string         `json:"gaugings"`
	Proposal []jsonShiftPoint `json:"proposal"`
}

// WriteShiftsJSON writes a shift check as one JSON object:
//
//	{"units", "gaugings": [{"time", "stage", "discharge", "quality",
//	  "rating_period", "rated", "departure_percent", "outside_band", "shift",
//	  "applied_shift", "residual_shift", "shifted", "shifted_departure_percent",
//	  "outside_band_shifted", "visit", "source", "flags", "exclude"}],
//	 "visits": [{"visit", "time", "gaugings", "proposal": [{"stage", "shift"}]}],
//	 "ratings", "shifts", "warnings", "caution", "site", "input_notes"}
//
// input_notes, the notes of the inputs (a rating table naming no unit,
// read as the units decided), is left out when there are none. ratings
// and shifts state the rating periods and the diagrams applied, as
// the record's JSON does; a visit's gaugings are the sources of its
// gaugings and its proposal is empty when it proposes no diagram; a
// gauging's exclude is the reason it is left out ("" when kept).
// Undefined values are null.
func WriteShiftsJSON(w io.Writer, c *gauged.ShiftCheck) error {
	z := zoneOf(c.UTCOffset)
	visit := visitOf(c)
	out := struct {
		Units    JSONUnits          `json:"units"`
		Gaugings []jsonShiftGauging `json:"gaugings"`
		Visits   []jsonVisit        `json:"visits"`
		Ratings  []jsonPeriod       `json:"ratings"`
		Shifts   []jsonShift        `json:"shifts"`
		Warnings []string           `json:"warnings"`
		Caution  string             `json:"caution"`
		Site     *jsonSite          `json:"site"`
		Notes    []string           `json:"input_notes,omitempty"`
	}{Units: UnitNames(c.Units), Gaugings: []jsonShiftGauging{}, Visits: []jsonVisit{}, Warnings: nonNil(c.Warnings), Caution: recordCaution(record.ProvisionalNote),
		Site: siteJSON(c.Provenance.Site), Notes: c.Provenance.Notes}
	for i, g := range c.Gaugings {
		jg := jsonShiftGauging{Time: g.Time.In(z).Format(RecordTimeLayout), Stage: Float(g.Stage), Discharge: Float(g.Discharge), Quality: g.Quality.String(),
			Rated: Float(g.Rated), Departure: Float(g.Departure), Outside: g.Outside, Shift: Float(g.Shift), Applied: Float(g.Applied),
			Residual: Float(g.Residual), Shifted: Float(g.Shifted), ShiftedDeparture: Float(g.ShiftedDeparture), OutsideShifted: g.OutsideShifted,
			Visit: visit[i] + 1, Source: g.Source, Flags: append([]string{}, gaugingFlags(g)...), Exclude: excludeReason(g)}
		if g.Period >= 0 {
			p := g.Period + 1
			jg.RatingPeriod = &p
		}
		out.Gaugings = append(out.Gaugings, jg)
	}
	for k, v := range c.Visits {
		jv := jsonVisit{Visit: k + 1, Time: v.Time.In(z).Format(RecordTimeLayout), Gaugings: []string{}, Proposal: []jsonShiftPoint{}}
		for _, i := range v.Gaugings {
			jv.Gaugings = append(jv.Gaugings, c.Gaugings[i].Source)
		}
		for _, p := range v.Proposal.Points {
			jv.Proposal = append(jv.Proposal, jsonShiftPoint{Float(p.Stage), Float(p.Shift)})
		}
		out.Visits = append(out.Visits, jv)
	}
	ps, ss := shiftInfoOf(c)
	out.Ratings, out.Shifts = jsonPeriods(ps, z), jsonShifts(ss, z)
	return writeJSON(w, out)
}

// WriteShiftsText writes a shift check for reading: the ratings and
// diagrams it was measured against, every gauging's departure and shifts,
// the excluded gaugings with their reasons, each visit's proposed diagram,
// the warnings, the caution and the provisional note.
func WriteShiftsText(w io.Writer, c *gauged.ShiftCheck) error {
	bw := bufio.NewWriter(w)
	z := zoneOf(c.UTCOffset)
	u := c.Units
	fmt.Fprintf(bw, "Gaugings against the ratings in force: %s; %s units (gauge heights and shifts in %s, discharge in %s); times in %s\n",
		rating.Counted(len(c.Gaugings), "measurement", "measurements"), u, u.Length(), u.Discharge(), zoneName(z))
	bw.WriteString(siteLine(c.Provenance))
	if len(c.Provenance.Inputs) > 0 {
		fmt.Fprintf(bw, "Read from: %s; computed by %s\n", joinInputs(c.Provenance.Inputs), programName(c.Provenance))
	}
	ps, ss := shiftInfoOf(c)
	writeHistoryText(bw, ps, ss, z, u)
	fmt.Fprintf(bw, "\nGaugings (departure = 100·(measured − rated)/rated on the base rating; shift = what to add to the gauge height for the rating to pass through the gauging;\n")
	fmt.Fprintf(bw, "applied = the shift the diagrams give there; residual = shift − applied; * outside the gauging's band, its uncertainty or else its quality's):\n")
	fmt.Fprintf(bw, "  %-25s %8s %10s %-9s %3s %10s %7s %8s %8s %8s %8s %s\n", "time", "stage", "discharge", "quality", "per", "rated", "dep. %", "shift", "applied", "residual", "shifted%", "flags")
	for _, g := range c.Gaugings {
		period := "-"
		if g.Period >= 0 {
			period = fmt.Sprint(g.Period + 1)
		}
		line := fmt.Sprintf("  %-25s %8s %10s %-9s %3s %10s %6s%s %8s %8s %8s %7s%s %s", g.Time.In(z).Format(RecordTimeLayout), fixed(g.Stage, 3),
			sig(g.Discharge, 4), g.Quality, period, sig(g.Rated, 4), fixed(g.Departure, 1), fitStar(g.Outside),
			fixed(g.Shift, 3), fixed(g.Applied, 3), fixed(g.Residual, 3), fixed(g.ShiftedDeparture, 1), fitStar(g.OutsideShifted), gaugingFlags(g))
		bw.WriteString(strings.TrimRight(line, " ") + "\n")
	}
	if n := excludedCount(c); n > 0 {
		fmt.Fprintf(bw, "\nExcluded gaugings (left out by their exclude column: no diagram is proposed from them, and they are not marked or counted outside their bands):\n")
		for _, g := range c.Gaugings {
			if g.Excluded {
				fmt.Fprintf(bw, "  %-25s %s%s\n", g.Time.In(z).Format(RecordTimeLayout), excludeReason(g), sourceNote(g.Source))
			}
		}
	}
	fmt.Fprintf(bw, "\nField visits and the shift diagram each proposes (through its measured shifts; write them with --proposed FILE, edit, and apply them with --shifts FILE):\n")
	for k, v := range c.Visits {
		fmt.Fprintf(bw, "  visit %d, %s, %s: ", k+1, v.Time.In(z).Format(RecordTimeLayout), rating.Counted(len(v.Gaugings), "gauging", "gaugings"))
		if len(v.Proposal.Points) == 0 {
			fmt.Fprintln(bw, "no diagram proposed"+allExcludedNote(c, v))
			continue
		}
		fmt.Fprintln(bw, shiftWords(v.Proposal, u))
	}
	writeTextEnd(bw, c.Warnings)
	fmt.Fprintf(bw, "provisional: %s\n", record.ProvisionalNote)
	return bw.Flush()
}

// WriteShiftsWorkbook writes the results workbook of a shift check to w.
// Sheets:
//
//   - summary: the files read, program, units, zone, every rating period
//     and diagram applied, the counts of gaugings outside their bands, the
//     warnings and the caution;
//   - gaugings: each gauging against the rating in force, with its
//     shifts (ShiftGaugingColumns() with units);
//   - proposed shifts: each visit's proposed diagram in the columns of a
//     shift table, times as date cells with their zone in a tz column,
//     so the sheet reads back as shift diagrams;
//   - ratings and shifts: the periods' tables and the diagrams applied;
//   - plots: the figures, when drawn.
func WriteShiftsWorkbook(w io.Writer, c *gauged.ShiftCheck) error {
	b := newBook("shifts", c.Provenance.Site, "")
	defer b.Close()
	z := zoneOf(c.UTCOffset)
	ps, ss := shiftInfoOf(c)
	if err := writeShiftsSummary(b, c, ps, ss, z); err != nil {
		return err
	}
	if err := writeShiftGaugingsSheet(b, c, z, nil); err != nil {
		return err
	}
	var props []shiftInfo
	for _, v := range c.Visits {
		if len(v.Proposal.Points) > 0 {
			props = append(props, shiftInfo{ShiftDiagram: v.Proposal, period: v.Period})
		}
	}
	if err := writeShiftsSheet(b, SheetProposals, props, z, c.Units); err != nil {
		return err
	}
	if err := writeRatingsSheet(b, ps, z, c.Units); err != nil {
		return err
	}
	if len(ss) > 0 {
		if err := writeShiftsSheet(b, SheetShifts, ss, z, c.Units); err != nil {
			return err
		}
	}
	return finishBook(w, b, c.Figures)
}

// writeShiftsSummary writes the summary sheet of a shifts workbook.
func writeShiftsSummary(b *workbook.Book, c *gauged.ShiftCheck, ps []periodInfo, ss []shiftInfo, z *time.Location) error {
	u := c.Units
	out, outShifted := outsideCounts(c)
	items := []SummaryItem{
		{"read from", joinInputs(c.Provenance.Inputs), ""},
		{"program", programName(c.Provenance), ""},
		{"site", c.Provenance.Site.String(), ""},
	}
	items = append(items, inputNoteItems(c.Provenance)...)
	items = append(items, []SummaryItem{
		{"units", fmt.Sprintf("%s: gauge heights and shifts in %s, discharge in %s", u, u.Length(), u.Discharge()), ""},
		{"times in", zoneName(z), ""},
		{"method", "measured shift s with Q_rating(h + s) = Q; diagrams prorated in time between visits, from no shift at a rating period's start, none applied before its time (Kennedy, 1983, USGS TWRI 3-A13)", ""},
		{"gaugings", len(c.Gaugings), ""},
		{"field visits", len(c.Visits), ""},
		{"gaugings outside their quality bands (base rating)", out, ""},
		{"gaugings outside their quality bands (shifted rating)", outShifted, ""},
		{"gaugings excluded (no diagram proposed from them, not counted outside their bands)", excludedCount(c), ""},
	}...)
	items = append(items, historyItems(ps, ss, z, u)...)
	items = append(items, SummaryItem{"provisional", record.ProvisionalNote, ""})
	return WriteSummarySheet(b, SheetSummary, items, c.Warnings)
}

// excludedCount counts the excluded gaugings.
func excludedCount(c *gauged.ShiftCheck) int {
	n := 0
	for _, g := range c.Gaugings {
		if g.Excluded {
			n++
		}
	}
	return n
}

// allExcludedNote says why a visit whose gaugings are all excluded
// proposes no diagram ("" otherwise).
func allExcludedNote(c *gauged.ShiftCheck, v gauged.Visit) string {
	for _, i := range v.Gaugings {
		if !c.Gaugings[i].Excluded {
			return ""
		}
	}
	return ": its gaugings are excluded"
}

// sourceNote is " [SOURCE]", or "" without a source.
func sourceNote(s string) string {
	if s == "" {
		return ""
	}
	return " [" + s + "]"
}

// outsideCounts counts the gaugings outside their bands on the base and
// on the shifted rating (excluded gaugings never are).
func outsideCounts(c *gauged.ShiftCheck) (base, shifted int) {
	for _, g := range c.Gaugings {
		if g.Outside {
			base++
		}
		if g.OutsideShifted {
			shifted++
		}
	}
	return base, shifted
}

// WriteShiftsSummary says that a shift check was written to path: the
// gaugings, how many lie outside their bands, the visits proposing a
// diagram, the warnings and the caution.
func WriteShiftsSummary(w io.Writer, c *gauged.ShiftCheck, path string) error {
	bw := bufio.NewWriter(w)
	out, outShifted := outsideCounts(c)
	proposed := 0
	for _, v := range c.Visits {
		if len(v.Proposal.Points) > 0 {
			proposed++
		}
	}
	fmt.Fprintf(bw, "wrote %s: %s in %s", path, rating.Counted(len(c.Gaugings), "gauging", "gaugings"), rating.Counted(len(c.Visits), "visit", "visits"))
	if n := excludedCount(c); n > 0 {
		fmt.Fprintf(bw, " (%d excluded)", n)
	}
	fmt.Fprintf(bw, ", %d outside their bands on the base rating", out)
	if len(c.History.Shifts) > 0 {
		fmt.Fprintf(bw, ", %d once shifted", outShifted)
	}
	fmt.Fprintf(bw, "; %s %s a shift diagram\n", rating.Counted(proposed, "visit", "visits"), rating.Agree(proposed, "proposes", "propose"))
	return endSummary(bw, c.Warnings)
}
