package main

import (
	"context"
	"os"
	"os/signal"
	"sync"
	"syscall"
)

// stopped is the error of a command stopped by a signal; the program exits
// with the conventional status 128 + the signal's number (130 for SIGINT,
// 143 for SIGTERM).
type stopped struct {
	name   string
	number int
}

func (s *stopped) Error() string   { return "stopped by " + s.name }
func (s *stopped) exitCode() int   { return 128 + s.number }
func (s *stopped) Is(t error) bool { _, ok := t.(*stopped); return ok }

// signalContext returns a context cancelled by the first SIGINT or SIGTERM
// (what a terminal's Ctrl-C and a batch scheduler send), a function telling
// which signal came (nil if none), and a function that stops listening.
// The work in progress is expected to finish its current step and stop
// cleanly; a second signal is left to its default action, ending the
// program at once.
func signalContext() (context.Context, func() *stopped, func()) {
	ctx, cancel := context.WithCancel(context.Background())
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, os.Interrupt, syscall.SIGTERM)
	var mu sync.Mutex
	var got *stopped
	done := make(chan struct{})
	go func() {
		select {
		case s := <-ch:
			signal.Reset(os.Interrupt, syscall.SIGTERM)
			st := &stopped{name: "SIGINT", number: int(syscall.SIGINT)}
			if s == syscall.SIGTERM {
				st = &stopped{name: "SIGTERM", number: int(syscall.SIGTERM)}
			}
			mu.Lock()
			got = st
			mu.Unlock()
			cancel()
		case <-done:
		}
	}()
	which := func() *stopped {
		mu.Lock()
		defer mu.Unlock()
		return got
	}
	var once sync.Once
	stop := func() {
		once.Do(func() {
			signal.Stop(ch)
			close(done)
			cancel()
		})
	}
	return ctx, which, stop
}
