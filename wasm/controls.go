package main

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// effect says what a control change does to the running model.
type effect int

const (
	// display changes only what is drawn.
	display effect = iota
	// schedule changes how much work a frame does.
	schedule
	// rebuild builds a new model with the changed settings and carries the
	// eddies over to it: the model time goes on, the running mean restarts.
	rebuild
	// restart builds a new model from the start (a new grid, another
	// scenario): the model time goes back to zero.
	restart
)

// option is one choice of a select control.
type option struct {
	Value string `json:"value"`
	Label string `json:"label"`
}

// control is one of the page's controls: the name the page uses
// (data-control="name"), a label in plain words, its unit on the page and
// how it changes the settings.
type control struct {
	Name, Label, Unit string
	// Scale converts the page's number to SI: value × Scale.
	Scale   float64
	Options []option // a select's choices; nil for a number
	Effect  effect
	// set applies a number (in SI, after Scale) or a choice to s.
	setNum func(s *settings, v float64) error
	setOpt func(s *settings, v string) error
	// get returns the current value in the page's unit (a number printed
	// for an input, or a choice's value).
	get func(s *settings) string
}

// Grid sizes offered, by number of points along x (y has half as many on
// the built-in 2:1 domain).
var gridSizes = [...]int{64, 128, 256}

// settings are the values behind the controls: the experiment's
// configuration and the display and scheduling choices around it.
type settings struct {
	Config   experiment.Config
	Scenario string // the built-in experiment the configuration started from
	Nx       int    // grid points along x

	StepsPerFrame int
	Live          string // live field: pv, pv_total, psi, height
	Mean          string // running-mean field: conv, conv_vort, conv_interface, zt, zt_vort, zt_interface
	Layer         int    // 1 upper, 2 lower
	Arrows        string // over the running mean: off, or evec (E-vectors over the mean streamfunction)

	// blockShape is the shape the scenario's block has, restored when the
	// block is switched back on.
	blockShape block.Shape
	// sourceKind is the kind of the source whose parameters the page
	// shows: the source's kind, or while it is off the kind it had.
	sourceKind wavemaker.Kind
}

// defaultGrid is the grid the page starts on, and the steps per frame each
// grid starts with (about one model day per second of wall time at 30
// frames per second, see the speed table in the README).
const defaultGrid = 128

func defaultSteps(nx int) int {
	switch nx {
	case 64:
		return 1
	case 256:
		return 4
	}
	return 2
}

// newSettings returns the settings of built-in scenario name at nx points.
func newSettings(name string, nx int) (settings, error) {
	c, err := experiment.Builtin(name)
	if err != nil {
		return settings{}, err
	}
	s := settings{Config: c, Scenario: name, StepsPerFrame: defaultSteps(nx), Live: "pv", Mean: "conv", Layer: 1, Arrows: "off", blockShape: c.Block.Shape}
	if s.blockShape == block.None || s.blockShape == "" {
		s.blockShape = block.DipoleShape
	}
	s.sourceKind = c.Wavemaker.Kind
	if s.sourceKind == wavemaker.Off || s.sourceKind == "" {
		s.sourceKind = wavemaker.WaveTrain
		_ = setSourceKind(&s, string(wavemaker.Off))
	}
	if err := s.setGrid(nx); err != nil {
		return settings{}, err
	}
	return s, nil
}

// setGrid puts the configuration on a grid of nx points along x, keeping
// the domain's aspect ratio and scaling the time step with the grid length
// (the scenario's own CFL number and resolution of its fastest waves).
func (s *settings) setGrid(nx int) error {
	ok := false
	for _, g := range gridSizes {
		ok = ok || g == nx
	}
	if !ok {
		return fmt.Errorf("grid: %d points along x is not offered (64, 128 or 256)", nx)
	}
	base, err := experiment.Builtin(s.Scenario)
	if err != nil {
		return err
	}
	m := &s.Config.Model
	m.Nx = nx
	m.Ny = max(8, int(math.Round(float64(nx)*m.Ly/m.Lx)))
	m.Dt = base.Model.Dt * float64(base.Model.Nx) / float64(nx)
	m.Workers = 1 // WebAssembly runs on one thread
	s.Nx = nx
	return nil
}

