package survey

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"

	"wetline/rating"
	"wetline/subdivide"
)

// Column names of a coordinate survey (x, y, z are accepted too).
const (
	ColEasting  = "easting"
	ColNorthing = "northing"
	// MarkLeftPin and MarkRightPin mark the end pins of the section line,
	// left and right looking downstream.
	MarkLeftPin  = "left pin"
	MarkRightPin = "right pin"
)

// Ways the left end of a coordinate survey was told apart from the right.
const (
	LeftFromPins    = "the end pins, marked left and right"
	LeftFromFlow    = "the flow direction given"
	LeftFromOrder   = "the order of the survey (its first point is the left end)"
	LeftFromBanks   = "the bank marks naming their sides (the survey's order has them on the other sides)"
	LeftFromLine    = "the line given (its first point is the left end)"
	LineFromPins    = "the line through the two end pins"
	LineGiven       = "the line given"
	LineFromPrinAx  = "the principal axis of the points (total least squares)"
	DefaultOffsetSI = 0.5 // m
	DefaultOffsetUS = 1.5 // ft
)

// CoordinateOptions say how a survey of eastings and northings is turned
// into stations. The zero value takes the line through the end pins, else
// the principal axis, and left from the pins, else from the survey order.
type CoordinateOptions struct {
	// Line, when Given, is the section line through (E1, N1) and (E2, N2)
	// (length unit), E1, N1 the left end, where stations count from; when
	// the pins or the flow direction put it on the right bank, stations
	// count from E2, N2 (Projection.LineTurned).
	Line  [4]float64
	Given bool
	// FlowAzimuth, when FlowGiven, is the direction the water flows, in
	// degrees clockwise from grid north; left is then the bank on the left
	// looking that way.
	FlowAzimuth float64
	FlowGiven   bool
	// OffsetTolerance is the distance off the line (length unit) above
	// which a point is warned about; zero means DefaultOffsetSI (or US when
	// Feet is set).
	OffsetTolerance float64
	Feet            bool
}

// Projection says how a coordinate survey became stations.
type Projection struct {
	// Line and Left name the methods used (the Line... and LeftFrom...
	// constants).
	Line, Left string
	// Origin is the left end (easting, northing) stations count from, and
	// Azimuth the direction of increasing station, degrees from north.
	OriginE, OriginN, Azimuth float64
	// Offsets holds each point's signed distance off the line (length
	// unit; positive downstream of it when the flow direction is known,
	// else to the right of increasing station).
	Offsets []float64
	// MaxOffset is the largest distance off the line; Tolerance the one
	// warned above.
	MaxOffset, Tolerance float64
	// Reversed reports a survey taken right to left, whose points were put
	// in station order.
	Reversed bool
	// Easting and Northing are the points' coordinates, in station order
	// as Offsets are.
	Easting, Northing []float64
	// PinsDisagree reports a flow direction given that puts the pin
	// marked left pin on the right bank.
	PinsDisagree bool
	// LineTurned reports a line given whose first point the pins or the
	// flow direction put on the right bank: stations count from its
	// second point, the left end.
	LineTurned bool
}

// Causes of a coordinate survey that cannot be projected, for errors.Is.
var (
	ErrFoldBack   = errors.New("the point folds back along the section line: stations must run one way")
	ErrPins       = errors.New("mark exactly one left pin and one right pin")
	ErrLineLength = errors.New("the section line has no length")
	ErrFlowAlong  = errors.New("the flow direction runs along the section line, so it cannot tell left from right")
	ErrBankSides  = errors.New("the two bank marks name the same side, so they cannot tell left from right")
	// ErrSidesDisagree: the end pins, the flow direction or the line
	// given set the left bank, and the bank marks naming a side all lie
	// the other way.
	ErrSidesDisagree = errors.New("the bank marks lie on the sides they do not name")
)

