// Command wasm is eddyblock's browser demo: the library's experiment
// (package experiment, with qg, wavemaker and qg/diag) compiled to
// WebAssembly and drawn live with ebiten.
//
// Build it with
//
//	GOOS=js GOARCH=wasm go build -o eddyblock.wasm ./wasm
//
// or let `eddyblock serve` build and serve it, or `eddyblock site DIR`
// write a static folder that any web server can host. The page index.html
// at the top of the repository hosts the program's frame (wasm/frame.html)
// and its controls.
//
// The program runs one of the built-in experiments on a 64×32, 128×64 or
// 256×128 grid and shows, side by side, a live field of one layer (the PV
// anomaly, the PV with its background gradient, the streamfunction or the
// height) and the running mean of the eddy forcing since the last clear
// (the eddy PV flux convergence or the eddy height tendency, whole or its
// vorticity-flux or interface-flux part), each with its colour bar on the
// signed scale of package output/palette, the block's outline, the wave
// source's outline and the sponge band. Every number it shows is the
// model's or the diagnostics' own.
//
// Each frame takes the set number of model steps, samples the diagnostics
// every three hours of model time, recomputes the running-mean field when
// a sample arrived (diag.Accumulator.EddyField) and the one-number answers
// once a second (diag.Accumulator.Summary), and writes one pixel buffer.
// A step that fails stops the model and shows the error; a control value
// that the library refuses shows its error and leaves the model running
// as it was.
//
// The page talks to the program through a small object on the frame's
// window, eddyblock: set(name, value) applies a control (returning "" or
// the error), command(name) runs a button (pause, resume, toggle, step,
// reset, clear), status() returns the read-only status (see Status) and
// controls() the list of controls with their labels and units.
//
// The files without build tags hold everything but the browser's glue and
// are tested natively; main_js.go (GOOS=js GOARCH=wasm only) holds the
// ebiten game and the JavaScript bindings.
package main
