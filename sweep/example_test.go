package sweep_test

import (
	"fmt"
	"log"
	"strings"

	"github.com/eddyblock/eddyblock/sweep"
)

// A sweep file's members: a Cartesian product of two lists, each member
// with its directory name and its wave source's seed (a SplitMix64 step of
// the sweep's seed and the member's index).
func Example() {
	spec, err := sweep.Parse(strings.NewReader(`
base = "storm-track-ending-at-block"
seed = 7
[fixed]
"model.nx" = 64
"model.ny" = 32
"model.dt" = 3600.0
[vary]
"wavemaker.injection_rate" = [5e-6, 2e-5]
"model.u1" = [14.0, 16.0]
`))
	if err != nil {
		log.Fatal(err)
	}
	plan, err := spec.Expand()
	if err != nil {
		log.Fatal(err)
	}
	for _, m := range plan.Members {
		fmt.Printf("%s  seed %d\n", m.Name, m.Seed)
	}
	// Output:
	// 000_injection_rate=5e-06,u1=14  seed 3595544800446187243
	// 001_injection_rate=5e-06,u1=16  seed 154844686297477902
	// 002_injection_rate=2e-05,u1=14  seed 8308050873407804673
	// 003_injection_rate=2e-05,u1=16  seed 5376582964150736101
}

// Shards split a sweep between the tasks of a job array: shard i of n holds
// members i, i+n, i+2n, …
func ExampleParseShard() {
	env := func(string) string { return "1" } // SLURM_ARRAY_TASK_ID=1
	for _, s := range []string{"1/3", "auto/3"} {
		sh, err := sweep.ParseShard(s, env, 8)
		if err != nil {
			log.Fatal(err)
		}
		var members []int
		for i := range 8 {
			if sh.Contains(i) {
				members = append(members, i)
			}
		}
		fmt.Println(s, members)
	}
	// Output:
	// 1/3 [1 4 7]
	// auto/3 [1 4 7]
}