// hasCoordinates reports a header with an easting (or x) and a northing
// (or y) column, however many of their names it gives (the reader of the
// survey refuses two).
func hasCoordinates(t *Table) bool {
	return t.Column(ColEasting, "x") >= 0 && t.Column(ColNorthing, "y") >= 0
}

// coordinateColumns finds the easting and northing columns (or x, y);
// ok when both are there. A header naming one of them twice (easting and
// x) is an error (ErrAliasColumns): the two may be grid and local
// coordinates, and which were meant is not guessed.
func coordinateColumns(t *Table) (ce, cn int, ok bool, err error) {
	if ce, err = t.Optional(ColEasting, "x"); err != nil {
		return -1, -1, false, err
	}
	if cn, err = t.Optional(ColNorthing, "y"); err != nil {
		return -1, -1, false, err
	}
	return ce, cn, ce >= 0 && cn >= 0, nil
}

// projectPoints turns eastings and northings into stations along the
// section line. rows are the points' records, for positions; marks are
// the points' marks as written (pins, bank marks). It returns
// the stations in survey order (reversed order when Reversed) and the
// permutation applied.
func projectPoints(t *Table, rows []Record, e, n []float64, marks []string, opt CoordinateOptions) ([]float64, []int, Projection, error) {
	var pr Projection
	x0, y0, dx, dy, err := sectionLine(t, rows, e, n, marks, opt, &pr)
	if err != nil {
		return nil, nil, pr, err
	}
	if err := orient(t, rows, e, n, marks, opt, &dx, &dy, &pr); err != nil {
		return nil, nil, pr, err
	}
	if pr.Line == LineGiven && (opt.Line[2]-opt.Line[0])*dx+(opt.Line[3]-opt.Line[1])*dy < 0 {
		// The pins or the flow direction put the line's first point on
		// the right bank: its second point is the left end.
		x0, y0, pr.LineTurned = opt.Line[2], opt.Line[3], true
	}
	st := make([]float64, len(e))
	pr.Offsets = make([]float64, len(e))
	lo := math.Inf(1)
	for i := range e {
		u, v := e[i]-x0, n[i]-y0
		st[i] = u*dx + v*dy
		pr.Offsets[i] = u*dy - v*dx // to the right of increasing station
		lo = math.Min(lo, st[i])
		pr.MaxOffset = math.Max(pr.MaxOffset, math.Abs(pr.Offsets[i]))
	}
	if pr.Line == LineGiven {
		lo = 0 // stations count from the given left end
	}
	for i := range st {
		st[i] = st[i] - lo + 0 // + 0: a station of −0 is 0 (IEEE 754 sum)
	}
	pr.OriginE, pr.OriginN = x0+lo*dx, y0+lo*dy
	pr.Azimuth = math.Mod(math.Atan2(dx, dy)*180/math.Pi+360, 360)
	order, err := stationOrder(t, rows, st, &pr)
	return st, order, pr, err
}

// sectionLine returns a point of the line and its unit direction: the
// line given, through the pins, or the principal axis of the points.
func sectionLine(t *Table, rows []Record, e, n []float64, marks []string, opt CoordinateOptions, pr *Projection) (x0, y0, dx, dy float64, err error) {
	switch l, r, nl, nr := pins(marks); {
	case opt.Given:
		x0, y0 = opt.Line[0], opt.Line[1]
		dx, dy = opt.Line[2]-opt.Line[0], opt.Line[3]-opt.Line[1]
		pr.Line = LineGiven
	case nl == 1 && nr == 1:
		x0, y0 = e[l], n[l]
		dx, dy = e[r]-e[l], n[r]-n[l]
		pr.Line = LineFromPins
	case nl+nr > 0:
		i := r
		if nl > 0 {
			i = l
		}
		return 0, 0, 0, 0, t.At(rows[i], markColumnOr(t), fmt.Errorf("%w, found %d left and %d right", ErrPins, nl, nr))
	default:
		x0, y0, dx, dy = principalAxis(e, n)
		pr.Line = LineFromPrinAx
	}
	length := math.Hypot(dx, dy)
	if !(length > 0) {
		return 0, 0, 0, 0, &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrLineLength}
	}
	return x0, y0, dx / length, dy / length, nil
}

