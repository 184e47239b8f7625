package team

import (
	"os"
	"os/exec"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// busyVar makes the test binary a busy loop (see busyProcesses).
const busyVar = "EDDYBLOCK_TEAM_BUSY"

func TestMain(m *testing.M) {
	if os.Getenv(busyVar) == "1" {
		x := 1.0
		for x > 0 {
			x = x*1.0000001 + 1e-9
		}
	}
	os.Exit(m.Run())
}

// busyProcesses starts n copies of the test binary that spin until killed:
// the operating system then takes the threads of the team away at arbitrary
// instructions, which in-process goroutines cannot do.
func busyProcesses(t *testing.T, n int) {
	t.Helper()
	for range n {
		c := exec.Command(os.Args[0], "-test.run=^$")
		c.Env = append(os.Environ(), busyVar+"=1")
		if err := c.Start(); err != nil {
			t.Fatalf("starting a busy process: %v", err)
		}
		t.Cleanup(func() { c.Process.Kill(); c.Wait() })
	}
}

// TestRunUnderProcessLoad runs two million short passes while two busy
// processes occupy the cores, checking after each that both workers ran it.
// The hand-off this package replaced failed this check (a finish recorded
// for one pass released the next one early: pass 200032 of 2 000 000 in its
// run); the window is a few instructions wide, so it takes many passes.
func TestRunUnderProcessLoad(t *testing.T) {
	testenv.Long(t)
	busyProcesses(t, 2)
	tm, err := New(2)
	if err != nil {
		t.Fatal(err)
	}
	defer tm.Close()
	var stamp [2]int
	const passes = 2000000
	for pass := 1; pass <= passes; pass++ {
		tm.Run(func(k int) { stamp[k] = pass })
		if stamp[0] != pass || stamp[1] != pass {
			t.Fatalf("after pass %d the workers hold passes %v", pass, stamp)
		}
	}
}
