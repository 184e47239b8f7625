package main

import (
	"image"
	"image/color"
	"math"
	"time"

	"github.com/eddyblock/eddyblock/output/palette"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// The picture is composed by the browser's WebGL (ebiten) from three
// images, so that the one thread that runs the model paints few pixels:
//
//   - each field (the live field, the running mean) is painted at
//     fieldScale pixels per grid point, sampled bilinearly on the periodic
//     grid, and scaled to its panel with linear filtering;
//   - the overlay, at the picture's full size, holds what changes only with
//     the settings: the block's and the source's outlines, the sponge's
//     veil and hatching, the panels' frames and the colour bars.
//
// Only the fields are repainted while the model runs.

// fieldScale is the number of field-image pixels per grid point along each
// axis.
const fieldScale = 2

// FieldSize returns the size of the field images, pixels.
func (a *App) FieldSize() (w, h int) { return fieldScale * a.g.Nx, fieldScale * a.g.Ny }

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

// Layout returns the layout of a w×h picture of this domain.
func (a *App) Layout(w, h int) layout { return makeLayout(w, h, a.g.Lx/a.g.Ly) }

// Colours of the overlay: the block's outline in a dark neutral grey, the
// source's outline in the palette's first line colour, the frame of a
// stopped model in a strong red (alpha-premultiplied, as palette.Canvas
// takes them).
var (
	outlineColour = color.RGBA{40, 40, 40, 255}
	frameColour   = color.RGBA{120, 120, 120, 255}
	stopColour    = color.RGBA{200, 0, 0, 255}
	hatchColour   = color.RGBA{90, 90, 90, 130}
)

// painter holds what painting reuses from frame to frame.
type painter struct {
	p palette.Painter
}

// PaintField paints field k (0 the live field, 1 the running mean) into
// pix, an image of FieldSize pixels (4 bytes each, RGBA, north up), on the
// signed colour scale over its range symmetric about zero. It allocates
// nothing.
func (a *App) PaintField(pt *painter, k int, pix []byte) {
	t0 := time.Now()
	defer func() { a.paintMs = ema(a.paintMs, time.Since(t0)) }()
	fw, fh := a.FieldSize()
	f, m := a.live, a.liveHold.m
	if k == 1 {
		f, m = a.mean, a.meanHold.m
	}
	grid := palette.Grid{Values: f, Nx: a.g.Nx, Ny: a.g.Ny}
	_ = pt.p.Fill(pix, 4*fw, fw, fh, grid, palette.Range{Lo: -m, Hi: m}, palette.Signed(),
		palette.FillOptions{Sampling: palette.Bilinear, Periodic: true, FlipY: true})
}

// PaintOverlay paints the overlay of a w×h picture into pix (transparent
// where it shows the fields): over each panel the sponge band (veiled in
// proportion to its damping rate and hatched), the block's outline (its
// upper-layer ψ_B at half the peak of each lobe), the source's outline (the
// e-folding ellipses of its mask) and a frame, red around the live field
// while the model is stopped; under each panel its colour bar.
func (a *App) PaintOverlay(pix []byte, w, h int) {
	clear(pix)
	l := a.Layout(w, h)
	stride := 4 * w
	g := a.g
	for k := range 2 {
		r := l.Panel[k]
		if r.Empty() {
			continue
		}
		off := r.Min.Y*stride + 4*r.Min.X
		pw, ph := r.Dx(), r.Dy()
		a.paintSponge(pix[off:], stride, pw, ph)
		cv := palette.Canvas{Pix: pix[off:], Stride: stride, W: pw, H: ph}
		tr := palette.Transform{Nx: g.Nx, Ny: g.Ny, W: pw, H: ph, FlipY: true}
		width := math.Max(1.2, float64(pw)/350)
		cv.Segments(a.outline, tr, true, width, outlineColour)
		a.paintSource(cv, tr, width)
		if k == 0 && a.failure != nil {
			cv.StrokeRect(1.5, 1.5, float64(pw)-1.5, float64(ph)-1.5, 3, stopColour)
		} else {
			cv.StrokeRect(0.5, 0.5, float64(pw)-0.5, float64(ph)-0.5, 1, frameColour)
		}
		paintBar(pix, stride, l.Bar[k], palette.Signed())
	}
}

// paintSponge veils the sponge band in white in proportion to its damping
// rate, up to 40 % at the band's centre, and hatches where the rate is
// over a tenth of its peak.
func (a *App) paintSponge(pix []byte, stride, pw, ph int) {
	nx := a.g.Nx
	for px := range pw {
		gx := -0.5 + (float64(px)+0.5)/float64(pw)*float64(nx)
		col := ((int(math.Round(gx)) % nx) + nx) % nx
		v := a.veil[col]
		if v <= 0 {
			continue
		}
		white := uint8(0.4*v*255 + 0.5)
		for py := range ph {
			p := pix[py*stride+4*px : py*stride+4*px+4]
			if v > 0.1 && (px+py)%10 == 0 {
				p[0], p[1], p[2], p[3] = hatchColour.R, hatchColour.G, hatchColour.B, hatchColour.A
				continue
			}
			p[0], p[1], p[2], p[3] = white, white, white, white
		}
	}
}

// paintSource draws the e-folding ellipse of each patch of the source's
// mask, with its periodic copies.
func (a *App) paintSource(cv palette.Canvas, tr palette.Transform, width float64) {
	w := a.exp.Config.Wavemaker
	if w.Kind == wavemaker.Off {
		return
	}
	col := palette.Distinct(0)
	const n = 64
	draw := func(x, y, rx, ry float64) {
		for sx := -1; sx <= 1; sx++ {
			for sy := -1; sy <= 1; sy++ {
				cx, cy := x+float64(sx)*a.g.Lx, y+float64(sy)*a.g.Ly
				var x0, y0 float64
				for k := 0; k <= n; k++ {
					th := 2 * math.Pi * float64(k) / n
					px, py := tr.Pixel(palette.Point{X: (cx + rx*math.Cos(th)) / a.g.Dx, Y: (cy + ry*math.Sin(th)) / a.g.Dy})
					if k > 0 {
						cv.Line(x0, y0, px, py, width, col)
					}
					x0, y0 = px, py
				}
			}
		}
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
	cv.StrokeRect(0.5, 0.5, float64(bw)-0.5, float64(r.Dy())-0.5, 1, frameColour)
}
