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
// order. They are a contract with scripts: the first seven are those of
// earlier versions (lower_95 and upper_95 the band of the relation, as
// parametric_lower_95 and parametric_upper_95); new columns come after.
func FitTableColumns() []string {
	return []string{"stage", "discharge", "extrapolated", "basis", "lower_95", "upper_95", "hydraulic",
		"parametric_lower_95", "parametric_upper_95", "total_lower_95", "total_upper_95", "gauged_multiple"}
}

// ComparisonColumns returns the columns of a gauging comparison as CSV:
// the first eleven as in earlier versions, then the uncertainty a fit
// would give each gauging and its exclude text.
func ComparisonColumns() []string {
	return []string{"time", "stage", "discharge", "quality", "rated", "departure_percent", "shift",
		"outside_band", "factor_on_n", "n", "source", "uncertainty_percent", "exclude"}
}

// WriteFitCSV writes the table of a fit (FitTableColumns()), or, in
// comparison-only mode, the gaugings against the hydraulic rating
// (ComparisonColumns()). Stages are gauge heights; undefined values are
// empty cells. The CSV has no comment lines: the datum, the method and
// the uncertainty convention are stated by the text and JSON reports.
func WriteFitCSV(w io.Writer, r *gauged.Report) error {
	bw := bufio.NewWriter(w)
	if r.Table != nil {
		writeRecord(bw, FitTableColumns())
		for _, row := range r.Table.Rows {
			writeRecord(bw, []string{FormatFloat(row.Stage), FormatFloat(row.Discharge), fmt.Sprint(row.Extrapolated()),
				row.Basis.String(), FormatFloat(row.ParametricLower), FormatFloat(row.ParametricUpper), FormatFloat(row.Hydraulic),
				FormatFloat(row.ParametricLower), FormatFloat(row.ParametricUpper), FormatFloat(row.TotalLower), FormatFloat(row.TotalUpper),
				FormatFloat(row.Multiple)})
		}
		return bw.Flush()
	}
	writeRecord(bw, ComparisonColumns())
	for i, g := range r.Gaugings {
		rec := []string{gauged.TimeText(g.Time, r.UTCOffset), FormatFloat(g.Stage), FormatFloat(g.Discharge), g.Quality.String()}
		if r.Comparison != nil {
			c := r.Comparison.Residuals[i]
			rec = append(rec, FormatFloat(c.Fitted), FormatFloat(c.DeparturePercent), FormatFloat(c.Shift), fmt.Sprint(c.OutsideBand))
		} else {
			rec = append(rec, "", "", "", "")
		}
		f, n := calPoint(r, i)
		rec = append(rec, FormatFloat(f), FormatFloat(n), fitCSVText(g.Source), FormatFloat(g.UncertaintyPercent()), fitCSVText(g.Exclude))
		writeRecord(bw, rec)
	}
	return bw.Flush()
}

// fitCSVText quotes a CSV field when it needs it.
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

// segmentTo is where control j of a fit stops: the next breakpoint, or
// the highest gauging fitted for the top control; NaN for a top control
// that starts at or above it (a control with its prior from the survey
// may lie wholly above the gaugings), which has no gauged top.
func segmentTo(f *gauged.ControlFit, j int) float64 {
	if j+1 < len(f.Controls) {
		return f.Controls[j+1].From
	}
	if !(f.HighStage > f.Controls[j].From) {
		return math.NaN()
	}
	return f.HighStage
}

// segmentStages words the stages of control j in length unit L ("" for
// none): "FROM to TO", or "from FROM up, above every gauging fitted" for a
// top control with no gauged top, so a range never reads backwards.
func segmentStages(f *gauged.ControlFit, j int, L string) string {
	from, to := f.Controls[j].From, segmentTo(f, j)
	unit := ""
	if L != "" {
		unit = " " + L
	}
	if math.IsNaN(to) {
		return fmt.Sprintf("from %.3f%s up, above every gauging fitted", from, unit)
	}
	return fmt.Sprintf("%.3f to %.3f%s", from, to, unit)
}

// exponentBounds are the exponents control j may take without a warning.
func exponentBounds(f *gauged.ControlFit, j int) (lo, hi float64) {
	if j < len(f.Exponents) {
		return f.Exponents[j].Low, f.Exponents[j].High
	}
	return gauged.ExponentRange(f.Controls[j].Kind)
}

// priorSource says where control j's prior came from ("" for least
// squares).
func priorSource(f *gauged.ControlFit, j int) string {
	if f.Posterior == nil || j >= len(f.Posterior.PriorSources) {
		return ""
	}
	return f.Posterior.PriorSources[j]
}

type jsonSegment struct {
	FromStage     Float  `json:"from_stage"`
	ToStage       Float  `json:"to_stage"`
	Coefficient   Float  `json:"coefficient"`
	CoefficientSE Float  `json:"coefficient_standard_error"`
	ZeroFlowStage Float  `json:"zero_flow_stage"`
	Exponent      Float  `json:"exponent"`
	ExponentSE    Float  `json:"exponent_standard_error"`
	ZeroFlowSE    Float  `json:"zero_flow_standard_error"`
	FromSE        Float  `json:"from_stage_standard_error"`
	Control       string `json:"control"`
	Kind          string `json:"kind"`
	ExponentLow   Float  `json:"exponent_low"`
	ExponentHigh  Float  `json:"exponent_high"`
	Prior         string `json:"prior"`
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
	Uncertainty      Float  `json:"uncertainty_percent"`
	UncertaintyGiven Float  `json:"uncertainty_column"`
	ExcludedReason   string `json:"excluded_reason"`
	LogResidual      Float  `json:"log_residual"`
	Weight           Float  `json:"weight"`
}

