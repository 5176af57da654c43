package reach

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// Tolerances of the step-backwater tests.
const (
	// normalTol is the relative tolerance on depth between the upstream
	// end of a long prismatic reach and the normal depth of
	// rating.NormalStages (which is found to rating.DepthTolerance).
	normalTol = 10 * rating.DepthTolerance
	// energyBalanceTol is the relative tolerance to which the energy
	// equation, recomputed in the test from rating.Hydraulics on
	// Geometry.At, balances at every subreach (relative to the specific
	// energy of the upstream section).
	energyBalanceTol = 1e-9
	// monotoneSlack is the depth change (relative) below which two depths
	// of a converged profile count as equal in a monotonicity check.
	monotoneSlack = 1e-9
	// pathTol is the relative depth tolerance between profiles that solve
	// the same equations exactly by different paths (the piecewise form
	// or At; another order of discharges): both are found to
	// BackwaterStageTolerance.
	pathTol = 1e-9
	// settledSpread is the spread below which the two profiles of a long
	// reach count as joined: a thousandth of the default tolerance.
	settledSpread = 1e-3 * SpreadToleranceSI
)

// prismNormal returns the highest normal stage of q at slope s in g
// (rating.NormalStages: Manning's equation, Chow 1959, section 6-4).
func prismNormal(t *testing.T, g subdivide.Geometry, q, s float64, u rating.Units) rating.Root {
	t.Helper()
	roots, err := rating.NormalStages(g, q, rating.Options{Slope: s, Units: u})
	if err != nil {
		t.Fatal(err)
	}
	return roots[len(roots)-1]
}

