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
	cells := rowCells{t: t}
	out.Bottom, out.Top = math.Inf(1), math.Inf(-1)
	bottomFromDepth := false
	for _, rec := range t.Records {
		opt := func(name string) float64 { return cells.optional(rec, name) }
		r := rating.Row{
			Stage: cells.needed(rec, cs, "stage"), Discharge: cells.needed(rec, cq, "discharge"),
			Depth: opt("depth"), Area: opt("area"), WettedPerimeter: opt("wetted_perimeter"),
			TopWidth: opt("top_width"), HydraulicRadius: opt("hydraulic_radius"),
			Conveyance: opt("conveyance"), MeanVelocity: opt("mean_velocity"),
			Alpha: opt("alpha"), Froude: opt("froude"), HydraulicDepth: opt("hydraulic_depth"),
			Beta: opt("beta"), ShearStress: opt("shear_stress"),
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
	if err := cells.errs.err(); err != nil {
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

// rowCells reads the numbers of a table's rows, gathering every bad cell.
type rowCells struct {
	t    *Table
	errs errorList
}

// optional is the number in the column named name, NaN when the column
// is absent, the cell blank or bad (a bad cell is gathered).
func (c *rowCells) optional(rec Record, name string) float64 {
	col := c.t.Column(name)
	if col < 0 {
		return math.NaN()
	}
	v, ok, err := c.t.Float(rec, col)
	if err != nil {
		c.errs = append(c.errs, err.(*ParseError))
		return math.NaN()
	}
	if !ok {
		return math.NaN()
	}
	return v
}

// needed is the number in column col, NaN with a gathered error when the
// cell is blank or bad; what names the value in the message.
func (c *rowCells) needed(rec Record, col int, what string) float64 {
	v, ok, err := c.t.Float(rec, col)
	switch {
	case err != nil:
		c.errs = append(c.errs, err.(*ParseError))
	case !ok:
		c.errs = append(c.errs, c.t.At(rec, col, fmt.Errorf("%w: %s is blank", ErrNotNumber, what)))
	default:
		return v
	}
	return math.NaN()
}
