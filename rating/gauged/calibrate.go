package gauged

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/optimize"

	"wetline/rating"
	"wetline/subdivide"
)

// NPoint is the roughness back-calculated from one gauging.
type NPoint struct {
	Gauging
	// Rated is the hydraulic discharge at the gauging with the survey's n.
	Rated float64
	// Factor is the factor on n that makes the computed discharge equal the
	// measured one (NaN when no factor can).
	Factor float64
	// N is Factor times the n of the scaled subsection carrying the most
	// conveyance at the gauging (Subsection, 0-based).
	N          float64
	Subsection int
}

// Calibration is Manning's n back-calculated from gaugings with a known
// slope.
//
// Conveyance is inversely proportional to n (Manning's equation; Chow, 1959,
// eq. 6-9), so multiplying the scaled subsections' n by f gives
//
//	Q(f) = Qs/f + Qo
//
// with Qs the discharge of the scaled subsections and Qo that of the
// others at the survey's n. Each gauging's factor solves Q(f) = Qm exactly:
// f = Qs/(Qm − Qo), defined when Qm > Qo. The best single factor minimises
// Σ wᵢ·(ln Qmᵢ − ln Qᵢ(f))² with the quality weights: in closed form
// ln f = Σwᵢ ln(Qrᵢ/Qmᵢ)/Σwᵢ when every n is scaled, by gonum's
// Nelder–Mead search on ln f otherwise.
type Calibration struct {
	// ChannelOnly reports that only the channel's n was scaled.
	ChannelOnly bool
	// Factor is the best single factor on n.
	Factor float64
	// StandardErrorPercent is the weighted standard error of the calibrated
	// rating against the gaugings, as in Fit (n − 1 degrees of freedom).
	StandardErrorPercent float64
	// Points holds each gauging's back-calculated n: one per gauging, in
	// input order.
	Points []NPoint
	// Warnings are facts a reviewer should see.
	Warnings []string
}

// ErrCalibrate is returned when no gauging can calibrate n.
var ErrCalibrate = errors.New("no gauging can calibrate n")

// Calibrate back-calculates n from gaugings on the hydraulic rating c (see
// Calibration). Gaugings with zero discharge are left out; a gauging
// whose Exclude is not blank keeps its own factor but is left out of the
// best one. Weights are 1/σ² with σ the gauging's LogSigma.
func Calibrate(gs []Gauging, c rating.HydraulicCurve, channelOnly bool) (Calibration, error) {
	return calibrate(gs, c, channelOnly, Selection{})
}

// calibrate is Calibrate with the best factor taken over the gaugings sel
// selects.
func calibrate(gs []Gauging, c rating.HydraulicCurve, channelOnly bool, sel Selection) (Calibration, error) {
	cal := Calibration{ChannelOnly: channelOnly, Factor: math.NaN(), StandardErrorPercent: math.NaN()}
	if channelOnly {
		has := false
		for _, s := range c.Geometry.Subsections() {
			if s.Region != subdivide.Channel {
				has = true
			}
		}
		if !has {
			cal.Warnings = append(cal.Warnings, "the section has no bank stations: all of it is channel, so every n is scaled")
		}
	}
	type part struct{ qs, qo, qm, w float64 }
	var parts []part
	scaled := rating.ScaledN{Factor: 1, ChannelOnly: channelOnly}
	var errs []error
	var swl, sw float64
	for _, g := range gs {
		pt := NPoint{Gauging: g, Factor: math.NaN(), N: math.NaN(), Rated: math.NaN(), Subsection: -1}
		r, err := c.Row(g.Stage)
		if err != nil {
			errs = append(errs, fmt.Errorf("%s: gauge height %g: %w", g.label(), g.Stage, err))
			continue
		}
		pt.Rated = r.Discharge
		var qs, qo, kmax float64
		for i, s := range r.Subs {
			if scaled.Scales(s.Region) {
				qs += s.Discharge
				if s.Conveyance > kmax {
					kmax, pt.Subsection = s.Conveyance, i
				}
			} else {
				qo += s.Discharge
			}
		}
		switch {
		case !(g.Discharge > 0):
			cal.Warnings = append(cal.Warnings, fmt.Sprintf("%s: zero discharge: left out of the calibration", g.label()))
		case !(qs > 0):
			cal.Warnings = append(cal.Warnings, fmt.Sprintf("%s: gauge height %g: the scaled subsections are dry: no factor on n", g.label(), g.Stage))
		case !(g.Discharge > qo):
			cal.Warnings = append(cal.Warnings, fmt.Sprintf("%s: the measured %g is not above the %g the unscaled subsections carry: no factor on the channel's n fits", g.label(), g.Discharge, qo))
		case sel.Reason(g) != "":
			pt.Factor = qs / (g.Discharge - qo)
			pt.N = pt.Factor * r.Subs[pt.Subsection].N
		default:
			pt.Factor = qs / (g.Discharge - qo)
			pt.N = pt.Factor * r.Subs[pt.Subsection].N
			w := 1 / (g.LogSigma() * g.LogSigma())
			parts = append(parts, part{qs, qo, g.Discharge, w})
			swl += w * math.Log(r.Discharge/g.Discharge)
			sw += w
		}
		cal.Points = append(cal.Points, pt)
	}
	if len(errs) > 0 {
		return cal, errors.Join(errs...)
	}
	if len(parts) == 0 {
		if len(cal.Warnings) > 0 {
			return cal, fmt.Errorf("%w (check --datum: elevation = gauge height + datum), e.g. %s", ErrCalibrate, cal.Warnings[len(cal.Warnings)-1])
		}
		return cal, ErrCalibrate
	}
	ssr := func(lf float64) float64 {
		f := math.Exp(lf)
		var s float64
		for _, p := range parts {
			d := math.Log(p.qm) - math.Log(p.qs/f+p.qo)
			s += p.w * d * d
		}
		return s
	}
	lf := swl / sw
	if channelOnly {
		res, err := optimize.Minimize(optimize.Problem{Func: func(x []float64) float64 { return ssr(x[0]) }},
			[]float64{lf}, &optimize.Settings{
				Converger:       &optimize.FunctionConverge{Relative: fitRelTol, Iterations: fitStall},
				MajorIterations: 5000,
			}, &optimize.NelderMead{SimplexSize: 0.05})
		if res == nil {
			return cal, fmt.Errorf("calibration: %w", err)
		}
		if res.F <= ssr(lf) {
			lf = res.X[0]
		}
	}
	cal.Factor = math.Exp(lf)
	if n := len(parts); n > 1 {
		// Weights normalised to mean one, as in Fit.
		s := math.Sqrt(ssr(lf) * float64(n) / sw / float64(n-1))
		cal.StandardErrorPercent = 100 * math.Sinh(s)
	}
	return cal, nil
}
