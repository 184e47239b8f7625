// Package palette maps plain float64 grids to colours, for figures and for
// live rendering in a browser: perceptually designed colour scales, range
// helpers, a grid-to-pixel painter, marching-squares contours and a small
// anti-aliased rasteriser for lines, arrows and rectangles.
//
// The scales are designed in CIE 1976 L*a*b* (through its cylindrical form
// L*, C*ab, h_ab) over the sRGB gamut of IEC 61966-2-1: Signed is a
// diverging scale with a neutral light grey exactly at zero (on a range
// symmetric about zero) and ramps of equal lightness either side; Magnitude
// is a sequential scale whose lightness falls monotonically. Each is a
// lookup table of TableSize colours.
//
// Grids are stored by rows, Values[j*Nx+i] at grid coordinates (i, j).
// Painting maps a Window of grid coordinates onto an image, each pixel
// sampling the grid at its centre; a Transform maps grid coordinates to the
// same image's pixel coordinates, so contours and arrows drawn with a
// Canvas line up with the painted field.
//
// The package uses only the standard library, keeps no mutable package
// state, builds for GOOS=js GOARCH=wasm, and a reused Painter allocates
// nothing per frame.
package palette