type jsonTableRow struct {
	Stage           Float  `json:"stage"`
	Discharge       Float  `json:"discharge"`
	Extrapolated    bool   `json:"extrapolated"`
	Basis           string `json:"basis"`
	Lower           Float  `json:"lower_95"`
	Upper           Float  `json:"upper_95"`
	Hydraulic       Float  `json:"hydraulic"`
	ParametricLower Float  `json:"parametric_lower_95"`
	ParametricUpper Float  `json:"parametric_upper_95"`
	TotalLower      Float  `json:"total_lower_95"`
	TotalUpper      Float  `json:"total_upper_95"`
	Multiple        Float  `json:"gauged_multiple"`
	// OverbankShare is the overbanks' share of conveyance at the row's
	// stage, on rows of the conveyance-slope extension (null on others):
	// with join_overbank_share it gives the row's allowance for n.
	OverbankShare Float `json:"overbank_share"`
}

type jsonBreak struct {
	Stage Float `json:"stage"`
	SE    Float `json:"standard_error"`
	Fixed bool  `json:"fixed"`
}

type jsonParam struct {
	Name      string `json:"name"`
	Mean      Float  `json:"mean"`
	SD        Float  `json:"sd"`
	P2_5      Float  `json:"p2_5"`
	P50       Float  `json:"p50"`
	P97_5     Float  `json:"p97_5"`
	PriorMean Float  `json:"prior_mean"`
	PriorSD   Float  `json:"prior_sd"`
	RHat      Float  `json:"rhat"`
	ESS       Float  `json:"ess"`
	Derived   bool   `json:"derived"`
}

type jsonPosterior struct {
	Parameters      []jsonParam `json:"parameters"`
	RHatMax         Float       `json:"rhat_max"`
	RHatParameter   string      `json:"rhat_parameter"`
	ESSMin          Float       `json:"ess_min"`
	ESSParameter    string      `json:"ess_parameter"`
	Acceptance      Float       `json:"acceptance"`
	ChainAcceptance []Float     `json:"chain_acceptance"`
	Converged       bool        `json:"converged"`
	RHatLimit       Float       `json:"rhat_limit"`
	Chains          int         `json:"chains"`
	Draws           int         `json:"draws_per_chain"`
	Pilot           int         `json:"pilot_per_chain"`
	Seed            uint64      `json:"seed"`
	Modes           int         `json:"modes"`
	Likelihood      string      `json:"likelihood"`
	PriorSources    []string    `json:"prior_sources"`
}

type jsonTest struct {
	N         int   `json:"n"`
	Statistic Float `json:"statistic"`
	P         Float `json:"p"`
	Failed    bool  `json:"failed"`
}

type jsonTests struct {
	Level Float    `json:"level"`
	Sign  jsonTest `json:"sign"`
	Runs  jsonTest `json:"runs"`
	Mean  jsonTest `json:"mean_departure"`
}

type jsonJohnson struct {
	// OK: the estimate was made and is determined, so it checks the
	// offset (as Determined; false when not made or not determined).
	OK            bool   `json:"ok"`
	ZeroFlowStage Float  `json:"zero_flow_stage"`
	Q1            Float  `json:"q1"`
	Q2            Float  `json:"q2"`
	Q3            Float  `json:"q3"`
	G1            Float  `json:"g1"`
	G2            Float  `json:"g2"`
	G3            Float  `json:"g3"`
	Note          string `json:"note"`
	// StandardError is the standard error of zero_flow_stage and
	// Determined whether it is small enough for the check (appended keys).
	StandardError Float `json:"standard_error"`
	Determined    bool  `json:"determined"`
}

type jsonMore struct {
	Made      bool  `json:"made"`
	Controls  int   `json:"controls"`
	F         Float `json:"f"`
	P         Float `json:"p"`
	SEPercent Float `json:"standard_error_percent"`
	Poor      bool  `json:"poor"`
}

type jsonSelection struct {
	From     string   `json:"period_from"`
	To       string   `json:"period_to"`
	Exclude  []string `json:"exclude_times"`
	Fitted   int      `json:"fitted"`
	Excluded int      `json:"excluded"`
}

type jsonExtrapolation struct {
	ScaleFactor     Float           `json:"scale_factor"`
	ScaleStage      Float           `json:"scale_stage"`
	Note            string          `json:"note"`
	LargestGauged   Float           `json:"largest_gauged_discharge"`
	MaxMultiple     Float           `json:"max_gauged_multiple"`
	WarnMultiple    Float           `json:"warn_gauged_multiple"`
	ConveyanceSlope *jsonConveyance `json:"conveyance_slope"`
}

type jsonConveyance struct {
	Gaugings   int   `json:"gaugings"`
	Level      bool  `json:"level"`
	LogSlope   Float `json:"log_slope"`
	LogSlopeSE Float `json:"log_slope_standard_error"`
	Trend      Float `json:"trend"`
	TrendSE    Float `json:"trend_standard_error"`
	Centre     Float `json:"centre_stage"`
	TrendP     Float `json:"trend_p"`
	ScatterLog Float `json:"scatter_log"`
	// The join with the fitted rating at the highest gauging: ln S there
	// is join_log_slope and above it ln S = join_log_slope + trend·(h −
	// join_stage) (null when not joined).
	JoinStage      Float `json:"join_stage"`
	JoinDischarge  Float `json:"join_discharge"`
	JoinConveyance Float `json:"join_conveyance"`
	JoinLogSlope   Float `json:"join_log_slope"`
	// The inputs of the bands' allowances above the join (appended keys):
	// the slope's t·½·(h − join_stage)·line_trend_standard_error, t
	// Student's quantile on line_trend_degrees_of_freedom, and n's
	// z·|φ(h) − join_overbank_share|·n_log_sd, n_log_sd = √(ln(1 +
	// n_cv²)) (both null when the reference has no overbanks: no such
	// allowance).
	LineTrendSE       Float `json:"line_trend_standard_error"`
	LineTrendT        Float `json:"line_trend_t"`
	LineTrendDF       int   `json:"line_trend_degrees_of_freedom"`
	NCV               Float `json:"n_cv"`
	NLogSD            Float `json:"n_log_sd"`
	JoinOverbankShare Float `json:"join_overbank_share"`
}

type jsonControl struct {
	Kind    string `json:"kind"`
	Control string `json:"control"`
	A       Float  `json:"coefficient"`
	B       Float  `json:"zero_flow_stage"`
	C       Float  `json:"exponent"`
	From    Float  `json:"from_stage"`
}