// pinMarks is the one list of the words read as an end pin's mark:
// MarkLeftPin and MarkRightPin first, then the forms field crews write
// (common practice): lpin (so l pin), lp, left end pin, and the right's
// alike. They are matched as bank marks are (see readPinMark); none is a
// bank word (BankWords), in either form.
func pinMarks() []bankMark {
	return []bankMark{
		{MarkLeftPin, leftBank}, {MarkRightPin, rightBank},
		{"lpin", leftBank}, {"left end pin", leftBank}, {"l end pin", leftBank},
		{"rpin", rightBank}, {"right end pin", rightBank}, {"r end pin", rightBank},
	}
}

// PinWords returns the words of the mark column read as the mark of an
// end pin, left or right looking downstream, MarkLeftPin and
// MarkRightPin first (a fresh slice). They are matched as BankWords are:
// in any case, with runs of spaces, hyphens and underscores alike and
// dots dropped, with their spaces or without them ("L.PIN", "l pin",
// "Left-Pin" and "left_end_pin" are pins).
func PinWords() []string {
	var out []string
	for _, p := range pinMarks() {
		out = append(out, p.word)
	}
	return out
}

// leftPinWords and rightPinWords are PinWords of the left pin and of the
// right pin.
func leftPinWords() []string  { return sidePinWords(leftBank) }
func rightPinWords() []string { return sidePinWords(rightBank) }

func sidePinWords(side bankSide) []string {
	var out []string
	for _, p := range pinMarks() {
		if p.side == side {
			out = append(out, p.word)
		}
	}
	return out
}

// readPinMark reports whether a mark is an end pin's (one of PinWords)
// and the side it names.
func readPinMark(mark string) (bankSide, bool) {
	w := bankWord(mark)
	compact := strings.ReplaceAll(w, " ", "")
	for _, p := range pinMarks() {
		if p.word == w || strings.ReplaceAll(p.word, " ", "") == compact {
			return p.side, true
		}
	}
	return eitherBank, false
}

// pinLike reports a mark that is not an end pin's (one of PinWords) but
// holds the word pin (L pin 2, pin left, LT pin), as a crew writes of
// an end pin.
func pinLike(mark string) bool {
	if _, ok := readPinMark(mark); ok {
		return false
	}
	words := strings.FieldsFunc(bankWord(mark), func(r rune) bool { return !('a' <= r && r <= 'z') })
	return slices.Contains(words, "pin") || slices.Contains(words, "lpin") || slices.Contains(words, "rpin")
}

// sideLike reports a short mark that is no pin word nor bank word but
// may be meant as the mark of one end of the line: its letters and digits
// (at most 6) begin with l or r and hold a p (LP1, R.P.2, LEP, RHP), as
// a crew abbreviates a left or right pin.
func sideLike(mark string) bool {
	if _, ok := readPinMark(mark); ok {
		return false
	}
	if _, ok := readBankMark(mark); ok {
		return false
	}
	var c []rune
	for _, r := range bankWord(mark) {
		switch {
		case 'a' <= r && r <= 'z', '0' <= r && r <= '9':
			c = append(c, r)
		case r != ' ':
			return false
		}
	}
	return len(c) >= 2 && len(c) <= 6 && (c[0] == 'l' || c[0] == 'r') && slices.Contains(c[1:], 'p')
}

