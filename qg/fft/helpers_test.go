//go:build !fftw || !cgo

package fft

import (
	"runtime"
	"testing"
	"time"
)

// TestHelpersStop: the helper goroutines of a plan end once the plan is unreachable.
func TestHelpersStop(t *testing.T) {
	base := runtime.NumGoroutine()
	func() {
		p := mustPlan(t, 16, 16, 4)
		f := randomField(16, 16, 17)
		c := make([]complex128, 16*9)
		p.Forward(c, f)
		if n := runtime.NumGoroutine(); n < base+3 {
			t.Errorf("%d goroutines with a 4-worker plan, want at least %d", n, base+3)
		}
	}()
	deadline := time.Now().Add(5 * time.Second)
	for runtime.NumGoroutine() > base && time.Now().Before(deadline) {
		runtime.GC()
		time.Sleep(10 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > base {
		t.Errorf("%d goroutines after the plan was dropped, want %d", n, base)
	}
}
