package subdivide

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// ShapeKind names a built (prismatic) cross-section.
type ShapeKind string

// The built shapes.
const (
	Rectangle ShapeKind = "rectangle"
	Trapezoid ShapeKind = "trapezoid"
	Triangle  ShapeKind = "triangle"
	Circle    ShapeKind = "circle"
	// Compound is a two-stage trapezoid: a main channel with a floodplain
	// on each side at the channel's top, and outer banks above them.
	Compound ShapeKind = "compound"
)

// MaxShapeSize bounds every dimension and the invert of a built shape
// (length unit): larger numbers are typing slips, not channels.
const MaxShapeSize = 1e5

// ShapeForms lists the accepted spec forms, for error messages and help.
const ShapeForms = "rectangle:width=W | trapezoid:bottom=B,side=Z (or left=ZL,right=ZR, or angle=DEG) | " +
	"triangle:side=Z | circle:diameter=D | compound:bottom=B,side=Z,depth=H,floodplain=W[,outer=Z][,floodn=N]; " +
	"every kind takes invert=ELEV, open kinds height=H"

// Shape is a built cross-section: a lined channel, a culvert barrel or a
// pipe. Lengths are in the caller's unit; side slopes Z are horizontal per
// vertical (0 is a vertical wall). The zero value is not a shape; get one
// from ParseShape or fill the fields and call Validate.
//
// The invert (lowest point) is at elevation Invert, so with the default 0
// a stage is a depth. An open shape without Height goes on straight above
// its nominal top (see NominalHeight): stages above it are exact, never a
// vertical-wall extension. With Height given, the shape ends there and a
// higher stage is handled like a survey's (walls, or an error with
// Options.NoExtend).
type Shape struct {
	Kind ShapeKind
	// Bottom is the bottom width of a trapezoid or of a compound shape's
	// main channel, and the width of a rectangle.
	Bottom float64
	// Left and Right are the side slopes Z of the (main) channel's walls.
	Left, Right float64
	// Diameter is a circle's inside diameter.
	Diameter float64
	// Depth is the depth of a compound shape's main channel (invert to
	// floodplain); Floodplain the width of each floodplain; Outer the side
	// slope Z of the banks beyond the floodplains; FloodN the floodplains'
	// Manning's n (0: from the caller's n by region).
	Depth, Floodplain, Outer, FloodN float64
	// Invert is the elevation of the lowest point.
	Invert float64
	// Height is the height of an open shape above its invert; 0 means
	// open-ended (see the type's doc).
	Height float64
}

// ShapeError reports a bad shape spec: the key at fault (or "kind") and why.
// Its message lists the accepted forms.
type ShapeError struct {
	Spec string
	Key  string
	Err  error
}

func (e *ShapeError) Error() string {
	return fmt.Sprintf("shape %q: %s: %v (accepted: %s)", e.Spec, e.Key, e.Err, ShapeForms)
}

func (e *ShapeError) Unwrap() error { return e.Err }

// Shape spec causes, for errors.Is.
var (
	ErrShapeKind     = errors.New("unknown kind")
	ErrShapeKey      = errors.New("unknown key")
	ErrShapeMissing  = errors.New("missing")
	ErrShapeValue    = errors.New("not a finite number")
	ErrShapeSize     = errors.New("too large for a built section")
	ErrShapePositive = errors.New("must be positive")
	ErrShapeNegative = errors.New("must not be negative")
	ErrShapeRepeated = errors.New("given twice")
	ErrShapeAngle    = errors.New("must be above 0 and at most 90 degrees")
	ErrAboveCrown    = errors.New("stage is above the crown of a closed conduit")
)

// shapeKeys lists the keys each kind accepts.
var shapeKeys = map[ShapeKind][]string{
	Rectangle: {"width", "invert", "height"},
	Trapezoid: {"bottom", "side", "left", "right", "angle", "invert", "height"},
	Triangle:  {"side", "left", "right", "angle", "invert", "height"},
	Circle:    {"diameter", "invert"},
	Compound:  {"bottom", "side", "left", "right", "angle", "depth", "floodplain", "outer", "floodn", "invert", "height"},
}

