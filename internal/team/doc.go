// Package team is the one place where eddyblock splits work between
// goroutines. A [Team] of n workers is the calling goroutine and n−1
// goroutines that the team starts at [New] and stops at [Team.Close].
// [Team.Run] hands one pass of work to every worker and returns when all of
// them have finished it.
//
// The hand-off is correct by construction under any scheduling: every pass
// has a generation number; a worker records the generation it finished in
// its own slot, and the caller waits until every slot holds the generation
// it posted. A finish recorded for an earlier pass can therefore never end
// a later one, and a worker can never start a pass that was not posted.
// Waiting first polls for a short while (waking a parked thread costs tens
// of microseconds on a virtual machine, as much as a pass of a small
// model), then blocks on a condition variable whose condition is re-checked
// under its lock, so no wake-up can be lost and none is needed to be right.
//
// Which worker computes a piece of work must never change its result:
// callers give each worker a fixed share (as the model does with its two
// layers) or hand out tasks whose results do not depend on who takes them
// ([Team.Tasks]); reductions are combined by the caller in a fixed order.
package team
