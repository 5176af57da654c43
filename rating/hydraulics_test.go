package rating

import (
	"math"
	"testing"

	"wetline/subdivide"
)

func compile(t testing.TB, s subdivide.Section) *subdivide.Profile {
	t.Helper()
	p, err := subdivide.Compile(s)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func rowAt(t testing.TB, p *subdivide.Profile, stage, slope float64, u Units) Row {
	t.Helper()
	w, err := p.At(stage, subdivide.Options{AllPools: true})
	if err != nil {
		t.Fatal(err)
	}
	r, err := Hydraulics(w, p.Bottom(), slope, u)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func relErr(a, b float64) float64 { return math.Abs(a-b) / math.Max(math.Abs(b), 1e-300) }

// TestManningSingleChannels compares discharge with Manning's formula
// Q = (k/n)·A·R^(2/3)·S^(1/2) evaluated by hand from the closed-form
// elements of Chow (1959), Table 2-1, and eq. 5-7 for k:
//
//   - wide rectangle b = 50 m, y = 1.2 m, n = 0.030, S = 0.0005 (SI):
//     A = 60, P = 52.4, R = 1.145038…, Q = 60·1.145038^(2/3)·0.0223607/0.030
//   - trapezoid b = 6 ft, z = 2, y = 3 ft, n = 0.025, S = 0.001 (US):
//     A = 36, P = 6 + 6√5 = 19.416408, R = 1.854122…, k = 1.486
func TestManningSingleChannels(t *testing.T) {
	rect := compile(t, subdivide.Section{
		Points: subdivide.XZ(0, 4, 0, 0, 50, 0, 50, 4),
		N:      []float64{0.03, 0.03, 0.03},
	})
	a, p := 60.0, 52.4
	want := a * math.Pow(a/p, 2.0/3) * math.Sqrt(0.0005) / 0.030
	if r := rowAt(t, rect, 1.2, 0.0005, SI); relErr(r.Discharge, want) > 1e-12 {
		t.Errorf("rectangle: Q = %.9g, want %.9g", r.Discharge, want)
	}

	trap := compile(t, subdivide.Section{
		Points: subdivide.XZ(0, 5, 10, 0, 16, 0, 26, 5),
		N:      []float64{0.025, 0.025, 0.025},
	})
	a, p = 36, 6+6*math.Sqrt(5)
	want = 1.486 / 0.025 * a * math.Pow(a/p, 2.0/3) * math.Sqrt(0.001)
	r := rowAt(t, trap, 3, 0.001, US)
	if relErr(r.Discharge, want) > 1e-12 {
		t.Errorf("trapezoid: Q = %.9g, want %.9g", r.Discharge, want)
	}
	// A single roughness gives α = β = 1 (Chow, 1959, section 2-7).
	if math.Abs(r.Alpha-1) > 1e-12 || math.Abs(r.Beta-1) > 1e-12 {
		t.Errorf("alpha, beta = %g, %g; want 1, 1", r.Alpha, r.Beta)
	}
	// Wide-channel check (common practice): for b ≫ y, R ≈ y, and Q per unit
	// width tends to (1/n)·y^(5/3)·√S; at b/y ≈ 42 it is within 5 %.
	q := 1 / 0.030 * math.Pow(1.2, 5.0/3) * math.Sqrt(0.0005)
	if r := rowAt(t, rect, 1.2, 0.0005, SI); relErr(r.Discharge/50, q) > 0.05 {
		t.Errorf("wide rectangle: q = %g, wide-channel limit %g", r.Discharge/50, q)
	}
}

// TestCompoundChannel checks subdivided conveyance and α of a symmetric
// compound section against an independent evaluation in the test of
// K = (1/n)·A·R^(2/3) for each part (Chow, 1959, section 6-8, with vertical
// dividers not counted in the perimeter) and α = Σ(Ki³/Ai²)/(Kt³/At²)
// (Chow, 1959, eq. 2-5 in conveyance form).
//
// Section: main channel 10 m wide, 2 m deep with vertical walls, n = 0.030;
// two floodplains 20 m wide at elevation 2 with vertical outer walls at 5,
// n = 0.060. Stage 3 m.
func TestCompoundChannel(t *testing.T) {
	p := compile(t, subdivide.Section{
		Points:   subdivide.XZ(0, 5, 0, 2, 20, 2, 20, 0, 30, 0, 30, 2, 50, 2, 50, 5),
		N:        []float64{0.06, 0.06, 0.03, 0.03, 0.03, 0.06, 0.06},
		HasBanks: true, LeftBank: 20, RightBank: 30,
	})
	const s = 0.001
	r := rowAt(t, p, 3, s, SI)
	// Independent parts.
	af, pf := 20.0*1, 1.0+20 // floodplain: 1 m deep, outer wall 1 m + floor 20 m
	ac, pc := 10.0*3, 2.0+10+2
	kf := af * math.Pow(af/pf, 2.0/3) / 0.060
	kc := ac * math.Pow(ac/pc, 2.0/3) / 0.030
	kt, at := 2*kf+kc, 2*af+ac
	alpha := (2*kf*kf*kf/(af*af) + kc*kc*kc/(ac*ac)) / (kt * kt * kt / (at * at))
	if relErr(r.Conveyance, kt) > 1e-12 || relErr(r.Discharge, kt*math.Sqrt(s)) > 1e-12 {
		t.Errorf("K = %.9g, want %.9g", r.Conveyance, kt)
	}
	if relErr(r.Alpha, alpha) > 1e-12 {
		t.Errorf("alpha = %.9g, want %.9g", r.Alpha, alpha)
	}
	if len(r.Subs) != 3 || relErr(r.Subs[1].Conveyance, kc) > 1e-12 || relErr(r.Subs[0].Conveyance, kf) > 1e-12 {
		t.Errorf("subsections %+v", r.Subs)
	}
	// A lumped (unsubdivided) conveyance is different: subdivision matters.
	lumped := at * math.Pow(at/(pf*2+pc-2), 2.0/3) / 0.045
	if relErr(r.Conveyance, lumped) < 0.01 {
		t.Errorf("subdivided K %g suspiciously equal to a lumped one %g", r.Conveyance, lumped)
	}
}

// TestUnitConsistency rates the same section in metres and in feet: the
// discharges must agree within 0.1 % once converted (1 ft = 0.3048 m
// exactly; k = 1.486 against the exact 1.4859 differs by 0.007 %).
func TestUnitConsistency(t *testing.T) {
	si := subdivide.Section{
		Points:   subdivide.XZ(0, 3, 5, 1.2, 8, 0, 12, 0.2, 15, 1.4, 30, 1.8, 34, 3),
		N:        []float64{0.04, 0.035, 0.035, 0.035, 0.07, 0.07},
		HasBanks: true, LeftBank: 5, RightBank: 15,
	}
	us := si
	us.Points = nil
	for _, q := range si.Points {
		us.Points = append(us.Points, subdivide.Point{Station: q.Station * FeetPerMetre, Elevation: q.Elevation * FeetPerMetre})
	}
	us.LeftBank, us.RightBank = si.LeftBank*FeetPerMetre, si.RightBank*FeetPerMetre
	psi, pus := compile(t, si), compile(t, us)
	for _, h := range []float64{0.5, 1.3, 2.5} {
		qsi := rowAt(t, psi, h, 0.002, SI).Discharge
		qus := rowAt(t, pus, h*FeetPerMetre, 0.002, US).Discharge
		cfs := math.Pow(FeetPerMetre, 3)
		if e := relErr(qus/cfs, qsi); e > 0.001 {
			t.Errorf("stage %g m: %g m3/s vs %g ft3/s (= %g m3/s), %.3f %% apart", h, qsi, qus, qus/cfs, e*100)
		}
	}
}

// TestFroudeCritical checks the Froude number of a rectangular channel at
// critical depth yc = (q²/g)^(1/3) is 1 (Chow, 1959, eq. 4-11, closed form).
func TestFroudeCritical(t *testing.T) {
	const b, q = 4.0, 3.0 // m, m³/s per m
	g := SI.Gravity()
	yc := math.Cbrt(q * q / g)
	fr := FroudeNumber(q*b, b*yc, b, 1, SI)
	if math.Abs(fr-1) > 1e-12 {
		t.Errorf("Froude at critical depth = %g", fr)
	}
	if !math.IsNaN(FroudeNumber(1, 1, 0, 1, SI)) {
		t.Error("Froude with zero top width should be undefined (NaN)")
	}
}

func TestComputeDryAndUndefined(t *testing.T) {
	p := compile(t, subdivide.Section{Points: subdivide.XZ(0, 2, 1, 0, 2, 2), N: []float64{0.03, 0.03}})
	tab, err := Compute(p, []float64{-1, 0, 1}, Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	dry := tab.Rows[0]
	if dry.Area != 0 || dry.Discharge != 0 || !math.IsNaN(dry.Froude) || !math.IsNaN(dry.HydraulicRadius) {
		t.Errorf("dry row %+v", dry)
	}
	if _, err := Compute(p, []float64{1}, Options{}); err == nil {
		t.Error("zero slope accepted")
	}
	// No n: an error, not a silent zero.
	q := compile(t, subdivide.Section{Points: subdivide.XZ(0, 2, 1, 0, 2, 2)})
	if _, err := Compute(q, []float64{1}, Options{Slope: 0.001}); err == nil {
		t.Error("missing n accepted")
	}
}

func TestDefaultStages(t *testing.T) {
	p := compile(t, subdivide.Section{Points: subdivide.XZ(0, 104.8, 10, 100.3, 20, 104.9), N: []float64{0.03, 0.03}})
	s := DefaultStages(p)
	if s[0] != 100.3 || s[len(s)-1] != 104.8 || len(s) > MaxDefaultRows+2 || len(s) < 20 {
		t.Errorf("stages %v", s)
	}
	for i := 1; i < len(s); i++ {
		if !(s[i] > s[i-1]) {
			t.Fatalf("not increasing: %v", s)
		}
	}
}

// TestConveyanceDropFlag checks the flag on the classic case of a compound
// section rated without subdivision: just above bankfull the wetted
// perimeter jumps while the area barely grows, so conveyance falls
// (Chow, 1959, section 6-8).
func TestConveyanceDropFlag(t *testing.T) {
	p := compile(t, subdivide.Section{
		Points: subdivide.XZ(0, 4, 0, 2, 100, 2, 100, 0, 110, 0, 110, 2, 210, 2, 210, 4),
		N:      []float64{0.04, 0.04, 0.04, 0.04, 0.04, 0.04, 0.04},
	})
	tab, err := Compute(p, []float64{1.9, 2.0, 2.05, 2.1, 3.5}, Options{Slope: 0.001})
	if err != nil {
		t.Fatal(err)
	}
	has := func(r Row, f string) bool {
		for _, g := range r.Flags {
			if g == f {
				return true
			}
		}
		return false
	}
	if !has(tab.Rows[2], FlagConveyanceDrop) || has(tab.Rows[1], FlagConveyanceDrop) || has(tab.Rows[4], FlagConveyanceDrop) {
		t.Errorf("flags %v %v %v", tab.Rows[1].Flags, tab.Rows[2].Flags, tab.Rows[4].Flags)
	}
	if len(tab.Warnings) == 0 {
		t.Error("no warning about the conveyance drop")
	}
}

// TestWallsConvey: vertical walls with their own n are subsections of no
// width; their wetted perimeter joins the subsection they face with the
// Horton–Einstein composite n (Chow 1959, section 6-7), so a rougher wall
// lowers the discharge. Rectangle 5 m wide, walls n = 0.1, bed n = 0.03,
// depth 1 m, S = 0.001 (SI), by hand: A = 5, P = 7,
//
//	n = ((5·0.03^1.5 + 2·1·0.1^1.5)/7)^(2/3) = 0.054594…,
//	Q = 5·(5/7)^(2/3)·√0.001/n = 2.3138…;
//
// with walls of the bed's n, 0.03, the section is one subsection and
// Q = 5·(5/7)^(2/3)·√0.001/0.03 = 4.2106…
func TestWallsConvey(t *testing.T) {
	box := func(wall float64) *subdivide.Profile {
		return compile(t, subdivide.Section{Points: []subdivide.Point{{Station: 0, Elevation: 3}, {Station: 0, Elevation: 0},
			{Station: 5, Elevation: 0}, {Station: 5, Elevation: 3}}, N: []float64{wall, 0.03, wall}})
	}
	horton := math.Pow((5*math.Pow(0.03, 1.5)+2*math.Pow(0.1, 1.5))/7, 2.0/3)
	want := 5 * math.Pow(5.0/7, 2.0/3) * math.Sqrt(0.001) / horton
	rough := rowAt(t, box(0.1), 1, 0.001, SI)
	if relErr(rough.Discharge, want) > 1e-12 {
		t.Errorf("walls n 0.1: Q = %.6g, want %.6g (Horton–Einstein over bed and walls)", rough.Discharge, want)
	}
	if p := rough.Subs[1].WettedPerimeter; relErr(p, 7) > 1e-12 || rough.Subs[0].WettedPerimeter != 0 || rough.Subs[2].WettedPerimeter != 0 {
		t.Errorf("perimeters %g, %g, %g: want the walls' 1 + 1 in the bed's 5", rough.Subs[0].WettedPerimeter, p, rough.Subs[2].WettedPerimeter)
	}
	if relErr(rough.WettedPerimeter, 7) > 1e-12 {
		t.Errorf("section perimeter %g, want 7", rough.WettedPerimeter)
	}
	smooth := rowAt(t, box(0.03), 1, 0.001, SI)
	if w := 5 * math.Pow(5.0/7, 2.0/3) * math.Sqrt(0.001) / 0.03; relErr(smooth.Discharge, w) > 1e-12 {
		t.Errorf("walls n 0.03: Q = %.6g, want %.6g", smooth.Discharge, w)
	}
	if !(rough.Discharge < smooth.Discharge) {
		t.Errorf("rougher walls carry more: %g against %g", rough.Discharge, smooth.Discharge)
	}
}

// TestRegimeFlags checks that a row's regime flag follows Regime: a wide
// rectangle (n = 0.03, 50 m wide, 1 m deep, α = 1) on the slope that gives
// it Froude number F, from Manning's equation and F = V/√(g·D) solved for
// S = (F·n·√(g·D)/R^(2/3))² (Chow 1959, eqs. 3-7 and 5-6, closed form). A
// Froude number of 1 to rounding, or inside CriticalBand, is near critical,
// never supercritical.
func TestRegimeFlags(t *testing.T) {
	const b, y, n = 50.0, 1.0, 0.03
	p := compile(t, subdivide.Section{Points: subdivide.XZ(0, 3, 0, 0, b, 0, b, 3), N: []float64{n, n, n}})
	r := b * y / (b + 2*y)
	for _, tc := range []struct {
		froude float64
		want   string // the regime flag, "" for none
	}{
		{0.5, ""},
		{0.95, FlagNearCritical},
		{1 - 1e-12, FlagNearCritical},
		{1 + 1e-12, FlagNearCritical}, // critical depth, Froude 1 to rounding
		{1 + CriticalBand/2, FlagNearCritical},
		{1 + 2*CriticalBand, FlagSupercritical},
		{1.5, FlagSupercritical},
	} {
		s := math.Pow(tc.froude*n*math.Sqrt(SI.Gravity()*y)/math.Pow(r, 2.0/3), 2)
		row := rowAt(t, p, y, s, SI)
		if math.Abs(row.Froude-tc.froude) > 1e-12 {
			t.Fatalf("F %v: computed %v", tc.froude, row.Froude)
		}
		got := ""
		for _, f := range row.Flags {
			if f == FlagNearCritical || f == FlagSupercritical {
				got += f
			}
		}
		if got != tc.want {
			t.Errorf("Froude %v (computed %.15g): flags %q, want %q (regime %q)", tc.froude, row.Froude, got, tc.want, Regime(row.Froude))
		}
	}
}
