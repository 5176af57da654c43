package reach

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// gvfRect is a wide rectangular channel for the gradually-varied-flow
// equation, in SI: width b, Manning's n, bed slope s0 and discharge q.
type gvfRect struct{ b, n, s0, q float64 }

// sf is the friction slope Q²/K² with K = A·R^(2/3)/n, A = b·y,
// R = b·y/(b + 2y) (Manning's equation, Chow 1959, eq. 6-9).
func (c gvfRect) sf(y float64) float64 {
	a := c.b * y
	k := a * math.Pow(a/(c.b+2*y), 2.0/3) / c.n
	return c.q * c.q / (k * k)
}

// fr2 is the square of the Froude number, Q²·T/(g·A³) with T = b, α = 1.
func (c gvfRect) fr2(y float64) float64 {
	a := c.b * y
	return c.q * c.q * c.b / (9.80665 * a * a * a)
}

// dydx is the gradually-varied-flow equation dy/dx = (S0 − Sf)/(1 − Fr²)
// with x downstream (Chow 1959, eq. 9-13).
func (c gvfRect) dydx(y float64) float64 { return (c.s0 - c.sf(y)) / (1 - c.fr2(y)) }

// rk4Upstream integrates dy/dx upstream from depth y0 at x = L over the
// distance L in steps of h by the classical fourth-order Runge–Kutta
// method (Press et al. 2007, Numerical Recipes, section 17.1), returning
// the depth at every point x = L − k·h, k = 0…steps.
func (c gvfRect) rk4Upstream(y0, h float64, steps int) []float64 {
	ys := make([]float64, steps+1)
	ys[0] = y0
	y := y0
	for k := 1; k <= steps; k++ {
		// x decreases: dy/d(−x) = −dydx.
		k1 := -c.dydx(y)
		k2 := -c.dydx(y + h*k1/2)
		k3 := -c.dydx(y + h*k2/2)
		k4 := -c.dydx(y + h*k3)
		y += h * (k1 + 2*k2 + 2*k3 + k4) / 6
		ys[k] = y
	}
	return ys
}

