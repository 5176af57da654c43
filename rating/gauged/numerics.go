package gauged

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

// Settings of the numerical searches shared by the fits.
const (
	// derivStep is the step of the central differences, relative to each
	// parameter's scale.
	derivStep = 1e-6
	// lmMaxIter bounds the Levenberg–Marquardt iterations.
	lmMaxIter = 200
	// lmRelTol is the relative decrease of the sum of squares below which
	// a Levenberg–Marquardt step counts as no progress.
	lmRelTol = 1e-14
	// lmStall is the number of steps without progress that ends it.
	lmStall = 3
	// lmLambda0, lmLambdaMin, lmLambdaMax: starting, least and largest damping.
	lmLambda0, lmLambdaMin, lmLambdaMax = 1e-3, 1e-12, 1e12
	// nmSimplex is the Nelder–Mead starting simplex size in scaled units.
	nmSimplex = 0.05
	// nmRelTol and nmStall end a Nelder–Mead search: the relative change
	// of the objective below which an iteration is no progress, and how
	// many such iterations end it.
	nmRelTol, nmStall = 1e-13, 60
	// nmMaxEval bounds the objective evaluations of one Nelder–Mead search.
	nmMaxEval = 40000
)

// jacobian returns the Jacobian of f at x by central differences with
// steps derivStep·scale[j] (one-sided where a side is not admissible,
// f returning nil); nil when no step is admissible for some column.
func jacobian(f func([]float64) []float64, x, scale []float64, f0 []float64) *mat.Dense {
	n, p := len(f0), len(x)
	jac := mat.NewDense(n, p, nil)
	xt := append([]float64(nil), x...)
	for j := range x {
		h := derivStep * scale[j]
		xt[j] = x[j] + h
		up := f(xt)
		xt[j] = x[j] - h
		dn := f(xt)
		xt[j] = x[j]
		switch {
		case up != nil && dn != nil:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (up[i]-dn[i])/(2*h))
			}
		case up != nil:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (up[i]-f0[i])/h)
			}
		case dn != nil:
			for i := 0; i < n; i++ {
				jac.Set(i, j, (f0[i]-dn[i])/h)
			}
		default:
			return nil
		}
	}
	return jac
}

// sumSq is Σ r_i² (+Inf for nil).
func sumSq(r []float64) float64 {
	if r == nil {
		return math.Inf(1)
	}
	var s float64
	for _, v := range r {
		s += v * v
	}
	if math.IsNaN(s) {
		return math.Inf(1)
	}
	return s
}

// levenberg minimises Σ r_i(x)² by the Levenberg–Marquardt method from x0:
// each step solves (JᵀJ + λ·diag(JᵀJ))·δ = −Jᵀr, taken when it lowers the
// sum (λ shrinks tenfold) and refused otherwise (λ grows tenfold). res
// returns nil where x is not admissible. It returns the best point and its
// sum of squares. It ends after lmStall steps in a row each lowering the sum
// by no more than lmRelTol of it (see levenbergTol).
//
// References:
//
//	Marquardt, D. W. (1963). An algorithm for least-squares estimation of
//	nonlinear parameters. Journal of the Society for Industrial and
//	Applied Mathematics 11(2), 431–441.
func levenberg(res func([]float64) []float64, x0, scale []float64) ([]float64, float64) {
	return levenbergTol(res, x0, scale, lmRelTol, lmMaxIter)
}

// levenbergTol is levenberg ending after lmStall steps in a row each
// lowering the sum of squares by no more than relTol of it, or after
// maxIter steps.
func levenbergTol(res func([]float64) []float64, x0, scale []float64, relTol float64, maxIter int) ([]float64, float64) {
	x := append([]float64(nil), x0...)
	r := res(x)
	f := sumSq(r)
	if math.IsInf(f, 1) {
		return x, f
	}
	p := len(x)
	lambda := lmLambda0
	stall := 0
	for it := 0; it < maxIter && stall < lmStall; it++ {
		jac := jacobian(res, x, scale, r)
		if jac == nil {
			break
		}
		var jtj mat.SymDense
		jtj.SymOuterK(1, jac.T())
		var g mat.VecDense
		g.MulVec(jac.T(), mat.NewVecDense(len(r), r))
		improved := false
		for lambda < lmLambdaMax {
			a := mat.NewSymDense(p, nil)
			a.CopySym(&jtj)
			for j := 0; j < p; j++ {
				d := jtj.At(j, j)
				if !(d > 0) {
					d = 1 / (scale[j] * scale[j])
				}
				a.SetSym(j, j, d*(1+lambda))
			}
			var ch mat.Cholesky
			if !ch.Factorize(a) {
				lambda *= 10
				continue
			}
			var delta mat.VecDense
			if err := ch.SolveVecTo(&delta, &g); err != nil {
				lambda *= 10
				continue
			}
			xt := make([]float64, p)
			for j := range xt {
				xt[j] = x[j] - delta.AtVec(j)
			}
			rt := res(xt)
			if ft := sumSq(rt); ft < f {
				if f-ft <= relTol*f {
					stall++
				} else {
					stall = 0
				}
				x, r, f = xt, rt, ft
				lambda = math.Max(lambda/10, lmLambdaMin)
				improved = true
				break
			}
			lambda *= 10
		}
		if !improved {
			break
		}
	}
	return x, f
}

// nelderMead minimises obj from x0 by gonum's Nelder–Mead simplex search
// in coordinates scaled by scale; it returns the best point found.
func nelderMead(obj func([]float64) float64, x0, scale []float64) ([]float64, float64) {
	z0 := make([]float64, len(x0))
	for j := range x0 {
		z0[j] = x0[j] / scale[j]
	}
	x := make([]float64, len(x0))
	unscale := func(z []float64) []float64 {
		for j := range z {
			x[j] = z[j] * scale[j]
		}
		return x
	}
	fz := func(z []float64) float64 { return obj(unscale(z)) }
	best, bestF := append([]float64(nil), x0...), obj(x0)
	res, _ := optimize.Minimize(optimize.Problem{Func: fz}, z0, &optimize.Settings{
		Converger:       &optimize.FunctionConverge{Relative: nmRelTol, Iterations: nmStall},
		FuncEvaluations: nmMaxEval,
	}, &optimize.NelderMead{SimplexSize: nmSimplex})
	if res != nil && res.F < bestF {
		bestF = res.F
		best = append([]float64(nil), unscale(res.X)...)
	}
	return best, bestF
}
