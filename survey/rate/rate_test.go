package rate_test

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
	"wetline/survey/rate"
	"wetline/survey/results"
)

// trapezoid is an invented section: a trapezoidal channel 4 m wide at the
// bed, 1 m deep, side slopes 1:1, bank marks at its top (elevation 1),
// then flat overbanks to walls at elevation 2.
const trapezoid = `station,elevation,n,mark
0,2,0.05,
1,1,0.05,
5,1,0.03,bank
6,0,0.03,
10,0,0.03,
11,1,0.05,bank
15,1,0.05,
16,2,,
`

// slope is the friction slope of every test (m/m).
const slope = 0.001

// closeQ is the relative tolerance between a discharge and the same
// formula evaluated in another order.
const closeQ = 1e-9

// writeSurvey writes a survey file into a test folder.
func writeSurvey(t *testing.T, name, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// ranged asks for stages from to to by step.
func ranged(from, to, step float64) rating.StageSpec {
	return rating.StageSpec{From: from, To: to, FromSet: true, ToSet: true, Step: step}
}

// bankfullQ is Manning's equation for the trapezoid full to its banks
// (Chow, 1959, section 6-4, for the channel alone: the overbanks are dry
// at their own elevation): A = (4 + 1)·1 = 5 m², P = 4 + 2√2 m,
// Q = (1/n)·A·(A/P)^(2/3)·√S with n = 0.03.
func bankfullQ() float64 {
	a, p := 5.0, 4+2*math.Sqrt2
	return a * math.Pow(a/p, 2.0/3) * math.Sqrt(slope) / 0.03
}

// Section rates the survey at the stages asked for, as rating.Compute
// rates its geometry at them, and computes the discharge at its bankfull
// stage; with gauge heights the bankfull stage is given on the gauge.
func TestSection(t *testing.T) {
	path := writeSurvey(t, "xs.csv", trapezoid)
	for _, tc := range []struct {
		name      string
		rating    rating.RateOptions
		stages    rating.StageSpec
		bankfull  float64 // the bankfull stage in the table's stages
		rows      int
		lookupRow bool // a lookup table is rated
	}{
		{"elevations", rating.RateOptions{}, ranged(0, 2, 0.25), 1, 9, false},
		{"gauge heights", rating.RateOptions{GaugeHeights: true, Datum: 0.5}, rating.StageSpec{List: []float64{0, 0.5, 1}, Datum: 0.5}, 0.5, 3, false},
		{"with the lookup table", rating.RateOptions{Lookup: true}, ranged(0, 1, 0.5), 1, 3, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			ro := tc.rating
			ro.Options = rating.Options{Slope: slope}
			res, err := rate.Section(rate.Options{Request: survey.SectionRequest{Path: path}, Stages: tc.stages, Rating: ro})
			if err != nil {
				t.Fatal(err)
			}
			rep := res.Report
			if len(rep.Table.Rows) != tc.rows || (len(rep.Lookup.Rows) > 0) != tc.lookupRow {
				t.Fatalf("%d rows and %d lookup rows, want %d rows (lookup %v)", len(rep.Table.Rows), len(rep.Lookup.Rows), tc.rows, tc.lookupRow)
			}
			// The same stages rated directly (an independent path through
			// the library): the table must be the one Compute gives.
			stages, _, err := results.TableStages(tc.stages, res.Prepared.Geometry, res.Prepared.Source())
			if err != nil {
				t.Fatal(err)
			}
			elev := slices.Clone(stages)
			for i := range elev {
				if tc.rating.GaugeHeights {
					elev[i] += tc.rating.Datum
				}
			}
			want, err := rating.Compute(res.Prepared.Geometry, elev, rating.Options{Slope: slope, Units: rating.SI})
			if err != nil {
				t.Fatal(err)
			}
			for i, r := range rep.Table.Rows {
				if r.Stage != stages[i] || r.Discharge != want.Rows[i].Discharge {
					t.Errorf("row %d: stage %g discharge %g, want %g and %g", i, r.Stage, r.Discharge, stages[i], want.Rows[i].Discharge)
				}
			}
			if q := bankfullQ(); res.BankfullStage != tc.bankfull || math.Abs(res.BankfullDischarge-q) > closeQ*q {
				t.Errorf("bankfull %g m, %g m3/s; want %g m, %g m3/s", res.BankfullStage, res.BankfullDischarge, tc.bankfull, q)
			}
			if rep.Ground.Source != path || !slices.Equal(rep.Provenance.Inputs, []string{path}) || rep.Provenance.Program != "" {
				t.Errorf("ground from %q, inputs %q, program %q", rep.Ground.Source, rep.Provenance.Inputs, rep.Provenance.Program)
			}
		})
	}
}

// A section without two bank marks has no bankfull stage, and no
// discharge there.
func TestSectionNoBanks(t *testing.T) {
	path := writeSurvey(t, "xs.csv", strings.ReplaceAll(trapezoid, "bank", ""))
	res, err := rate.Section(rate.Options{Request: survey.SectionRequest{Path: path}, Stages: ranged(0, 2, 0.5),
		Rating: rating.RateOptions{Options: rating.Options{Slope: slope}}})
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsNaN(res.BankfullStage) || !math.IsNaN(res.BankfullDischarge) {
		t.Errorf("bankfull %g m, %g m3/s; want NaN and NaN", res.BankfullStage, res.BankfullDischarge)
	}
}