// controls lists every control of the page, in the page's order.
func controls() []control {
	num := func(name, label, unit string, scale float64, eff effect, set func(*settings, float64) error, get func(*settings) float64) control {
		return control{Name: name, Label: label, Unit: unit, Scale: scale, Effect: eff, setNum: set,
			get: func(s *settings) string { return formatInput(get(s) / scale) }}
	}
	sel := func(name, label string, opts []option, eff effect, set func(*settings, string) error, get func(*settings) string) control {
		return control{Name: name, Label: label, Options: opts, Effect: eff, setOpt: set, get: get}
	}
	var scen []option
	for _, c := range experiment.Builtins() {
		scen = append(scen, option{c.Name, scenarioLabel(c.Name)})
	}
	wm := func(s *settings) *wavemaker.Config { return &s.Config.Wavemaker }
	return []control{
		sel("scenario", "Scenario", scen, restart, func(s *settings, v string) error {
			n, err := newSettings(v, s.Nx)
			if err != nil {
				return err
			}
			n.StepsPerFrame, n.Live, n.Mean, n.Layer, n.Arrows = s.StepsPerFrame, s.Live, s.Mean, s.Layer, s.Arrows
			*s = n
			return nil
		}, func(s *settings) string { return s.Scenario }),

		sel("source", "Wave source", []option{
			{string(wavemaker.WaveTrain), "coherent wave train"},
			{string(wavemaker.White), "white noise"},
			{string(wavemaker.Red), "red noise"},
			{string(wavemaker.Off), "off"},
		}, rebuild, setSourceKind, func(s *settings) string { return string(wm(s).Kind) }),
		num("train_amplitude", "Wave-train strength (PV tendency at the source's centre; 0 switches it off)", "10⁻¹⁰ s⁻²", 1e-10, rebuild,
			func(s *settings, v float64) error { return s.setStrength(v, &wm(s).Train.Amplitude) },
			func(s *settings) float64 { return s.strength(wm(s).Train.Amplitude) }),
		num("train_wavelength", "Wave-train wavelength (east–west)", "km", 1e3, rebuild,
			func(s *settings, v float64) error { wm(s).Train.WavelengthX = v; return nil },
			func(s *settings) float64 { return wm(s).Train.WavelengthX }),
		num("noise_rate", "Noise strength (energy injection rate; 0 switches it off)", "10⁻⁶ m² s⁻³", 1e-6, rebuild,
			func(s *settings, v float64) error { return s.setStrength(v, &wm(s).InjectionRate) },
			func(s *settings) float64 { return s.strength(wm(s).InjectionRate) }),
		num("band_min", "Noise band: shortest wavelength", "km", 1e3, rebuild,
			func(s *settings, v float64) error { wm(s).Band.MinWavelength = v; return nil },
			func(s *settings) float64 { return wm(s).Band.MinWavelength }),
		num("band_max", "Noise band: longest wavelength", "km", 1e3, rebuild,
			func(s *settings, v float64) error { wm(s).Band.MaxWavelength = v; return nil },
			func(s *settings) float64 { return wm(s).Band.MaxWavelength }),
		num("correlation", "Red noise: correlation time", "h", 3600, rebuild,
			func(s *settings, v float64) error { wm(s).CorrelationTime = v; return nil },
			func(s *settings) float64 { return wm(s).CorrelationTime }),
		num("source_x", "Source centre, east of the western edge", "km", 1e3, rebuild,
			func(s *settings, v float64) error { return moveSource(wm(s), v, math.NaN()) },
			func(s *settings) float64 { x, _ := sourceCentre(*wm(s)); return x }),
		num("source_y", "Source centre, north of the southern edge", "km", 1e3, rebuild,
			func(s *settings, v float64) error { return moveSource(wm(s), math.NaN(), v) },
			func(s *settings) float64 { _, y := sourceCentre(*wm(s)); return y }),

		sel("block", "Block", []option{{"on", "on"}, {"off", "off"}}, rebuild, func(s *settings, v string) error {
			switch v {
			case "on":
				s.Config.Block.Shape = s.blockShape
			case "off":
				s.Config.Block.Shape = block.None
			default:
				return fmt.Errorf("block: %q: choose on or off", v)
			}
			return nil
		}, func(s *settings) string {
			if s.Config.Block.Shape == block.None || s.Config.Block.Shape == "" {
				return "off"
			}
			return "on"
		}),
		num("block_height", "Block amplitude (height of each lobe, upper layer)", "m", 1, rebuild,
			func(s *settings, v float64) error {
				b := &s.Config.Block
				if s.blockShape == block.ModonShape {
					b.Modon.Height = v
				} else {
					b.Dipole.Height = v
				}
				return nil
			},
			func(s *settings) float64 {
				if s.blockShape == block.ModonShape {
					return s.Config.Block.Modon.Height
				}
				return s.Config.Block.Dipole.Height
			}),
		sel("block_mode", "Block held by", []option{
			{string(qg.Forced), "a steady forcing (forced)"},
			{string(qg.Fixed), "nothing: fixed background (fixed)"},
			{string(qg.Relaxed), "relaxation towards it (relaxed)"},
			{string(qg.Free), "nothing: free to evolve (free)"},
		}, rebuild, func(s *settings, v string) error {
			s.Config.Block.Mode = qg.BlockMode(v)
			if s.Config.Block.Mode == qg.Relaxed && s.Config.Block.RelaxTime == 0 {
				s.Config.Block.RelaxTime = 10 * 86400 // a start the user can change
			}
			return nil
		}, func(s *settings) string { return string(s.Config.Block.Mode) }),
		num("relax_time", "Relaxation time", "days", 86400, rebuild,
			func(s *settings, v float64) error { s.Config.Block.RelaxTime = v; return nil },
			func(s *settings) float64 { return s.Config.Block.RelaxTime }),

		num("shear", "Shear U1 − U2 (lower-layer wind kept)", "m s⁻¹", 1, rebuild,
			func(s *settings, v float64) error { s.Config.Model.U1 = s.Config.Model.U2 + v; return nil },
			func(s *settings) float64 { return s.Config.Model.U1 - s.Config.Model.U2 }),
		num("drag", "Ekman drag on the lower layer", "day⁻¹", 1.0/86400, rebuild,
			func(s *settings, v float64) error { s.Config.Model.Drag = v; return nil },
			func(s *settings) float64 { return s.Config.Model.Drag }),
		sel("scheme", "Time scheme", []option{{string(qg.RK4), "Runge–Kutta 4"}, {string(qg.AB3), "Adams–Bashforth 3"}}, rebuild,
			func(s *settings, v string) error { s.Config.Model.Scheme = qg.Scheme(v); return nil },
			func(s *settings) string { return string(s.Config.Model.Scheme) }),
		sel("grid", "Grid", []option{{"64", "64 × 32"}, {"128", "128 × 64"}, {"256", "256 × 128"}}, restart,
			func(s *settings, v string) error {
				n, err := strconv.Atoi(v)
				if err != nil {
					return fmt.Errorf("grid: %q is not a grid size", v)
				}
				if err := s.setGrid(n); err != nil {
					return err
				}
				s.StepsPerFrame = defaultSteps(n)
				return nil
			}, func(s *settings) string { return strconv.Itoa(s.Nx) }),
		{Name: "steps", Label: "Steps per frame", Unit: "", Scale: 1, Effect: schedule,
			setNum: func(s *settings, v float64) error {
				if v != math.Trunc(v) || v < 1 || v > maxStepsPerFrame {
					return fmt.Errorf("steps per frame = %s: must be a whole number from 1 to %d", formatInput(v), maxStepsPerFrame)
				}
				s.StepsPerFrame = int(v)
				return nil
			},
			get: func(s *settings) string { return strconv.Itoa(s.StepsPerFrame) }},

		sel("live", "Live field", []option{
			{"pv", "PV anomaly"}, {"pv_total", "PV with the background gradient"},
			{"psi", "streamfunction ψ"}, {"height", "height f0ψ/g"},
		}, display, func(s *settings, v string) error { s.Live = v; return nil }, func(s *settings) string { return s.Live }),
		sel("mean", "Running mean", []option{
			{"conv", "eddy PV flux convergence"}, {"conv_vort", "its vorticity-flux part"}, {"conv_interface", "its interface (heat) flux part"},
			{"zt", "eddy height tendency"}, {"zt_vort", "its vorticity-flux part"}, {"zt_interface", "its interface (heat) flux part"},
		}, display, func(s *settings, v string) error { s.Mean = v; return nil }, func(s *settings) string { return s.Mean }),
		sel("arrows", "Over the mean", []option{{"off", "nothing"}, {"evec", "E-vectors and mean ψ"}}, display,
			func(s *settings, v string) error { s.Arrows = v; return nil }, func(s *settings) string { return s.Arrows }),
		sel("layer", "Layer", []option{{"1", "upper"}, {"2", "lower"}}, display,
			func(s *settings, v string) error { s.Layer = int(v[0] - '0'); return nil },
			func(s *settings) string { return strconv.Itoa(s.Layer) }),
	}
}

