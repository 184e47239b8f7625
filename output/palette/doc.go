// Package palette maps plain float64 grids to colours: perceptually designed
// colour scales, range helpers, a fast grid-to-pixel painter, marching-squares
// contours and a small rasteriser for lines, arrows and rectangles.
package palette
