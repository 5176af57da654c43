package plotting

import (
	"math"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
)

// The fit figure pads its axes so that the top gauging is drawn whole:
// unpadded, the figure of the Patuxent gaugings (USGS 01594440, top
// gauging 21.1 ft, testdata/reference/gaugings-01594440.csv) ended its
// stage axis at 21.1 ft and cut the marker in half at the panel's edge. Here invented
// gaugings from 3.5 to 21.1 ft with e = 1.9 ft: the linear panel's stage
// axis reaches EndPad of its span above 21.1 ft, and the log–log panel's
// h − e axis EndPadLog of a decade above 19.2 ft.
func TestFitFigurePadsTopGauging(t *testing.T) {
	rep := &gauged.Report{Units: rating.US}
	for _, h := range []float64{3.5, 6, 9, 13, 17, 21.1} {
		rep.Gaugings = append(rep.Gaugings, gauged.Gauging{Stage: h, Discharge: 30 * math.Pow(h-1.9, 2.2), Quality: rating.Fair})
	}
	rp := FitPlot(rep, "site")
	rp.ZeroFlow, rp.HasZeroFlow = 1.9, true
	d, _ := cleanRatingLines(rp)
	var res Result
	ps := ratingPanels(rp, d, names(rp.Units), 1.9, true, &res)
	if len(ps) != 2 {
		t.Fatalf("%d panels", len(ps))
	}
	lin, lg := ps[0], ps[1]
	if span := lin.Y.Max - lin.Y.Min; !(lin.Y.Max >= 21.1+0.99*EndPad*span/(1+EndPad)) {
		t.Errorf("stage axis to %g, want a margin above 21.1 ft", lin.Y.Max)
	}
	if want := 19.2 * math.Pow(10, EndPadLog); !(lg.Y.Max >= want*(1-1e-9)) {
		t.Errorf("h − e axis to %g, want at least %g", lg.Y.Max, want)
	}
}
