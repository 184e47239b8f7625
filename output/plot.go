package output

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/output/figure"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

// The sizes of the figures Plot writes, in pixels.
var (
	figureSize = figure.Size{Width: 1200, Height: 700}
	panelsSize = figure.Size{Width: 1800, Height: 560}
	lineSize   = figure.Size{Width: 1100, Height: 600}
)

// FigureNames returns the files Plot writes (block_index.png only for a run
// with a block).
func FigureNames() []string {
	return []string{"height.png", "eddy_forcing.png", "evectors.png", "spectra.png", "budget.png", "block_index.png"}
}

// Plot reads the NetCDF files of a run's output directory dir (means.nc,
// series.nc) and writes the standard figures into figs as PNG: the
// time-mean upper-layer height with the block's outline, the wave source's
// mask and the sponge band; the eddy height tendency and its vorticity and
// interface parts side by side on one colour scale; the E-vectors over the
// time-mean streamfunction; the eddy energy spectra; the energy-budget rates
// over time; and the block index with its histogram (when the run has a
// block). Axes are in km and days, colour bars carry units.
func Plot(dir, figs string) error {
	mf, err := netcdf.Open(filepath.Join(dir, MeansFile))
	if err != nil {
		return err
	}
	defer mf.Close()
	sf, err := netcdf.Open(filepath.Join(dir, SeriesNCFile))
	if err != nil {
		return err
	}
	defer sf.Close()
	p, err := newPlotter(mf, sf)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(figs, 0o755); err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		make func() (figure.Figure, error)
		size figure.Size
	}{
		{"height.png", p.height, figureSize},
		{"eddy_forcing.png", p.eddyForcing, panelsSize},
		{"evectors.png", p.evectors, figureSize},
		{"spectra.png", p.spectra, lineSize},
		{"budget.png", p.budget, lineSize},
		{"block_index.png", p.blockIndex, lineSize},
	} {
		fig, err := f.make()
		if err != nil {
			return fmt.Errorf("%s: %w", f.name, err)
		}
		if fig == nil {
			continue // nothing to show (e.g. no block)
		}
		b, err := figure.PNG(fig, f.size)
		if err != nil {
			return fmt.Errorf("%s: %w", f.name, err)
		}
		if err := writeSynced(filepath.Join(figs, f.name), b); err != nil {
			return err
		}
	}
	return nil
}

// plotter reads the fields of means.nc and series.nc.
type plotter struct {
	m, s   *netcdf.File
	nx, ny int
	lx, ly float64
}

func newPlotter(m, s *netcdf.File) (*plotter, error) {
	x, err := m.ReadFloat64("x")
	if err != nil {
		return nil, err
	}
	y, err := m.ReadFloat64("y")
	if err != nil {
		return nil, err
	}
	if len(x) < 2 || len(y) < 2 {
		return nil, errors.New("means: the grid has fewer than two points along an axis")
	}
	p := &plotter{m: m, s: s, nx: len(x), ny: len(y)}
	p.lx, p.ly = x[1]*float64(p.nx), y[1]*float64(p.ny)
	return p, nil
}

// has reports whether means.nc holds the variable.
func (p *plotter) has(name string) bool { _, ok := p.m.Var(name); return ok }

// layer returns layer l (0 upper) of a (layer, y, x) variable as a Field.
func (p *plotter) layer(name string, l int) (figure.Field, error) {
	v, err := p.m.ReadFloat64(name)
	if err != nil {
		return figure.Field{}, err
	}
	np := p.nx * p.ny
	if len(v) != 2*np {
		return figure.Field{}, fmt.Errorf("means: %s has %d values, want 2×%d×%d", name, len(v), p.ny, p.nx)
	}
	return p.field(v[l*np : (l+1)*np]), nil
}

// flat returns a (y, x) variable as a Field.
func (p *plotter) flat(name string) (figure.Field, error) {
	v, err := p.m.ReadFloat64(name)
	if err != nil {
		return figure.Field{}, err
	}
	if len(v) != p.nx*p.ny {
		return figure.Field{}, fmt.Errorf("means: %s has %d values, want %d×%d", name, len(v), p.ny, p.nx)
	}
	return p.field(v), nil
}

func (p *plotter) field(v []float64) figure.Field {
	return figure.Field{Values: v, Nx: p.nx, Ny: p.ny, Lx: p.lx, Ly: p.ly}
}

// overlays are the block's outline, the source's mask and the sponge band.
func (p *plotter) overlays() ([]figure.Contour, []figure.Mask, error) {
	var cs []figure.Contour
	var ms []figure.Mask
	if p.has("psi_block") {
		b, err := p.layer("psi_block", 0)
		if err != nil {
			return nil, nil, err
		}
		var mx float64
		for _, v := range b.Values {
			mx = math.Max(mx, math.Abs(v))
		}
		if mx > 0 {
			cs = append(cs,
				figure.Contour{Field: b, Levels: []float64{mx / 2}, Color: color.Black, Width: 1.5, Label: "block high (half its peak ψ)"},
				figure.Contour{Field: b, Levels: []float64{-mx / 2}, Color: color.Black, Width: 1.5, Dashed: true, Label: "block low (half its trough ψ)"})
		}
	}
	if p.has("source_mask") {
		m, err := p.flat("source_mask")
		if err != nil {
			return nil, nil, err
		}
		ms = append(ms, figure.Mask{Field: m, Threshold: math.Exp(-1), Color: color.RGBA{20, 120, 60, 255}, Outline: true, Label: "wave source (mask > 1/e)"})
	}
	if p.has("sponge_rate") {
		s, err := p.flat("sponge_rate")
		if err != nil {
			return nil, nil, err
		}
		var mx float64
		for _, v := range s.Values {
			mx = math.Max(mx, v)
		}
		if mx > 0 {
			ms = append(ms, figure.Mask{Field: s, Threshold: mx / 2, Color: color.RGBA{90, 90, 90, 255}, Hatch: true, Label: "sponge (rate > half its peak)"})
		}
	}
	return cs, ms, nil
}

