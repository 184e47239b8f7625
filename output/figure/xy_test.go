package figure

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math"
	"strings"
	"testing"
)

// markerCentres draws one single-point line (a marker alone) per point,
// each in a colour of its own, and returns the centres of the pixels of
// each colour.
func markerCentres(t *testing.T, f *XY, pts [][2]float64) [][2]float64 {
	t.Helper()
	cols := []color.RGBA{{255, 0, 0, 255}, {0, 255, 0, 255}, {0, 0, 255, 255}}
	f.Lines = nil
	for k, p := range pts {
		f.Lines = append(f.Lines, Line{X: []float64{p[0]}, Y: []float64{p[1]}, Color: cols[k]})
	}
	img, err := f.Draw(Size{Width: 640, Height: 420})
	if err != nil {
		t.Fatal(err)
	}
	out := make([][2]float64, len(pts))
	for k := range pts {
		var sx, sy float64
		n := 0
		for y := range img.Bounds().Dy() {
			for x := range img.Bounds().Dx() {
				if img.RGBAAt(x, y) == cols[k] {
					sx, sy, n = sx+float64(x), sy+float64(y), n+1
				}
			}
		}
		if n < 9 {
			t.Fatalf("point %d: %d pixels of its colour, want a marker", k, n)
		}
		out[k] = [2]float64{sx / float64(n), sy / float64(n)}
	}
	return out
}

// TestXYPointsAtTheirPixels checks that the markers fall where a linear
// axis (or a logarithmic abscissa) puts them: the ratios of pixel
// distances equal the ratios of the data distances, and y grows upwards
// (common practice for plots; the pixel positions are measured on the
// image, independently of the plotting code).
func TestXYPointsAtTheirPixels(t *testing.T) {
	pts := [][2]float64{{1, 1}, {2, 4}, {4, 2}}
	c := markerCentres(t, &XY{XLabel: "x", YLabel: "y"}, pts)
	rx := (c[1][0] - c[0][0]) / (c[2][0] - c[0][0])
	ry := (c[1][1] - c[0][1]) / (c[2][1] - c[0][1])
	if math.Abs(rx-1.0/3) > 0.01 || math.Abs(ry-3) > 0.06 || c[1][1] >= c[2][1] {
		t.Errorf("linear axes: pixel ratios x %.4f (want 1/3), y %.4f (want 3); centres %v", rx, ry, c)
	}
	// on a logarithmic abscissa 1, 10, 1000 are spaced 1:2
	logPts := [][2]float64{{1, 1}, {10, 2}, {1000, 3}}
	c = markerCentres(t, &XY{XLabel: "x", YLabel: "y", LogX: true}, logPts)
	if rx := (c[1][0] - c[0][0]) / (c[2][0] - c[0][0]); math.Abs(rx-1.0/3) > 0.01 {
		t.Errorf("logarithmic abscissa: pixel ratio %.4f, want 1/3", rx)
	}
	// values of small magnitude are drawn the same once scaled
	small := [][2]float64{{1e-6, 1e-5}, {2e-6, 4e-5}, {4e-6, 2e-5}}
	c = markerCentres(t, &XY{XLabel: "x", YLabel: "y"}, small)
	if rx := (c[1][0] - c[0][0]) / (c[2][0] - c[0][0]); math.Abs(rx-1.0/3) > 0.01 {
		t.Errorf("small values: pixel ratio %.4f, want 1/3", rx)
	}
}

// TestXYDrawsLinesWithLegend checks a figure with lines of several points
// and a legend: it decodes as PNG at the size asked for (image/png) and
// holds each line's colour.
func TestXYDrawsLinesWithLegend(t *testing.T) {
	red, blue := color.RGBA{200, 30, 30, 255}, color.RGBA{30, 30, 200, 255}
	f := &XY{Title: "eddy forcing against shear", XLabel: "model.u1 (m s⁻¹)", YLabel: "eddy_per_day (day⁻¹)", Lines: []Line{
		{Label: "rate = 5e-06", X: []float64{12, 14, 16}, Y: []float64{-0.01, 0.002, 0.01}, Color: red},
		{Label: "rate = 2e-05", X: []float64{12, 14, 16}, Y: []float64{0.02, 0.001, -0.004}, Color: blue},
	}}
	for _, s := range []Size{{Width: 480, Height: 300}, {Width: 960, Height: 600, DPI: 192}} {
		b, err := PNG(f, s)
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		if img.Bounds() != image.Rect(0, 0, s.Width, s.Height) {
			t.Errorf("bounds %v at %+v", img.Bounds(), s)
		}
		found := map[color.RGBA]int{}
		for y := range s.Height {
			for x := range s.Width {
				r, g, b, a := img.At(x, y).RGBA()
				c := color.RGBA{uint8(r >> 8), uint8(g >> 8), uint8(b >> 8), uint8(a >> 8)}
				if c == red || c == blue {
					found[c]++
				}
			}
		}
		if found[red] < 50 || found[blue] < 50 {
			t.Errorf("at %+v: %d red and %d blue pixels", s, found[red], found[blue])
		}
	}
}

// TestXYBadInputs checks that bad inputs are refused, naming the field.
func TestXYBadInputs(t *testing.T) {
	for _, tc := range []struct {
		f    XY
		want string
	}{
		{XY{}, "XY.Lines"},
		{XY{Lines: []Line{{X: []float64{1, 2}, Y: []float64{1}}}}, "XY.Lines[0]"},
		{XY{Lines: []Line{{}}}, "no point"},
		{XY{Lines: []Line{{X: []float64{1}, Y: []float64{math.NaN()}}}}, "XY.Lines[0].Y[0]"},
		{XY{Lines: []Line{{X: []float64{1}, Y: []float64{1}}, {X: []float64{0, 1}, Y: []float64{1, 2}}}, LogX: true}, "XY.Lines[1].X[0]"},
	} {
		if _, err := tc.f.Draw(Size{Width: 400, Height: 300}); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: %v, want an error naming %s", tc.f, err, tc.want)
		}
	}
}
