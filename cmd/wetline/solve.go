package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"

	"wetline/rating"
	"wetline/survey/output"
	"wetline/survey/results"
)

const solveUsage = "solve (SURVEY | --shape SPEC) (--discharge Q [--slope S] | --area A | --stage H [--slope S]) [--n ...] [--composite M] [--units si|us] [--format text|json] [-o FILE]"

type solveFlags struct {
	sectionFlags
	discharge, area, stage, slope float64
	format, output                string
}

func runSolve(ctx context.Context, e *env, args []string) error {
	fs := newFlags("solve", solveUsage)
	var f solveFlags
	f.sectionFlags.register(fs)
	fs.Float64Var(&f.discharge, "discharge", math.NaN(), "discharge to find the normal and critical stages of")
	fs.Float64Var(&f.area, "area", math.NaN(), "flow area to find the stage of (instead of --discharge)")
	fs.Float64Var(&f.stage, "stage", math.NaN(), "stage to find the critical (and, with --slope, uniform-flow) discharge at")
	fs.Float64Var(&f.slope, "slope", 0, "friction slope for the normal stage (m/m or ft/ft)")
	fs.StringVar(&f.format, "format", "", "output format: text or json (default: from the -o extension, else text)")
	fs.StringVarP(&f.output, "output", "o", "", "output file (default: standard output)")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() > 1 || (fs.NArg() == 0 && f.shape == "") {
		return usagef("solve: want one SURVEY file or --shape SPEC, got %d arguments", fs.NArg())
	}
	modes := 0
	for _, m := range []struct {
		name     string
		v        float64
		positive bool
	}{{"--discharge", f.discharge, true}, {"--area", f.area, true}, {"--stage", f.stage, false}} {
		if math.IsNaN(m.v) {
			continue
		}
		modes++
		if math.IsInf(m.v, 0) || m.positive && !(m.v > 0) {
			return usagef("solve: %s %v: want a positive, finite number", m.name, m.v)
		}
	}
	if modes != 1 {
		return usagef("solve: give one of --discharge Q, --area A or --stage H")
	}
	if !(f.slope >= 0) || math.IsInf(f.slope, 0) {
		return usagef("solve: --slope must be a positive friction slope")
	}
	format, err := outputFormat(f.format, f.output, "text", "json")
	if err != nil {
		return err
	}
	l, err := f.load(fs.Arg(0))
	if err != nil {
		return err
	}
	if f.output != "" {
		if err := output.CheckOutput(f.output, l.inputs); err != nil {
			return err
		}
	}
	opt := rating.Options{Slope: f.slope, Units: l.units, Geometry: l.geomOpt}
	var text func(io.Writer) error
	var obj any
	switch {
	case !math.IsNaN(f.discharge):
		sol, err := rating.Solve(l.geom, f.discharge, opt)
		if err != nil {
			return l.fail(err)
		}
		sol.Composite, _ = rating.ParseComposite(f.composite)
		sol.Warnings = append(append([]string(nil), l.warnings...), sol.Warnings...)
		text = func(w io.Writer) error { return writeSolutionText(w, sol) }
		obj = solutionJSON(sol)
	case !math.IsNaN(f.area):
		r, err := rating.StageForArea(l.geom, f.area, opt)
		if err != nil {
			return l.fail(err)
		}
		wet, err := l.geom.At(r.Stage, l.geomOpt)
		if err != nil {
			return l.fail(err)
		}
		text = func(w io.Writer) error {
			fmt.Fprintf(w, "section %s (%s units)\n", l.source, l.units)
			fmt.Fprintf(w, "flow area %g %s is held at stage %.4f %s (depth %.4f %s): top width %.4g %s, wetted perimeter %.4g %s\n",
				f.area, l.units.Area(), r.Stage, l.units.Length(), r.Depth, l.units.Length(),
				wet.TopWidth, l.units.Length(), wet.WettedPerimeter, l.units.Length())
			printWarnings(w, l.warnings)
			fmt.Fprintln(w, "caution: "+rating.Caution)
			return nil
		}
		obj = map[string]any{
			"section": l.source, "units": results.UnitNames(l.units), "area": results.Float(f.area),
			"stage": results.Float(r.Stage), "depth": results.Float(r.Depth),
			"top_width": results.Float(wet.TopWidth), "wetted_perimeter": results.Float(wet.WettedPerimeter),
			"hydraulic_radius": results.Float(wet.HydraulicRadius), "full": wet.Full,
			"warnings": nonNil(l.warnings), "caution": rating.Caution,
		}
	default:
		qc, err := rating.CriticalDischarge(l.geom, f.stage, opt)
		if err != nil {
			return l.fail(err)
		}
		uniform := math.NaN()
		if f.slope > 0 {
			t, err := rating.Compute(l.geom, []float64{f.stage}, opt)
			if err != nil {
				return l.fail(err)
			}
			uniform = t.Rows[0].Discharge
		}
		text = func(w io.Writer) error {
			fmt.Fprintf(w, "section %s (%s units)\n", l.source, l.units)
			fmt.Fprintf(w, "at stage %g %s the critical discharge is %.4g %s\n", f.stage, l.units.Length(), qc, l.units.Discharge())
			if f.slope > 0 {
				fmt.Fprintf(w, "uniform flow at slope %g carries %.4g %s\n", f.slope, uniform, l.units.Discharge())
			}
			printWarnings(w, l.warnings)
			fmt.Fprintln(w, "caution: "+rating.Caution)
			return nil
		}
		obj = map[string]any{
			"section": l.source, "units": results.UnitNames(l.units), "stage": results.Float(f.stage),
			"critical_discharge": results.Float(qc), "slope": nullIfZero(f.slope), "uniform_discharge": results.Float(uniform),
			"warnings": nonNil(l.warnings), "caution": rating.Caution,
		}
	}
	write := text
	if format == "json" {
		write = func(w io.Writer) error {
			enc := json.NewEncoder(w)
			enc.SetIndent("", "  ")
			return enc.Encode(obj)
		}
	}
	if f.output == "" {
		return write(e.stdout)
	}
	if err := output.WriteFile(f.output, l.inputs, write); err != nil {
		return err
	}
	fmt.Fprintf(e.stderr, "wrote %s\ncaution: %s\n", f.output, rating.Caution)
	return nil
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}

