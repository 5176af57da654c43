package main

import (
	"errors"
	"fmt"
	"math"

	"wetline/rating"
	"wetline/rating/gauged"
	"wetline/subdivide"
	"wetline/survey"
)

// sectionFlags are the flags shared by every command that reads one section.
type sectionFlags struct {
	sheet     string
	n         numbers
	banks     numbers
	units     string
	allPools  bool
	noExtend  bool
	shape     string // a built shape spec instead of a survey file
	composite string // composite roughness method
	coords    coordFlags
	site      string
	fs        *flagSet
}

// coordFlags say how a coordinate survey becomes stations.
type coordFlags struct {
	line      numbers
	azimuth   float64
	tolerance float64
}

// register adds the flags; line is false for commands reading several
// sections (one line cannot fit them all).
func (cf *coordFlags) register(fs *flagSet, line bool) {
	if line {
		fs.Var(&cf.line, "line", "coordinate surveys: the section line E1,N1,E2,N2 from its left end (one starting on the right bank is reversed, warned; default: through the points marked left pin and right pin, else the principal axis of the points)")
	}
	fs.Float64Var(&cf.azimuth, "flow-azimuth", math.NaN(), "coordinate surveys: the direction the water flows, degrees clockwise from grid north, which tells the left bank (default: the pins, else the first point surveyed is the left end)")
	fs.Float64Var(&cf.tolerance, "offset-tolerance", 0, "coordinate surveys: warn of points farther off the section line than this (default 0.5 m, 1.5 ft)")
}

// options checks the flags and returns the coordinate options.
func (cf *coordFlags) options(fs *flagSet, u survey.UnitChoice) (survey.CoordinateOptions, error) {
	opt := survey.CoordinateOptions{Feet: u.Given && u.Units == rating.US}
	if err := fs.positive("offset-tolerance"); err != nil {
		return opt, err
	}
	if err := fs.within(survey.MaxCoordinate, "offset-tolerance"); err != nil {
		return opt, err
	}
	opt.OffsetTolerance = cf.tolerance
	if fs.Changed("flow-azimuth") {
		if !(cf.azimuth >= -360 && cf.azimuth <= 360) {
			return opt, usagef("%s: --flow-azimuth %g: want degrees from -360 to 360", fs.Name(), cf.azimuth)
		}
		opt.FlowAzimuth, opt.FlowGiven = cf.azimuth, true
	}
	if fs.Changed("line") {
		if len(cf.line) != 4 {
			return opt, usagef("%s: --line: want four numbers E1,N1,E2,N2, got %d", fs.Name(), len(cf.line))
		}
		for _, v := range cf.line {
			if math.Abs(v) > survey.MaxCoordinate {
				return opt, usagef("%s: --line: %g is beyond ±%g: not a plausible coordinate", fs.Name(), v, float64(survey.MaxCoordinate))
			}
		}
		if cf.line[0] == cf.line[2] && cf.line[1] == cf.line[3] {
			return opt, usagef("%s: --line: the two ends are the same point", fs.Name())
		}
		opt.Given = true
		copy(opt.Line[:], cf.line)
	}
	return opt, nil
}

func (sf *sectionFlags) register(fs *flagSet) {
	sf.fs = fs
	fs.StringVar(&sf.sheet, "sheet", "", "workbook sheet holding the survey (default: the first visible sheet)")
	fs.Var(&sf.n, "n", "Manning's n for the whole section, or LEFT,CHANNEL,RIGHT by region (overrides the survey's n column)")
	fs.Var(&sf.banks, "banks", "bank stations LEFT,RIGHT bounding the main channel (overrides bank marks)")
	fs.StringVar(&sf.units, "units", "si", unitsUsage)
	fs.BoolVar(&sf.allPools, "all-pools", false, "count water standing in pockets behind higher ground as flowing (default: only the water connected to the main channel)")
	connectedFlag(fs)
	fs.BoolVar(&sf.noExtend, "no-extend", false, "make a stage above an end of the section an error instead of extending the end with a vertical wall, which is warned of")
	fs.StringVar(&sf.shape, "shape", "", "a built section instead of a survey: "+subdivide.ShapeForms)
	fs.StringVar(&sf.composite, "composite", "split", "roughness where a region's ground has several n: split (a subsection per n; a vertical wall's perimeter joins the subsection it faces, Horton–Einstein n), horton, pavlovskii or lotter")
	sf.coords.register(fs, true)
	fs.StringVar(&sf.site, "site", "", siteUsage)
}

