package figure

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// polylines is a plotter drawing lines given in data coordinates.
type polylines struct {
	lines [][]palette.Point
	style draw.LineStyle
}

func (l polylines) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for _, line := range l.lines {
		pts := make([]vg.Point, len(line))
		for i, q := range line {
			pts[i] = vg.Point{X: trX(q.X), Y: trY(q.Y)}
		}
		c.StrokeLines(l.style, c.ClipLinesXY(pts)...)
	}
}

// frame is a plotter drawing the outline of the data area.
type frame struct{}

func (frame) Plot(c draw.Canvas, _ *plot.Plot) {
	r := c.Rectangle
	c.StrokeLines(frameStyle(), []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
}

// contourLines returns the contours of f at the given levels as polylines
// in km.
func contourLines(f Field, levels []float64) [][]palette.Point {
	var out [][]palette.Point
	var segs []palette.Segment
	for _, lv := range levels {
		segs, _ = palette.Contour(segs[:0], f.grid(), lv, !f.Bounded)
		for _, line := range palette.Chain(segs) {
			for i, q := range line {
				line[i] = palette.Point{X: f.kmX(q.X), Y: f.kmY(q.Y)}
			}
			out = append(out, line)
		}
	}
	return out
}

// lineStyle returns a line style of the given colour (nil: black), width in
// points (0: 1) and dashing.
func lineStyle(c color.Color, width float64, dashed bool) draw.LineStyle {
	if c == nil {
		c = color.Black
	}
	if width <= 0 {
		width = 1
	}
	st := draw.LineStyle{Color: c, Width: vg.Points(width)}
	if dashed {
		st.Dashes = []vg.Length{vg.Points(4), vg.Points(2.5)}
	}
	return st
}

func hypot(x, y float64) float64 { return math.Hypot(x, y) }
