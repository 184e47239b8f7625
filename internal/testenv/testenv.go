package testenv

import (
	"os"
	"os/exec"
	"runtime"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// FullVar is the environment variable that asks for the complete suite.
const FullVar = "EDDYBLOCK_FULL_TESTS"

// Full reports whether the complete suite was asked for.
func Full() bool { return os.Getenv(FullVar) == "1" }

// Long skips t unless the complete suite was asked for. Use it for tests
// that take more than a few seconds on a 2-core machine.
func Long(t testing.TB) {
	t.Helper()
	if !Full() {
		t.Skipf("long test: set %s=1 (scripts/test-all does) to run it", FullVar)
	}
}

// Tool returns the path of the external program name. When it is missing
// the test fails if the complete suite was asked for, and is skipped with
// a loud message otherwise; hint says how to install it.
func Tool(t testing.TB, name, hint string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err == nil {
		return p
	}
	if Full() {
		t.Fatalf("MISSING TOOL: %s is not installed (%s); the complete suite requires it", name, hint)
	}
	t.Skipf("MISSING TOOL: %s is not installed (%s); skipped (with %s=1 this fails)", name, hint, FullVar)
	return ""
}

// File is Tool for a program at a fixed path (for example /usr/bin/python3,
// Debian's Python, which has Debian's Python packages).
func File(t testing.TB, path, hint string) string {
	t.Helper()
	if st, err := os.Stat(path); err == nil && !st.IsDir() {
		return path
	}
	if Full() {
		t.Fatalf("MISSING TOOL: %s does not exist (%s); the complete suite requires it", path, hint)
	}
	t.Skipf("MISSING TOOL: %s does not exist (%s); skipped (with %s=1 this fails)", path, hint, FullVar)
	return ""
}

// Busy keeps n goroutines computing until the returned function is called,
// so that the goroutines under test compete for the threads (common
// practice for exposing scheduling-dependent bugs). They yield every
// microsecond or so, so the scheduler interleaves them with the others at
// random points instead of handing out whole 10 ms time slices.
func Busy(n int) (stop func()) {
	var quit atomic.Bool
	var wg sync.WaitGroup
	for range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			x := 1.0
			for !quit.Load() {
				for range 1000 {
					x = x*1.0000001 + 1e-9
				}
				runtime.Gosched()
			}
			_ = x
		}()
	}
	return func() { quit.Store(true); wg.Wait() }
}

// Goroutines returns the number of goroutines once it has fallen to at
// most limit, or the number after a few seconds if it does not. A
// goroutine that has signalled its owner (a sync.WaitGroup's Done, say)
// still counts until it has returned, and the runtime's finalizer
// goroutine counts while it runs a finalizer, so a count taken at once
// after a Close can be one too many for a moment; waiting for it to
// settle keeps the check meaningful (a goroutine that never ends still
// fails it) without failing on a loaded machine.
func Goroutines(limit int) int {
	deadline := time.Now().Add(5 * time.Second)
	n := runtime.NumGoroutine()
	for n > limit && time.Now().Before(deadline) {
		time.Sleep(5 * time.Millisecond)
		n = runtime.NumGoroutine()
	}
	return n
}

// Baseline returns the number of goroutines once it has stopped changing
// for 50 ms (or after a few seconds), so that goroutines of an earlier
// test that are still ending are not counted as part of the baseline.
func Baseline() int {
	deadline := time.Now().Add(5 * time.Second)
	n, since := runtime.NumGoroutine(), time.Now()
	for time.Since(since) < 50*time.Millisecond && time.Now().Before(deadline) {
		time.Sleep(5 * time.Millisecond)
		if m := runtime.NumGoroutine(); m != n {
			n, since = m, time.Now()
		}
	}
	return n
}
