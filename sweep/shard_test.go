package sweep

import (
	"fmt"
	"strings"
	"testing"
)

// TestShardsPartitionMembers checks that the shards i/n, i = 0 … n−1,
// hold every member exactly once (common practice: a job array's tasks
// must cover the work without overlap), for sweeps smaller and larger
// than the number of shards.
func TestShardsPartitionMembers(t *testing.T) {
	for members := 1; members <= 17; members++ {
		for n := 1; n <= 7; n++ {
			count := make([]int, members)
			for i := range n {
				sh, err := ParseShard(fmt.Sprintf("%d/%d", i, n), nil, members)
				if err != nil {
					t.Fatal(err)
				}
				for m := range members {
					if sh.Contains(m) {
						count[m]++
					}
				}
			}
			for m, c := range count {
				if c != 1 {
					t.Errorf("%d members, %d shards: member %d is in %d shards", members, n, m, c)
				}
			}
		}
	}
}

// TestShardFromJobArray checks how a shard is read from Slurm's job-array
// task index: "auto" makes task i run member i, "auto/n" shard i of n, and
// an index outside the sweep is refused with the sbatch line to use.
func TestShardFromJobArray(t *testing.T) {
	env := func(id string) func(string) string {
		return func(k string) string {
			if k == ArrayTaskVar {
				return id
			}
			return ""
		}
	}
	for _, tc := range []struct {
		spec, id string
		members  int
		want     Shard
		err      string
	}{
		{"auto", "2", 4, Shard{2, 4}, ""},
		{"auto", "0", 1, Shard{}, ""},
		{"auto/3", "1", 10, Shard{1, 3}, ""},
		{"1/4", "", 4, Shard{1, 4}, ""},
		{"", "3", 4, Shard{}, ""},
		{"auto", "4", 4, Shard{}, "--array=0-3"},
		{"auto/2", "2", 9, Shard{}, "--array=0-1"},
		{"auto", "", 4, Shard{}, ArrayTaskVar + " is not set"},
		{"auto", "x", 4, Shard{}, "not a whole number"},
		{"4/4", "", 8, Shard{}, "0 ≤ i < n"},
		{"-1/4", "", 8, Shard{}, "0 ≤ i < n"},
		{"1/0", "", 8, Shard{}, "at least 1"},
		{"3", "", 8, Shard{}, "want i/n"},
	} {
		got, err := ParseShard(tc.spec, env(tc.id), tc.members)
		switch {
		case tc.err == "" && (err != nil || got != tc.want):
			t.Errorf("ParseShard(%q) with task %q: %v, %v; want %v", tc.spec, tc.id, got, err, tc.want)
		case tc.err != "" && (err == nil || !strings.Contains(err.Error(), tc.err)):
			t.Errorf("ParseShard(%q) with task %q: %v; want an error saying %q", tc.spec, tc.id, err, tc.err)
		}
	}
}