// In a long prismatic channel on a mild slope the profile tends upstream
// to the normal depth, from above along an M1 curve when the boundary
// stage is raised above normal, from below along an M2 curve when it is
// at critical depth: depth decreasing upstream towards normal in the
// first, increasing towards it in the second, and never crossing it
// (Chow 1959, Open-Channel Hydraulics, sections 9-1 to 9-3: the M1
// backwater and M2 drawdown curves). In the last case the compound
// section has three critical depths at the discharge (Blalock and Sturm
// 1981, J. Hydraulics Div. ASCE 107(HY6)): in-bank, where the flat
// floodplains are wetted, and on them; normal depth is in-bank, in the
// lower of the two subcritical bands, and the profile must find it there.
// Chow's curves assume one critical depth, so their shape is not checked
// in that case: a profile falling from the floodplains drops into the
// channel where the upper subcritical root vanishes.
func TestBackwaterTendsToNormal(t *testing.T) {
	for _, tc := range []struct {
		name, spec string
		n          subdivide.PerRegion
		q, s0, dx  float64
		m          int
		units      rating.Units
		crits      int // critical stages expected; when > 1 the curve's shape is not checked
	}{
		{"trapezoid", "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 50, 0.001, 300, 40, rating.SI, 0},
		{"wide rectangle", "rectangle:width=40", subdivide.Uniform(0.025), 120, 0.0005, 400, 60, rating.SI, 0},
		{"compound", "compound:bottom=8,side=1.5,depth=2,floodplain=30,outer=2,floodn=0.06", subdivide.PerRegion{Channel: 0.03, Left: 0.06, Right: 0.06}, 90, 0.001, 300, 50, rating.SI, 0},
		{"trapezoid, feet", "trapezoid:bottom=30,side=2", subdivide.Uniform(0.03), 1800, 0.001, 1000, 40, rating.US, 0},
		{"compound, three critical depths", "compound:bottom=6,side=1,depth=1.5,floodplain=80,outer=2,floodn=0.05", subdivide.PerRegion{Channel: 0.03, Left: 0.05, Right: 0.05}, 20, 0.003, 200, 60, rating.SI, 3},
	} {
		t.Run(tc.name, func(t *testing.T) {
			secs := prismReach(t, tc.spec, tc.n, tc.m, tc.dx, tc.s0)
			last := secs[len(secs)-1].Geometry
			sol, err := rating.Solve(last, tc.q, rating.Options{Slope: tc.s0, Units: tc.units})
			if err != nil {
				t.Fatal(err)
			}
			yn := prismNormal(t, last, tc.q, tc.s0, tc.units).Depth
			if fr := sol.Normal[len(sol.Normal)-1].Row.Froude; !(fr < 1) {
				t.Fatalf("Froude number %g at normal depth: not a mild slope", fr)
			}
			if tc.crits > 0 && len(sol.Critical) != tc.crits {
				t.Fatalf("%d critical stages, want %d", len(sol.Critical), tc.crits)
			}
			for _, b := range []struct {
				curve string
				bd    Boundary
			}{
				{"M1", Boundary{Kind: KnownStage, Stage: last.Bottom() + yn + 1.5}},
				{"M2", Boundary{Kind: CriticalDepth}},
			} {
				res, err := ComputeBackwater(secs, []float64{tc.q}, b.bd, BackwaterOptions{Units: tc.units})
				if err != nil {
					t.Fatal(err)
				}
				ps := res.Profiles[0].Sections
				for j := len(ps) - 2; j >= 0 && tc.crits <= 1; j-- {
					y, ydn := ps[j].WaterSurface-ps[j].Bottom, ps[j+1].WaterSurface-ps[j+1].Bottom
					slack := monotoneSlack * yn
					switch b.curve {
					case "M1": // above normal, falling upstream
						if y < yn-slack || y > ydn+slack {
							t.Errorf("%s %s: depth %g after %g downstream, normal %g", b.curve, ps[j].ID, y, ydn, yn)
						}
					case "M2": // below normal, rising upstream
						if y > yn+slack || y < ydn-slack {
							t.Errorf("%s %s: depth %g after %g downstream, normal %g", b.curve, ps[j].ID, y, ydn, yn)
						}
					}
					if ps[j].Critical || !(ps[j].Froude < 1) {
						t.Errorf("%s %s: critical %v, Froude %g", b.curve, ps[j].ID, ps[j].Critical, ps[j].Froude)
					}
				}
				if y := ps[0].WaterSurface - ps[0].Bottom; math.Abs(y-yn) > normalTol*yn {
					t.Errorf("%s: upstream depth %.9g, normal depth %.9g", b.curve, y, yn)
				}
			}
		})
	}
}

// hydraulicsAt returns rating.Hydraulics of g at stage h (slope 1).
func hydraulicsAt(t *testing.T, g subdivide.Geometry, h float64, gopt subdivide.Options) rating.Row {
	t.Helper()
	w, err := g.At(h, gopt)
	if err != nil {
		t.Fatal(err)
	}
	r, err := rating.Hydraulics(w, g.Bottom(), 1, rating.SI)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// regionK sums a row's subsection conveyances by region.
func regionK(r rating.Row) [3]float64 {
	var k [3]float64 // indexed by subdivide.Region
	for _, s := range r.Subs {
		k[s.Region] += s.Conveyance
	}
	return k
}

// The energy equation of Davidian (1984, TWRI 3-A15) and Chow (1959,
// section 10-2), recomputed in the test from rating.Hydraulics on the
// sections' exact geometry (Geometry.At) at the computed stages, balances
// at every subreach of natural sections from in-bank to overbank flow,
// with conveyance-weighted lengths on some subreaches:
//
//	hu + αu·Vu²/2g = hd + αd·Vd²/2g + L·Q²/(Ku·Kd) + k·|Δ(α·V²/2g)|
func TestBackwaterEnergyBalance(t *testing.T) {
	const g = 9.80665
	secs := naturalReach(t, 12, 120, 200, 0.001)
	secs[2].FlowLengths = subdivide.PerRegion{Channel: 200, Left: 260, Right: 230} // a bend: the overbanks are shorter
	secs[5].FlowLengths = subdivide.PerRegion{Channel: 190, Left: 0, Right: 215}
	gopt := subdivide.Options{}
	opt := BackwaterOptions{Geometry: gopt, Expansion: 0.3, Contraction: 0.1}
	res, err := ComputeBackwater(secs, ladder(2, 600, 25), Boundary{Kind: NormalDepth, Slope: 0.001}, opt)
	if err != nil {
		t.Fatal(err)
	}
	checked, jumps, overbank := 0, 0, false
	for _, p := range res.Profiles {
		q := p.Discharge
		for j := 0; j+1 < len(secs); j++ {
			up, dn := p.Sections[j], p.Sections[j+1]
			if up.Critical {
				continue
			}
			if up.Jump {
				jumps++
				continue
			}
			ru := hydraulicsAt(t, secs[j].Geometry, up.WaterSurface, gopt)
			rd := hydraulicsAt(t, secs[j+1].Geometry, dn.WaterSurface, gopt)
			hvu := ru.Alpha * q * q / (2 * g * ru.Area * ru.Area)
			hvd := rd.Alpha * q * q / (2 * g * rd.Area * rd.Area)
			l := secs[j+1].Distance - secs[j].Distance
			if fl := secs[j].FlowLengths.Array(); fl != [3]float64{} {
				for i := range fl { // a zero entry is the distance
					if fl[i] == 0 {
						fl[i] = l
					}
				}
				// Davidian (1984): ΣLi·Ki/K at each end, averaged.
				ku, kd := regionK(ru), regionK(rd)
				l = 0.5 * ((fl[0]*ku[0]+fl[1]*ku[1]+fl[2]*ku[2])/ru.Conveyance + (fl[0]*kd[0]+fl[1]*kd[1]+fl[2]*kd[2])/rd.Conveyance)
			}
			k := 0.1
			if hvu > hvd {
				k = 0.3
			}
			lhs := up.WaterSurface + hvu
			rhs := dn.WaterSurface + hvd + l*q*q/(ru.Conveyance*rd.Conveyance) + k*math.Abs(hvu-hvd)
			e := ru.Depth + hvu // specific energy upstream
			if math.Abs(lhs-rhs) > energyBalanceTol*e || math.Abs(up.Residual) > energyBalanceTol*e {
				t.Errorf("Q %g %s: energy %.12g against %.12g (residual %.3g, specific energy %.4g)", q, up.ID, lhs, rhs, lhs-rhs, e)
			}
			if math.Abs(up.Length-l) > energyBalanceTol*l {
				t.Errorf("Q %g %s: subreach length %.9g, hand %.9g", q, up.ID, up.Length, l)
			}
			if math.Abs(up.VelocityHead-hvu) > energyBalanceTol*e {
				t.Errorf("Q %g %s: velocity head %g, want %g", q, up.ID, up.VelocityHead, hvu)
			}
			overbank = overbank || ru.Subs[0].Area > 0
			checked++
		}
	}
	if checked < 200 || !overbank || jumps > checked/50 {
		t.Errorf("checked %d subreaches, %d at a jump, overbank flow %v", checked, jumps, overbank)
	}
}

// WeightedLength against a hand computation (Davidian 1984, weighted
// length of a subreach): upstream K = 100, 600, 300 and lengths 90, 100,
// 120 give (9 000 + 60 000 + 36 000)/1 000 = 105; downstream K = 200,
// 600, 200 give (18 000 + 60 000 + 24 000)/1 000 = 102; the mean is 103.5.
// Channel, left, right are indexed by subdivide.Region.
func TestWeightedLength(t *testing.T) {
	l := subdivide.PerRegion{Channel: 100, Left: 90, Right: 120}
	ku := subdivide.PerRegion{Channel: 600, Left: 100, Right: 300}
	kd := subdivide.PerRegion{Channel: 600, Left: 200, Right: 200}
	for _, tc := range []struct {
		name   string
		ku, kd subdivide.PerRegion
		want   float64
	}{
		{"both", ku, kd, 103.5},
		{"in-bank only", subdivide.PerRegion{Channel: 500}, subdivide.PerRegion{Channel: 700}, 100},
		{"upstream dry", subdivide.PerRegion{}, kd, 102},
	} {
		if got := WeightedLength(l, tc.ku, tc.kd); saRelErr(got, tc.want) > saClosedFormTol {
			t.Errorf("%s: %.15g, hand %g", tc.name, got, tc.want)
		}
	}
	if got := WeightedLength(l, subdivide.PerRegion{}, subdivide.PerRegion{}); !math.IsNaN(got) {
		t.Errorf("no conveyance: %g, want NaN", got)
	}
}

// hideAll wraps every section's geometry so that it is evaluated with At.
func hideAll(secs []Section) []Section {
	out := append([]Section(nil), secs...)
	for i := range out {
		out[i].Geometry = hidden{out[i].Geometry}
	}
	return out
}

// The exact piecewise form and stage-by-stage evaluation with At give the
// same profiles, and the order in which discharges are given (which
// changes the warm starts) does not change them.
func TestBackwaterPathsAgree(t *testing.T) {
	secs := naturalReach(t, 8, 80, 250, 0.0008)
	qs := []float64{300, 5, 120, 40, 450, 12}
	bd := Boundary{Kind: NormalDepth, Slope: 0.0008}
	opt := BackwaterOptions{Geometry: subdivide.Options{}}
	fast, err := ComputeBackwater(secs, qs, bd, opt)
	if err != nil {
		t.Fatal(err)
	}
	slow, err := ComputeBackwater(hideAll(secs), qs, bd, opt)
	if err != nil {
		t.Fatal(err)
	}
	rev := []float64{12, 450, 40, 120, 5, 300}
	back, err := ComputeBackwater(secs, rev, bd, opt)
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range fast.Profiles {
		for j, s := range p.Sections {
			d := s.WaterSurface - s.Bottom
			for _, o := range []struct {
				what string
				s    ProfileSection
			}{{"with At", slow.Profiles[i].Sections[j]}, {"reordered", back.Profiles[len(qs)-1-i].Sections[j]}} {
				if math.Abs(o.s.WaterSurface-s.WaterSurface) > pathTol*d || o.s.Critical != s.Critical {
					t.Errorf("Q %g %s: %.12g, %s %.12g", p.Discharge, s.ID, s.WaterSurface, o.what, o.s.WaterSurface)
				}
			}
		}
	}
}

// Where the bed drops by more than the flow can climb back, no
// subcritical stage upstream balances the energy equation: the stage is
// critical depth (Froude number 1, Chow 1959, section 4-2) and the row
// and the warnings say so. A boundary stage below critical depth is
// replaced by critical depth.
func TestBackwaterCriticalFallback(t *testing.T) {
	secs := prismReach(t, "rectangle:width=10", subdivide.Uniform(0.03), 3, 100, 0.001)
	drop, err := subdivide.ParseShape("rectangle:width=10,invert=95")
	if err != nil {
		t.Fatal(err)
	}
	if secs[2].Geometry, err = drop.Build(subdivide.Uniform(0.03)); err != nil {
		t.Fatal(err)
	}
	const q = 30.0
	res, err := ComputeBackwater(secs, []float64{q}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p := res.Profiles[0]
	s := p.Sections[1]
	yc := math.Cbrt(q * q / (9.80665 * 100)) // rectangle: yc = ∛(q²/g) per unit width (Chow 1959, eq. 4-8 form)
	if !s.Critical || math.Abs(s.Froude-1) > saClosedFormTol || math.Abs(s.WaterSurface-s.Bottom-yc) > saClosedFormTol*yc {
		t.Errorf("section above the drop: critical %v, Froude %g, depth %g (critical depth %g)", s.Critical, s.Froude, s.WaterSurface-s.Bottom, yc)
	}
	if len(p.Warnings) == 0 || !strings.Contains(strings.Join(res.Warnings, " "), "critical depth") {
		t.Errorf("no warning of critical depth: %q %q", p.Warnings, res.Warnings)
	}
	if p.Sections[0].Critical {
		t.Error("the section upstream of the critical one is critical too")
	}
	// A known stage below critical depth at the last section.
	last := secs[2].Geometry.Bottom()
	res, err = ComputeBackwater(secs, []float64{q}, Boundary{Kind: KnownStage, Stage: last + 0.5*yc}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	s = res.Profiles[0].Sections[2]
	if !s.Critical || !res.Profiles[0].StartCritical || math.Abs(s.WaterSurface-last-yc) > saClosedFormTol*yc {
		t.Errorf("boundary below critical: critical %v, depth %g, want %g", s.Critical, s.WaterSurface-last, yc)
	}
	if len(res.Profiles[0].Warnings) == 0 {
		t.Error("no warning for a boundary stage below critical depth")
	}
}

// A rating read at critical depth (the section above a drop, as in
// TestBackwaterCriticalFallback) is flagged critical_stage, never
// supercritical, whatever the rounding of its Froude number (1 at critical
// depth, Chow 1959, section 4-2), and each row of the rating table carries
// the discharge asked for, exactly.
func TestBackwaterTableCriticalRows(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 3, 100, 0.001)
	drop, err := subdivide.ParseShape("trapezoid:bottom=10,side=2,invert=95")
	if err != nil {
		t.Fatal(err)
	}
	if secs[2].Geometry, err = drop.Build(subdivide.Uniform(0.03)); err != nil {
		t.Fatal(err)
	}
	qs := []float64{5, 7, 10, 20, 30, 50, 70, 100}
	res, err := ComputeBackwater(secs, qs, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{At: secs[1].ID})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := res.Rating.Table()
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range tab.Rows {
		flags := strings.Join(r.Flags, " ")
		if !res.Rating.Rows[i].Critical || !strings.Contains(flags, FlagCriticalStage) || strings.Contains(flags, rating.FlagSupercritical) {
			t.Errorf("Q %g: critical %v, Froude %.17g, flags %q", qs[i], res.Rating.Rows[i].Critical, r.Froude, flags)
		}
		if r.Discharge != qs[i] {
			t.Errorf("row %d: discharge %.17g, asked %g", i, r.Discharge, qs[i])
		}
		for _, sr := range r.Subs { // one subsection: it carries the whole discharge
			if sr.Area > 0 && sr.Discharge != qs[i] {
				t.Errorf("row %d: subsection discharge %.17g, asked %g", i, sr.Discharge, qs[i])
			}
		}
	}
}

// Profiles from the two starts converge upstream (Davidian 1984,
// convergence of backwater curves): at the upstream end of a long reach
// they agree, at the first section upstream of the boundary they do not,
// and a rating read there is unsettled and warned.
func TestBackwaterConvergence(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 40, 300, 0.001)
	bd := Boundary{Kind: NormalDepth, Slope: 0.001}
	long, err := ComputeBackwater(secs, []float64{20, 50}, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	short, err := ComputeBackwater(secs, []float64{20, 50}, bd, BackwaterOptions{At: secs[38].ID})
	if err != nil {
		t.Fatal(err)
	}
	for i, rd := range long.Rating.Rows {
		if rd.Unsettled || rd.Spread > settledSpread {
			t.Errorf("long reach: spread %g unsettled %v", rd.Spread, rd.Unsettled)
		}
		p := long.Profiles[i]
		if !p.SecondCritical || p.StartCritical || math.Abs(p.Sections[39].WaterSurface-p.Start) != 0 {
			t.Errorf("starts %g (critical %v) and %g (critical %v)", p.Start, p.StartCritical, p.SecondStart, p.SecondCritical)
		}
		if sr := short.Rating.Rows[i]; !sr.Unsettled || !(sr.Spread > SpreadToleranceSI) {
			t.Errorf("one subreach from the boundary: spread %g unsettled %v", sr.Spread, sr.Unsettled)
		}
	}
	if strings.Contains(strings.Join(long.Warnings, " "), "too short") {
		t.Errorf("long reach warned: %q", long.Warnings)
	}
	if !strings.Contains(strings.Join(short.Warnings, " "), "too short for the boundary to be forgotten") {
		t.Errorf("short reach not warned: %q", short.Warnings)
	}
	// A critical-depth boundary is checked against a raised start.
	crit, err := ComputeBackwater(secs, []float64{50}, Boundary{Kind: CriticalDepth}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p := crit.Profiles[0]
	bottom := secs[39].Geometry.Bottom()
	if !p.StartCritical || p.SecondCritical || saRelErr(p.SecondStart-bottom, RaisedStartFactor*(p.Start-bottom)) > saClosedFormTol {
		t.Errorf("critical boundary: starts %g and %g", p.Start, p.SecondStart)
	}
}

// The boundary kinds agree where they describe the same stage: a known
// stage equal to the normal stage of rating.NormalStages, a stage
// function giving it, and a stage-discharge table of the last section's
// uniform-flow rating (rating.Compute, Manning's equation) at stages Δh =
// 0.01 m apart, read by linear interpolation. The first two agree with
// the normal-depth boundary to rating.DepthTolerance of the depth. The
// table errs by linear interpolation: in stage, about Δh²·|Q″|/(8·Q′)
// with Q′ and Q″ the derivatives of discharge with stage (taken from the
// table by finite differences), and the difference can only shrink
// upstream as the profiles converge.
func TestBackwaterBoundaries(t *testing.T) {
	const s0, q, dh = 0.001, 37.0, 0.01
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5", subdivide.Uniform(0.035), 6, 200, s0)
	last := secs[5].Geometry
	hn := prismNormal(t, last, q, s0, rating.SI)
	stages, err := rating.StageRange(last.Bottom()+dh, last.Bottom()+5, dh)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := rating.Compute(last, stages, rating.Options{Slope: s0})
	if err != nil {
		t.Fatal(err)
	}
	var pts []StageDischarge
	var interp float64 // the interpolation bound about the normal stage
	for i, r := range tab.Rows {
		pts = append(pts, StageDischarge{Stage: r.Stage, Discharge: r.Discharge})
		if i > 0 && i+1 < len(tab.Rows) && math.Abs(r.Stage-hn.Stage) < 2*dh {
			q1 := (tab.Rows[i+1].Discharge - tab.Rows[i-1].Discharge) / (2 * dh)
			q2 := (tab.Rows[i+1].Discharge - 2*r.Discharge + tab.Rows[i-1].Discharge) / (dh * dh)
			interp = math.Max(interp, dh*dh*math.Abs(q2)/(8*q1))
		}
	}
	normal, err := ComputeBackwater(secs, []float64{q}, Boundary{Kind: NormalDepth, Slope: s0}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := normal.Profiles[0]
	if d := want.Start - hn.Stage; math.Abs(d) > rating.DepthTolerance*hn.Depth {
		t.Errorf("normal start %g, rating.NormalStages %g", want.Start, hn.Stage)
	}
	for _, tc := range []struct {
		name string
		bd   Boundary
		tol  float64
	}{
		{"known stage", Boundary{Kind: KnownStage, Stage: hn.Stage}, rating.DepthTolerance * hn.Depth},
		{"stage function", Boundary{Kind: StageRating, StageOf: func(float64) (float64, error) { return hn.Stage, nil }}, rating.DepthTolerance * hn.Depth},
		{"stage table", Boundary{Kind: StageRating, Rating: pts}, interp},
	} {
		res, err := ComputeBackwater(secs, []float64{q}, tc.bd, BackwaterOptions{})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		p := res.Profiles[0]
		if d := p.Start - want.Start; math.Abs(d) > tc.tol {
			t.Errorf("%s: start %.7f, normal depth %.7f (tolerance %.2g)", tc.name, p.Start, want.Start, tc.tol)
		}
		if d := p.Sections[0].WaterSurface - want.Sections[0].WaterSurface; math.Abs(d) > tc.tol {
			t.Errorf("%s: upstream stage %.7f, from normal depth %.7f", tc.name, p.Sections[0].WaterSurface, want.Sections[0].WaterSurface)
		}
	}
	if !(interp > 0) {
		t.Fatal("no interpolation bound")
	}
	if _, err := ComputeBackwater(secs, []float64{q, 1e5}, Boundary{Kind: StageRating, Rating: pts}, BackwaterOptions{}); !errors.Is(err, ErrBoundaryRange) {
		t.Errorf("discharge beyond the table: %v", err)
	}
}

// Inputs that are not steady subcritical open-channel flow through
// surveyed sections are refused with a sentinel error.
func TestBackwaterRefuses(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5", subdivide.Uniform(0.035), 3, 200, 0.001)
	pipe, err := subdivide.ParseShape("circle:diameter=2,invert=99.7")
	if err != nil {
		t.Fatal(err)
	}
	culvert, err := pipe.Build(subdivide.Uniform(0.013))
	if err != nil {
		t.Fatal(err)
	}
	with := func(f func(s []Section)) []Section {
		s := append([]Section(nil), secs...)
		f(s)
		return s
	}
	normal := Boundary{Kind: NormalDepth, Slope: 0.001}
	for _, tc := range []struct {
		name  string
		secs  []Section
		qs    []float64
		bd    Boundary
		opt   BackwaterOptions
		want  error
		field string
	}{
		{"culvert", with(func(s []Section) { s[1].Geometry = culvert }), []float64{10}, normal, BackwaterOptions{}, ErrClosedConduit, "geometry"},
		{"one section", secs[:1], []float64{10}, normal, BackwaterOptions{}, ErrBackwaterSections, ""},
		{"distances", with(func(s []Section) { s[2].Distance = s[1].Distance }), []float64{10}, normal, BackwaterOptions{}, ErrDistances, "distance"},
		{"flow length", with(func(s []Section) { s[0].FlowLengths = subdivide.PerRegion{Channel: 200, Left: -5, Right: 0} }), []float64{10}, normal, BackwaterOptions{}, ErrFlowLength, "flow_lengths"},
		{"zero discharge", secs, []float64{10, 0}, normal, BackwaterOptions{}, ErrDischarge, ""},
		{"no discharges", secs, nil, normal, BackwaterOptions{}, ErrNoDischarges, ""},
		{"no slope", secs, []float64{10}, Boundary{Kind: NormalDepth}, BackwaterOptions{}, ErrBoundary, ""},
		{"dry stage", secs, []float64{10}, Boundary{Kind: KnownStage, Stage: 90}, BackwaterOptions{}, ErrBoundary, ""},
		{"falling table", secs, []float64{10}, Boundary{Kind: StageRating, Rating: []StageDischarge{{100, 5}, {101, 4}}}, BackwaterOptions{}, ErrBoundary, ""},
		{"eddy k", secs, []float64{10}, normal, BackwaterOptions{Expansion: 1.5}, ErrEddyK, ""},
		{"rating section", secs, []float64{10}, normal, BackwaterOptions{At: "nowhere"}, ErrRatingSection, ""},
		{"above the ends", prismReach(t, "trapezoid:bottom=6,side=1.5,height=2", subdivide.Uniform(0.035), 3, 200, 0.001),
			[]float64{10, 500}, normal, BackwaterOptions{Geometry: subdivide.Options{AllPools: true, NoExtend: true}}, subdivide.ErrAboveEnds, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ComputeBackwater(tc.secs, tc.qs, tc.bd, tc.opt)
			if !errors.Is(err, tc.want) {
				t.Fatalf("err = %v, want %v", err, tc.want)
			}
			var se *SectionError
			if tc.field != "" && (!errors.As(err, &se) || se.Field != tc.field) {
				t.Errorf("err = %#v, want a SectionError on %s", err, tc.field)
			}
		})
	}
}

// The rating table at the rating section carries the full hydraulics at
// each computed stage with the friction slope (Q/K)² there, so each row's
// Manning discharge K·√Sf is the profile's discharge (Chow 1959, eq. 6-9);
// the row carries that discharge exactly, not K·√Sf with its rounding.
func TestBackwaterTable(t *testing.T) {
	secs := naturalReach(t, 6, 60, 200, 0.001)
	qs := ladder(5, 300, 7)
	res, err := ComputeBackwater(secs, qs, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{At: secs[3].ID})
	if err != nil {
		t.Fatal(err)
	}
	tab, err := res.Rating.Table()
	if err != nil {
		t.Fatal(err)
	}
	if res.Rating.Section != secs[3].ID || res.Rating.Index != 3 || len(tab.Rows) != len(qs) || !math.IsNaN(tab.Slope) {
		t.Fatalf("rating at %s (%d), %d rows, slope %g", res.Rating.Section, res.Rating.Index, len(tab.Rows), tab.Slope)
	}
	for i, r := range tab.Rows {
		rd := res.Rating.Rows[i]
		if r.Discharge != qs[i] || r.Stage != rd.Stage || rd.Stage != res.Profiles[i].Sections[3].WaterSurface {
			t.Errorf("row %d: Q %g stage %g, read Q %g stage %g", i, r.Discharge, r.Stage, rd.Discharge, rd.Stage)
		}
		hasFlag := strings.Contains(strings.Join(r.Flags, ","), FlagUnsettled)
		if hasFlag != rd.Unsettled {
			t.Errorf("row %d: flags %q, unsettled %v", i, r.Flags, rd.Unsettled)
		}
	}
}

// Marks set at known offsets from a computed profile depart from it by
// those offsets (computed minus marked).
func TestVerifyBackwater(t *testing.T) {
	secs := naturalReach(t, 5, 60, 200, 0.001)
	bd := Boundary{Kind: NormalDepth, Slope: 0.001}
	if _, err := VerifyBackwater(secs, 80, bd, BackwaterOptions{}); !errors.Is(err, ErrNoMarks) {
		t.Fatalf("no marks: %v", err)
	}
	res, err := ComputeBackwater(secs, []float64{80}, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ps := res.Profiles[0].Sections
	secs[0].Left, secs[0].Right = ps[0].WaterSurface+0.04, ps[0].WaterSurface-0.02
	secs[2].Right = ps[2].WaterSurface - 0.10
	v, err := VerifyBackwater(secs, 80, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(v.Marks) != 2 || v.Marks[0].Index != 0 || v.Marks[1].Index != 2 {
		t.Fatalf("marks %+v", v.Marks)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"mean mark departure at 0", v.Marks[0].Departure, -0.01},
		{"left departure at 0", v.Marks[0].LeftDeparture, -0.04},
		{"right departure at 0", v.Marks[0].RightDeparture, 0.02},
		{"departure at 2", v.Marks[1].Departure, 0.10},
		{"mean departure", v.MeanDeparture, 0.045},
		{"largest departure", v.MaxDeparture, 0.10},
	} {
		if math.Abs(c.got-c.want) > saClosedFormTol {
			t.Errorf("%s: %g, want %g", c.what, c.got, c.want)
		}
	}
	if !math.IsNaN(v.Marks[1].LeftDeparture) {
		t.Errorf("no left mark at 2: departure %g", v.Marks[1].LeftDeparture)
	}
}

// With Options.NoExtend a discharge that stays within the sections gives
// the same profile as with the ends extended.
func TestBackwaterNoExtend(t *testing.T) {
	secs := naturalReach(t, 5, 60, 200, 0.001)
	bd := Boundary{Kind: NormalDepth, Slope: 0.001}
	a, err := ComputeBackwater(secs, []float64{50}, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := ComputeBackwater(secs, []float64{50}, bd, BackwaterOptions{Geometry: subdivide.Options{AllPools: true, NoExtend: true}})
	if err != nil {
		t.Fatal(err)
	}
	for j, s := range a.Profiles[0].Sections {
		if o := b.Profiles[0].Sections[j]; o.WaterSurface != s.WaterSurface {
			t.Errorf("%s: %.12g, with NoExtend %.12g", s.ID, s.WaterSurface, o.WaterSurface)
		}
	}
}

// The second boundary can be given; the warnings name a channel flow
// length that differs from the sections' distances and stages above the
// ends of a section; every boundary kind describes itself.
func TestBackwaterOptions(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5,height=2.5", subdivide.Uniform(0.035), 4, 200, 0.001)
	secs[1].FlowLengths = subdivide.PerRegion{Channel: 260}
	last := secs[3].Geometry.Bottom()
	second := Boundary{Kind: KnownStage, Stage: last + 2.2}
	res, err := ComputeBackwater(secs, []float64{5, 80}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{Second: &second})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range res.Profiles {
		if p.SecondStart != second.Stage || p.SecondCritical || p.Sections[3].SecondWaterSurface != second.Stage {
			t.Errorf("Q %g: second start %g, want %g", p.Discharge, p.SecondStart, second.Stage)
		}
	}
	if res.SecondBoundary != second.String() || res.Expansion != ExpandingEddyK || res.Contraction != ContractingEddyK {
		t.Errorf("second %q, k %g %g", res.SecondBoundary, res.Expansion, res.Contraction)
	}
	all := strings.Join(res.Warnings, "\n")
	for _, want := range []string{"channel flow length 260 m to the next section differs from the distance between them, 200 m", "above the left end of the section: a vertical wall up to"} {
		if !strings.Contains(all, want) {
			t.Errorf("no warning with %q in %q", want, res.Warnings)
		}
	}
	for _, tc := range []struct {
		b    Boundary
		want string
	}{
		{Boundary{Kind: NormalDepth, Slope: 0.002}, "normal depth at slope 0.002"},
		{Boundary{Kind: CriticalDepth}, "critical depth"},
		{Boundary{Kind: KnownStage, Stage: 101.5}, "stage 101.5"},
		{Boundary{Kind: StageRating, Rating: []StageDischarge{{100, 1}, {101, 9}}}, "stage-discharge rating of 2 points, 1 to 9"},
		{Boundary{Kind: StageRating, StageOf: func(float64) (float64, error) { return 0, nil }}, "stage-discharge rating (function)"},
		{Boundary{Kind: StageRating, Rating: []StageDischarge{{100, 0}, {101, 9}}, StageOf: func(float64) (float64, error) { return 0, nil }},
			"stage-discharge rating of 2 points, 0 to 9"}, // a table read by StageOf is still described by its points
	} {
		if got := tc.b.String(); got != tc.want {
			t.Errorf("%v: %q, want %q", tc.b.Kind, got, tc.want)
		}
	}
}

// Over a short reach the profile from critical depth can overshoot the
// first and cross it: solutions of the gradually-varied-flow equation
// dy/dx = f(x, y) cannot cross (uniqueness of solutions of a first-order
// equation), but the standard step's long subreaches can, and then the
// two profiles meet at the rating section at some discharge by chance.
// The half-way start shows the stage still depends on the boundary there.
// Every section's Spread is the larger of the two check differences, and
// the half-way profile starts half-way between the two starts.
func TestBackwaterHalfwayStart(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.035), 3, 300, 0.001)
	res, err := ComputeBackwater(secs, ladder(2, 200, 100), Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{At: secs[1].ID})
	if err != nil {
		t.Fatal(err)
	}
	chance := -1 // the discharge where the first two profiles agree best at the rating section
	for i, p := range res.Profiles {
		if want := (p.Start + p.SecondStart) / 2; p.HalfwayStart != want || p.Sections[2].HalfwayWaterSurface != want {
			t.Errorf("Q %g: half-way start %g (at the boundary %g), want %g", p.Discharge, p.HalfwayStart, p.Sections[2].HalfwayWaterSurface, want)
		}
		for _, s := range p.Sections {
			if want := math.Max(math.Abs(s.WaterSurface-s.SecondWaterSurface), math.Abs(s.WaterSurface-s.HalfwayWaterSurface)); s.Spread != want {
				t.Errorf("Q %g, %s: spread %g, want %g", p.Discharge, s.ID, s.Spread, want)
			}
		}
		d := math.Abs(p.Sections[1].WaterSurface - p.Sections[1].SecondWaterSurface)
		if chance < 0 || d < math.Abs(res.Profiles[chance].Sections[1].WaterSurface-res.Profiles[chance].Sections[1].SecondWaterSurface) {
			chance = i
		}
	}
	p, rd := res.Profiles[chance], res.Rating.Rows[chance]
	s := p.Sections[1]
	if two := math.Abs(s.WaterSurface - s.SecondWaterSurface); !(two < SpreadToleranceSI) || !rd.Unsettled || !(rd.Spread > 10*SpreadToleranceSI) {
		t.Errorf("Q %g: the first two profiles differ by %.4f at %s, the half-way one by %.4f; read spread %.4f unsettled %v: want a chance agreement caught",
			p.Discharge, two, s.ID, math.Abs(s.WaterSurface-s.HalfwayWaterSurface), rd.Spread, rd.Unsettled)
	}
}

// qaCompound returns a two-section compound reach (invented): a channel
// 10 m wide and 2 m deep (n 0.03) between floodplains 30 and 40 m wide
// rising 0.1 m to their outer ends (n 0.06 and 0.08) and walls to 4 m
// above the channel floor, the downstream section (B, 200 m on) 0.2 m
// lower; A has flow lengths 100, 200 and 300 m. At the floodplains' level
// the top width jumps from 10 to about 80 m, so that a compound section of
// this kind has several critical stages (Blalock and Sturm 1981) and a
// supercritical band of stages just above the floodplains.
func qaCompound(t *testing.T) []Section {
	t.Helper()
	var secs []Section
	for i, id := range []string{"A", "B"} {
		z := 100 - 0.2*float64(i)
		s := subdivide.Section{Name: id, HasBanks: true, LeftBank: 40, RightBank: 50,
			N: []float64{0.06, 0.06, 0.03, 0.03, 0.03, 0.08, 0.08}}
		for _, p := range [][2]float64{{0, 6}, {10, 2.1}, {40, 2}, {40, 0}, {50, 0}, {50, 2}, {90, 2.1}, {100, 6}} {
			s.Points = append(s.Points, subdivide.Point{Station: p[0], Elevation: z + p[1]})
		}
		g, err := subdivide.Compile(s)
		if err != nil {
			t.Fatal(err)
		}
		secs = append(secs, Section{ID: id, Geometry: g, Distance: 200 * float64(i), Left: math.NaN(), Right: math.NaN()})
	}
	secs[0].FlowLengths = subdivide.PerRegion{Left: 100, Channel: 200, Right: 300}
	return secs
}

// froudeAt returns the Froude number of discharge q at stage h in g,
// from rating.Hydraulics: Fr = √(α·Q²·T/(g·A³)), proportional to Q, so
// the row's value at slope 1 is scaled by q over the row's discharge.
func froudeAt(t *testing.T, g subdivide.Geometry, h, q float64) float64 {
	t.Helper()
	r := hydraulicsAt(t, g, h, subdivide.Options{})
	// The row holds the Froude number at slope 1; scale it to discharge q.
	return r.Froude * q / r.Discharge
}

// Where the stage half-way between the two starts is supercritical (in the
// band above the floodplains of a compound section), the third start is
// looked for nearer the first: s1 + (s2 − s1)/2^k, k = 1, 2, ..., the
// first whose Froude number, recomputed here from rating.Hydraulics, is
// at most 1. Boundary stage 102.8 m at B; at Q = 60 m3/s the second
// start is critical depth in the channel, about 101.34 m, and half-way,
// about 102.07 m, lies just above the floodplains (102.0 to 102.1 m at
// B), where it is supercritical. Where s1 lies just above the highest
// critical stage, every trial stage down towards s2 is supercritical: the
// third start is s1 itself and the profile and the report say so.
func TestBackwaterHalfwaySupercritical(t *testing.T) {
	secs := qaCompound(t)
	gB := secs[1].Geometry
	res, err := ComputeBackwater(secs, []float64{10, 60, 150}, Boundary{Kind: KnownStage, Stage: 102.8}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	moved := false
	for _, p := range res.Profiles {
		s1, s2 := p.Start, p.SecondStart
		want := math.NaN()
		for k, d := 1, (s2-s1)/2; k <= HalfwayTries; k, d = k+1, d/2 {
			if froudeAt(t, gB, s1+d, p.Discharge) <= 1 {
				want = s1 + d
				break
			}
			moved = moved || p.Discharge == 60
		}
		if math.Abs(p.HalfwayStart-want) > 1e-12 {
			t.Errorf("Q %g: third start %.6f, want %.6f (starts %.6f, %.6f)", p.Discharge, p.HalfwayStart, want, s1, s2)
		}
		if p.HalfwayStart == s1 {
			t.Errorf("Q %g: third start is the first start %.6f", p.Discharge, s1)
		}
		if len(p.Warnings) > 0 {
			t.Errorf("Q %g: warnings %q", p.Discharge, p.Warnings)
		}
	}
	if !moved {
		t.Error("at Q 60 half-way was not supercritical: the case does not test the search")
	}

	// No subcritical stage between: the first start just above the
	// highest critical stage at B, the second just below the one beneath
	// it (where the flow falls supercritical as the floodplains wet), so
	// that every trial stage lies in the supercritical band between.
	const q = 60
	crit, err := rating.CriticalStages(gB, q, rating.Options{Slope: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(crit) != 3 {
		t.Fatalf("critical stages %v: want three", crit)
	}
	top, below := crit[2].Stage+1e-4, crit[1].Stage-1e-4
	for _, h := range []float64{top, below} {
		if froudeAt(t, gB, h, q) > 1 {
			t.Fatalf("stage %.6f supercritical (critical stages %v)", h, crit)
		}
	}
	second := Boundary{Kind: KnownStage, Stage: below}
	res, err = ComputeBackwater(secs, []float64{q}, Boundary{Kind: KnownStage, Stage: top}, BackwaterOptions{Second: &second})
	if err != nil {
		t.Fatal(err)
	}
	p := res.Profiles[0]
	if p.HalfwayStart != p.Start || p.Start != top {
		t.Errorf("third start %.6f, first %.6f, want both %.6f", p.HalfwayStart, p.Start, top)
	}
	if len(p.Warnings) != 1 || !strings.Contains(p.Warnings[0], "third profile starts at the first start") {
		t.Errorf("profile warnings %q: want one on the third start", p.Warnings)
	}
	if all := strings.Join(res.Warnings, "\n"); !strings.Contains(all, "at the one discharge no stage tried between the two starts is subcritical") {
		t.Errorf("report warnings %q: want the third start named", res.Warnings)
	}
}

// A stage above the ends of a section is computed with vertical walls
// added there, and the warning says how high they stand, as a rating
// table's does (rating.ExtensionWarnings). Three rectangular sections 10 m
// wide with ends 6 m above the bed (z = 100, 99.8, 99.6), boundary stage
// 8 m above the last bed, 107.6 m: at P2 the walls stand 107.6 − 105.6 =
// 2.000 m on both sides (by hand). Upstream the stages are higher still,
// each wall the section's highest stage less its end elevation.
func TestBackwaterWallHeights(t *testing.T) {
	var secs []Section
	for i := range 3 {
		z := 100 - 0.2*float64(i)
		g, err := subdivide.Compile(subdivide.Section{Name: fmt.Sprintf("P%d", i),
			Points: saPoints(0, z+6, 0, z, 10, z, 10, z+6), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		secs = append(secs, Section{ID: fmt.Sprintf("P%d", i), Geometry: g, Distance: 200 * float64(i), Left: math.NaN(), Right: math.NaN()})
	}
	res, err := ComputeBackwater(secs, []float64{50, 100}, Boundary{Kind: KnownStage, Stage: 107.6}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	all := strings.Join(res.Warnings, "\n")
	for _, want := range []string{
		"section P2: stages up to 107.600 m are above the left end of the section: a vertical wall up to 2.000 m high was added there",
		"section P2: stages up to 107.600 m are above the right end of the section: a vertical wall up to 2.000 m high was added there",
	} {
		if !strings.Contains(all, want) {
			t.Errorf("warnings lack %q:\n%s", want, all)
		}
	}
	for j := range 2 {
		h := math.Max(res.Profiles[0].Sections[j].WaterSurface, res.Profiles[1].Sections[j].WaterSurface)
		want := fmt.Sprintf("section P%d: stages up to %.3f m are above the left end of the section: a vertical wall up to %.3f m high was added there",
			j, h, h-(106-0.2*float64(j)))
		if !strings.Contains(all, want) {
			t.Errorf("warnings lack %q:\n%s", want, all)
		}
	}
}

// Sections whose ends are not extended (NoExtend): a boundary or a
// balancing stage above the top of a section is reported at the top, the
// highest stage the section holds, not at whatever trial stage the search
// had reached ("stage 104.03 is 0.03 above the left end" for any Q).
// Rectangles 10 m wide with ends 6 m up, beds 100, 99.8, 99.6: tops 106,
// 105.8, 105.6. Normal depth of 1e5 m3/s at slope 0.001 lies far above
// P2's top (at the top, A = 60 m², R = 60/22 m, K = A·R^(2/3)/n ≈ 3.9e3,
// Q = K·√S ≈ 124 m3/s by hand). From stage 105.5 at P2, 200 m3/s needs a
// friction loss over 200 m of about 200·(200/3819)² = 0.55 m (K at 5.9 m
// depth, by hand): P1 would stand near 106.05 m, above its top 105.8.
func TestBackwaterNoExtendNamesTop(t *testing.T) {
	var secs []Section
	for i := range 3 {
		z := 100 - 0.2*float64(i)
		g, err := subdivide.Compile(subdivide.Section{Name: fmt.Sprintf("P%d", i),
			Points: saPoints(0, z+6, 0, z, 10, z, 10, z+6), N: []float64{0.03, 0.03, 0.03}})
		if err != nil {
			t.Fatal(err)
		}
		secs = append(secs, Section{ID: fmt.Sprintf("P%d", i), Geometry: g, Distance: 200 * float64(i), Left: math.NaN(), Right: math.NaN()})
	}
	opt := BackwaterOptions{Geometry: subdivide.Options{NoExtend: true}}
	for _, tc := range []struct {
		name string
		q    float64
		b    Boundary
		want string
	}{
		{"normal boundary", 1e5, Boundary{Kind: NormalDepth, Slope: 0.001}, "not reached up to the top of the section, stage 105.6 (the lower of its ends)"},
		{"balance upstream", 200, Boundary{Kind: KnownStage, Stage: 105.5}, "the balancing stage is not reached up to the top of the section, stage 105.8 (the lower of its ends)"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ComputeBackwater(secs, []float64{tc.q}, tc.b, opt)
			if err == nil || !errors.Is(err, subdivide.ErrAboveEnds) || !strings.Contains(err.Error(), tc.want) || strings.Contains(err.Error(), "above the left end") {
				t.Errorf("error %v: want one wrapping ErrAboveEnds with %q and no trial stage", err, tc.want)
			}
		})
	}
	if _, err := ComputeBackwater(secs, []float64{100}, Boundary{Kind: NormalDepth, Slope: 0.001}, opt); err != nil {
		t.Errorf("normal depth of 100 m3/s (below the top's 124): %v", err)
	}
}

// wantOneWarning checks the warnings that about picks out: none when want
// is "", else exactly one, starting with want.
func wantOneWarning(t *testing.T, warnings []string, about func(string) bool, want string) {
	t.Helper()
	var got []string
	for _, w := range warnings {
		if about(w) {
			got = append(got, w)
		}
	}
	if want == "" && len(got) > 0 || want != "" && (len(got) != 1 || !strings.HasPrefix(got[0], want)) {
		t.Errorf("warnings %q, want %q", got, want)
	}
}

// An overbank flow length more than OverbankLengthRatio times the
// distance between the sections, or less than its inverse, is warned,
// naming the section, the side and both lengths; one within, or one not
// given (zero), is not.
func TestBackwaterOverbankLengthWarning(t *testing.T) {
	for _, tc := range []struct {
		name    string
		lengths subdivide.PerRegion
		want    string // "" for no overbank warning
	}{
		{"within", subdivide.PerRegion{Left: 150, Channel: 200, Right: 390}, ""},
		{"at half", subdivide.PerRegion{Left: 100, Channel: 200, Right: 200}, ""},
		{"not given", subdivide.PerRegion{Channel: 200}, ""},
		{"left long", subdivide.PerRegion{Left: 401, Channel: 200, Right: 200},
			"section P0: the left overbank flow length 401 m to the next section is 2.005 times the distance between them, 200 m"},
		{"right short", subdivide.PerRegion{Left: 200, Channel: 200, Right: 20.5},
			"section P0: the right overbank flow length 20.5 m to the next section is 0.1025 times the distance between them, 200 m"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			secs := prismReach(t, "trapezoid:bottom=6,side=1.5,height=2.5", subdivide.Uniform(0.035), 3, 200, 0.001)
			secs[0].FlowLengths = tc.lengths
			res, err := ComputeBackwater(secs, []float64{5}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			wantOneWarning(t, res.Warnings, func(w string) bool { return strings.Contains(w, "to the next section is") }, tc.want)
		})
	}
}

// A rating at the last section, where the boundary sets the stage, is the
// boundary itself: with a known stage every discharge reads that stage (a
// flat rating) and the result warns, naming the section and the stage;
// under normal or critical depth it warns too, naming the boundary. The
// check starts differ from the boundary there by construction, so no read
// there is unsettled and the reach is not called too short; a rating
// upstream does not warn of the boundary.
func TestBackwaterRatingAtBoundary(t *testing.T) {
	const h = 101.2
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5,height=4", subdivide.Uniform(0.035), 3, 200, 0.001)
	last := secs[2].ID
	table := []StageDischarge{{secs[2].Geometry.Bottom() + 0.5, 1}, {secs[2].Geometry.Bottom() + 3, 200}}
	for _, tc := range []struct {
		name string
		at   string
		b    Boundary
		want string // "" for no warning about the boundary
	}{
		{"stage at the last", last, Boundary{Kind: KnownStage, Stage: h},
			"the rating is at section " + last + ", the last, where the boundary fixes the stage: it is stage 101.200 m for every discharge"},
		{"stage upstream", secs[1].ID, Boundary{Kind: KnownStage, Stage: h}, ""},
		{"stage, default section", "", Boundary{Kind: KnownStage, Stage: h}, ""},
		{"normal at the last", last, Boundary{Kind: NormalDepth, Slope: 0.001},
			"the rating is at section " + last + ", the last, where the boundary sets the stage: it is normal depth at slope 0.001 (the section's uniform-flow rating"},
		{"critical at the last", last, Boundary{Kind: CriticalDepth},
			"the rating is at section " + last + ", the last, where the boundary sets the stage: it is the section's critical depth at every discharge"},
		{"normal upstream", secs[0].ID, Boundary{Kind: NormalDepth, Slope: 0.001}, ""},
		{"rating at the last", last, Boundary{Kind: StageRating, Rating: table},
			"the rating is at section " + last + ", the last, where the boundary sets the stage: it is the boundary's stage-discharge rating given back"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			res, err := ComputeBackwater(secs, []float64{5, 20, 60}, tc.b, BackwaterOptions{At: tc.at})
			if err != nil {
				t.Fatal(err)
			}
			wantOneWarning(t, res.Warnings, func(w string) bool { return strings.HasPrefix(w, "the rating is at section") }, tc.want)
			if tc.at == last {
				if i := slices.IndexFunc(res.Warnings, func(w string) bool { return strings.HasPrefix(w, tc.want) }); i < 0 ||
					!strings.Contains(res.Warnings[i], "flag no stage unsettled") {
					t.Errorf("no warning says the spreads at the boundary flag nothing: %q", res.Warnings)
				}
				apart := false
				for _, rd := range res.Rating.Rows {
					apart = apart || rd.Spread > res.Rating.Tolerance
					if rd.Unsettled {
						t.Errorf("discharge %g at the boundary section flagged unsettled (spread %g)", rd.Discharge, rd.Spread)
					}
				}
				if !apart && tc.b.Kind != CriticalDepth {
					t.Errorf("no spread above the tolerance at the boundary: the test does not try the flag")
				}
				if !res.Rating.AtBoundary {
					t.Errorf("AtBoundary false at the last section")
				}
				for _, w := range res.Warnings {
					if strings.Contains(w, "too short") {
						t.Errorf("warning %q at the boundary section", w)
					}
				}
			}
			if tc.b.Kind == KnownStage && tc.at == last {
				flat := 0
				for i, rd := range res.Rating.Rows {
					switch {
					case res.Profiles[i].StartCritical: // the stage is below critical depth there
					case rd.Stage != h:
						t.Errorf("discharge %g at the boundary: stage %g, want %g", rd.Discharge, rd.Stage, h)
					default:
						flat++
					}
				}
				if flat < 2 {
					t.Errorf("%d discharges at the fixed stage, want 2 or more to show a flat rating", flat)
				}
			}
		})
	}
}

// A section without bank marks is all channel, so the overbank flow lengths
// of a subreach it ends cannot be weighted at it: the result warns, naming
// the section and the subreach, and the length used is half the weighted
// length at the other end plus half the channel length (WeightedLength with
// the section's conveyance all in the channel: Davidian 1984, weighted
// length; from memory). A reach whose sections all have banks, or whose
// overbank lengths equal the channel's, or that gives no flow lengths, is
// not warned.
func TestBackwaterNoBanksFlowLengths(t *testing.T) {
	lengths := subdivide.PerRegion{Left: 180, Channel: 220, Right: 260}
	reach := func(t *testing.T, banks []bool, l subdivide.PerRegion) []Section {
		secs := make([]Section, len(banks))
		for i, b := range banks {
			s := naturalSection(40, i, 100-0.001*220*float64(i))
			s.HasBanks = b
			if !b {
				s.NByRegion = subdivide.PerRegion{}
				s.N = make([]float64, len(s.Points)-1)
				for k := range s.N {
					s.N[k] = 0.035
				}
			}
			p, err := subdivide.Compile(s)
			if err != nil {
				t.Fatal(err)
			}
			secs[i] = Section{ID: fmt.Sprintf("X%d", i), Geometry: p, Distance: 220 * float64(i), Left: math.NaN(), Right: math.NaN()}
			if i < len(banks)-1 {
				secs[i].FlowLengths = l
			}
		}
		return secs
	}
	for _, tc := range []struct {
		name  string
		banks []bool
		l     subdivide.PerRegion
		want  string // "" for no warning of banks
	}{
		{"middle without banks", []bool{true, false, true}, lengths,
			"section X1 has no bank marks, so all its conveyance is the channel's: the overbank flow lengths of the subreaches " +
				"X0 to X1 (left 180, channel 220, right 260 m) and X1 to X2 (left 180, channel 220, right 260 m) cannot be applied at it"},
		{"two without banks", []bool{false, false, true}, lengths,
			"sections X0 and X1 have no bank marks, so all their conveyance is the channel's: the overbank flow lengths of the subreaches " +
				"X0 to X1 (left 180, channel 220, right 260 m) and X1 to X2"},
		{"all with banks", []bool{true, true, true}, lengths, ""},
		{"lengths all equal", []bool{true, false, true}, subdivide.PerRegion{Left: 220, Channel: 220, Right: 220}, ""},
		{"no lengths", []bool{true, false, true}, subdivide.PerRegion{}, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			secs := reach(t, tc.banks, tc.l)
			res, err := ComputeBackwater(secs, []float64{400}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			wantOneWarning(t, res.Warnings, func(w string) bool { return strings.Contains(w, "bank marks") }, tc.want)
		})
	}
	// The length of X0 to X1 with X1 all channel: ½·(weighted at X0 + 220).
	secs := reach(t, []bool{true, false, true}, lengths)
	res, err := ComputeBackwater(secs, []float64{400}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	x0 := res.Profiles[0].Sections[0]
	w, err := secs[0].Geometry.At(x0.WaterSurface, subdivide.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var k subdivide.PerRegion
	for _, sw := range rating.FoldWalls(w.Subs) {
		if sw.Area > 0 {
			v := rating.Conveyance(sw.Area, sw.WettedPerimeter, sw.N, rating.SI)
			switch sw.Region {
			case subdivide.LeftOverbank:
				k.Left += v
			case subdivide.RightOverbank:
				k.Right += v
			default:
				k.Channel += v
			}
		}
	}
	if k.Left+k.Right <= 0 {
		t.Fatalf("X0 at %g: no overbank flow (%v): the check needs some", x0.WaterSurface, k)
	}
	want := WeightedLength(lengths, k, subdivide.PerRegion{Channel: 1})
	if saRelErr(x0.Length, want) > saClosedFormTol || math.Abs(x0.Length-220) < 0.1 {
		t.Errorf("length X0 to X1 %.6g, want %.6g", x0.Length, want)
	}
}

// The warning of unsettled reads gives their discharges as runs among all
// the discharges in ascending order, not the range from the least to the
// greatest (which would take in the settled ones between), and one
// discharge once.
func TestUnsettledWarningRuns(t *testing.T) {
	read := func(q float64, unsettled bool) RatingRead {
		return RatingRead{Discharge: q, Spread: 0.02, Unsettled: unsettled}
	}
	for _, tc := range []struct {
		name string
		rows []RatingRead
		want string
	}{
		{"one of one", []RatingRead{read(100, true)}, "at the one discharge (100 m3/s) the profiles"},
		{"two runs", []RatingRead{read(1, true), read(2, false), read(77, false), read(78, true), read(140, true), read(200, true)},
			"at 4 of 6 discharges (1 and 78 to 200 m3/s) the profiles"},
		{"out of order", []RatingRead{read(200, true), read(2, false), read(1, true), read(78, true)},
			"at 3 of 4 discharges (1 and 78 to 200 m3/s) the profiles"},
		{"all", []RatingRead{read(5, true), read(25, true), read(45, true)}, "at 3 of 3 discharges (5 to 45 m3/s) the profiles"},
		{"many runs", []RatingRead{read(1, true), read(2, false), read(3, true), read(4, false), read(5, true), read(6, false),
			read(7, true), read(8, false), read(9, true), read(10, false), read(11250, true)},
			"at 6 of 11 discharges (1, 3, 5 m3/s and 3 more runs) the profiles"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := unsettledWarning(BackwaterRating{Section: "X1", Tolerance: 0.01, Rows: tc.rows}, rating.SI)
			if !strings.HasPrefix(got, tc.want) {
				t.Errorf("warning %q, want it to start %q", got, tc.want)
			}
		})
	}
	if got := unsettledWarning(BackwaterRating{Rows: []RatingRead{read(1, false)}}, rating.SI); got != "" {
		t.Errorf("no unsettled read: warning %q", got)
	}
}

// The check starts differ from the boundary at the last section by
// construction, so the spread there says nothing of the departure of its
// mark: the warning of departures still depending on the boundary names
// the sections upstream of it only.
func TestVerifyBackwaterBoundaryMark(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5,height=4", subdivide.Uniform(0.035), 3, 100, 0.001)
	last := secs[2].Geometry.Bottom()
	bd := Boundary{Kind: KnownStage, Stage: last + 2.5}
	res, err := ComputeBackwater(secs, []float64{20}, bd, BackwaterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ps := res.Profiles[0].Sections
	tol := BackwaterOptions{}.spreadTolerance()
	if !(ps[0].Spread > tol && ps[2].Spread > tol) {
		t.Fatalf("spreads %g, %g: the reach should be too short to forget its boundary", ps[0].Spread, ps[2].Spread)
	}
	for _, c := range []struct {
		name   string
		marked []int
		want   string // "" for no warning
	}{
		{"boundary mark only", []int{2}, ""},
		{"upstream and boundary marks", []int{0, 2}, "at the marks of P0 ("},
	} {
		t.Run(c.name, func(t *testing.T) {
			s := slices.Clone(secs)
			for _, i := range c.marked {
				s[i].Left, s[i].Right = ps[i].WaterSurface, ps[i].WaterSurface
			}
			v, err := VerifyBackwater(s, 20, bd, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			var w string
			for _, x := range v.Warnings {
				if strings.Contains(x, "still depends on the downstream boundary") {
					w = x
				}
			}
			if c.want == "" && w != "" || c.want != "" && !strings.Contains(w, c.want) || strings.Contains(w, "P2") {
				t.Errorf("warning %q, want %q without the boundary section P2", w, c.want)
			}
		})
	}
}

// A mark at the last section under an assumed boundary (normal or
// critical depth) checks that assumption, not the reach: a warning says
// so; under a known stage none does.
func TestVerifyBackwaterAssumedBoundaryMark(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=6,side=1.5,height=4", subdivide.Uniform(0.035), 3, 100, 0.001)
	for _, c := range []struct {
		name string
		bd   Boundary
		want bool
	}{
		{"normal depth", Boundary{Kind: NormalDepth, Slope: 0.002}, true},
		{"critical depth", Boundary{Kind: CriticalDepth}, true},
		{"known stage", Boundary{Kind: KnownStage, Stage: secs[2].Geometry.Bottom() + 2.5}, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, err := ComputeBackwater(secs, []float64{20}, c.bd, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			s := slices.Clone(secs)
			ws := res.Profiles[0].Sections[2].WaterSurface
			s[2].Left, s[2].Right = ws, ws
			v, err := VerifyBackwater(s, 20, c.bd, BackwaterOptions{})
			if err != nil {
				t.Fatal(err)
			}
			var got string
			for _, w := range v.Warnings {
				if strings.Contains(w, "checks the boundary, not the reach") {
					got = w
				}
			}
			if c.want != (got != "") || c.want && !strings.Contains(got, "at P2, where the profile starts") {
				t.Errorf("warning %q, want one: %v", got, c.want)
			}
		})
	}
}
