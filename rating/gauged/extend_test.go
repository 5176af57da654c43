package gauged_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"wetline/rating/gauged"
)

// The conveyance-slope fit: gaugings whose effective slope follows
// ln S = ln 0.001 + 0.3·(h − 1) exactly give that line back and Q = K·√S
// above them (closed form); gaugings of a constant slope with noise give
// no significant trend (t test at SlopeTrendLevel) and a level S.
func TestFitConveyanceSlope(t *testing.T) {
	c := built(t, "trapezoid:bottom=10,side=2,height=5", 0.035, 0.001)
	slope := func(h float64) float64 { return 0.001 * math.Exp(0.3*(h-1)) }
	hs := linspace(0.8, 1.6, 6)
	qs := make([]float64, len(hs))
	ws := make([]float64, len(hs))
	for i, h := range hs {
		r, _ := c.Row(h)
		qs[i], ws[i] = r.Conveyance*math.Sqrt(slope(h)), 1
	}
	s, err := gauged.FitConveyanceSlope(c, hs, qs, ws)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-9 // round-off
	if s.Level || math.Abs(s.Trend-0.3) > tol || math.Abs(s.LogSlopeAt(1)-math.Log(0.001)) > tol {
		t.Errorf("fit %+v", s)
	}
	r, _ := c.Row(3)
	if q, _, _, _, _ := s.At(3, r.Conveyance); relErr(q, r.Conveyance*math.Sqrt(slope(3))) > tol {
		t.Errorf("Q(3) = %g, want %g", q, r.Conveyance*math.Sqrt(slope(3)))
	}
	rng := rand.New(rand.NewPCG(4, 4))
	for i, h := range hs {
		r, _ := c.Row(h)
		qs[i] = r.Conveyance * math.Sqrt(0.001) * math.Exp(0.02*rng.NormFloat64())
	}
	s, err = gauged.FitConveyanceSlope(c, hs, qs, ws)
	if err != nil {
		t.Fatal(err)
	}
	if !(s.TrendP >= gauged.SlopeTrendLevel) || !s.Level || s.Trend != 0 {
		t.Errorf("noisy constant slope: trend %g (p %g), level %v", s.Trend, s.TrendP, s.Level)
	}
	if _, err := gauged.FitConveyanceSlope(c, hs[:2], qs[:2], ws[:2]); err == nil {
		t.Error("two gaugings: no error")
	}
}
