package figure

import (
	"image/color"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// keyEntry is one item of the key printed under a figure: a symbol and a
// text, or a text alone.
type keyEntry struct {
	line   *draw.LineStyle // a line sample
	patch  color.Color     // a filled square
	hatch  bool            // hatched instead of filled
	arrow  vg.Length       // an arrow of this length
	arrowC color.Color
	text   string
}

const (
	keySymbol = 22 // symbol width, points
	keyGap    = 4  // between symbol and text
	keySep    = 16 // between entries
)

func (c *canvas) entryWidth(e keyEntry) vg.Length {
	w := c.label.Width(e.text)
	switch {
	case e.arrow > 0:
		w += e.arrow + vg.Points(keyGap)
	case e.line != nil || e.patch != nil:
		w += vg.Points(keySymbol + keyGap)
	}
	return w
}

// keyRows splits the entries into rows fitting width.
func (c *canvas) keyRows(entries []keyEntry, width vg.Length) [][]keyEntry {
	var rows [][]keyEntry
	var row []keyEntry
	var used vg.Length
	for _, e := range entries {
		w := c.entryWidth(e)
		if len(row) > 0 && used+vg.Points(keySep)+w > width {
			rows = append(rows, row)
			row, used = nil, 0
		}
		if len(row) > 0 {
			used += vg.Points(keySep)
		}
		row = append(row, e)
		used += w
	}
	if len(row) > 0 {
		rows = append(rows, row)
	}
	return rows
}

// keySpace returns the height the key takes under a figure of that width.
func (c *canvas) keySpace(entries []keyEntry, width vg.Length) vg.Length {
	if len(entries) == 0 {
		return 0
	}
	rows := c.keyRows(entries, width-vg.Points(8))
	return c.keyRowHeight()*vg.Length(len(rows)) + vg.Points(8)
}

func (c *canvas) keyRowHeight() vg.Length { return c.label.Height("Mg") * 1.45 }

// drawKey draws the entries in rows at the bottom of area, centred, and
// returns the area left above them.
func (c *canvas) drawKey(area draw.Canvas, entries []keyEntry) draw.Canvas {
	if len(entries) == 0 {
		return area
	}
	width := area.Max.X - area.Min.X - vg.Points(8)
	rows := c.keyRows(entries, width)
	rh := c.keyRowHeight()
	y := area.Min.Y + vg.Points(4) + rh*vg.Length(len(rows)) - rh/2
	for _, row := range rows {
		var total vg.Length
		for i, e := range row {
			if i > 0 {
				total += vg.Points(keySep)
			}
			total += c.entryWidth(e)
		}
		x := (area.Min.X+area.Max.X)/2 - total/2
		for _, e := range row {
			x = c.drawEntry(area, e, x, y)
			x += vg.Points(keySep)
		}
		y -= rh
	}
	area.Min.Y += c.keySpace(entries, area.Max.X-area.Min.X)
	return area
}

// drawEntry draws one key entry with its left end at x and its middle at
// y, and returns where it ends.
func (c *canvas) drawEntry(area draw.Canvas, e keyEntry, x, y vg.Length) vg.Length {
	half := c.label.Height("M") / 2
	switch {
	case e.arrow > 0:
		drawArrow(area, vg.Point{X: x, Y: y}, vg.Point{X: x + e.arrow, Y: y}, e.arrowC, vg.Points(1))
		x += e.arrow + vg.Points(keyGap)
	case e.line != nil:
		area.StrokeLine2(*e.line, x, y, x+vg.Points(keySymbol), y)
		x += vg.Points(keySymbol + keyGap)
	case e.patch != nil:
		r := vg.Rectangle{Min: vg.Point{X: x + vg.Points(4), Y: y - half}, Max: vg.Point{X: x + vg.Points(keySymbol-4), Y: y + half}}
		if e.hatch {
			st := draw.LineStyle{Color: e.patch, Width: vg.Points(1)}
			for k := vg.Length(0); k < 3*half; k += vg.Points(3) {
				// Diagonal strokes clipped to the square.
				x0, y0 := r.Min.X+k, r.Min.Y
				x1, y1 := x0+2*half, y0+2*half
				if x1 > r.Max.X {
					y1 -= x1 - r.Max.X
					x1 = r.Max.X
				}
				if x0 < r.Max.X {
					area.StrokeLine2(st, x0, y0, x1, y1)
				}
			}
		} else {
			area.FillPolygon(e.patch, []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}})
		}
		area.StrokeLines(frameStyle(), []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
		x += vg.Points(keySymbol + keyGap)
	}
	area.FillText(c.label, vg.Point{X: x, Y: y}, e.text)
	return x + c.label.Width(e.text)
}

// drawArrow draws an arrow from tail to tip with a filled head.
func drawArrow(c draw.Canvas, tail, tip vg.Point, col color.Color, width vg.Length) {
	d := tip.Sub(tail)
	l := vg.Length(hypot(float64(d.X), float64(d.Y)))
	if l == 0 {
		return
	}
	head := min(vg.Points(5), 0.45*l)
	u := d.Scale(1 / l)
	n := vg.Point{X: -u.Y, Y: u.X}
	base := tip.Sub(u.Scale(head))
	c.StrokeLine2(draw.LineStyle{Color: col, Width: width}, tail.X, tail.Y, base.X+u.X*head/3, base.Y+u.Y*head/3)
	c.FillPolygon(col, []vg.Point{tip, base.Add(n.Scale(head * 0.42)), base.Sub(n.Scale(head * 0.42))})
}
