package results_test

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/survey/results"
)

// fitReports returns a least-squares and a Bayesian report on gaugings of
// Q = 8·(h − 0.3)^2 (invented) with seeded noise, one gauging excluded by
// its own text and the table carried to twice the highest gauging's stage.
func fitReports(t *testing.T) (lsq, bayes *gauged.Report) {
	t.Helper()
	law := func(h float64) float64 { return 8 * math.Pow(h-0.3, 2) }
	t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	var gs []gauged.Gauging
	for i := range 14 {
		h := 0.5 + 0.1*float64(i)
		g := gauged.Gauging{Time: t0.AddDate(0, i, 0), Stage: h, Discharge: law(h) * (1 + 0.02*math.Sin(float64(7*i))), Quality: rating.Good}
		gs = append(gs, g)
	}
	gs[3].Exclude, gs[3].Discharge = "weed on the control", 2*gs[3].Discharge
	gs[5].Uncertainty = 3.5
	var err error
	opt := gauged.Options{Site: "test", Units: rating.SI, Table: gauged.ControlTableOptions{To: 3.6, Step: 0.1}, Lookup: true}
	if lsq, err = gauged.Analyze(gs, opt); err != nil {
		t.Fatal(err)
	}
	opt.Method, opt.Bayes = gauged.Bayesian, gauged.BayesOptions{Chains: 2, Draws: 1000, Seed: 1}
	if bayes, err = gauged.Analyze(gs, opt); err != nil {
		t.Fatal(err)
	}
	return lsq, bayes
}

// The table's CSV keeps the seven columns of earlier versions first, in
// order, with lower_95 and upper_95 the parametric band, then the new
// ones; gauged_multiple is the discharge over the largest one fitted on
// rows above the gaugings and blank on the others.
func TestWriteFitCSVColumns(t *testing.T) {
	lsq, _ := fitReports(t)
	legacy := []string{"stage", "discharge", "extrapolated", "basis", "lower_95", "upper_95", "hydraulic"}
	cols := results.FitTableColumns()
	if !slices.Equal(cols[:len(legacy)], legacy) {
		t.Fatalf("columns %q do not start with %q", cols, legacy)
	}
	var buf bytes.Buffer
	if err := results.WriteFitCSV(&buf, lsq); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(recs[0], cols) || len(recs)-1 != len(lsq.Table.Rows) {
		t.Fatalf("header %q, %d rows", recs[0], len(recs)-1)
	}
	at := func(rec []string, name string) string { return rec[slices.Index(cols, name)] }
	above := 0
	for i, rec := range recs[1:] {
		row := lsq.Table.Rows[i]
		if at(rec, "lower_95") != at(rec, "parametric_lower_95") || at(rec, "upper_95") != at(rec, "parametric_upper_95") {
			t.Errorf("row %d: lower/upper_95 are not the parametric band: %q", i+1, rec)
		}
		m := at(rec, "gauged_multiple")
		if row.Stage <= lsq.Fit.HighStage {
			if m != "" {
				t.Errorf("row %d within the gaugings has multiple %q", i+1, m)
			}
			continue
		}
		above++
		v, err := strconv.ParseFloat(m, 64)
		if err != nil || math.Abs(v-row.Discharge/lsq.Fit.MaxDischarge) > 1e-5*v || at(rec, "total_lower_95") == "" {
			t.Errorf("row %d above the gaugings: %q", i+1, rec)
		}
	}
	if above == 0 {
		t.Error("no row above the gaugings")
	}
}

