package figure

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/plot"

	"github.com/eddyblock/eddyblock/output/palette"
)

// sampleField evaluates f(x, y) (metres) on the periodic grid of Field.
func sampleField(nx, ny int, lx, ly float64, f func(x, y float64) float64) Field {
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = f(float64(i)*lx/float64(nx), float64(j)*ly/float64(ny))
		}
	}
	return Field{Values: v, Nx: nx, Ny: ny, Lx: lx, Ly: ly}
}

func gauss(x, y, x0, y0, r float64) float64 {
	return math.Exp(-((x-x0)*(x-x0) + (y-y0)*(y-y0)) / (r * r))
}

const lx, ly = 20000e3, 10000e3

// samples are one figure of each kind, in an invented scenario: a dipole
// block at x = 11 000 km, a wave source upstream of it and a sponge band
// downstream.
func samples() map[string]Figure {
	const nx, ny = 64, 32
	block := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 150*gauss(x, y, 11000e3, 6500e3, 1500e3) - 150*gauss(x, y, 11000e3, 3500e3, 1500e3)
	})
	tend := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 5.4*gauss(x, y, 10500e3, 6500e3, 1200e3) - 4*gauss(x, y, 10500e3, 3500e3, 1200e3) +
			2*gauss(x, y, 8000e3, 5000e3, 900e3)*math.Sin(2*math.Pi*x/1500e3)
	})
	part := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return -0.8*gauss(x, y, 11000e3, 6500e3, 1800e3) + 0.5*gauss(x, y, 11000e3, 3500e3, 1800e3)
	})
	source := sampleField(nx, ny, lx, ly, func(x, y float64) float64 { return gauss(x, y, 8500e3, 5000e3, 1250e3) })
	sponge := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		if x >= 14000e3 {
			return 1
		}
		return 0
	})
	ke := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 0.2 + 30*gauss(x, y, 9000e3, 5000e3, 2000e3)
	})
	psi := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 1.5e7*(gauss(x, y, 11000e3, 6500e3, 1500e3)-gauss(x, y, 11000e3, 3500e3, 1500e3)) - 1.6e7*math.Sin(2*math.Pi*y/ly)
	})
	eu := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 40 * gauss(x, y, 8000e3, 5000e3, 2000e3) * math.Cos(2*math.Pi*(y-5000e3)/6000e3)
	})
	ev := sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return 25 * gauss(x, y, 9000e3, 5000e3, 2000e3) * (y - 5000e3) / 2000e3
	})
	outline := []Contour{{Field: block, Levels: []float64{-100, -50, 50, 100}, Color: color.Black, Width: 1.2, Label: "block (±50, ±100 m)"}}
	masks := []Mask{
		{Field: source, Threshold: 0.5, Color: color.RGBA{0, 110, 60, 255}, Label: "wave source (half amplitude)"},
		{Field: sponge, Threshold: 0.5, Color: color.RGBA{90, 90, 90, 255}, Hatch: true, Label: "sponge"},
	}
	var k, e1, e2, days, inj, drag, idx []float64
	for i := 1; i <= 42; i++ {
		kk := float64(i) * 2 * math.Pi / lx
		k = append(k, kk)
		e1 = append(e1, 1e6*math.Pow(kk/3e-6, -3)/(1+math.Pow(3e-6/kk, 4)))
		e2 = append(e2, 3e5*math.Pow(kk/3e-6, -3)/(1+math.Pow(2e-6/kk, 4)))
	}
	e2[41] = 0 // beyond a truncation: left out of a log plot
	x := 1.0
	for i := 0; i <= 120; i++ {
		d := float64(i)
		days = append(days, d)
		inj = append(inj, 5.1e-6+1e-7*math.Sin(d/3))
		drag = append(drag, -3.8e-6*(1-math.Exp(-d/8)))
		x = 1.028 + 0.8*(x-1.028) + 0.02*math.Sin(d*1.7)*math.Cos(d*0.37)
		idx = append(idx, x)
	}
	return map[string]Figure{
		"map": &Map{Title: "Eddy height tendency, days 30–120", Panels: []Panel{{Field: tend}},
			Units: "m day⁻¹", Contours: outline, Masks: masks},
		"panels": &Map{Title: "Eddy height tendency and its two parts",
			Panels: []Panel{{"total", tend}, {"vorticity flux", tend}, {"interface flux", part}},
			Units:  "m day⁻¹", Contours: outline[:1]},
		"positive": &Map{Title: "Eddy kinetic energy, upper layer", Panels: []Panel{{Field: ke}}, Units: "m² s⁻²"},
		"vectors": &Vectors{Title: "E-vectors over the mean streamfunction, upper layer", U: eu, V: ev,
			Units: "m² s⁻²", Stream: psi, StreamName: "mean ψ₁", StreamUnits: "m² s⁻¹", Masks: masks[:1]},
		"spectra": &Spectra{Title: "Kinetic energy spectra", XLabel: "total wavenumber K (rad m⁻¹)",
			YLabel: "energy density (m³ s⁻²)", Lines: []Line{{Label: "upper layer", X: k, Y: e1}, {Label: "lower layer", X: k, Y: e2}}},
		"series": &Series{Title: "Energy budget", YLabel: "rate (m² s⁻³)",
			Lines: []Line{{Label: "wave source", X: days, Y: inj}, {Label: "Ekman drag", X: days, Y: drag}}},
		"distribution": &Distribution{Title: "Block index", Label: "block index", Days: days, Values: idx},
	}
}

