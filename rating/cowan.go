package rating

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// CowanChoice is one row of an adjustment table: a field description and
// the range of values published for it (Lo == Hi for a single value).
type CowanChoice struct {
	// Key is the short name a crew types (e.g. "minor").
	Key string
	// Description is the condition, in the table's words condensed.
	Description string
	// Lo and Hi bound the published value (n, or the ratio m).
	Lo, Hi float64
}

// CowanFactor is one term of Cowan's equation with its table.
type CowanFactor struct {
	// Symbol is the term (nb, n1, n2, n3, n4, m); Name what it accounts for.
	Symbol, Name string
	// Table cites where the values are published.
	Table string
	// Choices are the table's rows.
	Choices []CowanChoice
}

// Tables of Arcement, G.J., Jr., and Schneider, V.R. (1989), Guide for
// selecting Manning's roughness coefficients for natural channels and
// flood plains, U.S. Geological Survey Water-Supply Paper 2339. Table 1
// gives base values nb in two columns, table 2 the adjustments for
// channels and table 3 those for flood plains. The values below are from
// memory of those tables and should be checked against the paper before
// use in a report.
const (
	tableBase       = "Arcement & Schneider (1989), USGS WSP 2339, table 1 (from memory)"
	tableChannel    = "Arcement & Schneider (1989), USGS WSP 2339, table 2 (from memory)"
	tableFloodplain = "Arcement & Schneider (1989), USGS WSP 2339, table 3 (from memory)"
)

// BaseColumn selects a column of the base values of table 1. The zero
// value, AnyColumn, takes the straight-uniform-channel value where the
// table gives one, else the smooth-channel value.
type BaseColumn int

// Columns of table 1.
const (
	AnyColumn BaseColumn = iota
	// StraightColumn: straight uniform channels (after Benson & Dalrymple,
	// 1967, USGS TWRI 3-A1), a range for most materials.
	StraightColumn
	// SmoothColumn: smooth channels in the material (after Chow, 1959,
	// Open-Channel Hydraulics, table 5-5), one value.
	SmoothColumn
)

func (c BaseColumn) String() string {
	switch c {
	case StraightColumn:
		return "straight uniform channel (Benson & Dalrymple, 1967)"
	case SmoothColumn:
		return "smooth channel (Chow, 1959)"
	}
	return "straight uniform channel, else smooth channel"
}

// ParseBaseColumn reads "straight", "smooth" or "" (any column; any case).
func ParseBaseColumn(s string) (BaseColumn, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "", "any", "auto":
		return AnyColumn, nil
	case "straight", "straight-uniform", "benson-dalrymple":
		return StraightColumn, nil
	case "smooth", "chow":
		return SmoothColumn, nil
	}
	return AnyColumn, fmt.Errorf("base column %q: want straight or smooth: %w", s, ErrCowanChoice)
}

// CowanBaseRow is one bed material of table 1 with its value in each
// column; a column without a value has Lo = Hi = NaN.
type CowanBaseRow struct {
	Key, Description string
	// Straight and Smooth are the ranges of the two columns.
	Straight, Smooth [2]float64
}

// cowanBase lists table 1: sand channels for upper-regime flow by median
// grain size, then stable channels and flood plains.
func cowanBase() []CowanBaseRow {
	nan := math.NaN()
	none := [2]float64{nan, nan}
	v := func(lo, hi float64) [2]float64 { return [2]float64{lo, hi} }
	return []CowanBaseRow{
		{"sand-0.2", "sand, median size 0.2 mm", v(0.012, 0.012), none},
		{"sand-0.3", "sand, median size 0.3 mm", v(0.017, 0.017), none},
		{"sand-0.4", "sand, median size 0.4 mm", v(0.020, 0.020), none},
		{"sand-0.5", "sand, median size 0.5 mm", v(0.022, 0.022), none},
		{"sand-0.6", "sand, median size 0.6 mm", v(0.023, 0.023), none},
		{"sand-0.8", "sand, median size 0.8 mm", v(0.025, 0.025), none},
		{"sand-1.0", "sand, median size 1.0 mm", v(0.026, 0.026), none},
		{"concrete", "concrete", v(0.012, 0.018), v(0.011, 0.011)},
		{"rock-cut", "rock cut", none, v(0.025, 0.025)},
		{"firm-soil", "firm soil", v(0.025, 0.032), v(0.020, 0.020)},
		{"coarse-sand", "coarse sand, 1-2 mm", v(0.026, 0.035), none},
		{"fine-gravel", "fine gravel", none, v(0.024, 0.024)},
		{"gravel", "gravel, 2-64 mm", v(0.028, 0.035), none},
		{"coarse-gravel", "coarse gravel", none, v(0.026, 0.026)},
		{"cobble", "cobble, 64-256 mm", v(0.030, 0.050), none},
		{"boulder", "boulder, over 256 mm", v(0.040, 0.070), none},
	}
}