// siteUsage is the help of --site.
const siteUsage = "the site's name for the report and the figure titles (default: the site key of the input)"

// siteWith returns what is known of a site with its name replaced by
// name, when given (--site).
func siteWith(s rating.Site, name string) rating.Site {
	if name != "" {
		s.Name = name
	}
	return s
}

// geometry returns the wetting options of the flags.
func (sf *sectionFlags) geometry() subdivide.Options {
	return subdivide.Options{AllPools: sf.allPools, NoExtend: sf.noExtend}
}

// unitsUsage is the help of --units.
const unitsUsage = "unit system of all input and output: si (m, m3/s) or us (ft, ft3/s); default: the units written in the input's headers, else si"

// unitSystem reads --units, and whether it was given.
func (sf *sectionFlags) unitSystem() (survey.UnitChoice, error) {
	return unitChoice(sf.units, sf.fs != nil && sf.fs.Changed("units"))
}

// unitChoice reads a --units value.
func unitChoice(text string, given bool) (survey.UnitChoice, error) {
	u, err := rating.ParseUnits(text)
	if err != nil {
		return survey.UnitChoice{}, usageError{err: err}
	}
	return survey.UnitChoice{Units: u, Given: given}, nil
}

// request turns the flags into a section request for the survey at path
// ("" with --shape).
func (sf *sectionFlags) request(path string) (survey.SectionRequest, error) {
	u, err := sf.unitSystem()
	if err != nil {
		return survey.SectionRequest{}, err
	}
	c, err := rating.ParseComposite(sf.composite)
	if err != nil {
		return survey.SectionRequest{}, usageError{err: err}
	}
	if sf.fs != nil {
		if err := sf.fs.within(survey.MaxCoordinate, "banks", "line"); err != nil {
			return survey.SectionRequest{}, err
		}
	}
	co, err := sf.coords.options(sf.fs, u)
	if err != nil {
		return survey.SectionRequest{}, err
	}
	req := survey.SectionRequest{Path: path, Sheet: sf.sheet, Shape: sf.shape, Composite: c, Units: u.Units, UnitsGiven: u.Given, Coordinates: co}
	if len(sf.n) > 0 {
		req.N = sf.n
	}
	if len(sf.banks) > 0 {
		req.Banks = sf.banks
	}
	return req, nil
}

// prepare reads the survey at path (or builds --shape) with the flags'
// overrides. A request the flags got wrong is a usage error.
func (sf *sectionFlags) prepare(path string) (*survey.Prepared, error) {
	req, err := sf.request(path)
	if err != nil {
		return nil, err
	}
	p, err := survey.Prepare(req)
	return p, sf.requestError(err)
}

// prepareIn is prepare for a section read with other inputs, in the
// units decided by them (see unitsDecided.prepareWith).
func (sf *sectionFlags) prepareIn(path string, d *unitsDecided) (*survey.Prepared, error) {
	req, err := sf.request(path)
	if err != nil {
		return nil, err
	}
	p, err := d.prepareWith(req)
	return p, sf.requestError(err)
}

// requestError makes an error in what the flags asked of a survey a
// usage error naming the command; other errors pass unchanged.
func (sf *sectionFlags) requestError(err error) error {
	if !errors.Is(err, survey.ErrRequest) {
		return err
	}
	if sf.fs != nil {
		err = fmt.Errorf("%s: %w", sf.fs.Name(), err)
	}
	return usageError{err: err}
}

// failed words an error from computing on a prepared section: a stage
// above a conduit's crown is a usage error.
func failed(p *survey.Prepared, err error) error {
	err = fmt.Errorf("%s: %w", p.Source(), err)
	if errors.Is(err, subdivide.ErrAboveCrown) {
		return usageError{err: err}
	}
	return err
}

