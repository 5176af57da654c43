package results

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"wetline/rating"
	"wetline/rating/gauged"
)

// FitTableColumns returns the columns of a fitted lookup table as CSV, in
// order. They are a contract with scripts; add columns after them.
func FitTableColumns() []string {
	return []string{"stage", "discharge", "extrapolated", "basis", "lower_95", "upper_95", "hydraulic"}
}

// ComparisonColumns returns the columns of a gauging comparison as CSV.
func ComparisonColumns() []string {
	return []string{"time", "stage", "discharge", "quality", "rated", "departure_percent", "shift",
		"outside_band", "factor_on_n", "n", "source"}
}

// GaugingTimeLayout is how gauging times are written.
const GaugingTimeLayout = "2006-01-02T15:04:05"

// WriteFitCSV writes the lookup table of a fit (FitTableColumns()),
// or, in comparison-only mode, the gaugings against the hydraulic rating
// (ComparisonColumns()). Stages are gauge heights; undefined values are
// empty cells. The CSV has no comment lines: the datum is stated by the
// text and JSON reports.
func WriteFitCSV(w io.Writer, r *gauged.Report) error {
	bw := bufio.NewWriter(w)
	if r.Table != nil {
		writeRecord(bw, FitTableColumns())
		for _, row := range r.Table.Rows {
			writeRecord(bw, []string{FormatFloat(row.Stage), FormatFloat(row.Discharge), fmt.Sprint(row.Extrapolated()),
				row.Basis.String(), FormatFloat(row.Lower), FormatFloat(row.Upper), FormatFloat(row.Hydraulic)})
		}
		return bw.Flush()
	}
	writeRecord(bw, ComparisonColumns())
	for i, g := range r.Gaugings {
		rec := []string{g.Time.Format(GaugingTimeLayout), FormatFloat(g.Stage), FormatFloat(g.Discharge), g.Quality.String()}
		if r.Comparison != nil {
			c := r.Comparison.Residuals[i]
			rec = append(rec, FormatFloat(c.Fitted), FormatFloat(c.DeparturePercent), FormatFloat(c.Shift), fmt.Sprint(c.OutsideBand))
		} else {
			rec = append(rec, "", "", "", "")
		}
		f, n := calPoint(r, i)
		rec = append(rec, FormatFloat(f), FormatFloat(n), fitCSVText(g.Source))
		writeRecord(bw, rec)
	}
	return bw.Flush()
}

// csvText quotes a CSV field when it needs it.
func fitCSVText(s string) string {
	if strings.ContainsAny(s, ",\"\n\r") {
		return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
	}
	return s
}

// calPoint returns gauging i's back-calculated factor and n (NaN without).
func calPoint(r *gauged.Report, i int) (float64, float64) {
	if r.Calibration == nil || i >= len(r.Calibration.Points) {
		return math.NaN(), math.NaN()
	}
	p := r.Calibration.Points[i]
	return p.Factor, p.N
}

type jsonSegment struct {
	FromStage     Float `json:"from_stage"`
	ToStage       Float `json:"to_stage"`
	Coefficient   Float `json:"coefficient"`
	CoefficientSE Float `json:"coefficient_standard_error"`
	ZeroFlowStage Float `json:"zero_flow_stage"`
	Exponent      Float `json:"exponent"`
	ExponentSE    Float `json:"exponent_standard_error"`
}

type jsonGauging struct {
	Time             string `json:"time"`
	Stage            Float  `json:"stage"`
	Discharge        Float  `json:"discharge"`
	Quality          string `json:"quality"`
	Note             string `json:"note"`
	Source           string `json:"source"`
	Fitted           Float  `json:"fitted"`
	DeparturePercent Float  `json:"departure_percent"`
	Shift            Float  `json:"shift"`
	OutsideBand      bool   `json:"outside_band"`
	Excluded         bool   `json:"excluded"`
	Hydraulic        Float  `json:"hydraulic"`
	HydDeparture     Float  `json:"hydraulic_departure_percent"`
	HydShift         Float  `json:"hydraulic_shift"`
	HydOutside       bool   `json:"hydraulic_outside_band"`
	FactorOnN        Float  `json:"factor_on_n"`
	N                Float  `json:"n"`
}

