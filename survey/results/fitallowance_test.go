package results_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
	"wetline/survey/results"
)

// allowanceSection returns the hydraulic rating of an invented compound
// section (a channel 10 m wide and 2 m deep, floodplains 30 m wide with a
// rougher n), with its bank stations or, banks false, without them.
func allowanceSection(t *testing.T, banks bool) rating.HydraulicCurve {
	t.Helper()
	s, err := subdivide.ParseShape("compound:bottom=10,side=0,depth=2,floodplain=30,outer=0,floodn=0.06,height=4")
	if err != nil {
		t.Fatal(err)
	}
	sec, err := s.Section(subdivide.PerRegion{Channel: 0.035})
	if err != nil {
		t.Fatal(err)
	}
	sec.HasBanks = banks && sec.HasBanks
	p, err := subdivide.Compile(sec)
	if err != nil {
		t.Fatal(err)
	}
	return rating.HydraulicCurve{Geometry: p, Options: rating.Options{Slope: 0.001}}
}

// The JSON object of the conveyance-slope extension keeps its keys of
// earlier versions first, in order, and adds after them the inputs of the
// bands' allowances above the join: the trend's standard error with its t
// quantile and degrees of freedom, n's cv and σ_lnf = √(ln(1 + cv²))
// (0.198042 for cv 0.2, hand calculation; null without overbanks) and the
// overbanks' share at the join. The text report gives them on one line.
// On each section the upper total band at the top row is re-derived from
// the report alone: √(w_j² + a_S² + a_n²), w_j the total half-width in
// ln Q at the join's row, a_S = t·½·(h − h_j)·SE, with t the published
// 97.5 % Student quantile (Student's t table), and a_n = z·|φ(h) −
// φ(h_j)|·σ_lnf, z = 1.959964 the 97.5 % normal quantile (standard
// normal table), φ(h) the row's overbank_share (the last key of every
// table row, null off the extension) and φ(h_j) join_overbank_share;
// without bank stations a_n is 0.
func TestWriteFitJSONAllowances(t *testing.T) {
	var gs []gauged.Gauging
	for i := range 12 {
		h := 0.4 + 0.13*float64(i)
		q := 10 * h * math.Pow(10*h/(10+2*h), 2.0/3) / 0.030 * math.Sqrt(0.001) // Manning, n 0.030 (Chow, 1959, eq. 6-9)
		gs = append(gs, gauged.Gauging{Stage: h, Discharge: q * (1 + 0.03*math.Sin(float64(5*i))), Quality: rating.Good})
	}
	legacy := []string{"gaugings", "level", "log_slope", "log_slope_standard_error", "trend", "trend_standard_error", "centre_stage",
		"trend_p", "scatter_log", "join_stage", "join_discharge", "join_conveyance", "join_log_slope"}
	added := []string{"line_trend_standard_error", "line_trend_t", "line_trend_degrees_of_freedom", "n_cv", "n_log_sd", "join_overbank_share"}
	tTable := map[float64]float64{3: 3.1824, 4: 2.7764, 5: 2.5706, 6: 2.4469, 7: 2.3646} // Student's t, 97.5 %
	for _, banks := range []bool{true, false} {
		sec := allowanceSection(t, banks)
		rep, err := gauged.Analyze(gs, gauged.Options{Site: "test", Units: rating.SI, Hydraulic: &sec, Table: gauged.ControlTableOptions{To: 4, Step: 0.1}})
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := results.WriteFitJSON(&buf, rep); err != nil {
			t.Fatal(err)
		}
		var doc struct {
			Extrapolation struct {
				ConveyanceSlope json.RawMessage `json:"conveyance_slope"`
			}
			Table []struct {
				Stage, Discharge float64
				Basis            string
				TotalUpper       float64  `json:"total_upper_95"`
				Share            *float64 `json:"overbank_share"`
			}
		}
		var rawDoc struct {
			Table []json.RawMessage `json:"table"`
		}
		if err := json.Unmarshal(buf.Bytes(), &doc); err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(buf.Bytes(), &rawDoc); err != nil {
			t.Fatal(err)
		}
		raw := doc.Extrapolation.ConveyanceSlope
		if keys := jsonKeys(t, raw); !slices.Equal(keys, slices.Concat(legacy, added)) {
			t.Fatalf("banks %v: keys %q, want %q then %q", banks, keys, legacy, added)
		}
		var c struct {
			Stage    float64  `json:"join_stage"`
			SE       float64  `json:"line_trend_standard_error"`
			T        float64  `json:"line_trend_t"`
			DF       int      `json:"line_trend_degrees_of_freedom"`
			NCV      *float64 `json:"n_cv"`
			NLogSD   *float64 `json:"n_log_sd"`
			Share    *float64 `json:"join_overbank_share"`
			Gaugings int
		}
		if err := json.Unmarshal(raw, &c); err != nil {
			t.Fatal(err)
		}
		if tq, ok := tTable[float64(c.DF)]; !ok || c.DF != c.Gaugings-2 || math.Abs(c.T-tq) > 1e-4 || !(c.SE > 0) || c.Share == nil {
			t.Errorf("banks %v: t %g on %d degrees of freedom (%d gaugings), SE %g, share %v", banks, c.T, c.DF, c.Gaugings, c.SE, c.Share)
		}
		var aN float64
		if banks {
			if c.NCV == nil || *c.NCV != 0.2 || c.NLogSD == nil || math.Abs(*c.NLogSD-0.198042) > 1e-6 {
				t.Errorf("n cv %v, σ_lnf %v, want 0.2 and 0.198042", c.NCV, c.NLogSD)
			}
		} else if c.NCV != nil || c.NLogSD != nil || *c.Share != 0 {
			t.Errorf("without banks: n cv %v, σ_lnf %v, share %v, want null, null, 0", c.NCV, c.NLogSD, *c.Share)
		}
		var wj float64
		for i, r := range doc.Table {
			if math.Abs(r.Stage-c.Stage) < 1e-9 {
				wj = math.Log(r.TotalUpper / r.Discharge)
			}
			if keys := jsonKeys(t, rawDoc.Table[i]); keys[len(keys)-1] != "overbank_share" {
				t.Errorf("banks %v: row at %g m: keys %q, want overbank_share last", banks, r.Stage, keys)
			}
			if ext := r.Basis == "conveyance-slope"; ext != (r.Share != nil) {
				t.Errorf("banks %v: row at %g m, basis %s: overbank_share %v", banks, r.Stage, r.Basis, r.Share)
			}
		}
		top := doc.Table[len(doc.Table)-1]
		if top.Share == nil || banks != (*top.Share > *c.Share) || !banks && *top.Share != 0 {
			t.Fatalf("banks %v: overbank_share %v at the top row, %v at the join", banks, top.Share, *c.Share)
		}
		if banks {
			aN = 1.959964 * math.Abs(*top.Share-*c.Share) * *c.NLogSD
		}
		aS := c.T * 0.5 * (top.Stage - c.Stage) * c.SE
		if got, want := math.Log(top.TotalUpper/top.Discharge), math.Sqrt(wj*wj+aS*aS+aN*aN); !(wj > 0) || math.Abs(got-want) > 1e-4*want {
			t.Errorf("banks %v: total half-width at %g m %.6g, want %.6g from the report (w_j %g, a_S %g, a_n %g)", banks, top.Stage, got, want, wj, aS, aN)
		}
		buf.Reset()
		if err := results.WriteFitText(&buf, rep); err != nil {
			t.Fatal(err)
		}
		want := fmt.Sprintf("on %d degrees of freedom; ", c.DF)
		if banks {
			want += "n off the channel cv 0.2 (σ_lnf 0.198), overbanks' share of conveyance at the join"
		} else {
			want += "no allowance for n off the channel"
		}
		if n := strings.Count(buf.String(), "allowances above the join"); n != 1 || !strings.Contains(buf.String(), want) {
			t.Errorf("banks %v: %d allowance lines, want one with %q", banks, n, want)
		}
	}
}
