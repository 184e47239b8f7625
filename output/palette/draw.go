package palette

import (
	"image"
	"image/color"
	"math"
)

// Canvas is a small anti-aliased rasteriser over an RGBA pixel buffer (4
// bytes per pixel, rows Stride bytes apart, top row first). Coordinates are
// in pixels, with (0, 0) the top-left corner of the top-left pixel, so the
// centre of pixel (i, j) is at (i+½, j+½). Colours are alpha-premultiplied
// (as color.RGBA is) and composited over what is there.
type Canvas struct {
	Pix    []byte
	Stride int
	W, H   int
}

// NewCanvas returns a Canvas drawing into img (its bounds' top-left corner
// becomes (0, 0)).
func NewCanvas(img *image.RGBA) Canvas {
	b := img.Bounds()
	return Canvas{Pix: img.Pix[img.PixOffset(b.Min.X, b.Min.Y):], Stride: img.Stride, W: b.Dx(), H: b.Dy()}
}

// blend composites colour c at coverage a (0…1) over pixel (x, y).
func (cv Canvas) blend(x, y int, c color.RGBA, a float64) {
	if a <= 0 || x < 0 || y < 0 || x >= cv.W || y >= cv.H {
		return
	}
	if a > 1 {
		a = 1
	}
	p := cv.Pix[y*cv.Stride+4*x : y*cv.Stride+4*x+4]
	k := 1 - a*float64(c.A)/255
	p[0] = uint8(a*float64(c.R) + k*float64(p[0]) + 0.5)
	p[1] = uint8(a*float64(c.G) + k*float64(p[1]) + 0.5)
	p[2] = uint8(a*float64(c.B) + k*float64(p[2]) + 0.5)
	p[3] = uint8(a*float64(c.A) + k*float64(p[3]) + 0.5)
}

// box returns the pixel range covering [x0, x1] × [y0, y1] grown by pad,
// clipped to the canvas.
func (cv Canvas) box(x0, y0, x1, y1, pad float64) (ix0, iy0, ix1, iy1 int) {
	ix0 = max(0, int(math.Floor(math.Min(x0, x1)-pad)))
	iy0 = max(0, int(math.Floor(math.Min(y0, y1)-pad)))
	ix1 = min(cv.W-1, int(math.Ceil(math.Max(x0, x1)+pad)))
	iy1 = min(cv.H-1, int(math.Ceil(math.Max(y0, y1)+pad)))
	return
}

// Line draws a straight line of the given width (pixels) from (x0, y0) to
// (x1, y1), with round ends.
func (cv Canvas) Line(x0, y0, x1, y1, width float64, c color.RGBA) {
	if !finite(x0, y0, x1, y1, width) || width <= 0 {
		return
	}
	r := width / 2
	ix0, iy0, ix1, iy1 := cv.box(x0, y0, x1, y1, r+1)
	dx, dy := x1-x0, y1-y0
	l2 := dx*dx + dy*dy
	for y := iy0; y <= iy1; y++ {
		py := float64(y) + 0.5
		for x := ix0; x <= ix1; x++ {
			px := float64(x) + 0.5
			t := 0.0
			if l2 > 0 {
				t = math.Max(0, math.Min(1, ((px-x0)*dx+(py-y0)*dy)/l2))
			}
			d := math.Hypot(px-(x0+t*dx), py-(y0+t*dy))
			cv.blend(x, y, c, r+0.5-d)
		}
	}
}

// Triangle fills the triangle with the given corners.
func (cv Canvas) Triangle(ax, ay, bx, by, cx, cy float64, c color.RGBA) {
	if !finite(ax, ay, bx, by, cx, cy) {
		return
	}
	// Orient counter-clockwise in pixel coordinates (y down).
	area := (bx-ax)*(cy-ay) - (by-ay)*(cx-ax)
	if area == 0 {
		return
	}
	if area < 0 {
		bx, by, cx, cy = cx, cy, bx, by
	}
	type edge struct{ nx, ny, d float64 }
	mk := func(x0, y0, x1, y1 float64) edge {
		nx, ny := y1-y0, -(x1 - x0)
		l := math.Hypot(nx, ny)
		return edge{-nx / l, -ny / l, (nx*x0 + ny*y0) / l}
	}
	es := [3]edge{mk(ax, ay, bx, by), mk(bx, by, cx, cy), mk(cx, cy, ax, ay)}
	ix0, iy0, ix1, iy1 := cv.box(math.Min(ax, math.Min(bx, cx)), math.Min(ay, math.Min(by, cy)),
		math.Max(ax, math.Max(bx, cx)), math.Max(ay, math.Max(by, cy)), 1)
	for y := iy0; y <= iy1; y++ {
		py := float64(y) + 0.5
		for x := ix0; x <= ix1; x++ {
			px := float64(x) + 0.5
			// Signed distance inside each edge; coverage from the nearest.
			in := math.Inf(1)
			for _, e := range es {
				in = math.Min(in, e.nx*px+e.ny*py+e.d)
			}
			cv.blend(x, y, c, in+0.5)
		}
	}
}

