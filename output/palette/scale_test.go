package palette

import (
	"image/color"
	"math"
	"testing"
)

// refLab returns CIE 1976 L*a*b* (D65) of an 8-bit sRGB colour, computed
// here from the published formulas independently of the package: the sRGB
// transfer function and primaries of IEC 61966-2-1 and the CIE 1976 L*a*b*
// definitions.
func refLab(c color.RGBA) (L, a, b float64) {
	lin := func(u uint8) float64 {
		v := float64(u) / 255
		if v <= 0.04045 {
			return v / 12.92
		}
		return math.Pow((v+0.055)/1.055, 2.4)
	}
	r, g, bl := lin(c.R), lin(c.G), lin(c.B)
	x := (0.4124*r + 0.3576*g + 0.1805*bl) / 0.9505
	y := 0.2126*r + 0.7152*g + 0.0722*bl
	z := (0.0193*r + 0.1192*g + 0.9505*bl) / 1.0890
	f := func(t float64) float64 {
		if t > math.Pow(6.0/29, 3) {
			return math.Cbrt(t)
		}
		return t/(3*(6.0/29)*(6.0/29)) + 4.0/29
	}
	return 116*f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))
}

func deltaE(c, d color.RGBA) float64 {
	l1, a1, b1 := refLab(c)
	l2, a2, b2 := refLab(d)
	return math.Sqrt((l1-l2)*(l1-l2) + (a1-a2)*(a1-a2) + (b1-b2)*(b1-b2))
}

func TestRefLab(t *testing.T) {
	// CIELAB of the sRGB primaries and white (CIE 1976 L*a*b*; sRGB IEC
	// 61966-2-1); the reference values are the widely tabulated ones, from
	// memory.
	for _, c := range []struct {
		c       color.RGBA
		L, a, b float64
	}{
		{color.RGBA{255, 0, 0, 255}, 53.24, 80.09, 67.20},
		{color.RGBA{0, 255, 0, 255}, 87.73, -86.18, 83.18},
		{color.RGBA{0, 0, 255, 255}, 32.30, 79.19, -107.86},
		{color.RGBA{255, 255, 255, 255}, 100, 0, 0},
	} {
		L, a, b := refLab(c.c)
		if math.Abs(L-c.L) > 0.05 || math.Abs(a-c.a) > 0.1 || math.Abs(b-c.b) > 0.1 {
			t.Errorf("Lab%v = (%.2f, %.2f, %.2f), want (%.2f, %.2f, %.2f)", c.c, L, a, b, c.L, c.a, c.b)
		}
	}
}

func TestPackageLabAgrees(t *testing.T) {
	// The package's own conversion (used to design the scales) agrees with
	// the independent one above, and its inverse returns the input.
	for _, c := range []color.RGBA{{255, 0, 0, 255}, {12, 200, 90, 255}, {40, 40, 160, 255}, {250, 250, 250, 255}} {
		L, a, b := cielab(srgbDecode(float64(c.R)/255), srgbDecode(float64(c.G)/255), srgbDecode(float64(c.B)/255))
		rl, ra, rb := refLab(c)
		if math.Abs(L-rl) > 1e-9 || math.Abs(a-ra) > 1e-9 || math.Abs(b-rb) > 1e-9 {
			t.Errorf("cielab%v = (%g, %g, %g), reference (%g, %g, %g)", c, L, a, b, rl, ra, rb)
		}
		r, g, bl := linearOfLab(L, a, b)
		got := color.RGBA{to8(r), to8(g), to8(bl), 255}
		if got != c {
			t.Errorf("round trip of %v gave %v", c, got)
		}
	}
}

const half = (TableSize - 1) / 2

