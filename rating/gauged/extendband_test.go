package gauged_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
)

// floodRect is a compound section of rectangles (invented): a main
// channel 10 m wide and 2 m deep with n = 0.035, and on each side a
// floodplain 30 m wide with n = 0.060 and a vertical outer wall, the
// section 4 m high.
const floodRect = "compound:bottom=10,side=0,depth=2,floodplain=30,outer=0,floodn=0.06,height=4"

// floodRectShare is the overbanks' share of the conveyance of floodRect at
// depth y, by Manning's conveyance K = A·R^(2/3)/n (Chow, 1959, eq. 6-9)
// of each subsection, the division lines unwetted (Chow, 1959, section
// 6-4): the channel A = 10·y, P = 10 + 2·2; each floodplain
// A = 30·(y − 2), P = 30 + (y − 2). Closed form.
func floodRectShare(y float64) float64 {
	k := func(a, p, n float64) float64 { return a * math.Pow(a/p, 2.0/3) / n }
	if y <= 2 {
		return 0
	}
	kc := k(10*y, 14, 0.035)
	kf := k(30*(y-2), 30+(y-2), 0.060)
	return 2 * kf / (kc + 2*kf)
}

// Above the highest gauging the bands of a joined extension widen, in
// quadrature with the fitted rating's half-width w_j at the join, by the
// slope's allowance t·½·(h − h_j)·SE(trend) and the allowance for n off
// the channel z·|φ_ob(h) − φ_ob(h_j)|·σ_lnf. Checked against the closed
// form: the gaugings (invented, below the banks, noisy) give the upper
// points' S_i = (Q_i/K_i)² with K_i = 10·y·(10·y/(10 + 2·y))^(2/3)/0.035
// (Manning), the trend's standard error is that of the weighted straight
// line of ln S_i on stage (Draper and Smith, 1998, section 2.6; from
// memory; the gaugings all fair, so equal weights), t Student's 97.5 %
// quantile with n − 2 degrees of freedom (from the published table:
// 3.1824 for 3, 2.7764 for 4, 2.5706 for 5, 2.4469 for 6), z = 1.95996 (normal table),
// σ_lnf = √(ln(1 + 0.2²)) = 0.198042 (hand calculation) and φ_ob from
// floodRectShare. The upper bands are compared; the lower ones are held
// where they would fall (heldLower).
func TestExtensionBandAllowances(t *testing.T) {
	survey := built(t, floodRect, 0.035, 0.001)
	truth := built(t, floodRect, 0.030, 0.001)
	stages := linspace(0.4, 1.9, 12)
	rng := rand.New(rand.NewPCG(21, 21))
	var gs []gauged.Gauging
	for _, h := range stages {
		q, err := truth.Discharge(h)
		if err != nil {
			t.Fatal(err)
		}
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q * math.Exp(0.03*rng.NormFloat64()), Quality: rating.Fair})
	}
	f, tab := joinedTable(t, gs, survey)
	e := tab.Extension
	// The line of ln S_i, by hand.
	n := len(e.Points)
	var sx, sy float64
	x, y := make([]float64, n), make([]float64, n)
	for i, p := range e.Points {
		d := p.Stage
		k := 10 * d * math.Pow(10*d/(10+2*d), 2.0/3) / 0.035
		x[i], y[i] = d, 2*math.Log(p.Discharge/k)
		sx, sy = sx+x[i], sy+y[i]
	}
	xm, ym := sx/float64(n), sy/float64(n)
	var sxx, sxy float64
	for i := range x {
		sxx += (x[i] - xm) * (x[i] - xm)
		sxy += (x[i] - xm) * (y[i] - ym)
	}
	b := sxy / sxx
	var ss float64
	for i := range x {
		r := y[i] - ym - b*(x[i]-xm)
		ss += r * r
	}
	se := math.Sqrt(ss / float64(n-2) / sxx)
	tq, ok := map[int]float64{3: 3.1824, 4: 2.7764, 5: 2.5706, 6: 2.4469}[n-2]
	if !ok {
		t.Fatalf("%d upper gaugings: no Student quantile in the test's table", n)
	}
	const z, sigF = 1.95996, 0.198042
	if relErr(e.LineTrendSE, se) > 1e-9 || relErr(e.NLogSD, sigF) > 1e-5 {
		t.Errorf("trend standard error %g, want %g; σ_lnf %g, want %g", e.LineTrendSE, se, e.NLogSD, sigF)
	}
	j := tab.Rows[checkJoin(t, tab, f.HighStage, gauged.ConveyanceSlopeAbove)]
	wp, wt := math.Log(j.ParametricUpper/j.Discharge), math.Log(j.TotalUpper/j.Discharge)
	hj := f.HighStage
	for _, h := range []float64{2.5, 3.0, 3.5, 4.0} {
		r, err := tab.At(h)
		if err != nil {
			t.Fatal(err)
		}
		aS := tq * 0.5 * (h - hj) * se
		aN := z * math.Abs(floodRectShare(h)-floodRectShare(hj)) * sigF
		const tol = 2e-4 // four- and five-figure quantiles
		if got, want := math.Log(r.ParametricUpper/r.Discharge), math.Sqrt(wp*wp+aS*aS+aN*aN); relErr(got, want) > tol {
			t.Errorf("%g m: parametric half-width %.6g, want %.6g (w_j %.4g, slope %.4g, n %.4g)", h, got, want, wp, aS, aN)
		}
		if got, want := math.Log(r.TotalUpper/r.Discharge), math.Sqrt(wt*wt+aS*aS+aN*aN); relErr(got, want) > tol {
			t.Errorf("%g m: total half-width %.6g, want %.6g (w_j %.4g, slope %.4g, n %.4g)", h, got, want, wt, aS, aN)
		}
		if aN < aS {
			t.Logf("%g m: n's allowance %.3g below the slope's %.3g", h, aN, aS)
		}
	}
	// Above the join the bands widen in ln Q at every row and the lower
	// limits never fall.
	var prev *gauged.ControlRow
	for i := range tab.Rows {
		r := tab.Rows[i]
		if r.Stage < hj {
			continue
		}
		if prev != nil {
			if !(math.Log(r.ParametricUpper/r.Discharge) > math.Log(prev.ParametricUpper/prev.Discharge)) ||
				!(math.Log(r.TotalUpper/r.Discharge) > math.Log(prev.TotalUpper/prev.Discharge)) {
				t.Errorf("band does not widen from %g to %g m: %+v then %+v", prev.Stage, r.Stage, *prev, r)
			}
			const tol = 1e-12 // round-off
			if r.ParametricLower < prev.ParametricLower*(1-tol) || r.TotalLower < prev.TotalLower*(1-tol) {
				t.Errorf("lower band falls from %g to %g m", prev.Stage, r.Stage)
			}
		}
		prev = &tab.Rows[i]
	}
}

