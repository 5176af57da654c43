package plotting

import (
	"errors"
	"fmt"
	"image/color"
	"io"
	"math"
	"strconv"
	"strings"

	stdfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"wetline/rating"
)

// Default figure size: 1600×1000 pixels at 150 dots per inch, a figure
// about 27 cm wide in a printed report.
const (
	DefaultWidth  = 1600 // pixels
	DefaultHeight = 1000 // pixels
	DefaultDPI    = 150  // dots per inch
)

// Size bounds of a figure, checked by every drawing function.
const (
	MinPixels = 200    // smallest width or height, pixels
	MaxPixels = 10_000 // largest width or height, pixels
	MinDPI    = 50     // lowest resolution, dots per inch
	MaxDPI    = 1200   // highest resolution, dots per inch
)

// Size is the pixel size and resolution of a figure. The zero value (and
// any zero field) means the default: 1600×1000 px at 150 dpi. Text sizes
// are in points, so at a higher DPI the same pixel size holds less text.
type Size struct {
	Width, Height int // pixels, MinPixels to MaxPixels
	DPI           int // dots per inch, MinDPI to MaxDPI
}

// ErrSize is returned for a figure size outside the bounds above.
var ErrSize = errors.New("plotting: figure size out of range")

// ErrDraw wraps a failure inside the plotting library while drawing.
var ErrDraw = errors.New("plotting: drawing failed")

// ErrNoData is returned when a figure has nothing to draw.
var ErrNoData = errors.New("plotting: nothing to draw")

// ErrRange is returned for a panel whose axis would run to a value that
// is not finite, or over a span too wide for a float64 (values near
// ±1.8e308): such a range cannot be divided into ticks or scaled.
var ErrRange = errors.New("plotting: values span a range that cannot be drawn")

// Check reports a size outside the bounds (ErrSize), after filling in
// the defaults for zero fields.
func (s Size) Check() error {
	_, err := s.norm()
	return err
}

func (s Size) norm() (Size, error) {
	if s.Width == 0 {
		s.Width = DefaultWidth
	}
	if s.Height == 0 {
		s.Height = DefaultHeight
	}
	if s.DPI == 0 {
		s.DPI = DefaultDPI
	}
	if s.Width < MinPixels || s.Width > MaxPixels || s.Height < MinPixels || s.Height > MaxPixels ||
		s.DPI < MinDPI || s.DPI > MaxDPI {
		return s, fmt.Errorf("%w: %d×%d px at %d dpi (want %d to %d px and %d to %d dpi)",
			ErrSize, s.Width, s.Height, s.DPI, MinPixels, MaxPixels, MinDPI, MaxDPI)
	}
	return s, nil
}

// Result carries what a drawing function wants the reader to know.
type Result struct {
	// Warnings say what was left out of the figure and why.
	Warnings []string
	// Omitted counts points left out of a log panel because they lie at
	// or below the gauge height of zero flow or have no positive
	// discharge (rating figure only).
	Omitted int
}

// DefaultCaution is the line printed at the foot of a rating figure when
// the caller gives none: the project's caution in a form short enough
// for one line.
const DefaultCaution = "Caution: a computed rating is an estimate until discharge measurements confirm it; " +
	"agency standards and professional judgement govern its use."

// Colour scheme ("river slate"): dark ink for the ground and the hydraulic
// rating, a mid-tone copper for fitted curves, blues for water; lightness
// steps of at least about 20 % between series that may cross, so a
// greyscale print keeps them apart.
var (
	colInk       = color.NRGBA{R: 0x1e, G: 0x29, B: 0x33, A: 0xff} // near-black slate
	colMuted     = color.NRGBA{R: 0x5c, G: 0x67, B: 0x70, A: 0xff} // grey-blue for notes
	colGrid      = color.NRGBA{R: 0xdd, G: 0xe1, B: 0xe4, A: 0xff}
	colGround    = color.NRGBA{R: 0x4a, G: 0x3a, B: 0x2a, A: 0xff} // dark earth
	colEarth     = color.NRGBA{R: 0xc9, G: 0xb8, B: 0x96, A: 0x8c} // earth fill, translucent
	colWater     = color.NRGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff} // water surface
	colWaterFill = color.NRGBA{R: 0x5b, G: 0x9b, B: 0xd5, A: 0x6e} // wetted area
	colHydraulic = color.NRGBA{R: 0x12, G: 0x3f, B: 0x4f, A: 0xff} // deep teal, dark
	colFitted    = color.NRGBA{R: 0xc2, G: 0x5e, B: 0x1e, A: 0xff} // copper, mid
	colBand      = color.NRGBA{R: 0xe8, G: 0xa8, B: 0x70, A: 0x60} // light copper, translucent
	colBank      = color.NRGBA{R: 0x7a, G: 0x2e, B: 0x5a, A: 0xff} // plum for bank lines
	colDivider   = color.NRGBA{R: 0x8a, G: 0x93, B: 0x9a, A: 0xff}
	colOverbank  = color.NRGBA{R: 0xf2, G: 0xe6, B: 0xc8, A: 0x80} // above-bankfull zone
	colEnergy    = color.NRGBA{R: 0xb0, G: 0x3a, B: 0x2e, A: 0xff} // energy grade line
	colCaution   = color.NRGBA{R: 0x4a, G: 0x30, B: 0x20, A: 0xff} // the caution at the foot
)