// CowanBase returns table 1 (a new slice on every call).
func CowanBase() []CowanBaseRow { return cowanBase() }

// baseFactor turns table 1 into a factor for one column (AnyColumn:
// straight where given, else smooth). Materials without a value in the
// column are left out.
func baseFactor(col BaseColumn) CowanFactor {
	f := CowanFactor{Symbol: "nb", Name: "base value for the bed material", Table: tableBase + ", column: " + col.String()}
	for _, r := range cowanBase() {
		v := r.Straight
		switch {
		case col == SmoothColumn, col == AnyColumn && math.IsNaN(v[0]):
			v = r.Smooth
		}
		if math.IsNaN(v[0]) {
			continue
		}
		f.Choices = append(f.Choices, CowanChoice{Key: r.Key, Description: r.Description, Lo: v[0], Hi: v[1]})
	}
	return f
}

// CowanChannel returns the channel adjustments n1 to n4 and m (table 2),
// a new slice on every call.
//
// References:
//
//	Cowan, W.L., 1956, Estimating hydraulic roughness coefficients:
//	Agricultural Engineering, 37(7), 473–475.
//	Arcement, G.J., Jr., and Schneider, V.R., 1989, Guide for selecting
//	Manning's roughness coefficients for natural channels and flood plains:
//	USGS Water-Supply Paper 2339, table 2.
func CowanChannel() []CowanFactor {
	return []CowanFactor{
		{Symbol: "n1", Name: "degree of irregularity", Table: tableChannel, Choices: []CowanChoice{
			{"smooth", "smooth: the smoothest channel attainable in the bed material", 0, 0},
			{"minor", "minor: slightly eroded or scoured side slopes", 0.001, 0.005},
			{"moderate", "moderate: moderately sloughed or eroded side slopes", 0.006, 0.010},
			{"severe", "severe: badly sloughed or scalloped banks, jagged rock", 0.011, 0.020},
		}},
		{Symbol: "n2", Name: "variation in channel cross section", Table: tableChannel, Choices: []CowanChoice{
			{"gradual", "gradual changes in size and shape", 0, 0},
			{"occasional", "large and small sections alternate occasionally", 0.001, 0.005},
			{"frequent", "large and small sections alternate frequently", 0.010, 0.015},
		}},
		{Symbol: "n3", Name: "effect of obstruction", Table: tableChannel, Choices: []CowanChoice{
			{"negligible", "negligible: a few scattered obstructions, under 5 % of the area", 0, 0.004},
			{"minor", "minor: obstructions occupy 5-15 % of the area", 0.005, 0.015},
			{"appreciable", "appreciable: obstructions occupy 15-50 % of the area", 0.020, 0.030},
			{"severe", "severe: obstructions occupy over 50 % of the area", 0.040, 0.050},
		}},
		{Symbol: "n4", Name: "amount of vegetation", Table: tableChannel, Choices: []CowanChoice{
			{"none", "no vegetation", 0, 0},
			{"small", "small: dense low grass or weeds, flexible seedlings", 0.002, 0.010},
			{"medium", "medium: turf grass, brushy growth, moderately dense", 0.010, 0.025},
			{"large", "large: turf grass as deep as the flow, bushy trees", 0.025, 0.050},
			{"very-large", "very large: turf twice the flow depth, dense willows", 0.050, 0.100},
		}},
		{Symbol: "m", Name: "degree of meandering", Table: tableChannel, Choices: []CowanChoice{
			{"minor", "minor: ratio of meander to straight length 1.0-1.2", 1.00, 1.00},
			{"appreciable", "appreciable: ratio 1.2-1.5", 1.15, 1.15},
			{"severe", "severe: ratio over 1.5", 1.30, 1.30},
		}},
	}
}

