// Heating adds a user-defined forcing to a whole experiment: a steady patch
// of negative upper-layer PV tendency (standing for a heating anomaly aloft)
// 3000 km upstream of the block in the default experiment, on a coarse grid.
// It runs the control and the heated experiment, writes each one's time
// means to NetCDF, and reads the time-mean height back from the files to
// show the response at the patch and at the block.
//
//	go run ./examples/heating
package main

import (
	"context"
	"fmt"
	"log"
	"math"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

func main() {
	dir, err := os.MkdirTemp("", "heating")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)

	c := experiment.Default()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 30, 10, 2
	patchX, patchY := c.Block.Dipole.X-3e6, c.Block.Dipole.Y

	files := map[string]string{}
	for _, heated := range []bool{false, true} {
		e, err := experiment.New(c)
		if err != nil {
			log.Fatal(err)
		}
		if heated {
			g := e.Model.Grid()
			patch := make([]float64, g.Points())
			for y := range g.Ny {
				for x := range g.Nx {
					dx := qg.PeriodicDistance(g.X(x), patchX, g.Lx) / 7e5
					dy := qg.PeriodicDistance(g.Y(y), patchY, g.Ly) / 7e5
					patch[y*g.Nx+x] = -1e-10 * math.Exp(-dx*dx-dy*dy) // s⁻²
				}
			}
			e.Model.AddGridForcing(qg.GridForcingFunc(func(dq [2][]float64, t float64) {
				for i, f := range patch {
					dq[0][i] += f
				}
			}))
		}
		if err := e.Run(context.Background(), nil); err != nil {
			log.Fatal(err)
		}
		name := map[bool]string{false: "control", true: "heated"}[heated]
		files[name] = filepath.Join(dir, name+"-means.nc")
		if err := output.WriteMeans(files[name], e); err != nil {
			log.Fatal(err)
		}
		e.Close()
	}

	// read the time-mean upper-layer height back from the files
	read := func(path string) ([]float64, int, float64) {
		f, err := netcdf.Open(path)
		if err != nil {
			log.Fatal(err)
		}
		defer f.Close()
		z, err := f.ReadFloat64("height_mean")
		if err != nil {
			log.Fatal(err)
		}
		x, _ := f.ReadFloat64("x")
		return z, len(x), x[1] - x[0]
	}
	zc, nx, dx := read(files["control"])
	zh, _, _ := read(files["heated"])
	at := func(z []float64, x, y float64) float64 {
		return z[int(math.Round(y/dx))*nx+int(math.Round(x/dx))] // square cells
	}
	fmt.Println("time-mean upper-layer height, days 10–30, read from means.nc (m):")
	fmt.Printf("  at the heating patch:  control %+6.1f  heated %+6.1f  response %+6.1f\n",
		at(zc, patchX, patchY), at(zh, patchX, patchY), at(zh, patchX, patchY)-at(zc, patchX, patchY))
	hx, hy := c.Block.Dipole.X, c.Block.Dipole.Y+c.Block.Dipole.Separation/2
	fmt.Printf("  at the block's high:   control %+6.1f  heated %+6.1f  response %+6.1f\n",
		at(zc, hx, hy), at(zh, hx, hy), at(zh, hx, hy)-at(zc, hx, hy))
}
