package figure

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// XY is a plot of lines of marked points against any abscissa, with a
// legend: for example one answer of a parameter sweep against one
// parameter, a line per value of a second parameter. Values of very small
// or very large magnitude are plotted in units of a power of ten, given
// beside the axis label (x) or above the axis (y).
type XY struct {
	Title  string
	XLabel string // the abscissa and its units, e.g. "wavemaker.injection_rate (m² s⁻³)"
	YLabel string // the ordinate and its units, e.g. "eddy projection (day⁻¹)"
	Lines  []Line // a line may have a single point
	// LogX draws the abscissa on a logarithmic scale; its values must then
	// be positive.
	LogX bool
}

func (p *XY) check() error {
	if len(p.Lines) == 0 {
		return fmt.Errorf("figure: XY.Lines: no line")
	}
	for k, l := range p.Lines {
		name := fmt.Sprintf("XY.Lines[%d]", k)
		if len(l.X) != len(l.Y) {
			return fmt.Errorf("figure: %s: %d X values but %d Y values", name, len(l.X), len(l.Y))
		}
		if len(l.X) == 0 {
			return fmt.Errorf("figure: %s: no point", name)
		}
		for i := range l.X {
			x, y := l.X[i], l.Y[i]
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("figure: %s.X[%d] = %g is not finite", name, i, x)
			}
			if math.IsNaN(y) || math.IsInf(y, 0) {
				return fmt.Errorf("figure: %s.Y[%d] = %g is not finite", name, i, y)
			}
			if p.LogX && x <= 0 {
				return fmt.Errorf("figure: %s.X[%d] = %g: a logarithmic axis needs positive values", name, i, x)
			}
		}
	}
	return nil
}

// Draw renders the plot.
func (p *XY) Draw(s Size) (*image.RGBA, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if err := p.check(); err != nil {
		return nil, err
	}
	var xs, ys []float64
	for _, l := range p.Lines {
		xs = append(xs, l.X...)
		ys = append(ys, l.Y...)
	}
	// powers of ten factored out of the values' magnitudes
	scale := func(v []float64) int {
		e := palette.MinMaxRange(v)
		return decade(math.Max(math.Abs(e.Lo), math.Abs(e.Hi)))
	}
	ex, ey := 0, scale(ys)
	if !p.LogX {
		ex = scale(xs)
	}
	fx, fy := math.Pow(10, -float64(ex)), math.Pow(10, -float64(ey))
	lines := slices.Clone(p.Lines)
	for k := range lines {
		x, y := make([]float64, len(lines[k].X)), make([]float64, len(lines[k].Y))
		for i := range x {
			x[i], y[i] = lines[k].X[i]*fx, lines[k].Y[i]*fy
		}
		lines[k].X, lines[k].Y = x, y
	}
	xlabel := p.XLabel
	if ex != 0 {
		xlabel += " (×" + tenTo(ex) + ")"
	}

	c := newCanvas(s)
	area := c.drawTitle(c.dc, p.Title)
	pl := c.newPlot("", xlabel, p.YLabel)
	if p.LogX {
		pl.X.Scale = plot.LogScale{}
		pl.X.Tick.Marker = logTicks{}
	}
	pl.Add(lightGrid())
	var keys []keyEntry
	for k, l := range lines {
		col := lineColour(l, k)
		st := lineStyle(col, 1.4, l.Dashed)
		xy := make(plotter.XYs, len(l.X))
		for i := range l.X {
			xy[i] = plotter.XY{X: l.X[i], Y: l.Y[i]}
		}
		if len(xy) > 1 {
			ln, err := plotter.NewLine(xy)
			if err != nil {
				return nil, fmt.Errorf("figure: line %d: %w", k, err)
			}
			ln.LineStyle = st
			pl.Add(ln)
		}
		sc, err := plotter.NewScatter(xy)
		if err != nil {
			return nil, fmt.Errorf("figure: line %d: %w", k, err)
		}
		sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
		pl.Add(sc)
		if l.Label != "" {
			keys = append(keys, keyEntry{line: &st, text: l.Label})
		}
	}
	padRange(&pl.Y)
	if !p.LogX {
		padRange(&pl.X)
	} else {
		pl.X.Min /= 1.15
		pl.X.Max *= 1.15
	}
	if pl.Y.Min < 0 && pl.Y.Max > 0 {
		pl.Add(hline{0, draw.LineStyle{Color: color.Gray{Y: 90}, Width: vg.Points(0.7)}})
	}
	pl.Add(frame{})
	if ey != 0 {
		pl.Add(corner{"×" + tenTo(ey), c.tick})
	}
	c.drawWithLegend(pl, area, keys)
	return c.img, nil
}