// Arrow draws an arrow from its tail (x0, y0) to its tip (x1, y1): a shaft
// of the given width and a filled head of length head (pixels; at most 60 %
// of the arrow) and half that width on each side.
func (cv Canvas) Arrow(x0, y0, x1, y1, width, head float64, c color.RGBA) {
	dx, dy := x1-x0, y1-y0
	l := math.Hypot(dx, dy)
	if !finite(x0, y0, x1, y1, width, head) || l == 0 {
		return
	}
	head = math.Min(head, 0.6*l)
	ux, uy := dx/l, dy/l
	bx, by := x1-head*ux, y1-head*uy
	cv.Line(x0, y0, bx+0.3*head*ux, by+0.3*head*uy, width, c)
	hw := 0.5 * head
	cv.Triangle(x1, y1, bx-hw*uy, by+hw*ux, bx+hw*uy, by-hw*ux, c)
}

// FillRect fills the rectangle [x0, x1) × [y0, y1) in pixel coordinates,
// with partial coverage at fractional edges.
func (cv Canvas) FillRect(x0, y0, x1, y1 float64, c color.RGBA) {
	if !finite(x0, y0, x1, y1) {
		return
	}
	if x1 < x0 {
		x0, x1 = x1, x0
	}
	if y1 < y0 {
		y0, y1 = y1, y0
	}
	ix0, iy0, ix1, iy1 := cv.box(x0, y0, x1, y1, 0)
	for y := iy0; y <= iy1; y++ {
		cy := overlap(float64(y), y0, y1)
		for x := ix0; x <= ix1; x++ {
			cv.blend(x, y, c, cy*overlap(float64(x), x0, x1))
		}
	}
}

// StrokeRect draws the outline of the rectangle [x0, x1] × [y0, y1].
func (cv Canvas) StrokeRect(x0, y0, x1, y1, width float64, c color.RGBA) {
	cv.Line(x0, y0, x1, y0, width, c)
	cv.Line(x1, y0, x1, y1, width, c)
	cv.Line(x1, y1, x0, y1, width, c)
	cv.Line(x0, y1, x0, y0, width, c)
}

// overlap returns the length of [p, p+1) ∩ [a, b).
func overlap(p, a, b float64) float64 {
	return math.Max(0, math.Min(p+1, b)-math.Max(p, a))
}

// Transform maps grid coordinates to the pixel coordinates of a W×H image
// showing Window (zero: the whole grid of Nx×Ny points, as in FillOptions),
// consistently with Fill: the centre of pixel (i, j) shows the grid point
// Fill samples there.
type Transform struct {
	Window Window
	Nx, Ny int
	W, H   int
	FlipY  bool
}

// Pixel returns the pixel coordinates of grid point p.
func (t Transform) Pixel(p Point) (x, y float64) {
	w := t.Window.resolve(t.Nx, t.Ny)
	x = (p.X - w.X0) / (w.X1 - w.X0) * float64(t.W)
	if t.FlipY {
		y = (w.Y1 - p.Y) / (w.Y1 - w.Y0) * float64(t.H)
	} else {
		y = (p.Y - w.Y0) / (w.Y1 - w.Y0) * float64(t.H)
	}
	return x, y
}

// Segments draws contour segments given in grid coordinates. With periodic
// set, each segment is also drawn shifted by ±Nx in x and ±Ny in y, so that
// a periodic field's contours show wherever the window reaches.
func (cv Canvas) Segments(segs []Segment, t Transform, periodic bool, width float64, c color.RGBA) {
	shifts := [...]float64{0, -1, 1}
	n := 1
	if periodic {
		n = 3
	}
	for _, s := range segs {
		for a := range n {
			for b := range n {
				sx, sy := shifts[a]*float64(t.Nx), shifts[b]*float64(t.Ny)
				x0, y0 := t.Pixel(Point{s.A.X + sx, s.A.Y + sy})
				x1, y1 := t.Pixel(Point{s.B.X + sx, s.B.Y + sy})
				if math.Max(x0, x1) < -width || math.Min(x0, x1) > float64(cv.W)+width ||
					math.Max(y0, y1) < -width || math.Min(y0, y1) > float64(cv.H)+width {
					continue
				}
				cv.Line(x0, y0, x1, y1, width, c)
			}
		}
	}
}

func finite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}
