package results

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/workbook"
)

// Sheet name of the rows of a comparison workbook.
const SheetComparison = "comparison"

// RatingComparisonColumns returns the columns of a comparison of two
// ratings as CSV, in order. They are a contract with scripts; add columns
// after them.
func RatingComparisonColumns() []string {
	return []string{"stage", "discharge_a", "discharge_b", "difference", "percent_difference", "shift"}
}

// SectionComparisonColumns returns the columns of a comparison of two
// surveys as CSV, in order. They are a contract with scripts; add columns
// after them.
func SectionComparisonColumns() []string {
	return []string{"stage",
		"area_a", "area_b", "area_difference",
		"wetted_perimeter_a", "wetted_perimeter_b", "wetted_perimeter_difference",
		"top_width_a", "top_width_b", "top_width_difference",
		"conveyance_a", "conveyance_b", "conveyance_difference", "conveyance_percent_difference"}
}

// WriteRatingComparisonCSV writes two ratings side by side
// (RatingComparisonColumns()): at every stage of their common range each
// discharge, B − A, 100·(B − A)/A and the shift of A's gauge height that
// carries B's discharge. Undefined values are empty cells.
func WriteRatingComparisonCSV(w io.Writer, c *gauged.RatingComparison) error {
	bw := bufio.NewWriter(w)
	writeRecord(bw, RatingComparisonColumns())
	for _, r := range c.Rows {
		writeRecord(bw, []string{comparedStage(r.Stage), FormatFloat(r.A), FormatFloat(r.B), FormatFloat(r.Difference), FormatFloat(r.Percent), FormatLength(r.Shift)})
	}
	return bw.Flush()
}

type jsonRatingDifference struct {
	Stage      Float `json:"stage"`
	A          Float `json:"discharge_a"`
	B          Float `json:"discharge_b"`
	Difference Float `json:"difference"`
	Percent    Float `json:"percent_difference"`
	Shift      Float `json:"shift"`
}

// WriteRatingComparisonJSON writes a comparison of two ratings as one JSON
// object:
//
//	{"kind": "ratings", "a", "b", "units", "from", "to", "max_percent",
//	 "max_stage", "rows": [{"stage", "discharge_a", "discharge_b",
//	 "difference", "percent_difference", "shift"}], "ratings", "warnings",
//	 "caution", "site", "max_difference", "max_difference_stage",
//	 "input_notes"}
//
// input_notes, the notes of the inputs (a rating table naming no unit),
// is left out when there are none.
// max_percent is the largest absolute percent difference, max_difference
// the largest B − A by size (signed); shift is the gauge-height shift of A
// that gives B's discharge at the row's stage.
//
// ratings describes the two tables (as the record's JSON does, periods 1
// and 2 standing for A and B). Undefined values are null.
func WriteRatingComparisonJSON(w io.Writer, c *gauged.RatingComparison) error {
	out := struct {
		Kind       string                 `json:"kind"`
		A          string                 `json:"a"`
		B          string                 `json:"b"`
		Units      JSONUnits              `json:"units"`
		From       Float                  `json:"from"`
		To         Float                  `json:"to"`
		MaxPercent Float                  `json:"max_percent"`
		MaxStage   Float                  `json:"max_stage"`
		Rows       []jsonRatingDifference `json:"rows"`
		Ratings    []jsonPeriod           `json:"ratings"`
		Warnings   []string               `json:"warnings"`
		Caution    string                 `json:"caution"`
		Site       *jsonSite              `json:"site"`
		MaxDiff    Float                  `json:"max_difference"`
		MaxDiffAt  Float                  `json:"max_difference_stage"`
		Notes      []string               `json:"input_notes,omitempty"`
	}{Kind: "ratings", A: c.A, B: c.B, Units: UnitNames(c.Units), From: Float(c.From), To: Float(c.To),
		MaxPercent: Float(c.MaxPercent), MaxStage: Float(c.MaxStage), Rows: []jsonRatingDifference{},
		MaxDiff: Float(c.MaxDifference), MaxDiffAt: Float(c.MaxDifferenceStage),
		Warnings: nonNil(c.Warnings), Caution: rating.Caution, Site: siteJSON(c.Provenance.Site), Notes: c.Provenance.Notes}
	for _, r := range c.Rows {
		out.Rows = append(out.Rows, jsonRatingDifference{Float(r.Stage), Float(r.A), Float(r.B), Float(r.Difference), Float(r.Percent), Float(r.Shift)})
	}
	out.Ratings = jsonPeriods(comparedTables(c), nil)
	return writeJSON(w, out)
}

