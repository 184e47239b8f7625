package qg

import (
	"runtime"
	"sync/atomic"
	"time"
)

// partnerSpin is how long an idle partner keeps polling for the next layer
// pass before it parks, and partnerWait how long the caller polls for the
// partner to finish before it blocks. Waking a parked thread costs tens of
// microseconds on a virtual machine and a step has six layer passes, so
// both poll first (yielding now and then, so other goroutines still run);
// they block after a while so that an oversubscribed machine is not kept
// busy by polling.
const (
	partnerSpin = 300 * time.Microsecond
	partnerWait = 100 * time.Microsecond
)

// partner is a persistent goroutine that runs layer 1's part of every
// layer pass while the caller runs layer 0's. The assignment is fixed, so
// each layer's fields stay in the cache of the core that works on them.
//
// The goroutine holds no reference to the Model, only to the partner (the
// pass body is dropped once run), so a cleanup attached to the Model stops
// it when the model becomes unreachable.
type partner struct {
	task    func(n int)
	posted  atomic.Uint64 // number of passes posted
	done    atomic.Uint64 // number of passes the partner finished
	parked  atomic.Int32  // 1 while the partner is blocked (or about to block) on wake
	waiting atomic.Int32  // 1 while the caller is blocked (or about to block) on finish
	wake    chan struct{}
	finish  chan struct{}
	stop    atomic.Bool
}

func newPartner() *partner {
	p := &partner{wake: make(chan struct{}, 1), finish: make(chan struct{}, 1)}
	go p.loop()
	return p
}

// run calls fn(1) on the partner and fn(0) on the caller, and returns when
// both have returned.
func (p *partner) run(fn func(n int)) {
	p.task = fn
	seq := p.posted.Add(1) // publishes task
	if p.parked.CompareAndSwap(1, 0) {
		p.wake <- struct{}{}
	}
	fn(0)
	start := time.Now()
	for spins := 1; p.done.Load() != seq; spins++ {
		if spins%64 == 0 && time.Since(start) > partnerWait {
			p.waiting.Store(1)
			if p.done.Load() == seq && p.waiting.CompareAndSwap(1, 0) {
				break
			}
			<-p.finish // the partner cleared waiting and sends
			break
		}
		runtime.Gosched()
	}
	p.task = nil
}

// shutdown makes the partner's goroutine return.
func (p *partner) shutdown() {
	p.stop.Store(true)
	if p.parked.CompareAndSwap(1, 0) {
		p.wake <- struct{}{}
	}
}

func (p *partner) loop() {
	var seen uint64
	for {
		start := time.Now()
		for spins := 1; p.posted.Load() == seen; spins++ {
			if p.stop.Load() {
				return
			}
			if spins%64 == 0 && time.Since(start) > partnerSpin {
				p.parked.Store(1)
				if p.stop.Load() {
					return
				}
				if p.posted.Load() != seen && p.parked.CompareAndSwap(1, 0) {
					break // a pass arrived before the caller saw us parked
				}
				<-p.wake // the caller (or shutdown) cleared parked and sends
				if p.stop.Load() {
					return
				}
				break
			}
			if spins%256 == 0 {
				runtime.Gosched()
			}
		}
		seen = p.posted.Load()
		p.task(1)
		p.done.Store(seen)
		if p.waiting.CompareAndSwap(1, 0) {
			p.finish <- struct{}{}
		}
	}
}
