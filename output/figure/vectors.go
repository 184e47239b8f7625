package figure

import (
	"fmt"
	"image"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/eddyblock/eddyblock/output/palette"
)

// Vectors is a vector field drawn as arrows (such as E-vectors) over the
// contours of a scalar field (such as the time-mean streamfunction), on
// the (x, y) plane with axes in km and equal scales in x and y. Arrows are
// centred on their grid points; the longest is 0.9 times the spacing
// between arrows, and a reference arrow in the key gives the scale.
type Vectors struct {
	Title string
	// U and V are the vectors' x (east) and y (north) components, on one grid.
	U, V  Field
	Units string // of the vectors, e.g. "m² s⁻²"
	// Every draws an arrow at every Every-th grid point in x and y; 0 picks
	// a step putting arrows about 18 points (a quarter inch) apart.
	Every int
	Color color.Color // of the arrows; nil: black

	// Stream is the contoured scalar field; none if it has no values.
	Stream      Field
	StreamName  string // e.g. "mean ψ₁"
	StreamUnits string
	// Interval is the contour interval; 0 picks one giving about 12 levels.
	// Negative values are dashed, zero thin.
	Interval float64

	Contours []Contour
	Masks    []Mask
}

func (v *Vectors) check() error {
	if err := v.U.check("Vectors.U"); err != nil {
		return err
	}
	if err := v.V.check("Vectors.V"); err != nil {
		return err
	}
	if v.V.Nx != v.U.Nx || v.V.Ny != v.U.Ny || !sameDomain(v.U, v.V) || v.U.Bounded != v.V.Bounded {
		return fmt.Errorf("figure: Vectors.V: grid %d×%d over %g m × %g m differs from Vectors.U's %d×%d over %g m × %g m",
			v.V.Nx, v.V.Ny, v.V.Lx, v.V.Ly, v.U.Nx, v.U.Ny, v.U.Lx, v.U.Ly)
	}
	if v.Every < 0 {
		return fmt.Errorf("figure: Vectors.Every: %d must not be negative", v.Every)
	}
	if v.Stream.Values != nil {
		if err := v.Stream.check("Vectors.Stream"); err != nil {
			return err
		}
		if !sameDomain(v.Stream, v.U) {
			return fmt.Errorf("figure: Vectors.Stream: domain %g m × %g m differs from the vectors' %g m × %g m", v.Stream.Lx, v.Stream.Ly, v.U.Lx, v.U.Ly)
		}
	}
	if v.Interval < 0 || math.IsNaN(v.Interval) || math.IsInf(v.Interval, 0) {
		return fmt.Errorf("figure: Vectors.Interval: %g must be positive and finite, or 0", v.Interval)
	}
	return checkOverlays("Vectors", v.U, v.Contours, v.Masks)
}

// arrowSet is a plotter of arrows centred at (x, y) (km) with components
// (u, v) drawn at scale length per unit.
type arrowSet struct {
	x, y, u, v []float64
	scale      vg.Length
	color      color.Color
}

func (a *arrowSet) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	for k := range a.x {
		cx, cy := trX(a.x[k]), trY(a.y[k])
		dx, dy := vg.Length(a.u[k])*a.scale, vg.Length(a.v[k])*a.scale
		if math.Hypot(float64(dx), float64(dy)) < float64(vg.Points(2)) {
			continue // too short to show a direction
		}
		drawArrow(c, vg.Point{X: cx - dx/2, Y: cy - dy/2}, vg.Point{X: cx + dx/2, Y: cy + dy/2}, a.color, vg.Points(0.8))
	}
}

