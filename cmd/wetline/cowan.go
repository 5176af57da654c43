package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"wetline/rating"
)

const cowanUsage = "cowan [--floodplain] --bed MATERIAL [--irregularity K] [--variation K] [--obstruction K] [--vegetation K] [--meander K] | cowan --list"

// runCowan turns a field crew's description of a reach into Manning's n
// by Cowan's method.
func runCowan(ctx context.Context, e *env, args []string) error {
	fs := newFlags("cowan", cowanUsage)
	var in rating.CowanInput
	fs.BoolVar(&in.Floodplain, "floodplain", false, "describe a flood plain (adjustments of table 3) instead of a channel (table 2)")
	fs.StringVar(&in.Base, "bed", "", "bed material for the base value nb (see --list)")
	fs.StringVar(&in.Irregularity, "irregularity", "", "n1, degree of irregularity (default: the smoothest)")
	fs.StringVar(&in.Variation, "variation", "", "n2, variation of the channel's cross section (default: gradual)")
	fs.StringVar(&in.Obstruction, "obstruction", "", "n3, effect of obstructions (default: negligible)")
	fs.StringVar(&in.Vegetation, "vegetation", "", "n4, amount of vegetation (default: none)")
	fs.StringVar(&in.Meander, "meander", "", "m, degree of meandering (default: minor)")
	list := fs.Bool("list", false, "print the tables and their choices")
	if err := parseFlags(fs, e, args); err != nil {
		return err
	}
	if fs.NArg() != 0 {
		return usagef("cowan: takes no arguments, only flags")
	}
	if *list {
		writeCowanTables(e.stdout)
		return nil
	}
	if in.Base == "" {
		return usagef("cowan: --bed MATERIAL is required (see wetline cowan --list)")
	}
	res, err := rating.Cowan(in)
	if errors.Is(err, rating.ErrCowanChoice) {
		return usageError{err}
	}
	if err != nil {
		return err
	}
	where := "channel"
	if in.Floodplain {
		where = "flood plain"
	}
	fmt.Fprintf(e.stdout, "Manning's n by Cowan's method for a %s, n = (nb + n1 + n2 + n3 + n4)·m:\n", where)
	for _, t := range res.Terms {
		v := fmt.Sprintf("%.3f", t.Choice.Lo)
		if t.Choice.Hi != t.Choice.Lo {
			v += fmt.Sprintf("-%.3f", t.Choice.Hi)
		}
		fmt.Fprintf(e.stdout, "  %-3s %-12s %-36s %s\n", t.Factor.Symbol, v, t.Factor.Name, t.Choice.Description)
	}
	fmt.Fprintf(e.stdout, "n = %.3f (range %.3f to %.3f, from the low and high ends of every term)\n", res.N, res.Lo, res.Hi)
	fmt.Fprintf(e.stdout, "values: %s; %s; check them against the paper\n", res.Terms[0].Factor.Table, res.Terms[1].Factor.Table)
	fmt.Fprintln(e.stdout, "caution: "+rating.Caution)
	return nil
}

func writeCowanTables(w io.Writer) {
	for _, group := range []struct {
		title   string
		factors []rating.CowanFactor
	}{
		{"base values (--bed)", []rating.CowanFactor{rating.CowanBase}},
		{"channel adjustments", rating.CowanChannel},
		{"flood-plain adjustments (--floodplain)", rating.CowanFloodplain},
	} {
		fmt.Fprintf(w, "%s — %s\n", group.title, group.factors[0].Table)
		for _, f := range group.factors {
			if len(group.factors) > 1 {
				fmt.Fprintf(w, "  %s, %s:\n", f.Symbol, f.Name)
			}
			for _, c := range f.Choices {
				v := fmt.Sprintf("%.3f", c.Lo)
				if c.Hi != c.Lo {
					v += fmt.Sprintf("-%.3f", c.Hi)
				}
				fmt.Fprintf(w, "    %-14s %-12s %s\n", c.Key, v, c.Description)
			}
		}
	}
}
