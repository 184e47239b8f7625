package palette

import (
	"image"
	"image/color"
	"math"
	"strings"
	"testing"
)

// bump is f = cos(2π(x−x0)/nx) + cos(2π(y−y0)/ny) on an nx×ny periodic grid:
// its maximum 2 is at grid point (x0, y0) only and its minimum −2 at
// (x0 + nx/2, y0 + ny/2) only.
func bump(nx, ny, x0, y0 int) Grid {
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = math.Cos(2*math.Pi*float64(i-x0)/float64(nx)) + math.Cos(2*math.Pi*float64(j-y0)/float64(ny))
		}
	}
	return Grid{v, nx, ny}
}

// centroidOf returns the mean pixel centre of the pixels of colour c.
func centroidOf(img *image.RGBA, c color.RGBA) (x, y float64, n int) {
	b := img.Bounds()
	for py := b.Min.Y; py < b.Max.Y; py++ {
		for px := b.Min.X; px < b.Max.X; px++ {
			if img.RGBAAt(px, py) == c {
				x += float64(px) + 0.5
				y += float64(py) + 0.5
				n++
			}
		}
	}
	return x / float64(n), y / float64(n), n
}

func TestFillExtremes(t *testing.T) {
	const nx, ny, x0, y0 = 32, 16, 5, 3
	g := bump(nx, ny, x0, y0)
	s := Signed()
	r := SymmetricRange(g.Values)
	for _, c := range []struct {
		name     string
		w, h     int
		o        FillOptions
		tol      float64
		minCount int
	}{
		{"nearest", 96, 48, FillOptions{FlipY: true}, 0.01, 9},
		{"nearest-noflip", 96, 48, FillOptions{}, 0.01, 9},
		{"bilinear", 160, 80, FillOptions{Sampling: Bilinear, Periodic: true, FlipY: true}, 1, 1},
		{"bilinear-open", 160, 80, FillOptions{Sampling: Bilinear}, 1, 1},
	} {
		img := image.NewRGBA(image.Rect(0, 0, c.w, c.h))
		if err := FillImage(img, g, r, s, c.o); err != nil {
			t.Fatal(err)
		}
		tr := Transform{Nx: nx, Ny: ny, W: c.w, H: c.h, FlipY: c.o.FlipY}
		for _, e := range []struct {
			entry  int
			gx, gy int
		}{{TableSize - 1, x0, y0}, {0, x0 + nx/2, y0 + ny/2}} {
			// The extreme colours sit on the pixels around the grid point of
			// the extreme (the analytic position), within a pixel.
			wx, wy := tr.Pixel(Point{float64(e.gx), float64(e.gy)})
			x, y, n := centroidOf(img, s.Entry(e.entry))
			if n < c.minCount || math.Abs(x-wx) > c.tol || math.Abs(y-wy) > c.tol {
				t.Errorf("%s: entry %d on %d pixels centred at (%.2f, %.2f), want (%.2f, %.2f)", c.name, e.entry, n, x, y, wx, wy)
			}
		}
	}
}

func TestFillZeroIsCentre(t *testing.T) {
	// A field of zeros and one positive value: the zeros take the neutral
	// centre on a symmetric range.
	g := Grid{[]float64{0, 0, 0, 1}, 2, 2}
	img := image.NewRGBA(image.Rect(0, 0, 2, 2))
	if err := FillImage(img, g, SymmetricRange(g.Values), Signed(), FillOptions{}); err != nil {
		t.Fatal(err)
	}
	if got, want := img.RGBAAt(0, 0), Signed().Entry(half); got != want {
		t.Errorf("zero painted %v, want centre %v", got, want)
	}
	if got, want := img.RGBAAt(1, 1), Signed().Entry(TableSize-1); got != want {
		t.Errorf("max painted %v, want end %v", got, want)
	}
}

func TestFillMissingAndWindow(t *testing.T) {
	g := Grid{[]float64{0, 1, math.NaN(), 3}, 4, 1}
	img := image.NewRGBA(image.Rect(0, 0, 8, 1))
	miss := color.RGBA{1, 2, 3, 255}
	// The window shows grid x in [1.5, 3.5], four pixels per grid unit: the
	// first four pixels show point 2 (NaN), the last four point 3.
	o := FillOptions{Window: Window{1.5, -0.5, 3.5, 0.5}, Missing: miss}
	if err := FillImage(img, g, Range{0, 3}, Magnitude(), o); err != nil {
		t.Fatal(err)
	}
	for px := range 8 {
		want := miss
		if px >= 4 {
			want = Magnitude().Entry(TableSize - 1)
		}
		if got := img.RGBAAt(px, 0); got != want {
			t.Errorf("pixel %d = %v, want %v", px, got, want)
		}
	}
}

func TestFillErrors(t *testing.T) {
	good := Grid{make([]float64, 6), 3, 2}
	buf := make([]byte, 4*4*4)
	s := Signed()
	for _, c := range []struct {
		name string
		err  error
		want string
	}{
		{"short values", Fill(buf, 16, 4, 4, Grid{make([]float64, 5), 3, 2}, Range{0, 1}, s, FillOptions{}), "has 5 values"},
		{"zero grid", Fill(buf, 16, 4, 4, Grid{nil, 0, 2}, Range{0, 1}, s, FillOptions{}), "grid size 0×2"},
		{"zero image", Fill(buf, 16, 0, 4, good, Range{0, 1}, s, FillOptions{}), "image size 0×4"},
		{"stride", Fill(buf, 8, 4, 4, good, Range{0, 1}, s, FillOptions{}), "stride 8"},
		{"buffer", Fill(buf[:10], 16, 4, 4, good, Range{0, 1}, s, FillOptions{}), "pixel buffer has 10 bytes"},
		{"range", Fill(buf, 16, 4, 4, good, Range{1, math.NaN()}, s, FillOptions{}), "invalid range"},
		{"scale", Fill(buf, 16, 4, 4, good, Range{0, 1}, nil, FillOptions{}), "nil scale"},
	} {
		if c.err == nil || !strings.Contains(c.err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, c.err, c.want)
		}
	}
}

func TestPainterAllocs(t *testing.T) {
	g := bump(64, 32, 3, 4)
	buf := make([]byte, 4*200*100)
	var p Painter
	s := Signed()
	r := SymmetricRange(g.Values)
	o := FillOptions{Sampling: Bilinear, Periodic: true, FlipY: true}
	allocs := testing.AllocsPerRun(5, func() {
		if err := p.Fill(buf, 800, 200, 100, g, r, s, o); err != nil {
			t.Fatal(err)
		}
	})
	if allocs != 0 {
		t.Errorf("a reused Painter allocated %g times per frame", allocs)
	}
}

func BenchmarkFill(b *testing.B) {
	g := bump(128, 64, 3, 4)
	const w, h = 512, 256
	buf := make([]byte, 4*w*h)
	s := Signed()
	r := SymmetricRange(g.Values)
	for _, c := range []struct {
		name string
		o    FillOptions
	}{{"nearest", FillOptions{FlipY: true}}, {"bilinear", FillOptions{Sampling: Bilinear, Periodic: true, FlipY: true}}} {
		b.Run(c.name, func(b *testing.B) {
			var p Painter
			for b.Loop() {
				if err := p.Fill(buf, 4*w, w, h, g, r, s, c.o); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
