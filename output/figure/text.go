package figure

import (
	"math"
	"strings"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
)

// richText is a text handler for plain text whose superscript digits and
// signs (as in "m² s⁻³") are drawn as smaller raised characters, since the
// bundled fonts lack some of those glyphs.
type richText struct {
	fonts *font.Cache
}

var _ text.Handler = richText{}

// Superscript size and raise, as fractions of the font size (common
// typographic practice).
const (
	supSize  = 0.7
	supRaise = 0.38
)

// run is a piece of a line: normal text, or superscript characters already
// mapped to their normal forms.
type run struct {
	s   string
	sup bool
}

func runs(line string) []run {
	var out []run
	var b strings.Builder
	cur := false
	flush := func() {
		if b.Len() > 0 {
			out = append(out, run{b.String(), cur})
			b.Reset()
		}
	}
	for _, r := range line {
		n, sup := normalOfSuperscript(r)
		if sup != cur {
			flush()
			cur = sup
		}
		b.WriteRune(n)
	}
	flush()
	return out
}

// normalOfSuperscript returns the normal form of a superscript character
// and true, or r and false.
func normalOfSuperscript(r rune) (rune, bool) {
	switch r {
	case '⁻':
		return '−', true
	case '⁺':
		return '+', true
	case '¹':
		return '1', true
	case '²':
		return '2', true
	case '³':
		return '3', true
	}
	if r >= '⁰' && r <= '⁹' && r != 'ⁱ' && r != '⁲' && r != '⁳' {
		return '0' + (r - '⁰'), true
	}
	return r, false
}

func (h richText) Cache() *font.Cache { return h.fonts }

func (h richText) Extents(fnt font.Font) font.Extents {
	face := h.fonts.Lookup(fnt, fnt.Size)
	return face.Extents()
}

func (h richText) Lines(txt string) []string {
	return strings.Split(strings.TrimRight(txt, "\n"), "\n")
}

func (h richText) width(line string, fnt font.Font) vg.Length {
	var w vg.Length
	for _, r := range runs(line) {
		f := fnt
		if r.sup {
			f.Size *= supSize
		}
		face := h.fonts.Lookup(f, f.Size)
		w += face.Width(r.s)
	}
	return w
}

func (h richText) Box(txt string, fnt font.Font) (width, height, depth vg.Length) {
	ext := h.Extents(fnt)
	return h.width(txt, fnt), ext.Ascent, ext.Descent
}

// Draw draws the text aligned and rotated about pt as the style says, in
// the same frame as gonum's plain handler.
func (h richText) Draw(c vg.Canvas, txt string, sty text.Style, pt vg.Point) {
	txt = strings.TrimRight(txt, "\n")
	if txt == "" {
		return
	}
	c.SetColor(sty.Color)
	if sty.Rotation != 0 {
		c.Push()
		c.Rotate(sty.Rotation)
	}
	sin, cos := math.Sincos(sty.Rotation)
	pt.X, pt.Y = pt.Y*vg.Length(sin)+pt.X*vg.Length(cos), pt.Y*vg.Length(cos)-pt.X*vg.Length(sin)
	face := h.fonts.Lookup(sty.Font, sty.Font.Size)
	lines := h.Lines(txt)
	pt.Y += sty.Height(txt)*vg.Length(sty.YAlign) - face.Extents().Ascent
	for i, line := range lines {
		x := pt.X + vg.Length(sty.XAlign)*h.width(line, sty.Font)
		y := pt.Y + vg.Length(len(lines)-i)*sty.Font.Size
		for _, r := range runs(line) {
			f, dy := sty.Font, vg.Length(0)
			if r.sup {
				f.Size *= supSize
				dy = vg.Length(supRaise) * sty.Font.Size
			}
			fc := h.fonts.Lookup(f, f.Size)
			c.FillString(fc, vg.Point{X: x, Y: y + dy}, r.s)
			x += fc.Width(r.s)
		}
	}
	if sty.Rotation != 0 {
		c.Pop()
	}
}
