package attribution

import (
	"errors"
	"fmt"
	"math"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/linear"
)

// LinearOptions bound the search for a linear steady response.
type LinearOptions struct {
	// Tol is the relative residual GMRES stops at (default 1e-6, far below
	// the sampling noise of any time mean), and the relative change per
	// day the fallback time integration stops at.
	Tol float64 `toml:"tol" json:"tol"`
	// MaxIterations bounds GMRES's iterations (default 4000); MaxDays the
	// fallback time integration (default 2000 days).
	MaxIterations int     `toml:"max_iterations" json:"max_iterations"`
	MaxDays       float64 `toml:"max_days" json:"max_days"`
	// Restart is the size of GMRES's Krylov space before it restarts
	// (default 150).
	Restart int `toml:"restart" json:"restart"`
	// SpanDays is the model time over which GMRES seeks the fixed point of
	// the linear model's steps (default 5 days; see qg/linear.Options.Span):
	// over days the fast modes contract and the slow ones dominate, which
	// takes far fewer steps in all than a span of one step.
	SpanDays float64 `toml:"span_days" json:"span_days"`
}

// Validate checks the options (zero values take the defaults).
func (o LinearOptions) Validate() error {
	for _, err := range []error{
		check.NonNegative("linear.tol", o.Tol),
		check.NonNegative("linear.max_days", o.MaxDays),
		check.NonNegative("linear.span_days", o.SpanDays),
	} {
		if err != nil {
			return err
		}
	}
	if o.Tol >= 1 {
		return &qg.FieldError{Field: "linear.tol", Value: o.Tol, Why: "must be below 1 (0 takes the default, 1e-6)"}
	}
	if o.Restart < 0 {
		return &qg.FieldError{Field: "linear.restart", Value: o.Restart, Why: "must be 0 (the default, 150) or more"}
	}
	if o.MaxIterations < 0 {
		return &qg.FieldError{Field: "linear.max_iterations", Value: o.MaxIterations, Why: "must be 0 (the default, 4000) or more"}
	}
	return nil
}

func (o LinearOptions) linear(dt float64) linear.Options {
	if o.Tol == 0 {
		o.Tol = 1e-6
	}
	if o.SpanDays == 0 {
		o.SpanDays = 5
	}
	return linear.Options{Tol: o.Tol, MaxIterations: o.MaxIterations, MaxDays: o.MaxDays, Restart: o.Restart,
		Span: max(1, int(math.Round(o.SpanDays*86400/dt)))}
}

// Linear is the model linearised about a basic state (package qg/linear),
// with the drag, dissipation and sponge of the configuration.
type Linear struct {
	l   *linear.Model
	cfg qg.Config
}

// NewLinear builds the model of c linearised about the basic state whose
// streamfunction, relative to the imposed flow, is basic (m² s⁻¹, Ny rows
// of Nx points per layer; nil for the imposed flow alone). Close releases
// it.
func NewLinear(c qg.Config, basic [2][]float64) (*Linear, error) {
	l, err := linear.New(c, basic)
	if err != nil {
		return nil, err
	}
	return &Linear{l: l, cfg: c}, nil
}

// AboutMean builds the model linearised about a run's time mean, with the
// run's model configuration. The relaxed block mode is refused: its
// relaxation towards the block is a term of the run's equations that the
// linear model does not have.
func AboutMean(mf *MeanForcing) (*Linear, error) {
	if err := linearMode(mf.Config); err != nil {
		return nil, err
	}
	tg, err := newGridder(mf.grid)
	if err != nil {
		return nil, err
	}
	return NewLinear(mf.Config.Model, [2][]float64{tg.grid(mf.Psi[0]), tg.grid(mf.Psi[1])})
}

// AboutBlock builds the model of c linearised about the imposed flow plus
// the block as prescribed (the imposed flow alone without a block).
func AboutBlock(c experiment.Config) (*Linear, error) {
	var basic [2][]float64
	if c.Block.Enabled() {
		if err := linearMode(c); err != nil {
			return nil, err
		}
		b, err := c.Block.Block(c.Model)
		if err != nil {
			return nil, err
		}
		basic = b.Psi
	}
	return NewLinear(c.Model, basic)
}

// linearMode refuses the block modes the linear model cannot represent.
func linearMode(c experiment.Config) error {
	if !c.Block.Enabled() {
		return nil
	}
	switch c.Block.Mode {
	case qg.Fixed:
		return fmt.Errorf("attribution: %w", ErrFixedMode)
	case qg.Relaxed:
		return &qg.FieldError{Field: "block.mode", Value: string(c.Block.Mode),
			Why: "the linear model has no relaxation towards the block (a term of the relaxed mode's equations); use the forced or free mode, or no block"}
	}
	return nil
}

// Close releases the model.
func (l *Linear) Close() { l.l.Close() }

// Model returns the underlying qg/linear model.
func (l *Linear) Model() *linear.Model { return l.l }

// Respond returns the steady linear response (spectral PV, s⁻¹) to the
// steady PV forcing f (s⁻², spectral): by GMRES first and, if GMRES does
// not converge, by time integration. An unstable basic state gives the
// linear model's *linear.UnstableError.
func (l *Linear) Respond(f [2][]complex128, o LinearOptions) (linear.Response, error) {
	opt := o.linear(l.cfg.Dt)
	r, err := l.l.Solve(f, opt)
	if err == nil || !errors.Is(err, linear.ErrNotSettled) {
		return r, err
	}
	// the fixed point was not reached by GMRES: step to it instead
	return l.l.Integrate(f, opt)
}