// pinLikeWarnings warns, at its cell, of each mark of a coordinate
// survey that looks like an end pin's (see pinLike) but is not read as
// one, the section line being the principal axis of the points. When
// the left end is the first point surveyed (LeftFromOrder), a mark that
// may name an end's side (see sideLike) is warned of too, since the
// survey may then be mirrored.
func (r *sectionReader) pinLikeWarnings(pr Projection) {
	order := pr.Left == LeftFromOrder
	side := ""
	if order {
		side = fmt.Sprintf(", and the left end is the first point surveyed (row %d), so a survey begun on the right bank is mirrored", r.records[0].Row)
	}
	for i, m := range r.sv.Marks {
		if pinLike(m) || order && sideLike(m) {
			r.sv.Warnings = append(r.sv.Warnings, r.t.At(r.records[i], r.cm, fmt.Errorf(
				"not read as an end pin (the pin words are %s): the section line is the principal axis of the points%s; write one of them if the point is an end pin",
				strings.Join(PinWords(), ", "), side)).Error())
		}
	}
}

// pins finds the points marked as the left pin and the right pin (one of
// PinWords).
func pins(marks []string) (left, right, nl, nr int) {
	for i, m := range marks {
		switch side, ok := readPinMark(m); {
		case ok && side == leftBank:
			left, nl = i, nl+1
		case ok && side == rightBank:
			right, nr = i, nr+1
		}
	}
	return left, right, nl, nr
}

// principalAxis returns the centroid of the points and the direction of
// their greatest spread: the line of total least squares, the eigenvector
// of the largest eigenvalue of the points' covariance.
//
// References:
//
//	Golub, G.H., and Van Loan, C.F. (1980), An analysis of the total least
//	squares problem, SIAM J. Numer. Anal. 17(6), 883–893.
func principalAxis(e, n []float64) (x0, y0, dx, dy float64) {
	for i := range e {
		x0 += e[i]
		y0 += n[i]
	}
	x0 /= float64(len(e))
	y0 /= float64(len(e))
	var sxx, sxy, syy float64
	for i := range e {
		u, v := e[i]-x0, n[i]-y0
		sxx += u * u
		sxy += u * v
		syy += v * v
	}
	var eig mat.EigenSym
	if !eig.Factorize(mat.NewSymDense(2, []float64{sxx, sxy, sxy, syy}), true) {
		return x0, y0, 1, 0
	}
	var vec mat.Dense
	eig.VectorsTo(&vec)
	vals := eig.Values(nil)
	k := 1
	if vals[0] > vals[1] {
		k = 0
	}
	return x0, y0, vec.At(0, k), vec.At(1, k)
}

// orient turns the line's direction to run from left to right looking
// downstream, by the flow direction, the pins, or the survey order; in
// the survey order's case, a survey whose bank marks naming a side
// (ltob, rb, ...) all lie on the other side is turned by them (the crew
// shot it from the right end). Errors: ErrFlowAlong, ErrBankSides.
func orient(t *Table, rows []Record, e, n []float64, marks []string, opt CoordinateOptions, dx, dy *float64, pr *Projection) error {
	flip := func(ok bool) {
		if !ok {
			*dx, *dy = -*dx, -*dy
		}
	}
	l, r, nl, nr := pins(marks)
	switch {
	case opt.FlowGiven:
		th := opt.FlowAzimuth * math.Pi / 180
		// Right bank looking downstream: the flow direction turned a
		// quarter clockwise, (cos θ, −sin θ) in (east, north).
		rx, ry := math.Cos(th), -math.Sin(th)
		dot := *dx*rx + *dy*ry
		if math.Abs(dot) < flowAlongTolerance {
			return &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow, Err: ErrFlowAlong}
		}
		flip(dot > 0)
		pr.Left = LeftFromFlow
		if nl == 1 && nr == 1 && (e[r]-e[l])**dx+(n[r]-n[l])**dy < 0 {
			pr.PinsDisagree = true
		}
	case nl == 1 && nr == 1, opt.Given:
		if nl == 1 && nr == 1 {
			flip((e[r]-e[l])**dx+(n[r]-n[l])**dy > 0)
			pr.Left = LeftFromPins
		} else {
			pr.Left = LeftFromLine
		}
	default:
		last := len(e) - 1
		flip((e[last]-e[0])**dx+(n[last]-n[0])**dy > 0)
		pr.Left = LeftFromOrder
		turn, err := bankSidesTurn(t, rows, e, n, marks, *dx, *dy)
		if err != nil {
			return err
		}
		if turn {
			flip(false)
			pr.Left = LeftFromBanks
		}
	}
	return nil
}

