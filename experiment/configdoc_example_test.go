package experiment_test

import (
	"fmt"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg/block"
)

// The keys a configuration reads depend on its choices: a wave train has
// no random numbers, and without a block the dipole's keys are idle.
func ExampleConfig_Used() {
	c := experiment.Default() // a wave train and a dipole block
	fmt.Println(c.Used("wavemaker.train.frequency"), c.Used("wavemaker.seed"), c.Used("block.dipole.height"))
	c.Block.Shape = block.None
	fmt.Println(c.Used("block.shape"), c.Used("block.dipole.height"), c.Used("block.mode"))
	// Output:
	// true false true
	// true false false
}

// Documented prints a configuration as TOML with a comment on every key;
// here the [run] table of the default experiment.
func ExampleConfig_Documented() {
	for _, part := range strings.Split(experiment.Default().Documented(), "\n\n") {
		if strings.Contains(part, "\n[run]\n") {
			fmt.Println(part)
		}
	}
	// Output:
	// # Length of the run and what it records.
	// [run]
	// # Length of the run, model time. Unit: days. Allowed: greater than 0.
	// days = 120.0
	// # Time before the diagnostics start averaging. Unit: days. Allowed: 0 or greater, shorter than days.
	// spin_up_days = 30.0
	// # Interval between progress reports (and checkpoints). Unit: days. Allowed: greater than 0.
	// report_days = 10.0
	// # Time steps between diagnostic samples. Unit: 1. Allowed: an integer, 1 or more.
	// sample_steps = 6
	// # Interval between the snapshots of psi and q in the output directory (rounded to whole steps).
	// # Unit: days. Allowed: 0 or greater (0: no snapshots).
	// snapshot_days = 2.0
}
