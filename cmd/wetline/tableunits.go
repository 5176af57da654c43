package main

import (
	"fmt"

	"wetline/survey"
)

// unitsDecided is the unit system of a command's tables and what set it:
// --units, or the headers of the first table that named units; nothing
// (by "") while the default, si, stands.
type unitsDecided struct {
	survey.UnitChoice
	by string
}

// decideUnits starts from a --units value, given or the default.
func decideUnits(text string, given bool) (unitsDecided, error) {
	c, err := unitChoice(text, given)
	d := unitsDecided{UnitChoice: c}
	if given {
		d.by = "--units"
	}
	return d, err
}

// take resolves the units written in the headers of a table read from
// file (see survey.UnitNote.Resolve): units other than those already set
// are refused, naming the column and both units; the first table naming
// units sets them when nothing had. Nothing is converted.
func (d *unitsDecided) take(note survey.UnitNote, file string) error {
	u, err := note.Resolve(d.Units, d.Given)
	if err != nil {
		return fmt.Errorf("%w (%s units set by %s)", err, d.Units, d.by)
	}
	if !d.Given && note.Found {
		d.Given, d.by = true, "the headers of "+file
	}
	d.Units = u
	return nil
}
