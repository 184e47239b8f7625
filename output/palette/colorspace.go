package palette

import "math"

// This file holds the colour-space conversions the scales are designed in:
// the sRGB transfer function and primaries (IEC 61966-2-1) and CIE 1976
// L*a*b* with the D65 white, in cylindrical form (L*, C*ab, h_ab).

// srgbDecode maps an sRGB-encoded component in [0, 1] to linear light
// (IEC 61966-2-1).
func srgbDecode(c float64) float64 {
	if c <= 0.04045 {
		return c / 12.92
	}
	return math.Pow((c+0.055)/1.055, 2.4)
}

// srgbEncode maps linear light in [0, 1] to an sRGB-encoded component
// (IEC 61966-2-1).
func srgbEncode(l float64) float64 {
	if l <= 0.0031308 {
		return 12.92 * l
	}
	return 1.055*math.Pow(l, 1/2.4) - 0.055
}

// rgbToXYZ is the linear-sRGB to CIE XYZ matrix of IEC 61966-2-1 (D65).
var rgbToXYZ = [3][3]float64{
	{0.4124, 0.3576, 0.1805},
	{0.2126, 0.7152, 0.0722},
	{0.0193, 0.1192, 0.9505},
}

// The white point is the image of sRGB white, so that greys have a* = b* = 0.
const (
	whiteX = 0.4124 + 0.3576 + 0.1805
	whiteY = 0.2126 + 0.7152 + 0.0722
	whiteZ = 0.0193 + 0.1192 + 0.9505
)

// cielab returns CIE 1976 L*a*b* of linear sRGB.
func cielab(r, g, b float64) (L, A, B float64) {
	m := &rgbToXYZ
	x := m[0][0]*r + m[0][1]*g + m[0][2]*b
	y := m[1][0]*r + m[1][1]*g + m[1][2]*b
	z := m[2][0]*r + m[2][1]*g + m[2][2]*b
	fx, fy, fz := labF(x/whiteX), labF(y/whiteY), labF(z/whiteZ)
	return 116*fy - 16, 500 * (fx - fy), 200 * (fy - fz)
}

func labF(t float64) float64 {
	const e = 216.0 / 24389 // (6/29)³
	if t > e {
		return math.Cbrt(t)
	}
	return (24389.0/27*t + 16) / 116
}

func labFInv(f float64) float64 {
	if f > 6.0/29 {
		return f * f * f
	}
	return (116*f - 16) * 27 / 24389
}

// linearOfLab returns linear sRGB of CIE 1976 L*a*b*, through the exact
// inverse of rgbToXYZ.
func linearOfLab(L, A, B float64) (r, g, b float64) {
	fy := (L + 16) / 116
	x := whiteX * labFInv(fy+A/500)
	y := whiteY * labFInv(fy)
	z := whiteZ * labFInv(fy-B/200)
	inv := inverse3(rgbToXYZ)
	r = inv[0][0]*x + inv[0][1]*y + inv[0][2]*z
	g = inv[1][0]*x + inv[1][1]*y + inv[1][2]*z
	b = inv[2][0]*x + inv[2][1]*y + inv[2][2]*z
	return r, g, b
}

// inverse3 inverts a 3×3 matrix by cofactors.
func inverse3(m [3][3]float64) [3][3]float64 {
	var c [3][3]float64
	for i := range 3 {
		for j := range 3 {
			a, b := (i+1)%3, (i+2)%3
			p, q := (j+1)%3, (j+2)%3
			c[j][i] = m[a][p]*m[b][q] - m[a][q]*m[b][p]
		}
	}
	det := m[0][0]*c[0][0] + m[0][1]*c[1][0] + m[0][2]*c[2][0]
	for i := range 3 {
		for j := range 3 {
			c[i][j] /= det
		}
	}
	return c
}

func inGamut(r, g, b float64) bool {
	const tol = 1e-9
	return r >= -tol && r <= 1+tol && g >= -tol && g <= 1+tol && b >= -tol && b <= 1+tol
}

// lchPoint returns linear sRGB of CIE L*, chroma C*ab and hue angle h
// (degrees) or, if that lies outside the sRGB gamut, of the largest chroma
// below c at the same L* and h that lies inside it.
func lchPoint(lstar, c, h float64) (r, g, b float64) {
	ca, sa := math.Cos(h*math.Pi/180), math.Sin(h*math.Pi/180)
	r, g, b = linearOfLab(lstar, c*ca, c*sa)
	if !inGamut(r, g, b) {
		lo, hi := 0.0, c
		for range 40 {
			mid := 0.5 * (lo + hi)
			if inGamut(linearOfLab(lstar, mid*ca, mid*sa)) {
				lo = mid
			} else {
				hi = mid
			}
		}
		r, g, b = linearOfLab(lstar, lo*ca, lo*sa)
	}
	return clamp01(r), clamp01(g), clamp01(b)
}

func clamp01(x float64) float64 {
	if x < 0 {
		return 0
	}
	if x > 1 {
		return 1
	}
	return x
}

// to8 converts linear light to an 8-bit sRGB component, rounding to nearest.
func to8(l float64) uint8 {
	return uint8(math.Round(255 * srgbEncode(clamp01(l))))
}
