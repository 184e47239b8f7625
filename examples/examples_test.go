// Package examples_test runs the example programs, and builds the driver
// example in a module of its own outside the repository, as a user would.
package examples_test

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// repoRoot is the module's root directory (this file's parent's parent).
func repoRoot(t *testing.T) string {
	t.Helper()
	_, file, _, ok := runtime.Caller(0)
	if !ok {
		t.Fatal("cannot locate the test file")
	}
	return filepath.Dir(filepath.Dir(file))
}

func goTool(t *testing.T) string {
	t.Helper()
	return filepath.Join(runtime.GOROOT(), "bin", "go")
}

// TestOutsideDriver copies examples/driver/main.go into a new module in a
// temporary directory outside the repository, which requires this module
// by its path with a replace directive pointing at the checkout (the route
// the README gives for a local checkout), and runs it: only the public API
// is reachable from there (an internal package would not compile).
func TestOutsideDriver(t *testing.T) {
	testenv.Long(t)
	root := repoRoot(t)
	dir := t.TempDir()
	src, err := os.ReadFile(filepath.Join(root, "examples", "driver", "main.go"))
	if err != nil {
		t.Fatal(err)
	}
	gomod := "module labdriver\n\ngo 1.26\n\nrequire github.com/eddyblock/eddyblock v0.0.0\n\nreplace github.com/eddyblock/eddyblock => " + root + "\n"
	os.WriteFile(filepath.Join(dir, "go.mod"), []byte(gomod), 0o644)
	os.WriteFile(filepath.Join(dir, "main.go"), src, 0o644)
	run := func(args ...string) string {
		cmd := exec.Command(goTool(t), args...)
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off")
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("go %s: %v\n%s", strings.Join(args, " "), err, out)
		}
		return string(out)
	}
	run("mod", "tidy")
	out := run("run", ".")
	// a steady response to a negative PV forcing is anticyclonic: a high
	// (common practice: q′ < 0 inverts to ψ′ > 0 and Z′ = f0ψ′/g > 0)
	if !regexp.MustCompile(`day 10: upper-layer height peaks at \+\d+ m`).MatchString(out) {
		t.Errorf("driver output:\n%s", out)
	}

	// the module's internal packages are out of reach from outside
	bad := strings.Replace(string(src), `"github.com/eddyblock/eddyblock/qg"`, "\"github.com/eddyblock/eddyblock/qg\"\n\t_ \"github.com/eddyblock/eddyblock/internal/team\"", 1)
	os.WriteFile(filepath.Join(dir, "main.go"), []byte(bad), 0o644)
	cmd := exec.Command(goTool(t), "build", ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off")
	if out, err := cmd.CombinedOutput(); err == nil || !strings.Contains(string(out), "internal") {
		t.Errorf("a driver importing an internal package built: %v\n%s", err, out)
	}
}

// TestExamplesRun runs each example program and checks what it prints.
func TestExamplesRun(t *testing.T) {
	testenv.Long(t)
	root := repoRoot(t)
	for _, tc := range []struct {
		dir  string
		want []string
	}{
		{"attribution", []string{"(b) linear, anomaly alone", "(c) linear, anomaly + Δ eddy forcing"}},
		{"driver", []string{"day 10: upper-layer height peaks at +"}},
		{"heating", []string{"at the heating patch:", "response"}},
		{"spinup", []string{"day  20", "day 200", "days 140–200: energy"}},
		{"sweep", []string{"block height", "6 of 6 members done"}},
		{"tracksweep", []string{"track offset", "3000 km"}},
	} {
		cmd := exec.Command(goTool(t), "run", "./examples/"+tc.dir)
		cmd.Dir = root
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Errorf("%s: %v\n%s", tc.dir, err, out)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(string(out), w) {
				t.Errorf("%s: output lacks %q:\n%s", tc.dir, w, out)
			}
		}
	}
}
