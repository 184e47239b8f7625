package main

import (
	"image"
	"image/color"
	"math"
	"time"

	"github.com/eddyblock/eddyblock/output/palette"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// layout places the picture's parts in a W×H pixel buffer: the live field
// (Panel[0]) and the running mean (Panel[1]) side by side, each as wide as
// half the picture less a gap and as high as the domain's aspect ratio
// allows, with its colour bar (Bar[i]) under it.
type layout struct {
	W, H  int
	Panel [2]image.Rectangle
	Bar   [2]image.Rectangle
}

// makeLayout lays out a w×h picture for a domain whose width is aspect
// times its height. The page sizes its frame so that the panels fill the
// width (see index.html); a picture of another shape keeps the aspect
// ratio and is centred.
func makeLayout(w, h int, aspect float64) layout {
	l := layout{W: w, H: h}
	gap := max(2, w/100)
	barGap := max(2, w/250)
	barH := max(4, w/80)
	pw := (w - gap) / 2
	ph := int(math.Round(float64(pw) / aspect))
	if avail := h - barGap - barH; ph > avail {
		ph = max(1, avail)
		pw = max(1, int(math.Round(float64(ph)*aspect)))
	}
	pw, ph = max(1, pw), max(1, ph)
	x0 := max(0, (w-(2*pw+gap))/2)
	y0 := max(0, (h-(ph+barGap+barH))/2)
	for i := range 2 {
		x := x0 + i*(pw+gap)
		l.Panel[i] = image.Rect(x, y0, x+pw, y0+ph).Intersect(image.Rect(0, 0, w, h))
		l.Bar[i] = image.Rect(x, y0+ph+barGap, x+pw, y0+ph+barGap+barH).Intersect(image.Rect(0, 0, w, h))
	}
	return l
}

// Colours of the overlays: the block's outline in a dark neutral grey,
// the source's outline in the first line colour of the palette, the frame
// of a stopped model in a strong red.
var (
	outlineColour = color.RGBA{40, 40, 40, 255}
	stopColour    = color.RGBA{200, 0, 0, 255}
	background    = color.RGBA{255, 255, 255, 255}
)

// painter holds what painting reuses from frame to frame.
type painter struct {
	p palette.Painter
}

// Paint draws the picture into pix (w×h RGBA pixels, 4w bytes a row): both
// fields on the signed colour scale over ranges symmetric about zero,
// with north up, the sponge band veiled, the block's outline (its ψ_B at
// half the peak of each lobe) and the source's outline (its mask's
// e-folding ellipses) over both, and the colour bars. It allocates nothing.
func (a *App) Paint(pt *painter, pix []byte, w, h int) {
	t0 := time.Now()
	defer func() { a.paintMs = ema(a.paintMs, time.Since(t0)) }()
	g := a.g
	l := makeLayout(w, h, g.Lx/g.Ly)
	for i := 0; i+3 < len(pix); i += 4 {
		pix[i], pix[i+1], pix[i+2], pix[i+3] = background.R, background.G, background.B, background.A
	}
	scale := palette.Signed()
	stride := 4 * w
	fields := [2][]float64{a.live, a.mean}
	ranges := [2]float64{a.liveHold.m, a.meanHold.m}
	for k := range 2 {
		r := l.Panel[k]
		if r.Empty() {
			continue
		}
		off := r.Min.Y*stride + 4*r.Min.X
		pw, ph := r.Dx(), r.Dy()
		grid := palette.Grid{Values: fields[k], Nx: g.Nx, Ny: g.Ny}
		rg := palette.Range{Lo: -ranges[k], Hi: ranges[k]}
		_ = pt.p.Fill(pix[off:], stride, pw, ph, grid, rg, scale, palette.FillOptions{Sampling: palette.Bilinear, Periodic: true, FlipY: true})
		a.paintVeil(pix[off:], stride, pw, ph)
		cv := palette.Canvas{Pix: pix[off:], Stride: stride, W: pw, H: ph}
		tr := palette.Transform{Nx: g.Nx, Ny: g.Ny, W: pw, H: ph, FlipY: true}
		width := math.Max(1, float64(pw)/400)
		cv.Segments(a.outline, tr, true, width*1.3, outlineColour)
		a.paintSource(cv, tr, width*1.3)
		if k == 0 && a.failure != nil {
			cv.StrokeRect(1.5, 1.5, float64(pw)-1.5, float64(ph)-1.5, 3, stopColour)
		} else {
			cv.StrokeRect(0.5, 0.5, float64(pw)-0.5, float64(ph)-0.5, 1, color.RGBA{120, 120, 120, 255})
		}
		paintBar(pix, stride, l.Bar[k], scale)
	}
}

// paintVeil whitens the sponge band in proportion to its damping rate, up
// to 45 % at the band's centre.
func (a *App) paintVeil(pix []byte, stride, pw, ph int) {
	nx := a.g.Nx
	for px := range pw {
		gx := -0.5 + (float64(px)+0.5)/float64(pw)*float64(nx)
		col := int(math.Round(gx))
		col = ((col % nx) + nx) % nx
		f := 0.45 * a.veil[col]
		if f <= 0 {
			continue
		}
		for py := range ph {
			p := pix[py*stride+4*px : py*stride+4*px+3]
			for c := range p {
				p[c] = uint8(float64(p[c]) + (255-float64(p[c]))*f + 0.5)
			}
		}
	}
}

// paintSource draws the e-folding ellipse of each patch of the source's
// mask, with its periodic copies.
func (a *App) paintSource(cv palette.Canvas, tr palette.Transform, width float64) {
	w := a.exp.Config.Wavemaker
	col := palette.Distinct(0)
	const n = 48
	draw := func(x, y, rx, ry float64) {
		dx, dy := a.g.Dx, a.g.Dy
		for sx := -1; sx <= 1; sx++ {
			for sy := -1; sy <= 1; sy++ {
				cx, cy := x+float64(sx)*a.g.Lx, y+float64(sy)*a.g.Ly
				var x0, y0 float64
				for k := 0; k <= n; k++ {
					th := 2 * math.Pi * float64(k) / n
					px, py := tr.Pixel(palette.Point{X: (cx + rx*math.Cos(th)) / dx, Y: (cy + ry*math.Sin(th)) / dy})
					if k > 0 {
						cv.Line(x0, y0, px, py, width, col)
					}
					x0, y0 = px, py
				}
			}
		}
	}
	if w.Kind == wavemaker.Off {
		return
	}
	switch w.Mask.Kind {
	case wavemaker.Patch:
		draw(w.Mask.X, w.Mask.Y, w.Mask.WidthX, w.Mask.WidthY)
	case wavemaker.Patches:
		for _, p := range w.Mask.Patches {
			draw(p.X, p.Y, p.WidthX, p.WidthY)
		}
	}
}

// paintBar paints a colour bar over r: the scale from its lowest value at
// the left to its highest at the right, with a mark at the middle (zero
// on a symmetric range) and a thin frame.
func paintBar(pix []byte, stride int, r image.Rectangle, s *palette.Scale) {
	if r.Empty() {
		return
	}
	bw := r.Dx()
	for px := range bw {
		c := s.At((float64(px) + 0.5) / float64(bw))
		for py := r.Min.Y; py < r.Max.Y; py++ {
			o := py*stride + 4*(r.Min.X+px)
			pix[o], pix[o+1], pix[o+2], pix[o+3] = c.R, c.G, c.B, 255
		}
	}
	cv := palette.Canvas{Pix: pix[r.Min.Y*stride+4*r.Min.X:], Stride: stride, W: bw, H: r.Dy()}
	mid := float64(bw) / 2
	cv.Line(mid, 0, mid, float64(r.Dy()), 1, color.RGBA{60, 60, 60, 255})
	cv.StrokeRect(0.5, 0.5, float64(bw)-0.5, float64(r.Dy())-0.5, 1, color.RGBA{120, 120, 120, 255})
}