// CowanFloodplain returns the flood-plain adjustments (table 3), a new
// slice on every call; there is no variation of cross section (n2 = 0) and
// no meandering (m = 1.0).
//
// References:
//
//	Arcement, G.J., Jr., and Schneider, V.R., 1989, Guide for selecting
//	Manning's roughness coefficients for natural channels and flood plains:
//	USGS Water-Supply Paper 2339, table 3.
func CowanFloodplain() []CowanFactor {
	return []CowanFactor{
		{Symbol: "n1", Name: "degree of irregularity", Table: tableFloodplain, Choices: []CowanChoice{
			{"smooth", "smooth: the smoothest flood plain attainable", 0, 0},
			{"minor", "minor: a few rises and dips or sloughs", 0.001, 0.005},
			{"moderate", "moderate: more rises and dips, sloughs and hummocks", 0.006, 0.010},
			{"severe", "severe: many rises and dips, sloughs and hummocks", 0.011, 0.020},
		}},
		{Symbol: "n2", Name: "variation of cross section (not applicable)", Table: tableFloodplain, Choices: []CowanChoice{
			{"gradual", "not applicable on a flood plain", 0, 0},
		}},
		{Symbol: "n3", Name: "effect of obstructions", Table: tableFloodplain, Choices: []CowanChoice{
			{"negligible", "negligible: under 5 % of the area", 0, 0.004},
			{"minor", "minor: 5-15 % of the area", 0.005, 0.019},
			{"appreciable", "appreciable: 15-50 % of the area", 0.020, 0.030},
		}},
		{Symbol: "n4", Name: "amount of vegetation", Table: tableFloodplain, Choices: []CowanChoice{
			{"none", "no vegetation", 0, 0},
			{"small", "small: dense growth of flexible turf grass or weeds", 0.001, 0.010},
			{"medium", "medium: turf grass, moderately dense brush", 0.011, 0.025},
			{"large", "large: dense brush, young trees, grass as deep as the flow", 0.025, 0.050},
			{"very-large", "very large: dense bushy willows, heavy timber with underbrush", 0.050, 0.100},
			{"extreme", "extreme: dense standing timber, heavy undergrowth", 0.100, 0.200},
		}},
		{Symbol: "m", Name: "degree of meandering (not applicable)", Table: tableFloodplain, Choices: []CowanChoice{
			{"minor", "not applicable on a flood plain", 1.0, 1.0},
		}},
	}
}

// CowanFactors returns the terms of Cowan's equation for a channel or a
// flood plain, base values from column col: nb, n1, n2, n3, n4, m.
func CowanFactors(floodplain bool, col BaseColumn) []CowanFactor {
	adj := CowanChannel()
	if floodplain {
		adj = CowanFloodplain()
	}
	return append([]CowanFactor{baseFactor(col)}, adj...)
}

// CowanInput is a field description: a Key of the table for each term.
// An empty key takes the table's first row (the least roughness).
type CowanInput struct {
	Base                                                      string
	Irregularity, Variation, Obstruction, Vegetation, Meander string
	// Floodplain selects table 3 instead of table 2.
	Floodplain bool
	// Column is the column of table 1 the base value is taken from.
	Column BaseColumn
}

// CowanTerm is one term's chosen row.
type CowanTerm struct {
	Factor CowanFactor
	Choice CowanChoice
}

// CowanResult is Manning's n by Cowan's method with its published range.
type CowanResult struct {
	// Terms are nb, n1, n2, n3, n4 and m as chosen.
	Terms []CowanTerm
	// Lo and Hi use every term's low and high values; N its midpoints.
	Lo, N, Hi float64
}

// ErrCowanChoice reports an unknown description key.
var ErrCowanChoice = errors.New("unknown choice")

// Cowan computes Manning's n from a field description by Cowan's method,
//
//	n = (nb + n1 + n2 + n3 + n4)·m
//
// with the terms taken from the tables of Arcement & Schneider (1989), USGS
// Water-Supply Paper 2339, eq. 3 and tables 1-3 (Cowan, W.L., 1956,
// Estimating hydraulic roughness coefficients, Agricultural Engineering
// 37(7)). The base value comes from the column of table 1 in.Column
// selects. The table values carried here are from memory (see CowanBase).
//
// References:
//
//	Cowan, W.L. (1956), Estimating hydraulic roughness coefficients,
//	Agricultural Engineering 37(7), 473–475.
//	Arcement, G.J., Jr., and Schneider, V.R. (1989), Guide for selecting
//	Manning's roughness coefficients for natural channels and flood plains,
//	USGS Water-Supply Paper 2339, eq. 3 and tables 1–3.
func Cowan(in CowanInput) (CowanResult, error) {
	keys := []string{in.Base, in.Irregularity, in.Variation, in.Obstruction, in.Vegetation, in.Meander}
	all := CowanFactors(in.Floodplain, in.Column)
	var res CowanResult
	var sumLo, sumMid, sumHi float64
	for i, f := range all {
		c, err := f.choose(keys[i])
		if err != nil {
			return res, err
		}
		res.Terms = append(res.Terms, CowanTerm{Factor: f, Choice: c})
		if f.Symbol == "m" {
			res.Lo, res.N, res.Hi = sumLo*c.Lo, sumMid*(c.Lo+c.Hi)/2, sumHi*c.Hi
			continue
		}
		sumLo += c.Lo
		sumMid += (c.Lo + c.Hi) / 2
		sumHi += c.Hi
	}
	return res, nil
}

func (f CowanFactor) choose(key string) (CowanChoice, error) {
	key = strings.ToLower(strings.TrimSpace(key))
	if key == "" {
		return f.Choices[0], nil
	}
	keys := make([]string, len(f.Choices))
	for i, c := range f.Choices {
		if c.Key == key {
			return c, nil
		}
		keys[i] = c.Key
	}
	return CowanChoice{}, fmt.Errorf("%s (%s) %q: %w; want one of %s", f.Symbol, f.Name, key, ErrCowanChoice, strings.Join(keys, ", "))
}
