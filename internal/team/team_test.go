package team

import (
	"math/rand/v2"
	"runtime"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// TestRunEveryWorkerEveryPass checks the hand-off's contract: after Run
// returns, every worker has run that pass, exactly once, and no worker has
// started the next. Each worker stamps its slot with the pass number and
// sleeps or yields at random, under competing goroutines and with fewer
// threads than workers.
func TestRunEveryWorkerEveryPass(t *testing.T) {
	for _, procs := range []int{1, 2, 4} {
		for _, n := range []int{2, 3, 5} {
			prev := runtime.GOMAXPROCS(procs)
			// With one thread the workers already compete for it; with
			// more, two busy goroutines take threads away at random.
			stop := func() {}
			if procs > 1 {
				stop = testenv.Busy(2)
			}
			tm, err := New(n)
			if err != nil {
				t.Fatal(err)
			}
			stamp := make([]int64, n)
			calls := make([]atomic.Int64, n)
			passes := 1000
			for pass := 1; pass <= passes; pass++ {
				tm.Run(func(k int) {
					calls[k].Add(1)
					switch rand.IntN(50) {
					case 0:
						time.Sleep(time.Duration(rand.IntN(200)) * time.Microsecond)
					case 1, 2, 3:
						runtime.Gosched()
					}
					stamp[k] = int64(pass) // plain write: the race detector checks the hand-off
				})
				for k := range n {
					if stamp[k] != int64(pass) {
						t.Fatalf("GOMAXPROCS=%d, %d workers: after pass %d worker %d holds pass %d", procs, n, pass, k, stamp[k])
					}
				}
			}
			tm.Close()
			stop()
			runtime.GOMAXPROCS(prev)
			for k := range n {
				if c := calls[k].Load(); c != int64(passes) {
					t.Errorf("GOMAXPROCS=%d, %d workers: worker %d ran %d passes, want %d", procs, n, k, c, passes)
				}
			}
		}
	}
}

// TestTasksEachOnce checks that Tasks runs every task exactly once, with
// the worker index in range, under load.
func TestTasksEachOnce(t *testing.T) {
	stop := testenv.Busy(2)
	defer stop()
	tm, err := New(3)
	if err != nil {
		t.Fatal(err)
	}
	defer tm.Close()
	for _, ntask := range []int{0, 1, 2, 7, 64, 1000} {
		for range 50 {
			count := make([]atomic.Int32, ntask)
			var bad atomic.Bool
			tm.Tasks(ntask, func(i, k int) {
				if k < 0 || k >= 3 {
					bad.Store(true)
				}
				count[i].Add(1)
			})
			if bad.Load() {
				t.Fatal("worker index out of range")
			}
			for i := range count {
				if c := count[i].Load(); c != 1 {
					t.Fatalf("%d tasks: task %d ran %d times", ntask, i, c)
				}
			}
		}
	}
}

// TestSingleWorkerNoGoroutines checks that a one-worker team runs on the
// caller and starts nothing.
func TestSingleWorkerNoGoroutines(t *testing.T) {
	before := testenv.Baseline()
	tm, err := New(1)
	if err != nil {
		t.Fatal(err)
	}
	if g := runtime.NumGoroutine(); g > before {
		t.Errorf("New(1) started %d goroutines", g-before)
	}
	var ks []int
	tm.Run(func(k int) { ks = append(ks, k) })
	if len(ks) != 1 || ks[0] != 0 {
		t.Errorf("Run on one worker called %v, want [0]", ks)
	}
	tm.Close()
}

// TestCloseStopsGoroutines checks that no goroutine outlives Close, whether
// the workers were polling or parked, and that Close is idempotent.
func TestCloseStopsGoroutines(t *testing.T) {
	before := testenv.Baseline()
	for _, idle := range []time.Duration{0, 5 * Poll} {
		tm, err := New(4)
		if err != nil {
			t.Fatal(err)
		}
		tm.Run(func(int) {})
		time.Sleep(idle) // 0: workers still polling; 5·Poll: parked
		tm.Close()
		tm.Close()
	}
	if g := testenv.Goroutines(before); g > before {
		t.Errorf("%d goroutines left after Close", g-before)
	}
}

func TestRunAfterClosePanics(t *testing.T) {
	tm, err := New(2)
	if err != nil {
		t.Fatal(err)
	}
	tm.Close()
	defer func() {
		if recover() == nil {
			t.Error("Run after Close did not panic")
		}
	}()
	tm.Run(func(int) {})
}

// TestWorkerPanic checks that a panic on a worker goroutine reaches the
// caller of Run, after the pass, and that the team still works.
func TestWorkerPanic(t *testing.T) {
	tm, err := New(2)
	if err != nil {
		t.Fatal(err)
	}
	defer tm.Close()
	func() {
		defer func() {
			v := recover()
			if s, _ := v.(string); !strings.Contains(s, "worker 1 panicked: boom") {
				t.Errorf("recovered %v, want the worker's panic", v)
			}
		}()
		tm.Run(func(k int) {
			if k == 1 {
				panic("boom")
			}
		})
	}()
	var c atomic.Int32
	tm.Run(func(int) { c.Add(1) })
	if c.Load() != 2 {
		t.Errorf("after a panic, a pass ran %d workers, want 2", c.Load())
	}
}

func TestNewRejects(t *testing.T) {
	for _, n := range []int{0, -2} {
		if _, err := New(n); err == nil || !strings.Contains(err.Error(), "at least 1") {
			t.Errorf("New(%d): error %v, want one saying at least 1", n, err)
		}
	}
}

// BenchmarkRun measures the cost of one empty pass (the hand-off alone).
func BenchmarkRun(b *testing.B) {
	tm, err := New(2)
	if err != nil {
		b.Fatal(err)
	}
	defer tm.Close()
	for b.Loop() {
		tm.Run(func(int) {})
	}
}

// TestNoAllocation checks that a pass allocates nothing (the model and the
// transform hand off several passes per time step).
func TestNoAllocation(t *testing.T) {
	tm, err := New(2)
	if err != nil {
		t.Fatal(err)
	}
	defer tm.Close()
	var sum [2]int
	body := func(k int) { sum[k]++ }
	task := func(i, k int) {}
	if a := testing.AllocsPerRun(100, func() { tm.Run(body) }); a != 0 {
		t.Errorf("Run allocates %v times per pass", a)
	}
	if a := testing.AllocsPerRun(100, func() { tm.Tasks(16, task) }); a != 0 {
		t.Errorf("Tasks allocates %v times per pass", a)
	}
}
