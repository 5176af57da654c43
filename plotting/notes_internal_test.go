package plotting

import (
	"testing"

	"wetline/rating"
	"wetline/rating/reach"
)

// The slope-area figures' footnote and the backwater verification note
// write discharges in plain decimal to four significant figures: 1362
// ft3/s, band 1178 to 1558, not 1.36e+03 (1.18e+03 to 1.56e+03).
func TestFootnoteDischargesPlain(t *testing.T) {
	un := reach.Uncertainty{Draws: 5000, P05: 1177.51, P95: 1557.68}
	rp := reachPlot(reach.Report{Result: reach.SlopeArea{Method: reach.MethodSlopeArea, Units: rating.US, Discharge: 1362.097},
		Uncertainty: &un}, "")
	if want := "peak discharge 1362 ft3/s, 90 % band 1178 to 1558 ft3/s (Monte Carlo, 5000 draws)"; len(rp.Notes) != 1 || rp.Notes[0] != want {
		t.Errorf("notes %q, want %q", rp.Notes, want)
	}
	if got, want := verificationNote(reach.Verification{Discharge: 13621}, rating.SI),
		"verification at 13620 m3/s: mean departure from the marks 0.000 m, largest 0.000 m"; got != want {
		t.Errorf("got  %q\nwant %q", got, want)
	}
}
