package palette

import (
	"errors"
	"fmt"
	"image"
	"image/color"
	"math"
)

// Grid is a field on a regular grid, stored by rows: Values[j*Nx+i] is the
// value at column i (x) and row j (y). Grid coordinates put point (i, j) at
// (X, Y) = (i, j).
type Grid struct {
	Values []float64
	Nx, Ny int
}

// Check reports whether the grid's sizes are positive and agree with the
// length of Values.
func (g Grid) Check() error {
	if g.Nx <= 0 || g.Ny <= 0 {
		return fmt.Errorf("palette: grid size %d×%d: both must be positive", g.Nx, g.Ny)
	}
	if len(g.Values) != g.Nx*g.Ny {
		return fmt.Errorf("palette: grid has %d values, want Nx×Ny = %d×%d = %d", len(g.Values), g.Nx, g.Ny, g.Nx*g.Ny)
	}
	return nil
}

// Window is the rectangle of grid coordinates an image shows, from (X0, Y0)
// to (X1, Y1). The zero Window means the whole grid with each point at the
// centre of its cell: [−½, Nx−½] × [−½, Ny−½].
type Window struct {
	X0, Y0, X1, Y1 float64
}

func (w Window) resolve(nx, ny int) Window {
	if w == (Window{}) {
		return Window{-0.5, -0.5, float64(nx) - 0.5, float64(ny) - 0.5}
	}
	return w
}

// Sampling selects how a painter samples the grid at a pixel's centre.
type Sampling int

const (
	// Nearest takes the value of the nearest grid point (blocky, exact values).
	Nearest Sampling = iota
	// Bilinear interpolates the values of the four surrounding grid points
	// (values are interpolated, then coloured).
	Bilinear
)

// FillOptions control how a grid is painted.
type FillOptions struct {
	Sampling Sampling
	// Periodic makes the grid wrap around in x and y (a doubly periodic
	// domain): bilinear sampling between the last and the first column
	// interpolates across the boundary, and windows reaching beyond the grid
	// show its periodic copies. Otherwise samples beyond the grid take the
	// value of the nearest edge.
	Periodic bool
	// FlipY puts row j = 0 at the bottom of the image, as on a map with north
	// up; otherwise it is at the top.
	FlipY bool
	// Window is the part of the grid shown (zero: all of it).
	Window Window
	// Missing is the colour of pixels whose sample is NaN.
	Missing color.RGBA
}

// Painter paints grids into RGBA pixel buffers. It keeps its index tables
// between calls, so a Painter reused frame after frame allocates nothing.
// The zero Painter is ready to use; a Painter is not safe for concurrent use.
type Painter struct {
	xi0, xi1, yi0, yi1 []int
	xw, yw             []float64
}

// Fill paints grid g into the w×h RGBA pixels of dst (4 bytes per pixel, R,
// G, B, A, rows stride bytes apart, top row first), mapping values on range
// r to scale s. Pixel (px, py) samples the grid at the pixel's centre.
func Fill(dst []byte, stride, w, h int, g Grid, r Range, s *Scale, o FillOptions) error {
	var p Painter
	return p.Fill(dst, stride, w, h, g, r, s, o)
}

// FillImage paints grid g over the bounds of img (see Fill).
func FillImage(img *image.RGBA, g Grid, r Range, s *Scale, o FillOptions) error {
	var p Painter
	return p.FillImage(img, g, r, s, o)
}

// FillImage paints grid g over the bounds of img (see Fill).
func (p *Painter) FillImage(img *image.RGBA, g Grid, r Range, s *Scale, o FillOptions) error {
	b := img.Bounds()
	if b.Empty() {
		return errors.New("palette: empty image")
	}
	off := img.PixOffset(b.Min.X, b.Min.Y)
	return p.Fill(img.Pix[off:], img.Stride, b.Dx(), b.Dy(), g, r, s, o)
}

