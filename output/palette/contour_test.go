package palette

import (
	"math"
	"strings"
	"testing"
)

func sample(nx, ny int, f func(x, y float64) float64) Grid {
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = f(float64(i), float64(j))
		}
	}
	return Grid{v, nx, ny}
}

func totalLength(segs []Segment) float64 {
	l := 0.0
	for _, s := range segs {
		l += math.Hypot(s.B.X-s.A.X, s.B.Y-s.A.Y)
	}
	return l
}

func TestContourCircle(t *testing.T) {
	// f = (x−cx)² + (y−cy)², level r²: the contour is the circle of radius r.
	const n, cx, cy = 64, 31.3, 30.8
	for _, r := range []float64{5, 12.5, 25} {
		g := sample(n, n, func(x, y float64) float64 { return (x-cx)*(x-cx) + (y-cy)*(y-cy) })
		segs, err := Contour(nil, g, r*r, false)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range segs {
			for _, p := range []Point{s.A, s.B} {
				// Linear interpolation of f along a cell edge (h = 1) errs by at
				// most h²|f''|/8 = 1/4 (the error bound of linear interpolation),
				// so |ρ² − r²| ≤ 1/4 at every end, i.e. |ρ − r| ≤ 1/(4(ρ + r)).
				rho := math.Hypot(p.X-cx, p.Y-cy)
				if math.Abs(rho-r) > 0.25/(rho+r)+1e-12 {
					t.Errorf("r = %g: end (%.4f, %.4f) at radius %.5f", r, p.X, p.Y, rho)
				}
			}
		}
		// The segments are chords of the circle: their total is 2πr, a little
		// less (elementary geometry); within 1 % here.
		if l := totalLength(segs); math.Abs(l/(2*math.Pi*r)-1) > 0.01 {
			t.Errorf("r = %g: length %.4f, want 2πr = %.4f", r, l, 2*math.Pi*r)
		}
	}
}

func TestContourLinear(t *testing.T) {
	// A linear field is contoured exactly (linear interpolation is exact):
	// f = x + 2y, level c: every end lies on x + 2y = c, and the line crosses
	// the whole grid (0 ≤ x ≤ 15, 0 ≤ y ≤ 9): its length is known.
	g := sample(16, 10, func(x, y float64) float64 { return x + 2*y })
	const c = 13.3
	segs, err := Contour(nil, g, c, false)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range segs {
		for _, p := range []Point{s.A, s.B} {
			if math.Abs(p.X+2*p.Y-c) > 1e-12 {
				t.Errorf("end (%g, %g): x + 2y = %g, want %g", p.X, p.Y, p.X+2*p.Y, c)
			}
		}
	}
	// From (13.3, 0) to (0, 6.65).
	if l, want := totalLength(segs), math.Hypot(13.3, 6.65); math.Abs(l-want) > 1e-9 {
		t.Errorf("length %g, want %g", l, want)
	}
	// A ramp in x alone: a straight vertical line at x = 3.3 from y = 0 to 9.
	g = sample(8, 10, func(x, y float64) float64 { return x })
	segs, _ = Contour(nil, g, 3.3, false)
	for _, s := range segs {
		if math.Abs(s.A.X-3.3) > 1e-12 || math.Abs(s.B.X-3.3) > 1e-12 {
			t.Errorf("segment %v is not on x = 3.3", s)
		}
	}
	if l := totalLength(segs); math.Abs(l-9) > 1e-12 {
		t.Errorf("vertical line length %g, want 9", l)
	}
}

func TestContourPeriodic(t *testing.T) {
	// cos(2πx/16) on a periodic 16×8 grid: level 0 gives the lines x = 4 and
	// x = 12, each crossing the whole periodic height 8 (including the cells
	// that wrap from the last row to the first).
	g := sample(16, 8, func(x, y float64) float64 { return math.Cos(2 * math.Pi * x / 16) })
	segs, err := Contour(nil, g, 0, true)
	if err != nil {
		t.Fatal(err)
	}
	if l := totalLength(segs); math.Abs(l-16) > 1e-9 {
		t.Errorf("length %g, want 2 × 8", l)
	}
	for _, s := range segs {
		for _, p := range []Point{s.A, s.B} {
			if math.Abs(p.X-4) > 1e-9 && math.Abs(p.X-12) > 1e-9 {
				t.Errorf("end %v off the lines x = 4, 12", p)
			}
		}
	}
	// A level crossed only across the periodic boundary: f = 1 in column
	// 15 and 0 elsewhere, level ½: lines at x = 14.5 and between column 15
	// and column 0 (X = 15.5).
	g = sample(16, 4, func(x, y float64) float64 {
		if x == 15 {
			return 1
		}
		return 0
	})
	segs, _ = Contour(nil, g, 0.5, true)
	found := false
	for _, s := range segs {
		if math.Abs(s.A.X-15.5) < 1e-12 {
			found = true
		}
	}
	if !found || math.Abs(totalLength(segs)-8) > 1e-12 {
		t.Errorf("wrap-around contour missing: %v", segs)
	}
	segs, _ = Contour(nil, g, 0.5, false)
	if math.Abs(totalLength(segs)-3) > 1e-12 {
		t.Errorf("non-periodic grid: length %g, want 3", totalLength(segs))
	}
}

