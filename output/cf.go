package output

import (
	"runtime/debug"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

// Caution is the sentence every output file carries.
const Caution = "Idealised research model (two-layer quasi-geostrophic, doubly periodic beta-plane): not a weather forecast, and not for decisions about safety."

// Version returns the program's version: the module version and, when the
// build recorded it, the source revision.
func Version() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return "eddyblock (unknown version)"
	}
	v := "eddyblock " + bi.Main.Version
	for _, s := range bi.Settings {
		if s.Key == "vcs.revision" {
			v += " revision " + s.Value
		}
		if s.Key == "vcs.modified" && s.Value == "true" {
			v += " (modified)"
		}
	}
	return v
}

// globalAttrs are the CF global attributes of every file of a run.
func globalAttrs(c experiment.Config, title string) []netcdf.Attr {
	return []netcdf.Attr{
		{Name: "Conventions", Value: "CF-1.10"},
		{Name: "title", Value: title},
		{Name: "source", Value: Version()},
		{Name: "experiment", Value: c.Name},
		{Name: "comment", Value: Caution},
		{Name: "configuration", Value: c.Documented()},
	}
}

// gridDims are the dimensions x, y and layer, with the record dimension
// time first when rec is set.
func gridDims(g *qg.Grid, rec bool) []netcdf.Dim {
	d := []netcdf.Dim{{Name: "x", Len: g.Nx}, {Name: "y", Len: g.Ny}, {Name: "layer", Len: 2}}
	if rec {
		d = append([]netcdf.Dim{{Name: "time", Len: 0}}, d...)
	}
	return d
}

// coordVars are the coordinate variables of gridDims: x and y in metres
// (CF projection coordinates), their values in km as auxiliary
// coordinates, and the layer index.
func coordVars() []netcdf.Var {
	return []netcdf.Var{
		{Name: "x", Type: netcdf.Double, Dims: []string{"x"}, Attrs: []netcdf.Attr{
			{Name: "units", Value: "m"}, {Name: "long_name", Value: "distance east of the western edge"},
			{Name: "standard_name", Value: "projection_x_coordinate"}, {Name: "axis", Value: "X"},
		}},
		{Name: "y", Type: netcdf.Double, Dims: []string{"y"}, Attrs: []netcdf.Attr{
			{Name: "units", Value: "m"}, {Name: "long_name", Value: "distance north of the southern edge"},
			{Name: "standard_name", Value: "projection_y_coordinate"}, {Name: "axis", Value: "Y"},
		}},
		{Name: "x_km", Type: netcdf.Double, Dims: []string{"x"}, Attrs: []netcdf.Attr{
			{Name: "units", Value: "km"}, {Name: "long_name", Value: "distance east of the western edge"},
		}},
		{Name: "y_km", Type: netcdf.Double, Dims: []string{"y"}, Attrs: []netcdf.Attr{
			{Name: "units", Value: "km"}, {Name: "long_name", Value: "distance north of the southern edge"},
		}},
		{Name: "layer", Type: netcdf.Int, Dims: []string{"layer"}, Attrs: []netcdf.Attr{
			{Name: "long_name", Value: "layer of the two-layer model: 1 upper, 2 lower"},
		}},
	}
}

// timeVar is the time coordinate of the record dimension: model time
// elapsed since the start of the run, in days.
func timeVar() netcdf.Var {
	return netcdf.Var{Name: "time", Type: netcdf.Double, Dims: []string{"time"}, Attrs: []netcdf.Attr{
		{Name: "units", Value: "days"}, {Name: "long_name", Value: "model time since the start of the run"},
		{Name: "axis", Value: "T"},
	}}
}

// writeCoords writes the values of coordVars.
func writeCoords(w *netcdf.Writer, g *qg.Grid) error {
	x, y, xk, yk := make([]float64, g.Nx), make([]float64, g.Ny), make([]float64, g.Nx), make([]float64, g.Ny)
	for i := range x {
		x[i], xk[i] = g.X(i), g.X(i)/1e3
	}
	for j := range y {
		y[j], yk[j] = g.Y(j), g.Y(j)/1e3
	}
	for _, v := range []struct {
		name string
		data []float64
	}{{"x", x}, {"y", y}, {"x_km", xk}, {"y_km", yk}, {"layer", []float64{1, 2}}} {
		if err := w.WriteFloat64(v.name, v.data); err != nil {
			return err
		}
	}
	return nil
}

// fieldVar describes a gridded variable on (layer, y, x), or (y, x) when
// layered is false, with time first when rec is set.
func fieldVar(name string, typ netcdf.Type, layered, rec bool, long, units, standard string) netcdf.Var {
	dims := []string{"y", "x"}
	if layered {
		dims = append([]string{"layer"}, dims...)
	}
	if rec {
		dims = append([]string{"time"}, dims...)
	}
	attrs := []netcdf.Attr{{Name: "long_name", Value: long}, {Name: "units", Value: units}}
	if standard != "" {
		attrs = append(attrs, netcdf.Attr{Name: "standard_name", Value: standard})
	}
	attrs = append(attrs, netcdf.Attr{Name: "coordinates", Value: "y_km x_km"})
	return netcdf.Var{Name: name, Type: typ, Dims: dims, Attrs: attrs}
}

// standardNames are the CF standard names of the fields that have one.
var standardNames = map[string]string{
	"psi_mean":    "atmosphere_horizontal_streamfunction",
	"psi_ref":     "atmosphere_horizontal_streamfunction",
	"psi_block":   "atmosphere_horizontal_streamfunction",
	"psi":         "atmosphere_horizontal_streamfunction",
	"u_mean":      "eastward_wind",
	"v_mean":      "northward_wind",
	"height_mean": "geopotential_height_anomaly",
}
