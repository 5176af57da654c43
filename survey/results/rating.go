package results

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"wetline/rating"
)

// RatingColumns returns the leading column names of a rating table, in order.
// They are a contract with scripts; add columns after them, never between.
func RatingColumns() []string {
	return []string{
		"stage", "depth", "area", "wetted_perimeter", "top_width", "hydraulic_radius",
		"conveyance", "discharge", "mean_velocity", "alpha", "froude",
	}
}

// ExtraRatingColumns() follow the per-subsection discharges, which follow
// RatingColumns().
func ExtraRatingColumns() []string {
	return []string{"hydraulic_depth", "beta", "shear_stress"}
}

// SubsectionColumn names the discharge column of subsection i (0-based).
func SubsectionColumn(t rating.Table, i int) string {
	s := t.Subsections[i]
	return fmt.Sprintf("discharge_%d_%s", i+1, regionTag(s.Region.String()))
}

func regionTag(r string) string {
	switch r {
	case "left overbank":
		return "left"
	case "right overbank":
		return "right"
	}
	return "channel"
}

// lengthColumn marks the columns of rowValues written to a fixed number of
// decimals (FormatLength): stage and depth, whose absolute precision is
// what a gauge reader needs. Everything else keeps 6 significant digits.
var lengthColumn = map[int]bool{0: true, 1: true}

// rowValues returns a row's values in column order: RatingColumns(), one
// discharge per subsection, then ExtraRatingColumns().
func rowValues(r rating.Row) []float64 {
	v := mainValues(r)
	for _, s := range r.Subs {
		v = append(v, s.Discharge)
	}
	return append(v, extraValues(r)...)
}

// mainValues returns a row's values of RatingColumns().
func mainValues(r rating.Row) []float64 {
	return []float64{r.Stage, r.Depth, r.Area, r.WettedPerimeter, r.TopWidth, r.HydraulicRadius,
		r.Conveyance, r.Discharge, r.MeanVelocity, r.Alpha, r.Froude}
}

// extraValues returns a row's values of ExtraRatingColumns().
func extraValues(r rating.Row) []float64 {
	return []float64{r.HydraulicDepth, r.Beta, r.ShearStress}
}

// ratingCSVColumns names the columns of a rating table in CSV order.
func ratingCSVColumns(t rating.Table) []string {
	cols := append([]string(nil), RatingColumns()...)
	for i := range t.Subsections {
		cols = append(cols, SubsectionColumn(t, i))
	}
	return append(cols, ExtraRatingColumns()...)
}

// WriteRatingCSV writes a rating report's table as CSV: a header row of
// column names (RatingColumns(), one discharge column per subsection,
// ExtraRatingColumns() and flags), then one row per stage. Undefined values
// are empty cells. Units are those of the table; the CSV has no comment
// lines, so it loads into any spreadsheet (the warnings and the caution
// are for the console: see WriteRatingSummary).
func WriteRatingCSV(w io.Writer, rep rating.RatingReport) error {
	t := rep.Table
	bw := bufio.NewWriter(w)
	cols := append(ratingCSVColumns(t), "flags")
	writeRecord(bw, cols)
	rec := make([]string, 0, len(cols))
	for _, r := range t.Rows {
		rec = rec[:0]
		for i, v := range rowValues(r) {
			if lengthColumn[i] {
				rec = append(rec, FormatLength(v))
			} else {
				rec = append(rec, FormatFloat(v))
			}
		}
		rec = append(rec, strings.Join(r.Flags, " "))
		writeRecord(bw, rec)
	}
	return bw.Flush()
}

type jsonSub struct {
	FromStation     Float  `json:"from_station"`
	ToStation       Float  `json:"to_station"`
	Region          string `json:"region"`
	N               Float  `json:"n"`
	Area            Float  `json:"area"`
	WettedPerimeter Float  `json:"wetted_perimeter"`
	TopWidth        Float  `json:"top_width"`
	Conveyance      Float  `json:"conveyance"`
	Discharge       Float  `json:"discharge"`
	MeanVelocity    Float  `json:"mean_velocity"`
}

type jsonRow struct {
	Stage           Float     `json:"stage"`
	Depth           Float     `json:"depth"`
	Area            Float     `json:"area"`
	WettedPerimeter Float     `json:"wetted_perimeter"`
	TopWidth        Float     `json:"top_width"`
	HydraulicRadius Float     `json:"hydraulic_radius"`
	Conveyance      Float     `json:"conveyance"`
	Discharge       Float     `json:"discharge"`
	MeanVelocity    Float     `json:"mean_velocity"`
	Alpha           Float     `json:"alpha"`
	Froude          Float     `json:"froude"`
	HydraulicDepth  Float     `json:"hydraulic_depth"`
	Beta            Float     `json:"beta"`
	ShearStress     Float     `json:"shear_stress"`
	Subsections     []jsonSub `json:"subsections"`
	Flags           []string  `json:"flags"`
}

// jsonCalibration is a rating report's calibration of n in JSON.
type jsonCalibration struct {
	Factor                     Float  `json:"factor"`
	FactorStandardErrorPercent Float  `json:"factor_standard_error_percent"`
	StandardErrorPercent       Float  `json:"standard_error_percent"`
	Gaugings                   int    `json:"gaugings"`
	ChannelOnly                bool   `json:"channel_only"`
	Source                     string `json:"source"`
}

// calibrationJSON lays out a calibration of n (nil, null in JSON, for none).
func calibrationJSON(c *rating.NCalibration) *jsonCalibration {
	if c == nil {
		return nil
	}
	return &jsonCalibration{Factor: Float(c.Factor), FactorStandardErrorPercent: Float(c.FactorStandardErrorPercent),
		StandardErrorPercent: Float(c.StandardErrorPercent), Gaugings: c.Gaugings, ChannelOnly: c.ChannelOnly, Source: c.Source}
}