func (p *plotter) height() (figure.Figure, error) {
	z, err := p.layer("height_mean", 0)
	if err != nil {
		return nil, err
	}
	cs, ms, err := p.overlays()
	if err != nil {
		return nil, err
	}
	return &figure.Map{Title: "time-mean height anomaly, upper layer", Panels: []figure.Panel{{Field: z}},
		Scale: figure.Signed, Units: "m", Contours: cs, Masks: ms}, nil
}

func (p *plotter) eddyForcing() (figure.Figure, error) {
	var panels []figure.Panel
	for _, f := range []struct{ name, title string }{
		{"zt", "eddy PV flux"}, {"zt_vort", "vorticity-flux part"}, {"zt_interface", "interface-flux part"},
	} {
		z, err := p.layer(f.name, 0)
		if err != nil {
			return nil, err
		}
		panels = append(panels, figure.Panel{Title: f.title, Field: z})
	}
	cs, ms, err := p.overlays()
	if err != nil {
		return nil, err
	}
	return &figure.Map{Title: "eddy height tendency f0 ψt/g, upper layer", Panels: panels,
		Scale: figure.Signed, Percentile: 99.5, Units: "m day⁻¹", Contours: cs, Masks: ms}, nil
}

func (p *plotter) evectors() (figure.Figure, error) {
	ex, err := p.layer("ex", 0)
	if err != nil {
		return nil, err
	}
	ey, err := p.layer("ey", 0)
	if err != nil {
		return nil, err
	}
	psi, err := p.layer("psi_mean", 0)
	if err != nil {
		return nil, err
	}
	_, ms, err := p.overlays()
	if err != nil {
		return nil, err
	}
	return &figure.Vectors{Title: "E-vectors (v′² − u′², −u′v′) over the time-mean streamfunction, upper layer",
		U: ex, V: ey, Units: "m² s⁻²", Stream: psi, StreamName: "mean ψ₁", StreamUnits: "m² s⁻¹", Masks: ms}, nil
}

func (p *plotter) spectra() (figure.Figure, error) {
	k, err := p.m.ReadFloat64("wavenumber")
	if err != nil {
		return nil, err
	}
	ke, err := p.m.ReadFloat64("ke_spectrum")
	if err != nil {
		return nil, err
	}
	if len(ke) != 2*len(k) {
		return nil, fmt.Errorf("means: ke_spectrum has %d values, want 2×%d", len(ke), len(k))
	}
	// the K = 0 shell holds the domain mean, which has no energy: leave it
	// out of the logarithmic axis
	first := 0
	for first < len(k) && k[first] <= 0 {
		first++
	}
	k = k[first:]
	n := len(k)
	lines := []figure.Line{
		{Label: "kinetic, upper layer", X: k, Y: ke[first : first+n]},
		{Label: "kinetic, lower layer", X: k, Y: ke[2*first+n:]},
	}
	for _, s := range []struct{ name, label string }{
		{"barotropic_ke_spectrum", "kinetic, barotropic mode"},
		{"baroclinic_ke_spectrum", "kinetic, baroclinic mode"},
		{"ape_spectrum", "available potential"},
	} {
		y, err := p.m.ReadFloat64(s.name)
		if err != nil {
			return nil, err
		}
		lines = append(lines, figure.Line{Label: s.label, X: k, Y: y[first:], Dashed: s.name == "ape_spectrum"})
	}
	return &figure.Spectra{Title: "time-mean eddy energy spectra", XLabel: "total wavenumber K (rad m⁻¹)",
		YLabel: "energy density (m³ s⁻²)", Lines: lines}, nil
}

func (p *plotter) budget() (figure.Figure, error) {
	days, err := p.s.ReadFloat64("time")
	if err != nil {
		return nil, err
	}
	var lines []figure.Line
	for _, t := range qg.Terms() {
		if t == qg.TermAdvection {
			continue // exchanges energy only: zero up to rounding for the full flow
		}
		y, err := p.s.ReadFloat64("rate_" + t.String())
		if err != nil {
			return nil, err
		}
		nonzero := false
		for _, v := range y {
			nonzero = nonzero || v != 0
		}
		if nonzero && len(y) > 1 {
			// the first sample's rate spans the interval before it: drop it
			lines = append(lines, figure.Line{Label: t.String(), X: days[1:], Y: y[1:]})
		}
	}
	return &figure.Series{Title: "energy-budget rates", YLabel: "rate (m² s⁻³)", Lines: lines}, nil
}

func (p *plotter) blockIndex() (figure.Figure, error) {
	if _, ok := p.s.Var("block_index"); !ok {
		return nil, nil
	}
	days, err := p.s.ReadFloat64("time")
	if err != nil {
		return nil, err
	}
	x, err := p.s.ReadFloat64("block_index")
	if err != nil {
		return nil, err
	}
	return &figure.Distribution{Title: "block index: projection of the flow on the block", Label: "block index", Days: days, Values: x}, nil
}
