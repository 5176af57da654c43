package main

import (
	"context"
	"errors"

	"wetline/rating"
	"wetline/survey/results"
)

const cowanUsage = "cowan [--site NAME] [--floodplain] --bed MATERIAL [--base-column straight|smooth] [--irregularity K] [--variation K] [--obstruction K] [--vegetation K] [--meander K] | cowan --list"

// runCowan turns a field crew's description of a reach into Manning's n
// by Cowan's method.
func runCowan(ctx context.Context, e *env, args []string) error {
	fs := newFlags("cowan", cowanUsage)
	var in rating.CowanInput
	var column string
	fs.BoolVar(&in.Floodplain, "floodplain", false, "describe a flood plain (adjustments of table 3) instead of a channel (table 2)")
	fs.StringVar(&in.Base, "bed", "", "bed material for the base value nb (see --list)")
	fs.StringVar(&column, "base-column", "", "column of the base values: straight (straight uniform channels) or smooth (smooth channels); default: straight where the table gives it, else smooth")
	fs.StringVar(&in.Irregularity, "irregularity", "", "n1, degree of irregularity (default: the smoothest)")
	fs.StringVar(&in.Variation, "variation", "", "n2, variation of the channel's cross section (default: gradual)")
	fs.StringVar(&in.Obstruction, "obstruction", "", "n3, effect of obstructions (default: negligible)")
	fs.StringVar(&in.Vegetation, "vegetation", "", "n4, amount of vegetation (default: none)")
	fs.StringVar(&in.Meander, "meander", "", "m, degree of meandering (default: minor)")
	list := fs.Bool("list", false, "print the tables and their choices")
	site := fs.String("site", "", "the site's name, for the report")
	if err := fs.parse(e, args); err != nil {
		return err
	}
	if fs.NArg() != 0 {
		return usagef("cowan: takes no arguments, only flags")
	}
	if *list {
		return results.WriteCowanTables(e.stdout)
	}
	if in.Base == "" {
		return usagef("cowan: --bed MATERIAL is required (see wetline cowan --list)")
	}
	var err error
	if in.Column, err = rating.ParseBaseColumn(column); err != nil {
		return usageError{err: err}
	}
	res, err := rating.Cowan(in)
	if errors.Is(err, rating.ErrCowanChoice) {
		return usageError{err: err}
	}
	if err != nil {
		return err
	}
	return results.WriteCowanText(e.stdout, in, res, rating.Provenance{Program: program(), Site: rating.Site{Name: *site}})
}
