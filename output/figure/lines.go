package figure

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// Line is one line of a line plot.
type Line struct {
	Label  string // for the legend; empty: not listed
	X, Y   []float64
	Color  color.Color // nil: the next of palette.Distinct's colours
	Dashed bool
}

// Spectra is a log–log plot of several spectra against wavenumber (or any
// positive abscissa) with a legend. Points with Y ≤ 0 are left out (a
// truncated spectrum is zero beyond its cutoff).
type Spectra struct {
	Title  string
	XLabel string // e.g. "total wavenumber K (rad m⁻¹)"
	YLabel string // e.g. "kinetic energy density (m³ s⁻²)"
	Lines  []Line
}

// Series is a plot of several time series against days, with a legend and a
// zero line when the values change sign.
type Series struct {
	Title  string
	YLabel string // the quantity and its units, e.g. "energy rate (m² s⁻³)"
	Lines  []Line // X in days
}

func checkLines(owner string, lines []Line, logXY bool) error {
	if len(lines) == 0 {
		return fmt.Errorf("figure: %s.Lines: no line", owner)
	}
	for k, l := range lines {
		name := fmt.Sprintf("%s.Lines[%d]", owner, k)
		if len(l.X) != len(l.Y) {
			return fmt.Errorf("figure: %s: %d X values but %d Y values", name, len(l.X), len(l.Y))
		}
		if len(l.X) < 2 {
			return fmt.Errorf("figure: %s: %d points, need at least 2", name, len(l.X))
		}
		pos := 0
		for i := range l.X {
			x, y := l.X[i], l.Y[i]
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("figure: %s.X[%d] = %g is not finite", name, i, x)
			}
			if math.IsNaN(y) || math.IsInf(y, 0) {
				return fmt.Errorf("figure: %s.Y[%d] = %g is not finite", name, i, y)
			}
			if logXY && x <= 0 {
				return fmt.Errorf("figure: %s.X[%d] = %g: a logarithmic axis needs positive values", name, i, x)
			}
			if y > 0 {
				pos++
			}
		}
		if logXY && pos < 2 {
			return fmt.Errorf("figure: %s: %d positive Y values, a logarithmic axis needs at least 2", name, pos)
		}
	}
	return nil
}

// lineColour returns the colour of line k.
func lineColour(l Line, k int) color.Color {
	if l.Color != nil {
		return l.Color
	}
	return palette.Distinct(k)
}

// addLines adds the lines to p and returns their legend entries.
func addLines(p *plot.Plot, lines []Line, positiveOnly bool) ([]keyEntry, error) {
	var keys []keyEntry
	for k, l := range lines {
		st := lineStyle(lineColour(l, k), 1.4, l.Dashed)
		xy := make(plotter.XYs, 0, len(l.X))
		for i := range l.X {
			if positiveOnly && l.Y[i] <= 0 {
				continue
			}
			xy = append(xy, plotter.XY{X: l.X[i], Y: l.Y[i]})
		}
		pl, err := plotter.NewLine(xy)
		if err != nil {
			return nil, fmt.Errorf("figure: line %d: %w", k, err)
		}
		pl.LineStyle = st
		p.Add(pl)
		if l.Label != "" {
			keys = append(keys, keyEntry{line: &st, text: l.Label})
		}
	}
	return keys, nil
}

// lightGrid returns a grid of thin light lines at the major ticks.
func lightGrid() *plotter.Grid {
	g := plotter.NewGrid()
	g.Vertical = draw.LineStyle{Color: color.Gray{Y: 225}, Width: vg.Points(0.5)}
	g.Horizontal = g.Vertical
	return g
}

// drawWithLegend draws p in area with the legend entries listed to the
// right of its data area, top-aligned.
func (c *canvas) drawWithLegend(p *plot.Plot, area draw.Canvas, keys []keyEntry) {
	var lw vg.Length
	for _, k := range keys {
		lw = max(lw, c.entryWidth(k))
	}
	if lw > 0 {
		lw += vg.Points(14)
	}
	plotArea := draw.Crop(area, 0, -lw, 0, 0)
	p.Draw(plotArea)
	da := p.DataCanvas(plotArea)
	y := da.Max.Y - c.keyRowHeight()/2
	for _, k := range keys {
		c.drawEntry(area, k, da.Max.X+vg.Points(12), y)
		y -= c.keyRowHeight()
	}
}