// bankSidesTurn reports whether the survey's two bank marks, taken along
// the direction (dx, dy), both lie on the side other than the one they
// name, when at least one names a side: the lower one names right (rb,
// rtob, ...) or the higher one left, and neither names its own side. Two
// marks naming one side (ltob and lb) contradict each other whichever
// way the line runs: ErrBankSides at the second mark's row, naming both.
// With other than two bank marks it reports false (the reader of the
// banks reports their count).
func bankSidesTurn(t *Table, rows []Record, e, n []float64, marks []string, dx, dy float64) (bool, error) {
	var at []int
	for i, m := range marks {
		if _, ok := readBankMark(m); ok {
			at = append(at, i)
		}
	}
	if len(at) != 2 {
		return false, nil
	}
	a, b := at[0], at[1]
	if (e[b]-e[a])*dx+(n[b]-n[a])*dy < 0 {
		a, b = b, a // a is the one at the lower station
	}
	sa, _ := readBankMark(marks[a])
	sb, _ := readBankMark(marks[b])
	if sa != eitherBank && sa == sb {
		first, second := at[0], at[1]
		return false, t.At(rows[second], markColumnOr(t), fmt.Errorf("%w (%q at row %d, %q at row %d): correct one of them, or give the flow direction (--flow-azimuth)",
			ErrBankSides, echo(marks[first]), rows[first].Row, echo(marks[second]), rows[second].Row))
	}
	wrong := sa == rightBank || sb == leftBank
	right := sa == leftBank || sb == rightBank
	return wrong && !right, nil
}

// flowAlongTolerance is the cosine between the flow direction and the
// right bank's direction below which they are taken to be at right
// angles (the flow runs along the line: about 3°).
const flowAlongTolerance = 0.05

// stationOrder checks the stations run one way in survey order: rising,
// or falling (a survey taken right to left, whose order is then
// reversed). A point that folds back is an error at its row, naming the
// row of the point before it in survey order (either may be the one out
// of place).
func stationOrder(t *Table, rows []Record, st []float64, pr *Projection) ([]int, error) {
	order := make([]int, len(st))
	for i := range order {
		order[i] = i
	}
	if len(st) > 1 && st[len(st)-1] < st[0] {
		pr.Reversed = true
		for i := range order {
			order[i] = len(st) - 1 - i
		}
	}
	for k := 1; k < len(order); k++ {
		if st[order[k]] < st[order[k-1]] {
			ce, _, _, _ := coordinateColumns(t)
			return nil, t.At(rows[order[k]], ce, fmt.Errorf("%w (station %.3f after %.3f at row %d: one of the two is out of place)",
				ErrFoldBack, st[order[k]], st[order[k-1]], rows[order[k-1]].Row))
		}
	}
	return order, nil
}

// maxOffsetWarnings bounds how many points off the line are warned about
// one by one.
const maxOffsetWarnings = 10

