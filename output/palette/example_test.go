package palette_test

import (
	"fmt"
	"image"

	"github.com/eddyblock/eddyblock/output/palette"
)

func ExampleFill() {
	// A 4×2 signed field, painted north up into an 8×4 image on a range
	// symmetric about zero: the zeros take the neutral centre of the scale.
	g := palette.Grid{Values: []float64{-2, -1, 0, 1, 0, 0, 2, 0}, Nx: 4, Ny: 2}
	r := palette.SymmetricRange(g.Values)
	img := image.NewRGBA(image.Rect(0, 0, 8, 4))
	if err := palette.FillImage(img, g, r, palette.Signed(), palette.FillOptions{FlipY: true}); err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("range:", r)
	fmt.Println("bottom left (−2):", img.RGBAAt(0, 3))
	fmt.Println("bottom middle (0):", img.RGBAAt(4, 3))
	fmt.Println("top middle (2):", img.RGBAAt(4, 0))
	segs, _ := palette.Contour(nil, g, 0.5, false)
	fmt.Println("segments of the contour 0.5:", len(segs))
	// Output:
	// range: {-2 2}
	// bottom left (−2): {28 71 167 255}
	// bottom middle (0): {246 246 246 255}
	// top middle (2): {149 32 21 255}
	// segments of the contour 0.5: 3
}