func nullIfZero(v float64) results.Float {
	if v == 0 {
		return results.Float(math.NaN())
	}
	return results.Float(v)
}

// energyExtremum says whether specific energy has a minimum or a maximum
// at a critical stage: a minimum where the Froude number falls through 1.
func energyExtremum(c rating.CriticalRoot) string {
	if c.Rising {
		return "minimum"
	}
	return "maximum"
}

// solutionJSON is the JSON form of a solution. Its leading keys are a
// contract: normal_stage, normal_depth, critical_stages, froude, regime.
func solutionJSON(s rating.Solution) any {
	type normal struct {
		Stage        results.Float `json:"stage"`
		Depth        results.Float `json:"depth"`
		Branch       string        `json:"branch"`
		Discharge    results.Float `json:"discharge"`
		Area         results.Float `json:"area"`
		TopWidth     results.Float `json:"top_width"`
		MeanVelocity results.Float `json:"mean_velocity"`
		Froude       results.Float `json:"froude"`
		Regime       *string       `json:"regime"`
		Full         bool          `json:"full"`
		Jump         bool          `json:"jump"`
	}
	type critical struct {
		Stage          results.Float `json:"stage"`
		Depth          results.Float `json:"depth"`
		Alpha          results.Float `json:"alpha"`
		SpecificEnergy results.Float `json:"specific_energy"`
		Energy         string        `json:"specific_energy_extremum"`
		Jump           bool          `json:"jump"`
	}
	out := struct {
		NormalStage    results.Float     `json:"normal_stage"`
		NormalDepth    results.Float     `json:"normal_depth"`
		CriticalStages []results.Float   `json:"critical_stages"`
		CriticalDepths []results.Float   `json:"critical_depths"`
		Froude         results.Float     `json:"froude"`
		Regime         *string           `json:"regime"`
		Section        string            `json:"section"`
		Units          map[string]string `json:"units"`
		Discharge      results.Float     `json:"discharge"`
		Slope          results.Float     `json:"slope"`
		Composite      string            `json:"composite_roughness"`
		NormalStages   []normal          `json:"normal_stages"`
		Critical       []critical        `json:"critical"`
		MinEnergyStage results.Float     `json:"min_specific_energy_stage"`
		MinEnergy      results.Float     `json:"min_specific_energy"`
		ClosedConduit  bool              `json:"closed_conduit"`
		FullDischarge  results.Float     `json:"full_discharge"`
		PeakDischarge  results.Float     `json:"peak_discharge"`
		PeakStage      results.Float     `json:"peak_discharge_stage"`
		Warnings       []string          `json:"warnings"`
		Caution        string            `json:"caution"`
	}{
		NormalStage: results.Float(math.NaN()), NormalDepth: results.Float(math.NaN()), Froude: results.Float(math.NaN()),
		CriticalStages: []results.Float{}, CriticalDepths: []results.Float{},
		Section: s.Name, Units: results.UnitNames(s.Units), Discharge: results.Float(s.Discharge),
		Slope: nullIfZero(s.Slope), Composite: s.Composite.String(),
		NormalStages: []normal{}, Critical: []critical{},
		MinEnergyStage: results.Float(s.MinEnergy.Stage), MinEnergy: results.Float(s.MinEnergy.Energy),
		ClosedConduit: s.Closed, FullDischarge: results.Float(s.FullDischarge),
		PeakDischarge: results.Float(s.PeakDischarge), PeakStage: results.Float(s.PeakStage),
		Warnings: nonNil(s.Warnings), Caution: rating.Caution,
	}
	for i, n := range s.Normal {
		var regime *string
		if n.Regime != "" {
			r := n.Regime
			regime = &r
		}
		out.NormalStages = append(out.NormalStages, normal{
			Stage: results.Float(n.Stage), Depth: results.Float(n.Depth), Branch: n.Branch(),
			Discharge: results.Float(n.Row.Discharge), Area: results.Float(n.Row.Area), TopWidth: results.Float(n.Row.TopWidth),
			MeanVelocity: results.Float(n.Row.MeanVelocity), Froude: results.Float(n.Row.Froude), Regime: regime, Full: n.Row.Full,
			Jump: n.Jump,
		})
		if i == 0 {
			out.NormalStage, out.NormalDepth, out.Froude, out.Regime = results.Float(n.Stage), results.Float(n.Depth), results.Float(n.Row.Froude), regime
		}
	}
	for _, c := range s.Critical {
		out.CriticalStages = append(out.CriticalStages, results.Float(c.Stage))
		out.CriticalDepths = append(out.CriticalDepths, results.Float(c.Depth))
		out.Critical = append(out.Critical, critical{
			Stage: results.Float(c.Stage), Depth: results.Float(c.Depth), Alpha: results.Float(c.Alpha),
			SpecificEnergy: results.Float(c.Energy), Energy: energyExtremum(c), Jump: c.Jump,
		})
	}
	return out
}