// comparedTables lays out the two tables of a comparison as periods, for
// the writers that describe ratings.
func comparedTables(c *gauged.RatingComparison) []periodInfo {
	a, b := c.TableA, c.TableB
	return []periodInfo{{rating: &a, readings: -1}, {rating: &b, readings: -1}}
}

// WriteRatingComparisonText writes a comparison of two ratings for
// reading: both ratings, the common range, the largest difference, every
// row, the warnings and the caution.
func WriteRatingComparisonText(w io.Writer, c *gauged.RatingComparison) error {
	bw := bufio.NewWriter(w)
	u := c.Units
	L, Q := u.Length(), u.Discharge()
	fmt.Fprintf(bw, "Two ratings compared: A = %s, B = %s (%s units)\n", c.A, c.B, u)
	bw.WriteString(siteLine(c.Provenance))
	ts := comparedTables(c)
	fmt.Fprintf(bw, "  A: %s\n  B: %s\n", ratingWords(ts[0].rating, u), ratingWords(ts[1].rating, u))
	fmt.Fprintf(bw, "Common range of stage: %s to %s %s, within the rows of both tables; %s\n", comparedStage(c.From), comparedStage(c.To), L, extrapolationWords(c))
	fmt.Fprintf(bw, "Largest difference: %s\n", LargestDifference(c))
	fmt.Fprintf(bw, "\n  %9s %12s %12s %12s %9s %9s\n", "stage", "A", "B", "B − A", "% diff.", "shift")
	fmt.Fprintf(bw, "  %9s %12s %12s %12s %9s %9s\n", "("+L+")", "("+Q+")", "("+Q+")", "("+Q+")", "", "("+L+")")
	for _, r := range c.Rows {
		fmt.Fprintf(bw, "  %9s %12s %12s %12s %9s %9s\n", comparedStageText(r.Stage), sig(r.A, 5), sig(r.B, 5), sig(r.Difference, 4), fixed(r.Percent, 2), fixed(r.Shift, 3))
	}
	writeTextEnd(bw, c.Warnings)
	return bw.Flush()
}

// extrapolationWords says which tables of a comparison are extrapolated
// above their highest gauging within the common range, and over which
// stages; a table whose highest gauging is not known is said to be so.
func extrapolationWords(c *gauged.RatingComparison) string {
	L := c.Units.Length()
	a, b := c.ExtrapolatedA, c.ExtrapolatedB
	span := func(e gauged.Extrapolation) string {
		return fmt.Sprintf("from %s to %s %s", FormatLength(e.From), FormatLength(e.To), L)
	}
	other := func(name string, e gauged.Extrapolation) string {
		if !e.Known {
			return name + "'s highest gauging is not known"
		}
		return name + " is not"
	}
	switch {
	case a.Any() && b.Any():
		return fmt.Sprintf("A is extrapolated above its highest gauging %s, B %s", span(a), span(b))
	case a.Any():
		return fmt.Sprintf("A is extrapolated above its highest gauging %s; %s", span(a), other("B", b))
	case b.Any():
		return fmt.Sprintf("B is extrapolated above its highest gauging %s; %s", span(b), other("A", a))
	case a.Known && b.Known:
		return "neither table is extrapolated above its highest gauging"
	case a.Known:
		return "A is not extrapolated above its highest gauging; B's highest gauging is not known"
	case b.Known:
		return "B is not extrapolated above its highest gauging; A's highest gauging is not known"
	}
	return "neither table's highest gauging is known"
}

