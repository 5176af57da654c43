package gauged_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A closed-form power law Q = a·(h − e)^c (the form of ISO 18320:2020)
// whose table starts above e, wet: the table's first row is not where the
// flow starts.
const (
	lawA, lawE, lawC = 12.0, 0.6, 1.9
	lawFirst, lawTop = 2.0, 8.0
)

func wetLaw(h float64) float64 { return lawA * math.Pow(h-lawE, lawC) }

// lawTable tabulates law from lawFirst to lawTop every 0.05, no zero-flow
// stage (a step-backwater ladder's shape).
func lawTable(t *testing.T) *gauged.TableRating {
	t.Helper()
	rt := gauged.RatingTable{Name: "law"}
	for i := 0; ; i++ {
		h := lawFirst + 0.05*float64(i)
		if h > lawTop+1e-9 {
			break
		}
		rt.Points = append(rt.Points, gauged.RatingPoint{Stage: h, Discharge: wetLaw(h)})
	}
	tr, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// lawGaugings are noise-free gaugings on law, most of them below the
// table's first row.
func lawGaugings() []gauged.Gauging {
	var gs []gauged.Gauging
	for _, h := range linspace(0.9, 7.5, 12) {
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: wetLaw(h), Quality: rating.Good})
	}
	return gs
}

// The prior from a table whose first row carries discharge fits the
// table's own power law with its offset free below that row: on a table
// of Q = a·(h − e)^c it gives back e and c (closed form; the table's
// linear interpolation between rows 0.05 apart leaves a small bias),
// not the first row as the offset.
func TestTablePriorOffsetBelowWetFoot(t *testing.T) {
	tab := lawTable(t)
	got, err := gauged.TablePrior(tab, 0.5, lawTop, gauged.HydraulicPriorOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if b := got.Offset.Mean; math.Abs(b-lawE) > 0.05 {
		t.Errorf("prior offset %g, want the law's e = %g (not the first row %g); source %q", b, lawE, lawFirst, got.Source)
	}
	if c := got.Exponent.Mean; math.Abs(c-lawC) > 0.02 {
		t.Errorf("prior exponent %g, want %g", c, lawC)
	}
	if a := math.Exp(got.LogCoefficient.Mean); relErr(a, lawA) > 0.05 {
		t.Errorf("prior coefficient %g, want %g", a, lawA)
	}
	if !(got.Offset.SD > 0) || math.IsInf(got.Offset.SD, 0) {
		t.Errorf("offset prior sd %g", got.Offset.SD)
	}
	if !strings.Contains(got.Source, "offset fitted below its lowest row 2") {
		t.Errorf("source %q does not say the offset was fitted below the wet first row", got.Source)
	}
}

// A Bayesian fit with such a table as its hydraulic rating passes through
// gaugings made on the same law (closed form: they are the law) and finds
// its e, below the table's first row.
func TestBayesWetFootTablePassesGaugings(t *testing.T) {
	tab := lawTable(t)
	gs := lawGaugings()
	f, err := gauged.FitBayes(gs, gauged.BayesOptions{ControlOptions: gauged.ControlOptions{Controls: []gauged.ControlSpec{{Kind: gauged.ChannelControl}}},
		HydraulicTable: tab, Chains: 2, Draws: 500, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if b := f.Rating.Controls[0].B; math.Abs(b-lawE) > 0.05 {
		t.Errorf("fitted offset %g, want %g", b, lawE)
	}
	if c := f.Rating.Controls[0].C; math.Abs(c-lawC) > 0.03 {
		t.Errorf("fitted exponent %g, want %g", c, lawC)
	}
	for _, g := range gs {
		if q := f.Rating.Discharge(g.Stage); relErr(q, g.Discharge) > 0.02 {
			t.Errorf("at %g: fitted %g, gauged %g", g.Stage, q, g.Discharge)
		}
	}
	a, _ := findParam(f.Posterior, "c1")
	if math.Abs(a.PriorMean-lawC) > 0.05 {
		t.Errorf("exponent prior mean %g, want near %g", a.PriorMean, lawC)
	}
}

// The offset from the survey's control cannot come from a table whose
// first row flows: that row is no gauge height of zero flow, so the
// report is ErrTableFlowsAtFoot, whatever the method; a table with a
// zero-flow stage gives it.
func TestZeroFlowControlWetFootTable(t *testing.T) {
	tab := lawTable(t)
	gs := lawGaugings()
	for _, m := range []gauged.Method{gauged.LeastSquares, gauged.Bayesian} {
		_, err := gauged.Analyze(gs, gauged.Options{HydraulicTable: tab, ZeroFlowControl: true, Method: m,
			Bayes: gauged.BayesOptions{Chains: 2, Draws: 200, Seed: 1}})
		if !errors.Is(err, gauged.ErrTableFlowsAtFoot) {
			t.Errorf("method %v: %v, want ErrTableFlowsAtFoot", m, err)
		}
	}
	rt := gauged.RatingTable{Name: "law", HasZeroFlow: true, ZeroFlow: lawE}
	for _, h := range linspace(lawFirst, lawTop, 61) {
		rt.Points = append(rt.Points, gauged.RatingPoint{Stage: h, Discharge: wetLaw(h)})
	}
	dry, err := rt.Compile()
	if err != nil {
		t.Fatal(err)
	}
	rep, err := gauged.Analyze(gs, gauged.Options{HydraulicTable: dry, ZeroFlowControl: true})
	if err != nil {
		t.Fatal(err)
	}
	if b := rep.Fit.Rating.Controls[0].B; b != lawE {
		t.Errorf("offset %g, want the table's zero-flow stage %g", b, lawE)
	}
}
