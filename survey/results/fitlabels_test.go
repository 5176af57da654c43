package results_test

import (
	"bytes"
	"encoding/json"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
	"wetline/survey/results"
)

// labelGaugings are gaugings of Q = 8·(h − 0.3)^2 (invented) at the
// stages, with a small fixed scatter so a fit has a standard error.
func labelGaugings(stages []float64) []gauged.Gauging {
	t0 := time.Date(2024, 1, 1, 9, 0, 0, 0, time.UTC)
	var gs []gauged.Gauging
	for i, h := range stages {
		q := 8 * math.Pow(h-0.3, 2) * (1 + 0.02*math.Sin(float64(7*i)))
		gs = append(gs, gauged.Gauging{Time: t0.AddDate(0, i, 0), Stage: h, Discharge: q, Quality: rating.Good})
	}
	return gs
}

// The fit's labels in the text report, the console summary and the
// workbook: a given breakpoint has no ±; the standard error of estimate
// is called the weighted one with its degrees of freedom (n − p of the
// rating), or says why it is not defined (no more gaugings than
// parameters); the summary counts the gaugings fitted of those read.
func TestFitLabels(t *testing.T) {
	many := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.4, 2.6})
	selected := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.4, 2.6})
	selected[2].Exclude, selected[9].Exclude = "weed", "weed"
	for _, tc := range []struct {
		name      string
		gs        []gauged.Gauging
		opt       gauged.Options
		text, not []string // in the text report, and not
		summary   string   // in the console summary
		items     map[string]string
	}{
		{
			name: "least squares, breakpoint given", gs: many,
			opt: gauged.Options{Controls: gauged.ControlOptions{Breaks: []float64{1.5}}},
			// 14 gaugings, 5 parameters (A, B, C of control 1; A, C of
			// control 2 with its breakpoint given).
			text:    []string{"breakpoint 1.5000 m (given)", "weighted standard error of estimate ", " in ln Q, 9 degrees of freedom)"},
			not:     []string{"± -", "± NaN"},
			summary: "wrote out: 14 gaugings;",
			items:   map[string]string{"degrees of freedom of the standard error of estimate": "9|"},
		},
		{
			// A Bayesian fit moves the remnant error too: 4 parameters
			// beside 14 − 3 = 11 degrees of freedom, which the count says.
			name: "Bayesian, parameters beside degrees of freedom", gs: many,
			opt:     gauged.Options{Method: gauged.Bayesian, Bayes: gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}},
			text:    []string{"14 gaugings, 4 parameters (3 of the rating and the remnant error)", " in ln Q, 11 degrees of freedom)"},
			summary: "(11 degrees of freedom)",
		},
		{
			name: "least squares, two gaugings left out", gs: selected,
			text:    []string{" in ln Q, 9 degrees of freedom)"},
			summary: "wrote out: 12 gaugings fitted of 14 read;",
			items:   map[string]string{"degrees of freedom of the standard error of estimate": "9|"},
		},
		{
			// Three gaugings for the three parameters of one control
			// (A, B, C; the remnant error is no parameter of the rating).
			name: "Bayesian, as many gaugings as parameters", gs: labelGaugings([]float64{0.6, 1.2, 2.0}),
			opt: gauged.Options{Method: gauged.Bayesian, Bayes: gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}},
			text: []string{"weighted standard error of estimate not defined: 3 gaugings for 3 parameters of the rating, the remnant error aside",
				"3 gaugings, 4 parameters (3 of the rating and the remnant error)"},
			not:     []string{"- % (- in ln Q)"},
			summary: "weighted standard error not defined (3 gaugings for 3 parameters of the rating)",
			items: map[string]string{"weighted standard error of estimate": "not defined: 3 gaugings for 3 parameters of the rating, " +
				"the remnant error aside (it needs more gaugings than parameters)|"},
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			tc.opt.Site, tc.opt.Units = "test", rating.SI
			rep, err := gauged.Analyze(tc.gs, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			var text, sum, book bytes.Buffer
			if err := results.WriteFitText(&text, rep); err != nil {
				t.Fatal(err)
			}
			for _, w := range tc.text {
				if !strings.Contains(text.String(), w) {
					t.Errorf("text lacks %q", w)
				}
			}
			for _, w := range tc.not {
				if strings.Contains(text.String(), w) {
					t.Errorf("text has %q", w)
				}
			}
			if err := results.WriteFitSummary(&sum, rep, "out"); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(sum.String(), tc.summary) {
				t.Errorf("summary %q lacks %q", sum.String(), tc.summary)
			}
			if err := results.WriteFitWorkbook(&book, rep); err != nil {
				t.Fatal(err)
			}
			items := summaryItems(t, openWritten(t, &book))
			for k, v := range tc.items {
				if items[k] != v {
					t.Errorf("workbook item %q = %q, want %q", k, items[k], v)
				}
			}
			if f := rep.Fit; f.StandardErrorDF > 0 {
				v, unit, _ := strings.Cut(items["weighted standard error of estimate"], "|")
				if got, err := strconv.ParseFloat(v, 64); err != nil || unit != "%" || got != reported(f.StandardErrorPercent, false) {
					t.Errorf("workbook standard error %q %q, want %g %%", v, unit, f.StandardErrorPercent)
				}
			}
		})
	}
}