// maxStepsPerFrame bounds the steps per frame, so that a typing slip
// cannot freeze the page for minutes.
const maxStepsPerFrame = 64

// findControl returns the control of the given name.
func findControl(name string) (control, bool) {
	for _, c := range controls() {
		if c.Name == name {
			return c, true
		}
	}
	return control{}, false
}

// apply parses value for control c and applies it to a copy of s. The
// copy is returned with nil, or s unchanged with an error that names the
// control in the page's words. The library's validation happens when the
// new settings are built into a model.
func (c control) apply(s settings, value string) (settings, error) {
	value = strings.TrimSpace(value)
	// the copy must not share the patches of the mask with s
	s.Config.Wavemaker.Mask.Patches = append([]wavemaker.PatchConfig(nil), s.Config.Wavemaker.Mask.Patches...)
	if c.Options != nil {
		ok := false
		for _, o := range c.Options {
			ok = ok || o.Value == value
		}
		if !ok {
			var vs []string
			for _, o := range c.Options {
				vs = append(vs, o.Value)
			}
			return s, fmt.Errorf("%s: %q is not one of %s", strings.ToLower(c.Label), value, strings.Join(vs, ", "))
		}
		return s, c.setOpt(&s, value)
	}
	v, err := strconv.ParseFloat(value, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return s, fmt.Errorf("%s: %q is not a number", strings.ToLower(c.Label), value)
	}
	return s, c.setNum(&s, v*c.Scale)
}

