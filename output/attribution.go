package output

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strings"

	"github.com/eddyblock/eddyblock/attribution"
	"github.com/eddyblock/eddyblock/output/figure"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// The files of an attribution experiment's output directory (besides
// SummaryFile, ConfigFile and FiguresDir).
const (
	AttributionFile    = "attribution.nc"     // the responses, the forcings and the basic state on (layer, y, x)
	ControlForcingFile = "control_forcing.nc" // the control run's mean-state forcing and its split
	AnomalyForcingFile = "anomaly_forcing.nc" // the same for the run with the anomaly
)

// AttributionFigureNames returns the figures WriteAttribution draws.
func AttributionFigureNames() []string {
	return []string{"response.png", "errors.png", "forcing.png"}
}

// WriteMeanForcing writes a run's mean-state forcing and its split to path
// as NetCDF (64-bit offset, CF-1.10, double precision): every field of
// mf.Fields on (layer, y, x), with the run's configuration, the averaging
// window, the number of samples and the residual's ratio to H as global
// attributes, and extra global attributes after them.
func WriteMeanForcing(path string, mf *attribution.MeanForcing, extra ...netcdf.Attr) error {
	f, err := mf.Fields()
	if err != nil {
		return err
	}
	pv, psi := mf.ResidualRatio()
	attrs := append(globalAttrs(mf.Config, "mean-state forcing of an eddyblock run: the steady PV forcing H = -N(q_mean) that holds its time mean steady without eddies, split into the time-mean eddy and external forcings and a residual"),
		netcdf.Attr{Name: "averaging_window_days", Value: []float64{mf.StartDay, mf.EndDay}},
		netcdf.Attr{Name: "samples", Value: int32(mf.Samples)},
		netcdf.Attr{Name: "residual_ratio", Value: []float64{pv, psi}},
		netcdf.Attr{Name: "residual_ratio_comment", Value: "RMS of residual_forcing over RMS of mean_state_forcing, both layers mass-weighted: of the PV tendencies, then of the streamfunction tendencies they induce"})
	return writeLayered(path, mf.Grid(), f, append(attrs, extra...))
}

// writeLayered writes the per-layer fields of f (names ending in 1 and 2)
// on (layer, y, x) with the coordinates and the global attributes.
func writeLayered(path string, g *qg.Grid, f diag.Fields, attrs []netcdf.Attr) error {
	h := netcdf.Header{Format: netcdf.Offset64, Dims: gridDims(g, false), Attrs: attrs, Vars: coordVars()}
	var data [][]float64
	for _, x := range f.List {
		base, layer := splitLayer(x.Name)
		if layer != 1 {
			continue
		}
		x2, ok := f.Get(base + "2")
		if !ok {
			return fmt.Errorf("%s: field %s has no layer-2 partner", filepath.Base(path), x.Name)
		}
		h.Vars = append(h.Vars, fieldVar(base, netcdf.Double, true, false, strings.TrimSuffix(x.Long, ", layer 1"), x.Units, standardNames[base]))
		data = append(data, append(append(make([]float64, 0, 2*len(x.Data)), x.Data...), x2.Data...))
	}
	w, err := netcdf.Create(path, h)
	if err != nil {
		return err
	}
	if err := writeCoords(w, g); err != nil {
		w.Close()
		return err
	}
	for i, v := range h.Vars[len(coordVars()):] {
		if err := w.WriteFloat64(v.Name, data[i]); err != nil {
			w.Close()
			return err
		}
	}
	w.SetDurable(true)
	return w.Close()
}

// AttributionOutput is the output directory of an attribution experiment.
// Its files grow in StagingDir(dir) and replace dir as a whole when all are
// written, as a run's do.
type AttributionOutput struct {
	dir, stage string
	done, keep bool
}

// PrepareAttribution checks, before any work, that dir can be written and
// replaced, and stages it.
func PrepareAttribution(dir string) (*AttributionOutput, error) {
	s, err := stage(dir, false)
	if err != nil {
		return nil, fmt.Errorf("output directory: %w", err)
	}
	return &AttributionOutput{dir: dir, stage: s}, nil
}

// Dir returns the output directory.
func (o *AttributionOutput) Dir() string { return o.dir }