// jsonFitReport is the JSON object of a gaugings report, in the key
// order of its contract: the keys of earlier versions first, new keys
// after the table.
type jsonFitReport struct {
	Site          string              `json:"site"`
	Units         JSONUnits           `json:"units"`
	Datum         Float               `json:"datum"`
	Slope         Float               `json:"slope"`
	ZeroFlow      *jsonZeroFlow       `json:"zero_flow"`
	Segments      []jsonSegment       `json:"segments"`
	Breakpoints   []jsonBreak         `json:"breakpoints"`
	SEPercent     Float               `json:"standard_error_percent"`
	SELog         Float               `json:"standard_error_log"`
	Fitted        int                 `json:"gaugings_fitted"`
	Params        int                 `json:"parameters"`
	PoorFit       bool                `json:"poor_fit"`
	Gaugings      []jsonGauging       `json:"gaugings"`
	Calibration   *jsonFitCalibration `json:"calibration"`
	Extrapolation *jsonExtrapolation  `json:"extrapolation"`
	Table         []jsonTableRow      `json:"table"`
	Method        string              `json:"method"`
	Convention    string              `json:"uncertainty_convention"`
	HydSource     string              `json:"hydraulic_source"`
	BankStage     Float               `json:"bank_stage"`
	Floodplain    bool                `json:"floodplain_added"`
	Selection     jsonSelection       `json:"selection"`
	BandNote      string              `json:"band_note"`
	BandsWithheld bool                `json:"bands_withheld"`
	MoreControls  *jsonMore           `json:"more_controls"`
	Tests         *jsonTests          `json:"relation_tests"`
	Johnson       *jsonJohnson        `json:"johnson"`
	Posterior     *jsonPosterior      `json:"posterior"`
	Prior         []jsonControl       `json:"prior_rating"`
	Warnings      []string            `json:"warnings"`
	Caution       string              `json:"caution"`
	SiteMetadata  *jsonSite           `json:"site_metadata"`
	Section       string              `json:"section"`
	InputNotes    []string            `json:"input_notes,omitempty"`
}

// WriteFitJSON writes a gaugings report as one JSON object:
//
//	{"site","units","datum","slope","zero_flow":{...},"segments":[...],
//	 "breakpoints":[...],"standard_error_percent","standard_error_log",
//	 "gaugings_fitted","parameters","poor_fit","gaugings":[...],
//	 "calibration":{...},"extrapolation":{...},"table":[...],
//	 "method","uncertainty_convention","hydraulic_source","bank_stage",
//	 "floodplain_added",
//	 "selection":{...},"band_note","bands_withheld","more_controls":{...},
//	 "relation_tests":{...},"johnson":{...},"posterior":{...},
//	 "prior_rating":[...],"warnings":[...],"caution","site_metadata":{...},
//	 "section"}
//
// zero_flow has fixed, source, stage and standard_error; calibration
// (with a section, else null) channel_only, factor, standard_error_percent
// and factor_standard_error_percent. Each segment (one per control) has
// from_stage, to_stage (the next
// breakpoint, or the highest gauging fitted; null for a top control
// starting above every gauging fitted), coefficient,
// its own zero_flow_stage and exponent (with standard errors), control
// (replace or add), kind (section, channel, unknown) and the exponent
// range of its kind; each gauging stage, discharge, fitted,
// departure_percent, shift, excluded with its excluded_reason, and its
// uncertainty_percent; each table row stage, discharge, extrapolated,
// basis, the parametric and total 95 % bands (lower_95 and upper_95 repeat
// the parametric band, as in earlier versions) and gauged_multiple;
// posterior (Bayesian only, else null) parameters[] with name, mean, sd,
// p2_5, p50, p97_5, prior_mean, prior_sd, and rhat_max, ess_min,
// acceptance. site is the name the report goes by (the gaugings file's;
// before this version, with a section, the section's); section the
// section's name ("" without); site_metadata what is known of the site
// (name, id, surveyed, datum, crew; null when nothing). Stages are gauge
// heights.
// Parts that do not apply are null or empty; undefined numbers are null.
func WriteFitJSON(w io.Writer, r *gauged.Report) error {
	out := jsonFitReport{Site: r.Site, Section: r.Section, InputNotes: r.Provenance.Notes, SiteMetadata: siteJSON(r.Provenance.Site), Units: UnitNames(r.Units), Datum: Float(r.Datum), Slope: Float(r.Slope),
		Segments: []jsonSegment{}, Breakpoints: []jsonBreak{}, Table: []jsonTableRow{}, Gaugings: []jsonGauging{},
		SEPercent: Float(math.NaN()), SELog: Float(math.NaN()), Warnings: nonNil(r.Warnings), Caution: rating.Caution,
		Convention: gauged.UncertaintyConvention(), HydSource: r.HydraulicSource, BankStage: Float(r.BankStage), Floodplain: r.FloodplainAdded,
		Selection: jsonSelectionOf(r)}
	if f := r.Fit; f != nil {
		fillJSONFit(&out, r, f)
	}
	for i, g := range r.Gaugings {
		out.Gaugings = append(out.Gaugings, jsonGaugingOf(r, i, g))
	}
	if c := r.Calibration; c != nil {
		out.Calibration = &jsonFitCalibration{Factor: Float(c.Factor), FactorStandardErrorPercent: Float(c.FactorStandardErrorPercent),
			StandardErrorPercent: Float(c.StandardErrorPercent), ChannelOnly: c.ChannelOnly}
	}
	if t := r.Table; t != nil {
		out.Extrapolation = jsonExtrapolationOf(r, t)
		out.BandNote, out.BandsWithheld = t.BandNote, t.BandsWithheld
		for _, row := range t.Rows {
			share := math.NaN()
			if row.Basis == gauged.ConveyanceSlopeAbove {
				share = row.OverbankShare
			}
			out.Table = append(out.Table, jsonTableRow{Float(row.Stage), Float(row.Discharge), row.Extrapolated(), row.Basis.String(),
				Float(row.ParametricLower), Float(row.ParametricUpper), Float(row.Hydraulic),
				Float(row.ParametricLower), Float(row.ParametricUpper), Float(row.TotalLower), Float(row.TotalUpper), Float(row.Multiple), Float(share)})
		}
	}
	return writeJSON(w, out)
}

