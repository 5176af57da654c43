package results

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
)

// solveNormal is one normal stage in the JSON of a solve report.
type solveNormal struct {
	Stage        Float   `json:"stage"`
	Depth        Float   `json:"depth"`
	Branch       string  `json:"branch"`
	Discharge    Float   `json:"discharge"`
	Area         Float   `json:"area"`
	TopWidth     Float   `json:"top_width"`
	MeanVelocity Float   `json:"mean_velocity"`
	Froude       Float   `json:"froude"`
	Regime       *string `json:"regime"`
	Full         bool    `json:"full"`
	Jump         bool    `json:"jump"`
}

// solveCritical is one critical stage in the JSON of a solve report.
type solveCritical struct {
	Stage          Float  `json:"stage"`
	Depth          Float  `json:"depth"`
	Alpha          Float  `json:"alpha"`
	SpecificEnergy Float  `json:"specific_energy"`
	Energy         string `json:"specific_energy_extremum"`
	Jump           bool   `json:"jump"`
	Least          bool   `json:"least_specific_energy"`
}

// solveEnergy is one local minimum of specific energy in the JSON of a
// solve report.
type solveEnergy struct {
	Stage          Float `json:"stage"`
	Depth          Float `json:"depth"`
	SpecificEnergy Float `json:"specific_energy"`
}

// solveDischargeJSON is the JSON of a solve report for a discharge. Its
// leading keys are a contract: normal_stage, normal_depth,
// critical_stages, froude, regime.
type solveDischargeJSON struct {
	NormalStage    Float           `json:"normal_stage"`
	NormalDepth    Float           `json:"normal_depth"`
	CriticalStages []Float         `json:"critical_stages"`
	CriticalDepths []Float         `json:"critical_depths"`
	Froude         Float           `json:"froude"`
	Regime         *string         `json:"regime"`
	Section        string          `json:"section"`
	Units          JSONUnits       `json:"units"`
	Discharge      Float           `json:"discharge"`
	Slope          Float           `json:"slope"`
	Composite      string          `json:"composite_roughness"`
	NormalStages   []solveNormal   `json:"normal_stages"`
	Critical       []solveCritical `json:"critical"`
	MinEnergyStage Float           `json:"min_specific_energy_stage"`
	MinEnergy      Float           `json:"min_specific_energy"`
	ClosedConduit  bool            `json:"closed_conduit"`
	FullDischarge  Float           `json:"full_discharge"`
	PeakDischarge  Float           `json:"peak_discharge"`
	PeakStage      Float           `json:"peak_discharge_stage"`
	EnergyMinima   []solveEnergy   `json:"specific_energy_minima"`
	Warnings       []string        `json:"warnings"`
	Caution        string          `json:"caution"`
	Site           *jsonSite       `json:"site"`
	Notes          []string        `json:"input_notes,omitempty"`
}

// solveAreaJSON is the JSON of a solve report for a flow area.
type solveAreaJSON struct {
	Section         string    `json:"section"`
	Units           JSONUnits `json:"units"`
	Area            Float     `json:"area"`
	Stage           Float     `json:"stage"`
	Depth           Float     `json:"depth"`
	TopWidth        Float     `json:"top_width"`
	WettedPerimeter Float     `json:"wetted_perimeter"`
	HydraulicRadius Float     `json:"hydraulic_radius"`
	Full            bool      `json:"full"`
	Warnings        []string  `json:"warnings"`
	Caution         string    `json:"caution"`
	Site            *jsonSite `json:"site"`
	Notes           []string  `json:"input_notes,omitempty"`
}

// solveStageJSON is the JSON of a solve report for a stage.
type solveStageJSON struct {
	Section           string    `json:"section"`
	Units             JSONUnits `json:"units"`
	Stage             Float     `json:"stage"`
	CriticalDischarge Float     `json:"critical_discharge"`
	Slope             Float     `json:"slope"`
	UniformDischarge  Float     `json:"uniform_discharge"`
	Warnings          []string  `json:"warnings"`
	Caution           string    `json:"caution"`
	Site              *jsonSite `json:"site"`
	Notes             []string  `json:"input_notes,omitempty"`
}

// nullIfZero is a slope that was not given: null.
func nullIfZero(v float64) Float {
	if v == 0 {
		return Float(math.NaN())
	}
	return Float(v)
}