// A step-backwater profile through a prismatic wide rectangle agrees with
// an independent fine integration of the gradually-varied-flow equation
// (classical RK4, 50 substeps per subreach), from a boundary 2 m above
// normal depth (an M1 curve). The eddy losses are set to zero, as the
// differential equation has none.
//
// The standard step method integrates dH/dx = −Sf (H the total head) with
// the friction slope of each subreach taken as Q²/(Ku·Kd), the geometric
// mean of the end values: a trapezoidal rule, whose error over a step Δx
// is Δx³·|Sf″|/12, plus the geometric mean's shortfall from the
// arithmetic, Δx·(ΔSf)²/(8·Sf) ≈ Δx³·Sf′²/(8·Sf) (primes along x). Over
// the reach length L the head errs by at most L·Δx²·max(|Sf″|/12 +
// Sf′²/(8·Sf)), and a head error δ is a depth error δ/(1 − Fr²). That
// bound, with the derivatives taken from the fine solution, is the
// tolerance; halving Δx must divide the largest departure by about four
// (second order: between 3 and 5).
func TestBackwaterAgainstGVF(t *testing.T) {
	c := gvfRect{b: 40, n: 0.03, s0: 0.0004, q: 120}
	const length, sub = 20000.0, 50
	// Normal depth by bisection on Sf(y) = S0, in the test.
	lo, hi := 0.01, 20.0
	for range 200 {
		if mid := (lo + hi) / 2; c.sf(mid) > c.s0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	yn := (lo + hi) / 2
	y0 := yn + 2
	var prevErr float64
	for _, dx := range []float64{400, 200} {
		m := int(length/dx) + 1
		secs := prismReach(t, fmt.Sprintf("rectangle:width=%g", c.b), subdivide.Uniform(c.n), m, dx, c.s0)
		bottom := secs[m-1].Geometry.Bottom()
		res, err := ComputeBackwater(secs, []float64{c.q}, Boundary{Kind: KnownStage, Stage: bottom + y0},
			BackwaterOptions{Expansion: -1, Contraction: -1})
		if err != nil {
			t.Fatal(err)
		}
		h := dx / sub
		fine := c.rk4Upstream(y0, h, (m-1)*sub)
		// Bound from the fine solution's friction slope.
		var worst, fr2 float64
		for k := 1; k+1 < len(fine); k++ {
			s0, s1, s2 := c.sf(fine[k-1]), c.sf(fine[k]), c.sf(fine[k+1])
			d1 := (s2 - s0) / (2 * h)
			d2 := (s2 - 2*s1 + s0) / (h * h)
			worst = math.Max(worst, math.Abs(d2)/12+d1*d1/(8*s1))
			fr2 = math.Max(fr2, c.fr2(fine[k]))
		}
		tol := length * dx * dx * worst / (1 - fr2)
		var maxErr float64
		for j, s := range res.Profiles[0].Sections {
			want := fine[(m-1-j)*sub]
			got := s.WaterSurface - s.Bottom
			maxErr = math.Max(maxErr, math.Abs(got-want))
			if math.Abs(got-want) > tol {
				t.Errorf("Δx %g, %s: depth %.6f, RK4 %.6f (tolerance %.2g)", dx, s.ID, got, want, tol)
			}
		}
		if prevErr > 0 {
			if r := prevErr / maxErr; r < 3 || r > 5 {
				t.Errorf("halving Δx divides the largest departure by %.2f (%.3g to %.3g), want about 4", r, prevErr, maxErr)
			}
		}
		t.Logf("Δx %g m: largest departure %.3g m, tolerance %.3g m", dx, maxErr, tol)
		prevErr = maxErr
	}
}

// TestBackwaterOrderWarnings checks that a reach whose bed or marks rise
// from the first section to the last is warned of, and one falling
// downstream is not: both rising is called a reach listed downstream
// first; a bed rising alone is asked about (a riffle below a pool does
// it). The bed of the prisms falls 0.001 over 100 m: 0.1 m per subreach,
// 0.2 m over the reach (closed form).
func TestBackwaterOrderWarnings(t *testing.T) {
	for _, c := range []struct {
		name    string
		reverse bool
		marks   [3]float64
		want    string
	}{
		{"upstream first", false, [3]float64{101.5, 101.4, 101.3}, ""},
		{"downstream first", true, [3]float64{101.3, 101.4, 101.5}, "the bed and the high-water marks both rise downstream over the reach (thalweg of P0 at 99.800, of P2 at 100.000 m; marks of P0 at 101.300, of P2 at 101.500 m): the reach is most likely listed downstream first"},
		{"marks rise only", false, [3]float64{101.3, math.NaN(), 101.5}, "the high-water marks rise 0.2 m downstream over the reach (P0 at 101.300, P2 at 101.500 m), which a steady water surface does not"},
		{"bed rises only, no marks", true, [3]float64{math.NaN(), math.NaN(), math.NaN()}, "the bed rises 0.2 m downstream over the reach (thalweg of P0 at 99.800, of P2 at 100.000 m): a riffle or weir below a pool does this"},
		// Marks 1 mm higher downstream (a flat water surface surveyed)
		// and 0.029 m higher lie within a good mark's band, 0.03 m
		// (DefaultMarkSDSI, unrated marks): no rise.
		{"marks 1 mm higher downstream", false, [3]float64{101.545, math.NaN(), 101.546}, ""},
		{"marks 29 mm higher downstream", false, [3]float64{101.5, math.NaN(), 101.529}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 3, 100, 0.001)
			if c.reverse {
				for i, j := 0, len(secs)-1; i < j; i, j = i+1, j-1 {
					secs[i].Geometry, secs[j].Geometry = secs[j].Geometry, secs[i].Geometry
				}
			}
			for i := range secs {
				secs[i].Left = c.marks[i]
			}
			res, err := ComputeBackwater(secs, []float64{20}, Boundary{Kind: NormalDepth, Slope: 0.001}, BackwaterOptions{Units: rating.SI})
			if err != nil {
				t.Fatal(err)
			}
			n := 0
			found := c.want == ""
			for _, w := range res.Warnings {
				if strings.Contains(w, "downstream over the reach") {
					n++
					found = found || strings.HasPrefix(w, c.want)
				}
			}
			if !found || n > 1 || c.want == "" && n > 0 {
				t.Errorf("warnings %q, want one starting %q", res.Warnings, c.want)
			}
		})
	}
}

// A thalweg 0.02 m higher at the last section than at the first (the
// prisms' bed falling 0.0001 over 100 m, listed in reverse: 0.01 m per
// subreach, closed form) lies within what a survey tells, less than
// BedRiseSI: no warning of a rising bed.
func TestBackwaterOrderWarningsBedTolerance(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 3, 100, 0.0001)
	for i, j := 0, len(secs)-1; i < j; i, j = i+1, j-1 {
		secs[i].Geometry, secs[j].Geometry = secs[j].Geometry, secs[i].Geometry
	}
	for _, w := range orderWarnings(secs, rating.SI) {
		t.Errorf("warning %q for a bed rising 0.02 m", w)
	}
}

// A boundary's own warnings (a rating table read linearly, say) are
// reported among the computation's.
func TestBackwaterReportsBoundaryWarnings(t *testing.T) {
	secs := prismReach(t, "trapezoid:bottom=10,side=2", subdivide.Uniform(0.03), 3, 100, 0.001)
	const w = "r.csv: the boundary rating has no row without flow, so it is read linearly in stage between rows"
	b := Boundary{Kind: StageRating, Rating: []StageDischarge{{Stage: 99.9, Discharge: 5}, {Stage: 102, Discharge: 80}}, Warnings: []string{w}}
	res, err := ComputeBackwater(secs, []float64{20}, b, BackwaterOptions{Units: rating.SI})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(res.Warnings, w) {
		t.Errorf("warnings %q lack the boundary's", res.Warnings)
	}
}
