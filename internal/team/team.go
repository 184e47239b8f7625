package team

import (
	"fmt"
	"runtime"
	"sync"
	"sync/atomic"
	"time"
)

// Poll is how long a waiting goroutine polls before it blocks: an idle
// worker waiting for the next pass, or the caller waiting for the workers
// to finish one. Polling yields to other goroutines, so with fewer threads
// than workers (GOMAXPROCS=1, or a machine busy with other work) the
// goroutine being waited for still runs.
const Poll = 200 * time.Microsecond

// Team is a fixed set of workers. It is not safe for concurrent use: one
// goroutine calls Run (or Tasks) at a time.
type Team struct {
	n    int
	fn   func(k int) // body of the current pass, written before gen is published
	gen  atomic.Uint64
	done []slot // done[k-1]: the last generation worker k finished

	mu      sync.Mutex
	posted  *sync.Cond // broadcast after a pass is posted (or the team closed)
	finish  *sync.Cond // broadcast after a worker finished a pass
	closed  bool
	running sync.WaitGroup

	next   atomic.Int64 // next task of a Tasks pass
	ntask  int          // number of tasks of a Tasks pass
	task   func(task, k int)
	byTask func(k int) // t.takeTasks, bound once so that Tasks does not allocate
	fault  atomic.Pointer[fault]
}

// slot is one worker's finished generation, alone on its cache line.
type slot struct {
	gen atomic.Uint64
	_   [56]byte
}

type fault struct {
	worker int
	value  any
	stack  []byte
}

// New starts a team of n ≥ 1 workers: the caller and n−1 goroutines.
func New(n int) (*Team, error) {
	if n < 1 {
		return nil, fmt.Errorf("team: %d workers, want at least 1", n)
	}
	t := &Team{n: n, done: make([]slot, n-1)}
	t.byTask = t.takeTasks
	t.posted = sync.NewCond(&t.mu)
	t.finish = sync.NewCond(&t.mu)
	t.running.Add(n - 1)
	for k := 1; k < n; k++ {
		go t.loop(k)
	}
	return t, nil
}

// Size returns the number of workers, the caller included.
func (t *Team) Size() int { return t.n }

// Run calls fn(k) once for every worker k = 0..Size()−1, fn(0) on the
// calling goroutine, and returns when every call has returned. A panic in
// any call is re-raised by Run once all calls have returned. Run panics if
// the team is closed.
func (t *Team) Run(fn func(k int)) {
	if t.n == 1 {
		fn(0)
		return
	}
	t.mu.Lock()
	if t.closed {
		t.mu.Unlock()
		panic("team: Run after Close")
	}
	t.fn = fn
	g := t.gen.Add(1)
	t.posted.Broadcast()
	t.mu.Unlock()

	func() {
		defer t.wait(g) // the workers finish the pass even if fn(0) panics
		fn(0)
	}()
	t.fn = nil
	if f := t.fault.Swap(nil); f != nil {
		panic(fmt.Sprintf("team: worker %d panicked: %v\n%s", f.worker, f.value, f.stack))
	}
}

// Tasks runs fn(task, k) for task = 0..n−1, each exactly once, on the
// workers (k is the worker that runs it), and returns when all are done.
// Tasks are handed out in order to whichever worker asks first, so a
// worker that the operating system does not schedule leaves its share to
// the others; fn's result must not depend on k, only its scratch space may.
func (t *Team) Tasks(n int, fn func(task, k int)) {
	if t.n == 1 || n <= 1 {
		for i := range n {
			fn(i, 0)
		}
		return
	}
	t.next.Store(0)
	t.ntask, t.task = n, fn
	defer func() { t.task = nil }()
	t.Run(t.byTask)
}

// takeTasks is worker k's part of a Tasks pass.
func (t *Team) takeTasks(k int) {
	for {
		i := int(t.next.Add(1) - 1)
		if i >= t.ntask {
			return
		}
		t.task(i, k)
	}
}

// finished reports whether every worker has finished generation g.
func (t *Team) finished(g uint64) bool {
	for i := range t.done {
		if t.done[i].gen.Load() != g {
			return false
		}
	}
	return true
}

// wait returns when every worker has finished generation g.
func (t *Team) wait(g uint64) {
	start := time.Now()
	for spins := 0; ; spins++ {
		if t.finished(g) {
			return
		}
		if spins%32 == 31 && time.Since(start) > Poll {
			break
		}
		runtime.Gosched()
	}
	t.mu.Lock()
	for !t.finished(g) {
		t.finish.Wait()
	}
	t.mu.Unlock()
}

// loop is worker k's goroutine.
func (t *Team) loop(k int) {
	defer t.running.Done()
	var seen uint64 // the last generation this worker finished
	for {
		g, ok := t.await(seen)
		if !ok {
			return
		}
		if g != seen+1 {
			panic(fmt.Sprintf("team: worker %d finished pass %d and was given pass %d", k, seen, g))
		}
		t.call(k, t.fn)
		seen = g
		t.done[k-1].gen.Store(g)
		t.mu.Lock()
		t.finish.Broadcast()
		t.mu.Unlock()
	}
}

// await returns the generation of the next pass after seen, or false once
// the team is closed.
func (t *Team) await(seen uint64) (uint64, bool) {
	start := time.Now()
	for spins := 0; ; spins++ {
		if g := t.gen.Load(); g != seen {
			return g, true
		}
		if spins%32 == 31 && time.Since(start) > Poll {
			break
		}
		runtime.Gosched()
	}
	t.mu.Lock()
	defer t.mu.Unlock()
	for {
		if g := t.gen.Load(); g != seen {
			return g, true
		}
		if t.closed {
			return 0, false
		}
		t.posted.Wait()
	}
}

// call runs fn(k), recording a panic instead of letting it end the program
// on a goroutine the caller cannot see.
func (t *Team) call(k int, fn func(int)) {
	defer func() {
		if v := recover(); v != nil {
			buf := make([]byte, 4096)
			buf = buf[:runtime.Stack(buf, false)]
			t.fault.CompareAndSwap(nil, &fault{worker: k, value: v, stack: buf})
		}
	}()
	fn(k)
}

// Close stops the team's goroutines and waits until they have returned.
// It must not be called during Run; calling it again does nothing.
func (t *Team) Close() {
	t.mu.Lock()
	t.closed = true
	t.posted.Broadcast()
	t.mu.Unlock()
	t.running.Wait()
}
