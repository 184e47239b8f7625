package palette

import (
	"math"
	"slices"
)

// Range is the interval of values a scale spans: Lo maps to t = 0 and Hi to
// t = 1.
type Range struct {
	Lo, Hi float64
}

// Norm returns (v − Lo)/(Hi − Lo), the position of v on the scale; values
// outside the range give t outside [0, 1], which Scale.At clamps. A
// degenerate range (Lo = Hi) puts v = Lo at 1/2, values below at 0 and
// values above at 1.
func (r Range) Norm(v float64) float64 {
	if r.Hi == r.Lo {
		switch {
		case v < r.Lo:
			return 0
		case v > r.Hi:
			return 1
		case v == r.Lo:
			return 0.5
		}
		return math.NaN()
	}
	return (v - r.Lo) / (r.Hi - r.Lo)
}

// SymmetricRange returns [−m, m] with m the largest |v| over the finite
// values, the range for signed fields on the diverging scale (zero at its
// centre). Non-finite values are skipped; with none finite, or all zero, it
// returns the zero Range.
func SymmetricRange(values []float64) Range {
	m := 0.0
	for _, v := range values {
		if a := math.Abs(v); a > m && !math.IsInf(a, 1) {
			m = a
		}
	}
	return Range{-m, m}
}

// RobustSymmetricRange returns [−m, m] with m the p-th percentile (0 < p ≤
// 100) of |v| over the finite values, so that a few extreme values do not
// wash out the rest of a signed field; values beyond ±m take the end colours.
// The percentile interpolates linearly between order statistics (common
// practice). p outside (0, 100] is treated as 100.
func RobustSymmetricRange(values []float64, p float64) Range {
	if !(p > 0 && p < 100) {
		return SymmetricRange(values)
	}
	abs := make([]float64, 0, len(values))
	for _, v := range values {
		if a := math.Abs(v); !math.IsNaN(a) && !math.IsInf(a, 1) {
			abs = append(abs, a)
		}
	}
	if len(abs) == 0 {
		return Range{}
	}
	slices.Sort(abs)
	m := percentileSorted(abs, p)
	return Range{-m, m}
}

// MinMaxRange returns [min, max] over the finite values, the range for
// positive fields on the sequential scale. With no finite value it returns
// the zero Range.
func MinMaxRange(values []float64) Range {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		lo = math.Min(lo, v)
		hi = math.Max(hi, v)
	}
	if lo > hi {
		return Range{}
	}
	return Range{lo, hi}
}

// percentileSorted returns the p-th percentile of sorted x, interpolating
// linearly between the order statistics at positions (n−1)p/100.
func percentileSorted(x []float64, p float64) float64 {
	pos := (float64(len(x)) - 1) * p / 100
	i := int(pos)
	if i >= len(x)-1 {
		return x[len(x)-1]
	}
	f := pos - float64(i)
	return x[i] + f*(x[i+1]-x[i])
}

// NiceStep returns a step of 1, 2 or 5 times a power of ten close to
// span/n (at least 0.75 span/n), for contour intervals and axis ticks;
// 0 when span/n is not positive and finite.
func NiceStep(span float64, n int) float64 {
	raw := span / float64(n)
	if !(raw > 0) || math.IsInf(raw, 0) {
		return 0
	}
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= raw*0.75 {
			return m * p
		}
	}
	return 10 * p
}