// fillJSONFit fills the fit's part of the JSON report.
func fillJSONFit(out *jsonFitReport, r *gauged.Report, f *gauged.ControlFit) {
	c0 := f.Controls[0]
	out.ZeroFlow = &jsonZeroFlow{Fixed: f.OffsetFixed, Source: f.OffsetSource, Stage: Float(c0.B), StandardError: Float(c0.BSE)}
	for j, c := range f.Controls {
		lo, hi := exponentBounds(f, j)
		out.Segments = append(out.Segments, jsonSegment{Float(c.From), Float(segmentTo(f, j)), Float(c.A), Float(c.ASE),
			Float(c.B), Float(c.C), Float(c.CSE), Float(c.BSE), Float(c.FromSE), c.Joint.String(), c.Kind.String(),
			Float(lo), Float(hi), priorSource(f, j)})
		if j > 0 {
			out.Breakpoints = append(out.Breakpoints, jsonBreak{Float(c.From), Float(c.FromSE), f.BreaksFixed})
		}
	}
	out.SEPercent, out.SELog = Float(f.StandardErrorPercent), Float(f.StandardErrorLog)
	out.Fitted, out.Params, out.PoorFit = f.N, f.Params, r.MoreControls.Poor
	out.Method = f.Method.String()
	m := r.MoreControls
	out.MoreControls = &jsonMore{m.Made, m.Controls, Float(m.F), Float(m.P), Float(m.StandardErrorPercent), m.Poor}
	test := func(t gauged.RelationTest) jsonTest { return jsonTest{t.N, Float(t.Statistic), Float(t.P), t.Failed} }
	out.Tests = &jsonTests{Float(gauged.RelationTestLevel), test(f.Tests.Sign), test(f.Tests.Runs), test(f.Tests.Mean)}
	j := f.Johnson
	out.Johnson = &jsonJohnson{j.OK && !j.Undetermined, Float(j.ZeroFlow), Float(j.Q1), Float(j.Q2), Float(j.Q3), Float(j.G1), Float(j.G2), Float(j.G3), j.Note,
		Float(j.ZeroFlowSE), j.OK && !j.Undetermined}
	if p := f.Posterior; p != nil {
		jp := &jsonPosterior{Parameters: []jsonParam{}, RHatMax: Float(p.RHatMax), RHatParameter: p.RHatParam, ESSMin: Float(p.ESSMin),
			ESSParameter: p.ESSParam, Acceptance: Float(p.Acceptance), Converged: p.Converged, RHatLimit: Float(gauged.RHatLimit),
			Chains: p.Chains, Draws: p.Draws, Pilot: p.Pilot, Seed: p.Seed, Modes: p.Modes, Likelihood: p.Likelihood,
			PriorSources: nonNil(p.PriorSources)}
		for _, a := range p.ChainAcceptance {
			jp.ChainAcceptance = append(jp.ChainAcceptance, Float(a))
		}
		for _, s := range p.Parameters {
			jp.Parameters = append(jp.Parameters, jsonParam{s.Name, Float(s.Mean), Float(s.SD), Float(s.P2_5), Float(s.P50), Float(s.P97_5),
				Float(s.PriorMean), Float(s.PriorSD), Float(s.RHat), Float(s.ESS), s.Derived})
		}
		out.Posterior = jp
	}
	if r.Prior != nil {
		out.Prior = []jsonControl{}
		for _, c := range r.Prior.Controls {
			out.Prior = append(out.Prior, jsonControl{c.Kind.String(), c.Joint.String(), Float(c.A), Float(c.B), Float(c.C), Float(c.From)})
		}
	}
}

// jsonGaugingOf is gauging i of the JSON report.
func jsonGaugingOf(r *gauged.Report, i int, g gauged.Gauging) jsonGauging {
	nan := Float(math.NaN())
	jg := jsonGauging{Time: gauged.TimeText(g.Time, r.UTCOffset), Stage: Float(g.Stage), Discharge: Float(g.Discharge),
		Quality: g.Quality.String(), Note: g.Note, Source: g.Source,
		Fitted: nan, DeparturePercent: nan, Shift: nan, Hydraulic: nan, HydDeparture: nan, HydShift: nan,
		Uncertainty: Float(g.UncertaintyPercent()), UncertaintyGiven: nan, LogResidual: nan, Weight: nan}
	if g.Uncertainty > 0 {
		jg.UncertaintyGiven = Float(g.Uncertainty)
	}
	if r.Fit != nil {
		res := r.Fit.Residuals[i]
		jg.Fitted, jg.DeparturePercent, jg.Shift = Float(res.Fitted), Float(res.DeparturePercent), Float(res.Shift)
		jg.OutsideBand, jg.Excluded, jg.ExcludedReason = res.OutsideBand, res.Excluded, res.ExcludedReason
		jg.LogResidual, jg.Weight = Float(res.LogResidual), Float(res.Weight)
	} else {
		jg.ExcludedReason = r.Selection.Reason(g)
		jg.Excluded = jg.ExcludedReason != ""
	}
	if r.Comparison != nil {
		c := r.Comparison.Residuals[i]
		jg.Hydraulic, jg.HydDeparture, jg.HydShift, jg.HydOutside = Float(c.Fitted), Float(c.DeparturePercent), Float(c.Shift), c.OutsideBand
	}
	f, n := calPoint(r, i)
	jg.FactorOnN, jg.N = Float(f), Float(n)
	return jg
}

// jsonSelectionOf states how the gaugings were chosen.
func jsonSelectionOf(r *gauged.Report) jsonSelection {
	s := r.Selection
	out := jsonSelection{Exclude: []string{}}
	if !s.From.IsZero() {
		out.From = gauged.TimeText(s.From, r.UTCOffset)
	}
	if !s.To.IsZero() {
		out.To = gauged.TimeText(s.To, r.UTCOffset)
	}
	for _, t := range s.Exclude {
		out.Exclude = append(out.Exclude, gauged.TimeText(t, r.UTCOffset))
	}
	for _, g := range r.Gaugings {
		if s.Reason(g) != "" {
			out.Excluded++
		}
	}
	out.Fitted = len(r.Gaugings) - out.Excluded
	if r.Fit != nil {
		out.Fitted = r.Fit.N
	}
	return out
}