// Write writes every file of the finished experiment r — summary.json,
// config.toml (the whole attribution configuration, readable by
// eddyblock attribute -config), attribution.nc, control_forcing.nc,
// anomaly_forcing.nc and, with plot, the figures — and moves them over the
// output directory.
func (o *AttributionOutput) Write(r *attribution.Result, plot bool) error {
	if err := writeRuns(o.stage, r); err != nil {
		return err
	}
	if err := writeJSON(filepath.Join(o.stage, SummaryFile), r.Summary()); err != nil {
		return err
	}
	f, err := r.Fields()
	if err != nil {
		return err
	}
	sum := r.Summary()
	attrs := append(globalAttrs(r.Config.Config, "attribution of the response to a forcing anomaly: nonlinear response (a), linear response (b), linear response with the change in eddy forcing (c)"),
		netcdf.Attr{Name: "attribution_configuration", Value: r.Config.ExtraTOML()},
		netcdf.Attr{Name: "forcing_anomaly", Value: r.Config.Anomaly.String()},
		netcdf.Attr{Name: "averaging_window_days", Value: []float64{sum.StartDay, sum.EndDay}},
		netcdf.Attr{Name: "pattern_correlation_linear", Value: sum.Linear.Correlation},
		netcdf.Attr{Name: "pattern_correlation_linear_eddy", Value: sum.LinearEddy.Correlation},
		netcdf.Attr{Name: "rms_difference_linear_m", Value: sum.Linear.RMS},
		netcdf.Attr{Name: "rms_difference_linear_eddy_m", Value: sum.LinearEddy.RMS},
		netcdf.Attr{Name: "sampling_noise_rms_m", Value: sum.Noise.RMS},
		netcdf.Attr{Name: "scores_comment", Value: "pattern correlations of the streamfunctions and RMS height differences against (a), both layers mass-weighted; the sampling noise of (a) by batch means over segments of the averaging window"})
	if err := writeLayered(filepath.Join(o.stage, AttributionFile), r.Grid(), f, attrs); err != nil {
		return err
	}
	if plot {
		if err := plotAttribution(filepath.Join(o.stage, FiguresDir), r, f); err != nil {
			return fmt.Errorf("figures: %w", err)
		}
	}
	if err := writeSynced(filepath.Join(o.stage, ConfigFile), []byte(r.Config.TOML())); err != nil {
		return err
	}
	if err := commit(o.stage, o.dir); err != nil {
		return fmt.Errorf("output directory %s: %w", o.dir, err)
	}
	o.done = true
	return nil
}

// WriteRuns writes the two runs' mean-state forcings of a result whose
// linear step failed into the staging directory and keeps it, so that the
// long runs are not lost; it returns the staging directory's path. The
// output directory is left as it was.
func (o *AttributionOutput) WriteRuns(r *attribution.Result) (string, error) {
	if err := writeRuns(o.stage, r); err != nil {
		return "", err
	}
	if err := writeSynced(filepath.Join(o.stage, ConfigFile), []byte(r.Config.TOML())); err != nil {
		return "", err
	}
	o.keep = true
	return o.stage, nil
}

// writeRuns writes the runs' mean-state forcing files into dir (those the
// result has).
func writeRuns(dir string, r *attribution.Result) error {
	for _, x := range []struct {
		file string
		mf   *attribution.MeanForcing
		run  string
	}{{ControlForcingFile, r.Control, attribution.ControlRun}, {AnomalyForcingFile, r.Perturbed, attribution.AnomalyRun}} {
		if x.mf == nil {
			continue
		}
		extra := []netcdf.Attr{{Name: "run", Value: x.run}}
		if x.run == attribution.AnomalyRun {
			extra = append(extra, netcdf.Attr{Name: "forcing_anomaly", Value: r.Config.Anomaly.String()})
		}
		if err := WriteMeanForcing(filepath.Join(dir, x.file), x.mf, extra...); err != nil {
			return err
		}
	}
	return nil
}

// Close removes the staging directory unless the files were committed or
// kept by WriteRuns.
func (o *AttributionOutput) Close() {
	if !o.done && !o.keep {
		os.RemoveAll(o.stage)
	}
}