// WriteRatingComparisonWorkbook writes a comparison of two ratings as a
// workbook: summary (both ratings, the range, the largest difference,
// warnings, caution), comparison (RatingComparisonColumns() with units)
// and plots.
func WriteRatingComparisonWorkbook(w io.Writer, c *gauged.RatingComparison) error {
	b := newBook("compare", c.Provenance.Site, c.A+" and "+c.B)
	defer b.Close()
	u := c.Units
	L, Q := u.Length(), u.Discharge()
	ts := comparedTables(c)
	items := []SummaryItem{
		{"rating A", ratingWords(ts[0].rating, u), ""},
		{"rating B", ratingWords(ts[1].rating, u), ""},
		{"read from", joinInputs(c.Provenance.Inputs), ""},
		{"program", programName(c.Provenance), ""},
		{"site", c.Provenance.Site.String(), ""},
		{"units", fmt.Sprintf("%s: stage in %s, discharge in %s", u, L, Q), ""},
		{"common range of stage", fmt.Sprintf("%s to %s (within the rows of both tables)", comparedStage(c.From), comparedStage(c.To)), L},
		{"extrapolated above the highest gauging", extrapolationWords(c), ""},
		{"largest difference", LargestDifference(c), ""},
	}
	items = append(items, inputNoteItems(c.Provenance)...)
	if err := WriteSummarySheet(b, SheetSummary, items, c.Warnings); err != nil {
		return err
	}
	s, err := reportTable(b, SheetComparison, []workbook.Column{
		{Name: "stage", Unit: L, Format: "0.000"},
		{Name: "discharge_a", Unit: Q, Format: workbook.FormatSig3},
		{Name: "discharge_b", Unit: Q, Format: workbook.FormatSig3},
		{Name: "difference", Unit: Q, Format: workbook.FormatSig3},
		{Name: "percent_difference", Unit: "%", Format: "0.00"},
		{Name: "shift", Unit: L, Format: "0.000"},
	})
	if err != nil {
		return err
	}
	for _, r := range c.Rows {
		if err := s.Row(r.Stage, r.A, r.B, r.Difference, r.Percent, r.Shift); err != nil {
			return err
		}
	}
	if err := s.Flush(); err != nil {
		return err
	}
	return finishBook(w, b, c.Figures)
}

// sectionValues are the cells of a section comparison row, in the order
// of SectionComparisonColumns().
func sectionValues(r rating.SectionDifference) []float64 {
	return []float64{r.Stage,
		r.A.Area, r.B.Area, r.Difference.Area,
		r.A.WettedPerimeter, r.B.WettedPerimeter, r.Difference.WettedPerimeter,
		r.A.TopWidth, r.B.TopWidth, r.Difference.TopWidth,
		r.A.Conveyance, r.B.Conveyance, r.Difference.Conveyance, r.ConveyancePercent}
}

// WriteSectionComparisonCSV writes two surveys side by side
// (SectionComparisonColumns()): at each stage the area, wetted perimeter,
// top width and conveyance of each, B − A of each and the conveyance's
// percent difference. Undefined values are empty cells.
func WriteSectionComparisonCSV(w io.Writer, c *rating.SectionComparison) error {
	bw := bufio.NewWriter(w)
	writeRecord(bw, SectionComparisonColumns())
	rec := make([]string, 0, len(SectionComparisonColumns()))
	for _, r := range c.Rows {
		rec = rec[:0]
		for i, v := range sectionValues(r) {
			if i == 0 || i >= 4 && i <= 9 {
				rec = append(rec, FormatLength(v))
			} else {
				rec = append(rec, FormatFloat(v))
			}
		}
		writeRecord(bw, rec)
	}
	return bw.Flush()
}

type jsonGeometry struct {
	Area            Float `json:"area"`
	WettedPerimeter Float `json:"wetted_perimeter"`
	TopWidth        Float `json:"top_width"`
	Conveyance      Float `json:"conveyance"`
}

type jsonSectionDifference struct {
	Stage             Float        `json:"stage"`
	A                 jsonGeometry `json:"a"`
	B                 jsonGeometry `json:"b"`
	Difference        jsonGeometry `json:"difference"`
	ConveyancePercent Float        `json:"conveyance_percent_difference"`
}

func geometryJSON(g rating.SectionGeometry) jsonGeometry {
	return jsonGeometry{Float(g.Area), Float(g.WettedPerimeter), Float(g.TopWidth), Float(g.Conveyance)}
}

