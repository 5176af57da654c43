package rating

import (
	"errors"
	"math"
	"testing"
)

// HydraulicCurve.Stage inverts the rating with the search of
// NormalStages, so that a rating whose discharge falls with stage over
// part of its range still gives a stage: the lowest that carries the
// discharge. A circle D = 1.2 m across, n 0.013, slope 0.003, its invert
// at gauge height 0.5 (Datum −0.5), given 1.04 times its full-flow
// discharge Qfull = (1/n)·(πD²/4)·(D/4)^(2/3)·√S: between full flow and
// the greatest part-full discharge (about 1.076·Qfull near 0.94·D, from
// memory) it is carried twice, on the rising branch and on the falling
// one just below the crown. The stage returned must be the lower, and
// carry q by Manning's equation with the circular segment's
// A = r²(θ − sin θ)/2, P = r·θ, θ = 2·acos(1 − y/r) (Chow 1959, table
// 2-1, and eq. 5-7), computed here, rising there.
func TestHydraulicCurveStageLowestRoot(t *testing.T) {
	const d, n, s = 1.2, 0.013, 0.003
	c := HydraulicCurve{Geometry: mustShape(t, "circle:diameter=1.2", n), Datum: -0.5, Options: Options{Slope: s}}
	r := d / 2
	manning := func(y float64) float64 {
		th := 2 * math.Acos(1-y/r)
		a, p := r*r*(th-math.Sin(th))/2, r*th
		return a * math.Pow(a/p, 2.0/3) * math.Sqrt(s) / n
	}
	full := math.Pi * d * d / 4 * math.Pow(d/4, 2.0/3) * math.Sqrt(s) / n
	q := 1.04 * full
	h, err := c.Stage(q)
	if err != nil {
		t.Fatal(err)
	}
	y := h - 0.5
	const closeQ = 1e-6 // relative: the stage is found to ShiftTolerance
	if got := manning(y); math.Abs(got/q-1) > closeQ {
		t.Errorf("gauge height %g (depth %g) carries %g by Manning's equation, want %g", h, y, got, q)
	}
	if !(manning(y+0.001) > manning(y-0.001)) {
		t.Errorf("depth %g is not on the rising branch", y)
	}
	roots, err := NormalStages(c.Geometry, q, c.Options)
	if err != nil || len(roots) != 2 || !closeDepth(y, roots[0].Stage, 0) || !(roots[1].Stage > y) {
		t.Errorf("normal stages %+v (%v): want two, the lower at depth %g", roots, err, y)
	}
	if _, err := c.Stage(1.2 * full); !errors.Is(err, ErrNoRoot) {
		t.Errorf("above the greatest part-full discharge: %v, want ErrNoRoot", err)
	}
	if _, err := c.Stage(0); !errors.Is(err, ErrTarget) {
		t.Errorf("zero discharge: %v, want ErrTarget", err)
	}
}