// Fill paints grid g into dst (see the package function Fill).
func (p *Painter) Fill(dst []byte, stride, w, h int, g Grid, r Range, s *Scale, o FillOptions) error {
	if err := g.Check(); err != nil {
		return err
	}
	if s == nil {
		return errors.New("palette: nil scale")
	}
	if w <= 0 || h <= 0 {
		return fmt.Errorf("palette: image size %d×%d: both must be positive", w, h)
	}
	if stride < 4*w {
		return fmt.Errorf("palette: stride %d is less than 4×width = %d", stride, 4*w)
	}
	if need := (h-1)*stride + 4*w; len(dst) < need {
		return fmt.Errorf("palette: pixel buffer has %d bytes, need %d for %d×%d at stride %d", len(dst), need, w, h, stride)
	}
	if math.IsNaN(r.Lo) || math.IsNaN(r.Hi) || math.IsInf(r.Lo, 0) || math.IsInf(r.Hi, 0) || r.Lo > r.Hi {
		return fmt.Errorf("palette: invalid range [%g, %g]", r.Lo, r.Hi)
	}
	win := o.Window.resolve(g.Nx, g.Ny)
	if !(win.X1 != win.X0 && win.Y1 != win.Y0) || math.IsNaN(win.X0+win.X1+win.Y0+win.Y1) || math.IsInf(win.X0+win.X1+win.Y0+win.Y1, 0) {
		return fmt.Errorf("palette: invalid window %+v", win)
	}

	bilinear := o.Sampling == Bilinear
	p.xi0, p.xi1, p.xw = axisTable(p.xi0, p.xi1, p.xw, w, g.Nx, win.X0, win.X1, false, bilinear, o.Periodic)
	p.yi0, p.yi1, p.yw = axisTable(p.yi0, p.yi1, p.yw, h, g.Ny, win.Y0, win.Y1, o.FlipY, bilinear, o.Periodic)

	// Value v goes to entry int(v·k + c), clamped to the table.
	const top = TableSize - 1
	var k, c float64
	degenerate := r.Hi == r.Lo
	if !degenerate {
		k = top / (r.Hi - r.Lo)
		c = 0.5 - r.Lo*k
	}
	lut := &s.rgba
	missing := [4]byte{o.Missing.R, o.Missing.G, o.Missing.B, o.Missing.A}
	vals := g.Values
	nx := g.Nx
	for py := range h {
		row := dst[py*stride : py*stride+4*w]
		j0, j1, fy := p.yi0[py]*nx, p.yi1[py]*nx, p.yw[py]
		for px := range w {
			var v float64
			i0 := p.xi0[px]
			if bilinear {
				i1, fx := p.xi1[px], p.xw[px]
				a := vals[j0+i0] + fx*(vals[j0+i1]-vals[j0+i0])
				b := vals[j1+i0] + fx*(vals[j1+i1]-vals[j1+i0])
				v = a + fy*(b-a)
			} else {
				v = vals[j0+i0]
			}
			var e *[4]byte
			switch {
			case v != v:
				e = &missing
			case degenerate:
				switch {
				case v < r.Lo:
					e = &lut[0]
				case v > r.Hi:
					e = &lut[top]
				default:
					e = &lut[top/2]
				}
			default:
				t := v*k + c
				switch {
				case t <= 0:
					e = &lut[0]
				case t >= top:
					e = &lut[top]
				default:
					e = &lut[int(t)]
				}
			}
			copy(row[4*px:4*px+4], e[:])
		}
	}
	return nil
}

// axisTable fills the sample indices and weights of one image axis of n
// pixels over grid coordinates [a0, a1] of a grid axis of m points.
func axisTable(i0, i1 []int, wt []float64, n, m int, a0, a1 float64, flip, bilinear, periodic bool) ([]int, []int, []float64) {
	i0 = grow(i0, n)
	i1 = grow(i1, n)
	wt = growF(wt, n)
	step := (a1 - a0) / float64(n)
	for q := range n {
		pos := float64(q) + 0.5
		if flip {
			pos = float64(n-q) - 0.5
		}
		x := a0 + pos*step
		if !bilinear {
			i0[q] = wrapOrClamp(int(math.Floor(x+0.5)), m, periodic)
			continue
		}
		f := math.Floor(x)
		w := x - f
		j := int(f)
		if !periodic {
			switch {
			case j < 0:
				j, w = 0, 0
			case j >= m-1:
				j, w = m-1, 0
			}
		}
		i0[q] = wrapOrClamp(j, m, periodic)
		i1[q] = wrapOrClamp(j+1, m, periodic)
		wt[q] = w
	}
	return i0, i1, wt
}

func wrapOrClamp(i, m int, periodic bool) int {
	if periodic {
		i %= m
		if i < 0 {
			i += m
		}
		return i
	}
	return max(0, min(m-1, i))
}

func grow(s []int, n int) []int {
	if cap(s) < n {
		return make([]int, n)
	}
	return s[:n]
}

func growF(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

func errorf(format string, args ...any) error {
	return fmt.Errorf("palette: "+format, args...)
}
