package results

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/survey"
)

// projectedPoint is one point of a projected survey, in station order.
type projectedPoint struct {
	Row       int    `json:"row"`
	Station   Float  `json:"station"`
	Elevation Float  `json:"elevation"`
	N         Float  `json:"n"`
	Mark      string `json:"mark"`
	Note      string `json:"note"`
	Easting   Float  `json:"easting"`
	Northing  Float  `json:"northing"`
	Offset    Float  `json:"offset"`
}

// projectedPoints lays out the points of a projected survey: n is that
// of the ground from the point to the next (none on the last point, none
// at all without an n column), and the mark is the point's as written, a
// bank mark's word too (RB keeps its side).
func projectedPoints(sv survey.Survey) []projectedPoint {
	sec, pr := sv.Section, sv.Projection
	out := make([]projectedPoint, len(sec.Points))
	for i, p := range sec.Points {
		pt := projectedPoint{Row: sv.Rows[i], Station: Float(p.Station), Elevation: Float(p.Elevation), N: Float(math.NaN()),
			Mark: sv.Mark(i), Note: sv.Notes[i],
			Easting: Float(pr.Easting[i]), Northing: Float(pr.Northing[i]), Offset: Float(pr.Offsets[i])}
		if i < len(sec.N) {
			pt.N = Float(sec.N[i])
		}
		out[i] = pt
	}
	return out
}

// projectionWords are the lines that say how a survey was projected.
func projectionWords(rep survey.ProjectionReport) []string {
	pr, L := rep.Survey.Projection, rep.Units.Length()
	lines := []string{
		fmt.Sprintf("Stations projected from eastings and northings onto %s.", pr.Line),
		fmt.Sprintf("Left bank (looking downstream) from %s.", pr.Left),
		fmt.Sprintf("Station 0 lies at easting %s, northing %s; stations increase towards grid azimuth %.4f degrees.",
			exactNumber(roundLength(pr.OriginE)), exactNumber(roundLength(pr.OriginN)), pr.Azimuth),
		fmt.Sprintf("Offset is the distance off the line, %s, positive to the right of increasing station; the farthest point lies %s %s off, the tolerance is %s %s.",
			L, FormatLength(pr.MaxOffset), L, FormatFloat(pr.Tolerance), L),
	}
	if pr.Reversed {
		lines = append(lines, "The survey ran right to left; its points are listed in station order, each n applying from its point to the next.")
	}
	return lines
}

// roundLength rounds a length to LengthDecimals decimals.
func roundLength(v float64) float64 {
	p := math.Pow(10, LengthDecimals)
	return math.Round(v*p) / p
}

// exactNumber writes a number in the shortest form that reads back to it.
func exactNumber(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// WriteProjectionCSV writes a projected coordinate survey as a survey CSV
// that every command reads back to the same section: key lines of the
// site (# site: …), comment lines saying how the stations were made and
// the caution, then the columns station, elevation, n (when the survey has
// n), mark, note, easting, northing, offset and row (the point's row in
// the survey read), lengths in the unit written in each header, in
// station order. Warnings go to the caller (the CSV carries only data and
// comments).
func WriteProjectionCSV(w io.Writer, rep survey.ProjectionReport) error {
	bw := bufio.NewWriter(w)
	site := rep.Provenance.Site
	for _, kv := range [][2]string{{survey.MetaSite, site.Name}, {survey.MetaSiteID, site.ID}, {survey.MetaSurveyed, site.Surveyed},
		{survey.MetaDatum, site.Datum}, {survey.MetaCrew, site.Crew}} {
		if kv[1] != "" {
			fmt.Fprintf(bw, "# %s: %s\n", kv[0], oneLine(kv[1]))
		}
	}
	fmt.Fprintf(bw, "# %s, projected by %s\n", oneLine(rep.Survey.Section.Name), programName(rep.Provenance))
	for _, l := range projectionWords(rep) {
		bw.WriteString("# " + l + "\n")
	}
	bw.WriteString("# Caution. " + rating.Caution + "\n")
	L := " (" + rep.Units.Length() + ")"
	hasN := rep.Survey.Section.N != nil
	head := []string{survey.ColStation + L, survey.ColElevation + L}
	if hasN {
		head = append(head, survey.ColN)
	}
	head = append(head, survey.ColMark, survey.ColNote, survey.ColEasting+L, survey.ColNorthing+L, "offset"+L, "row")
	cw := csv.NewWriter(bw)
	cw.Write(head)
	for _, p := range projectedPoints(rep.Survey) {
		rec := []string{FormatLength(float64(p.Station)), exactNumber(float64(p.Elevation))}
		if hasN {
			rec = append(rec, exactNumber(float64(p.N)))
		}
		rec = append(rec, p.Mark, p.Note, exactNumber(float64(p.Easting)), exactNumber(float64(p.Northing)),
			FormatLength(float64(p.Offset)), strconv.Itoa(p.Row))
		cw.Write(rec)
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}

// WriteProjectionJSON writes a projected coordinate survey as one JSON
// object: {"section","units","line","left","origin":{"easting",
// "northing"},"azimuth","offset_tolerance","max_offset","reversed",
// "points":[{"row","station","elevation","n","mark","note","easting",
// "northing","offset"}],"site","warnings","caution","input_notes"}, the
// input notes saying how the survey was projected. The azimuth is in
// degrees clockwise from grid north; lengths are in units.length.
func WriteProjectionJSON(w io.Writer, rep survey.ProjectionReport) error {
	pr := rep.Survey.Projection
	pts := projectedPoints(rep.Survey)
	return writeJSONObject(w, []jsonField{
		{key: "section", value: rep.Survey.Section.Name},
		{key: "units", value: UnitNames(rep.Units)},
		{key: "line", value: pr.Line},
		{key: "left", value: pr.Left},
		{key: "origin", value: struct {
			Easting  Float `json:"easting"`
			Northing Float `json:"northing"`
		}{Float(pr.OriginE), Float(pr.OriginN)}},
		{key: "azimuth", value: Float(pr.Azimuth)},
		{key: "offset_tolerance", value: Float(pr.Tolerance)},
		{key: "max_offset", value: Float(pr.MaxOffset)},
		{key: "reversed", value: pr.Reversed},
		{key: "points", n: len(pts), item: func(i int) any { return pts[i] }},
		{key: "site", value: siteJSON(rep.Provenance.Site)},
		{key: "warnings", value: nonNil(rep.Warnings)},
		{key: "caution", value: rating.Caution},
		{key: "input_notes", value: nonNil(rep.Provenance.Notes)},
	})
}

// WriteProjectionSummary writes the console lines after a projection was
// written to a file: what was written, the warnings and the caution (the
// input notes, "input: ...", come before it, from the one writer of the
// console's notes).
func WriteProjectionSummary(w io.Writer, rep survey.ProjectionReport, output string) error {
	bw := bufio.NewWriter(w)
	pr := rep.Survey.Projection
	fmt.Fprintf(bw, "wrote %s: %d points of %s projected onto %s, left bank from %s; farthest off the line %s %s\n",
		output, len(rep.Survey.Section.Points), rep.Survey.Section.Name, pr.Line, pr.Left, FormatLength(pr.MaxOffset), rep.Units.Length())
	return endSummary(bw, rep.Warnings)
}

// oneLine keeps a free-text value on one comment line.
func oneLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}