type jsonTableRow struct {
	Stage        Float  `json:"stage"`
	Discharge    Float  `json:"discharge"`
	Extrapolated bool   `json:"extrapolated"`
	Basis        string `json:"basis"`
	Lower        Float  `json:"lower_95"`
	Upper        Float  `json:"upper_95"`
	Hydraulic    Float  `json:"hydraulic"`
}

type jsonBreak struct {
	Stage Float `json:"stage"`
	SE    Float `json:"standard_error"`
	Fixed bool  `json:"fixed"`
}

// WriteFitJSON writes a gaugings report as one JSON object:
//
//	{"site","units","datum","slope","zero_flow":{...},"segments":[...],
//	 "breakpoints":[...],"standard_error_percent","gaugings":[...],
//	 "calibration":{...},"extrapolation":{...},"table":[...],
//	 "warnings":[...],"caution"}
//
// Each segment has from_stage, to_stage, coefficient, zero_flow_stage and
// exponent (with standard errors); each gauging stage, discharge, fitted,
// departure_percent and shift against the fit, and the same against the
// hydraulic rating; each table row stage, discharge and extrapolated.
// Stages are gauge heights. Parts that do not apply are null or empty.
func WriteFitJSON(w io.Writer, r *gauged.Report) error {
	out := struct {
		Site          string            `json:"site"`
		Units         map[string]string `json:"units"`
		Datum         Float             `json:"datum"`
		Slope         Float             `json:"slope"`
		ZeroFlow      any               `json:"zero_flow"`
		Segments      []jsonSegment     `json:"segments"`
		Breakpoints   []jsonBreak       `json:"breakpoints"`
		SEPercent     Float             `json:"standard_error_percent"`
		SELog         Float             `json:"standard_error_log"`
		Fitted        int               `json:"gaugings_fitted"`
		Params        int               `json:"parameters"`
		PoorFit       bool              `json:"poor_fit"`
		Gaugings      []jsonGauging     `json:"gaugings"`
		Calibration   any               `json:"calibration"`
		Extrapolation any               `json:"extrapolation"`
		Table         []jsonTableRow    `json:"table"`
		Warnings      []string          `json:"warnings"`
		Caution       string            `json:"caution"`
	}{Site: r.Site, Units: UnitNames(r.Units), Datum: Float(r.Datum), Slope: Float(r.Slope),
		Segments: []jsonSegment{}, Breakpoints: []jsonBreak{}, Table: []jsonTableRow{}, Gaugings: []jsonGauging{},
		SEPercent: Float(math.NaN()), SELog: Float(math.NaN()), Warnings: r.Warnings, Caution: rating.Caution}
	if out.Warnings == nil {
		out.Warnings = []string{}
	}
	if f := r.Fit; f != nil {
		out.ZeroFlow = map[string]any{"stage": Float(f.ZeroFlow), "standard_error": Float(f.ZeroFlowSE),
			"fixed": f.ZeroFlowFixed, "source": f.ZeroFlowSource}
		for _, s := range f.Segments {
			out.Segments = append(out.Segments, jsonSegment{Float(s.From), Float(s.To), Float(s.Coefficient), Float(s.CoefficientSE),
				Float(s.ZeroFlow), Float(s.Exponent), Float(s.ExponentSE)})
		}
		for i, b := range f.Breaks {
			out.Breakpoints = append(out.Breakpoints, jsonBreak{Float(b), Float(f.BreaksSE[i]), f.BreaksFixed})
		}
		out.SEPercent, out.SELog = Float(f.StandardErrorPercent), Float(f.StandardErrorLog)
		out.Fitted, out.Params, out.PoorFit = f.N, f.Params, f.PoorFit
	}
	for i, g := range r.Gaugings {
		nan := Float(math.NaN())
		jg := jsonGauging{Time: g.Time.Format(GaugingTimeLayout), Stage: Float(g.Stage), Discharge: Float(g.Discharge),
			Quality: g.Quality.String(), Note: g.Note, Source: g.Source,
			Fitted: nan, DeparturePercent: nan, Shift: nan, Hydraulic: nan, HydDeparture: nan, HydShift: nan}
		if r.Fit != nil {
			res := r.Fit.Residuals[i]
			jg.Fitted, jg.DeparturePercent, jg.Shift = Float(res.Fitted), Float(res.DeparturePercent), Float(res.Shift)
			jg.OutsideBand, jg.Excluded = res.OutsideBand, res.Excluded
		}
		if r.Comparison != nil {
			c := r.Comparison.Residuals[i]
			jg.Hydraulic, jg.HydDeparture, jg.HydShift, jg.HydOutside = Float(c.Fitted), Float(c.DeparturePercent), Float(c.Shift), c.OutsideBand
		}
		f, n := calPoint(r, i)
		jg.FactorOnN, jg.N = Float(f), Float(n)
		out.Gaugings = append(out.Gaugings, jg)
	}
	if c := r.Calibration; c != nil {
		out.Calibration = map[string]any{"factor": Float(c.Factor), "channel_only": c.ChannelOnly,
			"standard_error_percent": Float(c.StandardErrorPercent)}
	}
	if t := r.Table; t != nil {
		out.Extrapolation = map[string]any{"scale_factor": Float(t.ScaleFactor), "scale_stage": Float(t.ScaleStage), "note": t.ScaleNote}
		for _, row := range t.Rows {
			out.Table = append(out.Table, jsonTableRow{Float(row.Stage), Float(row.Discharge), row.Extrapolated(), row.Basis.String(),
				Float(row.Lower), Float(row.Upper), Float(row.Hydraulic)})
		}
	}
	return writeJSON(w, out)
}