func TestSignedCentre(t *testing.T) {
	s := Signed()
	if !s.Diverging() {
		t.Fatal("Signed is not diverging")
	}
	c := s.Entry(half)
	L, a, b := refLab(c)
	// Neutral light centre: a* = b* = 0 (a grey) and L* = 97 by design.
	if math.Abs(a) > 0.5 || math.Abs(b) > 0.5 || math.Abs(L-97) > 0.5 {
		t.Errorf("centre %v has Lab (%.2f, %.2f, %.2f), want (97, 0, 0)", c, L, a, b)
	}
	// Value zero on a range symmetric about zero takes exactly the centre.
	for _, m := range []float64{1, 3.7e-5, 1234.5} {
		r := Range{-m, m}
		if i := s.Index(r.Norm(0)); i != half {
			t.Errorf("range ±%g: zero maps to entry %d, want %d", m, i, half)
		}
		if got := s.Value(0, r); got != c {
			t.Errorf("range ±%g: Value(0) = %v, want the centre %v", m, got, c)
		}
	}
	// The next entries either side are already coloured: zero is the only
	// neutral value (common practice for a diverging scale).
	for _, i := range []int{half - 2, half + 2} {
		_, a, b := refLab(s.Entry(i))
		if math.Hypot(a, b) < 0.5 {
			t.Errorf("entry %d is grey (a* %.2f, b* %.2f)", i, a, b)
		}
	}
}

func TestSignedLightness(t *testing.T) {
	s := Signed()
	prev := math.Inf(1)
	for k := 0; k <= half; k++ {
		Lw, _, _ := refLab(s.Entry(half + k))
		Lc, _, _ := refLab(s.Entry(half - k))
		// Equal lightness at equal distances from the centre, to the 8-bit
		// rounding (one code value moves L* by at most ≈0.4).
		if math.Abs(Lw-Lc) > 0.6 {
			t.Errorf("k = %d: L* warm %.2f, cool %.2f", k, Lw, Lc)
		}
		// Lightness falls monotonically away from the centre on both sides.
		if k > 0 {
			Lw0, _, _ := refLab(s.Entry(half + k - 1))
			Lc0, _, _ := refLab(s.Entry(half - k + 1))
			if Lw >= Lw0 || Lc >= Lc0 {
				t.Errorf("k = %d: L* not falling (warm %.2f→%.2f, cool %.2f→%.2f)", k, Lw0, Lw, Lc0, Lc)
			}
		}
		prev = Lw
	}
	if prev > 34 || prev < 32 {
		t.Errorf("end lightness %.2f, designed 33", prev)
	}
	// Hues: the low side is blue (b* < 0), the high side red-orange (a*, b* > 0).
	_, a0, b0 := refLab(s.Entry(0))
	_, a1, b1 := refLab(s.Entry(TableSize - 1))
	if b0 > -40 || a1 < 30 || b1 < 20 {
		t.Errorf("ends Lab a*,b*: low (%.1f, %.1f), high (%.1f, %.1f)", a0, b0, a1, b1)
	}
}

func TestMagnitudeLightness(t *testing.T) {
	s := Magnitude()
	if s.Diverging() {
		t.Error("Magnitude claims to be diverging")
	}
	prev := math.Inf(1)
	for i := range TableSize {
		L, _, _ := refLab(s.Entry(i))
		if L >= prev {
			t.Errorf("entry %d: L* %.2f not below %.2f", i, L, prev)
		}
		prev = L
	}
	L0, _, _ := refLab(s.Entry(0))
	if math.Abs(L0-98) > 0.6 || math.Abs(prev-20) > 0.6 {
		t.Errorf("L* runs %.2f → %.2f, designed 98 → 20", L0, prev)
	}
}

func TestUniformSteps(t *testing.T) {
	// CIE 1976 ΔE between samples 16 entries apart stays within 15 % of its
	// mean along each ramp (perceptually even steps; the tolerance is ours).
	for _, c := range []struct {
		s      *Scale
		lo, hi int
	}{
		{Signed(), 0, half},
		{Signed(), half, TableSize - 1},
		{Magnitude(), 0, TableSize - 1},
	} {
		var steps []float64
		sum := 0.0
		for i := c.lo; i+16 <= c.hi; i += 16 {
			d := deltaE(c.s.Entry(i), c.s.Entry(i+16))
			steps = append(steps, d)
			sum += d
		}
		mean := sum / float64(len(steps))
		for k, d := range steps {
			if math.Abs(d/mean-1) > 0.15 {
				t.Errorf("%s entries %d–%d: ΔE step %d is %.2f, mean %.2f", c.s.Name(), c.lo, c.hi, k, d, mean)
			}
		}
	}
}