// project turns the coordinate survey read into stations, puts its points
// in station order and records the projection.
func (r *sectionReader) project(opt CoordinateOptions) error {
	if len(r.east) < 2 {
		return nil // shape reports too few points
	}
	r.copt = opt
	st, order, pr, err := projectPoints(r.t, r.records, r.east, r.north, r.sv.Marks, opt)
	if err != nil {
		return err
	}
	zeroRoundOff(pr.Offsets, st)
	if pr.Line == LineFromPrinAx {
		r.pinLikeWarnings(pr)
	}
	pr.Tolerance = opt.OffsetTolerance
	if !(pr.Tolerance > 0) {
		pr.Tolerance = DefaultOffsetSI
		if opt.Feet || (r.sv.Units.Found && r.sv.Units.Units == rating.US) {
			pr.Tolerance = DefaultOffsetUS
		}
	}
	if pr.Reversed && r.cn >= 0 {
		if err := r.reverseN(); err != nil {
			return err
		}
	}
	// Put every per-point column in station order.
	n := len(order)
	sv := &r.sv
	pts, ns, rows, labels, notes, marks := make([]subdivide.Point, n), make([]float64, n), make([]int, n), make([]string, n), make([]string, n), make([]string, n)
	pr.Easting, pr.Northing = make([]float64, n), make([]float64, n)
	offsets, recs := make([]float64, n), make([]Record, n)
	where := make([]int, n) // where[i] is the new index of survey point i
	for k, i := range order {
		pts[k] = subdivide.Point{Station: st[i], Elevation: sv.Section.Points[i].Elevation}
		ns[k], rows[k], labels[k], notes[k], marks[k] = r.ns[i], sv.Rows[i], sv.Labels[i], sv.Notes[i], sv.Marks[i]
		pr.Easting[k], pr.Northing[k], offsets[k], recs[k] = r.east[i], r.north[i], pr.Offsets[i], r.records[i]
		where[i] = k
	}
	pr.Offsets = offsets
	sv.Section.Points, r.ns, sv.Rows, sv.Labels, sv.Notes, sv.Marks = pts, ns, rows, labels, notes, marks
	for j := range r.bankAt {
		r.bankAt[j] = where[r.bankAt[j]]
	}
	if len(r.bankAt) == 2 && r.bankAt[0] > r.bankAt[1] {
		r.bankAt[0], r.bankAt[1] = r.bankAt[1], r.bankAt[0]
		r.bankRows[0], r.bankRows[1] = r.bankRows[1], r.bankRows[0]
	}
	sv.Projection = pr
	r.offsetWarnings(recs, opt.Feet)
	return nil
}

// offsetRoundOff is the fraction of the line's length below which an
// offset is round-off of the projection, not a distance: points exactly on
// the line come out some 1e-16 of their coordinates off it.
const offsetRoundOff = 1e-9

// zeroRoundOff sets to 0 each offset smaller than offsetRoundOff of the
// line's length (the span of stations).
func zeroRoundOff(offsets, stations []float64) {
	if len(stations) == 0 {
		return
	}
	span := slices.Max(stations) - slices.Min(stations)
	for i, d := range offsets {
		if math.Abs(d) < offsetRoundOff*span {
			offsets[i] = 0
		}
	}
}

// reverseN turns the n column of a survey taken right to left into n of
// the segments in station order: n on a point applies to the ground from
// it to the next point surveyed, so the values are carried down the
// survey order first, then each segment's n is moved to its left point.
func (r *sectionReader) reverseN() error {
	m := len(r.ns)
	empty := true
	for _, v := range r.ns {
		empty = empty && math.IsNaN(v)
	}
	if empty || (r.nGiven && math.IsNaN(r.ns[0])) {
		return nil // roughness reports the empty column, or n comes from elsewhere
	}
	if math.IsNaN(r.ns[0]) {
		return r.t.At(r.records[0], r.cn, ErrFirstNBlank)
	}
	seg := make([]float64, m) // seg[i]: n of the segment from survey point i to i+1
	cur := r.ns[0]
	for i := 0; i < m-1; i++ {
		if !math.IsNaN(r.ns[i]) {
			cur = r.ns[i]
		}
		seg[i] = cur
	}
	// After reversal, survey point i is station point m−1−i and the
	// segment from survey point i to i+1 runs from station point m−2−i.
	// Stored in survey order, the n of station point k is seg[m−2−k], so
	// survey point i (k = m−1−i) takes seg[i−1].
	ns := make([]float64, m)
	ns[0] = math.NaN() // the last point surveyed starts no segment
	for i := 1; i < m; i++ {
		ns[i] = seg[i-1]
	}
	r.ns = ns
	return nil
}

