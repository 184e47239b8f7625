//go:build !(js && wasm)

package main

import (
	"fmt"
	"os"
)

// main explains how to run the demo: it is built for the browser only.
func main() {
	fmt.Fprintln(os.Stderr, "wasm: this is eddyblock's browser demo; build it with GOOS=js GOARCH=wasm, or run `go run ./cmd/eddyblock serve` and open the address it prints")
	os.Exit(2)
}
