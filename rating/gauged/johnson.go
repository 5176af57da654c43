package gauged

import (
	"errors"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"

	"wetline/rating"
)

// ErrJohnson is returned when Johnson's method has no answer: stages not
// strictly rising, or three points on a straight line in stage (G₁ + G₃ =
// 2·G₂, no curvature to measure).
var ErrJohnson = errors.New("no answer from Johnson's three-point method for these stages")

// johnsonFlat is the relative size of G₁ + G₃ − 2·G₂ (against G₃ − G₁)
// below which the three points are taken to lie on a straight line.
const johnsonFlat = 1e-9

// JohnsonZeroFlow returns the gauge height of zero flow e of a power law
// Q = A·(h − e)^C through three points of a rating: G₁ and G₃ are the
// gauge heights of two discharges Q₁ < Q₃ and G₂ that of their geometric
// mean Q₂ = √(Q₁·Q₃). Then (G₂ − e)² = (G₁ − e)(G₃ − e), so
//
//	e = (G₁·G₃ − G₂²) / (G₁ + G₃ − 2·G₂),
//
// exact for an exact power law. Preconditions: G₁ < G₂ < G₃. Stages not
// rising, or on a straight line, give ErrJohnson.
//
// References:
//
//	Rantz, S. E., and others (1982). Measurement and computation of
//	streamflow, volume 2: computation of discharge. USGS Water-Supply
//	Paper 2175, chapter 10 (Johnson's method of estimating the gage height
//	of effective zero flow; from memory).
func JohnsonZeroFlow(g1, g2, g3 float64) (float64, error) {
	den := g1 + g3 - 2*g2
	if !(g1 < g2 && g2 < g3) || math.Abs(den) <= johnsonFlat*(g3-g1) {
		return math.NaN(), errorf("stages %g, %g, %g: %w", g1, g2, g3, ErrJohnson)
	}
	return (g1*g3 - g2*g2) / den, nil
}

// JohnsonEstimate is Johnson's three-point estimate of the first
// control's gauge height of zero flow, read from a curve drawn through
// the gaugings of that control (see johnsonFromData).
type JohnsonEstimate struct {
	// OK reports that the estimate was made; Note says why not otherwise.
	OK   bool
	Note string
	// ZeroFlow is the estimate e (gauge height, length unit) and
	// ZeroFlowSE its standard error, propagated from the standard errors
	// of G1, G2 and G3 read from the curve (see JohnsonZeroFlowSE; NaN
	// when not known).
	ZeroFlow, ZeroFlowSE float64
	// Undetermined reports an estimate whose 95 % uncertainty,
	// CoverageFactor95·ZeroFlowSE, exceeds the difference from the
	// fitted offset the check warns of (JohnsonCheckFraction of the
	// first control's gauged depth): the stages G1 to G3 are too short a
	// range for the method, the curve over them too nearly straight, and
	// e is reported as not determined rather than checked. Note says so.
	Undetermined bool
	// Q1, Q2, Q3 are the three discharges (discharge unit), Q₂ = √(Q₁·Q₃),
	// and G1, G2, G3 the gauge heights read for them (length unit).
	Q1, Q2, Q3, G1, G2, G3 float64
}

// judge checks a made estimate against the first control's offset b of
// gauged depth depth (length unit of u): an estimate whose 95 %
// uncertainty exceeds JohnsonCheckFraction·depth, or is not known, is
// marked Undetermined with a Note that says why; otherwise the warning is
// returned when e differs from b by more than that ("" when it does not).
func (j *JohnsonEstimate) judge(b, depth float64, u rating.Units) string {
	L := u.Length()
	limit := JohnsonCheckFraction * depth
	unc := CoverageFactor95 * j.ZeroFlowSE
	switch {
	case math.IsNaN(unc):
		j.Undetermined = true
		j.Note = sayf("not determined: e = %s %s from gauge heights %s to %s %s, its uncertainty not known (the curve read at G₁, G₂, G₃ "+
			"has no scatter to measure it by), so it cannot tell the offset wrong by %s %s (%.0f %% of the first control's gauged depth)",
			rating.PlainFigures(j.ZeroFlow, 3), L, gh(j.G1), gh(j.G3), L, rating.PlainFigures(limit, 2), L, 100*JohnsonCheckFraction)
	case !(unc <= limit):
		j.Undetermined = true
		j.Note = sayf("not determined: e = %s ± %s %s (95 %%) from gauge heights %s to %s %s, over which the curve is nearly straight "+
			"(G₁ + G₃ − 2·G₂ = %s %s): the range is too short for the method, its uncertainty more than the %s %s "+
			"(%.0f %% of the first control's gauged depth) by which the check would tell the offset wrong",
			rating.PlainFigures(j.ZeroFlow, 3), rating.PlainFigures(unc, 2), L, gh(j.G1), gh(j.G3), L,
			rating.PlainFigures(j.G1+j.G3-2*j.G2, 2), L, rating.PlainFigures(limit, 2), L, 100*JohnsonCheckFraction)
	case math.Abs(j.ZeroFlow-b) > limit:
		return sayf("Johnson's three-point estimate of the gauge height of zero flow, %.3g %s, differs from the first control's offset %.3g %s by more than %.0f %% of its gauged depth: check the offset",
			j.ZeroFlow, L, b, L, 100*JohnsonCheckFraction)
	}
	return ""
}

