package attribution

import (
	"errors"
	"fmt"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// A Recorder records, at the diagnostics' sample times of an experiment's
// averaging window, what its diagnostics do not keep and the mean-state
// forcing can use: the domain mean of the PV, the realised time mean of a
// red-noise wave source (white noise has no value at an instant), the
// first and last states of the window (the trend) and the time-mean
// streamfunction of consecutive segments of the window (for the sampling
// noise). Make it before the run's first step and call Observe after every
// step.
type Recorder struct {
	e     *experiment.Experiment
	times []float64 // the window's sample times
	k     int       // samples taken
	noise *wavemaker.Noise

	q0          [2]complex128     // sum of the domain-mean PV coefficients
	stoch, buf  [2][]complex128   // sum of the red noise's tendency; work
	seg         [][2][]complex128 // sums of ψ per segment of the window
	count       []int
	first, last [2][]complex128 // PV at the first and last samples
	tFirst      float64
	tLast       float64
}

// NewRecorder makes a Recorder for e, which must be at its start, that
// splits the window's samples into the given number of consecutive
// segments of equal size (at least 2; the last takes the remainder).
func NewRecorder(e *experiment.Experiment, segments int) (*Recorder, error) {
	if e.Model.Steps() != 0 {
		return nil, errors.New("attribution: NewRecorder: the experiment has already stepped")
	}
	if segments < 2 {
		return nil, fmt.Errorf("attribution: NewRecorder: %d segments: need at least 2", segments)
	}
	ns := e.Model.Grid().Len()
	r := &Recorder{e: e, times: sampleTimes(e.Config)}
	if n, ok := e.Maker.(*wavemaker.Noise); ok && e.Config.Wavemaker.Kind == wavemaker.Red {
		r.noise = n
		r.stoch, r.buf = pair(ns), pair(ns)
	}
	if len(r.times) < segments {
		return nil, fmt.Errorf("attribution: the averaging window has %d samples, fewer than the %d segments", len(r.times), segments)
	}
	r.seg = make([][2][]complex128, segments)
	r.count = make([]int, segments)
	for i := range r.seg {
		r.seg[i] = pair(ns)
	}
	return r, nil
}

// Observe samples the model if the diagnostics just took a sample of the
// averaging window (the step count is a multiple of run.sample_steps and
// the time is past the spin-up).
func (r *Recorder) Observe() {
	e := r.e
	m := e.Model
	if r.k >= len(r.times) || m.Steps()%e.Config.Run.SampleSteps != 0 || m.Time() < e.Config.Run.SpinUpDays*86400 {
		return
	}
	q, psi := m.SpectralPV(), m.SpectralStreamfunction()
	h := min(len(r.seg)-1, r.k/(len(r.times)/len(r.seg)))
	for n := range 2 {
		r.q0[n] += q[n][0]
		for p, z := range psi[n] {
			r.seg[h][n][p] += z
		}
	}
	r.count[h]++
	if r.noise != nil {
		r.noise.Tendency(r.buf)
		for n := range 2 {
			for p, z := range r.buf[n] {
				r.stoch[n][p] += z
			}
		}
	}
	if r.k == 0 {
		r.first, r.tFirst = clonePair(q), m.Time()
	}
	r.last, r.tLast = clonePair(q), m.Time()
	r.k++
}

func clonePair(q [2][]complex128) [2][]complex128 {
	return [2][]complex128{append([]complex128(nil), q[0]...), append([]complex128(nil), q[1]...)}
}

// MeanForcing returns the mean-state forcing of the finished run, as
// FromExperiment does, with what was recorded: the domain mean of q̄ as
// sampled, the red noise's realised time mean as part of F̄ (and in
// MeanForcing.Stochastic), and the trend of the window.
func (r *Recorder) MeanForcing() (*MeanForcing, error) {
	if r.k == 0 {
		return nil, errors.New("attribution: the recorder took no samples (was Observe called after every step?)")
	}
	if r.k != r.e.Diag.Samples() {
		return nil, fmt.Errorf("attribution: the recorder took %d samples and the diagnostics %d (was Observe called after every step?)", r.k, r.e.Diag.Samples())
	}
	ns := len(r.first[0])
	x := &recorded{q0: r.q0, trend: pair(ns)}
	w := 1 / float64(r.k)
	for n := range 2 {
		x.q0[n] *= complex(w, 0)
	}
	if r.noise != nil {
		x.stoch = pair(ns)
		for n := range 2 {
			for p, z := range r.stoch[n] {
				x.stoch[n][p] = z * complex(w, 0)
			}
		}
	}
	if r.k > 1 {
		dt := complex(r.tLast-r.tFirst, 0)
		for n := range 2 {
			for p := range x.trend[n] {
				x.trend[n][p] = (r.last[n][p] - r.first[n][p]) / dt
			}
			x.trend[n][0] = 0
		}
	}
	return fromExperiment(r.e, x)
}

// Segments returns the time-mean streamfunction (spectral, m² s⁻¹) of
// each segment of the window.
func (r *Recorder) Segments() [][2][]complex128 {
	out := make([][2][]complex128, len(r.seg))
	for i := range r.seg {
		out[i] = pair(len(r.seg[i][0]))
		w := complex(1/float64(max(1, r.count[i])), 0)
		for n := range 2 {
			for p, z := range r.seg[i][n] {
				out[i][n][p] = z * w
			}
			out[i][n][0] = 0
		}
	}
	return out
}

// Halves returns the time-mean streamfunction (spectral, m² s⁻¹) of the
// samples of the first and of the second half of the segments, and the
// number of samples in each.
func (r *Recorder) Halves() ([2][2][]complex128, [2]int) {
	var out [2][2][]complex128
	var count [2]int
	k := len(r.seg)
	for h := range 2 {
		out[h] = pair(len(r.seg[0][0]))
		for i := h * k / 2; i < (h+1)*k/2; i++ {
			out[h] = add(out[h], r.seg[i])
			count[h] += r.count[i]
		}
		w := complex(1/float64(max(1, count[h])), 0)
		for n := range 2 {
			for p := range out[h][n] {
				out[h][n][p] *= w
			}
			out[h][n][0] = 0
		}
	}
	return out, count
}