// jsonExtrapolationOf says what the rows above the gaugings rest on.
func jsonExtrapolationOf(r *gauged.Report, t *gauged.ControlTable) *jsonExtrapolation {
	e := &jsonExtrapolation{ScaleFactor: Float(math.NaN()), ScaleStage: Float(r.Fit.HighStage), Note: t.AboveNote,
		LargestGauged: Float(t.MaxDischarge), MaxMultiple: Float(t.MaxMultiple), WarnMultiple: Float(gauged.ExtrapolationWarnMultiple)}
	if x := t.Extension; x != nil {
		nan := Float(math.NaN())
		e.ConveyanceSlope = &jsonConveyance{len(x.Points), x.Level, Float(x.LogSlope), Float(x.LogSlopeSE), Float(x.Trend), Float(x.TrendSE),
			Float(x.Centre), Float(x.TrendP), Float(x.ScatterLog), nan, nan, nan, nan,
			Float(x.LineTrendSE), Float(x.LineTrendT), x.LineTrendDF, nan, nan, nan}
		c := e.ConveyanceSlope
		if x.NLogSD > 0 {
			c.NCV, c.NLogSD = Float(x.NCV), Float(x.NLogSD)
		}
		if j := x.Join; j != nil {
			c.JoinStage, c.JoinDischarge, c.JoinConveyance, c.JoinLogSlope = Float(j.Stage), Float(j.Discharge), Float(j.Conveyance), Float(j.LogSlope)
			c.JoinOverbankShare = Float(j.OverbankShare)
		}
	}
	return e
}

// methodWords describes a fit's method in a sentence.
func methodWords(f *gauged.ControlFit) string {
	if f.Method == gauged.Bayesian {
		p := f.Posterior
		return fmt.Sprintf("Bayesian (Le Coz et al., 2014): priors from the survey where given, adaptive Metropolis (Haario et al., 2001), %d chains of %d draws after %d pilot iterations, seed %d; the table is the posterior mode",
			p.Chains, p.Draws, p.Pilot, p.Seed)
	}
	return "weighted least squares in ln Q (ISO 18320; Kennedy, 1984, USGS TWRI 3-A10), standard errors by the delta method"
}

// WriteFitText writes a gaugings report for reading: the datum, the
// method and the uncertainty convention, the fitted controls with their
// uncertainties, the posterior (Bayesian), the tests of the relation and
// Johnson's check, every gauging's departures (excluded ones marked with
// their reason), the back-calculated n, the table with both bands and the
// multiple of the largest gauged discharge, the warnings and the caution.
func WriteFitText(w io.Writer, r *gauged.Report) error {
	bw := bufio.NewWriter(w)
	u := r.Units
	L := u.Length()
	p := func(format string, a ...any) { fmt.Fprintf(bw, format, a...) }
	title := "Gaugings"
	switch { // the site's name when known, as the workbook's page header
	case r.Provenance.Site.Name != "":
		title += " at " + r.Provenance.Site.Name
	case r.Site != "":
		title += " at " + r.Site
	}
	p("%s: %d measurements, %s units", title, len(r.Gaugings), u)
	if r.UTCOffset != 0 {
		p("; times in %s", zoneName(zoneOf(r.UTCOffset)))
	}
	p("\n")
	bw.WriteString(siteLine(r.Provenance))
	switch {
	case r.Hydraulic != nil && r.DatumGiven:
		p("Gauge datum: elevation = gauge height %s %s (--datum); hydraulic rating%s at slope %s\n", rating.DatumTerm(r.Datum), L, ofSection(r), sig(r.Slope, shortest))
	case r.Hydraulic != nil:
		p("Gauge datum: none given, so gauge heights are read as the survey's elevations; hydraulic rating%s at slope %s\n", ofSection(r), sig(r.Slope, shortest))
	case r.HydraulicTable != nil:
		how := "linearly in stage between rows"
		if e, ok := r.HydraulicTable.ZeroFlow(); ok {
			how = fmt.Sprintf("log-linearly in (h − e) between rows, e = %s %s", rating.PlainFigures(e, 6), L)
		}
		p("Gauge datum: stages are gauge heights; hydraulic rating from the %s (read at gauge heights, %s)\n", r.HydraulicSource, how)
	default:
		p("Gauge datum: stages are gauge heights as read; no section given, so no hydraulic rating\n")
	}
	p("Uncertainty convention: %s\n", gauged.UncertaintyConvention())
	if s := jsonSelectionOf(r); s.Excluded > 0 || s.From != "" || s.To != "" {
		p("Selection: %d of %d gaugings fitted", s.Fitted, len(r.Gaugings))
		if s.From != "" || s.To != "" {
			p("; rating period %s", PeriodWords(s.From, s.To))
		}
		p(" (the others are shown with their departures, marked x)\n")
	}
	if f := r.Fit; f != nil {
		writeFitControls(p, r, f)
		if f.Posterior != nil {
			writePosterior(p, f.Posterior)
		}
		writeFitChecks(p, r, f)
	}
	writeGaugingRows(p, r)
	writeCalibration(p, r)
	if t := r.Table; t != nil {
		writeTableRows(p, r, t)
	}
	writeTextEnd(bw, r.Warnings)
	return bw.Flush()
}

// PeriodWords words a rating period of a selection, half-open as rating
// periods are: "from FROM up to, not including, TO", an open end left
// unsaid ("" is open).
func PeriodWords(from, to string) string {
	switch {
	case from == "":
		return "up to, not including, " + to
	case to == "":
		return "from " + from + " on"
	}
	return "from " + from + " up to, not including, " + to
}

// printer is a formatted writer.
type printer func(format string, a ...any)