// offsetWarnings states how the stations were made and warns of each
// point farther off the line than the tolerance (in feet when feet is
// asked for and the headers name no unit).
func (r *sectionReader) offsetWarnings(recs []Record, feet bool) {
	pr, t := r.sv.Projection, r.t
	unit := " " + lengthUnit(r.sv.Units, feet)
	far := 0
	var worst int
	for k, d := range pr.Offsets {
		if math.Abs(d) > math.Abs(pr.Offsets[worst]) {
			worst = k
		}
		if math.Abs(d) <= pr.Tolerance {
			continue
		}
		far++
		if far <= maxOffsetWarnings {
			r.sv.Warnings = append(r.sv.Warnings, t.At(recs[k], r.cx, fmt.Errorf(
				"the point lies %.3g%s off the section line, more than the tolerance %g%s: check it belongs to this section", math.Abs(d), unit, pr.Tolerance, unit)).Error())
		}
	}
	if far > maxOffsetWarnings {
		r.sv.Warnings = append(r.sv.Warnings, fmt.Sprintf("%s: %s %s off the section line by more than %g%s", where(t, t.HeaderRow), rating.Counted(far-maxOffsetWarnings, "more point", "more points"), rating.Agree(far-maxOffsetWarnings, "lies", "lie"), pr.Tolerance, unit))
	}
	if pr.LineTurned {
		r.sv.Warnings = append(r.sv.Warnings, fmt.Sprintf("%s: the line given starts on the right bank (left bank from %s): stations count from its second point, the left end; give the line from its left end",
			where(t, t.HeaderRow), pr.Left))
	}
	if pr.PinsDisagree {
		r.sv.Warnings = append(r.sv.Warnings, fmt.Sprintf("%s: the flow direction given puts the point marked %s on the right bank: the left bank was taken from the flow direction; check the pins' names and the azimuth",
			where(t, t.HeaderRow), MarkLeftPin))
	}
	r.sv.ProjectionNote = InputNote{At: where(t, t.HeaderRow), Text: fmt.Sprintf(
		"stations were projected from eastings and northings onto %s, left bank from %s; the farthest point lies %.3g%s off the line (row %d)%s",
		pr.Line, pr.Left, math.Abs(pr.Offsets[worst]), unit, r.sv.Rows[worst], reversedNote(pr.Reversed))}
}

// InputNote is a fact of an input a reviewer should see that is not a
// warning (how a coordinate survey's stations were made): where it
// holds (a file, sheet and row) and what it says.
type InputNote struct {
	At, Text string
}

// String is the note with its position: "xs.csv:1: stations were ...".
func (n InputNote) String() string {
	if n.Text == "" {
		return ""
	}
	return n.At + ": " + n.Text
}

func reversedNote(rev bool) string {
	if rev {
		return "; the survey ran right to left and was put in station order"
	}
	return ""
}

// ProjectionReport is a coordinate survey turned into stations, for a
// crew to check: the survey with its projection, the unit system, the
// warnings and the figures.
type ProjectionReport struct {
	Provenance rating.Provenance
	// Survey is the survey in station order; Survey.Projection says how.
	Survey Survey
	// Units is the unit system of the survey's lengths.
	Units rating.Units
	// Warnings are the survey's (each point far off the line). How it was
	// projected is not a warning: Provenance.Notes holds it
	// (Survey.ProjectionNote as a line with its position).
	Warnings []string
	// Figures are the pictures of the report (a plan of the points and the
	// line), drawn by the caller.
	Figures []rating.Figure
}

// ErrNotCoordinates is the cause of an error projecting a survey that
// already gives stations.
var ErrNotCoordinates = errors.New("the survey gives stations, not eastings and northings: there is nothing to project")

