package qg

import (
	"runtime"

	"github.com/eddyblock/eddyblock/internal/team"
	"github.com/eddyblock/eddyblock/qg/fft"
)

// layerWork holds the work buffers of one layer's part of a step, so that
// the two layers can be computed at the same time on two cores, each with
// its own transform plan. Splitting the work by layer rather than inside
// each transform avoids moving half of every field between the cores
// between the zonal and the meridional passes.
type layerWork struct {
	plan     *fft.Plan2D
	a, b     []complex128 // spectral fluxes
	du, dv   []complex128 // spectral velocities; zero outside the retained modes, which are the only ones written
	fu, fv   []float64    // gridded fluxes
	rowRates [][NumTerms]float64
	rowCFL   []float64
	rowSum   []float64 // per-row partial sums of the layer's energy
	rowCFLAt [][3]float64
	cfl      float64
	cflAt    [3]float64
}

// newLayerWork builds the per-layer buffers and plans: with two or more
// workers each layer has its own plan with half of the workers, otherwise
// the layers share one single-worker plan and run one after the other.
func (m *Model) newLayerWork() error {
	g := m.g
	ns, np := g.Ny*g.Nkx, g.Nx*g.Ny
	inner := m.innerWorkers()
	for n := range m.lw {
		lw := &m.lw[n]
		if n == 0 || m.workers >= 2 {
			p, err := fft.NewPlan2D(g.Nx, g.Ny, inner)
			if err != nil {
				return err
			}
			// Every field the model transforms lives on the retained
			// modes, or is truncated to them afterwards: the meridional
			// pass can skip the columns beyond them.
			if err := p.SetColumns(g.keptCols); err != nil {
				return err
			}
			lw.plan = p
		} else {
			lw.plan = m.lw[0].plan
		}
		lw.a, lw.b = make([]complex128, ns), make([]complex128, ns)
		lw.du, lw.dv = make([]complex128, ns), make([]complex128, ns)
		lw.fu, lw.fv = make([]float64, np), make([]float64, np)
		lw.rowRates = make([][NumTerms]float64, g.Ny)
		lw.rowCFL = make([]float64, g.Ny)
		lw.rowSum = make([]float64, g.Ny)
		lw.rowCFLAt = make([][3]float64, g.Ny)
	}
	m.plan = m.lw[0].plan
	if m.workers >= 2 {
		t, err := team.New(2)
		if err != nil {
			return err
		}
		m.pair = t
		// a backstop for a model dropped without Close
		runtime.AddCleanup(m, func(t *team.Team) { t.Close() }, t)
	}
	return nil
}

// Close stops the goroutines the model started (with two or more workers:
// the one that computes layer 1, and the transforms' helpers) and waits for
// them to return. A closed model cannot step; its state can still be read.
// Calling Close again does nothing.
func (m *Model) Close() {
	if m.closed {
		return
	}
	m.closed = true
	if m.pair != nil {
		m.pair.Close()
	}
	m.lw[0].plan.Close()
	if m.lw[1].plan != m.lw[0].plan {
		m.lw[1].plan.Close()
	}
}

// innerWorkers is the number of workers each layer's work may use.
func (m *Model) innerWorkers() int {
	if m.workers >= 2 {
		return max(1, m.workers/2)
	}
	return 1
}

// eachLayer runs fn for both layers: concurrently with two or more
// workers (layer 0 on the caller, layer 1 on the team's other goroutine),
// one after the other otherwise. fn must touch only its layer's buffers;
// the results are the same bits either way.
func (m *Model) eachLayer(fn func(n int)) {
	if m.pair == nil {
		fn(0)
		fn(1)
		return
	}
	m.pair.Run(fn)
}