// The JSON report keeps the keys of earlier versions in their order and
// adds the new ones; segments, gaugings and table rows carry theirs; the
// posterior is there for a Bayesian fit (with the keys the report
// promises) and null for least squares.
func TestWriteFitJSONKeys(t *testing.T) {
	lsq, bayes := fitReports(t)
	legacy := []string{"site", "units", "datum", "slope", "zero_flow", "segments", "breakpoints", "standard_error_percent",
		"standard_error_log", "gaugings_fitted", "parameters", "poor_fit", "gaugings", "calibration", "extrapolation", "table", "warnings", "caution"}
	added := []string{"method", "uncertainty_convention", "selection", "band_note", "relation_tests", "johnson", "posterior", "more_controls"}
	for _, rep := range []*gauged.Report{lsq, bayes} {
		var buf bytes.Buffer
		if err := results.WriteFitJSON(&buf, rep); err != nil {
			t.Fatal(err)
		}
		keys := jsonKeys(t, buf.Bytes())
		last := -1
		for _, k := range legacy {
			i := slices.Index(keys, k)
			if i <= last {
				t.Errorf("%s: key %q at %d, after %d (keys %q)", rep.Method, k, i, last, keys)
			}
			last = i
		}
		for _, k := range added {
			if !slices.Contains(keys, k) {
				t.Errorf("%s: no key %q", rep.Method, k)
			}
		}
		var doc map[string]any
		if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
			t.Fatal(err)
		}
		need(t, doc["segments"].([]any)[0].(map[string]any), "from_stage", "to_stage", "coefficient", "zero_flow_stage", "exponent", "control", "kind")
		g := doc["gaugings"].([]any)[3].(map[string]any)
		need(t, g, "stage", "discharge", "fitted", "departure_percent", "shift", "excluded", "excluded_reason", "uncertainty_percent")
		if g["excluded"] != true || g["excluded_reason"] != "weed on the control" || g["departure_percent"] == nil {
			t.Errorf("%s: excluded gauging %v", rep.Method, g)
		}
		if u := doc["gaugings"].([]any)[5].(map[string]any)["uncertainty_percent"]; u != 3.5 {
			t.Errorf("%s: uncertainty %v, want the column's 3.5", rep.Method, u)
		}
		row := doc["table"].([]any)[len(doc["table"].([]any))-1].(map[string]any)
		need(t, row, "stage", "discharge", "extrapolated", "basis", "parametric_lower_95", "parametric_upper_95", "total_lower_95", "total_upper_95", "gauged_multiple")
		if doc["method"] != rep.Method.String() || !strings.Contains(doc["uncertainty_convention"].(string), "poor 12 %") {
			t.Errorf("method %v, convention %v", doc["method"], doc["uncertainty_convention"])
		}
		need(t, doc["relation_tests"].(map[string]any)["runs"].(map[string]any), "n", "statistic", "p", "failed")
		post, isBayes := doc["posterior"].(map[string]any)
		if isBayes != (rep.Method == gauged.Bayesian) {
			t.Fatalf("%s: posterior %v", rep.Method, doc["posterior"])
		}
		if isBayes {
			need(t, post, "parameters", "rhat_max", "ess_min", "acceptance")
			need(t, post["parameters"].([]any)[0].(map[string]any), "name", "mean", "sd", "p2_5", "p50", "p97_5", "prior_mean", "prior_sd")
		}
	}
}

// need fails for every key missing from obj.
func need(t *testing.T, obj map[string]any, keys ...string) {
	t.Helper()
	for _, k := range keys {
		if _, ok := obj[k]; !ok {
			t.Errorf("missing key %q in %v", k, obj)
		}
	}
}

// The text report states the uncertainty convention, the method, the
// tests with their p-values and Johnson's check, marks the excluded
// gauging with its reason, and gives the Bayesian posterior.
func TestWriteFitTextStates(t *testing.T) {
	lsq, bayes := fitReports(t)
	for _, rep := range []*gauged.Report{lsq, bayes} {
		var buf bytes.Buffer
		if err := results.WriteFitText(&buf, rep); err != nil {
			t.Fatal(err)
		}
		out := buf.String()
		for _, w := range []string{"Uncertainty convention: ", "poor 12 %", "runs ", "p = ", "Johnson's three-point check",
			"x 2024-04-01T09:00:00Z: weed on the control", "param. 2.5%", "total 97.5%", "caution: "} {
			if !strings.Contains(out, w) {
				t.Errorf("%s: text lacks %q", rep.Method, w)
			}
		}
		if strings.Contains(out, "Posterior (") != (rep.Method == gauged.Bayesian) {
			t.Errorf("%s: posterior section present: %v", rep.Method, strings.Contains(out, "Posterior ("))
		}
	}
}

