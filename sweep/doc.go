// Package sweep runs parameter sweeps of eddyblock experiments: a sweep
// file names configuration keys with lists of values, the members are
// their combinations, each runs in a directory of its own, in parallel, on
// one machine or spread over the tasks of a batch scheduler's job array,
// and a sweep that was interrupted continues where it stopped. [Gather]
// collects every member's parameters and one-number answers into one
// [Table] (CSV, NetCDF, a figure).
//
// # Sweep files
//
// A sweep file is TOML:
//
//	name = "source-strength-and-shear"   # optional
//	base = "storm-track-ending-at-block" # a built-in experiment, or
//	# base_file = "track.toml"           # a configuration file (relative to this file)
//	seed = 7                             # the sweep's seed (default 1)
//
//	[fixed]                              # set for every member
//	"model.nx" = 128
//	"model.ny" = 64
//
//	[vary]                               # combined as a Cartesian product
//	"wavemaker.injection_rate" = [5e-6, 1e-5, 2e-5]
//	"model.u1" = [14.0, 16.0]
//
//	[[vary_together]]                    # varied together: equal lengths
//	"block.dipole.height" = [100.0, 150.0]
//	"block.dipole.radius" = [1.2e6, 1.5e6]
//
// Keys are those of a configuration file (`eddyblock config` prints them),
// written with dots, quoted or as nested tables ([vary.model] u1 = […]),
// with indices for lists of tables ("wavemaker.mask.patches[1].y"). Each
// [vary] list is a factor of the product and so is each [[vary_together]]
// group; the members come in the order of nested loops written in the
// file's order, the last factor varying fastest: the file above has
// 3 × 2 × 2 = 12 members. Values are checked against the type of their key
// (integers are accepted for numbers), and every member's configuration is
// validated before anything runs; errors name the key and the member.
//
// # Members
//
// A member's directory is named from its index and its values
// ([Names]: "003_injection_rate=1e-05,u1=16"). Its wave source's seed,
// wavemaker.seed, is [MemberSeed](seed, index), a SplitMix64 step of the
// sweep's seed and the member's index, unless the sweep sets
// wavemaker.seed itself (in [fixed] for one noise realisation shared by
// every member, or in a list for an ensemble).
//
// # Running
//
// [Spec.Expand] builds and validates the members; [Prepare] checks the sweep
// directory and the members' initial states and records the sweep there
// ([RecordFile] and [CopyFile]); [Run.Execute] runs the members that are not
// finished through package output (output.Prepare with Resume, then
// output.Run.Execute), [Options].Jobs at a time. Running the same sweep again
// skips finished members and resumes interrupted ones from their
// checkpoints; a sweep directory made by a different sweep is refused with
// the keys and values that differ. A [Shard] selects every n-th member for
// one process, such as a task of a Slurm job array ([ParseShard]). Members
// hold a lock while they run, so that two processes never run the same
// member.
package sweep