// Draw renders the spectra.
func (sp *Spectra) Draw(s Size) (*image.RGBA, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if err := checkLines("Spectra", sp.Lines, true); err != nil {
		return nil, err
	}
	c := newCanvas(s)
	area := c.drawTitle(c.dc, sp.Title)
	p := c.newPlot("", sp.XLabel, sp.YLabel)
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Tick.Marker, p.Y.Tick.Marker = logTicks{}, logTicks{}
	p.Add(lightGrid())
	keys, err := addLines(p, sp.Lines, true)
	if err != nil {
		return nil, err
	}
	p.Add(frame{})
	c.drawWithLegend(p, area, keys)
	return c.img, nil
}

// Draw renders the time series.
func (se *Series) Draw(s Size) (*image.RGBA, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if err := checkLines("Series", se.Lines, false); err != nil {
		return nil, err
	}
	c := newCanvas(s)
	area := c.drawTitle(c.dc, se.Title)
	p := c.newPlot("", "day", se.YLabel)
	p.Add(lightGrid())
	// Values of very small or large magnitude are plotted in units of a
	// power of ten, shown above the axis.
	var all []float64
	for _, l := range se.Lines {
		all = append(all, l.Y...)
	}
	ext := palette.MinMaxRange(all)
	exp := decade(math.Max(math.Abs(ext.Lo), math.Abs(ext.Hi)))
	lines := se.Lines
	if exp != 0 {
		f := math.Pow(10, -float64(exp))
		lines = slices.Clone(lines)
		for k := range lines {
			y := make([]float64, len(lines[k].Y))
			for i, v := range lines[k].Y {
				y[i] = v * f
			}
			lines[k].Y = y
		}
	}
	keys, err := addLines(p, lines, false)
	if err != nil {
		return nil, err
	}
	padRange(&p.Y)
	if p.Y.Min < 0 && p.Y.Max > 0 {
		p.Add(hline{0, draw.LineStyle{Color: color.Gray{Y: 90}, Width: vg.Points(0.7)}})
	}
	p.Add(frame{})
	if exp != 0 {
		p.Add(corner{"×" + tenTo(exp), c.tick})
	}
	c.drawWithLegend(p, area, keys)
	return c.img, nil
}

// padRange widens an axis range by 4 % on each side, so that lines do not
// run along the frame.
func padRange(a *plot.Axis) {
	pad := 0.04 * (a.Max - a.Min)
	if pad == 0 {
		pad = 0.5 * math.Max(math.Abs(a.Min), 1)
	}
	a.Min -= pad
	a.Max += pad
}

// corner is a plotter writing a note just above the top-left corner of the
// data area (the power of ten the values are given in).
type corner struct {
	text  string
	style text.Style
}

func (k corner) Plot(c draw.Canvas, _ *plot.Plot) {
	st := k.style
	st.XAlign, st.YAlign = draw.XLeft, draw.YBottom
	c.FillText(st, vg.Point{X: c.Min.X, Y: c.Max.Y + vg.Points(3)}, k.text)
}

// hline is a plotter drawing a horizontal line across the data area.
type hline struct {
	y     float64
	style draw.LineStyle
}

func (h hline) Plot(c draw.Canvas, p *plot.Plot) {
	_, trY := p.Transforms(&c)
	y := trY(h.y)
	c.StrokeLine2(h.style, c.Min.X, y, c.Max.X, y)
}

// logTicks labels the powers of ten of a logarithmic axis as 10ⁿ, with
// minor ticks at 2…9 times them; on a range of less than two decades the
// ticks at 2 and 5 times a power of ten are labelled too.
type logTicks struct{}