// plotAttribution draws the figures of an attribution experiment into
// figs: the three responses of the upper-layer height side by side on one
// colour scale; the errors of (b) and (c) beside the sampling noise of
// (a), on one colour scale; and the height tendencies of the anomaly and
// of the change in eddy forcing.
func plotAttribution(figs string, r *attribution.Result, f diag.Fields) error {
	if err := os.MkdirAll(figs, 0o755); err != nil {
		return err
	}
	g := r.Grid()
	field := func(name string) (figure.Field, error) {
		x, ok := f.Get(name)
		if !ok {
			return figure.Field{}, fmt.Errorf("no field %s", name)
		}
		return figure.Field{Values: x.Data, Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}, nil
	}
	diff := func(a, b string) (figure.Field, error) {
		fa, err := field(a)
		if err != nil {
			return fa, err
		}
		fb, err := field(b)
		if err != nil {
			return fb, err
		}
		d := make([]float64, len(fa.Values))
		for i := range d {
			d[i] = fa.Values[i] - fb.Values[i]
		}
		fa.Values = d
		return fa, nil
	}
	cs, ms, err := attributionOverlays(r)
	if err != nil {
		return err
	}
	s := r.Summary()
	type panel struct {
		title string
		get   func() (figure.Field, error)
	}
	one := func(name string) func() (figure.Field, error) {
		return func() (figure.Field, error) { return field(name) }
	}
	for _, fig := range []struct {
		name, title, units string
		panels             []panel
	}{
		{"response.png", "response of the upper-layer height to the anomaly", "m", []panel{
			{"(a) nonlinear runs", one("height_nonlinear1")},
			{fmt.Sprintf("(b) linear: corr %.3f, RMS diff. %.2f m", s.Linear.Correlation, s.Linear.RMS), one("height_linear1")},
			{fmt.Sprintf("(c) linear + ΔC̄: corr %.3f, RMS diff. %.2f m", s.LinearEddy.Correlation, s.LinearEddy.RMS), one("height_linear_eddy1")},
		}},
		{"errors.png", "upper-layer height: errors of the linear responses and the sampling noise of (a)", "m", []panel{
			{"(b) − (a)", func() (figure.Field, error) { return diff("height_linear1", "height_nonlinear1") }},
			{"(c) − (a)", func() (figure.Field, error) { return diff("height_linear_eddy1", "height_nonlinear1") }},
			{fmt.Sprintf("noise: (first − second half)/2; %d-segment RMS %.2f m", s.Noise.Segments, s.Noise.RMS), one("height_noise1")},
		}},
		{"forcing.png", "upper-layer height tendency f0ψt/g of the forcings", "m day⁻¹", []panel{
			{"anomaly f", one("height_tendency_anomaly1")},
			{"change in eddy forcing ΔC̄", one("height_tendency_eddy_change1")},
		}},
	} {
		var ps []figure.Panel
		for _, p := range fig.panels {
			x, err := p.get()
			if err != nil {
				return fmt.Errorf("%s: %w", fig.name, err)
			}
			ps = append(ps, figure.Panel{Title: p.title, Field: x})
		}
		m := &figure.Map{Title: fig.title, Panels: ps, Scale: figure.Signed, Units: fig.units, Contours: cs, Masks: ms}
		size := panelsSize
		if len(ps) == 2 {
			size = figure.Size{Width: 1400, Height: 560}
		}
		b, err := figure.PNG(m, size)
		if err != nil {
			return fmt.Errorf("%s: %w", fig.name, err)
		}
		if err := writeSynced(filepath.Join(figs, fig.name), b); err != nil {
			return err
		}
	}
	return nil
}

// attributionOverlays are the block's outline (upper layer, half its peak)
// and the anomaly's patch (where its shape exceeds 1/e).
func attributionOverlays(r *attribution.Result) ([]figure.Contour, []figure.Mask, error) {
	g := r.Grid()
	c := r.Config
	var cs []figure.Contour
	if c.Block.Enabled() {
		b, err := c.Block.Block(c.Model)
		if err != nil {
			return nil, nil, err
		}
		var mx float64
		for _, v := range b.Psi[0] {
			mx = math.Max(mx, math.Abs(v))
		}
		if mx > 0 {
			bf := figure.Field{Values: b.Psi[0], Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}
			cs = append(cs,
				figure.Contour{Field: bf, Levels: []float64{mx / 2}, Color: color.Black, Width: 1.5, Label: "block high (half its peak ψ)"},
				figure.Contour{Field: bf, Levels: []float64{-mx / 2}, Color: color.Black, Width: 1.5, Dashed: true, Label: "block low (half its trough ψ)"})
		}
	}
	a := c.Anomaly
	shape := make([]float64, g.Points())
	for y := range g.Ny {
		dy := qg.PeriodicDistance(g.Y(y), a.Y, g.Ly) / a.Radius
		for x := range g.Nx {
			dx := qg.PeriodicDistance(g.X(x), a.X, g.Lx) / a.Radius
			shape[y*g.Nx+x] = math.Exp(-dx*dx - dy*dy)
		}
	}
	if c.Anomaly.Kind == "" {
		return cs, nil, errors.New("the anomaly has no kind")
	}
	ms := []figure.Mask{{Field: figure.Field{Values: shape, Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}, Threshold: math.Exp(-1),
		Color: color.RGBA{150, 30, 150, 255}, Outline: true, Label: "forcing anomaly (shape > 1/e)"}}
	return cs, ms, nil
}