// A report with a section goes by its gaugings (Options.Site) and names
// the section as the section: the text report's title and gauge datum
// line, the workbook's summary and the JSON's section key.
func TestFitNamesSectionAsSection(t *testing.T) {
	sh, err := subdivide.ParseShape("trapezoid:bottom=10,side=2,height=5")
	if err != nil {
		t.Fatal(err)
	}
	g, err := sh.Build(subdivide.PerRegion{Channel: 0.035})
	if err != nil {
		t.Fatal(err)
	}
	hyd := rating.HydraulicCurve{Geometry: g, Options: rating.Options{Slope: 0.001}}
	gs := labelGaugings([]float64{0.5, 0.7, 0.9, 1.1, 1.3, 1.5})
	rep, err := gauged.Analyze(gs, gauged.Options{Site: "brook-gaugings", Section: "brook-xs", Units: rating.SI, Hydraulic: &hyd, DatumGiven: true})
	if err != nil {
		t.Fatal(err)
	}
	var text, js, book bytes.Buffer
	if err := results.WriteFitText(&text, rep); err != nil {
		t.Fatal(err)
	}
	for _, w := range []string{"Gaugings at brook-gaugings: 6 measurements", "hydraulic rating of section brook-xs at slope 0.001"} {
		if !strings.Contains(text.String(), w) {
			t.Errorf("text lacks %q", w)
		}
	}
	if err := results.WriteFitJSON(&js, rep); err != nil {
		t.Fatal(err)
	}
	var obj map[string]any
	if err := json.Unmarshal(js.Bytes(), &obj); err != nil {
		t.Fatal(err)
	}
	if obj["site"] != "brook-gaugings" || obj["section"] != "brook-xs" || obj["hydraulic_source"] != "section brook-xs" {
		t.Errorf("JSON site %v, section %v, hydraulic source %v", obj["site"], obj["section"], obj["hydraulic_source"])
	}
	if err := results.WriteFitWorkbook(&book, rep); err != nil {
		t.Fatal(err)
	}
	items := summaryItems(t, openWritten(t, &book))
	if items["site"] != "brook-gaugings|" || items["section"] != "brook-xs|" {
		t.Errorf("workbook site %q, section %q", items["site"], items["section"])
	}
}

