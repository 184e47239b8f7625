package figure

import (
	"fmt"
	"image"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// ScaleKind chooses the colour scale of a map.
type ScaleKind int

const (
	// AutoScale takes Signed if any value is negative, Positive otherwise.
	AutoScale ScaleKind = iota
	// Signed is the diverging scale on a range symmetric about zero, zero
	// at its neutral centre.
	Signed
	// Positive is the sequential scale from the lowest to the highest value.
	Positive
)

// Panel is one map of a row.
type Panel struct {
	Title string
	Field Field
}

// Contour is a set of contour lines of a field drawn over maps, such as the
// outline of the block.
type Contour struct {
	Field  Field // on the same domain as the maps
	Levels []float64
	Color  color.Color // nil: black
	Width  float64     // points; 0: 1
	Dashed bool
	Label  string // for the key under the figure; empty: not listed
}

// Mask marks a region on maps, such as the wave source's patch or the
// sponge band: the region where Field exceeds Threshold, in Color. It is
// shaded (translucent), hatched, outlined by the contour at Threshold, or
// any mix of these; with none set it is outlined.
type Mask struct {
	Field     Field // on the same domain as the maps
	Threshold float64
	Color     color.RGBA // zero: dark grey
	Shade     bool
	Hatch     bool
	Outline   bool
	Label     string // for the key under the figure; empty: not listed
}

// Map is one field, or several side by side on one shared colour scale
// with one colour bar, on the (x, y) plane with axes in km, with optional
// contours and masked regions drawn over every panel. Each panel keeps
// equal scales in x and y.
type Map struct {
	Title  string
	Panels []Panel
	Scale  ScaleKind
	// Lo and Hi fix the colour range when Lo < Hi (a signed scale needs
	// Lo = −Hi); otherwise it spans the values of all panels.
	Lo, Hi float64
	// Percentile, in (0, 100), bounds a signed range at that percentile of
	// |value| over all panels instead of the largest |value|, so that a few
	// extremes do not wash out the rest; beyond it colours saturate.
	Percentile float64
	Units      string // the colour bar's label, e.g. "m day⁻¹"
	Contours   []Contour
	Masks      []Mask
}

func (m *Map) check() error {
	if len(m.Panels) == 0 {
		return fmt.Errorf("figure: Map.Panels: no panel")
	}
	for k, p := range m.Panels {
		name := fmt.Sprintf("Map.Panels[%d].Field", k)
		if err := p.Field.check(name); err != nil {
			return err
		}
		if k > 0 && !sameDomain(p.Field, m.Panels[0].Field) {
			return fmt.Errorf("figure: %s: domain %g m × %g m differs from panel 0's %g m × %g m",
				name, p.Field.Lx, p.Field.Ly, m.Panels[0].Field.Lx, m.Panels[0].Field.Ly)
		}
	}
	if m.Scale < AutoScale || m.Scale > Positive {
		return fmt.Errorf("figure: Map.Scale: unknown scale %d", m.Scale)
	}
	if m.Lo != 0 || m.Hi != 0 {
		if !(m.Lo < m.Hi) || math.IsInf(m.Lo, 0) || math.IsInf(m.Hi, 0) {
			return fmt.Errorf("figure: Map.Lo, Map.Hi: range [%g, %g] must have Lo < Hi, both finite", m.Lo, m.Hi)
		}
		if m.Scale == Signed && m.Lo != -m.Hi {
			return fmt.Errorf("figure: Map.Lo, Map.Hi: range [%g, %g]: a signed scale needs Lo = −Hi", m.Lo, m.Hi)
		}
	}
	if m.Percentile != 0 && !(m.Percentile > 0 && m.Percentile < 100) {
		return fmt.Errorf("figure: Map.Percentile: %g must be in (0, 100) or 0", m.Percentile)
	}
	return checkOverlays("Map", m.Panels[0].Field, m.Contours, m.Masks)
}

func checkOverlays(owner string, ref Field, cs []Contour, ms []Mask) error {
	for k, ct := range cs {
		name := fmt.Sprintf("%s.Contours[%d]", owner, k)
		if err := ct.Field.check(name + ".Field"); err != nil {
			return err
		}
		if !sameDomain(ct.Field, ref) {
			return fmt.Errorf("figure: %s.Field: domain %g m × %g m differs from the map's %g m × %g m", name, ct.Field.Lx, ct.Field.Ly, ref.Lx, ref.Ly)
		}
		if len(ct.Levels) == 0 {
			return fmt.Errorf("figure: %s.Levels: no level", name)
		}
		for _, lv := range ct.Levels {
			if math.IsNaN(lv) || math.IsInf(lv, 0) {
				return fmt.Errorf("figure: %s.Levels: level %g is not finite", name, lv)
			}
		}
	}
	for k, mk := range ms {
		name := fmt.Sprintf("%s.Masks[%d]", owner, k)
		if err := mk.Field.check(name + ".Field"); err != nil {
			return err
		}
		if !sameDomain(mk.Field, ref) {
			return fmt.Errorf("figure: %s.Field: domain %g m × %g m differs from the map's %g m × %g m", name, mk.Field.Lx, mk.Field.Ly, ref.Lx, ref.Ly)
		}
		if math.IsNaN(mk.Threshold) || math.IsInf(mk.Threshold, 0) {
			return fmt.Errorf("figure: %s.Threshold: %g is not finite", name, mk.Threshold)
		}
	}
	return nil
}

// colours returns the scale and range of the map and a note for the key.
func (m *Map) colours() (*palette.Scale, palette.Range, string) {
	var all []float64
	for _, p := range m.Panels {
		all = append(all, p.Field.Values...)
	}
	ext := palette.MinMaxRange(all)
	kind := m.Scale
	if kind == AutoScale {
		kind = Positive
		if ext.Lo < 0 {
			kind = Signed
		}
	}
	units := ""
	if m.Units != "" {
		units = " " + m.Units
	}
	var rng palette.Range
	switch {
	case m.Lo < m.Hi:
		rng = palette.Range{Lo: m.Lo, Hi: m.Hi}
	case kind == Signed && m.Percentile > 0:
		rng = palette.RobustSymmetricRange(all, m.Percentile)
	case kind == Signed:
		rng = palette.SymmetricRange(all)
	default:
		rng = ext
	}
	if rng.Lo == rng.Hi {
		if kind == Signed {
			rng = palette.Range{Lo: -1, Hi: 1}
		} else {
			rng.Hi = rng.Lo + 1
		}
	}
	var note string
	s := palette.Magnitude()
	if kind == Signed {
		s = palette.Signed()
		note = "colour range ±" + formatNum(rng.Hi) + units
	} else {
		note = "colour range " + formatNum(rng.Lo) + " to " + formatNum(rng.Hi) + units
	}
	if ext.Lo < rng.Lo || ext.Hi > rng.Hi {
		note += fmt.Sprintf(" (beyond it colours saturate; values span %s to %s)", formatNum(ext.Lo), formatNum(ext.Hi))
	}
	return s, rng, note
}

// overlayKey returns the key entries of labelled contours and masks.
func overlayKey(cs []Contour, ms []Mask) []keyEntry {
	var keys []keyEntry
	for _, ct := range cs {
		if ct.Label != "" {
			st := lineStyle(ct.Color, ct.Width, ct.Dashed)
			keys = append(keys, keyEntry{line: &st, text: ct.Label})
		}
	}
	for _, mk := range ms {
		if mk.Label != "" {
			col := maskColour(mk)
			switch {
			case mk.Hatch || mk.Shade:
				keys = append(keys, keyEntry{patch: col, hatch: mk.Hatch && !mk.Shade, text: mk.Label})
			default:
				st := lineStyle(col, 1.2, false)
				keys = append(keys, keyEntry{line: &st, text: mk.Label})
			}
		}
	}
	return keys
}

func maskColour(mk Mask) color.RGBA {
	if mk.Color == (color.RGBA{}) {
		return color.RGBA{60, 60, 60, 255}
	}
	return mk.Color
}

// overlayPlotters returns the plotters drawing contours and mask outlines,
// and shades the masks into the pixels of r.
func (c *canvas) overlays(p *plot.Plot, r image.Rectangle, cs []Contour, ms []Mask) {
	for _, mk := range ms {
		col := maskColour(mk)
		rgb := [3]uint8{col.R, col.G, col.B}
		if mk.Shade {
			c.shade(r, mk.Field, mk.Threshold, rgb, false)
		}
		if mk.Hatch {
			c.shade(r, mk.Field, mk.Threshold, rgb, true)
		}
		if mk.Outline || !(mk.Shade || mk.Hatch) {
			p.Add(polylines{contourLines(mk.Field, []float64{mk.Threshold}), lineStyle(col, 1.2, false)})
		}
	}
	for _, ct := range cs {
		p.Add(polylines{contourLines(ct.Field, ct.Levels), lineStyle(ct.Color, ct.Width, ct.Dashed)})
	}
}

// mapPlot returns a plot with km axes over the domain of f, one of n
// panels side by side taking the width left of reserve: the first has
// the y axis's labels, the others only its ticks. The number of ticks
// suits the panels' expected size.
func (c *canvas) mapPlot(title string, f Field, first bool, n int, reserve vg.Length) *plot.Plot {
	yl := ""
	if first {
		yl = "y (km)"
	}
	p := c.newPlot(title, "x (km)", yl)
	p.X.Min, p.X.Max = 0, f.Lx/1000
	p.Y.Min, p.Y.Max = 0, f.Ly/1000
	aw, ah := c.dc.Max.X-c.dc.Min.X, c.dc.Max.Y-c.dc.Min.Y
	w := (aw-reserve)/vg.Length(n) - vg.Points(50)
	h := min(w*vg.Length(f.Ly/f.Lx), ah-vg.Points(90))
	per := c.tick.Width(tickLabel(f.Lx/1000, 0)) + vg.Points(14)
	p.X.Tick.Marker = niceTicks{n: fitTicks(w, per)}
	p.Y.Tick.Marker = niceTicks{n: fitTicks(h, 2.2*c.tick.Height("0"))}
	if !first {
		p.Y.Tick.Marker = unlabelled{p.Y.Tick.Marker}
	}
	return p
}

// drawPanel draws a map plot on its tile, with its title centred a fixed
// distance above its data area (gonum would put it at the tile's top, which
// differs between panels with and without y labels).
func (c *canvas) drawPanel(p *plot.Plot, tile draw.Canvas, data vg.Rectangle) {
	title := p.Title.Text
	if title != "" {
		tile.Max.Y -= p.Title.TextStyle.Rectangle(title).Size().Y + p.Title.Padding
		p.Title.Text = ""
	}
	p.Draw(tile)
	if title != "" {
		st := p.Title.TextStyle
		st.XAlign, st.YAlign = draw.XCenter, draw.YBottom
		tile.FillText(st, vg.Point{X: (data.Min.X + data.Max.X) / 2, Y: data.Max.Y + c.tick.Height("0") + vg.Points(2)}, title)
	}
}

// fitTicks returns how many labelled ticks, each needing per, an axis of
// length l can take, in [2, 5].
func fitTicks(l, per vg.Length) int {
	return max(2, min(5, int(l/(1.3*per))))
}

// Draw renders the map.
func (m *Map) Draw(s Size) (*image.RGBA, error) {
	img, _, err := m.draw(s)
	return img, err
}

// draw renders the map and returns its layout.
func (m *Map) draw(s Size) (*image.RGBA, mapLayout, error) {
	if err := s.check(); err != nil {
		return nil, mapLayout{}, err
	}
	if err := m.check(); err != nil {
		return nil, mapLayout{}, err
	}
	scale, rng, note := m.colours()
	c := newCanvas(s)
	keys := append([]keyEntry{{text: note}}, overlayKey(m.Contours, m.Masks)...)
	barW := c.barWidthFor(rng, m.Units)
	plots := make([]*plot.Plot, len(m.Panels))
	for k, pn := range m.Panels {
		plots[k] = c.mapPlot(pn.Title, pn.Field, k == 0, len(m.Panels), barW)
	}
	f0 := m.Panels[0].Field
	l := c.compactLayout(m.Title, func(mapLayout) []keyEntry { return keys }, func(area draw.Canvas) mapLayout {
		return c.layoutMaps(area, plots, f0.Ly/f0.Lx, barW)
	})
	for k, pn := range m.Panels {
		if err := c.paint(l.pix[k], pn.Field, rng, scale); err != nil {
			return nil, mapLayout{}, err
		}
		c.overlays(plots[k], l.pix[k], m.Contours, m.Masks)
		plots[k].Add(frame{})
		c.drawPanel(plots[k], l.tiles[k], l.data[k])
	}
	c.drawBar(l.bar, scale, rng, m.Units)
	return c.img, l, nil
}
