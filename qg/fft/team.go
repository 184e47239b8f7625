//go:build !fftw || !cgo

package fft

import (
	"runtime"
	"sync/atomic"
	"time"
)

// spinFor is how long an idle helper goroutine keeps polling for the next phase before it parks, and
// waitFor how long the caller polls for the helpers to finish a phase before it blocks. Waking a
// parked thread costs tens of microseconds on a virtual machine, as much as a whole phase of a 128²
// transform, so both poll first (yielding now and then with runtime.Gosched, so other goroutines still
// run); they block after a while so that, when the machine is oversubscribed, they do not keep a CPU
// that the thread they wait for needs.
const (
	spinFor = 200 * time.Microsecond
	waitFor = 50 * time.Microsecond
)

// team runs the phases of a transform on workers−1 persistent helper goroutines plus the caller. A
// phase is a list of independent tasks (chunks of rows or columns) that the workers take in turn from a
// shared counter, so a helper that the operating system does not schedule in time leaves its tasks to
// the others; which worker computes a task does not change its result.
//
// The helpers hold no reference to the Plan2D, only to its core, so a cleanup attached to the plan
// stops them when the plan becomes unreachable.
type team struct {
	run     func(phase, task, k int) // body of a task, run by worker k with its private buffers
	desc    atomic.Uint64            // seq<<32 | phase<<16 | number of tasks, of the current phase
	ticket  atomic.Uint64            // seq<<32 | next task to take
	done    atomic.Int64             // tasks of the current phase finished
	waiting atomic.Int32             // 1 while the caller is blocked (or about to block) on finished
	finish  chan struct{}
	seq     uint64 // sequence number of the last phase (caller only)
	stop    atomic.Bool
	helpers []helper
}

type helper struct {
	parked atomic.Int32 // 1 while blocked (or about to block) on wake
	wake   chan struct{}
}

func newTeam(workers int, run func(phase, task, k int)) *team {
	t := &team{run: run, helpers: make([]helper, workers-1), finish: make(chan struct{}, 1)}
	for i := range t.helpers {
		t.helpers[i].wake = make(chan struct{}, 1)
		go t.loop(i + 1)
	}
	return t
}

// parallel runs the n tasks of phase on the workers and returns when all are done.
func (t *team) parallel(phase, n int) {
	t.seq++
	t.done.Store(0)
	t.ticket.Store(t.seq << 32)
	t.desc.Store(t.seq<<32 | uint64(phase)<<16 | uint64(n))
	for i := range t.helpers {
		h := &t.helpers[i]
		if h.parked.CompareAndSwap(1, 0) {
			h.wake <- struct{}{}
		}
	}
	t.work(t.desc.Load(), 0)
	start := time.Now()
	for spins := 1; t.done.Load() != int64(n); spins++ {
		if spins%64 == 0 && time.Since(start) > waitFor {
			t.waiting.Store(1)
			if t.done.Load() == int64(n) && t.waiting.CompareAndSwap(1, 0) {
				return
			}
			<-t.finish // the worker finishing the last task cleared waiting and sends
			return
		}
		runtime.Gosched()
	}
}

// work takes and runs tasks of the phase described by d as worker k until none is left.
func (t *team) work(d uint64, k int) {
	seq, phase, n := d>>32, int(d>>16&0xffff), d&0xffff
	for {
		tk := t.ticket.Load()
		if tk>>32 != seq || tk&0xffffffff >= n {
			return
		}
		if t.ticket.CompareAndSwap(tk, tk+1) {
			t.run(phase, int(tk&0xffffffff), k)
			if uint64(t.done.Add(1)) == n && t.waiting.CompareAndSwap(1, 0) {
				t.finish <- struct{}{}
			}
		}
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
	var seen uint64 // sequence number of the last phase worked on (0: none yet)
	for {
		start := time.Now()
		for spins := 1; t.desc.Load()>>32 == seen; spins++ {
			if t.stop.Load() {
				return
			}
			if spins%64 == 0 && time.Since(start) > spinFor {
				h.parked.Store(1)
				if t.stop.Load() {
					return
				}
				if t.desc.Load()>>32 != seen && h.parked.CompareAndSwap(1, 0) {
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
		d := t.desc.Load()
		seen = d >> 32
		t.work(d, k)
	}
}