// WriteSolveJSON writes a solve report as one JSON object, by what was
// asked: for a discharge {"normal_stage","normal_depth","critical_stages",
// "critical_depths","froude","regime","section","units",...,
// "specific_energy_minima","warnings","caution"}, each entry of "critical"
// saying what the specific energy does there ("minimum", "maximum" or
// "none") and whether it is least there; for a flow area {"section","units","area","stage","depth",
// "top_width","wetted_perimeter","hydraulic_radius","full","warnings",
// "caution"}; for a stage {"section","units","stage","critical_discharge",
// "slope","uniform_discharge","warnings","caution"}; each ends with "site"
// (what is known of the site, null when nothing) and "input_notes" (the
// notes of the input, such as how a coordinate survey was projected; left
// out when there are none). Keys come in that order; undefined values are
// null.
func WriteSolveJSON(w io.Writer, rep rating.SolveReport) error {
	warnings := nonNil(rep.Warnings)
	switch {
	case rep.Area != nil:
		a := rep.Area
		return writeJSON(w, solveAreaJSON{Section: rep.Section, Units: UnitNames(rep.Units), Area: Float(a.Area),
			Stage: Float(a.Root.Stage), Depth: Float(a.Root.Depth), TopWidth: Float(a.TopWidth),
			WettedPerimeter: Float(a.WettedPerimeter), HydraulicRadius: Float(a.HydraulicRadius), Full: a.Full,
			Warnings: warnings, Caution: rating.Caution, Site: siteJSON(rep.Provenance.Site), Notes: rep.Provenance.Notes})
	case rep.Stage != nil:
		a := rep.Stage
		return writeJSON(w, solveStageJSON{Section: rep.Section, Units: UnitNames(rep.Units), Stage: Float(a.Stage),
			CriticalDischarge: Float(a.CriticalDischarge), Slope: nullIfZero(rep.Slope), UniformDischarge: Float(a.UniformDischarge),
			Warnings: warnings, Caution: rating.Caution, Site: siteJSON(rep.Provenance.Site), Notes: rep.Provenance.Notes})
	case rep.Discharge != nil:
		return writeJSON(w, solveDischarge(rep, warnings))
	}
	return rating.ErrQuery
}

// solveDischarge lays out the JSON of a solve report for a discharge.
func solveDischarge(rep rating.SolveReport, warnings []string) solveDischargeJSON {
	s := rep.Discharge
	nan := Float(math.NaN())
	out := solveDischargeJSON{
		NormalStage: nan, NormalDepth: nan, Froude: nan,
		CriticalStages: []Float{}, CriticalDepths: []Float{},
		Section: rep.Section, Units: UnitNames(s.Units), Discharge: Float(s.Discharge),
		Slope: nullIfZero(s.Slope), Composite: rep.Composite.String(),
		NormalStages: []solveNormal{}, Critical: []solveCritical{}, EnergyMinima: []solveEnergy{},
		MinEnergyStage: Float(s.MinEnergy.Stage), MinEnergy: Float(s.MinEnergy.Energy),
		ClosedConduit: s.Closed, FullDischarge: Float(s.FullDischarge),
		PeakDischarge: Float(s.PeakDischarge), PeakStage: Float(s.PeakStage),
		Warnings: warnings, Caution: rating.Caution, Site: siteJSON(rep.Provenance.Site),
		Notes: rep.Provenance.Notes,
	}
	for i, n := range s.Normal {
		var regime *string
		if n.Regime != "" {
			r := n.Regime
			regime = &r
		}
		out.NormalStages = append(out.NormalStages, solveNormal{
			Stage: Float(n.Stage), Depth: Float(n.Depth), Branch: n.Branch(),
			Discharge: Float(n.Row.Discharge), Area: Float(n.Row.Area), TopWidth: Float(n.Row.TopWidth),
			MeanVelocity: Float(n.Row.MeanVelocity), Froude: Float(n.Row.Froude), Regime: regime, Full: n.Row.Full,
			Jump: n.Jump,
		})
		if i == 0 {
			out.NormalStage, out.NormalDepth, out.Froude, out.Regime = Float(n.Stage), Float(n.Depth), Float(n.Row.Froude), regime
		}
	}
	for _, c := range s.Critical {
		out.CriticalStages = append(out.CriticalStages, Float(c.Stage))
		out.CriticalDepths = append(out.CriticalDepths, Float(c.Depth))
		out.Critical = append(out.Critical, solveCritical{
			Stage: Float(c.Stage), Depth: Float(c.Depth), Alpha: Float(c.Alpha),
			SpecificEnergy: Float(c.Energy), Energy: c.Extremum, Jump: c.Jump, Least: c.Least,
		})
	}
	for _, m := range s.EnergyMinima {
		out.EnergyMinima = append(out.EnergyMinima, solveEnergy{Stage: Float(m.Stage), Depth: Float(m.Depth), SpecificEnergy: Float(m.Energy)})
	}
	return out
}

// criticalEnergyWords says what the specific energy does at a critical
// stage: a local minimum (and whether the least), a local maximum, or
// neither, where α changing with stage moves the extremum off the stage
// at which the Froude number is 1.
func criticalEnergyWords(c rating.CriticalRoot) string {
	switch c.Extremum {
	case rating.EnergyMinimum:
		if c.Least {
			return "a local minimum of specific energy, the least"
		}
		return "a local minimum of specific energy, not the least"
	case rating.EnergyMaximum:
		return "a local maximum of specific energy"
	}
	return "not an extremum of specific energy: alpha changes with stage here, so the extremum lies off the stage where the Froude number is 1"
}

