package linear

import (
	"errors"
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

// Model is the linear model about one basic state.
type Model struct {
	m     *qg.Model
	force [2][]complex128 // the steady forcing f, spectral; added at every stage
}

// New builds the model of cfg linearised about the basic state with
// streamfunction basic (m² s⁻¹ per layer, Ny rows of Nx points, relative to
// the imposed flow U1, U2; nil for the imposed flow alone). It steps with
// RK4 whatever cfg.Scheme says (its fixed point is then exactly the steady
// state of the continuous equations in the stepper's terms). Like every
// block, the basic state is band-limited to the modes the cutoff filter
// leaves untouched. Close releases the model.
func New(cfg qg.Config, basic [2][]float64) (*Model, error) {
	cfg.Scheme = qg.RK4
	m, err := qg.NewModel(cfg)
	if err != nil {
		return nil, err
	}
	g := m.Grid()
	for n := range 2 {
		if basic[n] == nil {
			basic[n] = make([]float64, g.Points())
		}
	}
	if err := m.SetBlock(qg.Block{Psi: basic, Mode: qg.Fixed, Linear: true}); err != nil {
		m.Close()
		return nil, fmt.Errorf("linear: basic state: %w", err)
	}
	l := &Model{m: m}
	l.force = [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	m.AddForcing(l)
	return l, nil
}

// AddTendency adds the steady forcing (the linear model is its own
// qg.Forcing).
func (l *Model) AddTendency(dq [2][]complex128, t float64) {
	for n := range 2 {
		for p, z := range l.force[n] {
			dq[n][p] += z
		}
	}
}

// Close stops the model's goroutines.
func (l *Model) Close() { l.m.Close() }

// Grid returns the model's grid.
func (l *Model) Grid() *qg.Grid { return l.m.Grid() }

// Nonlinear returns the underlying model (fixed linear block mode), for
// reading fields of a response with its methods.
func (l *Model) Nonlinear() *qg.Model { return l.m }

// setForcing sets f (truncated to the retained modes), checking its size
// and finiteness.
func (l *Model) setForcing(f [2][]complex128) error {
	g := l.m.Grid()
	for n := range 2 {
		if len(f[n]) != g.Len() {
			return fmt.Errorf("linear: forcing of layer %d has %d coefficients, the grid needs %d", n+1, len(f[n]), g.Len())
		}
		for p, z := range f[n] {
			if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
				return fmt.Errorf("linear: forcing of layer %d is not finite at point %d", n+1, p)
			}
			l.force[n][p] = complex(g.Keep(p), 0) * z
		}
	}
	return nil
}

// Options bound the search for a steady response.
type Options struct {
	// Tol is the relative tolerance: for Integrate, the change of the
	// response over one day relative to its size; for Solve, the residual
	// of the fixed-point equation relative to that of the zero state.
	// Default 1e-9 (the rounding of a day of steps leaves a relative
	// change of a few 10⁻¹² per day).
	Tol float64
	// MaxDays bounds Integrate's model time (default 2000 days), and
	// MaxIterations Solve's iterations (default 4000).
	MaxDays       float64
	MaxIterations int
	// Restart is the Krylov space's size before GMRES restarts (default
	// 150).
	Restart int
	// Span is the number of time steps of the map whose fixed point Solve
	// seeks (default 1). The steady state is the fixed point of any number
	// of steps; over a longer span the fast, damped modes contract and the
	// map's spectrum clusters away from the slow modes, which can take
	// far fewer iterations (each costing Span steps).
	Span int
}

func (o *Options) defaults() {
	if o.Tol <= 0 {
		o.Tol = 1e-9
	}
	if o.MaxDays <= 0 {
		o.MaxDays = 2000
	}
	if o.MaxIterations <= 0 {
		o.MaxIterations = 4000
	}
	if o.Restart <= 0 {
		o.Restart = 150
	}
}

// Response is a steady response.
type Response struct {
	// Q is the response's spectral PV (both layers, the Grid's layout).
	Q [2][]complex128
	// Days is the model time Integrate took; Iterations the GMRES
	// iterations (one time step each) Solve took.
	Days       float64
	Iterations int
	// Change is the last relative change (Integrate) or residual (Solve).
	Change float64
}

// UnstableError reports a basic state on which the response grows instead
// of settling.
type UnstableError struct {
	// GrowthRate is the measured (Integrate) or estimated (Solve, from
	// the Ritz values of one time step) growth rate of the fastest
	// growing perturbation, day⁻¹.
	GrowthRate float64
	// Day is the model day at which Integrate stopped.
	Day float64
	// Route is "integration" or "gmres".
	Route string
}

func (e *UnstableError) Error() string {
	if e.Route == "gmres" {
		return fmt.Sprintf("linear: the basic state is unstable (GMRES's Ritz values show a perturbation growing at %.3g day⁻¹, e-folding %.3g days): "+
			"no steady response can be reached", e.GrowthRate, 1/e.GrowthRate)
	}
	return fmt.Sprintf("linear: the basic state is unstable: the response grows at %.3g day⁻¹ (e-folding %.3g days) instead of settling (stopped at day %.1f)",
		e.GrowthRate, 1/e.GrowthRate, e.Day)
}

// ErrNotSettled is returned (wrapped) when the search reaches its bound
// without converging or growing.
var ErrNotSettled = errors.New("linear: the response did not settle")

// zero sets the perturbation to rest.
func (l *Model) zero() error {
	g := l.m.Grid()
	z := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	return l.m.SetSpectralPV(z)
}

// Integrate finds the steady response to the steady PV forcing f (s⁻²,
// spectral, both layers) by stepping from rest, checking once per model
// day: it stops when the response changed by less than Options.Tol of its
// size over the day, and with an *UnstableError when the response grows
// instead of settling: when the largest day-to-day change of the last ten
// days has been more than twice that of the ten days before, three checks
// in a row (transient waves may make the change beat, but not grow
// tenfold).
func (l *Model) Integrate(f [2][]complex128, o Options) (Response, error) {
	o.defaults()
	if err := l.setForcing(f); err != nil {
		return Response{}, err
	}
	if err := l.zero(); err != nil {
		return Response{}, err
	}
	m := l.m
	dt := m.Config().Dt
	perDay := max(1, int(math.Round(86400/dt)))
	prev := clonePair(m.SpectralPV())
	var changes []float64
	grew := 0
	window := func(hi int) float64 { // the largest change of days hi−10 .. hi−1
		mx := 0.0
		for _, d := range changes[max(0, hi-10):hi] {
			mx = math.Max(mx, d)
		}
		return mx
	}
	for day := 1; float64(day) <= o.MaxDays; day++ {
		if err := m.Run(perDay); err != nil {
			var se *qg.StepError
			if errors.As(err, &se) && len(changes) > 1 {
				return Response{}, &UnstableError{GrowthRate: rate(changes), Day: float64(day), Route: "integration"}
			}
			return Response{}, err
		}
		q := m.SpectralPV()
		d, size := diffNorm(q, prev)
		if size == 0 {
			return Response{Q: clonePair(q), Days: float64(day)}, nil // no forcing, no response
		}
		change := d / size
		changes = append(changes, d)
		if change < o.Tol {
			return Response{Q: clonePair(q), Days: float64(day), Change: change}, nil
		}
		if n := len(changes); n >= 20 && window(n) > 2*window(n-10) {
			grew++
		} else {
			grew = 0
		}
		if grew >= 3 {
			return Response{}, &UnstableError{GrowthRate: rate(changes), Day: float64(day), Route: "integration"}
		}
		prev = clonePair(q)
	}
	return Response{}, fmt.Errorf("%w after %g days (relative change per day %.3g, tolerance %.3g)", ErrNotSettled, o.MaxDays,
		changes[len(changes)-1]/math.Max(1e-300, normPair(m.SpectralPV())), o.Tol)
}

// rate is the growth rate (day⁻¹) of the last five daily changes.
func rate(d []float64) float64 {
	n := len(d)
	k := min(5, n-1)
	if k < 1 || d[n-1-k] <= 0 {
		return math.NaN()
	}
	return math.Log(d[n-1]/d[n-1-k]) / float64(k)
}

func clonePair(q [2][]complex128) [2][]complex128 {
	return [2][]complex128{append([]complex128(nil), q[0]...), append([]complex128(nil), q[1]...)}
}

// diffNorm returns ‖a − b‖ and ‖a‖ (Euclidean over both layers).
func diffNorm(a, b [2][]complex128) (d, size float64) {
	for n := range 2 {
		for p := range a[n] {
			x := a[n][p] - b[n][p]
			d += real(x)*real(x) + imag(x)*imag(x)
			size += real(a[n][p])*real(a[n][p]) + imag(a[n][p])*imag(a[n][p])
		}
	}
	return math.Sqrt(d), math.Sqrt(size)
}

func normPair(a [2][]complex128) float64 {
	_, s := diffNorm(a, a)
	return s
}
