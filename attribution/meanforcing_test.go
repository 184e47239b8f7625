package attribution

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// smallConfig is the built-in attribution experiment on a coarse grid
// (64 × 32, dt = 1 h) with short runs, for fast tests.
func smallConfig() Config {
	c := Builtin()
	c.Model.Nx, c.Model.Ny, c.Model.Dt = 64, 32, 3600
	c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 120, 40, 2
	return c
}

// runRecorded runs e to its end with a Recorder of two segments.
func runRecorded(t *testing.T, e *experiment.Experiment) *Recorder {
	t.Helper()
	rec, err := NewRecorder(e, 2)
	if err != nil {
		t.Fatal(err)
	}
	for !e.Done() {
		if _, _, err := e.Advance(); err != nil {
			t.Fatal(err)
		}
		rec.Observe()
	}
	return rec
}

// relChange is ‖a − b‖/‖b‖ over both layers of spectral fields.
func relChange(a, b [2][]complex128) float64 {
	var num, den float64
	for n := range 2 {
		for p := range a[n] {
			d := a[n][p] - b[n][p]
			num += real(d)*real(d) + imag(d)*imag(d)
			den += real(b[n][p])*real(b[n][p]) + imag(b[n][p])*imag(b[n][p])
		}
	}
	return math.Sqrt(num / den)
}