// WriteRatingJSON writes a rating report as one JSON object:
// {"section","units","slope","rows":[...],"gauge_datum","site",
// "warnings":[...],"caution","calibration","input_notes"}; input_notes,
// the notes of the input (how a coordinate survey was projected), is left
// out when there are none. calibration is null unless
// n was calibrated on gaugings; then it holds the factor, its standard
// error in percent (factor_standard_error_percent), the gaugings' scatter
// about the calibrated rating (standard_error_percent, the standard error
// of estimate), the number of gaugings used, channel_only and the source.
// Undefined values are null.
func WriteRatingJSON(w io.Writer, rep rating.RatingReport) error {
	t := rep.Table
	fields := []jsonField{
		{key: "section", value: t.Name},
		{key: "units", value: UnitNames(t.Units)},
		{key: "slope", value: Float(t.Slope)},
		{key: "rows", n: len(t.Rows), item: func(i int) any { return ratingJSONRow(t.Rows[i]) }},
		{key: "gauge_datum", value: gaugeDatum(t)},
		{key: "site", value: siteJSON(rep.Provenance.Site)},
	}
	fields = append(fields, []jsonField{
		{key: "warnings", value: nonNil(rep.Warnings)},
		{key: "caution", value: rating.Caution},
		{key: "calibration", value: calibrationJSON(rep.Calibration)},
	}...)
	if len(rep.Provenance.Notes) > 0 {
		fields = append(fields, jsonField{key: "input_notes", value: rep.Provenance.Notes})
	}
	return writeJSONObject(w, fields)
}

// ratingJSONRow lays out one row of a rating table in JSON.
func ratingJSONRow(r rating.Row) jsonRow {
	return jsonRow{
		Stage: Float(r.Stage), Depth: Float(r.Depth), Area: Float(r.Area),
		WettedPerimeter: Float(r.WettedPerimeter), TopWidth: Float(r.TopWidth),
		HydraulicRadius: Float(r.HydraulicRadius), Conveyance: Float(r.Conveyance),
		Discharge: Float(r.Discharge), MeanVelocity: Float(r.MeanVelocity),
		Alpha: Float(r.Alpha), Froude: Float(r.Froude), HydraulicDepth: Float(r.HydraulicDepth),
		Beta: Float(r.Beta), ShearStress: Float(r.ShearStress),
		Subsections: jsonSubs(r.Subs), Flags: nonNil(r.Flags),
	}
}

// stageDecimals returns the decimals a table's stages and depths are shown
// with in text and workbooks: three, or as many as the stages need (up to
// LengthDecimals, as the CSV writes them) so that no two stages read alike.
func stageDecimals(t rating.Table) int {
	stages := make([]float64, len(t.Rows))
	for i, r := range t.Rows {
		stages[i] = r.Stage
	}
	return max(3, lengthDecimals(stages...))
}

// writeMainColumnsText writes the main columns of a rating table
// (RatingColumns()) aligned for a console, with their units under the
// names and each row's flags at its end: depths and stages, α and the
// Froude number to three decimals, the rest to four significant digits.
func writeMainColumnsText(w io.Writer, t rating.Table) {
	u := t.Units
	head := []string{"stage", "depth", "area", "wet.perim", "top width", "hyd.radius", "conveyance", "discharge", "velocity", "alpha", "Froude"}
	units := []string{u.Length(), u.Length(), u.Area(), u.Length(), u.Length(), u.Length(), u.Conveyance(), u.Discharge(), u.Velocity(), "", ""}
	var b strings.Builder
	for i := range head {
		fmt.Fprintf(&b, "%11s", head[i])
	}
	b.WriteString("  flags\n")
	for i := range units {
		fmt.Fprintf(&b, "%11s", units[i])
	}
	b.WriteByte('\n')
	io.WriteString(w, b.String())
	sd := stageDecimals(t)
	for _, r := range t.Rows {
		b.Reset()
		for i, v := range mainValues(r) {
			s := "-"
			switch {
			case math.IsNaN(v) || math.IsInf(v, 0):
			case i <= 1:
				s = strconv.FormatFloat(v, 'f', sd, 64)
			case i >= 9:
				s = strconv.FormatFloat(v, 'f', 3, 64)
			default:
				s = strconv.FormatFloat(v, 'g', 4, 64)
				if f, err := strconv.ParseFloat(s, 64); err == nil && math.Abs(f) >= 1 && math.Abs(f) < 1e7 {
					s = strconv.FormatFloat(f, 'f', -1, 64)
				}
			}
			fmt.Fprintf(&b, "%11s", s)
		}
		if len(r.Flags) > 0 {
			fmt.Fprintf(&b, "  %s", strings.Join(r.Flags, " "))
		}
		b.WriteByte('\n')
		io.WriteString(w, b.String())
	}
}

// WriteRatingText writes a rating report as aligned columns for reading
// on a console: a title, the units, the main columns, the warnings and the
// caution.
func WriteRatingText(w io.Writer, rep rating.RatingReport) error {
	t, warnings := rep.Table, rep.Warnings
	u := t.Units
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "Rating of %s at friction slope %g (%s units: stage and lengths %s, area %s, discharge %s)\n",
		t.Name, t.Slope, u, u.Length(), u.Area(), u.Discharge())
	bw.WriteString(siteLine(rep.Provenance))
	if t.GaugeHeights {
		fmt.Fprintf(bw, "Stages are gauge heights: elevation = gauge height %s %s\n", rating.DatumTerm(t.Datum), u.Length())
	}
	bw.WriteByte('\n')
	writeMainColumnsText(bw, t)
	bw.WriteByte('\n')
	return endSummary(bw, warnings)
}