// writeFitControls writes the fitted controls.
func writeFitControls(p printer, r *gauged.Report, f *gauged.ControlFit) {
	L, Q := r.Units.Length(), r.Units.Discharge()
	p("\nFitted rating: %s, each Q = A·(h − B)^C with its own offset B (h gauge height in %s, Q in %s), %s, %s\n",
		rating.Counted(len(f.Controls), "control", "controls"), L, Q, rating.Counted(f.N, "gauging", "gaugings"), parameterWords(f))
	p("  method: %s\n", methodWords(f))
	what := "±: standard errors"
	if f.Method == gauged.Bayesian {
		what = "±: posterior standard deviations; values at the posterior mode"
	}
	p("  (%s)\n", what)
	for j, c := range f.Controls {
		lo, hi := exponentBounds(f, j)
		join := ""
		switch {
		case j > 0 && c.Joint == gauged.Add:
			join = ", adds to the one below"
		case j > 0:
			join = ", replaces the one below"
		}
		p("  control %d (%s%s), %s: A = %s, B = %s, C = %s (exponents %s to %s expected)\n",
			j+1, c.Kind, join, segmentStages(f, j, L), withSE(sig(c.A, 5), c.ASE, "", f), offsetWords(f, j, L), withSE(fmt.Sprintf("%.4f", c.C), c.CSE, "", f), sig(lo, 3), sig(hi, 3))
		if j > 0 {
			if f.BreaksFixed || math.IsNaN(c.FromSE) {
				p("    breakpoint %.4f %s%s\n", c.From, L, map[bool]string{true: " (given)", false: " (no standard error)"}[f.BreaksFixed])
			} else {
				p("    breakpoint %.4f ± %s %s\n", c.From, sig(c.FromSE, 2), L)
			}
		}
		if src := priorSource(f, j); src != "" {
			p("    prior: %s\n", src)
		}
	}
	if r.FloodplainAdded {
		p("  control %d was added: a floodplain adding to the channel from the bank stage (%.3f %s), since the section's overbanks flow below the table's top\n",
			len(f.Controls), r.BankStage, L)
	}
	if f.OffsetFixed {
		p("  first offset held at %.4f %s (%s)\n", f.Controls[0].B, L, f.OffsetSource)
	}
	if f.NoStandardErrors != "" {
		p("  no standard errors: %s\n", f.NoStandardErrors)
	}
	p("  %s\n", standardErrorWords(f))
	if m := r.MoreControls; m.Made && f.Method == gauged.Bayesian {
		p("  one more control, a least-squares test (%s against %d, both fitted by weighted least squares, not this Bayesian fit): F = %.2f, p = %s (poor fit below p = %s), least-squares standard error %.2f %% with %d controls\n",
			rating.Counted(m.Controls, "control", "controls"), m.Controls+1, m.F, sig(m.P, 3), sig(gauged.PoorFitLevel, shortest), m.StandardErrorPercent, m.Controls+1)
	} else if m.Made {
		p("  one more control: F = %.2f, p = %s (poor fit below p = %s), standard error %.2f %%\n", m.F, sig(m.P, 3), sig(gauged.PoorFitLevel, shortest), m.StandardErrorPercent)
	}
	if r.Prior != nil {
		p("  prior rating (means of the priors, before the gaugings):")
		for j, c := range r.Prior.Controls {
			p(" control %d Q = %s·(h − %.4f)^%.3f from %.3f %s;", j+1, sig(c.A, 4), c.B, c.C, c.From, L)
		}
		p("\n")
	}
}

// parameterWords counts the parameters a fit moved, saying which are the
// rating's when a Bayesian fit's remnant error is one of them, and how
// many rest on their priors alone (controls above every gauging): the
// degrees of freedom of the standard error of estimate are the gaugings
// less the rating's parameters that gaugings constrain.
func parameterWords(f *gauged.ControlFit) string {
	all := rating.Counted(f.Params, "parameter", "parameters")
	if f.Method != gauged.Bayesian {
		return all
	}
	var say []string
	if own := f.N - f.StandardErrorDF + f.PriorOnlyParams; own == f.Params-1 {
		say = append(say, fmt.Sprintf("%d of the rating and the remnant error", own))
	}
	if n := f.PriorOnlyParams; n > 0 {
		say = append(say, fmt.Sprintf("%d of controls above every gauging %s on %s priors alone and %s no degree of freedom",
			n, rating.Agree(n, "rests", "rest"), rating.Agree(n, "its", "their"), rating.Agree(n, "takes", "take")))
	}
	if len(say) == 0 {
		return all
	}
	return all + " (" + strings.Join(say, "; ") + ")"
}

// withSE writes a fitted value v with its standard error se ("± se"), or
// v alone when the fit gives no standard errors (ControlFit.NoStandardErrors,
// said once below the controls). unit follows the standard error.
func withSE(v string, se float64, unit string, f *gauged.ControlFit) string {
	if unit != "" {
		unit = " " + unit
	}
	if f.NoStandardErrors != "" {
		return v + unit
	}
	return fmt.Sprintf("%s ± %s%s", v, sig(se, 2), unit)
}

// offsetWords writes control j's offset B with what it is: held at a
// given value (the first control, --zero-flow), its breakpoint (an added
// control), fitted (the first) or set by continuity at the breakpoint (a
// replacing control), with its standard error where the fit gives one
// (then alone, as the other parameters are).
func offsetWords(f *gauged.ControlFit, j int, L string) string {
	c := f.Controls[j]
	b := fmt.Sprintf("%.4f", c.B)
	switch {
	case j == 0 && f.OffsetFixed:
		return b + " " + L + " (held)"
	case j > 0 && c.Joint == gauged.Add && (f.NoStandardErrors != "" || math.IsNaN(c.BSE)):
		return b + " " + L + " (its breakpoint)"
	case f.NoStandardErrors != "" && j == 0:
		return b + " " + L + " (fitted)"
	case f.NoStandardErrors != "":
		return b + " " + L + " (by continuity at its breakpoint)"
	case math.IsNaN(c.BSE) && j == 0:
		return b + " " + L + " (fitted, no standard error)"
	case math.IsNaN(c.BSE):
		return b + " " + L + " (by continuity at its breakpoint, no standard error)"
	}
	return fmt.Sprintf("%s ± %s %s", b, sig(c.BSE, 2), L)
}