// Draw renders the figure.
func (v *Vectors) Draw(s Size) (*image.RGBA, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if err := v.check(); err != nil {
		return nil, err
	}
	c := newCanvas(s)
	f := v.U
	every := v.Every
	if every == 0 {
		w := c.dc.Max.X - c.dc.Min.X - vg.Points(60)
		h := c.dc.Max.Y - c.dc.Min.Y - vg.Points(90)
		w = min(w, h*vg.Length(f.Lx/f.Ly))
		every = max(1, int(math.Round(float64(f.Nx)/float64(w/vg.Points(18)))))
	}
	col := v.Color
	if col == nil {
		col = color.Black
	}
	set := &arrowSet{color: col}
	maxMag := 0.0
	for j := 0; j < f.Ny; j += every {
		for i := 0; i < f.Nx; i += every {
			k := j*f.Nx + i
			set.x = append(set.x, f.kmX(float64(i)))
			set.y = append(set.y, f.kmY(float64(j)))
			set.u = append(set.u, v.U.Values[k])
			set.v = append(set.v, v.V.Values[k])
			maxMag = math.Max(maxMag, math.Hypot(v.U.Values[k], v.V.Values[k]))
		}
	}
	// The reference arrow: 1, 2 or 5 times a power of ten, at most the
	// longest arrow.
	ref := 0.0
	if maxMag > 0 {
		p := math.Pow(10, math.Floor(math.Log10(maxMag)))
		for _, m := range []float64{1, 2, 5, 10} {
			if m*p <= maxMag*(1+1e-12) {
				ref = m * p
			}
		}
	}

	var streamKey []keyEntry
	var streamLines []polylines
	if v.Stream.Values != nil {
		ext := palette.MinMaxRange(v.Stream.Values)
		iv := v.Interval
		if iv == 0 && ext.Hi > ext.Lo {
			iv = palette.NiceStep(ext.Hi-ext.Lo, 12)
		}
		if iv > 0 {
			var neg, pos, zero []float64
			for k := math.Ceil(ext.Lo / iv); k*iv <= ext.Hi; k++ {
				switch {
				case k < 0:
					neg = append(neg, k*iv)
				case k > 0:
					pos = append(pos, k*iv)
				default:
					zero = append(zero, 0)
				}
			}
			grey := color.RGBA{70, 70, 70, 255}
			streamLines = []polylines{
				{contourLines(v.Stream, neg), lineStyle(grey, 0.9, true)},
				{contourLines(v.Stream, zero), lineStyle(grey, 0.5, false)},
				{contourLines(v.Stream, pos), lineStyle(grey, 0.9, false)},
			}
			name := v.StreamName
			if name == "" {
				name = "contours"
			}
			units := ""
			if v.StreamUnits != "" {
				units = " " + v.StreamUnits
			}
			st := lineStyle(grey, 0.9, false)
			streamKey = []keyEntry{{line: &st, text: name + " every " + formatNum(iv) + units + " (negative dashed)"}}
		}
	}

	p := c.mapPlot("", f, true, 1, 0)
	layout := func(area draw.Canvas) mapLayout {
		return c.layoutMaps(area, []*plot.Plot{p}, f.Ly/f.Lx, 0)
	}
	// scaleOf returns the arrow length per unit of the vectors in a layout.
	scaleOf := func(l mapLayout) vg.Length {
		width := vg.Points(400)
		if len(l.data) > 0 {
			width = l.data[0].Max.X - l.data[0].Min.X
		}
		if maxMag == 0 {
			return 0
		}
		return 0.9 * width * vg.Length(float64(every)/float64(f.Nx)/maxMag)
	}
	keys := func(l mapLayout) []keyEntry {
		var ks []keyEntry
		if ref > 0 {
			units := ""
			if v.Units != "" {
				units = " " + v.Units
			}
			ks = append(ks, keyEntry{arrow: vg.Length(ref) * scaleOf(l), arrowC: col, text: formatNum(ref) + units})
		} else {
			ks = append(ks, keyEntry{text: "all vectors are zero"})
		}
		ks = append(ks, streamKey...)
		return append(ks, overlayKey(v.Contours, v.Masks)...)
	}
	l := c.compactLayout(v.Title, keys, layout)
	set.scale = scaleOf(l)
	c.overlays(p, l.pix[0], v.Contours, v.Masks)
	for _, sl := range streamLines {
		p.Add(sl)
	}
	p.Add(set, frame{})
	c.drawPanel(p, l.tiles[0], l.data[0])
	return c.img, nil
}
