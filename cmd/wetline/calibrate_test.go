package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// calibRect is an invented survey of a rectangle 5 m wide with walls 3 m
// high and n 0.04, its units in the headers (as shape writes it).
const calibRect = `station (m),elevation (m),n
0,3,0.04
0,0,0.04
5,0,0.04
5,3,
`

// rate --calibrate: the gaugings' header units must agree with the
// survey's; a factor giving an implausible n is refused; gaugings above
// the section's ends are warned of; one gauging has no standard error;
// only the gaugings used are counted.
//
// Hand values (Manning's equation, Chow 1959, eq. 5-7, k = 1, S = 0.001,
// sqrt(S) = 0.0316228), the 5 m rectangle at n 0.04:
//
//	stage 1 m: A = 5 m2, P = 7 m, R = 0.714286 m, R^(2/3) = 0.799064,
//	  Q = 25 * 5 * 0.799064 * 0.0316228 = 3.15858 m3/s.
//	stage 4 m (1 m above the walls' tops, walls extended): A = 20 m2,
//	  P = 13 m, R = 1.538462 m, R^(2/3) = 1.332676,
//	  Q = 25 * 20 * 1.332671 * 0.0316228 = 21.0715 m3/s.
//
// Every n is scaled, so one gauging's factor is Q(n 0.04)/Q measured:
// a gauging of 3.15858/1.25 = 2.52686 m3/s at 1 m gives factor 1.25
// (n 0.05) and the calibrated rating 2.52686 m3/s there, as does
// 21.0715/1.25 = 16.8572 m3/s at 4 m; 3.15858/73.2 =
// 0.0431500 gives n 2.928 and 3.15858/0.0009 = 3509.5 gives n 0.000036,
// both outside survey.MinN..MaxN (0.005 to 1).
func TestRateCalibrateChecks(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	survey := filepath.Join(dir, "rect.csv")
	if err := os.WriteFile(survey, []byte(calibRect), 0o644); err != nil {
		t.Fatal(err)
	}
	const head = "time,stage (m),discharge (m3/s)\n"
	const closeQ = 1e-4 // relative: the hand values' six digits
	for _, tc := range []struct {
		name      string
		gaugings  string
		code      int
		words     []string // in the warnings (exit 0) or on standard error
		discharge float64  // of the calibrated rating at 1 m, 0 when refused
	}{
		{"feet against metres", "time,stage (ft),discharge (cfs)\n2026-01-10,1,2.52686\n", 1,
			[]string{"gaug.csv:1:2: stage (ft)", "si units set by the headers of"}, 0},
		{"one gauging", head + "2026-01-10,1,2.52686\n", 0,
			[]string{"n calibrated on 1 gauging in", "multiplied by 1.2500", "standard errors not estimated from one gauging"}, 2.52686},
		{"a dry gauging is not counted", head + "2026-01-09,0,0.1\n2026-01-10,1,2.52686\n", 0,
			[]string{"scaled subsections are dry", "n calibrated on 1 gauging in"}, 2.52686},
		{"n far too high", head + "2026-01-10,1,0.0431500\n", 1,
			[]string{"calibrated n outside the plausible range", "73.2", "2.928"}, 0},
		{"n far too low", head + "2026-01-10,1,3509.5\n", 1,
			[]string{"calibrated n outside the plausible range", "0.0009"}, 0},
		{"above the ends", head + "2026-01-10,4,16.8572\n", 0,
			[]string{"1 gauging lies above an end of the section (gauge heights up to 4.000 m; the lower end is at gauge height 3.000 m)", "multiplied by 1.2500"}, 2.52686},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sub := t.TempDir()
			g := filepath.Join(sub, "gaug.csv")
			if err := os.WriteFile(g, []byte(tc.gaugings), 0o644); err != nil {
				t.Fatal(err)
			}
			out, errs, code := runCLI(t, "rate", survey, "--slope", "0.001", "--stages", "1", "--calibrate", g, "--format", "json")
			if code != tc.code {
				t.Fatalf("exit %d, want %d; stderr %s", code, tc.code, errs)
			}
			text := errs
			var doc struct {
				Warnings []string
				Rows     []struct{ Stage, Discharge float64 }
			}
			if code == 0 {
				if err := json.Unmarshal([]byte(out), &doc); err != nil {
					t.Fatal(err)
				}
				text = strings.Join(doc.Warnings, "\n")
				if len(doc.Rows) != 1 || math.Abs(doc.Rows[0].Discharge-tc.discharge) > closeQ*tc.discharge {
					t.Errorf("rows %+v, want %g m3/s at 1 m", doc.Rows, tc.discharge)
				}
			} else if out != "" || strings.Count(strings.TrimSpace(errs), "\n") != 0 {
				t.Errorf("refused with output %q and stderr %q (want one line)", out, errs)
			}
			for _, w := range tc.words {
				if !strings.Contains(text, w) {
					t.Errorf("%q not in %q", w, text)
				}
			}
		})
	}
}