// The band note names both allowances; on a hydraulic rating given as a
// table, which has no subsections, the extension takes none for n off
// the channel and its note says so.
func TestExtensionBandNote(t *testing.T) {
	survey := built(t, floodRect, 0.035, 0.001)
	gs := gaugeTruth(t, built(t, floodRect, 0.030, 0.001), linspace(0.4, 1.9, 12), rand.New(rand.NewPCG(22, 22)))
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		opt  gauged.ControlTableOptions
		note string
		ncv  bool
	}{
		{"section", gauged.ControlTableOptions{Hydraulic: &survey, To: 4}, "Manning's n of the overbanks relative to the channel's", true},
		{"table", gauged.ControlTableOptions{HydraulicTable: tableOf(t, survey, 0.05), To: 3.9}, "no allowance for n off the channel: a table reference has no subsections", false},
	} {
		tab, err := f.Table(tc.opt)
		if err != nil {
			t.Fatal(err)
		}
		e := tab.Extension
		if e == nil {
			t.Fatalf("%s: no extension: %q", tc.name, tab.Warnings)
		}
		if !hasWarning([]string{tab.BandNote}, tc.note) || !hasWarning([]string{tab.BandNote}, "t·½·(h − h_j)") {
			t.Errorf("%s: band note %q", tc.name, tab.BandNote)
		}
		if (e.NLogSD > 0) != tc.ncv {
			t.Errorf("%s: σ_lnf %g", tc.name, e.NLogSD)
		}
	}
}