// WriteFitText writes a gaugings report for reading: the datum,
// the fitted equation with standard errors, every gauging's departures,
// the back-calculated n, the lookup table with extrapolated rows marked,
// the warnings and the caution.
func WriteFitText(w io.Writer, r *gauged.Report) error {
	bw := bufio.NewWriter(w)
	u := r.Units
	L, Q := u.Length(), u.Discharge()
	p := func(format string, a ...any) { fmt.Fprintf(bw, format, a...) }
	title := "Gaugings"
	if r.Site != "" {
		title += " at " + r.Site
	}
	p("%s: %d measurements, %s units\n", title, len(r.Gaugings), u)
	if r.Comparison != nil {
		p("Gauge datum: elevation = gauge height + %s %s (--datum); hydraulic rating at slope %g\n", FormatFloat(r.Datum), L, r.Slope)
	} else {
		p("Gauge datum: stages are gauge heights as read; no section given, so no hydraulic rating\n")
	}
	if f := r.Fit; f != nil {
		p("\nFitted rating, Q = C·(h − e)^b (h gauge height in %s, Q in %s), %d segment(s), %d gaugings, %d parameters:\n",
			L, Q, len(f.Segments), f.N, f.Params)
		if f.ZeroFlowFixed {
			p("  e = %.4f %s (%s)\n", f.ZeroFlow, L, f.ZeroFlowSource)
		} else {
			p("  e = %.4f ± %s %s (fitted)\n", f.ZeroFlow, sig(f.ZeroFlowSE, 2), L)
		}
		for i, b := range f.Breaks {
			if f.BreaksFixed {
				p("  breakpoint %d at %.4f %s (given)\n", i+1, b, L)
			} else {
				p("  breakpoint %d at %.4f ± %s %s\n", i+1, b, sig(f.BreaksSE[i], 2), L)
			}
		}
		for i, s := range f.Segments {
			p("  segment %d, %.3f to %.3f %s: C = %s ± %s, b = %.4f ± %s\n", i+1, s.From, s.To, L,
				sig(s.Coefficient, 5), sig(s.CoefficientSE, 2), s.Exponent, sig(s.ExponentSE, 2))
		}
		p("  standard error of estimate %.2f %% (%.4f in ln Q)\n", f.StandardErrorPercent, f.StandardErrorLog)
		if !math.IsNaN(f.MoreSegmentsP) {
			p("  one more segment: F = %.2f, p = %.3g (poor fit below p = %g)\n", f.MoreSegmentsF, f.MoreSegmentsP, gauged.PoorFitLevel)
		}
	}
	p("\nGaugings (departure = 100·(measured − curve)/curve; shift = what to add to the gauge height for the curve to pass through it; * outside its quality band):\n")
	p("  %-19s %9s %10s %-9s", "time", "stage", "discharge", "quality")
	if r.Fit != nil {
		p(" %10s %8s %8s", "fitted", "dep. %", "shift")
	}
	if r.Comparison != nil {
		p(" %10s %8s %8s %8s %7s", "hydraulic", "dep. %", "shift", "n factor", "n")
	}
	p("\n")
	for i, g := range r.Gaugings {
		p("  %-19s %9.3f %10s %-9s", g.Time.Format(GaugingTimeLayout), g.Stage, sig(g.Discharge, 5), g.Quality)
		if r.Fit != nil {
			res := r.Fit.Residuals[i]
			p(" %10s %7s%s %8s", sig(res.Fitted, 5), fixed(res.DeparturePercent, 1), fitStar(res.OutsideBand), fixed(res.Shift, 3))
		}
		if r.Comparison != nil {
			c := r.Comparison.Residuals[i]
			f, n := calPoint(r, i)
			p(" %10s %7s%s %8s %8s %7s", sig(c.Fitted, 5), fixed(c.DeparturePercent, 1), fitStar(c.OutsideBand), fixed(c.Shift, 3), fixed(f, 3), fixed(n, 4))
		}
		p("\n")
	}
	if c := r.Comparison; c != nil {
		p("Against the hydraulic rating: geometric mean departure %s %%, %d of %d outside their quality bands\n",
			fixed(c.MeanLogDeparturePercent, 1), c.Outside, len(c.Residuals))
	}
	if c := r.Calibration; c != nil {
		which := "every subsection's n"
		if c.ChannelOnly {
			which = "the channel's n"
		}
		p("Best factor on %s (least squares in ln Q): %.4f; the calibrated rating's standard error %s %%\n",
			which, c.Factor, fixed(c.StandardErrorPercent, 2))
		pts := append([]gauged.NPoint(nil), c.Points...)
		sort.SliceStable(pts, func(i, j int) bool { return pts[i].Stage < pts[j].Stage })
		p("\nBack-calculated n against stage (n of the scaled subsection carrying the most conveyance):\n")
		p("  %9s %9s %8s\n", "stage", "factor", "n")
		for _, pt := range pts {
			p("  %9.3f %9s %8s\n", pt.Stage, fixed(pt.Factor, 4), fixed(pt.N, 4))
		}
	}
	if t := r.Table; t != nil {
		p("\nLookup table (gauge height %s, discharge %s; x = extrapolated: below the lowest gauging on the fit, above the highest on the scaled hydraulic rating):\n", L, Q)
		if t.ScaleNote != "" {
			p("  %s\n", t.ScaleNote)
		}
		p("  %9s %11s %11s %11s  %s\n", "stage", "discharge", "lower 95%", "upper 95%", "basis")
		for _, row := range t.Rows {
			mark := " "
			if row.Extrapolated() {
				mark = "x"
			}
			p("  %9.3f %11s %11s %11s %s %s\n", row.Stage, sig(row.Discharge, 5), sig(row.Lower, 5), sig(row.Upper, 5), mark, row.Basis)
		}
	}
	if len(r.Warnings) > 0 {
		p("\n")
		for _, s := range r.Warnings {
			p("warning: %s\n", s)
		}
	}
	p("\ncaution: %s\n", rating.Caution)
	return bw.Flush()
}

func fitStar(b bool) string {
	if b {
		return "*"
	}
	return " "
}
