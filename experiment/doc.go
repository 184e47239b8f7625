// Package experiment assembles an eddy–block experiment from the library's
// parts — the two-layer model (qg), a prescribed block (qg/block), an
// upstream wave source (wavemaker) and the diagnostics (qg/diag) — from one
// configuration, and runs it. The command-line program, the browser demo and
// the examples are thin layers over it.
//
// A configuration is a TOML document with the tables [model], [block],
// [wavemaker], [run] and [diagnostics]. Default returns the built-in
// experiment (a wave train strained by the block), StormTrack a stochastic
// storm track that ends at the block, and Builtin either by name;
// Config.TOML prints any configuration as a complete, comment-free document
// that Decode reads back. Unknown keys are errors, so a misspelt
// key never silently falls back to a default.
package experiment
