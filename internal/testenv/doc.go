// Package testenv holds what the project's tests share about their
// environment: whether the complete suite was asked for, and where the
// external programs some tests use (Unidata's ncdump, Debian's Python with
// xarray, Chromium) are.
//
// A plain `go test ./...` runs the fast tests and skips the long experiment
// runs and the tests that need external programs, saying so. The project's
// test command (scripts/test-all) sets EDDYBLOCK_FULL_TESTS=1: then every
// long test runs, and a missing external program fails the test instead of
// skipping it.
package testenv