// A least-squares fit whose gaugings do not determine every parameter
// (the delta method's JᵀWJ singular, as a fit of the Patuxent gaugings
// with breakpoints 7,12 ft was before its runaway exponent was refused) has
// no standard errors: the text says each offset is fitted, or set by
// continuity at its breakpoint, and says once why no standard errors are
// given, instead of "(held)" beside a fitted offset and "± -" beside
// every value. An offset held by --zero-flow is still "(held)".
func TestFitTextSaysFittedWithoutStandardErrors(t *testing.T) {
	gs := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.4, 2.6})
	for _, tc := range []struct {
		name      string
		opt       gauged.ControlOptions
		text, not []string
	}{
		{"fitted offset", gauged.ControlOptions{Breaks: []float64{1.5}},
			[]string{"B = 0.3", " m (fitted), C = ", " m (by continuity at its breakpoint), C = ", "  no standard errors: the gaugings do not determine every parameter"},
			[]string{"(held)", "± -", "± NaN"}},
		{"held offset", gauged.ControlOptions{Breaks: []float64{1.5}, OffsetFixed: true, Offset: 0.3},
			[]string{"B = 0.3000 m (held), C = ", " m (by continuity at its breakpoint), C = "},
			[]string{"(fitted)", "± -"}},
	} {
		rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Method: gauged.LeastSquares, Controls: tc.opt})
		if err != nil {
			t.Fatal(err)
		}
		f := rep.Fit
		f.NoStandardErrors = "the gaugings do not determine every parameter (the matrix JᵀWJ of the delta method is singular)"
		for j := range f.Controls {
			c := &f.Controls[j]
			c.ASE, c.BSE, c.CSE, c.FromSE = math.NaN(), math.NaN(), math.NaN(), math.NaN()
		}
		var text bytes.Buffer
		if err := results.WriteFitText(&text, rep); err != nil {
			t.Fatal(err)
		}
		for _, w := range tc.text {
			if !strings.Contains(text.String(), w) {
				t.Errorf("%s: text lacks %q", tc.name, w)
			}
		}
		for _, w := range tc.not {
			if strings.Contains(text.String(), w) {
				t.Errorf("%s: text has %q", tc.name, w)
			}
		}
	}
}

// Johnson's estimate reads alike in the text, the JSON and the workbook:
// a determined estimate with its 95 % uncertainty (2 × 0.0125 = 0.025 m,
// by hand) in all three; one not determined gives its note in the text
// and the workbook and "ok": false beside "determined": false in the
// JSON, where "ok" claimed the check was made.
func TestJohnsonAgreesInTextJSONWorkbook(t *testing.T) {
	gs := labelGaugings([]float64{0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.4, 2.6})
	for _, tc := range []struct {
		name       string
		j          gauged.JohnsonEstimate
		text, item string
		ok         bool
	}{
		{"determined", gauged.JohnsonEstimate{OK: true, ZeroFlow: 0.31, ZeroFlowSE: 0.025 / gauged.CoverageFactor95,
			Q1: 0.5, Q2: 2, Q3: 8, G1: 0.55, G2: 0.8, G3: 1.3},
			"e = 0.3100 ± 0.025 m (95 %)", "0.025|m", true},
		{"not determined", gauged.JohnsonEstimate{OK: true, Undetermined: true, ZeroFlow: 0.61, ZeroFlowSE: 0.17, Note: "not determined: e = 0.61 ± 0.34 m (95 %)",
			Q1: 0.5, Q2: 2, Q3: 8, G1: 0.55, G2: 0.8, G3: 1.3},
			"not determined: e = 0.61 ± 0.34 m (95 %)", "", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI})
			if err != nil {
				t.Fatal(err)
			}
			rep.Fit.Johnson = tc.j
			var text, js, book bytes.Buffer
			if err := results.WriteFitText(&text, rep); err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(text.String(), tc.text) || strings.Contains(text.String(), "± -") {
				t.Errorf("text lacks %q:\n%s", tc.text, text.String())
			}
			if err := results.WriteFitJSON(&js, rep); err != nil {
				t.Fatal(err)
			}
			var obj struct {
				Johnson struct {
					OK         bool `json:"ok"`
					Determined bool `json:"determined"`
				} `json:"johnson"`
			}
			if err := json.Unmarshal(js.Bytes(), &obj); err != nil {
				t.Fatal(err)
			}
			if obj.Johnson.OK != tc.ok || obj.Johnson.Determined != tc.ok {
				t.Errorf("JSON johnson ok %v, determined %v, want both %v", obj.Johnson.OK, obj.Johnson.Determined, tc.ok)
			}
			if err := results.WriteFitWorkbook(&book, rep); err != nil {
				t.Fatal(err)
			}
			items := summaryItems(t, openWritten(t, &book))
			if got := items["Johnson's zero-flow stage, uncertainty at 95 % (±)"]; got != tc.item {
				t.Errorf("workbook ± %q, want %q", got, tc.item)
			}
		})
	}
}