// MaxShapeSpec bounds the length of a shape spec.
const MaxShapeSpec = 1000

// ParseShape reads a shape spec KIND:key=value,... (see ShapeForms). Kind
// and keys are case-insensitive, spaces around them are ignored. A side
// slope comes from side= (both sides), angle= (both sides, degrees above
// the horizontal: Z = 1/tan(angle)) or left=/right= (one side each, taking
// precedence). Errors are *ShapeError naming the key.
func ParseShape(spec string) (Shape, error) {
	bad := func(key string, err error) (Shape, error) {
		return Shape{}, &ShapeError{Spec: spec, Key: key, Err: err}
	}
	if len(spec) > MaxShapeSpec {
		return bad("spec", fmt.Errorf("longer than %d characters", MaxShapeSpec))
	}
	kindText, rest, _ := strings.Cut(spec, ":")
	s := Shape{Kind: ShapeKind(strings.ToLower(strings.TrimSpace(kindText)))}
	keys, ok := shapeKeys[s.Kind]
	if !ok {
		return bad("kind", fmt.Errorf("%w %q", ErrShapeKind, strings.TrimSpace(kindText)))
	}
	vals, key, err := shapeValues(rest, s.Kind, keys)
	if err != nil {
		return bad(key, err)
	}
	for _, set := range []func(shapeVals) (string, error){s.setSize, s.setSides, s.setFloodplain} {
		if key, err := set(vals); err != nil {
			return bad(key, err)
		}
	}
	if err := s.Validate(); err != nil {
		var se *ShapeError
		if errors.As(err, &se) {
			se.Spec = spec
		}
		return Shape{}, err
	}
	return s, nil
}

// shapeVals are the key=value pairs of a shape spec.
type shapeVals map[string]float64

func (v shapeVals) has(k string) bool { _, ok := v[k]; return ok }

// shapeValues reads the key=value list of a spec of the given kind, whose
// keys are keys. On error it returns the key at fault.
func shapeValues(list string, kind ShapeKind, keys []string) (shapeVals, string, error) {
	vals := shapeVals{}
	if strings.TrimSpace(list) == "" {
		return vals, "", nil
	}
	for _, kv := range strings.Split(list, ",") {
		k, v, found := strings.Cut(kv, "=")
		k = strings.ToLower(strings.TrimSpace(k))
		if !found {
			return nil, strconv.Quote(k), errors.New("want key=value")
		}
		if !contains(keys, k) {
			return nil, strconv.Quote(k), fmt.Errorf("%w for %s (keys: %s)", ErrShapeKey, kind, strings.Join(keys, ", "))
		}
		if vals.has(k) {
			return nil, k, ErrShapeRepeated
		}
		x, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
		if err != nil || !finite(x) {
			return nil, k, fmt.Errorf("%q is %w", strings.TrimSpace(v), ErrShapeValue)
		}
		vals[k] = x
	}
	return vals, "", nil
}

// setSize sets the invert, the height and the kind's main dimension.
func (s *Shape) setSize(vals shapeVals) (string, error) {
	s.Invert = vals["invert"]
	s.Height = vals["height"]
	if vals.has("height") && !(s.Height > 0) {
		return "height", ErrShapePositive
	}
	need := map[ShapeKind]string{Rectangle: "width", Trapezoid: "bottom", Compound: "bottom", Circle: "diameter"}[s.Kind]
	if need == "" {
		return "", nil
	}
	if !vals.has(need) {
		return need, ErrShapeMissing
	}
	if s.Kind == Circle {
		s.Diameter = vals[need]
	} else {
		s.Bottom = vals[need]
	}
	return "", nil
}

