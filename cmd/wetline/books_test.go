package main

import (
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"wetline/rating"
	"wetline/survey"
	"wetline/survey/results"
	"wetline/survey/workbook"
)

// bookSheet is a sheet of a results workbook read back: raw cell values
// by row, padded to the header's width, and the file for styles.
type bookSheet struct {
	f    *excelize.File
	name string
	rows [][]string
	// title is the sheet's title line above the header ("" for none).
	title string
}

// openBook opens a written workbook with raw (unformatted) cell values.
func openBook(t *testing.T, path string) *excelize.File {
	t.Helper()
	f, err := excelize.OpenFile(path, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

func readSheet(t *testing.T, f *excelize.File, name string) bookSheet {
	t.Helper()
	return readRows(t, f, name, false)
}

// readTitledSheet reads a sheet with a title line above its header.
func readTitledSheet(t *testing.T, f *excelize.File, name string) bookSheet {
	t.Helper()
	return readRows(t, f, name, true)
}

func readRows(t *testing.T, f *excelize.File, name string, titled bool) bookSheet {
	t.Helper()
	rows, err := f.GetRows(name)
	if err != nil {
		t.Fatal(err)
	}
	title := ""
	if titled && len(rows) > 0 && len(rows[0]) > 0 {
		title, rows = rows[0][0], rows[1:]
	}
	if len(rows) == 0 {
		t.Fatalf("sheet %q is empty", name)
	}
	w := len(rows[0])
	for i := range rows {
		for len(rows[i]) < w {
			rows[i] = append(rows[i], "")
		}
	}
	return bookSheet{f, name, rows, title}
}

// col returns the 0-based index of the column whose header is name
// (written in words: underscores as spaces) with or without a unit in
// brackets, failing the test when there is none.
func (s bookSheet) col(t *testing.T, name string) int {
	t.Helper()
	name = strings.ReplaceAll(name, "_", " ")
	for i, h := range s.rows[0] {
		if h == name || strings.HasPrefix(h, name+" (") {
			return i
		}
	}
	t.Fatalf("sheet %q: no column %q in %q", s.name, name, s.rows[0])
	return -1
}

// num parses the cell at data row i (0-based, after the header), column c.
func (s bookSheet) num(t *testing.T, i, c int) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s.rows[i+1][c], 64)
	if err != nil {
		t.Fatalf("sheet %q row %d column %d: %q is not a number", s.name, i+2, c+1, s.rows[i+1][c])
	}
	return v
}

// style returns the fill colour and number format code of a cell.
func (s bookSheet) style(t *testing.T, i, c int) (fill, format string) {
	t.Helper()
	top := 2
	if s.title != "" {
		top = 3
	}
	cell, _ := excelize.CoordinatesToCellName(c+1, i+top)
	id, err := s.f.GetCellStyle(s.name, cell)
	if err != nil {
		t.Fatal(err)
	}
	st, err := s.f.GetStyle(id)
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Fill.Color) > 0 {
		fill = st.Fill.Color[0]
	}
	if st.CustomNumFmt != nil {
		format = *st.CustomNumFmt
	}
	return fill, format
}

// summary returns the summary sheet's values by item (the last of a
// repeated item).
func summary(t *testing.T, f *excelize.File) map[string]string {
	t.Helper()
	s := readSheet(t, f, results.SheetSummary)
	out := map[string]string{}
	for _, r := range s.rows[1:] {
		out[r[0]] = r[1]
	}
	return out
}

// sameFigures reports whether a number read from a results workbook is
// the value computed (want) as the reports write a quantity: to six
// significant figures (results.FormatFloat).
func sameFigures(got, want float64) bool {
	v, err := strconv.ParseFloat(results.FormatFloat(want), 64)
	return err == nil && v == got || got == want
}

// sameLength reports whether a number read from a results workbook is
// the stage or elevation computed (want) as the reports write one: to
// results.LengthDecimals decimals (results.FormatLength).
func sameLength(got, want float64) bool {
	v, err := strconv.ParseFloat(results.FormatLength(want), 64)
	return err == nil && v == got || got == want
}

// sixFigures is the relative distance of a value from its six
// significant figures: half a unit of the sixth.
const sixFigures = 5e-6

func closeTo(a, b, rel float64) bool {
	return a == b || math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}

// ruleTol is how far the lookup rule evaluated in the test (the power law
// written out, and a rating computed at one stage) may differ from the
// program's, relative: round-off only.
const ruleTol = 1e-10