func TestContourSaddle(t *testing.T) {
	// Corners (0,0) and (1,1) at 1, the others at 0: a saddle. With level
	// 0.4 the centre (mean 0.5) is above, the high corners join, and the
	// segments cut off the low corners (1,0) and (0,1); with level 0.6 the
	// centre is below and they cut off the high corners.
	g := Grid{[]float64{1, 0, 0, 1}, 2, 2}
	for _, c := range []struct {
		level float64
		cut   [2]Point
	}{{0.4, [2]Point{{1, 0}, {0, 1}}}, {0.6, [2]Point{{0, 0}, {1, 1}}}} {
		segs, err := Contour(nil, g, c.level, false)
		if err != nil {
			t.Fatal(err)
		}
		if len(segs) != 2 {
			t.Fatalf("level %g: %d segments", c.level, len(segs))
		}
		for _, s := range segs {
			// Each segment's midpoint is nearer to one of the cut-off corners
			// than to the centre.
			mx, my := (s.A.X+s.B.X)/2, (s.A.Y+s.B.Y)/2
			dc := math.Hypot(mx-0.5, my-0.5)
			d0 := math.Min(math.Hypot(mx-c.cut[0].X, my-c.cut[0].Y), math.Hypot(mx-c.cut[1].X, my-c.cut[1].Y))
			if d0 >= dc {
				t.Errorf("level %g: segment %v does not cut off %v", c.level, s, c.cut)
			}
		}
	}
}

func TestContourNaNAndErrors(t *testing.T) {
	g := sample(4, 4, func(x, y float64) float64 { return x })
	g.Values[5] = math.NaN() // point (1, 1): its four cells get nothing
	segs, err := Contour(nil, g, 1.5, false)
	if err != nil {
		t.Fatal(err)
	}
	if l := totalLength(segs); math.Abs(l-1) > 1e-12 {
		t.Errorf("length %g, want 1 (only the cell row j = 2 stays)", l)
	}
	if _, err := Contour(nil, Grid{make([]float64, 3), 2, 2}, 0, false); err == nil || !strings.Contains(err.Error(), "has 3 values") {
		t.Errorf("wrong length: %v", err)
	}
	if _, err := Contour(nil, g, math.Inf(1), false); err == nil || !strings.Contains(err.Error(), "level") {
		t.Errorf("infinite level: %v", err)
	}
}

func TestChain(t *testing.T) {
	// The circle contour chains into one closed polyline through all the
	// segments' ends, of the same total length.
	const n, c, r = 40, 19.6, 11.0
	g := sample(n, n, func(x, y float64) float64 { return (x-c)*(x-c) + (y-c)*(y-c) })
	segs, _ := Contour(nil, g, r*r, false)
	lines := Chain(segs)
	if len(lines) != 1 {
		t.Fatalf("%d polylines, want 1", len(lines))
	}
	l := lines[0]
	if len(l) != len(segs)+1 || l[0] != l[len(l)-1] {
		t.Errorf("polyline of %d points for %d segments, closed %v", len(l), len(segs), l[0] == l[len(l)-1])
	}
	length := 0.0
	for i := 1; i < len(l); i++ {
		length += math.Hypot(l[i].X-l[i-1].X, l[i].Y-l[i-1].Y)
	}
	if math.Abs(length-totalLength(segs)) > 1e-9 {
		t.Errorf("chained length %g, segments %g", length, totalLength(segs))
	}
	// Two separate open lines (x = 3.3 and x = 6.6 in a ramp field that
	// falls again), each made of several segments.
	g = sample(10, 6, func(x, y float64) float64 { return 5 - math.Abs(x-5) })
	segs, _ = Contour(nil, g, 1.7, false)
	lines = Chain(segs)
	if len(lines) != 2 || len(lines[0]) != 6 || len(lines[1]) != 6 {
		t.Errorf("got %d polylines %v, want two of 6 points", len(lines), lines)
	}
}

func BenchmarkContour(b *testing.B) {
	g := sample(256, 128, func(x, y float64) float64 {
		return math.Cos(2*math.Pi*x/256) + math.Sin(4*math.Pi*y/128)
	})
	var segs []Segment
	for b.Loop() {
		segs, _ = Contour(segs[:0], g, 0.3, true)
	}
}