// setSides sets the side slopes of a trapezoid, triangle or compound
// shape: side= for both, angle= in degrees from the horizontal, or left=
// and right=, which override either.
func (s *Shape) setSides(vals shapeVals) (string, error) {
	if s.Kind != Trapezoid && s.Kind != Triangle && s.Kind != Compound {
		return "", nil
	}
	switch {
	case vals.has("side") && vals.has("angle"):
		return "angle", errors.New("give side= or angle=, not both")
	case vals.has("side"):
		s.Left, s.Right = vals["side"], vals["side"]
	case vals.has("angle"):
		a := vals["angle"]
		if !(a > 0 && a <= 90) {
			return "angle", ErrShapeAngle
		}
		z := 1 / math.Tan(a*math.Pi/180)
		if a == 90 {
			z = 0
		}
		s.Left, s.Right = z, z
	case !vals.has("left") || !vals.has("right"):
		key := "side"
		if vals.has("left") || vals.has("right") {
			key = map[bool]string{true: "right", false: "left"}[vals.has("left")]
		}
		return key, ErrShapeMissing
	}
	if vals.has("left") {
		s.Left = vals["left"]
	}
	if vals.has("right") {
		s.Right = vals["right"]
	}
	return "", nil
}

// setFloodplain sets the channel depth, floodplain width, outer slope and
// floodplain n of a compound shape.
func (s *Shape) setFloodplain(vals shapeVals) (string, error) {
	if s.Kind != Compound {
		return "", nil
	}
	for _, k := range []string{"depth", "floodplain"} {
		if !vals.has(k) {
			return k, ErrShapeMissing
		}
	}
	s.Depth, s.Floodplain = vals["depth"], vals["floodplain"]
	s.Outer = s.Left
	if vals.has("outer") {
		s.Outer = vals["outer"]
	}
	s.FloodN = vals["floodn"]
	if vals.has("floodn") && !(s.FloodN > 0) {
		return "floodn", ErrShapePositive
	}
	return "", nil
}

func contains(list []string, s string) bool {
	for _, v := range list {
		if v == s {
			return true
		}
	}
	return false
}

// Validate checks a shape's dimensions and returns a *ShapeError or nil.
func (s Shape) Validate() error {
	bad := func(key string, err error) error { return &ShapeError{Spec: s.String(), Key: key, Err: err} }
	if _, ok := shapeKeys[s.Kind]; !ok {
		return bad("kind", fmt.Errorf("%w %q", ErrShapeKind, s.Kind))
	}
	bottom := "bottom" // the key Bottom is given by
	if s.Kind == Rectangle {
		bottom = "width"
	}
	for _, f := range []struct {
		key string
		v   float64
	}{{"invert", s.Invert}, {"height", s.Height}, {bottom, s.Bottom}, {"left", s.Left}, {"right", s.Right},
		{"diameter", s.Diameter}, {"depth", s.Depth}, {"floodplain", s.Floodplain}, {"outer", s.Outer}, {"floodn", s.FloodN}} {
		if !finite(f.v) {
			return bad(f.key, ErrShapeValue)
		}
		if math.Abs(f.v) > MaxShapeSize {
			return bad(f.key, fmt.Errorf("%w: %g is beyond %g", ErrShapeSize, f.v, float64(MaxShapeSize)))
		}
	}
	if s.Height < 0 {
		return bad("height", ErrShapePositive)
	}
	switch s.Kind {
	case Rectangle:
		if !(s.Bottom > 0) {
			return bad("width", ErrShapePositive)
		}
	case Trapezoid, Compound:
		if !(s.Bottom > 0) {
			return bad("bottom", ErrShapePositive)
		}
	case Circle:
		if !(s.Diameter > 0) {
			return bad("diameter", ErrShapePositive)
		}
	}
	if s.Kind == Trapezoid || s.Kind == Triangle || s.Kind == Compound {
		if s.Left < 0 {
			return bad("left", ErrShapeNegative)
		}
		if s.Right < 0 {
			return bad("right", ErrShapeNegative)
		}
	}
	if s.Kind == Triangle && !(s.Left+s.Right > 0) {
		return bad("side", errors.New("a triangle needs at least one sloping side"))
	}
	if s.Kind == Compound {
		if !(s.Depth > 0) {
			return bad("depth", ErrShapePositive)
		}
		if !(s.Floodplain > 0) {
			return bad("floodplain", ErrShapePositive)
		}
		if s.Outer < 0 {
			return bad("outer", ErrShapeNegative)
		}
		if s.FloodN < 0 {
			return bad("floodn", ErrShapePositive)
		}
		if s.Height != 0 && !(s.Height > s.Depth) {
			return bad("height", errors.New("must exceed the main channel's depth"))
		}
	}
	return nil
}