// series is the look of one of several sections drawn together.
type series struct {
	color  color.NRGBA
	dashes []vg.Length
	glyph  draw.GlyphDrawer
}

// seriesStyles is a sequence of line styles for several sections drawn
// together: each differs from its neighbours in lightness and dashes.
var seriesStyles = []series{
	{colInk, nil, draw.CircleGlyph{}},
	{colFitted, []vg.Length{vg.Points(7), vg.Points(3)}, draw.SquareGlyph{}},
	{colWater, []vg.Length{vg.Points(2), vg.Points(2)}, draw.TriangleGlyph{}},
	{color.NRGBA{R: 0x8c, G: 0x9a, B: 0x3a, A: 0xff}, []vg.Length{vg.Points(9), vg.Points(3), vg.Points(2), vg.Points(3)}, draw.RingGlyph{}},
	{colBank, []vg.Length{vg.Points(4), vg.Points(4)}, draw.BoxGlyph{}},
	{colMuted, []vg.Length{vg.Points(12), vg.Points(4)}, draw.CrossGlyph{}},
}

// seriesStyle returns the look of the i-th (from 0) of several sections
// drawn together, distinct from every other for any count: the first
// len(seriesStyles) are those of the table; after them round
// k = i/len(seriesStyles) takes the table's colours again, each with a
// dash pattern of its own round (a long dash and k+1 dots, which no
// pattern of the table or of another round has) and a glyph moved on by
// k, so no two sections share colour and dashes.
func seriesStyle(i int) series {
	n := len(seriesStyles)
	i = max(i, 0)
	k := i / n
	base := seriesStyles[i%n]
	if k == 0 {
		return base
	}
	dashes := []vg.Length{vg.Points(10), vg.Points(3)}
	for range k + 1 {
		dashes = append(dashes, vg.Points(1.5), vg.Points(3))
	}
	return series{color: base.color, dashes: dashes, glyph: seriesStyles[(i+k)%n].glyph}
}

// Type sizes in points.
const (
	sizeTitle    = 16
	sizeSubtitle = 11
	sizePanel    = 12
	sizeLabel    = 11
	sizeTick     = 9.5
	sizeNote     = 9
	sizeCaution  = 8
	sizeMinNote  = 6
)

func sans(size float64) font.Font {
	return font.Font{Typeface: "Liberation", Variant: "Sans", Size: vg.Points(size)}
}

func sansBold(size float64) font.Font {
	f := sans(size)
	f.Weight = stdfont.WeightBold
	return f
}

func sansItalic(size float64) font.Font {
	f := sans(size)
	f.Style = stdfont.StyleItalic
	return f
}

func textStyle(f font.Font, c color.Color) text.Style {
	return text.Style{Color: c, Font: f, Handler: plot.DefaultTextHandler, XAlign: draw.XLeft, YAlign: draw.YBottom}
}

// newPanel returns a plot with the package's fonts and axes.
func newPanel(title, xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = sansBold(sizePanel)
	p.Title.TextStyle.Color = colInk
	p.Title.Padding = vg.Points(6)
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = sans(sizeLabel)
		ax.Label.TextStyle.Color = colInk
		ax.Tick.Label.Font = sans(sizeTick)
		ax.Tick.Label.Color = colInk
		ax.LineStyle.Color = colInk
		ax.Tick.LineStyle.Color = colInk
		ax.Padding = vg.Points(3)
	}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	p.Legend.TextStyle.Font = sans(sizeNote)
	p.Legend.TextStyle.Color = colInk
	p.Legend.ThumbnailWidth = vg.Points(26)
	p.Legend.Padding = vg.Points(2.5)
	return p
}

