package wavemaker

import "github.com/eddyblock/eddyblock/qg"

// Maker is what New returns: a wavemaker ready to be attached to the model
// it was built for. *Noise (a qg.Source), *Train (a qg.Forcing) and the
// no-op of kind "none" implement it.
type Maker interface {
	// Attach registers the wavemaker with m, as a source or a forcing.
	// Attach it once, to the model it was built for.
	Attach(m *qg.Model)
}

// New builds the wavemaker cfg describes for model m, checking cfg against
// the model's grid (ValidateFor): *Noise for kinds "white" and "red",
// *Train for "wavetrain", and a Maker whose Attach does nothing for "none".
func New(cfg Config, m *qg.Model) (Maker, error) {
	switch cfg.Kind {
	case White, Red:
		s, err := NewNoise(cfg, m)
		if err != nil {
			return nil, err
		}
		return s, nil
	case WaveTrain:
		tr, err := NewTrain(cfg, m)
		if err != nil {
			return nil, err
		}
		return tr, nil
	}
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	return none{}, nil
}

type none struct{}

func (none) Attach(*qg.Model) {}