// noBanksOf returns the hydraulic rating of a built shape's section with
// its bank stations taken away: the same ground and n, all channel.
func noBanksOf(t *testing.T, spec string, n, slope float64) rating.HydraulicCurve {
	t.Helper()
	s, err := subdivide.ParseShape(spec)
	if err != nil {
		t.Fatal(err)
	}
	sec, err := s.Section(subdivide.PerRegion{Channel: n})
	if err != nil {
		t.Fatal(err)
	}
	sec.HasBanks = false
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	return rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: slope}}
}

// A section without bank stations is all channel: its overbanks' share of
// conveyance is always 0, so the extension's bands take no allowance for
// n off the channel, and the band note and a warning say so rather than
// naming an allowance that is 0. Above the join the half-widths are then
// √(w_j² + a_S²) alone, a_S = t·½·(h − h_j)·SE(trend) with t Student's
// 97.5 % quantile on n − 2 degrees of freedom (from the published table,
// as in TestExtensionBandAllowances).
func TestExtensionBandNoBanks(t *testing.T) {
	survey := noBanksOf(t, floodRect, 0.035, 0.001)
	gs := gaugeTruth(t, built(t, floodRect, 0.030, 0.001), linspace(0.4, 1.9, 12), rand.New(rand.NewPCG(22, 22)))
	f, tab := joinedTable(t, gs, survey)
	e := tab.Extension
	if e.NLogSD != 0 || e.NCV != 0 || e.Join.OverbankShare != 0 {
		t.Errorf("σ_lnf %g, n cv %g, φ_ob at the join %g: want 0 without bank stations", e.NLogSD, e.NCV, e.Join.OverbankShare)
	}
	const why = "no allowance for n off the channel: the section has no bank stations"
	if !hasWarning([]string{tab.BandNote}, why) || hasWarning([]string{tab.BandNote}, "Manning's n of the overbanks relative") {
		t.Errorf("band note %q", tab.BandNote)
	}
	if !hasWarning(tab.Warnings, "no allowance for Manning's n off the channel: the section has no bank stations") {
		t.Errorf("no warning of the missing allowance: %q", tab.Warnings)
	}
	tq, ok := map[int]float64{3: 3.1824, 4: 2.7764, 5: 2.5706, 6: 2.4469}[e.LineTrendDF]
	if !ok || e.LineTrendDF != len(e.Points)-2 || relErr(e.LineTrendT, tq) > 2e-4 {
		t.Fatalf("t %g on %d degrees of freedom (%d gaugings)", e.LineTrendT, e.LineTrendDF, len(e.Points))
	}
	j := tab.Rows[checkJoin(t, tab, f.HighStage, gauged.ConveyanceSlopeAbove)]
	wp := math.Log(j.ParametricUpper / j.Discharge)
	for _, h := range []float64{2.5, 3.0, 4.0} {
		r, err := tab.At(h)
		if err != nil {
			t.Fatal(err)
		}
		aS := tq * 0.5 * (h - f.HighStage) * e.LineTrendSE
		if got, want := math.Log(r.ParametricUpper/r.Discharge), math.Sqrt(wp*wp+aS*aS); relErr(got, want) > 2e-4 {
			t.Errorf("%g m: parametric half-width %.6g, want %.6g", h, got, want)
		}
	}
	// The same ground with its banks marked has the allowance.
	banked := built(t, floodRect, 0.035, 0.001)
	tb, err := f.Table(gauged.ControlTableOptions{Hydraulic: &banked, To: 4, Step: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if tb.Extension == nil || !(tb.Extension.NLogSD > 0) || hasWarning(tb.Warnings, "no bank stations") {
		t.Errorf("banked section: extension %v, warnings %q", tb.Extension, tb.Warnings)
	}
}

// joinedTable fits one control to gs and tables it to 4 m in steps of
// 0.05 m with survey's conveyance-slope extension, which must be joined.
func joinedTable(t *testing.T, gs []gauged.Gauging, survey rating.HydraulicCurve) (*gauged.ControlFit, gauged.ControlTable) {
	t.Helper()
	f, err := gauged.FitControls(gs, gauged.ControlOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := f.Table(gauged.ControlTableOptions{Hydraulic: &survey, To: 4, Step: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if e := tab.Extension; e == nil || e.Join == nil {
		t.Fatalf("no joined extension: %q", tab.Warnings)
	}
	return f, tab
}
