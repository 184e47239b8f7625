package palette

import "image/color"

// distinctHues are the CIE h_ab angles (degrees) of the Distinct colours,
// ordered so that neighbours in the sequence lie far apart in hue.
var distinctHues = [...]float64{265, 40, 150, 330, 95, 215, 5, 125}

// Distinct returns colour i (modulo 8) of a sequence of distinct hues for
// lines and categories on a white background: all at CIE L* = 45 and
// chroma C*ab = 55 (or the largest chroma in the sRGB gamut below it), the
// hues ordered so that consecutive colours differ most.
func Distinct(i int) color.RGBA {
	i %= len(distinctHues)
	if i < 0 {
		i += len(distinctHues)
	}
	r, g, b := lchPoint(45, 55, distinctHues[i])
	return color.RGBA{to8(r), to8(g), to8(b), 255}
}
