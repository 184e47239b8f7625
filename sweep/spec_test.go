package sweep

import (
	"regexp"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/experiment"
)

// small is the head of the sweep files of the tests: the stochastic
// built-in experiment on a 64×32 grid for a few days.
const small = `
name = "test"
base = "storm-track-ending-at-block"
seed = 11
[fixed]
"model.nx" = 64
"model.ny" = 32
"model.dt" = 3600.0
"run.days" = 4.0
"run.spin_up_days" = 1.0
"run.report_days" = 1.0
"run.sample_steps" = 2
"run.snapshot_days" = 0.0
`

func parse(t *testing.T, src string) *Spec {
	t.Helper()
	s, err := Parse(strings.NewReader(src))
	if err != nil {
		t.Fatalf("%v\n%s", err, src)
	}
	return s
}

// TestSweepFileRefusedNamingKey checks that a sweep file with a bad key,
// list or value is refused by Parse or Expand, before anything runs, with
// an error naming the key (common practice: configuration errors name
// what is wrong, and are found before any long work).
func TestSweepFileRefusedNamingKey(t *testing.T) {
	for _, tc := range []struct {
		what, body string
		want       []string // each must be in the error
	}{
		{"unknown key", `[vary]
"model.u3" = [1.0, 2.0]`, []string{"model.u3", "unknown key"}},
		{"unknown key in a nested table", `[vary.wavemaker]
injection_rat = [1e-6]`, []string{"wavemaker.injection_rat", "unknown key"}},
		{"unknown key in [fixed]", `[fixed.block.dipole]
hieght = 100.0
[vary]
"model.u1" = [14.0]`, []string{"block.dipole.hieght", "unknown key"}},
		{"empty list", `[vary]
"model.u1" = []`, []string{"model.u1", "empty list"}},
		{"wrong type: a string for a number", `[vary]
"model.u1" = [14.0, "sixteen"]`, []string{"model.u1", "wrong type", `"sixteen"`, "value 2 of 2"}},
		{"wrong type: a fraction for an integer", `[vary]
"model.scale_selective.order" = [4, 4.5]`, []string{"model.scale_selective.order", "wrong type", "integer"}},
		{"wrong type: a number for a string", `[vary]
"block.mode" = ["fixed", 3]`, []string{"block.mode", "wrong type"}},
		{"not a list", `[vary]
"model.u1" = 14.0`, []string{"model.u1", "list"}},
		{"zipped lists of different lengths", `[[vary_together]]
"model.u1" = [14.0, 16.0]
"model.u2" = [4.0]`, []string{"model.u1", "model.u2", "equal lengths"}},
		{"a key given twice", `[fixed.model]
u2 = 4.0
[vary]
"model.u2" = [1.0, 2.0]`, []string{"model.u2", "twice"}},
		{"a table, not a key", `[vary]
"model" = [1.0]`, []string{"model", "table"}},
		{"a list index past the end", `[vary]
"wavemaker.mask.patches[5].y" = [2e6]`, []string{"wavemaker.mask.patches[5].y", "2 entries"}},
		{"value out of range", `[vary]
"model.u1" = [16.0]
"model.ld" = [7e5, -1.0]`, []string{"model.ld", "member 1 (001_u1=16,ld=-1)"}},
		{"an enumeration value unknown", `[vary]
"block.mode" = ["forced", "glued"]`, []string{"block.mode", "member 1"}},
		{"nothing varied", ``, []string{"nothing to vary"}},
		{"unknown top-level key", `[vary]
"model.u1" = [14.0]`, []string{`"sed"`, "unknown key"}},
	} {
		t.Run(tc.what, func(t *testing.T) {
			var err error
			src := small + tc.body
			if strings.HasPrefix(tc.what, "unknown top-level") {
				src = "sed = 3\n" + src
			}
			s, err := Parse(strings.NewReader(src))
			if err == nil {
				_, err = s.Expand()
			}
			if err == nil {
				t.Fatalf("accepted:\n%s", tc.body)
			}
			t.Log(err)
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error lacks %q:\n%v", w, err)
				}
			}
		})
	}
}