// setStrength sets a strength of the source (the wave train's amplitude or
// the noise's injection rate, *p): zero switches the source off, keeping
// its kind and parameters for when it is switched on again, and any other
// value switches it on with that strength, for the library to check.
func (s *settings) setStrength(v float64, p *float64) error {
	w := &s.Config.Wavemaker
	if v == 0 {
		w.Kind = wavemaker.Off
		return nil
	}
	w.Kind = s.sourceKind
	*p = v
	return nil
}

// strength returns the strength v of the source, 0 while it is off.
func (s *settings) strength(v float64) float64 {
	if s.Config.Wavemaker.Kind == wavemaker.Off {
		return 0
	}
	return v
}

// setSourceKind switches the wave source's kind, filling the parameters
// the new kind needs and the scenario left unset with those of the
// built-in experiment that uses that kind (the default's wave train, the
// control's white noise), so that a switch gives a working source.
func setSourceKind(s *settings, v string) error {
	w := &s.Config.Wavemaker
	w.Kind = wavemaker.Kind(v)
	if w.Kind != wavemaker.Off {
		s.sourceKind = w.Kind
	}
	switch w.Kind {
	case wavemaker.WaveTrain:
		if w.Train == (wavemaker.TrainConfig{}) {
			w.Train = experiment.Default().Wavemaker.Train
		}
	case wavemaker.White, wavemaker.Red:
		ref := experiment.WhiteNoiseControl().Wavemaker
		if w.Band == (wavemaker.BandConfig{}) {
			w.Band = ref.Band
		}
		if w.InjectionRate == 0 {
			w.InjectionRate = ref.InjectionRate
		}
		if w.Kind == wavemaker.Red && w.CorrelationTime == 0 {
			w.CorrelationTime = 86400 // one day, a synoptic time scale (common practice)
		}
	}
	return nil
}

// sourceCentre returns the centre of the source's mask (the mean of its
// patches' centres), m; NaN when the source covers the whole domain.
func sourceCentre(w wavemaker.Config) (x, y float64) {
	switch w.Mask.Kind {
	case wavemaker.Patch:
		return w.Mask.X, w.Mask.Y
	case wavemaker.Patches:
		if len(w.Mask.Patches) == 0 {
			return math.NaN(), math.NaN()
		}
		for _, p := range w.Mask.Patches {
			x += p.X
			y += p.Y
		}
		n := float64(len(w.Mask.Patches))
		return x / n, y / n
	}
	return math.NaN(), math.NaN()
}

// moveSource moves the source's mask so that its centre is at (x, y),
// keeping the patches' arrangement; a NaN coordinate is left as it is.
func moveSource(w *wavemaker.Config, x, y float64) error {
	cx, cy := sourceCentre(*w)
	if math.IsNaN(cx) {
		return fmt.Errorf("source centre: this source covers the whole domain and has no position")
	}
	dx, dy := 0.0, 0.0
	if !math.IsNaN(x) {
		dx = x - cx
	}
	if !math.IsNaN(y) {
		dy = y - cy
	}
	if w.Mask.Kind == wavemaker.Patch {
		w.Mask.X += dx
		w.Mask.Y += dy
		return nil
	}
	for i := range w.Mask.Patches {
		w.Mask.Patches[i].X += dx
		w.Mask.Patches[i].Y += dy
	}
	return nil
}

// scenarioLabel is the plain-words name of a built-in experiment.
func scenarioLabel(name string) string {
	switch name {
	case "wave-train-strained-by-block":
		return "wave train strained by the block (default)"
	case "storm-track-ending-at-block":
		return "stochastic storm track ending at the block"
	case "white-noise-control":
		return "white-noise control (erodes the block)"
	}
	return name
}

// formatInput prints a number for an input box: as short as it reads back
// exactly, at most 6 significant digits.
func formatInput(v float64) string {
	if math.IsNaN(v) {
		return ""
	}
	s := strconv.FormatFloat(v, 'g', 6, 64)
	if f, err := strconv.ParseFloat(s, 64); err == nil {
		return strconv.FormatFloat(f, 'g', -1, 64)
	}
	return s
}