// String writes the shape back as a spec that ParseShape reads to the
// same shape (side slopes as left= and right=).
func (s Shape) String() string {
	kv := map[string]float64{}
	switch s.Kind {
	case Rectangle:
		kv["width"] = s.Bottom
	case Trapezoid, Compound:
		kv["bottom"] = s.Bottom
	case Circle:
		kv["diameter"] = s.Diameter
	}
	if s.Kind == Trapezoid || s.Kind == Triangle || s.Kind == Compound {
		kv["left"], kv["right"] = s.Left, s.Right
	}
	if s.Kind == Compound {
		kv["depth"], kv["floodplain"], kv["outer"] = s.Depth, s.Floodplain, s.Outer
		if s.FloodN != 0 {
			kv["floodn"] = s.FloodN
		}
	}
	if s.Invert != 0 {
		kv["invert"] = s.Invert
	}
	if s.Height != 0 && s.Kind != Circle {
		kv["height"] = s.Height
	}
	order := shapeKeys[s.Kind]
	names := make([]string, 0, len(kv))
	for k := range kv {
		names = append(names, k)
	}
	sort.Slice(names, func(i, j int) bool { return index(order, names[i]) < index(order, names[j]) })
	var b strings.Builder
	b.WriteString(string(s.Kind))
	for i, k := range names {
		if i == 0 {
			b.WriteByte(':')
		} else {
			b.WriteByte(',')
		}
		b.WriteString(k + "=" + strconv.FormatFloat(kv[k], 'g', -1, 64))
	}
	return b.String()
}

func index(list []string, s string) int {
	for i, v := range list {
		if v == s {
			return i
		}
	}
	return len(list)
}

// Closed reports whether the shape is a closed conduit.
func (s Shape) Closed() bool { return s.Kind == Circle }

// NominalHeight is the height above the invert of an open shape's top when
// Height is not given, chosen so that a default rating range is useful:
// the bottom width for a rectangle or trapezoid, twice the main channel's
// depth for a compound shape, and one length unit for a triangle (which has
// no length of its own). For a circle it is the diameter.
func (s Shape) NominalHeight() float64 {
	if s.Height > 0 && s.Kind != Circle {
		return s.Height
	}
	switch s.Kind {
	case Circle:
		return s.Diameter
	case Compound:
		return 2 * s.Depth
	case Triangle:
		return 1
	}
	return s.Bottom
}

// Section returns an open shape as a ground line at its nominal height,
// with Manning's n per segment from n by region (the floodplains of a
// compound shape take FloodN when it is set) and, for a compound
// shape, the bank stations at the main channel's top corners. An n of 0
// leaves N nil. Stations start at 0 at the top of the left side. A circle
// has no ground-line form (its top is closed): ErrShapeKind.
func (s Shape) Section(n PerRegion) (Section, error) {
	if err := s.Validate(); err != nil {
		return Section{}, err
	}
	if s.Closed() {
		return Section{}, &ShapeError{Spec: s.String(), Key: "kind", Err: fmt.Errorf("%w: a closed conduit has no open ground line", ErrShapeKind)}
	}
	return s.sectionAt(s.NominalHeight(), n), nil
}