// WriteSectionComparisonJSON writes a comparison of two surveys as one
// JSON object:
//
//	{"kind": "sections", "a", "b", "units", "rows": [{"stage",
//	 "a": {"area", "wetted_perimeter", "top_width", "conveyance"}, "b": {...},
//	 "difference": {...}, "conveyance_percent_difference"}], "warnings", "caution",
//	 "site", "site_a", "site_b", "input_notes"}
//
// site is the site of both surveys (SetSites: blank where they disagree
// on date or datum), site_a and site_b what each survey says of it (its
// survey date), null when nothing. Undefined values are null.
func WriteSectionComparisonJSON(w io.Writer, c *rating.SectionComparison) error {
	out := struct {
		Kind     string                  `json:"kind"`
		A        string                  `json:"a"`
		B        string                  `json:"b"`
		Units    JSONUnits               `json:"units"`
		Rows     []jsonSectionDifference `json:"rows"`
		Warnings []string                `json:"warnings"`
		Caution  string                  `json:"caution"`
		Site     *jsonSite               `json:"site"`
		SiteA    *jsonSite               `json:"site_a"`
		SiteB    *jsonSite               `json:"site_b"`
		Notes    []string                `json:"input_notes,omitempty"`
	}{Kind: "sections", A: c.A, B: c.B, Units: UnitNames(c.Units), Rows: []jsonSectionDifference{}, Warnings: nonNil(c.Warnings), Caution: rating.Caution,
		Site: siteJSON(c.Provenance.Site), SiteA: siteJSON(c.SiteA), SiteB: siteJSON(c.SiteB), Notes: c.Provenance.Notes}
	for _, r := range c.Rows {
		out.Rows = append(out.Rows, jsonSectionDifference{Float(r.Stage), geometryJSON(r.A), geometryJSON(r.B), geometryJSON(r.Difference), Float(r.ConveyancePercent)})
	}
	return writeJSON(w, out)
}

// WriteSectionComparisonText writes a comparison of two surveys for
// reading: at each stage both surveys' area and conveyance, the
// differences of all four properties, the warnings and the caution.
func WriteSectionComparisonText(w io.Writer, c *rating.SectionComparison) error {
	bw := bufio.NewWriter(w)
	u := c.Units
	L, A := u.Length(), u.Area()
	datum := "both in one datum"
	if c.DatumsDiffer() {
		datum = fmt.Sprintf("datums differ: A %s, B %s", strings.TrimSpace(c.DatumA), strings.TrimSpace(c.DatumB))
	}
	fmt.Fprintf(bw, "Two surveys of one section compared: A = %s, B = %s (%s units; %s)\n", c.A, c.B, u, datum)
	bw.WriteString(siteLine(c.Provenance))
	if l := surveyDates(c); l != "" {
		bw.WriteString("Surveyed: " + l + "\n")
	}
	fmt.Fprintf(bw, "Differences are B − A: a larger area or conveyance in B is scour (or a lower control), a smaller one fill.\n")
	fmt.Fprintf(bw, "\n  %9s %10s %10s %10s %9s %9s %12s %12s %9s\n", "stage", "area A", "area B", "Δ area", "Δ perim.", "Δ width", "conv. A", "conv. B", "Δ conv. %")
	fmt.Fprintf(bw, "  %9s %10s %10s %10s %9s %9s %12s %12s\n", "("+L+")", "("+A+")", "("+A+")", "("+A+")", "("+L+")", "("+L+")", "("+u.Conveyance()+")", "("+u.Conveyance()+")")
	for _, r := range c.Rows {
		fmt.Fprintf(bw, "  %9.3f %10s %10s %10s %9s %9s %12s %12s %9s\n", r.Stage, sig(r.A.Area, 5), sig(r.B.Area, 5), sig(r.Difference.Area, 4),
			fixed(r.Difference.WettedPerimeter, 2), fixed(r.Difference.TopWidth, 2), sig(r.A.Conveyance, 5), sig(r.B.Conveyance, 5), fixed(r.ConveyancePercent, 2))
	}
	writeTextEnd(bw, c.Warnings)
	return bw.Flush()
}

// surveyDates says when each survey was made, "A 2020-01-14, B
// 2023-06-21" ("" when neither says).
func surveyDates(c *rating.SectionComparison) string {
	if strings.TrimSpace(c.SiteA.Surveyed) == "" && strings.TrimSpace(c.SiteB.Surveyed) == "" {
		return ""
	}
	return "A " + surveyDate(c.SiteA) + ", B " + surveyDate(c.SiteB)
}

// surveyDate is a survey's date as its site block gives it, or says it
// gives none.
func surveyDate(s rating.Site) string {
	if d := strings.TrimSpace(s.Surveyed); d != "" {
		return d
	}
	return "not given"
}