// addGrid adds light grid lines behind everything else.
func addGrid(p *plot.Plot) {
	g := plotter.NewGrid()
	g.Vertical.Color = colGrid
	g.Horizontal.Color = colGrid
	g.Vertical.Width = vg.Points(0.6)
	g.Horizontal.Width = vg.Points(0.6)
	p.Add(g)
}

// unitNames are the printed units of a unit system.
type unitNames struct{ length, area, discharge, velocity string }

func names(u rating.Units) unitNames {
	if u == rating.US {
		return unitNames{"ft", "ft²", "ft³/s", "ft/s"}
	}
	return unitNames{"m", "m²", "m³/s", "m/s"}
}

// figure is a page: a title block at the top, panels in the middle and an
// optional footnote at the foot.
type figure struct {
	title, subtitle string
	foot            []string // small lines at the foot, drawn in order
	footColor       color.Color
}

// render draws a figure of the given size into w. body draws the panels
// into the canvas left between the title block and the foot. Any panic
// in the plotting library is returned as ErrDraw.
func render(w io.Writer, size Size, fig figure, body func(c draw.Canvas) error) (err error) {
	size, err = size.norm()
	if err != nil {
		return err
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("%w: %v", ErrDraw, r)
		}
	}()
	wl := vg.Length(size.Width) * vg.Inch / vg.Length(size.DPI)
	hl := vg.Length(size.Height) * vg.Inch / vg.Length(size.DPI)
	img := vgimg.NewWith(vgimg.UseWH(wl, hl), vgimg.UseDPI(size.DPI), vgimg.UseBackgroundColor(color.White))
	dc := draw.New(img)
	margin := vg.Points(14)
	top := dc.Max.Y - margin
	left := dc.Min.X + margin
	if fig.title != "" {
		st := textStyle(sansBold(sizeTitle), colInk)
		st.YAlign = draw.YTop
		dc.FillText(st, vg.Point{X: left, Y: top}, fitLine(st, fig.title, dc.Max.X-dc.Min.X-2*margin))
		top -= st.Rectangle("Mg").Size().Y + vg.Points(4)
	}
	if fig.subtitle != "" {
		st := textStyle(sans(sizeSubtitle), colMuted)
		st.YAlign = draw.YTop
		dc.FillText(st, vg.Point{X: left, Y: top}, fitLine(st, fig.subtitle, dc.Max.X-dc.Min.X-2*margin))
		top -= st.Rectangle("Mg").Size().Y
	}
	top -= vg.Points(8)
	bottom := dc.Min.Y + margin*0.6
	fc := fig.footColor
	if fc == nil {
		fc = colMuted
	}
	for i := len(fig.foot) - 1; i >= 0; i-- {
		st := footStyle(fig.foot[i], dc.Max.X-dc.Min.X-2*margin, fc)
		dc.FillText(st, vg.Point{X: left, Y: bottom}, fig.foot[i])
		bottom += st.Rectangle("Mg").Size().Y + vg.Points(2)
	}
	if len(fig.foot) > 0 {
		bottom += vg.Points(6)
	}
	err = body(draw.Canvas{Canvas: dc.Canvas, Rectangle: vg.Rectangle{
		Min: vg.Point{X: dc.Min.X + margin*0.5, Y: bottom},
		Max: vg.Point{X: dc.Max.X - margin, Y: top},
	}})
	if err != nil {
		return err
	}
	return encodePNG(w, img.Image())
}

// footStyle picks the largest type from sizeCaution down to sizeMinNote
// at which line fits the width.
func footStyle(line string, width vg.Length, c color.Color) text.Style {
	for sz := float64(sizeCaution); ; sz -= 0.5 {
		st := textStyle(sansItalic(sz), c)
		if st.Width(line) <= width || sz <= sizeMinNote {
			return st
		}
	}
}

// fitLine shortens a line with an ellipsis until it fits the width.
func fitLine(st text.Style, line string, width vg.Length) string {
	if st.Width(line) <= width {
		return line
	}
	r := []rune(line)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if s := strings.TrimSpace(string(r)) + "…"; st.Width(s) <= width {
			return s
		}
	}
	return line
}

// titleOf joins a site and a section name for a figure title.
func titleOf(site, section, what string) string {
	var parts []string
	for _, s := range []string{site, section} {
		if s = strings.TrimSpace(s); s != "" {
			parts = append(parts, s)
		}
	}
	if len(parts) == 0 {
		return what
	}
	return strings.Join(parts, ", ") + " — " + what
}

