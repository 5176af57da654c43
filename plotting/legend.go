package plotting

import (
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// Share of each axis's span, from a corner of the data area, that a legend
// is taken to cover when its corner is chosen (a few rows of text; a
// judgement, not a measurement).
const legendSpanX, legendSpanY = 0.4, 0.3

// legendCorner puts p's legend in the corner of the data area that holds
// the fewest of pts (those within legendSpanX and legendSpanY of the
// corner), so that it hides the fewest data; the corner p already has wins
// a tie, then top before bottom and right before left. Call it once the
// axes' ranges are set.
func legendCorner(p *plot.Plot, pts plotter.XYs) {
	xs, ys := p.X.Max-p.X.Min, p.Y.Max-p.Y.Min
	if !(xs > 0) || !(ys > 0) {
		return
	}
	count := func(top, left bool) int {
		n := 0
		for _, q := range pts {
			fx, fy := (q.X-p.X.Min)/xs, (q.Y-p.Y.Min)/ys
			if left {
				fx = 1 - fx
			}
			if !top {
				fy = 1 - fy
			}
			if fx >= 1-legendSpanX && fy >= 1-legendSpanY {
				n++
			}
		}
		return n
	}
	bestTop, bestLeft := p.Legend.Top, p.Legend.Left
	best := count(bestTop, bestLeft)
	for _, c := range [][2]bool{{true, false}, {true, true}, {false, false}, {false, true}} {
		if n := count(c[0], c[1]); n < best {
			best, bestTop, bestLeft = n, c[0], c[1]
		}
	}
	p.Legend.Top, p.Legend.Left = bestTop, bestLeft
	// Clear of the axes and the frame by a few points.
	p.Legend.XOffs, p.Legend.YOffs = -legendInset, -legendInset
	if bestLeft {
		p.Legend.XOffs = legendInset
	}
	if !bestTop {
		p.Legend.YOffs = legendInset
	}
}

// legendInset keeps a legend placed by legendCorner off the axes.
const legendInset = vg.Length(6)

// gaugingXYs returns the positions of gauging points.
func gaugingXYs(pts []gaugingPoint) plotter.XYs {
	out := make(plotter.XYs, 0, len(pts))
	for _, g := range pts {
		out = append(out, plotter.XY{X: g.x, Y: g.y})
	}
	return out
}
