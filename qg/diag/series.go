package diag

// Series holds one entry per Sample call, spin-up included. Samples from
// WindowStart on form the averaging window.
type Series struct {
	Time       []float64 `json:"-"`          // model time, s
	Day        []float64 `json:"day"`        // model time, days (filled by Accumulator.Series)
	KE         []float64 `json:"ke"`         // kinetic energy, m² s⁻²
	APE        []float64 `json:"ape"`        // available potential energy, m² s⁻²
	Enstrophy1 []float64 `json:"enstrophy1"` // ½⟨q1²⟩, s⁻²
	Enstrophy2 []float64 `json:"enstrophy2"` // ½⟨q2²⟩, s⁻²
	CFL        []float64 `json:"cfl"`        // the model's CFL number at the last step
	// Rates holds, per qg.Term (keyed by its String), the energy the term
	// added since the previous sample (or since New, for the first) over
	// the interval, m² s⁻³; 0 when the interval is empty.
	Rates map[string][]float64 `json:"rates"`
	// Index is the block index, nil without a projection pattern.
	Index       []float64 `json:"index,omitempty"`
	WindowStart int       `json:"window_start"`
}

// Series returns a copy of the time series.
func (a *Accumulator) Series() Series {
	s := a.series
	cp := func(x []float64) []float64 { return append([]float64(nil), x...) }
	s.Time, s.KE, s.APE = cp(s.Time), cp(s.KE), cp(s.APE)
	s.Day = make([]float64, len(s.Time))
	for i, t := range s.Time {
		s.Day[i] = t / day
	}
	s.Enstrophy1, s.Enstrophy2, s.CFL = cp(s.Enstrophy1), cp(s.Enstrophy2), cp(s.CFL)
	if s.Index != nil {
		s.Index = cp(s.Index)
	}
	s.Rates = make(map[string][]float64, len(a.series.Rates))
	for k, v := range a.series.Rates {
		s.Rates[k] = cp(v)
	}
	return s
}

// window returns the block index over the averaging window and its mean
// sampling interval (s), and whether the sampling was uniform to 1e-6.
func (a *Accumulator) window() (x []float64, dt float64, uniform bool) {
	s := &a.series
	if s.Index == nil || len(s.Time)-s.WindowStart < 2 {
		return nil, 0, false
	}
	t := s.Time[s.WindowStart:]
	x = s.Index[s.WindowStart:]
	dt = (t[len(t)-1] - t[0]) / float64(len(t)-1)
	uniform = true
	for i := 1; i < len(t); i++ {
		if d := t[i] - t[i-1]; d < dt*(1-1e-6) || d > dt*(1+1e-6) {
			uniform = false
		}
	}
	return x, dt, uniform
}

// Episodes returns the episodes of the block index above threshold in the
// averaging window (sample indices relative to the window's start).
func (a *Accumulator) Episodes(threshold float64) []Episode {
	x, dt, _ := a.window()
	return Episodes(x, dt, threshold)
}
