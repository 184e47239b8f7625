package figure

import (
	"image"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// mapLayout is where a row of map panels and their colour bar go.
type mapLayout struct {
	tiles []draw.Canvas     // the canvas each panel's plot draws on
	data  []vg.Rectangle    // each panel's data area
	bar   vg.Rectangle      // the colour bar (zero if none)
	pix   []image.Rectangle // the data areas in pixels
	bpix  image.Rectangle   // the colour bar in pixels
}

const (
	panelGap = 10 // points between panels
	barGap   = 10 // points between the last panel and the colour bar
	barWidth = 12 // points
)

// layoutMaps places the plots side by side in area with data areas of
// equal size and height/width ratio aspect (equal scales in x and y when
// aspect = Ly/Lx), aligned with each other, and, if barW > 0, a colour bar
// of that total width (with its labels) right of them. The group is centred
// in area.
func (c *canvas) layoutMaps(area draw.Canvas, plots []*plot.Plot, aspect float64, barW vg.Length) mapLayout {
	n := len(plots)
	left := make([]vg.Length, n)
	right := make([]vg.Length, n)
	var bottom, top, sumLR vg.Length
	for k, p := range plots {
		da := p.DataCanvas(area)
		left[k] = da.Min.X - area.Min.X
		right[k] = area.Max.X - da.Max.X
		bottom = max(bottom, da.Min.Y-area.Min.Y)
		top = max(top, area.Max.Y-da.Max.Y)
		sumLR += left[k] + right[k]
	}
	aw, ah := area.Max.X-area.Min.X, area.Max.Y-area.Min.Y
	extra := sumLR + vg.Points(panelGap)*vg.Length(n-1)
	if barW > 0 {
		extra += vg.Points(barGap) + barW
	}
	d := max((aw-extra)/vg.Length(n), 1)
	h := max(ah-bottom-top, 1)
	if float64(h/d) > aspect {
		h = d * vg.Length(aspect)
	} else {
		d = h / vg.Length(aspect)
	}
	x := area.Min.X + (aw-(extra+d*vg.Length(n)))/2
	y0 := area.Min.Y + bottom + (ah-bottom-top-h)/2
	var l mapLayout
	for k, p := range plots {
		tile := area
		tile.Rectangle = vg.Rectangle{
			Min: vg.Point{X: x, Y: y0 - (bottom)},
			Max: vg.Point{X: x + left[k] + d + right[k], Y: y0 + h + top},
		}
		// The padding of a plot does not depend on its size, but re-measure
		// to place the data area exactly.
		da := p.DataCanvas(tile)
		tile.Min.X += x + left[k] - da.Min.X
		tile.Max.X += x + left[k] + d - da.Max.X
		tile.Min.Y += y0 - da.Min.Y
		tile.Max.Y += y0 + h - da.Max.Y
		da = p.DataCanvas(tile)
		l.tiles = append(l.tiles, tile)
		l.data = append(l.data, da.Rectangle)
		l.pix = append(l.pix, c.pixels(da.Rectangle))
		x += left[k] + d + right[k] + vg.Points(panelGap)
	}
	if barW > 0 {
		x += vg.Points(barGap - panelGap)
		l.bar = vg.Rectangle{Min: vg.Point{X: x, Y: y0}, Max: vg.Point{X: x + vg.Points(barWidth), Y: y0 + h}}
		l.bpix = c.pixels(l.bar)
	}
	return l
}

// paint fills the pixels of r with field f on scale s over range rng.
func (c *canvas) paint(r image.Rectangle, f Field, rng palette.Range, s *palette.Scale) error {
	if r.Empty() {
		return nil
	}
	sub := c.img.SubImage(r).(*image.RGBA)
	return palette.FillImage(sub, f.grid(), rng, s, palette.FillOptions{
		Sampling: palette.Bilinear,
		Periodic: !f.Bounded,
		FlipY:    true,
		Window:   f.window(),
	})
}

// shade blends colour col over the pixels of r where field f (interpolated
// bilinearly at the pixel's centre) exceeds threshold: solid at 35 %
// opacity, or as diagonal hatching.
func (c *canvas) shade(r image.Rectangle, f Field, threshold float64, col [3]uint8, hatch bool) {
	w := f.window()
	for py := r.Min.Y; py < r.Max.Y; py++ {
		gy := w.Y1 - (float64(py-r.Min.Y)+0.5)*(w.Y1-w.Y0)/float64(r.Dy())
		for px := r.Min.X; px < r.Max.X; px++ {
			gx := w.X0 + (float64(px-r.Min.X)+0.5)*(w.X1-w.X0)/float64(r.Dx())
			if !(f.at(gx, gy) > threshold) {
				continue
			}
			a := 0.35
			if hatch {
				if (px+py)%7 > 1 {
					continue
				}
				a = 0.85
			}
			o := c.img.PixOffset(px, py)
			p := c.img.Pix[o : o+3]
			for k := range 3 {
				p[k] = uint8(a*float64(col[k]) + (1-a)*float64(p[k]) + 0.5)
			}
		}
	}
}

// at interpolates f bilinearly at grid coordinates (gx, gy).
func (f Field) at(gx, gy float64) float64 {
	i0, j0 := math.Floor(gx), math.Floor(gy)
	fx, fy := gx-i0, gy-j0
	i, j := int(i0), int(j0)
	a0, a1 := wrapIndex(i, f.Nx, f.Bounded), wrapIndex(i+1, f.Nx, f.Bounded)
	b0, b1 := wrapIndex(j, f.Ny, f.Bounded)*f.Nx, wrapIndex(j+1, f.Ny, f.Bounded)*f.Nx
	v := f.Values
	lo := v[b0+a0] + fx*(v[b0+a1]-v[b0+a0])
	hi := v[b1+a0] + fx*(v[b1+a1]-v[b1+a0])
	return lo + fy*(hi-lo)
}

func wrapIndex(i, n int, bounded bool) int {
	if bounded {
		return max(0, min(n-1, i))
	}
	i %= n
	if i < 0 {
		i += n
	}
	return i
}

// compactLayout lays out a figure of maps with a title above and a key
// below, closing up the space the maps' fixed aspect leaves: title, maps
// and key are kept together and centred vertically. It draws the title and
// the key (whose entries may depend on the maps' layout) and returns the
// maps' layout.
func (c *canvas) compactLayout(title string, keys func(mapLayout) []keyEntry, layout func(draw.Canvas) mapLayout) mapLayout {
	full := c.dc
	width := full.Max.X - full.Min.X
	inner := full
	inner.Max.Y -= c.titleSpace(title)
	inner.Min.Y += c.keySpace(keys(mapLayout{}), width)
	l := layout(inner)
	lo, hi := inner.Max.Y, inner.Min.Y
	for _, t := range l.tiles {
		lo, hi = min(lo, t.Min.Y), max(hi, t.Max.Y)
	}
	if l.bar != (vg.Rectangle{}) {
		hi = max(hi, l.bar.Max.Y+c.tick.Height("0")+vg.Points(4))
	}
	if slack := (inner.Max.Y - inner.Min.Y) - (hi - lo); slack > 0 {
		full = draw.Crop(full, 0, 0, slack/2, -slack/2)
	}
	area := c.drawTitle(full, title)
	ks := keys(l)
	keyArea := area
	area.Min.Y += c.keySpace(ks, width)
	l = layout(area)
	c.drawKey(keyArea, keys(l))
	return l
}