// sectionAt builds the ground line with sides reaching height h above the
// invert. The bottom-left corner keeps the station it has at the nominal
// height, so stations of the inner points never depend on h.
func (s Shape) sectionAt(h float64, n PerRegion) Section {
	h0 := s.NominalHeight()
	nc, nl, nr := n.Channel, n.Left, n.Right
	if s.FloodN > 0 {
		nl, nr = s.FloodN, s.FloodN
	}
	if nl == 0 {
		nl = nc
	}
	if nr == 0 {
		nr = nc
	}
	z0 := s.Invert
	var pts []Point
	var ns []float64
	sec := Section{Name: s.String()}
	switch s.Kind {
	case Rectangle:
		pts = []Point{{0, z0 + h}, {0, z0}, {s.Bottom, z0}, {s.Bottom, z0 + h}}
		ns = []float64{nc, nc, nc}
	case Trapezoid, Triangle:
		x0 := s.Left * h0 // station of the bottom-left corner
		xl, xr := x0-s.Left*h, x0+s.Bottom+s.Right*h
		pts = []Point{{xl, z0 + h}, {x0, z0}}
		ns = []float64{nc}
		if s.Bottom > 0 {
			pts = append(pts, Point{x0 + s.Bottom, z0})
			ns = append(ns, nc)
		}
		pts = append(pts, Point{xr, z0 + h})
		ns = append(ns, nc)
	case Compound:
		d, f := s.Depth, s.Floodplain
		up0 := h0 - d // height of the outer banks at the nominal height
		up := h - d
		bl := s.Outer*up0 + f + s.Left*d // station of the channel's bottom-left
		lb, rb := bl-s.Left*d, bl+s.Bottom+s.Right*d
		pts = []Point{
			{lb - f - s.Outer*up, z0 + h}, {lb - f, z0 + d}, {lb, z0 + d},
			{bl, z0}, {bl + s.Bottom, z0},
			{rb, z0 + d}, {rb + f, z0 + d}, {rb + f + s.Outer*up, z0 + h},
		}
		ns = []float64{nl, nl, nc, nc, nc, nr, nr}
		sec.HasBanks, sec.LeftBank, sec.RightBank = true, lb, rb
	}
	sec.Points = pts
	if nc > 0 {
		sec.N = ns
	}
	return sec
}

// Build returns the exact geometry of a shape with Manning's n by region
// (n.Channel for a shape without floodplains). A circle is a *Conduit;
// an open shape is a *Prism.
func (s Shape) Build(n PerRegion) (Geometry, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if s.Kind == Circle {
		return &Conduit{Diameter: s.Diameter, Invert: s.Invert, N: n.Channel, Label: s.String()}, nil
	}
	sec := s.sectionAt(s.NominalHeight(), n)
	p, err := Compile(sec)
	if err != nil {
		return nil, err
	}
	return &Prism{shape: s, n: n, nominal: p}, nil
}

// Prism is an open built shape. Up to its nominal top it is the ground
// line of Shape.Section; above it an open-ended shape's sides go on
// straight, so every stage is exact. Safe for concurrent use.
type Prism struct {
	shape   Shape
	n       PerRegion
	nominal *Profile
}

// Shape returns the shape the prism was built from.
func (p *Prism) Shape() Shape { return p.shape }

// Name returns the shape's spec.
func (p *Prism) Name() string { return p.nominal.Name() }

// Points returns the ground line at the nominal height.
func (p *Prism) Points() []Point { return p.nominal.Points() }

// Bottom returns the invert elevation.
func (p *Prism) Bottom() float64 { return p.nominal.Bottom() }

// Top returns the elevation of the (nominal) top.
func (p *Prism) Top() float64 { return p.nominal.Top() }

// Subsections returns the subsection layout at the nominal height.
func (p *Prism) Subsections() []Subsection { return p.nominal.Subsections() }

// At returns the exact wetted geometry at a stage.
func (p *Prism) At(stage float64, opt Options) (Wetted, error) {
	if p.shape.Height > 0 || !(stage > p.nominal.Top()) || !finite(stage) {
		return p.nominal.At(stage, opt)
	}
	q, err := Compile(p.shape.sectionAt(stage-p.shape.Invert, p.n))
	if err != nil {
		return Wetted{}, err
	}
	w, err := q.At(stage, opt)
	if err != nil {
		return w, err
	}
	// The outer stations move with the height; report the nominal layout.
	if subs := p.nominal.subs; len(subs) == len(w.Subs) {
		for i := range w.Subs {
			w.Subs[i].Subsection = subs[i]
		}
	}
	return w, nil
}
