package main

import (
	"fmt"

	"wetline/survey"
)

// unitsDecided is the unit system of a command's inputs and what set it:
// --units (fixed), or else the first input read, whose headers name its
// units or, naming none, leave it in the default, si.
type unitsDecided struct {
	survey.UnitChoice
	by string
	// fixed: the units were set before any input was read (--units, or a
	// built shape's default); every input's headers must agree with them
	// and an input naming no unit takes them.
	fixed bool
	// src is the input that set the units when not fixed.
	src survey.UnitSource
}

// decideUnits starts from a --units value, given or the default.
func decideUnits(text string, given bool) (unitsDecided, error) {
	c, err := unitChoice(text, given)
	d := unitsDecided{UnitChoice: c}
	if given {
		d.by, d.fixed = "--units", true
	}
	return d, err
}

// take resolves the units written in the headers of an input read from
// file against those decided. Fixed units: headers naming others are
// refused (survey.UnitNote.Resolve), naming none take them. Otherwise the
// first input sets them, and every later one must be in them, an input
// whose headers name no unit being in si units (survey.UnitSource.Agree):
// such an input beside one naming us units is refused. Nothing is
// converted.
func (d *unitsDecided) take(note survey.UnitNote, file string) error {
	if d.fixed {
		if _, err := note.Resolve(d.Units, true); err != nil {
			return fmt.Errorf("%w (%s units set by %s)", err, d.Units, d.by)
		}
		return nil
	}
	if !d.Given {
		d.Given, d.src = true, survey.UnitSource{File: file, Note: note}
	} else if err := d.src.Agree(file, note); err != nil {
		return err
	} else if !d.src.Note.Found && note.Found {
		// Messages name the input whose headers say the units.
		d.src = survey.UnitSource{File: file, Note: note}
	}
	d.Units, d.by = d.src.Units(), "the headers of "+d.src.File
	return nil
}

// takeTable is take for a table of the kind wetline writes (a rating),
// whose CSV carries no units: it also returns the input note of such a
// table read in si units by default (see unitsAssumed).
func (d *unitsDecided) takeTable(note survey.UnitNote, file string) (string, error) {
	set := d.fixed || (d.Given && d.src.Note.Found)
	if err := d.take(note, file); err != nil {
		return "", err
	}
	return unitsAssumed(file, note, set), nil
}

// unitsAssumed is the one place deciding the input note of a table whose
// headers name no unit: when nothing else set the units (set: --units,
// or the headers of an input read before it), the table was read in si
// units by default, which survey.UnitsAssumedNote says; else "".
func unitsAssumed(file string, n survey.UnitNote, set bool) string {
	if n.Found || set {
		return ""
	}
	return survey.UnitsAssumedNote(file)
}
