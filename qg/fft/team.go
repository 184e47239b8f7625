package fft

import (
	"runtime"
	"sync/atomic"
	"time"
)

// spinFor is how long an idle helper goroutine keeps polling for the next phase before it parks.
// Waking a parked thread costs tens of microseconds on a virtual machine, as much as a whole phase of
// a 128² transform, and a model step calls the transform back to back, so the helpers poll in between
// (yielding with runtime.Gosched, so other goroutines still run).
const spinFor = time.Millisecond

// team runs the phases of a transform on workers−1 persistent helper goroutines plus the caller.
// The helpers hold no reference to the Plan2D, only to its core, so a cleanup attached to the plan
// stops them when the plan becomes unreachable.
type team struct {
	run     func(phase, k int) // phase body for worker k
	phase   atomic.Int32
	gen     atomic.Uint64 // incremented for each phase
	pending atomic.Int64  // helpers still working on the current phase
	stop    atomic.Bool
	helpers []helper
}

type helper struct {
	parked atomic.Int32 // 1 while blocked (or about to block) on wake
	wake   chan struct{}
}

func newTeam(workers int, run func(phase, k int)) *team {
	t := &team{run: run, helpers: make([]helper, workers-1)}
	for i := range t.helpers {
		t.helpers[i].wake = make(chan struct{}, 1)
		go t.loop(i + 1)
	}
	return t
}

// parallel runs phase on every worker and returns when all are done.
func (t *team) parallel(phase int) {
	t.phase.Store(int32(phase))
	t.pending.Store(int64(len(t.helpers)))
	t.gen.Add(1)
	for i := range t.helpers {
		h := &t.helpers[i]
		if h.parked.CompareAndSwap(1, 0) {
			h.wake <- struct{}{}
		}
	}
	t.run(phase, 0)
	for t.pending.Load() != 0 {
		runtime.Gosched()
	}
}

// shutdown makes the helpers return.
func (t *team) shutdown() {
	t.stop.Store(true)
	for i := range t.helpers {
		h := &t.helpers[i]
		if h.parked.CompareAndSwap(1, 0) {
			h.wake <- struct{}{}
		}
	}
}

// loop is helper k's goroutine.
func (t *team) loop(k int) {
	h := &t.helpers[k-1]
	var seen uint64 // the generation at creation: phases may be posted before this goroutine starts
	for {
		start := time.Now()
		for spins := 1; t.gen.Load() == seen; spins++ {
			if t.stop.Load() {
				return
			}
			if spins%64 == 0 && time.Since(start) > spinFor {
				h.parked.Store(1)
				if t.stop.Load() {
					return
				}
				if t.gen.Load() != seen && h.parked.CompareAndSwap(1, 0) {
					break // a phase arrived before the caller saw us parked
				}
				<-h.wake // the caller (or shutdown) cleared parked and sends
				if t.stop.Load() {
					return
				}
				break
			}
			if spins%256 == 0 {
				runtime.Gosched()
			}
		}
		seen = t.gen.Load()
		t.run(int(t.phase.Load()), k)
		t.pending.Add(-1)
	}
}