// fitReport is the JSON form of the demo fit, for checking the workbook.
type fitReport struct {
	Segments []struct {
		From float64 `json:"from_stage"`
		To   float64 `json:"to_stage"`
		C    float64 `json:"coefficient"`
		E    float64 `json:"zero_flow_stage"`
		B    float64 `json:"exponent"`
	}
	SEPercent float64 `json:"standard_error_percent"`
	Gaugings  []struct {
		Stage, Discharge, Fitted float64
		Departure                float64 `json:"departure_percent"`
		Excluded                 bool
	}
	Extrapolation struct {
		Slope struct {
			Trend     float64
			JoinStage float64 `json:"join_stage"`
		} `json:"conveyance_slope"`
	}
	Table []struct {
		Stage, Discharge float64
		Extrapolated     bool
	}
	Caution string
}

// TestFitResultsWorkbook: fit -o results.xlsx holds the fit, the
// residuals, the fitted table with extrapolated rows marked, the bands,
// and the lookup sheet whose every cell is the table's rule at that stage
// (least squares, whose rule above the gaugings is the conveyance-slope
// extension).
func TestFitResultsWorkbook(t *testing.T) {
	t.Parallel()
	args := []string{"fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--method", "lsq"}
	out, _, err := fitRun(t, append(args, "--format", "json")...)
	if err != nil {
		t.Fatal(err)
	}
	var rep fitReport
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "results.xlsx")
	if _, errs, err := fitRun(t, append(args, "-o", path)...); err != nil || !strings.Contains(errs, "wrote "+path) {
		t.Fatalf("%v: %s", err, errs)
	}
	f := openBook(t, path)
	want := []string{results.SheetSummary, results.SheetGaugings, results.SheetFitTable, results.SheetBands, results.SheetLookup, results.SheetNByStage, results.SheetPlots}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}

	sum := summary(t, f)
	for item, want := range map[string]string{"caution": rating.Caution, "program": "wetline " + Version, "gaugings": strconv.Itoa(len(rep.Gaugings))} {
		if sum[item] != want {
			t.Errorf("summary %q = %q, want %q", item, sum[item], want)
		}
	}
	for item, want := range map[string]float64{"weighted standard error of estimate": rep.SEPercent,
		"control 1: exponent C": rep.Segments[0].B} {
		if v, err := strconv.ParseFloat(sum[item], 64); err != nil || !sameFigures(v, want) {
			t.Errorf("summary %q = %q, want %g", item, sum[item], want)
		}
	}
	if v, err := strconv.ParseFloat(sum["control 1: offset B"], 64); err != nil || !sameLength(v, rep.Segments[0].E) { // a gauge height
		t.Errorf("summary offset B = %q, want %g", sum["control 1: offset B"], rep.Segments[0].E)
	}
	for _, item := range []string{"control 1: uncertainty of A", "calibration factor on every subsection's n", "extrapolation", "control 1: uncertainty of B",
		"uncertainty convention", "ISO 1100-2 runs test", "Johnson's three-point zero-flow stage"} {
		if sum[item] == "" {
			t.Errorf("summary lacks %q", item)
		}
	}

	g := readSheet(t, f, results.SheetGaugings)
	if len(g.rows)-1 != len(rep.Gaugings) {
		t.Fatalf("%d gauging rows, want %d", len(g.rows)-1, len(rep.Gaugings))
	}
	cq, cf, cd, ct := g.col(t, "discharge"), g.col(t, "fitted"), g.col(t, "departure"), g.col(t, "time")
	g.col(t, "hydraulic")
	g.col(t, "outside_band")
	g.col(t, "n")
	low, high := math.Inf(1), math.Inf(-1)
	for i, jg := range rep.Gaugings {
		if !sameFigures(g.num(t, i, cq), jg.Discharge) || !sameFigures(g.num(t, i, cf), jg.Fitted) || !sameFigures(g.num(t, i, cd), jg.Departure) {
			t.Errorf("gauging %d: %q, want %+v", i+1, g.rows[i+1], jg)
		}
		if !jg.Excluded {
			low, high = min(low, jg.Stage), max(high, jg.Stage)
		}
	}
	if _, format := g.style(t, 0, ct); format != workbook.FormatDateTime {
		t.Errorf("time format %q", format)
	}
	if _, format := g.style(t, 0, g.col(t, "stage")); format != "0.000" {
		t.Errorf("stage format %q", format)
	}

	ft := readSheet(t, f, results.SheetFitTable)
	if len(ft.rows)-1 != len(rep.Table) {
		t.Fatalf("%d table rows, want %d", len(ft.rows)-1, len(rep.Table))
	}
	cs, cq, cx := ft.col(t, "stage"), ft.col(t, "discharge"), ft.col(t, "extrapolated")
	table := map[float64]float64{}
	marked := 0
	for i, jr := range rep.Table {
		if !sameLength(ft.num(t, i, cs), jr.Stage) || !sameFigures(ft.num(t, i, cq), jr.Discharge) {
			t.Errorf("table row %d: %q, want %+v", i+1, ft.rows[i+1], jr)
		}
		fill, format := ft.style(t, i, cq)
		if x := ft.rows[i+1][cx]; (x == "yes") != jr.Extrapolated || (fill == workbook.MarkFill) != jr.Extrapolated {
			t.Errorf("table row %d (stage %g): extrapolated %q, fill %q, want %v", i+1, jr.Stage, x, fill, jr.Extrapolated)
		}
		if format == "" && jr.Discharge != 0 {
			t.Errorf("table row %d: discharge without a number format", i+1)
		}
		if jr.Extrapolated {
			marked++
		}
		table[jr.Stage] = jr.Discharge
	}
	if marked == 0 || marked == len(rep.Table) {
		t.Errorf("%d of %d rows extrapolated", marked, len(rep.Table))
	}

	// The rule, evaluated here independently: Q = A·(h − B)^C on the
	// control holding h (below the lowest gauging too), and above the
	// highest gauging h_j the conveyance-slope extension joined to the
	// fitted rating there, Q = Q_fit(h_j)·(K(h)/K(h_j))·exp(½·trend·(h −
	// h_j)), K the section's conveyance at elevation h + datum (Kennedy,
	// 1984, USGS TWRI 3-A10, with S at the join the fitted rating's, as the
	// table's doc says).
	p, err := survey.Prepare(survey.SectionRequest{Path: fitDemoSurvey})
	if err != nil {
		t.Fatal(err)
	}
	conveyance := func(h float64) float64 {
		tab, err := rating.Compute(p.Geometry, []float64{h + 100}, rating.Options{Slope: 0.0012, Units: rating.SI})
		if err != nil {
			t.Fatal(err)
		}
		return tab.Rows[0].Conveyance
	}
	fitted := func(h float64) float64 {
		s := rep.Segments[0]
		for _, seg := range rep.Segments {
			if h >= seg.From {
				s = seg
			}
		}
		if !(h > s.E) {
			return 0
		}
		return s.C * math.Pow(h-s.E, s.B)
	}
	if s := rep.Extrapolation.Slope; s.JoinStage != high {
		t.Errorf("extension joined at %g, the highest gauging is at %g", s.JoinStage, high)
	}
	qJoin, kJoin := fitted(high), conveyance(high)
	rule := func(h float64) float64 {
		if h > high {
			return qJoin * conveyance(h) / kJoin * math.Exp(0.5*rep.Extrapolation.Slope.Trend*(h-high))
		}
		return fitted(h)
	}
	lk := readTitledSheet(t, f, results.SheetLookup)
	if !strings.HasPrefix(lk.title, "discharge (m3/s) at each stage") {
		t.Errorf("lookup title %q", lk.title)
	}
	if lk.rows[0][0] != "stage (m)" || lk.rows[0][1] != "+0.00" || lk.rows[0][10] != "+0.09" {
		t.Errorf("lookup header %q", lk.rows[0])
	}
	cells, onTable := 0, 0
	e := rep.Segments[0].E
	for i := range len(lk.rows) - 1 {
		tenth := math.Round(lk.num(t, i, 0) * 10)
		for j := 1; j <= 10; j++ {
			h := (tenth*10 + float64(j-1)) / 100
			if lk.rows[i+1][j] == "" {
				if h >= e && h <= rep.Table[len(rep.Table)-1].Stage {
					t.Errorf("lookup: no cell at stage %.2f", h)
				}
				continue
			}
			cells++
			got := lk.num(t, i, j)
			if want := rule(h); !closeTo(got, want, sixFigures+ruleTol) { // the cell holds six figures
				t.Errorf("lookup at %.2f: %.9g, want %.9g", h, got, want)
			}
			if q, ok := table[h]; ok {
				onTable++
				if !sameFigures(got, q) {
					t.Errorf("lookup at %.2f: %g, the fitted rating sheet %g", h, got, q)
				}
			}
			fill, format := lk.style(t, i, j)
			if ext := h < low || h > high; (fill == workbook.MarkFill) != ext {
				t.Errorf("lookup at %.2f: fill %q, extrapolated %v", h, fill, ext)
			}
			if format == "" {
				t.Errorf("lookup at %.2f: no number format", h)
			}
		}
	}
	if cells < 100 || onTable < 5 {
		t.Errorf("%d lookup cells, %d on table stages", cells, onTable)
	}

	nb := readSheet(t, f, results.SheetNByStage)
	if len(nb.rows)-1 != len(rep.Gaugings) {
		t.Errorf("%d n rows, want %d", len(nb.rows)-1, len(rep.Gaugings))
	}
	for i := range len(nb.rows) - 1 {
		if n := nb.num(t, i, nb.col(t, "n")); !(n > 0.005 && n < 0.5) {
			t.Errorf("n by stage row %d: n = %g", i+1, n)
		}
	}
	if pics, err := f.GetPictureCells(results.SheetPlots); err != nil || len(pics) != 1 {
		t.Errorf("plots: %v pictures, %v", pics, err)
	}
	// The gaugings sheet has the columns of a field workbook's: it reads
	// back as gaugings.
	back, err := survey.ReadGaugings(path, results.SheetGaugings)
	if err != nil {
		t.Fatal(err)
	}
	if len(back.Gaugings) != len(rep.Gaugings) {
		t.Fatalf("%d gaugings read back, want %d", len(back.Gaugings), len(rep.Gaugings))
	}
	for i, bg := range back.Gaugings {
		if jg := rep.Gaugings[i]; !sameLength(bg.Stage, jg.Stage) || !sameFigures(bg.Discharge, jg.Discharge) {
			t.Errorf("gauging %d read back as %+v, want %+v", i+1, bg, jg)
		}
	}
}

