// Package experiment assembles an eddy–block experiment from the library's
// parts — the two-layer model (qg), a prescribed block (qg/block), an
// upstream wave source (wavemaker) and the diagnostics (qg/diag) — from one
// configuration, and runs it. The command-line program, the browser demo and
// the examples are thin layers over it.
//
// A [Config] is a TOML document with the tables model, block, wavemaker,
// run and diagnostics. [Default] returns the built-in experiment (a wave
// train strained by the block), [StormTrack] a stochastic storm track that
// ends at the block, [WhiteNoiseControl] the default's control with white
// noise in the wave train's place, and [Builtin] any of them by name;
// [Config.Documented] prints a configuration as TOML with a comment on
// every key (meaning, unit, allowed range), leaving out what the chosen
// options do not use ([Config.Used]), a document that [Decode] and [Load]
// read back. Unknown keys are errors, so a misspelt key never
// silently falls back to a default.
//
// [New] builds an [Experiment] (checking the initial state as a step
// would); [Experiment.Run] integrates it, reporting [Progress];
// [Experiment.Summary] gives the one-number answers and Experiment.Diag
// the gridded diagnostics; [Experiment.Checkpoint] and [Experiment.Restore]
// continue a run bit for bit; [Experiment.Close] releases the model.
package experiment