// calibrateFlags let a command scale the survey's n so that its hydraulic
// rating honours a file of gaugings.
type calibrateFlags struct {
	gaugings    string
	sheet       string
	datum       float64
	channelOnly bool
}

func (c *calibrateFlags) register(fs *flagSet) {
	fs.StringVar(&c.gaugings, "calibrate", "", "gaugings file: scale n by the factor that best fits them (least squares in ln Q); its standard error and the scatter go to the warnings and JSON calibration, not the CSV; a factor putting n outside 0.005 to 1 is refused")
	fs.StringVar(&c.sheet, "gaugings-sheet", "", "workbook sheet of the gaugings (default: a sheet named gaugings, else the first)")
	fs.Float64Var(&c.datum, "datum", 0, "elevation of the gauge's zero in the survey's datum: stages (and gaugings) are then gauge heights, elevation = gauge height + DATUM")
	fs.notGiven("datum")
	fs.input("calibrate")
	fs.BoolVar(&c.channelOnly, "channel-only", false, "with --calibrate: scale only the main channel's n")
}

// apply calibrates n on the gaugings, when asked, and replaces the
// prepared geometry by the scaled one; the factor and the datum are stated
// among the warnings so that every report carries them. It returns the
// calibration for the report (nil when not asked).
func (c *calibrateFlags) apply(fs *flagSet, p *survey.Prepared, opt rating.Options) (*rating.NCalibration, error) {
	if err := fs.needs("--calibrate GAUGINGS", c.gaugings != "", "gaugings-sheet", "channel-only"); err != nil {
		return nil, err
	}
	if c.gaugings == "" {
		return nil, nil
	}
	gs, err := survey.ReadGaugings(c.gaugings, c.sheet)
	if err != nil {
		return nil, err
	}
	d := sectionUnits(fs, p)
	if err := d.take(gs.Units, c.gaugings); err != nil {
		return nil, err
	}
	gs.Warnings = append(gs.Warnings, gs.SpanWarnings(d.Units)...)
	curve := rating.HydraulicCurve{Geometry: p.Geometry, Datum: c.datum, Options: opt}
	g, cal, notes, err := gauged.CalibratedGeometry(gs.Gaugings, curve, c.channelOnly, c.gaugings, gauged.NRange{Min: survey.MinN, Max: survey.MaxN})
	if err != nil {
		return nil, fmt.Errorf("%s: %w", c.gaugings, err)
	}
	p.Inputs = append(p.Inputs, c.gaugings)
	p.Warnings = append(append(p.Warnings, gs.Warnings...), notes...)
	p.Geometry = g
	return cal, nil
}

// sectionUnits is the unit system of a prepared section as other inputs
// read with it must take it: set by --units, the survey's headers, or the
// default (si) when neither said (see unitsDecided.take).
func sectionUnits(fs *flagSet, p *survey.Prepared) *unitsDecided {
	d := &unitsDecided{UnitChoice: survey.UnitChoice{Units: p.Units, Given: true}}
	switch {
	case fs.Changed("units"):
		d.by, d.fixed = "--units", true
	case p.Built:
		d.by, d.fixed = "default, for the built shape", true
	default:
		d.src = survey.UnitSource{File: p.Source(), Note: p.Survey.Units}
		d.by = "the headers of " + p.Source()
	}
	return d
}

// prepareWith reads the section of req in the units decided, which its
// headers must agree with (see unitsDecided.take); a built shape takes
// them.
func (d *unitsDecided) prepareWith(req survey.SectionRequest) (*survey.Prepared, error) {
	req.Units, req.UnitsGiven = d.Units, d.fixed || (d.Given && req.Shape != "")
	p, err := survey.Prepare(req)
	if err != nil {
		return nil, err
	}
	if !p.Built {
		if err := d.take(p.Survey.Units, p.Source()); err != nil {
			return nil, err
		}
		p.Units = d.Units
	}
	return p, nil
}

// connectedFlag keeps the flag --connected of earlier versions, whose
// behaviour is now the default, as a hidden flag that changes nothing.
func connectedFlag(fs *flagSet) {
	fs.Bool("connected", false, "count only the water connected to the main channel (now the default)")
	fs.MarkHidden("connected")
}