func (logTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(lo > 0 && hi > lo) {
		return nil
	}
	n0, n1 := int(math.Floor(math.Log10(lo))), int(math.Ceil(math.Log10(hi)))
	labelMinor := math.Log10(hi/lo) < 2
	var ticks []plot.Tick
	for n := n0; n <= n1; n++ {
		p := math.Pow(10, float64(n))
		for m := 1; m <= 9; m++ {
			v := float64(m) * p
			if v < lo*(1-1e-12) || v > hi*(1+1e-12) {
				continue
			}
			t := plot.Tick{Value: v}
			switch {
			case m == 1:
				t.Label = tenTo(n)
			case labelMinor && (m == 2 || m == 5):
				t.Label = fmt.Sprintf("%d×%s", m, tenTo(n))
			}
			ticks = append(ticks, t)
		}
	}
	return ticks
}

// Distribution is a time series against days with its histogram beside it
// on the same value axis (for the block index): the series with its mean
// (dashed) and mean ± one standard deviation (dotted), and the histogram as
// a probability density.
type Distribution struct {
	Title  string
	Label  string // the quantity and its units, e.g. "block index"
	Days   []float64
	Values []float64
	// Bins is the number of histogram bins; 0 picks it by the
	// Freedman–Diaconis rule (Sturges' rule when the quartiles coincide).
	Bins int
}

func (d *Distribution) check() error {
	if len(d.Days) != len(d.Values) {
		return fmt.Errorf("figure: Distribution: %d days but %d values", len(d.Days), len(d.Values))
	}
	if len(d.Values) < 2 {
		return fmt.Errorf("figure: Distribution.Values: %d values, need at least 2", len(d.Values))
	}
	for i := range d.Days {
		if x := d.Days[i]; math.IsNaN(x) || math.IsInf(x, 0) {
			return fmt.Errorf("figure: Distribution.Days[%d] = %g is not finite", i, x)
		}
		if y := d.Values[i]; math.IsNaN(y) || math.IsInf(y, 0) {
			return fmt.Errorf("figure: Distribution.Values[%d] = %g is not finite", i, y)
		}
	}
	if d.Bins < 0 || d.Bins > 1000 {
		return fmt.Errorf("figure: Distribution.Bins: %d must be in [1, 1000], or 0 for automatic", d.Bins)
	}
	return nil
}

// histogram returns the bin edges over [lo, hi] and the probability density
// in each bin.
func histogram(v []float64, lo, hi float64, bins int) (edges, dens []float64) {
	w := (hi - lo) / float64(bins)
	edges = make([]float64, bins+1)
	for k := range edges {
		edges[k] = lo + float64(k)*w
	}
	dens = make([]float64, bins)
	for _, x := range v {
		k := min(bins-1, max(0, int((x-lo)/w)))
		dens[k]++
	}
	for k := range dens {
		dens[k] /= float64(len(v)) * w
	}
	return edges, dens
}

// autoBins picks the number of bins: Freedman & Diaconis (1981), width
// 2·IQR·n^(−1/3), or Sturges (1926), ⌈log₂ n⌉ + 1, when the interquartile
// range is zero; kept within [5, 60].
func autoBins(v []float64) int {
	s := slices.Clone(v)
	slices.Sort(s)
	q := func(p float64) float64 {
		pos := p * float64(len(s)-1)
		i := int(pos)
		if i >= len(s)-1 {
			return s[len(s)-1]
		}
		return s[i] + (pos-float64(i))*(s[i+1]-s[i])
	}
	n := float64(len(s))
	iqr := q(0.75) - q(0.25)
	k := int(math.Ceil(math.Log2(n))) + 1
	if iqr > 0 {
		k = int(math.Ceil((s[len(s)-1] - s[0]) / (2 * iqr * math.Pow(n, -1.0/3))))
	}
	return max(5, min(60, k))
}

// hbars is a plotter of horizontal histogram bars.
type hbars struct {
	edges, dens []float64
	fill        color.Color
}

func (h hbars) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for k, d := range h.dens {
		if d == 0 {
			continue
		}
		x0, x1 := trX(0), trX(d)
		y0, y1 := trY(h.edges[k]), trY(h.edges[k+1])
		pts := []vg.Point{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}}
		c.FillPolygon(h.fill, pts)
		c.StrokeLines(draw.LineStyle{Color: color.White, Width: vg.Points(0.4)}, append(pts, pts[0]))
	}
}

