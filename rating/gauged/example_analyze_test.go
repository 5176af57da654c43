package gauged_test

import (
	"fmt"

	"wetline/rating"
	"wetline/rating/gauged"
)

// A report on gaugings (±2 % about the truth, invented) of the lower
// metre and a half of a trapezoidal channel surveyed with n a little
// high: the gaugings depart from the survey's hydraulic rating, least
// squares fits one control, and the table follows the conveyance-slope
// extension, joined to the fitted rating at the highest gauging, to the
// section's top with both bands on every row and the multiple of the
// largest gauging above it.
func ExampleAnalyze() {
	shape := "trapezoid:bottom=10,side=2,height=3"
	truth := section(shape, 0.035, 0.001)
	survey := section(shape, 0.040, 0.001)
	var gs []gauged.Gauging
	for i := 0; i < 10; i++ {
		h := 0.3 + 0.13*float64(i)
		q, _ := truth.Discharge(h)
		scatter := 1 + 0.02*float64(1-2*(i%2))*float64(i%3)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q * scatter, Quality: rating.Good})
	}
	rep, err := gauged.Analyze(gs, gauged.Options{Hydraulic: &survey, Table: gauged.ControlTableOptions{Step: 1}})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("mean departure from the survey's rating %+.1f %%\n", rep.Comparison.MeanLogDeparturePercent)
	c := rep.Fit.Controls[0]
	fmt.Printf("%s fit: A = %.2f, B = %.3f m, C = %.3f, standard error %.1f %%\n", rep.Method, c.A, c.B, c.C, rep.Fit.StandardErrorPercent)
	for _, r := range rep.Table.Rows[2:] {
		q, _ := truth.Discharge(r.Stage)
		fmt.Printf("%.2f m: %4.1f m3/s (truth %4.1f), total band %4.1f to %4.1f (%s)", r.Stage, r.Discharge, q, r.TotalLower, r.TotalUpper, r.Basis)
		if r.Extrapolated() {
			fmt.Printf(", %.2f × the largest gauging", r.Multiple)
		}
		fmt.Println()
	}
	// Output:
	// mean departure from the survey's rating +14.5 %
	// lsq fit: A = 9.28, B = -0.020 m, C = 1.772, standard error 3.0 %
	// 1.00 m:  9.6 m3/s (truth  9.6), total band  8.9 to 10.4 (fit)
	// 1.47 m: 18.8 m3/s (truth 18.8), total band 17.3 to 20.5 (fit)
	// 2.00 m: 32.8 m3/s (truth 32.8), total band 28.6 to 37.6 (conveyance-slope), 1.74 × the largest gauging
	// 3.00 m: 69.9 m3/s (truth 70.0), total band 50.7 to 96.4 (conveyance-slope), 3.71 × the largest gauging
}