// siteOrBase is the site a figure's title names, or when none is known
// the base name of its files (the input's name), as a fit's figure falls
// back to its gaugings' file: a figure printed alone still says what it
// shows.
func siteOrBase(site, base string) string {
	if strings.TrimSpace(site) == "" {
		return base
	}
	return site
}

// finite reports whether every value is a finite number.
func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// lineStyle returns a solid or dashed line style.
func lineStyle(c color.Color, width float64, dashes ...vg.Length) draw.LineStyle {
	return draw.LineStyle{Color: c, Width: vg.Points(width), Dashes: dashes}
}

// Magnitudes written without an exponent in labels.
const (
	plainMin = 1e-4
	plainMax = 1e7
)

// fmtNum formats a value for a label with up to 4 significant digits and
// no exponent for everyday magnitudes; a value that rounds to zero prints
// without a sign.
func fmtNum(v float64) string {
	if !finite(v) {
		return "–"
	}
	a := math.Abs(v)
	if a != 0 && (a < plainMin || a >= plainMax) {
		return fmt.Sprintf("%.3g", v)
	}
	s := fmt.Sprintf("%.4g", v)
	if strings.ContainsAny(s, "e") {
		return unsignedZero(fmt.Sprintf("%.0f", v))
	}
	return unsignedZero(s)
}

// fmtStage formats a stage or elevation with 2 decimals (3 for feet is
// not the trade's habit on figures; 2 suffice at figure scale); a value
// that rounds to zero prints without a sign.
func fmtStage(v float64) string { return unsignedZero(fmt.Sprintf("%.2f", v)) }

// fmtSigned formats a difference (a departure, a shift) with its sign and
// the given decimals, "+0.012" or "-0.004"; one that rounds to zero
// prints as "0.000", without a sign.
func fmtSigned(v float64, decimals int) string {
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if z := unsignedZero(s); z != s || strings.Trim(s, "0.") == "" {
		return z
	}
	if v > 0 {
		return "+" + s
	}
	return s
}

// unsignedZero drops the minus sign of a formatted number that shows only
// zeros ("-0.000", "-0"), which printing a small negative value or a
// negative zero gives.
func unsignedZero(s string) string {
	if rest, ok := strings.CutPrefix(s, "-"); ok && rest != "" && strings.Trim(rest, "0.") == "" {
		return rest
	}
	return s
}

// drawRow draws panels side by side in equal tiles, none when one of
// them cannot be drawn (drawable's error).
func drawRow(c draw.Canvas, panels []*plot.Plot, gap vg.Length) error {
	if err := drawable(panels...); err != nil {
		return err
	}
	tiles := draw.Tiles{Rows: 1, Cols: len(panels), PadX: gap}
	for i, p := range panels {
		p.Draw(tiles.At(c, i, 0))
	}
	return nil
}

// drawPanel draws p into c, or returns drawable's error without drawing.
func drawPanel(p *plot.Plot, c draw.Canvas) error {
	if err := drawable(p); err != nil {
		return err
	}
	p.Draw(c)
	return nil
}

// drawable checks the axes of panels before they are handed to the
// plotting library: each must run between finite values over a finite
// span, or its ticks and scale are not defined (ErrRange, naming the
// panel's title and the axis).
func drawable(panels ...*plot.Plot) error {
	for _, p := range panels {
		for _, a := range []struct {
			name     string
			min, max float64
		}{{"horizontal", p.X.Min, p.X.Max}, {"vertical", p.Y.Min, p.Y.Max}} {
			if !finite(a.min, a.max, a.max-a.min) {
				what := "a panel"
				if p.Title.Text != "" {
					what = p.Title.Text
				}
				return fmt.Errorf("%w: %s, %s axis from %g to %g", ErrRange, what, a.name, a.min, a.max)
			}
		}
	}
	return nil
}

// haloText draws text on a translucent white patch so it stays readable
// where it crosses lines or fills.
func haloText(c draw.Canvas, st text.Style, pt vg.Point, s string) {
	r := st.Rectangle(s).Add(pt)
	pad := vg.Points(1.5)
	var path vg.Path
	path.Move(vg.Point{X: r.Min.X - pad, Y: r.Min.Y - pad})
	path.Line(vg.Point{X: r.Max.X + pad, Y: r.Min.Y - pad})
	path.Line(vg.Point{X: r.Max.X + pad, Y: r.Max.Y + pad})
	path.Line(vg.Point{X: r.Min.X - pad, Y: r.Max.Y + pad})
	path.Close()
	c.SetColor(color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xc8})
	c.Fill(path)
	c.FillText(st, pt, s)
}
