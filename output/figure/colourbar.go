package figure

import (
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// barTicks returns the labelled tick values of a colour bar on rng, the
// power of ten factored out of their labels, and the labels.
func barTicks(rng palette.Range, n int) (vals []float64, exp int, labels []string) {
	exp = decade(math.Max(math.Abs(rng.Lo), math.Abs(rng.Hi)))
	f := math.Pow(10, float64(exp))
	for _, t := range (niceTicks{n: n}).Ticks(rng.Lo/f, rng.Hi/f) {
		if t.Label == "" {
			continue
		}
		vals = append(vals, t.Value*f)
		labels = append(labels, t.Label)
	}
	return vals, exp, labels
}

// barWidthFor returns the width a colour bar on rng with its labels and
// units takes.
func (c *canvas) barWidthFor(rng palette.Range, units string) vg.Length {
	_, _, labels := barTicks(rng, 5)
	var lw vg.Length
	for _, s := range labels {
		lw = max(lw, c.tick.Width(s))
	}
	w := vg.Points(barWidth+3+3) + lw
	if units != "" {
		w += vg.Points(6) + c.label.Height(units)
	}
	return w + vg.Points(2)
}

// drawBar draws a vertical colour bar in rectangle r: the scale from rng.Lo
// at the bottom to rng.Hi at the top, a frame, ticks and labels on the
// right, a power of ten above it if one is factored out, and the units
// along its right side.
func (c *canvas) drawBar(r vg.Rectangle, s *palette.Scale, rng palette.Range, units string) {
	pr := c.pixels(r)
	for py := pr.Min.Y; py < pr.Max.Y; py++ {
		col := s.At(1 - (float64(py-pr.Min.Y)+0.5)/float64(pr.Dy()))
		for px := pr.Min.X; px < pr.Max.X; px++ {
			c.img.SetRGBA(px, py, col)
		}
	}
	dc := c.dc
	dc.StrokeLines(frameStyle(), []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
	vals, exp, labels := barTicks(rng, fitTicks(r.Max.Y-r.Min.Y, 2.2*c.tick.Height("0")))
	st := c.tick
	st.XAlign, st.YAlign = draw.XLeft, draw.YCenter
	var lw vg.Length
	for k, v := range vals {
		y := r.Min.Y + vg.Length((v-rng.Lo)/(rng.Hi-rng.Lo))*(r.Max.Y-r.Min.Y)
		dc.StrokeLine2(frameStyle(), r.Max.X, y, r.Max.X+vg.Points(3), y)
		dc.FillText(st, vg.Point{X: r.Max.X + vg.Points(5), Y: y}, labels[k])
		lw = max(lw, c.tick.Width(labels[k]))
	}
	if exp != 0 {
		st.XAlign, st.YAlign = draw.XLeft, draw.YBottom
		dc.FillText(st, vg.Point{X: r.Min.X, Y: r.Max.Y + vg.Points(3)}, "×"+tenTo(exp))
	}
	if units != "" {
		ut := c.label
		ut.Rotation = math.Pi / 2
		ut.XAlign, ut.YAlign = draw.XCenter, draw.YTop
		dc.FillText(ut, vg.Point{X: r.Max.X + vg.Points(5+6) + lw, Y: (r.Min.Y + r.Max.Y) / 2}, units)
	}
}