// rate --calibrate states the factor with its own standard error and,
// apart from it, the gaugings' scatter about the calibrated rating, in
// the warning and in the JSON's calibration object (null without
// --calibrate). On the 5 m rectangle of calibRect (hand values above:
// 3.15858 m3/s at 1 m, and at 2 m A = 10 m2, P = 9 m, R^(2/3) = 1.072749,
// Q = 8.48096 m3/s), gaugings 1.2 and 1.3 times below the rating
// (2.63215 at 1 m, 6.52382 at 2 m), equal weights: ln f = (ln 1.2 +
// ln 1.3)/2, f = √1.56 = 1.249000; residuals ±(ln 1.3 − ln 1.2)/2 =
// ±0.0400214; factor's standard error √(2·0.0400214²/(1·2)) = 0.0400214,
// 100·sinh = 4.00320 %; scatter √(2·0.0400214²/1) = 0.0565991, 100·sinh =
// 5.66290 % (hand calculation).
func TestRateCalibrateStandardErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	survey, g := filepath.Join(dir, "rect.csv"), filepath.Join(dir, "gaug.csv")
	if err := os.WriteFile(survey, []byte(calibRect), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(g, []byte("time,stage (m),discharge (m3/s)\n2026-01-10,1,2.63215\n2026-02-10,2,6.52382\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const handTol = 2e-5 // relative: the gaugings' six digits
	type calibration struct {
		Factor      float64 `json:"factor"`
		FactorSE    float64 `json:"factor_standard_error_percent"`
		SE          float64 `json:"standard_error_percent"`
		Gaugings    int     `json:"gaugings"`
		ChannelOnly bool    `json:"channel_only"`
		Source      string  `json:"source"`
	}
	out, errs, code := runCLI(t, "rate", survey, "--slope", "0.001", "--stages", "1", "--calibrate", g, "--format", "json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Warnings    []string
		Calibration *calibration
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	c := doc.Calibration
	if c == nil || math.Abs(c.Factor/1.249000-1) > handTol || math.Abs(c.FactorSE/4.00320-1) > handTol || math.Abs(c.SE/5.66290-1) > handTol ||
		c.Gaugings != 2 || c.ChannelOnly || c.Source != g {
		t.Errorf("calibration %+v", c)
	}
	want := "every n multiplied by 1.2490 (standard error of the factor 4.00 %); the gaugings scatter 5.66 % about the calibrated rating (standard error of estimate)"
	if !strings.Contains(strings.Join(doc.Warnings, "\n"), want) {
		t.Errorf("warnings %q lack %q", doc.Warnings, want)
	}
	out, errs, code = runCLI(t, "rate", survey, "--slope", "0.001", "--stages", "1", "--format", "json")
	var plain map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &plain); code != 0 || err != nil || string(plain["calibration"]) != "null" {
		t.Errorf("without --calibrate: exit %d (%s), calibration %s", code, errs, plain["calibration"])
	}
}