// ofSection names a report's section for "hydraulic rating …" ("" when
// it has no name).
func ofSection(r *gauged.Report) string {
	if r.Section == "" {
		return ""
	}
	return " of section " + r.Section
}

// standardErrorWords says a fit's weighted standard error of estimate
// with its degrees of freedom, or why it is not defined (no more gaugings
// than parameters of the rating).
func standardErrorWords(f *gauged.ControlFit) string {
	if f.StandardErrorDF <= 0 || math.IsNaN(f.StandardErrorLog) {
		return "weighted standard error of estimate " + standardErrorUndefined(f)
	}
	return fmt.Sprintf("weighted standard error of estimate %s %% (%s in ln Q, %s)",
		fixed(f.StandardErrorPercent, 2), fixed(f.StandardErrorLog, 4), rating.Counted(f.StandardErrorDF, "degree of freedom", "degrees of freedom"))
}

// standardErrorUndefined says why a fit's standard error of estimate is
// not defined.
func standardErrorUndefined(f *gauged.ControlFit) string {
	p := f.N - f.StandardErrorDF
	aside := ""
	switch rem := p+f.PriorOnlyParams != f.Params; {
	case rem && f.PriorOnlyParams > 0:
		aside = fmt.Sprintf(", the remnant error and the %d resting on their priors alone aside", f.PriorOnlyParams)
	case f.PriorOnlyParams > 0:
		aside = fmt.Sprintf(", the %d resting on their priors alone aside", f.PriorOnlyParams)
	case rem:
		aside = ", the remnant error aside"
	}
	return fmt.Sprintf("not defined: %d gaugings for %d parameters of the rating%s (it needs more gaugings than parameters)", f.N, p, aside)
}

// writePosterior writes the posterior summaries.
func writePosterior(p printer, post *gauged.Posterior) {
	rhat := "not determined"
	if !math.IsNaN(post.RHatMax) && !math.IsInf(post.RHatMax, 0) {
		rhat = fmt.Sprintf("%.3f", post.RHatMax)
	}
	p("\nPosterior (%d chains of %d draws, pilot %d, seed %d): acceptance %.2f, R̂ max %s (%s; chains agree at ≤ %s), least effective sample size %.0f (%s)\n",
		post.Chains, post.Draws, post.Pilot, post.Seed, post.Acceptance, rhat, post.RHatParam, sig(gauged.RHatLimit, shortest), post.ESSMin, post.ESSParam)
	p("  likelihood: %s\n", post.Likelihood)
	p("  %-11s %11s %10s %11s %11s %11s %11s %10s %7s %7s\n", "parameter", "mean", "sd", "2.5 %", "median", "97.5 %", "prior mean", "prior sd", "R̂", "ESS")
	for _, s := range post.Parameters {
		p("  %-11s %11s %10s %11s %11s %11s %11s %10s %7s %7s\n", s.Name, sig(s.Mean, 5), sig(s.SD, 3), sig(s.P2_5, 5), sig(s.P50, 5), sig(s.P97_5, 5),
			sig(s.PriorMean, 5), sig(s.PriorSD, 3), fixed(s.RHat, 3), fixed(s.ESS, 0))
	}
}

// writeFitChecks writes the ISO tests and Johnson's check.
func writeFitChecks(p printer, r *gauged.Report, f *gauged.ControlFit) {
	L := r.Units.Length()
	p("\nTests of the relation on the fitted gaugings' departures by stage (ISO 1100-2, unweighted departures in ln Q; failed below p = %s):\n",
		sig(gauged.RelationTestLevel, shortest))
	for _, t := range []gauged.RelationTest{f.Tests.Sign, f.Tests.Runs, f.Tests.Mean} {
		verdict := "passes"
		if t.Failed {
			verdict = "FAILS"
		}
		if math.IsNaN(t.P) {
			verdict = "not made"
		}
		p("  %-15s n %3d, statistic %8s, p = %-8s %s\n", t.Name, t.N, sig(t.Statistic, 4), sig(t.P, 3), verdict)
	}
	if j := f.Johnson; j.OK && j.Undetermined {
		p("Johnson's three-point check of the first offset: %s; fitted B = %.4f %s\n", j.Note, f.Controls[0].B, L)
	} else if j.OK {
		p("Johnson's three-point check of the first offset: e = %.4f %s (gauge heights %.3f, %.3f, %.3f %s of %s, %s, %s %s); fitted B = %.4f %s\n",
			j.ZeroFlow, johnsonPlusMinus(j, L), j.G1, j.G2, j.G3, L, sig(j.Q1, 4), sig(j.Q2, 4), sig(j.Q3, 4), r.Units.Discharge(), f.Controls[0].B, L)
	} else {
		p("Johnson's three-point check of the first offset: not made (%s)\n", j.Note)
	}
}

// johnsonPlusMinus writes the unit L of Johnson's estimate after its 95 %
// uncertainty ("± U L (95 %)"), or L alone when that is not known.
func johnsonPlusMinus(j gauged.JohnsonEstimate, L string) string {
	if math.IsNaN(j.ZeroFlowSE) {
		return L
	}
	return "± " + sig(gauged.CoverageFactor95*j.ZeroFlowSE, 2) + " " + L + " (95 %)"
}

