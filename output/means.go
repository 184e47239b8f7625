package output

import (
	"fmt"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// meansVar is one variable of means.nc and its values.
type meansVar struct {
	v    netcdf.Var
	data []float64
}

// WriteMeans writes the time means and eddy statistics of the run's
// averaging window to path as NetCDF (64-bit offset, CF-1.10): every field
// of diag.Fields — fields per layer (names ending in 1 and 2) on
// (layer, y, x), the others on (y, x) — and the time-mean height, the
// block's prescribed streamfunction, the wave source's mask and the sponge
// rate, in double precision.
func WriteMeans(path string, e *experiment.Experiment) error {
	vars, err := meansVars(e)
	if err != nil {
		return err
	}
	g := e.Model.Grid()
	sp := e.Diag.Spectra()
	h := netcdf.Header{
		Format: netcdf.Offset64,
		Dims:   append(gridDims(g, false), netcdf.Dim{Name: "wavenumber", Len: len(sp.K)}),
		Attrs: append(globalAttrs(e.Config, "time means and eddy statistics of an eddyblock experiment"),
			netcdf.Attr{Name: "averaging_window_days", Value: []float64{e.Summary().StartDay, e.Summary().EndDay}},
			netcdf.Attr{Name: "samples", Value: int32(e.Diag.Samples())}),
		Vars: coordVars(),
	}
	for _, v := range vars {
		h.Vars = append(h.Vars, v.v)
	}
	spec := spectraVars(sp)
	for _, v := range spec {
		h.Vars = append(h.Vars, v.v)
	}
	vars = append(vars, spec...)
	w, err := netcdf.Create(path, h)
	if err != nil {
		return err
	}
	if err := writeCoords(w, g); err != nil {
		w.Close()
		return err
	}
	for _, v := range vars {
		if err := w.WriteFloat64(v.v.Name, v.data); err != nil {
			w.Close()
			return err
		}
	}
	w.SetDurable(true)
	return w.Close()
}

// meansVars gathers the variables of means.nc.
func meansVars(e *experiment.Experiment) ([]meansVar, error) {
	f := e.Diag.Fields()
	if len(f.List) == 0 {
		return nil, fmt.Errorf("means: no samples in the averaging window")
	}
	m := e.Model
	g := m.Grid()
	np := g.Points()
	var out []meansVar
	layered := func(base, long, units string, l1, l2 []float64) {
		data := append(append(make([]float64, 0, 2*np), l1...), l2...)
		out = append(out, meansVar{fieldVar(base, netcdf.Double, true, false, long, units, standardNames[base]), data})
	}
	seen := map[string]bool{}
	for _, x := range f.List {
		base, layer := splitLayer(x.Name)
		if layer == 0 {
			out = append(out, meansVar{fieldVar(x.Name, netcdf.Double, false, false, x.Long, x.Units, standardNames[x.Name]), x.Data})
			continue
		}
		if seen[base] {
			continue
		}
		seen[base] = true
		x2, ok := f.Get(base + "2")
		x1, ok1 := f.Get(base + "1")
		if !ok || !ok1 {
			return nil, fmt.Errorf("means: field %s has no layer-2 partner", x.Name)
		}
		layered(base, strings.TrimSuffix(x1.Long, ", layer 1"), x1.Units, x1.Data, x2.Data)
		if base == "psi_mean" {
			c := m.Config().F0 / qg.Gravity
			h1, h2 := make([]float64, np), make([]float64, np)
			for i := range h1 {
				h1[i], h2[i] = c*x1.Data[i], c*x2.Data[i]
			}
			layered("height_mean", "time-mean geopotential height anomaly f0 psi/g", "m", h1, h2)
		}
	}
	if b, ok := m.BlockStreamfunction(); ok {
		b1, b2 := make([]float64, np), make([]float64, np)
		if err := m.ToGrid(b1, b[0]); err != nil {
			return nil, err
		}
		if err := m.ToGrid(b2, b[1]); err != nil {
			return nil, err
		}
		layered("psi_block", "prescribed block streamfunction", "m2 s-1", b1, b2)
	}
	if mask := e.Config.Wavemaker.Mask.Field(g); mask != nil && e.Config.Wavemaker.Kind != "none" {
		out = append(out, meansVar{fieldVar("source_mask", netcdf.Double, false, false, "spatial mask of the wave source (1 at a patch centre)", "1", ""), mask})
	}
	if s := m.SpongeRate(); s != nil {
		rate := make([]float64, np)
		for i := range rate {
			rate[i] = s[i%g.Nx]
		}
		out = append(out, meansVar{fieldVar("sponge_rate", netcdf.Double, false, false, "damping rate of the sponge band", "s-1", ""), rate})
	}
	return out, nil
}

// splitLayer splits a field name ending in the layer number 1 or 2 from
// diag.Fields into its base and layer; layer 0 for a column field.
func splitLayer(name string) (string, int) {
	if n := len(name); n > 1 {
		switch name[n-1] {
		case '1':
			return name[:n-1], 1
		case '2':
			return name[:n-1], 2
		}
	}
	return name, 0
}

// spectraVars are the time-mean isotropic eddy energy spectra on the
// wavenumber dimension.
func spectraVars(sp diag.Spectra) []meansVar {
	spec := func(name, long string, dims []string, data []float64) meansVar {
		return meansVar{netcdf.Var{Name: name, Type: netcdf.Double, Dims: dims, Attrs: []netcdf.Attr{
			{Name: "long_name", Value: long}, {Name: "units", Value: "m3 s-2"},
		}}, data}
	}
	w := []string{"wavenumber"}
	return []meansVar{
		{netcdf.Var{Name: "wavenumber", Type: netcdf.Double, Dims: w, Attrs: []netcdf.Attr{
			{Name: "long_name", Value: "total wavenumber K at the centre of the spectral shell"},
			{Name: "units", Value: "rad m-1"},
			{Name: "shell_width", Value: sp.DK},
		}}, sp.K},
		spec("ke_spectrum", "eddy kinetic energy density per unit wavenumber, each layer (not mass-weighted)", []string{"layer", "wavenumber"},
			append(append([]float64(nil), sp.KE[0]...), sp.KE[1]...)),
		spec("barotropic_ke_spectrum", "eddy kinetic energy density of the barotropic mode", w, sp.Barotropic),
		spec("baroclinic_ke_spectrum", "eddy kinetic energy density of the baroclinic mode", w, sp.BaroclinicKE),
		spec("ape_spectrum", "eddy available potential energy density", w, sp.APE),
	}
}
