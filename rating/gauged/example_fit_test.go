package gauged_test

import (
	"fmt"
	"math"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A rating fitted to gaugings that follow Q = 4·(h − 0.2)^1.8 exactly.
func ExampleFitPowerLaw() {
	var gs []gauged.Gauging
	for _, h := range []float64{0.5, 0.8, 1.1, 1.5, 2.0, 2.6} {
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: 4 * math.Pow(h-0.2, 1.8), Quality: rating.Good})
	}
	f, err := gauged.FitPowerLaw(gs, gauged.FitOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	s := f.Segments[0]
	fmt.Printf("Q = %.4f·(h − %.4f)^%.4f\n", s.Coefficient, s.ZeroFlow, s.Exponent)
	fmt.Printf("Q(3.0) = %.3f\n", f.Discharge(3.0))
	// Output:
	// Q = 4.0000·(h − 0.2000)^1.8000
	// Q(3.0) = 25.524
}

// A gauging's departure from a good measurement's 5 % band.
func ExampleQuality_Outside() {
	q, _ := rating.ParseQuality("good")
	fmt.Println(q.BandPercent(), q.Outside(4.0), q.Outside(-6.5))
	// Output:
	// 5 false true
}

// The lookup table's rule at stages between its rows: below the lowest
// gauging the fit (extrapolated), within the gaugings the fit: here
// 4·(h − 0.2)^1.8, the law the gaugings follow (closed form).
func ExampleFitTable_At() {
	var gs []gauged.Gauging
	for _, h := range []float64{0.5, 0.8, 1.1, 1.5, 2.0, 2.6} {
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: 4 * math.Pow(h-0.2, 1.8), Quality: rating.Good})
	}
	f, err := gauged.FitPowerLaw(gs, gauged.FitOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	t, err := gauged.LookupTable(f, gauged.TableOptions{Step: 0.5})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []float64{0.33, 1.27} {
		r, err := t.At(f, nil, h)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%.2f m: %.4f m3/s, %s, extrapolated %v\n", h, r.Discharge, r.Basis, r.Extrapolated())
	}
	// Output:
	// 0.33 m: 0.1017 m3/s, fit below gaugings, extrapolated true
	// 1.27 m: 4.5180 m3/s, fit, extrapolated false
}
