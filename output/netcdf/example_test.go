package netcdf_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/output/netcdf"
)

// Example writes a small CF-style file, a streamfunction growing along
// an unlimited time dimension, and reads it back.
func Example() {
	dir, err := os.MkdirTemp("", "netcdf-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "vortex.nc")

	w, err := netcdf.Create(path, netcdf.Header{
		Format: netcdf.Classic,
		Dims:   []netcdf.Dim{{Name: "time", Len: 0}, {Name: "x", Len: 4}},
		Attrs: []netcdf.Attr{
			{Name: "Conventions", Value: "CF-1.8"},
			{Name: "title", Value: "a vortex drifting east"},
		},
		Vars: []netcdf.Var{
			{Name: "x", Type: netcdf.Double, Dims: []string{"x"}, Attrs: []netcdf.Attr{
				{Name: "units", Value: "km"}, {Name: "axis", Value: "X"},
			}},
			{Name: "time", Type: netcdf.Double, Dims: []string{"time"}, Attrs: []netcdf.Attr{
				{Name: "units", Value: "days since 2000-01-01"},
			}},
			{Name: "psi", Type: netcdf.Float, Dims: []string{"time", "x"}, Attrs: []netcdf.Attr{
				{Name: "long_name", Value: "streamfunction"},
				{Name: "units", Value: "m2 s-1"},
				{Name: "_FillValue", Value: float32(-9999)},
			}},
		},
	})
	if err != nil {
		log.Fatal(err)
	}
	if err := w.WriteFloat64("x", []float64{0, 250, 500, 750}); err != nil {
		log.Fatal(err)
	}
	for rec, psi := range [][]float64{{0, 1e6, 2e6, 0}, {0, 0, 1.5e6, 2.5e6}} {
		if err := w.WriteRecordFloat64("time", rec, []float64{float64(rec)}); err != nil {
			log.Fatal(err)
		}
		if err := w.WriteRecordFloat64("psi", rec, psi); err != nil {
			log.Fatal(err)
		}
		if err := w.CommitRecord(); err != nil {
			log.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		log.Fatal(err)
	}

	f, err := netcdf.Open(path)
	if err != nil {
		log.Fatal(err)
	}
	defer f.Close()
	conventions, _ := f.Attr("Conventions")
	psi, _ := f.Var("psi")
	units, _ := psi.Attr("units")
	shape, _ := f.Shape("psi")
	last, err := f.ReadRecordFloat64("psi", f.NumRecs()-1)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(f.Format, conventions.Value)
	fmt.Printf("%s %v(%v) %v in %v\n", psi.Name, psi.Type, psi.Dims, shape, units.Value)
	fmt.Println("fill:", psi.FillValue())
	fmt.Println("last record:", last)
	// Output:
	// classic CF-1.8
	// psi float([time x]) [2 4] in m2 s-1
	// fill: -9999
	// last record: [0 0 1.5e+06 2.5e+06]
}
