package sweep

import (
	"fmt"
	"strconv"
	"strings"
)

// ArrayTaskVar is the environment variable in which Slurm gives each task
// of a job array its index (sbatch --array).
const ArrayTaskVar = "SLURM_ARRAY_TASK_ID"

// Shard selects a share of a sweep's members: those whose index i has
// i mod Count = Index, that is members Index, Index+Count, Index+2·Count, …
// (0-based). Over Index = 0 … Count−1 the shards hold every member exactly
// once. The zero Shard selects every member.
type Shard struct {
	Index, Count int
}

// Contains reports whether member i belongs to the shard.
func (s Shard) Contains(i int) bool {
	return s.Count <= 1 || i%s.Count == s.Index
}

func (s Shard) String() string {
	if s.Count <= 1 {
		return "all members"
	}
	return fmt.Sprintf("shard %d/%d", s.Index, s.Count)
}

// ParseShard reads a shard written as "i/n" (0 ≤ i < n), "auto" or
// "auto/n". With "auto" the index i comes from the job array's task index
// (getenv(ArrayTaskVar)) and n is the number of members, so that task i
// runs member i: a sweep of M members is submitted with
// sbatch --array=0-(M−1). With "auto/n" the task index is the shard of n
// (sbatch --array=0-(n−1)), for fewer tasks than members. "" is every
// member.
func ParseShard(s string, getenv func(string) string, members int) (Shard, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return Shard{}, nil
	}
	is, ns, hasN := strings.Cut(s, "/")
	n := members
	if hasN {
		var err error
		if n, err = strconv.Atoi(ns); err != nil || n < 1 {
			return Shard{}, fmt.Errorf("shard %q: the count after / must be a whole number, at least 1", s)
		}
	}
	var i int
	if is == "auto" {
		env := getenv(ArrayTaskVar)
		if env == "" {
			return Shard{}, fmt.Errorf("shard %q: %s is not set (this is not a task of a Slurm job array); give the shard as i/n", s, ArrayTaskVar)
		}
		var err error
		if i, err = strconv.Atoi(env); err != nil {
			return Shard{}, fmt.Errorf("shard %q: %s = %q is not a whole number", s, ArrayTaskVar, env)
		}
		if i < 0 || i >= n {
			what := fmt.Sprintf("the sweep has %d members (0–%d), one per task", members, members-1)
			if hasN {
				what = fmt.Sprintf("the shards are 0–%d", n-1)
			}
			return Shard{}, fmt.Errorf("shard %q: %s = %d, but %s: submit with sbatch --array=0-%d", s, ArrayTaskVar, i, what, n-1)
		}
	} else {
		if !hasN {
			return Shard{}, fmt.Errorf("shard %q: want i/n (0 ≤ i < n), auto or auto/n", s)
		}
		var err error
		if i, err = strconv.Atoi(is); err != nil || i < 0 || i >= n {
			return Shard{}, fmt.Errorf("shard %q: want i/n with 0 ≤ i < n (shards count from 0)", s)
		}
	}
	if n == 1 {
		return Shard{}, nil
	}
	return Shard{Index: i, Count: n}, nil
}