// TestMeanForcingHoldsTimeMean checks the defining property of the
// mean-state forcing (common practice in the attribution of eddy
// feedbacks: H = −N(q̄) is the forcing that makes the time mean an exact
// steady state of the model without eddies): the nonlinear model started
// from a run's time mean and driven by H, with no wave source, moves by
// less than 1e-9 (relative) over 1000 steps — for a forced, a relaxed and a
// free block and without one, with a sponge and a filter, H computed both
// from the diagnostics alone and with a Recorder. Without H the same state
// moves at once, so the check can fail.
func TestMeanForcingHoldsTimeMean(t *testing.T) {
	for _, tc := range []struct {
		name     string
		mode     qg.BlockMode
		noBlock  bool
		recorded bool
	}{
		{"forced", qg.Forced, false, false},
		{"forced, recorded", qg.Forced, false, true},
		{"relaxed", qg.Relaxed, false, true},
		{"free", qg.Free, false, false},
		{"no block", "", true, true},
	} {
		c := smallConfig().Config
		c.Run.Days, c.Run.SpinUpDays = 30, 10
		c.Block.Mode = tc.mode
		c.Block.RelaxTime = 10 * 86400
		if tc.noBlock {
			c.Block.Shape = "none"
		}
		e, err := experiment.New(c)
		if err != nil {
			t.Fatal(err)
		}
		var mf *MeanForcing
		if tc.recorded {
			rec := runRecorded(t, e)
			mf, err = rec.MeanForcing()
		} else {
			if err := e.Run(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			mf, err = FromExperiment(e)
		}
		e.Close()
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		// a model of the same configuration without the wave source
		c.Wavemaker.Kind = wavemaker.Off
		h, err := experiment.New(c)
		if err != nil {
			t.Fatal(err)
		}
		m := h.Model
		if err := m.SetSpectralPV(mf.Mean); err != nil {
			t.Fatal(err)
		}
		q0 := clonePair(m.SpectralPV())
		if err := m.Run(10); err != nil {
			t.Fatal(err)
		}
		if d := relChange(m.SpectralPV(), q0); d < 1e-6 {
			t.Fatalf("%s: the time mean without H moved by only %.3g in 10 steps: the check would prove nothing", tc.name, d)
		}
		if err := m.SetSpectralPV(q0); err != nil {
			t.Fatal(err)
		}
		if err := mf.Attach(m); err != nil {
			t.Fatal(err)
		}
		if err := m.Run(1000); err != nil {
			t.Fatal(err)
		}
		if d := relChange(m.SpectralPV(), q0); d > 1e-9 {
			t.Errorf("%s: relative change %.3g over 1000 steps with H, want < 1e-9", tc.name, d)
		} else {
			t.Logf("%s: relative change %.2g over 1000 steps", tc.name, d)
		}
		h.Close()
	}
}

// TestResidualIsTrendAndSamplingError checks the split of the mean-state
// forcing of a statistically steady run against the time-averaged PV
// equation (common practice): averaging ∂q/∂t = N(q) + F over the window
// gives H = −N(q̄) = F̄ + C̄ − (q_last − q_first)/T, up to the error of
// the time discretisation. With the red-noise source's realised mean
// recorded in F̄, the residual R = H − F̄ − C̄ must be small compared with
// H — measured at 64 × 32 over 150 days: 0.115 (PV tendencies) and 0.082
// (streamfunction tendencies) with dt = 1 h, 0.081 and 0.058 with
// dt = 30 min — and R plus the trend is the discretisation error: the
// model applies its filter, sponge and source as split steps after each
// time step, a first-order (Lie) splitting (common practice), so it must
// halve with dt (measured: 0.104 → 0.057 on the PV tendencies). Without
// the recording, the source's realised mean, which has expectation zero
// but is not small over 150 days, stays in R (measured 0.86 of H).
func TestResidualIsTrendAndSamplingError(t *testing.T) {
	var rt [2]float64
	for k, dt := range []float64{3600, 1800} {
		c := smallConfig().Config
		c.Model.Dt = dt
		c.Run.Days, c.Run.SpinUpDays, c.Run.SampleSteps = 200, 50, int(3600/dt)
		e, err := experiment.New(c)
		if err != nil {
			t.Fatal(err)
		}
		rec := runRecorded(t, e)
		mf, err := rec.MeanForcing()
		if err != nil {
			t.Fatal(err)
		}
		g, ph := mf.Grid(), mf.ph
		norm := func(a [2][]complex128) float64 { return math.Sqrt(g.LayerProduct(ph, a, a)) }
		h := norm(mf.H)
		ratio, psiRatio := mf.ResidualRatio()
		rt[k] = norm(add(mf.Residual, mf.Trend)) / h
		plain, err := FromExperiment(e)
		if err != nil {
			t.Fatal(err)
		}
		e.Close()
		plainRatio, _ := plain.ResidualRatio()
		t.Logf("dt = %g s: ‖R‖/‖H‖ = %.3g (PV), %.3g (streamfunction tendency); ‖R + trend‖/‖H‖ = %.3g; without the noise's realised mean %.3g; ‖C̄‖/‖H‖ = %.3g",
			dt, ratio, psiRatio, rt[k], plainRatio, norm(mf.Eddy)/h)
		if ratio > 0.2 || psiRatio > 0.2 {
			t.Errorf("dt = %g s: residual %.3g (PV), %.3g (ψ) of H: want below 0.2", dt, ratio, psiRatio)
		}
		if norm(mf.Eddy) < 0.3*h {
			t.Errorf("dt = %g s: the eddy forcing is only %.3g of H: the run is not eddy-driven enough for the check", dt, norm(mf.Eddy)/h)
		}
		if plainRatio < 2*ratio {
			t.Errorf("dt = %g s: without the recorded noise the residual is %.3g of H, with it %.3g: the recording should account for most of it", dt, plainRatio, ratio)
		}
	}
	if q := rt[1] / rt[0]; q > 0.65 || q < 0.35 {
		t.Errorf("‖R + trend‖ went from %.3g to %.3g of H when dt halved (ratio %.2f): a first-order error halves", rt[0], rt[1], q)
	}
}

// TestDomainMeanBalance checks the domain mean of q̄ that FromExperiment
// derives from its balance (sponge and forcing, with no flow of its own)
// against the domain mean the Recorder samples: they agree to the trend of
// the window (common practice: the time-averaged budget of the domain-mean
// PV), and H computed with either holds the mean to the same residual.
func TestDomainMeanBalance(t *testing.T) {
	c := smallConfig()
	e, err := experiment.New(c.Config)
	if err != nil {
		t.Fatal(err)
	}
	defer e.Close()
	f, err := c.Anomaly.Forcing(e.Model)
	if err != nil {
		t.Fatal(err)
	}
	e.Model.AddForcing(SteadyTendency(f))
	rec := runRecorded(t, e)
	mr, err := rec.MeanForcing()
	if err != nil {
		t.Fatal(err)
	}
	mb, err := FromExperiment(e)
	if err != nil {
		t.Fatal(err)
	}
	for n := range 2 {
		got, want := real(mb.Mean[n][0]), real(mr.Mean[n][0])
		if want == 0 {
			t.Fatalf("layer %d: the sampled domain-mean PV is zero: the sponge made none, the check would prove nothing", n+1)
		}
		if math.Abs(got-want) > 0.05*math.Abs(want) {
			t.Errorf("layer %d: domain-mean PV from the balance %.4g, sampled %.4g", n+1, got, want)
		} else {
			t.Logf("layer %d: domain-mean PV from the balance %.4g, sampled %.4g (%.2g relative)", n+1, got, want, math.Abs(got-want)/math.Abs(want))
		}
	}
	// the anomaly is in F̄ exactly (it is steady), in both (with the red
	// noise's realised mean in the recorded one)
	for _, ext := range [][2][]complex128{sub(mr.External, mr.Stochastic), mb.External} {
		if d := relChange(ext, noMean(f)); d > 1e-12 {
			t.Errorf("F̄ (less the noise's mean) differs from the anomaly by %.3g", d)
		}
	}
}

// TestFixedModeRefused checks that a fixed-mode run has no mean-state
// forcing, with the reason.
func TestFixedModeRefused(t *testing.T) {
	c := smallConfig().Config
	c.Block.Mode = qg.Fixed
	c.Run.Days, c.Run.SpinUpDays = 2, 1
	e, err := experiment.New(c)
	if err != nil {
		t.Fatal(err)
	}
	defer e.Close()
	if err := e.Run(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	if _, err := FromExperiment(e); !errors.Is(err, ErrFixedMode) {
		t.Errorf("FromExperiment of a fixed-mode run: %v, want ErrFixedMode", err)
	}
}