// JohnsonZeroFlowSE returns the standard error of Johnson's e from the
// standard errors s1, s2, s3 of the gauge heights G₁ < G₂ < G₃ read from
// the curve, taken as independent. With D = G₁ + G₃ − 2·G₂,
//
//	∂e/∂G₁ = (G₃ − G₂)²/D²,   ∂e/∂G₂ = −2·(G₂ − G₁)(G₃ − G₂)/D²,   ∂e/∂G₃ = (G₂ − G₁)²/D²,
//
// (differentiating e = (G₁·G₃ − G₂²)/D), so e is the more sensitive the
// nearer the curve is to straight over G₁ to G₃ (D → 0): a short range of
// stage. NaN when the stages do not give an estimate (see
// JohnsonZeroFlow).
func JohnsonZeroFlowSE(g1, g2, g3, s1, s2, s3 float64) float64 {
	if _, err := JohnsonZeroFlow(g1, g2, g3); err != nil {
		return math.NaN()
	}
	d2 := math.Pow(g1+g3-2*g2, 2)
	a, b, c := (g3-g2)*(g3-g2)/d2, -2*(g2-g1)*(g3-g2)/d2, (g2-g1)*(g2-g1)/d2
	return math.Sqrt(a*a*s1*s1 + b*b*s2*s2 + c*c*s3*s3)
}

// johnsonMin is the fewest gaugings the curve of Johnson's method is
// drawn through (a quadratic and a residual).
const johnsonMin = 4

// johnsonLocalFraction is the share of the gaugings (at least johnsonMin)
// each local quadratic of johnsonFromData is drawn through.
const johnsonLocalFraction = 1.0 / 3

// johnsonFromData applies JohnsonZeroFlow to the gaugings with stage below
// top. Q₁ and Q₃ are the least and largest discharges among them; the
// curve drawn through them (standing in for the hand-drawn curve of the
// method) is read at ln Q₁, ln Q₂ and ln Q₃ by a weighted least-squares
// quadratic of gauge height in ln Q through the gaugings nearest each in
// ln Q (johnsonLocalFraction of them, at least johnsonMin).
func johnsonFromData(d *data, top float64) JohnsonEstimate {
	est := JohnsonEstimate{ZeroFlow: math.NaN(), ZeroFlowSE: math.NaN(), Q1: math.NaN(), Q2: math.NaN(), Q3: math.NaN(), G1: math.NaN(), G2: math.NaN(), G3: math.NaN()}
	var x, h, w []float64
	for i := range d.h {
		if d.h[i] < top {
			x, h, w = append(x, d.y[i]), append(h, d.h[i]), append(w, d.w[i])
		}
	}
	if len(x) < johnsonMin {
		est.Note = sayf("fewer than %d gaugings on the first control", johnsonMin)
		return est
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if !(hi > lo) {
		est.Note = "the gaugings of the first control all have one discharge"
		return est
	}
	k := max(johnsonMin, int(math.Ceil(johnsonLocalFraction*float64(len(x)))))
	mid := 0.5 * (lo + hi)
	var g, se [3]float64
	for i, at := range []float64{lo, mid, hi} {
		v, sv, ok := localQuadratic(x, h, w, at, k)
		if !ok {
			est.Note = "the gaugings of the first control do not determine a curve"
			return est
		}
		g[i], se[i] = v, sv
	}
	est.Q1, est.Q2, est.Q3 = math.Exp(lo), math.Exp(mid), math.Exp(hi)
	est.G1, est.G2, est.G3 = g[0], g[1], g[2]
	e, err := JohnsonZeroFlow(est.G1, est.G2, est.G3)
	if err != nil {
		est.Note = err.Error()
		return est
	}
	est.OK, est.ZeroFlow = true, e
	est.ZeroFlowSE = JohnsonZeroFlowSE(g[0], g[1], g[2], se[0], se[1], se[2])
	return est
}

// localQuadratic evaluates at x₀ the weighted least-squares quadratic of
// v in x through the k points nearest x₀ in x, with the standard error of
// that value from the points' scatter about the quadratic,
// s²·[(AᵀWA)⁻¹]₀₀ with s² = Σwᵢrᵢ²/(k − 3) (NaN when k = 3).
func localQuadratic(x, v, w []float64, x0 float64, k int) (val, se float64, ok bool) {
	idx := make([]int, len(x))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return math.Abs(x[idx[a]]-x0) < math.Abs(x[idx[b]]-x0) })
	idx = idx[:min(k, len(idx))]
	n := len(idx)
	a := mat.NewDense(n, 3, nil)
	b := mat.NewVecDense(n, nil)
	for r, i := range idx {
		s := math.Sqrt(w[i])
		u := x[i] - x0 // centred at x₀: the value is the intercept
		a.Set(r, 0, s)
		a.Set(r, 1, s*u)
		a.Set(r, 2, s*u*u)
		b.SetVec(r, s*v[i])
	}
	var c mat.VecDense
	if err := c.SolveVec(a, b); err != nil {
		return 0, 0, false
	}
	se = math.NaN()
	if n > 3 {
		var res mat.VecDense
		res.MulVec(a, &c)
		res.SubVec(b, &res)
		s2 := mat.Dot(&res, &res) / float64(n-3)
		var ata mat.SymDense
		ata.SymOuterK(1, a.T())
		var ch mat.Cholesky
		if ch.Factorize(&ata) {
			var inv mat.SymDense
			if err := ch.InverseTo(&inv); err == nil {
				se = math.Sqrt(s2 * inv.At(0, 0))
			}
		}
	}
	return c.AtVec(0), se, true
}
