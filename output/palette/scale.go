package palette

import (
	"image/color"
	"math"
	"sync"
)

// TableSize is the number of entries in every scale's lookup table. It is
// odd, so that the middle entry sits exactly at t = 1/2: on the signed scale
// with a range symmetric about zero, the value zero takes the neutral centre.
const TableSize = 257

// Scale is a colour scale: a lookup table of TableSize colours for t in
// [0, 1]. A Scale is immutable; the values returned by Signed and Magnitude
// are shared and safe for concurrent use.
type Scale struct {
	name      string
	diverging bool
	table     [TableSize]color.RGBA
	rgba      [TableSize][4]byte
}

// Name returns the scale's name.
func (s *Scale) Name() string { return s.name }

// Diverging reports whether the scale has a neutral centre at t = 1/2 and
// is meant for signed fields on a range symmetric about zero.
func (s *Scale) Diverging() bool { return s.diverging }

// Len returns the number of entries of the lookup table (TableSize).
func (s *Scale) Len() int { return TableSize }

// Entry returns entry i of the lookup table, 0 ≤ i < TableSize.
func (s *Scale) Entry(i int) color.RGBA { return s.table[i] }

// Index returns the lookup-table entry for t in [0, 1], rounding to the
// nearest entry; t outside [0, 1] is clamped and NaN gives -1.
func (s *Scale) Index(t float64) int {
	switch {
	case t != t:
		return -1
	case t <= 0:
		return 0
	case t >= 1:
		return TableSize - 1
	}
	return int(t*(TableSize-1) + 0.5)
}

// At returns the colour for t in [0, 1] (clamped). NaN gives the
// transparent colour.
func (s *Scale) At(t float64) color.RGBA {
	i := s.Index(t)
	if i < 0 {
		return color.RGBA{}
	}
	return s.table[i]
}

// Value returns the colour of value v on range r: At(r.Norm(v)).
func (s *Scale) Value(v float64, r Range) color.RGBA { return s.At(r.Norm(v)) }

// Colors returns the lookup table as a new slice, lowest value first (it
// satisfies gonum.org/v1/plot/palette.Palette).
func (s *Scale) Colors() []color.Color {
	c := make([]color.Color, TableSize)
	for i := range c {
		c[i] = s.table[i]
	}
	return c
}

var (
	signedOnce    = sync.OnceValue(buildSigned)
	magnitudeOnce = sync.OnceValue(buildMagnitude)
)

// Signed returns the diverging scale for signed fields, designed in CIE
// 1976 L*C*h: a neutral light grey (L* = 97, C* = 0) at t = 1/2, a cool blue
// ramp below it and a warm red one above it. Both ramps fall linearly in L*
// to 33 at the ends and grow linearly in chroma to C* = 60 there, so they
// have equal lightness and chroma at equal distances from the centre; the
// cool hue turns from h = 250° to 292° and the warm one from 62° to 38° on
// the way out.
func Signed() *Scale { return signedOnce() }

// Magnitude returns the sequential scale for positive fields: from a pale
// straw colour (L* = 98) for the lowest values through orange and crimson to
// a dark plum (L* = 20) for the highest, with CIE L* falling monotonically
// and equal CIE 1976 colour differences between entries.
func Magnitude() *Scale { return magnitudeOnce() }

// Design parameters of the signed scale (CIE L*, C*ab, h_ab in degrees).
const (
	signedCentreL = 97.0
	signedEndL    = 33.0
	signedEndC    = 60.0
	coolHue0      = 250.0
	coolHue1      = 292.0
	warmHue0      = 62.0
	warmHue1      = 38.0
)

func buildSigned() *Scale {
	s := &Scale{name: "signed", diverging: true}
	const half = (TableSize - 1) / 2
	for i := range TableSize {
		d := float64(i-half) / half // −1 … 1
		u := math.Abs(d)
		h := warmHue0 + (warmHue1-warmHue0)*u
		if d < 0 {
			h = coolHue0 + (coolHue1-coolHue0)*u
		}
		r, g, b := lchPoint(signedCentreL+(signedEndL-signedCentreL)*u, signedEndC*u, h)
		s.set(i, r, g, b)
	}
	return s
}

// magnitudeNodes are the control points of the sequential scale: CIE L*,
// C*ab and h_ab (degrees), joined by straight lines in (L*, C*, h) and then
// resampled to equal CIE 1976 ΔE steps.
var magnitudeNodes = [...][3]float64{
	{98, 12, 100},
	{80, 50, 75},
	{60, 68, 48},
	{40, 56, 15},
	{20, 34, -22},
}

func buildMagnitude() *Scale {
	s := &Scale{name: "magnitude"}
	// Dense path through the nodes, with its arc length in CIELAB.
	const dense = 4096
	type lab struct{ r, g, b float64 }
	path := make([]lab, dense+1)
	arc := make([]float64, dense+1)
	segs := float64(len(magnitudeNodes) - 1)
	var pL, pA, pB float64
	for k := range path {
		u := float64(k) / dense * segs
		j := min(int(u), len(magnitudeNodes)-2)
		f := u - float64(j)
		a, b := magnitudeNodes[j], magnitudeNodes[j+1]
		r, g, bl := lchPoint(a[0]+f*(b[0]-a[0]), a[1]+f*(b[1]-a[1]), a[2]+f*(b[2]-a[2]))
		L, A, B := cielab(r, g, bl)
		path[k] = lab{r, g, bl}
		if k > 0 {
			arc[k] = arc[k-1] + math.Sqrt((L-pL)*(L-pL)+(A-pA)*(A-pA)+(B-pB)*(B-pB))
		}
		pL, pA, pB = L, A, B
	}
	// Resample at equal arc length.
	total := arc[dense]
	k := 0
	for i := range TableSize {
		target := total * float64(i) / (TableSize - 1)
		for k < dense-1 && arc[k+1] < target {
			k++
		}
		f := 0.0
		if d := arc[k+1] - arc[k]; d > 0 {
			f = math.Min(1, math.Max(0, (target-arc[k])/d))
		}
		p, q := path[k], path[k+1]
		s.set(i, p.r+f*(q.r-p.r), p.g+f*(q.g-p.g), p.b+f*(q.b-p.b))
	}
	return s
}

func (s *Scale) set(i int, r, g, b float64) {
	c := color.RGBA{to8(r), to8(g), to8(b), 255}
	s.table[i] = c
	s.rgba[i] = [4]byte{c.R, c.G, c.B, c.A}
}
