package survey

import (
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"wetline/rating"
)

// ReadRatingCSV reads back a rating table written by WriteRatingCSV, from
// a CSV file or a workbook sheet (by extension; sheet "" is the first).
// The unit system is u's, or the headers' when they name units and u was
// not given (see UnitNote.Resolve).
func ReadRatingCSV(path, sheet string, u UnitChoice) (rating.Table, error) {
	t, err := ReadTable(path, sheet)
	if err != nil {
		return rating.Table{}, err
	}
	return RatingFromTable(t, u)
}

// ParseRatingCSV reads a rating table from CSV text; name is used in
// messages and as the table's name.
func ParseRatingCSV(r io.Reader, name string, u UnitChoice) (rating.Table, error) {
	t, err := ParseCSV(r, name)
	if err != nil {
		return rating.Table{}, err
	}
	return RatingFromTable(t, u)
}

// RatingFromTable turns a table with the columns of RatingColumns and
// ExtraRatingColumns into a rating table. Stage and discharge are
// required in every row; every other column may be missing or blank
// (NaN). Per-subsection columns are not read. Bottom is stage − depth
// where a depth is given, else the lowest stage; Top is the highest
// stage. Every bad cell is reported, each naming its row and column.
func RatingFromTable(t *Table, choice UnitChoice) (rating.Table, error) {
	out := rating.Table{Name: sectionName(t), Units: choice.Units, Slope: math.NaN()}
	out.Name = strings.TrimSuffix(out.Name, "-rating")
	cs, err := t.Require("stage")
	if err != nil {
		return out, err
	}
	cq, err := t.Require("discharge")
	if err != nil {
		return out, err
	}
	note, err := t.HeaderUnits(cs, cq, t.Column("depth"), t.Column("area"), t.Column("wetted_perimeter"), t.Column("top_width"))
	if err != nil {
		return out, err
	}
	if out.Units, err = note.Resolve(choice.Units, choice.Given); err != nil {
		return out, err
	}
	nan := math.NaN()
	var errs errorList
	opt := func(rec Record, names ...string) float64 {
		c := t.Column(names...)
		if c < 0 {
			return nan
		}
		v, ok, err := t.Float(rec, c)
		if err != nil {
			errs = append(errs, err.(*ParseError))
			return nan
		}
		if !ok {
			return nan
		}
		return v
	}
	need := func(rec Record, c int, what string) float64 {
		v, ok, err := t.Float(rec, c)
		switch {
		case err != nil:
			errs = append(errs, err.(*ParseError))
		case !ok:
			errs = append(errs, t.At(rec, c, fmt.Errorf("%w: %s is blank", ErrNotNumber, what)))
		default:
			return v
		}
		return nan
	}
	out.Bottom, out.Top = math.Inf(1), math.Inf(-1)
	bottomFromDepth := false
	for _, rec := range t.Records {
		r := rating.Row{
			Stage: need(rec, cs, "stage"), Discharge: need(rec, cq, "discharge"),
			Depth: opt(rec, "depth"), Area: opt(rec, "area"), WettedPerimeter: opt(rec, "wetted_perimeter"),
			TopWidth: opt(rec, "top_width"), HydraulicRadius: opt(rec, "hydraulic_radius"),
			Conveyance: opt(rec, "conveyance"), MeanVelocity: opt(rec, "mean_velocity"),
			Alpha: opt(rec, "alpha"), Froude: opt(rec, "froude"), HydraulicDepth: opt(rec, "hydraulic_depth"),
			Beta: opt(rec, "beta"), ShearStress: opt(rec, "shear_stress"),
		}
		if math.IsNaN(r.Stage) || math.IsNaN(r.Discharge) {
			continue
		}
		out.Top = math.Max(out.Top, r.Stage)
		if r.Depth > 0 && !bottomFromDepth {
			out.Bottom, bottomFromDepth = r.Stage-r.Depth, true
		} else if !bottomFromDepth {
			out.Bottom = math.Min(out.Bottom, r.Stage)
		}
		out.Rows = append(out.Rows, r)
	}
	if err := errs.err(); err != nil {
		return out, err
	}
	if len(out.Rows) == 0 {
		return out, &ParseError{File: t.File, Sheet: t.Sheet, Err: ErrEmpty}
	}
	if !bottomFromDepth && len(out.Rows) > 0 {
		out.Warnings = append(out.Warnings, fmt.Sprintf("%s: no depth column: the lowest stage is taken as the bottom of the section",
			filepath.Base(t.File)))
	}
	return out, nil
}