// The workbook of a Bayesian fit has the bands and posterior sheets: the
// posterior one row per parameter under PosteriorColumns, the bands with
// their half-widths 50·(upper − lower)/discharge in percent.
func TestWriteFitWorkbookBandsPosterior(t *testing.T) {
	_, bayes := fitReports(t)
	var buf bytes.Buffer
	if err := results.WriteFitWorkbook(&buf, bayes); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &buf)
	want := []string{results.SheetSummary, results.SheetGaugings, results.SheetFitTable, results.SheetBands, results.SheetPosterior, results.SheetLookup}
	if got := f.GetSheetList(); !slices.Equal(got, want) {
		t.Fatalf("sheets %q, want %q", got, want)
	}
	rows, err := f.GetRows(results.SheetPosterior)
	if err != nil {
		t.Fatal(err)
	}
	// The header in words: PosteriorColumns with spaces for underscores
	// and p2_5 as p2.5.
	wantHead := []string{"name", "mean", "sd", "p2.5", "p50", "p97.5", "prior mean", "prior sd", "rhat", "ess", "derived"}
	if len(wantHead) != len(results.PosteriorColumns()) {
		t.Fatalf("PosteriorColumns %q changed", results.PosteriorColumns())
	}
	if !slices.Equal(rows[0], wantHead) || len(rows)-1 != len(bayes.Fit.Posterior.Parameters) {
		t.Errorf("posterior sheet header %q, %d rows for %d parameters", rows[0], len(rows)-1, len(bayes.Fit.Posterior.Parameters))
	}
	rows, err = f.GetRows(results.SheetBands)
	if err != nil {
		t.Fatal(err)
	}
	col := func(name string) int {
		for i, h := range rows[0] {
			if h == name || strings.HasPrefix(h, name+" (") {
				return i
			}
		}
		t.Fatalf("no column %q in %q", name, rows[0])
		return -1
	}
	ct := col("total half width")
	for i, r := range bayes.Table.Rows {
		if !(r.Discharge > 0) {
			continue
		}
		got, err := strconv.ParseFloat(rows[i+1][ct], 64)
		if want := 50 * (r.TotalUpper - r.TotalLower) / r.Discharge; err != nil || got != reported(want, false) {
			t.Errorf("row %d: total half-width %q, want %g", i+1, rows[i+1][ct], want)
		}
	}
	g, err := f.GetRows(results.SheetGaugings)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(g[0], "exclude") || !slices.Contains(g[0], "uncertainty (%)") || !slices.Contains(g[0], "excluded reason") {
		t.Errorf("gaugings header %q", g[0])
	}
}

// With no UTC offset chosen, every gauging time of a fit is written in
// UTC, as RFC 3339 gives it (Z), whatever offset it was read with, in the
// text (the rows and the reasons of those left out) and in the JSON, as
// shifts and record write theirs; what is shown can be given back to
// --exclude. Gaugings of Q = 8·(h − 0.3)^2 (invented), the fourth at
// 2024-03-05T09:00+10:00, written 2024-03-04T23:00:00Z (RFC 3339, seconds
// included) and left out by its text; the others at 09:00 UTC on the first
// of each month, the first written 2024-01-01T09:00:00Z.
func TestFitGaugingTimesInUTC(t *testing.T) {
	east := time.FixedZone("", 10*3600)
	var gs []gauged.Gauging
	for i := range 10 {
		h := 0.5 + 0.1*float64(i)
		gs = append(gs, gauged.Gauging{Time: time.Date(2024, time.Month(1+i), 1, 9, 0, 0, 0, time.UTC), Stage: h,
			Discharge: 8 * math.Pow(h-0.3, 2) * (1 + 0.02*math.Sin(float64(7*i))), Quality: rating.Good})
	}
	gs[3].Time, gs[3].Exclude = time.Date(2024, 3, 5, 9, 0, 0, 0, east), "weed on the control"
	rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI})
	if err != nil {
		t.Fatal(err)
	}
	var text, js bytes.Buffer
	if err := results.WriteFitText(&text, rep); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{"  2024-03-04T23:00:00Z ", "  2024-01-01T09:00:00Z ", "x 2024-03-04T23:00:00Z: weed on the control"} {
		if !strings.Contains(text.String(), w) {
			t.Errorf("text lacks %q:\n%s", w, text.String())
		}
	}
	if err := results.WriteFitJSON(&js, rep); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Gaugings []struct {
			Time string `json:"time"`
		} `json:"gaugings"`
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Gaugings) != len(gs) || doc.Gaugings[0].Time != "2024-01-01T09:00:00Z" || doc.Gaugings[3].Time != "2024-03-04T23:00:00Z" {
		t.Errorf("JSON gauging times %+v", doc.Gaugings)
	}
}