func TestPNGSizes(t *testing.T) {
	// Every figure decodes as PNG (image/png, the PNG specification) at the
	// size asked for, also at twice the resolution.
	dir := os.Getenv("EDDYBLOCK_FIGURE_SAMPLES") // write the figures there to look at them
	for name, f := range samples() {
		for _, s := range []Size{{Width: 480, Height: 300}, {Width: 960, Height: 600, DPI: 192}} {
			b, err := PNG(f, s)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			img, err := png.Decode(bytes.NewReader(b))
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			if got := img.Bounds(); got != image.Rect(0, 0, s.Width, s.Height) {
				t.Errorf("%s at %+v: image bounds %v", name, s, got)
			}
			if dir != "" && s.DPI == 0 {
				if err := os.WriteFile(filepath.Join(dir, "figure_"+name+".png"), b, 0o644); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
}

// bumpField is cos(2π(x−xa)/Lx) + cos(2π(y−ya)/Ly): its maximum 2 is at
// (xa, ya) only, its minimum −2 at (xa + Lx/2, ya + Ly/2) only.
func bumpField(nx, ny int, xa, ya, offset float64) Field {
	return sampleField(nx, ny, lx, ly, func(x, y float64) float64 {
		return offset + math.Cos(2*math.Pi*(x-xa)/lx) + math.Cos(2*math.Pi*(y-ya)/ly)
	})
}

// centroid returns the mean pixel centre of the pixels of r coloured with
// entries e0…e1 of scale s (bilinear sampling reaches the very end entry
// only within a fraction of a pixel of an extreme, so one entry of slack).
func centroid(img *image.RGBA, r image.Rectangle, s *palette.Scale, e0, e1 int) (x, y float64, n int) {
	for py := r.Min.Y; py < r.Max.Y; py++ {
		for px := r.Min.X; px < r.Max.X; px++ {
			if e := entryOf(s, img.RGBAAt(px, py)); e >= e0 && e <= e1 {
				x += float64(px) + 0.5
				y += float64(py) + 0.5
				n++
			}
		}
	}
	return x / float64(n), y / float64(n), n
}

// entryOf returns the index of the scale entry equal to c, or −1.
func entryOf(s *palette.Scale, c color.RGBA) int {
	for i := range s.Len() {
		if s.Entry(i) == c {
			return i
		}
	}
	return -1
}

func TestMapExtremesAtTheirPixels(t *testing.T) {
	// A field with its maximum at (5000 km, 6250 km) and its minimum at
	// (15000 km, 1250 km) (periodic in y), both grid points of a 64×32 grid: the extreme
	// colours of the scale fall on the pixels of those positions, within
	// two pixels; the axes put x = 0…20 000 km and y = 0…10 000 km on the
	// frame of the data area.
	const xa, ya = 5000e3, 6250e3
	for _, c := range []struct {
		name   string
		offset float64
		kind   ScaleKind
		scale  *palette.Scale
	}{
		{"signed", 0, AutoScale, palette.Signed()},
		{"positive", 3, AutoScale, palette.Magnitude()},
		{"positive-explicit", 3, Positive, palette.Magnitude()},
	} {
		m := &Map{Panels: []Panel{{Field: bumpField(64, 32, xa, ya, c.offset)}}, Scale: c.kind, Units: "m"}
		img, l, err := m.draw(Size{Width: 640, Height: 360})
		if err != nil {
			t.Fatal(err)
		}
		r := l.pix[0]
		for _, e := range []struct {
			entry int
			x, y  float64
		}{{c.scale.Len() - 1, xa, ya}, {0, math.Mod(xa+lx/2, lx), math.Mod(ya+ly/2, ly)}} {
			wx := float64(r.Min.X) + e.x/lx*float64(r.Dx())
			wy := float64(r.Min.Y) + (1-e.y/ly)*float64(r.Dy())
			x, y, n := centroid(img, r, c.scale, max(0, e.entry-1), min(c.scale.Len()-1, e.entry+1))
			if n == 0 || math.Abs(x-wx) > 2 || math.Abs(y-wy) > 2 {
				t.Errorf("%s: entry %d on %d pixels centred at (%.1f, %.1f), want (%.1f, %.1f)", c.name, e.entry, n, x, y, wx, wy)
			}
		}
		// The frame gonum draws round the data area lies on the painted
		// area's edge: dark pixels within a pixel of it, left and top.
		midY, midX := (r.Min.Y+r.Max.Y)/2, (r.Min.X+r.Max.X)/2
		if !darkNear(img, r.Min.X, midY, true) || !darkNear(img, midX, r.Min.Y, false) {
			t.Errorf("%s: no frame line at the painted area's edge %v", c.name, r)
		}
		// The colour bar runs from the scale's first entry at the bottom to
		// its last at the top (within two entries: the frame covers the
		// outermost pixel rows).
		b := l.bpix
		bx := (b.Min.X + b.Max.X) / 2
		top, bottom := entryOf(c.scale, img.RGBAAt(bx, b.Min.Y+1)), entryOf(c.scale, img.RGBAAt(bx, b.Max.Y-2))
		if top < c.scale.Len()-3 || bottom < 0 || bottom > 2 {
			t.Errorf("%s: colour bar runs from entry %d to %d", c.name, bottom, top)
		}
		if c.kind != Positive && c.offset == 0 {
			// Zero, at the bar's middle, is the neutral centre.
			if mid := entryOf(c.scale, img.RGBAAt(bx, (b.Min.Y+b.Max.Y)/2)); mid < palette.TableSize/2-2 || mid > palette.TableSize/2+2 {
				t.Errorf("%s: colour bar middle is entry %d", c.name, mid)
			}
		}
	}
}

func darkNear(img *image.RGBA, x, y int, horizontal bool) bool {
	for d := -2; d <= 1; d++ {
		px, py := x, y
		if horizontal {
			px += d
		} else {
			py += d
		}
		if c := img.RGBAAt(px, py); int(c.R)+int(c.G)+int(c.B) < 3*128 {
			return true
		}
	}
	return false
}

func TestPanelsShareScaleAndAlign(t *testing.T) {
	// Two panels of the same field on one scale: the same pixels in each,
	// data areas of the same size at the same height.
	f := bumpField(32, 16, 5000e3, 5000e3, 0)
	g := bumpField(32, 16, 5000e3, 5000e3, 0)
	for i := range g.Values {
		g.Values[i] *= 0.5
	}
	m := &Map{Panels: []Panel{{"a", f}, {"b", g}}, Units: "m"}
	img, l, err := m.draw(Size{Width: 800, Height: 300})
	if err != nil {
		t.Fatal(err)
	}
	a, b := l.pix[0], l.pix[1]
	if a.Dy() != b.Dy() || a.Min.Y != b.Min.Y || abs(a.Dx()-b.Dx()) > 1 {
		t.Fatalf("panels at %v and %v", a, b)
	}
	// Equal scales in x and y: width/height = Lx/Ly = 2 to within a pixel.
	if math.Abs(float64(a.Dx())-2*float64(a.Dy())) > 2 {
		t.Errorf("panel %v is not twice as wide as high", a)
	}
	// The second panel (half the values) reaches only the middle of the
	// shared scale: its maximum colour is entry 128 + 64 (±1).
	s := palette.Signed()
	hi := 0
	for py := b.Min.Y + 2; py < b.Max.Y-2; py++ {
		for px := b.Min.X + 2; px < b.Max.X-2; px++ {
			hi = max(hi, entryOf(s, img.RGBAAt(px, py)))
		}
	}
	if hi < 191 || hi > 193 {
		t.Errorf("half field reaches entry %d, want 192", hi)
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

func TestBadInputs(t *testing.T) {
	good := bumpField(8, 4, 0, 0, 0)
	nan := bumpField(8, 4, 0, 0, 0)
	nan.Values[8*2+3] = math.NaN()
	short := good
	short.Values = good.Values[:31]
	other := good
	other.Lx = 1e6
	line := []float64{1, 2, 3}
	size := Size{Width: 400, Height: 300}
	for _, c := range []struct {
		name string
		f    Figure
		s    Size
		want string
	}{
		{"zero size", &Map{Panels: []Panel{{Field: good}}}, Size{}, "size 0×0"},
		{"small size", &Spectra{Lines: []Line{{X: line, Y: line}}}, Size{Width: 100, Height: 50}, "size 100×50"},
		{"negative DPI", &Map{Panels: []Panel{{Field: good}}}, Size{Width: 400, Height: 300, DPI: -1}, "DPI -1"},
		{"no panel", &Map{}, size, "Map.Panels: no panel"},
		{"NaN", &Map{Panels: []Panel{{Field: good}, {Field: nan}}}, size, "Map.Panels[1].Field: value NaN at i = 3, j = 2"},
		{"short", &Map{Panels: []Panel{{Field: short}}}, size, "Map.Panels[0].Field: 31 values, want Nx×Ny = 8×4 = 32"},
		{"zero grid", &Map{Panels: []Panel{{Field: Field{Lx: 1, Ly: 1}}}}, size, "grid size 0×0"},
		{"zero domain", &Map{Panels: []Panel{{Field: Field{Values: good.Values, Nx: 8, Ny: 4}}}}, size, "domain 0 m × 0 m"},
		{"domains", &Map{Panels: []Panel{{Field: good}, {Field: other}}}, size, "Map.Panels[1].Field: domain"},
		{"signed range", &Map{Panels: []Panel{{Field: good}}, Scale: Signed, Lo: -1, Hi: 2}, size, "Lo = −Hi"},
		{"range", &Map{Panels: []Panel{{Field: good}}, Lo: 2, Hi: 1}, size, "Map.Lo, Map.Hi"},
		{"percentile", &Map{Panels: []Panel{{Field: good}}, Percentile: 100}, size, "Map.Percentile"},
		{"contour field", &Map{Panels: []Panel{{Field: good}}, Contours: []Contour{{Field: nan, Levels: []float64{0}}}}, size, "Map.Contours[0].Field: value NaN"},
		{"contour levels", &Map{Panels: []Panel{{Field: good}}, Contours: []Contour{{Field: good}}}, size, "Map.Contours[0].Levels: no level"},
		{"mask domain", &Map{Panels: []Panel{{Field: good}}, Masks: []Mask{{Field: other}}}, size, "Map.Masks[0].Field: domain"},
		{"vectors", &Vectors{U: good, V: bumpField(16, 4, 0, 0, 0)}, size, "Vectors.V: grid 16×4"},
		{"vectors NaN", &Vectors{U: nan, V: good}, size, "Vectors.U: value NaN"},
		{"stream", &Vectors{U: good, V: good, Stream: short}, size, "Vectors.Stream: 31 values"},
		{"spectra x", &Spectra{Lines: []Line{{X: []float64{0, 1, 2}, Y: line}}}, size, "Spectra.Lines[0].X[0] = 0: a logarithmic axis needs positive values"},
		{"spectra y", &Spectra{Lines: []Line{{X: line, Y: []float64{1, 0, 0}}}}, size, "Spectra.Lines[0]: 1 positive Y values"},
		{"series lengths", &Series{Lines: []Line{{X: line, Y: line}, {X: line, Y: line[:2]}}}, size, "Series.Lines[1]: 3 X values but 2 Y values"},
		{"series NaN", &Series{Lines: []Line{{X: line, Y: []float64{1, math.NaN(), 3}}}}, size, "Series.Lines[0].Y[1] = NaN"},
		{"series none", &Series{}, size, "Series.Lines: no line"},
		{"distribution", &Distribution{Days: line, Values: []float64{1, math.Inf(1), 2}}, size, "Distribution.Values[1] = +Inf"},
		{"distribution lengths", &Distribution{Days: line, Values: line[:2]}, size, "3 days but 2 values"},
	} {
		var buf bytes.Buffer
		err := WritePNG(&buf, c.f, c.s)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: %d bytes written despite the error", c.name, buf.Len())
		}
	}
}

func TestGonumDefaultsUntouched(t *testing.T) {
	// Drawing changes none of gonum/plot's package defaults.
	before := plot.New()
	font0 := plot.DefaultFont
	for _, f := range samples() {
		if _, err := f.Draw(Size{Width: 320, Height: 200}); err != nil {
			t.Fatal(err)
		}
	}
	after := plot.New()
	if plot.DefaultFont != font0 || after.Title.TextStyle.Font != before.Title.TextStyle.Font ||
		after.X.Tick.Label.Font != before.X.Tick.Label.Font || after.BackgroundColor != before.BackgroundColor {
		t.Error("gonum/plot defaults changed")
	}
}

func TestNiceTicks(t *testing.T) {
	// Steps of 1, 2 or 5 times a power of ten (common practice).
	for _, c := range []struct {
		lo, hi float64
		want   string
	}{
		{0, 20000, "0 5000 10000 15000 20000"},
		{0, 10000, "0 2000 4000 6000 8000 10000"},
		{-5.38, 5.38, "−4 −2 0 2 4"},
		{1.004, 1.043, "1.01 1.02 1.03 1.04"},
	} {
		var labels []string
		for _, tk := range (niceTicks{}).Ticks(c.lo, c.hi) {
			if tk.Label != "" {
				labels = append(labels, tk.Label)
			}
		}
		if got := strings.Join(labels, " "); got != c.want {
			t.Errorf("ticks on [%g, %g]: %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
	var labels []string
	for _, tk := range (logTicks{}).Ticks(3e-7, 2e-5) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if got := strings.Join(labels, " "); got != "5×10⁻⁷ 10⁻⁶ 2×10⁻⁶ 5×10⁻⁶ 10⁻⁵ 2×10⁻⁵" {
		t.Errorf("log ticks %q", got)
	}
}

func TestHistogram(t *testing.T) {
	// A probability density integrates to one; the Freedman–Diaconis rule
	// (Freedman & Diaconis 1981) gives bins of 2·IQR·n^(−1/3): for 1000
	// values evenly spread over [0, 1), IQR = 0.5 and the width is 0.1, so
	// 10 bins.
	v := make([]float64, 1000)
	for i := range v {
		v[i] = (float64(i) + 0.5) / 1000
	}
	if k := autoBins(v); k != 10 {
		t.Errorf("Freedman–Diaconis bins %d, want 10", k)
	}
	edges, dens := histogram(v, 0, 1, 10)
	sum := 0.0
	for k, d := range dens {
		sum += d * (edges[k+1] - edges[k])
		if math.Abs(d-1) > 1e-12 {
			t.Errorf("bin %d density %g, want 1 (uniform)", k, d)
		}
	}
	if math.Abs(sum-1) > 1e-12 {
		t.Errorf("density integrates to %g", sum)
	}
}

func TestFormatNum(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{{5.38, "5.38"}, {-147, "−147"}, {5e6, "5×10⁶"}, {3.21e-5, "3.21×10⁻⁵"}, {0, "0"}} {
		if got := formatNum(c.v); got != c.want {
			t.Errorf("formatNum(%g) = %q, want %q", c.v, got, c.want)
		}
	}
}

func BenchmarkMap(b *testing.B) {
	m := &Map{Panels: []Panel{{Field: bumpField(256, 128, 5000e3, 5000e3, 0)}}, Units: "m"}
	for b.Loop() {
		if _, err := m.Draw(Size{Width: 900, Height: 480}); err != nil {
			b.Fatal(err)
		}
	}
}

func TestBoundedFieldExtremes(t *testing.T) {
	// On a bounded grid the points are cell centres, x = (i+½)·Lx/Nx: a
	// Gaussian bump on point (10, 5) of 40×20 has its extreme colour at
	// x = 10.5·500 km, y = 5.5·500 km.
	const nx, ny = 40, 20
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = math.Exp(-(math.Pow(float64(i-10), 2) + math.Pow(float64(j-5), 2)) / 8)
		}
	}
	m := &Map{Panels: []Panel{{Field: Field{Values: v, Nx: nx, Ny: ny, Lx: lx, Ly: ly, Bounded: true}}}}
	img, l, err := m.draw(Size{Width: 640, Height: 360})
	if err != nil {
		t.Fatal(err)
	}
	r := l.pix[0]
	wx := float64(r.Min.X) + 10.5/nx*float64(r.Dx())
	wy := float64(r.Min.Y) + (1-5.5/ny)*float64(r.Dy())
	s := palette.Magnitude()
	x, y, n := centroid(img, r, s, s.Len()-2, s.Len()-1)
	if n == 0 || math.Abs(x-wx) > 2 || math.Abs(y-wy) > 2 {
		t.Errorf("maximum colour on %d pixels centred at (%.1f, %.1f), want (%.1f, %.1f)", n, x, y, wx, wy)
	}
}
