package plotting

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math/rand/v2"
	"testing"
)

// TestEncodePNG checks the paletted encoding against the image it was
// given, decoded back with the standard library's PNG decoder: an image
// of at most 256 colours is stored exactly; in one of more, the 256 most
// frequent colours are exact and every other pixel is its nearest kept
// colour (the definition of the nearest-colour mapping, checked by a
// brute-force search over the palette).
func TestEncodePNG(t *testing.T) {
	rng := rand.New(rand.NewPCG(10, 2026))
	for _, tc := range []struct {
		name    string
		colours int
	}{
		{"one colour", 1},
		{"256 colours", 256},
		{"700 colours", 700},
	} {
		t.Run(tc.name, func(t *testing.T) {
			img := image.NewRGBA(image.Rect(0, 0, 90, 60))
			// Colour i is used by more pixels than colour i+1, so the
			// kept colours are the first 256.
			var colours []color.RGBA
			for range tc.colours {
				colours = append(colours, color.RGBA{uint8(rng.IntN(256)), uint8(rng.IntN(256)), uint8(rng.IntN(256)), 255})
			}
			n := img.Bounds().Dx() * img.Bounds().Dy()
			for p := range n {
				// Pixel p takes colour floor(c·(p/n)²): a decreasing share.
				f := float64(p) / float64(n)
				i := min(int(float64(tc.colours)*f*f), tc.colours-1)
				img.SetRGBA(p%90, p/90, colours[i])
			}
			var buf bytes.Buffer
			if err := encodePNG(&buf, img); err != nil {
				t.Fatal(err)
			}
			got, err := png.Decode(&buf)
			if err != nil {
				t.Fatal(err)
			}
			pi, ok := got.(*image.Paletted)
			if !ok {
				t.Fatalf("decoded a %T, want *image.Paletted", got)
			}
			pal := pi.Palette
			for y := range 60 {
				for x := range 90 {
					want := img.RGBAAt(x, y)
					have := color.RGBAModel.Convert(pi.At(x, y)).(color.RGBA)
					if tc.colours <= 256 || contains(pal, want) {
						if have != want {
							t.Fatalf("pixel (%d,%d) = %v, want %v exactly", x, y, have, want)
						}
						continue
					}
					if d, best := dist(have, want), dist(nearest(pal, want), want); d != best {
						t.Fatalf("pixel (%d,%d) = %v at distance %d from %v, the nearest kept colour is at %d", x, y, have, d, want, best)
					}
				}
			}
		})
	}
}

func contains(pal color.Palette, c color.RGBA) bool {
	for _, p := range pal {
		if color.RGBAModel.Convert(p).(color.RGBA) == c {
			return true
		}
	}
	return false
}

func dist(a, b color.RGBA) int {
	d := func(x, y uint8) int { return (int(x) - int(y)) * (int(x) - int(y)) }
	return d(a.R, b.R) + d(a.G, b.G) + d(a.B, b.B) + d(a.A, b.A)
}

func nearest(pal color.Palette, c color.RGBA) color.RGBA {
	best := color.RGBAModel.Convert(pal[0]).(color.RGBA)
	for _, p := range pal[1:] {
		q := color.RGBAModel.Convert(p).(color.RGBA)
		if dist(q, c) < dist(best, c) {
			best = q
		}
	}
	return best
}