// writeGaugingRows writes every gauging with its departures.
func writeGaugingRows(p printer, r *gauged.Report) {
	p("\nGaugings (U: uncertainty at 95 %%; departure = 100·(measured − curve)/curve; shift = what to add to the gauge height for the curve to pass through it; * outside its band (U; a poor gauging's is open); x left out of the fit):\n")
	p("  %-25s %9s %10s %-9s %5s", "time", "stage", "discharge", "quality", "U %")
	if r.Fit != nil {
		p(" %10s %8s %8s", "fitted", "dep. %", "shift")
	}
	if r.Comparison != nil {
		p(" %10s %8s %8s", "hydraulic", "dep. %", "shift")
	}
	if r.Calibration != nil {
		p(" %8s %7s", "n factor", "n")
	}
	p("\n")
	var reasons []string
	for i, g := range r.Gaugings {
		p("  %-25s %9.3f %10s %-9s %5s", gauged.TimeText(g.Time, r.UTCOffset), g.Stage, sig(g.Discharge, 5), g.Quality, fixed(g.UncertaintyPercent(), 1))
		reason := ""
		if r.Fit != nil {
			res := r.Fit.Residuals[i]
			p(" %10s %7s%s %8s", sig(res.Fitted, 5), fixed(res.DeparturePercent, 1), fitStar(res.OutsideBand), fixed(res.Shift, 3))
			reason = res.ExcludedReason
		} else {
			reason = r.Selection.Reason(g)
		}
		if r.Comparison != nil {
			c := r.Comparison.Residuals[i]
			p(" %10s %7s%s %8s", sig(c.Fitted, 5), fixed(c.DeparturePercent, 1), fitStar(c.OutsideBand), fixed(c.Shift, 3))
		}
		if r.Calibration != nil {
			f, n := calPoint(r, i)
			p(" %8s %7s", fixed(f, 3), fixed(n, 4))
		}
		if reason != "" {
			p(" x")
			reasons = append(reasons, fmt.Sprintf("%s: %s", gauged.TimeText(g.Time, r.UTCOffset), reason))
		}
		p("\n")
	}
	for _, s := range reasons {
		p("  x %s\n", s)
	}
	if c := r.Comparison; c != nil {
		which := ""
		if c.LeftOut > 0 {
			which = fmt.Sprintf(", the gaugings selected only, as the fit and the calibration take them (%d left out, marked x)", c.LeftOut)
		}
		p("Against the hydraulic rating%s: geometric mean departure %s %%, %d of %d compared outside their quality bands\n",
			which, fixed(c.MeanLogDeparturePercent, 1), c.Outside, c.Compared())
	}
}

// writeCalibration writes the back-calculated n.
func writeCalibration(p printer, r *gauged.Report) {
	c := r.Calibration
	if c == nil {
		return
	}
	which := "every subsection's n"
	if c.ChannelOnly {
		which = "the channel's n"
	}
	p("Best factor on %s (least squares in ln Q): %.4f (standard error of the factor %s %%); the calibrated rating's standard error %s %%\n",
		which, c.Factor, fixed(c.FactorStandardErrorPercent, 2), fixed(c.StandardErrorPercent, 2))
	pts := append([]gauged.NPoint(nil), c.Points...)
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].Stage < pts[j].Stage })
	p("\nBack-calculated n against stage (n of the scaled subsection carrying the most conveyance):\n")
	p("  %9s %9s %8s\n", "stage", "factor", "n")
	for _, pt := range pts {
		p("  %9.3f %9s %8s\n", pt.Stage, fixed(pt.Factor, 4), fixed(pt.N, 4))
	}
}

// writeTableRows writes the table with both bands.
func writeTableRows(p printer, r *gauged.Report, t *gauged.ControlTable) {
	L, Q := r.Units.Length(), r.Units.Discharge()
	p("\nRating table (gauge height %s, discharge %s; x = extrapolated, outside the gaugings; × = discharge over the largest gauged, %s %s):\n",
		L, Q, sig(t.MaxDischarge, 5), Q)
	p("  bands: %s\n", t.BandNote)
	if t.AboveNote != "" {
		p("  %s\n", t.AboveNote)
	}
	if x := t.Extension; x != nil && x.Join != nil {
		n := "no allowance for n off the channel"
		if x.NLogSD > 0 {
			n = fmt.Sprintf("n off the channel cv %s (σ_lnf %s), overbanks' share of conveyance at the join %s",
				sig(x.NCV, 3), sig(x.NLogSD, 4), sig(x.Join.OverbankShare, 4))
		}
		p("  allowances above the join (%s %s): slope SE(trend of ln S) %s per %s, t %s on %d degrees of freedom; %s\n",
			sig(x.Join.Stage, shortest), L, sig(x.LineTrendSE, 4), L, sig(x.LineTrendT, 4), x.LineTrendDF, n)
	}
	if t.BandsWithheld {
		p("  bands withheld: the chains disagree (see the warnings)\n")
	}
	p("  %9s %11s %11s %11s %11s %11s %6s  %s\n", "stage", "discharge", "param. 2.5%", "param. 97.5%", "total 2.5%", "total 97.5%", "×", "basis")
	for _, row := range t.Rows {
		mark := " "
		if row.Extrapolated() {
			mark = "x"
		}
		p("  %9.3f %11s %11s %11s %11s %11s %6s %s %s\n", row.Stage, sig(row.Discharge, 5), sig(row.ParametricLower, 5), sig(row.ParametricUpper, 5),
			sig(row.TotalLower, 5), sig(row.TotalUpper, 5), fixedOrBlank(row.Multiple, 2), mark, row.Basis)
	}
}

// shortest is enough significant figures for plainSig to write the
// shortest decimal that reads back to a float64, as %g does.
const shortest = 17

// fixedOrBlank formats v with n decimals, blank when undefined.
func fixedOrBlank(v float64, n int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return unsignedZero(fmt.Sprintf("%.*f", n, v))
}

func fitStar(b bool) string {
	if b {
		return "*"
	}
	return " "
}

// jsonFitCalibration is a fit report's calibration of the section's n in
// JSON, its keys in the order the report has written them since the first
// release (alphabetical, as a map gave them), the factor's own standard
// error added after them: whether only the channel's n was scaled, the
// factor, the gaugings' scatter about the calibrated rating (its standard
// error of estimate, in percent) and the factor's standard error in
// percent.
type jsonFitCalibration struct {
	ChannelOnly                bool  `json:"channel_only"`
	Factor                     Float `json:"factor"`
	StandardErrorPercent       Float `json:"standard_error_percent"`
	FactorStandardErrorPercent Float `json:"factor_standard_error_percent"`
}

// jsonZeroFlow is a fit's gauge height of zero flow in JSON, its keys in
// the order the report has always written them: whether it was held
// fixed, where it came from, the stage and its standard error (length
// unit).
type jsonZeroFlow struct {
	Fixed         bool   `json:"fixed"`
	Source        string `json:"source"`
	Stage         Float  `json:"stage"`
	StandardError Float  `json:"standard_error"`
}
