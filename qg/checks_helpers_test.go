package qg

import (
	"math"
	"testing"
)

// Shared helpers of the published checks (phillips_test.go, rossby_test.go,
// invariants_test.go, lamb_test.go). Names carry the prefix chk.

// chkConfig returns an inviscid configuration on an nx × ny grid of a
// domain lx × ly: no drag, no dissipation, no sponge, RK4, one worker, and a
// CFL limit that only a blow-up would reach.
func chkConfig(nx, ny int, lx, ly float64) Config {
	return Config{
		Nx: nx, Ny: ny, Lx: lx, Ly: ly,
		F0: 1e-4, Beta: 0, Ld: 7e5, Delta: 1,
		ScaleSelective: ScaleSelective{Kind: NoScaleSelective},
		Dt:             1800, Scheme: RK4, MaxCFL: 1.5, Workers: 1,
	}
}

// chkModel builds a model or stops the test.
func chkModel(t testing.TB, cfg Config) *Model {
	t.Helper()
	m, err := NewModel(cfg)
	if err != nil {
		t.Fatalf("NewModel: %v", err)
	}
	return m
}

// chkIndex returns the spectral index of the mode with zonal index i ≥ 0
// and signed meridional index j on grid g.
func chkIndex(g *Grid, i, j int) int {
	if j < 0 {
		j += g.Ny
	}
	return j*g.Nkx + i
}

// chkWavenumber returns (k, l) of zonal index i and signed meridional
// index j, computed from the domain size (not from the Grid's tables).
func chkWavenumber(g *Grid, i, j int) (k, l float64) {
	return 2 * math.Pi * float64(i) / g.Lx, 2 * math.Pi * float64(j) / g.Ly
}

// chkCosine returns the gridded field amp·cos(kx + ly + phase) of the mode
// (i, j).
func chkCosine(g *Grid, i, j int, amp, phase float64) []float64 {
	k, l := chkWavenumber(g, i, j)
	f := make([]float64, g.Nx*g.Ny)
	for y := range g.Ny {
		for x := range g.Nx {
			f[y*g.Nx+x] = amp * math.Cos(k*float64(x)*g.Lx/float64(g.Nx)+l*float64(y)*g.Ly/float64(g.Ny)+phase)
		}
	}
	return f
}

// chkFit returns the least-squares slope and intercept of y against x.
func chkFit(x, y []float64) (slope, intercept float64) {
	n := float64(len(x))
	var sx, sy float64
	for i := range x {
		sx += x[i]
		sy += y[i]
	}
	mx, my := sx/n, sy/n
	var sxx, sxy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
	}
	slope = sxy / sxx
	return slope, my - slope*mx
}

// chkRelErr returns |got − want| / |want|.
func chkRelErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }
