package figure_test

import (
	"bytes"
	"fmt"
	"image/png"
	"math"

	"github.com/eddyblock/eddyblock/output/figure"
)

func ExampleMap() {
	// A signed field on a 20 000 km × 10 000 km periodic domain, drawn on
	// the diverging scale with a colour bar in metres.
	const nx, ny = 32, 16
	v := make([]float64, nx*ny)
	for j := range ny {
		for i := range nx {
			v[j*nx+i] = 100 * math.Sin(2*math.Pi*float64(i)/nx) * math.Sin(math.Pi*float64(j)/ny)
		}
	}
	m := &figure.Map{
		Title:  "Height anomaly",
		Panels: []figure.Panel{{Field: figure.Field{Values: v, Nx: nx, Ny: ny, Lx: 20000e3, Ly: 10000e3}}},
		Units:  "m",
	}
	b, err := figure.PNG(m, figure.Size{Width: 600, Height: 320})
	if err != nil {
		fmt.Println(err)
		return
	}
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("PNG", img.Bounds().Dx(), "×", img.Bounds().Dy())
	// Output:
	// PNG 600 × 320
}
