package main

import (
	"fmt"
	"image/color"
	"math"
	"time"

	"github.com/eddyblock/eddyblock/output/palette"
)

// Over the running mean the page can draw the eddies' E-vectors
// E = (v′² − u′², −u′v′) of the shown layer as arrows, over contours of
// the layer's time-mean streamfunction (the mean flow runs along them,
// with higher values to its left in the northern hemisphere's sense).
// Both come from the diagnostics' running sums (diag's EddyField), over
// the same window as the running-mean field. E points along the eddies'
// group velocity relative to the mean flow, and its divergence is where
// they accelerate the mean westerlies (Hoskins, James & White 1983).

// Arrow layout, in pixels of the panel.
const (
	arrowSpacing = 26  // target distance between arrows
	arrowFill    = 0.9 // the longest arrow is this fraction of the spacing
	arrowMin     = 2.5 // shorter arrows are left out: no direction to see
	// contourLevels is about the number of contour intervals over the
	// mean streamfunction's range.
	contourLevels = 12
)

// Colours of the arrows (near black, opaque) and of the contours (a grey
// that lets the field show through), alpha-premultiplied.
var (
	arrowColour   = color.RGBA{20, 20, 20, 255}
	contourColour = color.RGBA{60, 60, 60, 170}
)

// refreshVectors updates the E-vectors and the mean-streamfunction
// contours of the shown layer when the arrows are on, the running mean
// has new samples and vectorsEvery has passed since the last update (at
// once after a change of settings).
func (a *App) refreshVectors(now time.Time) {
	if a.set.Arrows != "evec" {
		return
	}
	d := a.exp.Diag
	n := d.Samples()
	if !a.vecStale && (n == a.vecSamples || now.Sub(a.vecAt) < vectorsEvery) {
		return
	}
	L := a.set.Layer
	for _, f := range []struct {
		name string
		dst  []float64
	}{{"ex", a.ex}, {"ey", a.ey}, {"psi_mean", a.psiMean}} {
		if err := d.EddyField(fmt.Sprintf("%s%d", f.name, L), f.dst); err != nil {
			a.lastError = err.Error()
			return
		}
	}
	a.vecMax = 0
	for i := range a.ex {
		if m := math.Hypot(a.ex[i], a.ey[i]); m > a.vecMax && !math.IsInf(m, 0) {
			a.vecMax = m
		}
	}
	a.contours = a.contours[:0]
	a.vecInterval = 0
	if n > 0 {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, v := range a.psiMean {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if iv := palette.NiceStep(hi-lo, contourLevels); iv > 0 {
			a.vecInterval = iv
			g := palette.Grid{Values: a.psiMean, Nx: a.g.Nx, Ny: a.g.Ny}
			for level := math.Ceil(lo/iv) * iv; level <= hi; level += iv {
				if s, err := palette.Contour(a.contours, g, level, true); err == nil {
					a.contours = s
				}
			}
		}
	}
	a.vecSamples, a.vecAt, a.vecStale = n, now, false
	a.vecVer++
}

// arrowStride returns the grid points between arrows along each axis for
// a panel w pixels wide: about arrowSpacing pixels apart.
func (a *App) arrowStride(w int) int {
	return max(1, int(math.Round(arrowSpacing*float64(a.g.Nx)/float64(max(1, w)))))
}

// PaintVectors paints, into pix (a w×h RGBA image the size of the
// running-mean panel, transparent where it shows the field), the
// contours of the time-mean streamfunction and the E-vectors as arrows
// centred on every arrowStride-th grid point, the longest arrowFill times
// the spacing between arrows, north up. With the arrows off, or before
// the running mean has samples, it leaves pix transparent. It allocates
// nothing.
func (a *App) PaintVectors(pix []byte, w, h int) {
	clear(pix[:4*w*h])
	if a.set.Arrows != "evec" || a.vecSamples <= 0 {
		return
	}
	cv := palette.Canvas{Pix: pix, Stride: 4 * w, W: w, H: h}
	tr := palette.Transform{Nx: a.g.Nx, Ny: a.g.Ny, W: w, H: h, FlipY: true}
	width := math.Max(1, float64(w)/600)
	cv.Segments(a.contours, tr, true, width, contourColour)
	if !(a.vecMax > 0) {
		return
	}
	every := a.arrowStride(w)
	spacing := float64(every) * float64(w) / float64(a.g.Nx)
	scale := arrowFill * spacing / a.vecMax // pixels per m² s⁻²
	head := math.Max(3, 0.3*spacing)
	nx := a.g.Nx
	for j := every / 2; j < a.g.Ny; j += every {
		for i := every / 2; i < nx; i += every {
			k := j*nx + i
			dx, dy := a.ex[k]*scale, -a.ey[k]*scale // pixel y runs south
			if math.Hypot(dx, dy) < arrowMin {
				continue
			}
			cx, cy := tr.Pixel(palette.Point{X: float64(i), Y: float64(j)})
			cv.Arrow(cx-dx/2, cy-dy/2, cx+dx/2, cy+dy/2, 1.5*width, math.Min(head, 0.45*math.Hypot(dx, dy)), arrowColour)
		}
	}
}

// vectorsText returns the legend of the arrows for the page: the size of
// the longest arrow and the contour interval, with units.
func (a *App) vectorsText() string {
	switch {
	case a.set.Arrows != "evec":
		return ""
	case a.vecSamples <= 0:
		return "E-vectors: waiting for the running mean"
	}
	return fmt.Sprintf("longest arrow %s m² s⁻²; mean ψ contours every %s m² s⁻¹", sci(a.vecMax, 2), sci(a.vecInterval, 1))
}
