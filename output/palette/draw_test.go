package palette

import (
	"image"
	"image/color"
	"math"
	"testing"
)

// coverage returns the summed alpha (in pixels) of a canvas drawn from a
// transparent start in opaque white.
func coverage(img *image.RGBA) float64 {
	s := 0.0
	for i := 3; i < len(img.Pix); i += 4 {
		s += float64(img.Pix[i]) / 255
	}
	return s
}

var white = color.RGBA{255, 255, 255, 255}

func TestCanvasAreas(t *testing.T) {
	// The anti-aliased shapes cover the area elementary geometry gives them,
	// to the rounding of the edge pixels.
	for _, c := range []struct {
		name string
		draw func(Canvas)
		area float64
		tol  float64
	}{
		{"rect", func(c Canvas) { c.FillRect(10.25, 5.5, 30.75, 20, white) }, 20.5 * 14.5, 0.5},
		{"triangle", func(c Canvas) { c.Triangle(10, 10, 50, 12, 20, 45, white) }, 0.5 * math.Abs(40*35-2*10), 6},
		// A line of width w and length l with round ends: l·w + πw²/4.
		{"line", func(c Canvas) { c.Line(8, 9, 52, 40, 3, white) }, math.Hypot(44, 31)*3 + math.Pi*9/4, 4},
	} {
		img := image.NewRGBA(image.Rect(0, 0, 64, 64))
		c.draw(NewCanvas(img))
		if a := coverage(img); math.Abs(a-c.area) > c.tol {
			t.Errorf("%s covers %.2f pixels, want %.2f", c.name, a, c.area)
		}
	}
}

func TestCanvasArrow(t *testing.T) {
	img := image.NewRGBA(image.Rect(0, 0, 40, 20))
	c := NewCanvas(img)
	red := color.RGBA{200, 0, 0, 255}
	c.Arrow(5, 10, 35, 10, 1.5, 8, red)
	// Covered: the shaft's middle and the head just behind the tip; not
	// covered: beyond the tip and behind the tail, or beside the shaft.
	for _, p := range []struct {
		x, y int
		on   bool
	}{{15, 9, true}, {33, 9, true}, {29, 7, true}, {37, 9, false}, {2, 9, false}, {15, 5, false}} {
		if on := img.RGBAAt(p.x, p.y).A > 128; on != p.on {
			t.Errorf("pixel (%d, %d) covered %v, want %v", p.x, p.y, on, p.on)
		}
	}
}

func TestCanvasBlend(t *testing.T) {
	// Half-transparent black over white gives mid grey (Porter–Duff "over").
	img := image.NewRGBA(image.Rect(0, 0, 4, 4))
	c := NewCanvas(img)
	c.FillRect(0, 0, 4, 4, white)
	c.FillRect(1, 1, 3, 3, color.RGBA{0, 0, 0, 128})
	if got := img.RGBAAt(1, 1); got.R != 127 || got.A != 255 {
		t.Errorf("blend = %v, want R 127, A 255", got)
	}
	if got := img.RGBAAt(0, 0); got != white {
		t.Errorf("outside = %v, want white", got)
	}
}

func TestTransformMatchesFill(t *testing.T) {
	// Each grid point's pixel position lies in a pixel Fill paints with that
	// point's value (nearest sampling).
	const nx, ny, w, h = 8, 5, 24, 15
	v := make([]float64, nx*ny)
	for i := range v {
		v[i] = float64(i)
	}
	g := Grid{v, nx, ny}
	for _, flip := range []bool{false, true} {
		img := image.NewRGBA(image.Rect(0, 0, w, h))
		r := Range{0, float64(nx*ny - 1)}
		s := Magnitude()
		if err := FillImage(img, g, r, s, FillOptions{FlipY: flip}); err != nil {
			t.Fatal(err)
		}
		tr := Transform{Nx: nx, Ny: ny, W: w, H: h, FlipY: flip}
		for j := range ny {
			for i := range nx {
				x, y := tr.Pixel(Point{float64(i), float64(j)})
				if got, want := img.RGBAAt(int(x), int(y)), s.Value(v[j*nx+i], r); got != want {
					t.Errorf("flip %v: point (%d, %d) at pixel (%g, %g) is %v, want %v", flip, i, j, x, y, got, want)
				}
			}
		}
	}
}

func TestSegmentsPeriodicCopies(t *testing.T) {
	// A segment in the wrap-around cell (x from 15.5 to 15.5 across y) of a
	// 16-wide periodic grid shows at the left edge when drawn periodically.
	img := image.NewRGBA(image.Rect(0, 0, 64, 16))
	c := NewCanvas(img)
	tr := Transform{Window: Window{0, 0, 16, 4}, Nx: 16, Ny: 4, W: 64, H: 16}
	segs := []Segment{{Point{16.25, 1}, Point{16.25, 3}}}
	c.Segments(segs, tr, false, 1, white)
	if coverage(img) != 0 {
		t.Fatal("segment outside the window drawn without periodic copies")
	}
	c.Segments(segs, tr, true, 1, white)
	if img.RGBAAt(1, 8).A == 0 {
		t.Error("periodic copy at x = 0.25 missing")
	}
}