// writeSolutionText prints a solution for a reader.
func writeSolutionText(w io.Writer, s rating.Solution) error {
	u := s.Units
	L := u.Length()
	fmt.Fprintf(w, "section %s (%s units), discharge %g %s, roughness %s\n", s.Name, u, s.Discharge, u.Discharge(), compositeWords(s.Composite))
	if s.Slope > 0 {
		for _, n := range s.Normal {
			if n.Jump {
				fmt.Fprintf(w, "normal stage %.4f %s (depth %.4f %s) at slope %g: discharge drops past %g %s here as level ground is wetted all at once\n",
					n.Stage, L, n.Depth, L, s.Slope, s.Discharge, u.Discharge())
				continue
			}
			fmt.Fprintf(w, "normal stage %.4f %s (depth %.4f %s) at slope %g, %s branch: area %.4g %s, mean velocity %.4g %s, ",
				n.Stage, L, n.Depth, L, s.Slope, n.Branch(), n.Row.Area, u.Area(), n.Row.MeanVelocity, u.Velocity())
			if n.Row.Full {
				fmt.Fprintln(w, "flowing full (wetted perimeter the whole circumference, top width zero, no Froude number)")
			} else {
				fmt.Fprintf(w, "Froude number %.3f, %s\n", n.Row.Froude, n.Regime)
			}
		}
	} else {
		fmt.Fprintln(w, "normal stage: give --slope to compute it")
	}
	for _, c := range s.Critical {
		jump := ""
		if c.Jump {
			jump = "; the Froude number jumps through 1 here as level ground is wetted all at once"
		}
		fmt.Fprintf(w, "critical stage %.4f %s (depth %.4f %s): alpha %.3f, specific energy %.4f %s (a %s%s)\n",
			c.Stage, L, c.Depth, L, c.Alpha, c.Energy, L, energyExtremum(c), jump)
	}
	fmt.Fprintf(w, "least specific energy %.4f %s at stage %.4f %s\n", s.MinEnergy.Energy, L, s.MinEnergy.Stage, L)
	if s.Closed && s.Slope > 0 {
		fmt.Fprintf(w, "conduit at slope %g: %.4g %s flowing just full; at most %.4g %s part full, at stage %.4f %s (%.3f of the height)\n",
			s.Slope, s.FullDischarge, u.Discharge(), s.PeakDischarge, u.Discharge(), s.PeakStage, L, (s.PeakStage-s.Bottom)/(s.Top-s.Bottom))
	}
	printWarnings(w, s.Warnings)
	fmt.Fprintln(w, "caution: "+rating.Caution)
	return nil
}

func compositeWords(c rating.Composite) string {
	switch c {
	case rating.HortonEinstein:
		return "composite by region (Horton-Einstein, equal velocity)"
	case rating.Pavlovskii:
		return "composite by region (Pavlovskii, total force)"
	case rating.Lotter:
		return "composite by region (Lotter, sum of conveyances)"
	}
	return "split at every n change"
}

// Demo culvert: the invented Mill Lane culvert beside the gauge.
const (
	demoCulvert      = "circle:diameter=1.2"
	demoCulvertN     = "0.013"
	demoCulvertSlope = 0.003 // m/m
	demoCulvertFlow  = 1.5   // m³/s
)

// demoSolve writes the normal and critical depths of the demo culvert.
func demoSolve(ctx context.Context, e *env, dir string) error {
	name := "mill-lane-culvert-solve.txt"
	args := []string{"--shape", demoCulvert, "--n", demoCulvertN, "--slope", fmt.Sprint(demoCulvertSlope),
		"--discharge", fmt.Sprint(demoCulvertFlow), "-o", filepath.Join(dir, name)}
	if err := runSolve(ctx, &env{stdout: io.Discard, stderr: io.Discard}, args); err != nil {
		return err
	}
	fmt.Fprintf(e.stdout, "  %-28s %s\n", name, "normal and critical depth in the 1.2 m road culvert")
	return nil
}