// The comparison line counts the gaugings outside their bands among those
// compared: of three gaugings, one lies beyond a short hydraulic table (no
// rated discharge), one of the two compared departs by 20 % (outside a
// good gauging's 5 % band, common practice as the convention states), so
// "1 of 2 compared", not "1 of 3". Hand count.
func TestFitComparisonCountsCompared(t *testing.T) {
	at := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	gs := []gauged.Gauging{
		{Time: at, Stage: 0.5, Discharge: 1, Quality: rating.Good},
		{Time: at.AddDate(0, 1, 0), Stage: 0.8, Discharge: 2.4, Quality: rating.Good},
		{Time: at.AddDate(0, 2, 0), Stage: 5, Discharge: 40, Quality: rating.Good},
	}
	nan := math.NaN()
	rep := &gauged.Report{Units: rating.SI, Gaugings: gs, Comparison: &gauged.Comparison{Outside: 1, Residuals: []gauged.Residual{
		{Fitted: 1, DeparturePercent: 0, Shift: 0}, {Fitted: 2, DeparturePercent: 20, Shift: 0.05, OutsideBand: true}, {Fitted: nan, DeparturePercent: nan, Shift: nan},
	}}}
	var b bytes.Buffer
	if err := results.WriteFitText(&b, rep); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), ", 1 of 2 compared outside their quality bands") {
		t.Errorf("text:\n%s", b.String())
	}
}

// A control's stages never read backwards: a floodplain given above every
// gauging, its prior given (so the fit accepts it), starts at its
// breakpoint 2.5 m with no gauged top; text and workbook say "from 2.500
// m up" and JSON gives a null to_stage, where the top control used to
// read "2.500 to 1.800". Gaugings of Q = 8·(h − 0.3)^2 (invented), 0.5 to
// 1.8 m.
func TestFitControlAboveGaugingsRange(t *testing.T) {
	t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	var gs []gauged.Gauging
	for i := range 14 {
		h := 0.5 + 0.1*float64(i)
		gs = append(gs, gauged.Gauging{Time: t0.AddDate(0, i, 0), Stage: h, Discharge: 8 * math.Pow(h-0.3, 2) * (1 + 0.02*math.Sin(float64(7*i))), Quality: rating.Good})
	}
	opt := gauged.Options{Site: "test", Units: rating.SI, Method: gauged.Bayesian,
		Controls: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}, {Kind: gauged.ChannelControl, Joint: gauged.Add}}, Breaks: []float64{2.5}},
		Bayes: gauged.BayesOptions{Chains: 2, Draws: 500, Seed: 1, Priors: []gauged.ControlPrior{{}, {
			LogCoefficient: gauged.ParamPrior{Mean: math.Log(20), SD: 0.3}, Exponent: gauged.ParamPrior{Mean: 1.67, SD: 0.2}, Source: "given"}}},
		Table: gauged.ControlTableOptions{To: 3, Step: 0.1}}
	rep, err := gauged.Analyze(gs, opt)
	if err != nil {
		t.Fatal(err)
	}
	var text, js, book bytes.Buffer
	if err := results.WriteFitText(&text, rep); err != nil {
		t.Fatal(err)
	}
	if s := text.String(); !strings.Contains(s, "control 2 (channel, adds to the one below), from 2.500 m up, above every gauging fitted:") ||
		!strings.Contains(s, "control 1 (channel), ") || !strings.Contains(s, " to 2.500 m: ") || strings.Contains(s, "2.500 to 1.800") {
		t.Errorf("text:\n%s", s)
	}
	if err := results.WriteFitJSON(&js, rep); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Segments []struct {
			From *float64 `json:"from_stage"`
			To   *float64 `json:"to_stage"`
		} `json:"segments"`
	}
	if err := json.Unmarshal(js.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Segments) != 2 || doc.Segments[0].To == nil || *doc.Segments[0].To != 2.5 || doc.Segments[1].To != nil || *doc.Segments[1].From != 2.5 {
		t.Errorf("JSON segments %s", js.String()[:min(js.Len(), 400)])
	}
	if err := results.WriteFitWorkbook(&book, rep); err != nil {
		t.Fatal(err)
	}
	f := openWritten(t, &book)
	if got := summaryItems(t, f)["control 2: stages"]; got != "from 2.500 up, above every gauging fitted|m" {
		t.Errorf("workbook: control 2 stages %q", got)
	}
}