// Project reads the coordinate survey at path (sheet "" for the first
// of a workbook) and projects it onto its section line as opt says. The
// unit system is u's, which the survey's headers must not contradict when
// u.Given. Errors are those of ReadSection, ErrUnitsDisagree, and
// ErrNotCoordinates for a survey by station.
func Project(path, sheet string, opt CoordinateOptions, u UnitChoice) (ProjectionReport, error) {
	sv, err := ReadSection(path, sheet, SectionOptions{Coordinates: opt})
	if err != nil {
		return ProjectionReport{}, err
	}
	if sv.Projection.Line == "" {
		return ProjectionReport{}, fmt.Errorf("%s: %w", Position(path, sheet), ErrNotCoordinates)
	}
	units, err := sv.Units.Resolve(u.Units, u.Given)
	if err != nil {
		return ProjectionReport{}, err
	}
	return ProjectionReport{
		Provenance: rating.Provenance{Inputs: []string{Position(path, sheet)}, Site: sv.Site, Notes: sv.InputNotes()},
		Survey:     sv, Units: units, Warnings: append([]string(nil), sv.Warnings...),
	}, nil
}

// sidesDisagree returns the error of a coordinate survey whose left bank
// was set by the end pins, the flow direction or the line given, and
// whose bank marks naming a side all lie the other way (at rows a and b,
// a the one at the lower station, marks ma and mb): ErrSidesDisagree,
// naming what set the side (the pins' rows, the azimuth), the marks that
// disagree, and what to check first. It returns nil when the side came
// from the survey's order or its marks (bankSidesTurn turned it), or when
// the marks do not all lie the other way (bankSideError reports them).
func (r *sectionReader) sidesDisagree(a, b Record, ma, mb string) error {
	pr, t := r.sv.Projection, r.t
	sa, _ := readBankMark(ma)
	sb, _ := readBankMark(mb)
	if !(sa == rightBank || sb == leftBank) || sa == leftBank || sb == rightBank {
		return nil
	}
	var wrong []string
	if sa == rightBank {
		wrong = append(wrong, fmt.Sprintf("%q (row %d) on the left bank", echo(ma), a.Row))
	}
	if sb == leftBank {
		wrong = append(wrong, fmt.Sprintf("%q (row %d) on the right bank", echo(mb), b.Row))
	}
	puts := strings.Join(wrong, " and ") + " looking downstream"
	l, rt, nl, nr := pins(r.sv.Marks)
	pinsNamed := func() string {
		return fmt.Sprintf("%q (row %d) and %q (row %d)", echo(r.sv.Marks[l]), r.sv.Rows[l], echo(r.sv.Marks[rt]), r.sv.Rows[rt])
	}
	header := &ParseError{File: t.File, Sheet: t.Sheet, Row: t.HeaderRow}
	switch pr.Left {
	case LeftFromPins:
		at := header
		for _, rec := range t.Records {
			if rec.Row == r.sv.Rows[l] {
				at = t.At(rec, r.cm, nil)
				break
			}
		}
		at.Err = fmt.Errorf("%w: left was taken from the end pins, %s, which put %s; check the pins' labels, or else the bank marks",
			ErrSidesDisagree, pinsNamed(), puts)
		return at
	case LeftFromFlow:
		flow := fmt.Sprintf("the flow direction given (--flow-azimuth %g)", r.copt.FlowAzimuth)
		other := math.Mod(r.copt.FlowAzimuth+180, 360)
		advice := fmt.Sprintf("check the azimuth (the direction the water flows, clockwise from grid north; the marks agree with %g), or else the bank marks", other)
		switch {
		case pr.PinsDisagree:
			advice = fmt.Sprintf("the end pins, %s, agree with the marks: check the azimuth (the direction the water flows, clockwise from grid north; pins and marks agree with %g)", pinsNamed(), other)
		case nl == 1 && nr == 1:
			advice = fmt.Sprintf("the end pins, %s, agree with the azimuth: check the bank marks, or else the azimuth and the pins", pinsNamed())
		}
		header.Err = fmt.Errorf("%w: left was taken from %s, which puts %s; %s", ErrSidesDisagree, flow, puts, advice)
		return header
	case LeftFromLine:
		header.Err = fmt.Errorf("%w: left was taken from the line given (--line, its first point the left end), which puts %s; check the order of the line's two ends, or else the bank marks",
			ErrSidesDisagree, puts)
		return header
	}
	return nil
}
