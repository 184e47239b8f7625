package output

import (
	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

// WriteSeries writes the run's time series (those of series.json: energies,
// enstrophies, CFL number, the rate of every energy-budget term and the
// block index, per diagnostic sample) to path as NetCDF on the time
// dimension, with the averaging window's first sample as an attribute.
func WriteSeries(path string, e *experiment.Experiment) error {
	s := e.Diag.Series()
	type col struct {
		name, long, units string
		data              []float64
	}
	cols := []col{
		{"ke", "kinetic energy per unit mass, domain mean", "m2 s-2", s.KE},
		{"ape", "available potential energy per unit mass, domain mean", "m2 s-2", s.APE},
		{"enstrophy1", "enstrophy 1/2 <q1^2>, upper layer", "s-2", s.Enstrophy1},
		{"enstrophy2", "enstrophy 1/2 <q2^2>, lower layer", "s-2", s.Enstrophy2},
		{"cfl", "CFL number at the last step", "1", s.CFL},
	}
	for _, t := range qg.Terms() {
		cols = append(cols, col{"rate_" + t.String(), "energy added per unit time by the " + t.String() + " term since the previous sample", "m2 s-3", s.Rates[t.String()]})
	}
	if s.Index != nil {
		cols = append(cols, col{"block_index", "projection of the flow on the block pattern, relative to the pattern", "1", s.Index})
	}
	h := netcdf.Header{
		Format: netcdf.Offset64,
		Dims:   []netcdf.Dim{{Name: "time", Len: len(s.Day)}},
		Attrs: append(globalAttrs(e.Config, "time series of an eddyblock experiment"),
			netcdf.Attr{Name: "averaging_window_first_sample", Value: int32(s.WindowStart)}),
		Vars: []netcdf.Var{timeVar()},
	}
	for _, c := range cols {
		h.Vars = append(h.Vars, netcdf.Var{Name: c.name, Type: netcdf.Double, Dims: []string{"time"},
			Attrs: []netcdf.Attr{{Name: "long_name", Value: c.long}, {Name: "units", Value: c.units}}})
	}
	w, err := netcdf.Create(path, h)
	if err != nil {
		return err
	}
	if err := w.WriteFloat64("time", s.Day); err != nil {
		w.Close()
		return err
	}
	for _, c := range cols {
		if err := w.WriteFloat64(c.name, c.data); err != nil {
			w.Close()
			return err
		}
	}
	w.SetDurable(true)
	return w.Close()
}
