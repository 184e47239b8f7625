package settings

import (
	"math"
	"strings"
	"testing"
)

type patch struct {
	X float64 `toml:"x"`
	Y float64 `toml:"y"`
}

type sample struct {
	Name  string  `toml:"name"`
	Dt    float64 `toml:"dt"`
	Steps int     `toml:"steps"`
	On    bool    `toml:"on"`
	Inner struct {
		Kind    string  `toml:"kind"`
		Patches []patch `toml:"patches"`
	} `toml:"inner"`
}

func TestFlatten(t *testing.T) {
	var s sample
	s.Name, s.Dt, s.Steps, s.On = "a", 0.1, 7, true
	s.Inner.Kind = "red"
	s.Inner.Patches = []patch{{1, 2}, {3, 1.0 / 3}}
	got, err := Flatten(s, "x.")
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{
		"x.name": `"a"`, "x.dt": "0.1", "x.steps": "7", "x.on": "true",
		"x.inner.kind": `"red"`, "x.inner.patches.len": "2",
		"x.inner.patches[0].x": "1", "x.inner.patches[0].y": "2",
		"x.inner.patches[1].x": "3", "x.inner.patches[1].y": "0.3333333333333333",
	}
	if len(got) != len(want) {
		t.Errorf("got %d keys %v, want %d", len(got), got, len(want))
	}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("%s = %q, want %q", k, got[k], v)
		}
	}
}

// TestFlattenExact checks that values one unit in the last place apart
// (IEEE 754 binary64) flatten differently: a restart must not accept a
// configuration that differs in the last bit.
func TestFlattenExact(t *testing.T) {
	var a, b sample
	a.Dt = 900
	b.Dt = math.Nextafter(900, 1000)
	fa, _ := Flatten(a, "")
	fb, _ := Flatten(b, "")
	d := Diff(fa, fb)
	if len(d) != 1 || d[0].Key != "dt" {
		t.Fatalf("Diff = %v, want one change of dt", d)
	}
}

func TestDiff(t *testing.T) {
	old := map[string]string{"a": "1", "b": "2", "c": "3", "w": "1"}
	new := map[string]string{"a": "1", "b": "5", "d": "4", "w": "2"}
	d := Diff(old, new, "w")
	want := []string{"b: 2 → 5", "c: 3 → (absent)", "d: (absent) → 4"}
	if len(d) != len(want) {
		t.Fatalf("Diff = %v, want %v", d, want)
	}
	for i := range want {
		if d[i].String() != want[i] {
			t.Errorf("change %d = %q, want %q", i, d[i], want[i])
		}
	}
	if s := Describe(d); !strings.Contains(s, "  b: 2 → 5\n") {
		t.Errorf("Describe = %q", s)
	}
}
