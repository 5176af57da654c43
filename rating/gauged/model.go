package gauged

import (
	"fmt"
	"math"
)

// model lays out the parameters of a rating of K controls in one vector,
//
//	[ln A_1 … ln A_K, C_1 … C_K, B_1, κ_2 … κ_K, ln σ_r]
//
// (the full vector; ln σ_r is the remnant error of a Bayesian fit), and
// says which of them a fit moves (free) and which it holds (fixed at their
// values in base).
type model struct {
	kinds  []ControlKind
	joints []Joint
	// base holds every parameter; fixed ones keep their value.
	base []float64
	// free lists the indices of the parameters a fit moves.
	free []int
}

// Index helpers of the full vector.
func (m *model) k() int             { return len(m.kinds) }
func (m *model) iLnA(j int) int     { return j }
func (m *model) iC(j int) int       { return m.k() + j }
func (m *model) iB() int            { return 2 * m.k() }
func (m *model) iBreak(j int) int   { return 2*m.k() + j } // j = 1 … K−1
func (m *model) iRemnant() int      { return 3 * m.k() }
func (m *model) fullLen() int       { return 3*m.k() + 1 }
func (m *model) isStage(i int) bool { return i >= m.iB() && i < m.iRemnant() }

// newModel returns a model of the given controls with every parameter
// fixed at zero (callers set base and free).
func newModel(kinds []ControlKind, joints []Joint) *model {
	m := &model{kinds: append([]ControlKind(nil), kinds...), joints: append([]Joint(nil), joints...)}
	m.base = make([]float64, m.fullLen())
	return m
}

// paramName names parameter i of the full vector: ln_a1, c1, b1, break2,
// ln_remnant.
func (m *model) paramName(i int) string {
	switch {
	case i < m.k():
		return fmt.Sprintf("ln_a%d", i+1)
	case i < 2*m.k():
		return fmt.Sprintf("c%d", i-m.k()+1)
	case i == m.iB():
		return "b1"
	case i < m.iRemnant():
		return fmt.Sprintf("break%d", i-m.iB()+1)
	}
	return "ln_remnant"
}

// full returns the full vector with the free parameters set from x.
func (m *model) full(x []float64) []float64 {
	p := append([]float64(nil), m.base...)
	for j, i := range m.free {
		p[i] = x[j]
	}
	return p
}

// freeOf returns the free parameters of a full vector.
func (m *model) freeOf(p []float64) []float64 {
	x := make([]float64, len(m.free))
	for j, i := range m.free {
		x[j] = p[i]
	}
	return x
}

// rating builds the rating of a full vector; ok is false when the
// parameters make none (see NewRating).
func (m *model) rating(p []float64) (Rating, bool) {
	cs := make([]Control, m.k())
	for j := range cs {
		cs[j] = Control{Kind: m.kinds[j], Joint: m.joints[j], A: math.Exp(p[m.iLnA(j)]), C: p[m.iC(j)]}
		if j == 0 {
			cs[j].B = p[m.iB()]
		} else {
			cs[j].From = p[m.iBreak(j)]
		}
	}
	r, err := NewRating(cs)
	return r, err == nil
}

// logQ is ln Q of rating r at stage h (−Inf at or below the first offset).
func logQ(r Rating, h float64) float64 {
	j := r.segment(h)
	if j < 0 {
		return math.Inf(-1)
	}
	c := r.Controls[j]
	if j == 0 || c.Joint == Replace {
		return math.Log(c.A) + c.C*math.Log(h-c.B)
	}
	return math.Log(r.upTo(j, h))
}