// Calibrate is called with the prepared section in its units before the
// stages are laid out; the report carries its calibration, and the
// warnings come in order: the survey's (with Calibrate's), then the
// table's.
func TestSectionCalibrate(t *testing.T) {
	path := writeSurvey(t, "xs.csv", strings.Replace(trapezoid, "station,elevation", "station (ft),elevation (ft)", 1))
	cal := &rating.NCalibration{Source: "visits.csv", Factor: 1}
	var gotUnits rating.Units
	res, err := rate.Section(rate.Options{Request: survey.SectionRequest{Path: path}, Stages: ranged(0, 2.5, 0.5),
		Rating: rating.RateOptions{Options: rating.Options{Slope: slope}},
		Calibrate: func(p *survey.Prepared, opt rating.Options) (*rating.NCalibration, error) {
			gotUnits = opt.Units
			p.Warnings = append(p.Warnings, "calibrated")
			p.Inputs = append(p.Inputs, "visits.csv")
			return cal, nil
		}})
	if err != nil {
		t.Fatal(err)
	}
	rep := res.Report
	if gotUnits != rating.US || rep.Table.Units != rating.US {
		t.Errorf("calibrated in %v and rated in %v, want the headers' us units", gotUnits, rep.Table.Units)
	}
	if rep.Calibration != cal || !slices.Equal(rep.Provenance.Inputs, []string{path, "visits.csv"}) {
		t.Errorf("calibration %v, inputs %q", rep.Calibration, rep.Provenance.Inputs)
	}
	if len(rep.Warnings) < 2 || rep.Warnings[0] != "calibrated" || !strings.Contains(rep.Warnings[len(rep.Warnings)-1], "vertical wall") {
		t.Errorf("warnings %q: want the calibration's first and the table's (a wall above the ends) last", rep.Warnings)
	}
}

// Each step's error comes back so that a caller can tell them apart.
func TestSectionErrors(t *testing.T) {
	good := writeSurvey(t, "xs.csv", trapezoid)
	flat := writeSurvey(t, "flat.csv", "station,elevation,n\n0,1,0.03\n5,1,0.03\n")
	errCalib := errors.New("gaugings refused")
	type kind int
	const (
		plain kind = iota
		stages
		compute
	)
	for _, tc := range []struct {
		name      string
		opt       rate.Options
		kind      kind
		cause     error
		startWith string // the error's text begins with it ("" any)
	}{
		{"no depth", rate.Options{Request: survey.SectionRequest{Path: flat}}, stages, results.ErrNoDepth, flat},
		{"step too fine", rate.Options{Request: survey.SectionRequest{Path: good}, Stages: ranged(0, 2000, 0.001)}, stages, rating.ErrStepTooFine, ""},
		{"stages alike", rate.Options{Request: survey.SectionRequest{Path: good}, Stages: rating.StageSpec{List: []float64{1, 1.00001}}}, stages, results.ErrStagesAlike, ""},
		{"above the ends", rate.Options{Request: survey.SectionRequest{Path: good}, Stages: ranged(0, 3, 1),
			Rating: rating.RateOptions{Options: rating.Options{Geometry: subdivide.Options{NoExtend: true}}}}, compute, nil, good + ": "},
		{"too long for a workbook", rate.Options{Request: survey.SectionRequest{Path: good}, Stages: ranged(0, 40, 0.0001),
			Rating: rating.RateOptions{Lookup: true}}, plain, results.ErrWorkbookRows, ""},
		{"calibration", rate.Options{Request: survey.SectionRequest{Path: good},
			Calibrate: func(*survey.Prepared, rating.Options) (*rating.NCalibration, error) { return nil, errCalib }}, plain, errCalib, ""},
		{"banks off the section", rate.Options{Request: survey.SectionRequest{Path: good, Banks: []float64{1, 2000}}}, plain, survey.ErrRequest, ""},
		{"no file", rate.Options{Request: survey.SectionRequest{Path: filepath.Join(t.TempDir(), "gone.csv")}}, plain, nil, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			opt := tc.opt
			opt.Rating.Slope = slope
			res, err := rate.Section(opt)
			if err == nil {
				t.Fatalf("no error, %d rows", len(res.Report.Table.Rows))
			}
			var se *rate.StagesError
			var ce *rate.ComputeError
			if errors.As(err, &se) != (tc.kind == stages) || errors.As(err, &ce) != (tc.kind == compute) {
				t.Errorf("%v (%T): want kind %d", err, err, tc.kind)
			}
			if se != nil && se.Units != rating.SI {
				t.Errorf("stages error in %v units, want si", se.Units)
			}
			if tc.cause != nil && !errors.Is(err, tc.cause) {
				t.Errorf("%v: want it to wrap %v", err, tc.cause)
			}
			if !strings.HasPrefix(err.Error(), tc.startWith) {
				t.Errorf("%v: want it to begin with %q", err, tc.startWith)
			}
		})
	}
}