// unlabelled wraps a ticker and drops its labels.
type unlabelled struct{ plot.Ticker }

func (u unlabelled) Ticks(lo, hi float64) []plot.Tick {
	t := u.Ticker.Ticks(lo, hi)
	for i := range t {
		t[i].Label = ""
	}
	return t
}

// Draw renders the series and its histogram.
func (d *Distribution) Draw(s Size) (*image.RGBA, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if err := d.check(); err != nil {
		return nil, err
	}
	mean, sd := 0.0, 0.0
	for _, v := range d.Values {
		mean += v
	}
	mean /= float64(len(d.Values))
	for _, v := range d.Values {
		sd += (v - mean) * (v - mean)
	}
	sd = math.Sqrt(sd / float64(len(d.Values)-1))
	// Values of very small or large magnitude are plotted in units of a
	// power of ten, shown above the axis.
	ext := palette.MinMaxRange(d.Values)
	exp := decade(math.Max(math.Abs(ext.Lo), math.Abs(ext.Hi)))
	f := math.Pow(10, -float64(exp))
	vals := d.Values
	if exp != 0 {
		vals = make([]float64, len(d.Values))
		for i, v := range d.Values {
			vals[i] = v * f
		}
	}
	lo, hi := ext.Lo*f, ext.Hi*f
	if hi == lo {
		pad := 0.5 * math.Max(math.Abs(lo), 1)
		lo, hi = lo-pad, hi+pad
	}
	bins := d.Bins
	if bins == 0 {
		bins = autoBins(vals)
	}
	edges, dens := histogram(vals, lo, hi, bins)
	pad := 0.04 * (hi - lo)
	ylo, yhi := lo-pad, hi+pad

	c := newCanvas(s)
	area := c.drawTitle(c.dc, d.Title)
	keys := []keyEntry{
		{line: ptr(lineStyle(color.Black, 1, true)), text: "mean " + formatSig(mean, 4)},
		{line: ptr(dotted()), text: "mean ± standard deviation (" + formatSig(sd, 3) + ")"},
	}
	area = c.drawKey(area, keys)

	left := c.newPlot("", "day", d.Label)
	line := Line{X: d.Days, Y: vals, Color: palette.Distinct(0)}
	if exp != 0 {
		left.Add(corner{"×" + tenTo(exp), c.tick})
	}
	if _, err := addLines(left, []Line{line}, false); err != nil {
		return nil, err
	}
	right := c.newPlot("", "probability density", "")
	right.Y.Tick.Marker = unlabelled{niceTicks{}}
	right.X.Tick.Marker = niceTicks{n: 3}
	right.Add(hbars{edges, dens, color.RGBA{150, 160, 185, 255}})
	right.X.Min, right.X.Max = 0, 1.08*slices.Max(dens)
	for _, p := range []*plot.Plot{left, right} {
		p.Y.Min, p.Y.Max = ylo, yhi
		p.Add(hline{mean * f, lineStyle(color.Black, 1, true)})
		if sd > 0 {
			p.Add(hline{(mean - sd) * f, dotted()}, hline{(mean + sd) * f, dotted()})
		}
		p.Add(frame{})
	}
	// The series takes three quarters of the width; both data areas share
	// their vertical extent.
	split := area.Min.X + 0.75*(area.Max.X-area.Min.X)
	lc, rc := area, area
	lc.Max.X, rc.Min.X = split, split
	ld, rd := left.DataCanvas(lc), right.DataCanvas(rc)
	bottom, top := max(ld.Min.Y, rd.Min.Y), min(ld.Max.Y, rd.Max.Y)
	lc.Min.Y += bottom - ld.Min.Y
	lc.Max.Y += top - ld.Max.Y
	rc.Min.Y += bottom - rd.Min.Y
	rc.Max.Y += top - rd.Max.Y
	left.Draw(lc)
	right.Draw(rc)
	return c.img, nil
}

func ptr[T any](v T) *T { return &v }

func dotted() draw.LineStyle {
	return draw.LineStyle{Color: color.Black, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
}
