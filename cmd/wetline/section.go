package main

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/spf13/pflag"

	"wetline/rating"
	"wetline/subdivide"
	"wetline/survey"
)

// sectionFlags are the flags shared by every command that reads one section.
type sectionFlags struct {
	sheet     string
	n         string
	banks     string
	units     string
	connected bool
	noExtend  bool
	shape     string // a built shape spec instead of a survey file
	composite string // composite roughness method
}

func (sf *sectionFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&sf.sheet, "sheet", "", "workbook sheet holding the survey (default: the first sheet)")
	fs.StringVar(&sf.n, "n", "", "Manning's n for the whole section, or LEFT,CHANNEL,RIGHT by region (overrides the survey's n column)")
	fs.StringVar(&sf.banks, "banks", "", "bank stations LEFT,RIGHT bounding the main channel (overrides bank marks)")
	fs.StringVar(&sf.units, "units", "si", "unit system of all input and output: si (m, m3/s) or us (ft, ft3/s)")
	fs.BoolVar(&sf.connected, "connected", false, "count only the wetted reach holding the main channel, not pockets behind higher ground")
	fs.BoolVar(&sf.noExtend, "no-extend", false, "make a stage above an end of the section an error instead of extending the end with a vertical wall")
	sf.registerShape(fs)
}

// loaded is a section ready for hydraulics.
type loaded struct {
	geom     subdivide.Geometry
	survey   survey.Survey // empty for built shapes
	units    rating.Units
	geomOpt  subdivide.Options
	inputs   []string // files read, never to be written over
	warnings []string
	source   string          // the survey path or the shape spec, for messages
	shape    subdivide.Shape // the built shape, when one was given

	// section is the section as compiled, after the flag overrides.
	section subdivide.Section
}

// load reads the survey at path and applies the flag overrides.
func (sf *sectionFlags) load(path string) (*loaded, error) {
	u, err := rating.ParseUnits(sf.units)
	if err != nil {
		return nil, usageError{err}
	}
	l := &loaded{units: u, inputs: []string{path}, source: path,
		geomOpt: subdivide.Options{Connected: sf.connected, NoExtend: sf.noExtend}}
	if sf.shape != "" || path == "" {
		return sf.loadShape(l, path)
	}
	sv, err := survey.ReadSection(path, sf.sheet, survey.SectionOptions{IgnoreBankMarks: sf.banks != ""})
	if err != nil {
		return nil, err
	}
	l.survey = sv
	l.warnings = append(l.warnings, sv.Warnings...)
	sec := sv.Section
	if sf.banks != "" {
		v, err := parseFloats(sf.banks, "--banks")
		if err != nil {
			return nil, err
		}
		if len(v) != 2 {
			return nil, usagef("--banks wants two stations LEFT,RIGHT, got %q", sf.banks)
		}
		sec.HasBanks, sec.LeftBank, sec.RightBank = true, v[0], v[1]
	}
	if sf.n != "" {
		v, err := parseFloats(sf.n, "--n")
		if err != nil {
			return nil, err
		}
		for _, n := range v {
			if !(n > 0) {
				return nil, usagef("--n %q: Manning's n must be positive", sf.n)
			}
		}
		switch len(v) {
		case 1:
			sec.NByRegion = subdivide.UniformN(v[0])
		case 3:
			if !sec.HasBanks {
				return nil, fmt.Errorf("%s: --n LEFT,CHANNEL,RIGHT needs bank stations (mark two points bank or give --banks)", path)
			}
			sec.NByRegion.Left = v[0]
			sec.NByRegion.Channel = v[1]
			sec.NByRegion.Right = v[2]
		default:
			return nil, usagef("--n wants one value or three (LEFT,CHANNEL,RIGHT), got %q", sf.n)
		}
	}
	if sec.N == nil && sf.n == "" {
		return nil, fmt.Errorf("%s: the survey has no n column: give Manning's n with --n", path)
	}
	p, err := subdivide.Compile(sec)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	l.section = sec
	return sf.finish(l, p)
}

// parseFloats reads a comma-separated list of numbers from a flag value.
func parseFloats(s, flag string) ([]float64, error) {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		v, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || v != v {
			return nil, usagef("%s %q: %q is not a number", flag, s, f)
		}
		out = append(out, v)
	}
	return out, nil
}