func TestAtClampsAndNaN(t *testing.T) {
	s := Signed()
	for _, c := range []struct {
		t    float64
		want int
	}{{-3, 0}, {0, 0}, {1, TableSize - 1}, {7, TableSize - 1}, {0.5, half}, {0.25, 64}} {
		if got := s.At(c.t); got != s.Entry(c.want) {
			t.Errorf("At(%g) = %v, want entry %d = %v", c.t, got, c.want, s.Entry(c.want))
		}
	}
	if got := s.At(math.NaN()); got != (color.RGBA{}) {
		t.Errorf("At(NaN) = %v, want transparent", got)
	}
	if n := len(s.Colors()); n != TableSize {
		t.Errorf("Colors has %d entries", n)
	}
}

func TestRanges(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	if r := SymmetricRange([]float64{0.5, -3, nan, 2, inf}); r != (Range{-3, 3}) {
		t.Errorf("SymmetricRange = %v, want ±3", r)
	}
	if r := MinMaxRange([]float64{4, nan, -1, 2, -inf}); r != (Range{-1, 4}) {
		t.Errorf("MinMaxRange = %v, want [-1, 4]", r)
	}
	if r := MinMaxRange([]float64{nan}); r != (Range{}) {
		t.Errorf("MinMaxRange(NaN) = %v, want zero", r)
	}
	// Percentile by linear interpolation between order statistics, Hyndman &
	// Fan (1996) definition 7: of 1…5, the 50th is 3 and the 90th is 4.6.
	vals := []float64{-5, 1, 4, -2, 3}
	if r := RobustSymmetricRange(vals, 50); r.Hi != 3 || r.Lo != -3 {
		t.Errorf("50th percentile range %v, want ±3", r)
	}
	if r := RobustSymmetricRange(vals, 90); math.Abs(r.Hi-4.6) > 1e-12 {
		t.Errorf("90th percentile range %v, want ±4.6", r)
	}
	if r := RobustSymmetricRange(vals, 100); r.Hi != 5 {
		t.Errorf("100th percentile range %v, want ±5", r)
	}
	if got := (Range{2, 2}).Norm(2); got != 0.5 {
		t.Errorf("degenerate Norm = %g, want 0.5", got)
	}
	if got := (Range{-2, 6}).Norm(0); got != 0.25 {
		t.Errorf("Norm = %g, want 0.25", got)
	}
}

func TestDistinct(t *testing.T) {
	// Equal lightness (L* = 45 by design) and clearly different neighbours:
	// consecutive colours at least 40 CIE 1976 ΔE units apart (a ΔE of a few
	// units is already noticeable, common practice).
	for i := range 8 {
		c, d := Distinct(i), Distinct(i+1)
		if L, _, _ := refLab(c); math.Abs(L-45) > 0.6 {
			t.Errorf("Distinct(%d) L* = %.2f", i, L)
		}
		if e := deltaE(c, d); e < 40 {
			t.Errorf("Distinct(%d), Distinct(%d): ΔE %.1f", i, i+1, e)
		}
	}
	if Distinct(-1) != Distinct(7) || Distinct(8) != Distinct(0) {
		t.Error("Distinct does not cycle")
	}
}

// TestNiceStep checks the 1-2-5 series of steps (common practice for axis
// ticks and contour intervals): a step of 1, 2 or 5 times a power of ten,
// the smallest of them at least 3/4 of span/n.
func TestNiceStep(t *testing.T) {
	for _, tc := range []struct {
		span float64
		n    int
		want float64
	}{
		{10, 10, 1}, {3, 10, 0.5}, {1.5, 10, 0.2}, {7, 10, 1}, {1.5e7, 12, 1e6}, {2.4e7, 12, 2e6}, {-1, 10, 0}, {0, 10, 0}, {math.Inf(1), 10, 0},
	} {
		if got := NiceStep(tc.span, tc.n); math.Abs(got-tc.want) > 1e-12*tc.want {
			t.Errorf("NiceStep(%g, %d) = %g, want %g", tc.span, tc.n, got, tc.want)
		}
	}
}