// TestFitWorkbookComparisonOnly: --compare-only has no fit, so the
// workbook has no fitted table or lookup sheet, but the gaugings against
// the hydraulic rating.
func TestFitWorkbookComparisonOnly(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "compare.xlsx")
	if _, errs, err := fitRun(t, "fit", fitDemoGaugings, "--section", fitDemoSurvey, "--slope", "0.0012", "--datum", "100", "--compare-only", "-o", path); err != nil {
		t.Fatalf("%v: %s", err, errs)
	}
	f := openBook(t, path)
	want := []string{results.SheetSummary, results.SheetGaugings, results.SheetNByStage, results.SheetPlots}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Errorf("sheets %q, want %q", got, want)
	}
	g := readSheet(t, f, results.SheetGaugings)
	g.col(t, "hydraulic_departure")
	if s := summary(t, f); s["caution"] != rating.Caution || !strings.Contains(s["method"], "comparison") {
		t.Errorf("summary %q", s)
	}
}

// TestFitWorkbookErrors: xlsx needs -o; bad gaugings write no workbook.
func TestFitWorkbookErrors(t *testing.T) {
	t.Parallel()
	var ue usageError
	if _, _, err := fitRun(t, "fit", fitDemoGaugings, "--format", "xlsx"); !errors.As(err, &ue) {
		t.Errorf("xlsx without -o: %v, want a usage error", err)
	}
	dir := t.TempDir()
	in := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(in, []byte("time,stage,discharge\n2024-01-01,1,3\n2024-01-02,1.2,-4\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "results.xlsx")
	if _, _, err := fitRun(t, "fit", in, "-o", out); err == nil || !strings.Contains(err.Error(), "bad.csv:3:3") {
		t.Errorf("bad gaugings: %v", err)
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("workbook written despite the error")
	}
}

// saReport is the JSON form of a slope-area report, for checking the
// workbook.
type saReport struct {
	Discharge float64
	Sections  []struct {
		ID           string
		WaterSurface float64 `json:"water_surface"`
		Conveyance   float64
		Froude       float64
		WSLeft       float64 `json:"ws_left"`
		Subsections  []struct {
			N          float64
			Conveyance float64
		}
	}
	Subreaches []struct {
		From, To  string
		Discharge float64
	}
	Checks []struct {
		Name        string
		Value       float64
		Limit       float64
		Pass        bool
		Status      string
		Source      string
		Relation    string
		LimitIsNull bool `json:"-"`
	}
	Uncertainty struct{ P05, P50, P95 float64 }
}

// TestSlopeAreaResultsWorkbook: slopearea -o report.xlsx holds the
// summary, the inputs, sections, subreaches, checks and uncertainty with
// the report's numbers, and both figures.
func TestSlopeAreaResultsWorkbook(t *testing.T) {
	t.Parallel()
	args := []string{"slopearea", "demodata/reach-brindle.csv", "--draws", "300", "--seed", "7"}
	out, errs, code := runCLI(t, append(args, "--format", "json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var rep saReport
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "report.xlsx")
	if _, errs, code := runCLI(t, append(args, "-o", path)...); code != 0 || !strings.Contains(errs, "wrote "+path) {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f := openBook(t, path)
	want := []string{results.SheetSummary, results.SheetReachInputs, results.SheetSections, results.SheetSubsections,
		results.SheetSubreaches, results.SheetChecks, results.SheetUncertainty, results.SheetPlots}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}
	sum := summary(t, f)
	for item, want := range map[string]float64{"peak discharge": rep.Discharge, "5th percentile": rep.Uncertainty.P05,
		"median": rep.Uncertainty.P50, "95th percentile": rep.Uncertainty.P95} {
		if v, err := strconv.ParseFloat(sum[item], 64); err != nil || !sameFigures(v, want) {
			t.Errorf("summary %q = %q, want %g", item, sum[item], want)
		}
	}
	if sum["caution"] != rating.Caution || sum["program"] != "wetline "+Version || !strings.Contains(sum["method"], "Dalrymple") ||
		sum["reach length"] == "" || sum["fall"] == "" || !strings.Contains(sum["units"], "m3/s") {
		t.Errorf("summary %q", sum)
	}
	ss := readSheet(t, f, results.SheetSummary)
	for i, r := range ss.rows[1:] {
		if r[0] == "peak discharge" {
			if _, format := ss.style(t, i, 1); format == "" {
				t.Errorf("peak discharge without a number format")
			}
		}
	}

	in := readSheet(t, f, results.SheetReachInputs)
	for _, name := range []string{"section", "survey", "distance", "ws_left", "ws_right", "quality", "note"} {
		in.col(t, name)
	}
	sec := readSheet(t, f, results.SheetSections)
	sub := readSheet(t, f, results.SheetSubreaches)
	if len(in.rows)-1 != len(rep.Sections) || len(sec.rows)-1 != len(rep.Sections) || len(sub.rows)-1 != len(rep.Subreaches) {
		t.Fatalf("rows: inputs %d, sections %d, subreaches %d", len(in.rows)-1, len(sec.rows)-1, len(sub.rows)-1)
	}
	for i, s := range rep.Sections {
		if in.rows[i+1][0] != s.ID || sec.rows[i+1][0] != s.ID || !sameLength(in.num(t, i, in.col(t, "ws_left")), s.WSLeft) ||
			!sameFigures(sec.num(t, i, sec.col(t, "conveyance")), s.Conveyance) ||
			!sameFigures(sec.num(t, i, sec.col(t, "froude")), s.Froude) ||
			!sameLength(sec.num(t, i, sec.col(t, "water_surface")), s.WaterSurface) {
			t.Errorf("section %s: inputs %q, sections %q", s.ID, in.rows[i+1], sec.rows[i+1])
		}
	}
	if _, format := sec.style(t, 0, sec.col(t, "water_surface")); format != "0.000" {
		t.Errorf("water surface format %q", format)
	}
	// The n of every subsection of every section, as in the JSON.
	ns := readSheet(t, f, results.SheetSubsections)
	k := 0
	for _, s := range rep.Sections {
		for _, x := range s.Subsections {
			if k+1 >= len(ns.rows) || ns.rows[k+1][0] != s.ID || ns.num(t, k, ns.col(t, "n")) != x.N ||
				!sameFigures(ns.num(t, k, ns.col(t, "conveyance")), x.Conveyance) {
				t.Errorf("subsection row %d: %q, want %s n %g", k+1, ns.rows[min(k+1, len(ns.rows)-1)], s.ID, x.N)
			}
			k++
		}
	}
	if k == 0 || k != len(ns.rows)-1 {
		t.Errorf("%d subsection rows, %d in the JSON", len(ns.rows)-1, k)
	}
	for i, s := range rep.Subreaches {
		if sub.rows[i+1][0] != s.From || !sameFigures(sub.num(t, i, sub.col(t, "discharge")), s.Discharge) {
			t.Errorf("subreach %d: %q, want %+v", i+1, sub.rows[i+1], s)
		}
	}

	ch := readSheet(t, f, results.SheetChecks)
	if len(ch.rows)-1 != len(rep.Checks) {
		t.Fatalf("%d check rows, want %d", len(ch.rows)-1, len(rep.Checks))
	}
	warned := 0
	for i, c := range rep.Checks {
		row := ch.rows[i+1]
		if row[0] != c.Name || row[ch.col(t, "status")] != c.Status || row[ch.col(t, "source")] != c.Source ||
			!sameFigures(ch.num(t, i, ch.col(t, "value")), c.Value) {
			t.Errorf("check %d: %q, want %+v", i+1, row, c)
		}
		if fill, _ := ch.style(t, i, ch.col(t, "status")); (fill == workbook.MarkFill) != !c.Pass {
			t.Errorf("check %q: fill %q, pass %v", c.Name, fill, c.Pass)
		}
		if !c.Pass {
			warned++
		}
	}
	if warned == 0 {
		t.Log("no check warns on the demo reach: the marked style is not exercised")
	}

	un := readSheet(t, f, results.SheetUncertainty)
	got := map[string]string{}
	for _, r := range un.rows[1:] {
		got[r[0]+"|"+r[1]] = r[2]
	}
	for key, want := range map[string]float64{"discharge, 5th percentile|": rep.Uncertainty.P05, "discharge, median|": rep.Uncertainty.P50,
		"discharge, 95th percentile|": rep.Uncertainty.P95} {
		if v, err := strconv.ParseFloat(got[key], 64); err != nil || !sameFigures(v, want) {
			t.Errorf("uncertainty %q = %q, want %g", key, got[key], want)
		}
	}
	for _, s := range rep.Sections {
		if got["dQ/dh, this water surface alone|"+s.ID] == "" {
			t.Errorf("uncertainty lacks dQ/dh at %s", s.ID)
		}
	}
	if pics, err := f.GetPictureCells(results.SheetPlots); err != nil || len(pics) != 2 {
		t.Errorf("plots: %v pictures, %v", pics, err)
	}
}

// TestSlopeAreaWorkbookErrors: xlsx needs -o; a bad reach writes no
// workbook.
func TestSlopeAreaWorkbookErrors(t *testing.T) {
	t.Parallel()
	if _, errs, code := runCLI(t, "slopearea", "demodata/reach-brindle.csv", "--format", "xlsx"); code != 2 || !strings.Contains(errs, "-o FILE.xlsx") {
		t.Errorf("xlsx without -o: exit %d %s", code, errs)
	}
	dir := t.TempDir()
	for name, text := range map[string]string{
		"reach.csv": "section,survey,distance,ws_left,ws_right\nA,a.csv,0,11,\nB,a.csv,100,11.2,\n",
		"a.csv":     "station,elevation,n\n0,12,0.04\n10,10,0.04\n20,12,\n",
	} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	out := filepath.Join(dir, "report.xlsx")
	if _, errs, code := runCLI(t, "slopearea", filepath.Join(dir, "reach.csv"), "-o", out); code != 1 || !strings.Contains(errs, "must fall") {
		t.Errorf("rising water surface: exit %d %s", code, errs)
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("workbook written despite the error")
	}
}

// TestDemoWritesResultsWorkbooks: the demo writes the fit and slope-area
// workbooks, each with its figures.
func TestDemoWritesResultsWorkbooks(t *testing.T) {
	t.Parallel()
	dir, out := demoOutput(t)
	for _, tc := range []struct {
		name, sheet string
		pictures    int
	}{{"tallow-fit.xlsx", results.SheetLookup, 1}, {"reach-brindle-slopearea.xlsx", results.SheetChecks, 2}} {
		if !strings.Contains(out, tc.name) {
			t.Errorf("demo does not list %s", tc.name)
		}
		f := openBook(t, filepath.Join(dir, tc.name))
		if !slices.Contains(f.GetSheetList(), tc.sheet) {
			t.Errorf("%s: no %s sheet in %q", tc.name, tc.sheet, f.GetSheetList())
		}
		if pics, err := f.GetPictureCells(results.SheetPlots); err != nil || len(pics) != tc.pictures {
			t.Errorf("%s: %v pictures, %v", tc.name, pics, err)
		}
	}
}