// TestProductOrder checks the members of two lists and a zipped group
// against nested loops written in the test (an independent enumeration):
// the [vary] lists in the file's order, then the group, the last fastest.
func TestProductOrder(t *testing.T) {
	s := parse(t, small+`
[vary]
"wavemaker.injection_rate" = [5e-6, 1e-5, 2e-5]
"model.u1" = [14, 16.0]
[[vary_together]]
"block.dipole.height" = [100.0, 150.0]
"block.dipole.radius" = [1.2e6, 1.5e6]
`)
	p, err := s.Expand()
	if err != nil {
		t.Fatal(err)
	}
	wantKeys := []string{"wavemaker.injection_rate", "model.u1", "block.dipole.height", "block.dipole.radius"}
	if strings.Join(p.Keys, " ") != strings.Join(wantKeys, " ") {
		t.Errorf("keys %v, want %v", p.Keys, wantKeys)
	}
	type member struct{ rate, u1, h, r float64 }
	var want []member
	for _, rate := range []float64{5e-6, 1e-5, 2e-5} {
		for _, u1 := range []float64{14, 16} {
			for k, h := range []float64{100, 150} {
				want = append(want, member{rate, u1, h, []float64{1.2e6, 1.5e6}[k]})
			}
		}
	}
	if len(p.Members) != len(want) {
		t.Fatalf("%d members, want %d", len(p.Members), len(want))
	}
	for i, m := range p.Members {
		c := m.Config
		got := member{c.Wavemaker.InjectionRate, c.Model.U1, c.Block.Dipole.Height, c.Block.Dipole.Radius}
		if got != want[i] || m.Index != i {
			t.Errorf("member %d: %+v, want %+v", i, got, want[i])
		}
		// the values recorded for the member are its configuration's
		for k, v := range []float64{got.rate, got.u1, got.h, got.r} {
			if x, ok := Number(m.Values[k]); !ok || x != v {
				t.Errorf("member %d: value %d is %v, its configuration has %g", i, k, m.Values[k], v)
			}
		}
		// the fixed keys apply, and the base's other keys are kept
		base := experiment.StormTrack()
		if c.Model.Nx != 64 || c.Model.Ny != 32 || c.Run.Days != 4 || c.Model.Lx != base.Model.Lx || c.Model.U2 != base.Model.U2 {
			t.Errorf("member %d: nx %d ny %d days %g lx %g u2 %g", i, c.Model.Nx, c.Model.Ny, c.Run.Days, c.Model.Lx, c.Model.U2)
		}
	}
}

// TestListOfTablesKey checks that a key inside a list of tables
// (a source patch's latitude) is varied in that entry alone, the other
// entry and keys kept as the built-in experiment has them (read from
// experiment.StormTrack, independently of the sweep's expansion).
func TestListOfTablesKey(t *testing.T) {
	p, err := parse(t, small+`
[vary]
"wavemaker.mask.patches[1].y" = [2.0e6, 2.5e6]
`).Expand()
	if err != nil {
		t.Fatal(err)
	}
	base := experiment.StormTrack().Wavemaker.Mask.Patches
	for i, y := range []float64{2e6, 2.5e6} {
		got := p.Members[i].Config.Wavemaker.Mask.Patches
		if len(got) != 2 || got[1].Y != y || got[0] != base[0] || got[1].X != base[1].X {
			t.Errorf("member %d: patches %+v, want the second at y = %g and the first as the base's %+v", i, got, y, base[0])
		}
	}
}

// TestMemberNames checks that member names are unique, start with the
// zero-padded index, use only characters safe on every file system
// (common practice: the POSIX portable filename character set, plus = and
// ,) and shorten keys only as far as they stay distinct.
func TestMemberNames(t *testing.T) {
	keys := []string{"block.dipole.height", "block.modon.height", "model.u1", "name.of/thing"}
	var values [][]any
	for i := range 12 {
		values = append(values, []any{float64(i) * 50, int64(i), -4.5, "a/b c\x00" + strings.Repeat("z", 50)})
	}
	names := Names(keys, values)
	safe := regexp.MustCompile(`^[0-9]{3}_[A-Za-z0-9._=+,-]+$`)
	seen := map[string]bool{}
	for i, n := range names {
		if !safe.MatchString(n) || len(n) > maxName {
			t.Errorf("name %q is not safe or too long", n)
		}
		if seen[n] {
			t.Errorf("name %q twice", n)
		}
		seen[n] = true
		if i == 3 && !strings.HasPrefix(n, "003_dipole.height=150,modon.height=3,u1=-4.5,of_thing=a_b_c_") {
			t.Errorf("name %q", n)
		}
	}
	if got := Names([]string{"model.u1"}, make([][]any, 1001)); got[1000][:5] != "1000_" || got[7][:4] != "0007" {
		t.Errorf("padding: %q, %q", got[1000], got[7])
	}
}

// TestOneKeyValues checks the values of the one-key form: TOML values as
// in a configuration file (TOML 1.0's integer, float, boolean and string
// syntax), a bare word taken as a string.
func TestOneKeyValues(t *testing.T) {
	s, err := OneKey("", "block.mode", []string{"fixed", `"forced"`})
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Vary[0].Values; got[0] != "fixed" || got[1] != "forced" {
		t.Errorf("values %v", got)
	}
	for in, want := range map[string]any{"1e-6": 1e-6, "16": int64(16), "true": true, " 2.5 ": 2.5} {
		if got := ParseValue(in); got != want {
			t.Errorf("ParseValue(%q) = %#v, want %#v", in, got, want)
		}
	}
	// the TOML form of a Spec reads back to the same lists
	s2 := parse(t, small+`
[vary]
"model.u1" = [14, 16.5]
[[vary_together]]
"block.mode" = ["fixed", "forced"]
"model.u2" = [1.0, 2.0]
`)
	back := parse(t, s2.TOML())
	if back.TOML() != s2.TOML() || back.Seed != 11 || len(back.Fixed) != len(s2.Fixed) {
		t.Errorf("TOML form does not read back:\n%s\n%s", s2.TOML(), back.TOML())
	}
}
