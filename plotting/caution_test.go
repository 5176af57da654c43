package plotting

import (
	"bytes"
	"image/png"
	"math"
	"testing"

	"wetline/rating"
	"wetline/subdivide"
)

// Thresholds of the caution check: a pixel is the caution's colour when
// every channel is within cautionChannelTol of colCaution (the ground's
// dark earth differs by 10 in two channels), and a drawn caution line
// leaves at least minCautionPixels such pixels in the bottom
// cautionStrip of the figure, where the last foot line is drawn.
const (
	cautionChannelTol = 3
	minCautionPixels  = 50
	cautionStrip      = 0.04
)

// TestRatingFiguresCarryCaution draws the three figures of a rating table
// (an invented V-shaped section, 10 m wide and 2 m deep, its table from
// the closed forms A = 2.5 h², T = 5 h, P = 2 h √7.25) and checks that
// each has the caution line at its foot, in the caution's colour.
func TestRatingFiguresCarryCaution(t *testing.T) {
	sec := subdivide.Section{Name: "vee", Points: []subdivide.Point{{Station: 0, Elevation: 2}, {Station: 5, Elevation: 0}, {Station: 10, Elevation: 2}},
		N: []float64{0.035, 0.035}}
	tab := rating.Table{Name: "vee", Slope: 0.001, Bottom: 0, Top: 2}
	for _, h := range []float64{0, 0.5, 1, 1.5, 2} {
		a, tw, p := 2.5*h*h, 5*h, 2*h*math.Sqrt(7.25)
		r := math.NaN()
		if p > 0 {
			r = a / p
		}
		k := a * math.Pow(r, 2.0/3) / 0.035
		if h == 0 {
			k = 0
		}
		tab.Rows = append(tab.Rows, rating.Row{Stage: h, Depth: h, Area: a, TopWidth: tw, WettedPerimeter: p, HydraulicRadius: r,
			Conveyance: k, Discharge: k * math.Sqrt(0.001), Alpha: 1, MeanVelocity: math.Sqrt(0.001) * k / a})
	}
	figs, _, err := DrawRating(RatingFigures{Base: "vee", Table: tab, Ground: rating.Ground{Section: sec}, ZeroFlow: math.NaN()})
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"vee-rating.png", "vee-section.png", "vee-properties.png"} {
		t.Run(name, func(t *testing.T) {
			var fig *rating.Figure
			for i := range figs {
				if figs[i].Name == name {
					fig = &figs[i]
				}
			}
			if fig == nil {
				t.Fatalf("not drawn")
			}
			img, err := png.Decode(bytes.NewReader(fig.PNG))
			if err != nil {
				t.Fatal(err)
			}
			b := img.Bounds()
			near := func(v uint32, want uint8) bool { return math.Abs(float64(v>>8)-float64(want)) <= cautionChannelTol }
			count := 0
			for y := b.Max.Y - int(cautionStrip*float64(b.Dy())); y < b.Max.Y; y++ {
				for x := b.Min.X; x < b.Max.X; x++ {
					r, g, bl, _ := img.At(x, y).RGBA()
					if near(r, colCaution.R) && near(g, colCaution.G) && near(bl, colCaution.B) {
						count++
					}
				}
			}
			if count < minCautionPixels {
				t.Errorf("%d pixels of the caution's colour at the foot, want at least %d", count, minCautionPixels)
			}
		})
	}
}
