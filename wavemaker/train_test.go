package wavemaker

import (
	"math"
	"math/cmplx"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// trainModel is a 64 × 64 grid on a 16 000 km × 8000 km domain (grid
// wavenumber spacing 2π/16 000 km in x, 2π/8000 km in y).
func trainModel(t *testing.T) *qg.Model {
	qc := qg.DefaultConfig()
	qc.Nx, qc.Ny = 64, 64
	return newModel(t, qc)
}

func trainConfig() Config {
	c := DefaultConfig()
	c.Kind = WaveTrain
	c.Vertical = Baroclinic
	c.Mask = MaskConfig{Kind: Patch, X: 8e6, Y: 4e6, WidthX: 2e6, WidthY: 1e6}
	c.Train = TrainConfig{
		WavelengthX: 4e6,  // k: zonal index 4
		WavelengthY: -4e6, // l: meridional index −2
		Frequency:   2 * math.Pi / (3 * 86400),
		Amplitude:   2e-10,
	}
	return c
}

func newTrain(t *testing.T, c Config, m *qg.Model) *Train {
	t.Helper()
	tr, err := NewTrain(c, m)
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

func tendencyAt(tr *Train, ns int, tt float64) [2][]complex128 {
	dq := pair(ns)
	tr.AddTendency(dq, tt)
	return dq
}

// TestTrainPattern compares the train's gridded tendency with the formula
// W1 = A·m(x, y)·cos(kx + ly − ωt) evaluated directly on the grid at several
// times (an independent evaluation; the truncation to the retained modes
// is negligible for this smooth patch), checks the baroclinic structure
// q2 = −δq1 (H1ψ1 + H2ψ2 = 0, package wavemaker), and that the spectrum peaks at
// the set (k, l): the spectrum of m·e^{iθ} is the mask's spectrum shifted to
// (k, l) (the shift theorem; Bracewell, The Fourier Transform and Its
// Applications).
func TestTrainPattern(t *testing.T) {
	m := trainModel(t)
	c := trainConfig()
	tr := newTrain(t, c, m)
	g := m.Grid()
	ns := g.Len()
	k, l, om := 2*math.Pi/c.Train.WavelengthX, 2*math.Pi/c.Train.WavelengthY, c.Train.Frequency
	delta := m.Config().Delta
	for _, tt := range []float64{0, 0.37 * 86400, 2 * 86400} {
		dq := tendencyAt(tr, ns, tt)
		w1 := toGrid(t, m, dq[0])
		w2 := toGrid(t, m, dq[1])
		var maxErr float64
		for y := range g.Ny {
			for x := range g.Nx {
				dx := qg.PeriodicDistance(g.X(x), c.Mask.X, g.Lx) / c.Mask.WidthX
				dy := qg.PeriodicDistance(g.Y(y), c.Mask.Y, g.Ly) / c.Mask.WidthY
				want := c.Train.Amplitude * math.Exp(-dx*dx-dy*dy) * math.Cos(k*g.X(x)+l*g.Y(y)-om*tt)
				p := y*g.Nx + x
				maxErr = math.Max(maxErr, math.Abs(w1[p]-want))
				if math.Abs(w2[p]+delta*w1[p]) > 1e-12*c.Train.Amplitude {
					t.Fatalf("t = %g: lower-layer tendency %g is not −δ × upper %g", tt, w2[p], w1[p])
				}
			}
		}
		t.Logf("t = %g s: max |gridded − formula| / A = %.2g", tt, maxErr/c.Train.Amplitude)
		if maxErr > 1e-6*c.Train.Amplitude {
			t.Errorf("t = %g s: gridded tendency departs from A·m·cos(kx + ly − ωt) by %.3g (A = %g)", tt, maxErr, c.Train.Amplitude)
		}
		// The spectral peak.
		best, bp := -1.0, -1
		for p := range dq[0] {
			if a := cmplx.Abs(dq[0][p]); a > best {
				best, bp = a, p
			}
		}
		bi, bj := bp%g.Nkx, bp/g.Nkx
		if math.Abs(g.K(bi)-k) > 1e-12*k || math.Abs(g.L(bj)-l) > 1e-12*math.Abs(l) {
			t.Errorf("t = %g s: spectrum peaks at (k, l) = (%g, %g) rad/m, want (%g, %g)", tt, g.K(bi), g.L(bj), k, l)
		}
	}
}

// TestTrainPeriod checks the time dependence: the tendency repeats after a
// period 2π/ω, changes sign after half of it, and is orthogonal to itself a
// quarter period later (cos(θ − π/2) = sin θ, and ⟨m² cos θ sin θ⟩ ≈ 0
// over many wavelengths; common practice).
func TestTrainPeriod(t *testing.T) {
	m := trainModel(t)
	c := trainConfig()
	tr := newTrain(t, c, m)
	g := m.Grid()
	ns := g.Len()
	period := 2 * math.Pi / c.Train.Frequency
	t0 := 0.81 * 86400
	a := tendencyAt(tr, ns, t0)
	full := tendencyAt(tr, ns, t0+period)
	half := tendencyAt(tr, ns, t0+period/2)
	quarter := tendencyAt(tr, ns, t0+period/4)
	norm := math.Sqrt(g.Inner(a[0], a[0]))
	var dFull, dHalf float64
	for p := range a[0] {
		dFull = math.Max(dFull, cmplx.Abs(full[0][p]-a[0][p]))
		dHalf = math.Max(dHalf, cmplx.Abs(half[0][p]+a[0][p]))
	}
	scale := float64(g.Nx*g.Ny) * c.Train.Amplitude
	if dFull > 1e-12*scale || dHalf > 1e-12*scale {
		t.Errorf("after one period the tendency changes by %.3g, after half a period it departs from its negative by %.3g (scale %.3g)", dFull, dHalf, scale)
	}
	if r := g.Inner(a[0], quarter[0]) / (norm * math.Sqrt(g.Inner(quarter[0], quarter[0]))); math.Abs(r) > 0.01 {
		t.Errorf("pattern correlation a quarter period apart is %.4f, want ≈ 0", r)
	}
}

// TestTrainNoMask checks a train over the whole domain: a single Fourier
// mode, whose coefficient in the unnormalised transform of A·cos(kx − ωt)
// at t = 0 is A·M/2 (the DFT of a cosine; Bracewell), and nothing elsewhere.
func TestTrainNoMask(t *testing.T) {
	m := trainModel(t)
	c := trainConfig()
	c.Mask = MaskConfig{Kind: NoMask}
	c.Vertical = Upper
	c.Train.WavelengthX, c.Train.WavelengthY = 16e6/3, 0
	tr := newTrain(t, c, m)
	g := m.Grid()
	dq := tendencyAt(tr, g.Len(), 0)
	want := c.Train.Amplitude * float64(g.Nx*g.Ny) / 2
	for p, z := range dq[0] {
		target := 0.0
		if p == 3 {
			target = want
		}
		if cmplx.Abs(z-complex(target, 0)) > 1e-9*want {
			t.Fatalf("coefficient (i, j) = (%d, %d) is %v, want %g", p%g.Nkx, p/g.Nkx, z, target)
		}
	}
	for _, z := range dq[1] {
		if z != 0 {
			t.Fatal("an upper-layer train forces the lower layer")
		}
	}
}