// WriteSectionComparisonWorkbook writes a comparison of two surveys as a
// workbook: summary, comparison (SectionComparisonColumns() with units)
// and plots.
func WriteSectionComparisonWorkbook(w io.Writer, c *rating.SectionComparison) error {
	b := newBook("compare", c.Provenance.Site, c.A+" and "+c.B)
	defer b.Close()
	u := c.Units
	L, A, K := u.Length(), u.Area(), u.Conveyance()
	items := []SummaryItem{
		{"survey A", c.A, ""},
		{"survey B", c.B, ""},
		{"read from", joinInputs(c.Provenance.Inputs), ""},
		{"program", programName(c.Provenance), ""},
		{"site", c.Provenance.Site.String(), ""},
		{"survey A surveyed", surveyDate(c.SiteA), ""},
		{"survey B surveyed", surveyDate(c.SiteB), ""},
		{"units", fmt.Sprintf("%s: stage in %s, area in %s, conveyance in %s", u, L, A, K), ""},
		{"method", "area, wetted perimeter, top width and Manning conveyance of each survey at each stage (Chow, 1959); differences B − A", ""},
	}
	items = append(items, inputNoteItems(c.Provenance)...)
	if err := WriteSummarySheet(b, SheetSummary, items, c.Warnings); err != nil {
		return err
	}
	units := []string{L, A, A, A, L, L, L, L, L, L, K, K, K, "%"}
	formats := []string{"0.000", workbook.FormatSig3, workbook.FormatSig3, workbook.FormatSig3, "0.00", "0.00", "0.00", "0.00", "0.00", "0.00",
		workbook.FormatSig3, workbook.FormatSig3, workbook.FormatSig3, "0.00"}
	var cols []workbook.Column
	for i, n := range SectionComparisonColumns() {
		cols = append(cols, workbook.Column{Name: n, Unit: units[i], Format: formats[i]})
	}
	s, err := reportTable(b, SheetComparison, cols)
	if err != nil {
		return err
	}
	vals := make([]any, len(cols))
	for _, r := range c.Rows {
		for i, v := range sectionValues(r) {
			vals[i] = v
		}
		if err := s.Row(vals...); err != nil {
			return err
		}
	}
	if err := s.Flush(); err != nil {
		return err
	}
	return finishBook(w, b, c.Figures)
}

// WriteComparisonSummary says that a comparison was written to path.
func WriteComparisonSummary(w io.Writer, what string, rows int, warnings []string, path string) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "wrote %s: %s, %s\n", path, what, rating.Counted(rows, "stage", "stages"))
	return endSummary(bw, warnings)
}

// LargestDifference says where two ratings differ most: in discharge, with its
// percentage, and in percent where that falls elsewhere (near zero flow a
// small difference is a large percentage).
func LargestDifference(c *gauged.RatingComparison) string {
	L, Q := c.Units.Length(), c.Units.Discharge()
	if math.IsNaN(c.MaxDifference) {
		return "none (no row)"
	}
	pct := ""
	for _, r := range c.Rows {
		if r.Stage == c.MaxDifferenceStage && !math.IsNaN(r.Percent) {
			pct = fmt.Sprintf(" (%s %%)", fixed(r.Percent, 2))
			break
		}
	}
	out := fmt.Sprintf("%s %s at %s %s%s", sig(c.MaxDifference, 4), Q, comparedStage(c.MaxDifferenceStage), L, pct)
	if !math.IsNaN(c.MaxPercent) && c.MaxStage != c.MaxDifferenceStage {
		out += fmt.Sprintf("; in percent, %s %% at %s %s", fixed(c.MaxPercentSigned(), 2), comparedStage(c.MaxStage), L)
	}
	return out
}

// comparedStage writes a stage of a comparison as it was compared at: to
// LengthDecimals decimals (FormatLength) when that is the stage, else in
// full. The stages are the tables' own rows (a fit's table begins at its
// offset, written to six significant figures) or round multiples of the
// step, so writing them rounded would put discharges computed at one
// stage beside another.
func comparedStage(v float64) string {
	s := FormatLength(v)
	if x, err := strconv.ParseFloat(s, 64); err == nil && x != v && !math.IsInf(v, 0) && math.Abs(v) < 1e12 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return s
}

// comparedStageText writes a stage of a comparison's text table to three
// decimals, or in full when those round it (see comparedStage).
func comparedStageText(v float64) string {
	s := strconv.FormatFloat(v, 'f', 3, 64)
	if x, err := strconv.ParseFloat(s, 64); err == nil && x != v && !math.IsNaN(v) {
		return comparedStage(v)
	}
	return s
}