// WriteSolveText writes a solve report for a reader: the stages found,
// the hydraulics there, the warnings and the caution.
func WriteSolveText(w io.Writer, rep rating.SolveReport) error {
	bw := bufio.NewWriter(w)
	bw.WriteString(siteLine(rep.Provenance))
	u := rep.Units
	switch {
	case rep.Area != nil:
		a := rep.Area
		fmt.Fprintf(bw, "section %s (%s units)\n", rep.Section, u)
		plainf(bw, "flow area %g %s is held at stage %.4f %s (depth %.4f %s): top width %.4g %s, wetted perimeter %.4g %s\n",
			a.Area, u.Area(), a.Root.Stage, u.Length(), a.Root.Depth, u.Length(),
			a.TopWidth, u.Length(), a.WettedPerimeter, u.Length())
	case rep.Stage != nil:
		a := rep.Stage
		fmt.Fprintf(bw, "section %s (%s units)\n", rep.Section, u)
		if math.IsNaN(a.CriticalDischarge) {
			plainf(bw, "at stage %g %s no discharge is critical (no free surface)\n", a.Stage, u.Length())
		} else {
			plainf(bw, "at stage %g %s the critical discharge is %.4g %s\n", a.Stage, u.Length(), a.CriticalDischarge, u.Discharge())
		}
		if rep.Slope > 0 {
			plainf(bw, "uniform flow at slope %g carries %.4g %s\n", rep.Slope, a.UniformDischarge, u.Discharge())
		}
	case rep.Discharge != nil:
		writeSolution(bw, rep)
	default:
		return rating.ErrQuery
	}
	return endSummary(bw, rep.Warnings)
}

// writeSolution prints the stages of a discharge.
func writeSolution(w *bufio.Writer, rep rating.SolveReport) {
	s := rep.Discharge
	u := s.Units
	L := u.Length()
	plainf(w, "section %s (%s units), discharge %g %s, roughness %s\n", rep.Section, u, s.Discharge, u.Discharge(), roughnessWords(rep))
	if s.Slope > 0 {
		for _, n := range s.Normal {
			if n.Jump {
				plainf(w, "normal stage %.4f %s (depth %.4f %s) at slope %g: discharge drops past %g %s here as level ground is wetted all at once\n",
					n.Stage, L, n.Depth, L, s.Slope, s.Discharge, u.Discharge())
				continue
			}
			plainf(w, "normal stage %.4f %s (depth %.4f %s) at slope %g, %s branch: area %.4g %s, mean velocity %.4g %s, ",
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
		fmt.Fprintf(w, "critical stage %.4f %s (depth %.4f %s): alpha %.3f, specific energy %.4f %s (%s%s)\n",
			c.Stage, L, c.Depth, L, c.Alpha, c.Energy, L, criticalEnergyWords(c), jump)
	}
	least := ""
	for _, c := range s.Critical {
		if c.Least {
			least = " (at the critical stage there)"
		}
	}
	if !minimaAtCritical(s) {
		parts := make([]string, len(s.EnergyMinima))
		for i, m := range s.EnergyMinima {
			parts[i] = fmt.Sprintf("%.4f %s at stage %.4f %s", m.Energy, L, m.Stage, L)
		}
		fmt.Fprintf(w, "local minima of specific energy: %s\n", strings.Join(parts, "; "))
		if least == "" {
			least = " (off the critical stages)"
		}
	}
	fmt.Fprintf(w, "least specific energy %.4f %s at stage %.4f %s%s\n", s.MinEnergy.Energy, L, s.MinEnergy.Stage, L, least)
	if s.Closed && s.Slope > 0 {
		plainf(w, "conduit at slope %g: %.4g %s flowing just full; at most %.4g %s part full, at stage %.4f %s (%.3f of the height)\n",
			s.Slope, s.FullDischarge, u.Discharge(), s.PeakDischarge, u.Discharge(), s.PeakStage, L, (s.PeakStage-s.Bottom)/(s.Top-s.Bottom))
	}
}

// minimaAtCritical reports whether the solution's local minima of
// specific energy are exactly its critical stages labelled local minima,
// one each, so that a list of them would repeat those lines.
func minimaAtCritical(s *rating.Solution) bool {
	n := 0
	for _, c := range s.Critical {
		if c.Extremum != rating.EnergyMinimum {
			continue
		}
		n++
		found := false
		for _, m := range s.EnergyMinima {
			found = found || math.Abs(m.Stage-c.Stage) <= rating.ExtremumProbe*c.Depth
		}
		if !found {
			return false
		}
	}
	return n == len(s.EnergyMinima)
}

// roughnessWords says how roughness was handled: none given, which the
// answer does not use, or compositeWords.
func roughnessWords(rep rating.SolveReport) string {
	if rep.NUnset {
		return "none given (Manning's n plays no part in critical flow in one region)"
	}
	return compositeWords(rep.Composite)
}

// compositeWords says how roughness was handled.
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
