package experiment

import (
	"errors"
	"reflect"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/qg"
)

// TestDefaultRoundTrip checks that the built-in experiments are valid, that
// their TOML documents read back to the same configurations (also when read
// over the default, as a configuration file is), and that Builtin finds them
// by name and refuses an unknown one.
func TestDefaultRoundTrip(t *testing.T) {
	for _, d := range []Config{Default(), StormTrack()} {
		if err := d.Validate(); err != nil {
			t.Fatalf("%s: invalid: %v", d.Name, err)
		}
		for _, base := range []Config{{}, Default()} {
			back, err := Decode(strings.NewReader(d.TOML()), base)
			if err != nil {
				t.Fatalf("%s: TOML does not decode: %v", d.Name, err)
			}
			if !reflect.DeepEqual(back, d) {
				t.Errorf("%s: round trip changed the configuration:\n got %+v\nwant %+v", d.Name, back, d)
			}
		}
		b, err := Builtin(d.Name)
		if err != nil || !reflect.DeepEqual(b, d) {
			t.Errorf("Builtin(%q): %v", d.Name, err)
		}
	}
	if _, err := Builtin("no-such-experiment"); err == nil || !strings.Contains(err.Error(), "no-such-experiment") {
		t.Errorf("Builtin of an unknown name: error %v", err)
	}
}

// TestDecodeErrors checks that bad configurations are refused with errors
// that name the offending key, and that a partial file keeps the defaults.
func TestDecodeErrors(t *testing.T) {
	for _, tc := range []struct {
		doc, key string
	}{
		{"[model]\nnx = 100\n", "model.nx"},
		{"[model]\ndt = -5.0\n", "model.dt"},
		{"[model]\ndt = 1e5\n", "model.dt"},
		{"[model]\nld = nan\n", "model.ld"},
		{"[run]\ndays = 0.0\n", "run.days"},
		{"[run]\nspin_up_days = 500.0\n", "run.spin_up_days"},
		{"[run]\nsample_steps = 0\n", "run.sample_steps"},
		{"[block.dipole]\nradius = -1.0\n", "block.dipole.radius"},
		{"[block]\nmode = \"sideways\"\n", "block.mode"},
		{"[wavemaker]\ninjection_rate = -1.0\n", "wavemaker.injection_rate"},
		{"[wavemaker.band]\nmin_wavelength = 1.0\nmax_wavelength = 2.0\n", "wavemaker.band"},
		{"[wavemaker.mask]\nkind = \"patch\"\nx = -3.0e6\n", "wavemaker.mask.x"},
		{"[wavemaker.mask]\npatches = [{x = 1e6, y = 2e7, width_x = 1e6, width_y = 1e6}]\n", "wavemaker.mask.patches[0].y"},
		{"[diagnostics]\nnorm = \"taxicab\"\n", "diagnostics.norm"},
	} {
		// over the stochastic built-in experiment, so that the noise's keys
		// are checked
		_, err := Decode(strings.NewReader(tc.doc), StormTrack())
		var fe *qg.FieldError
		if !errors.As(err, &fe) || !strings.HasPrefix(fe.Field, tc.key) {
			t.Errorf("%q: got %v, want an error naming %s", tc.doc, err, tc.key)
		}
	}
	_, err := Decode(strings.NewReader("[model]\nnxx = 64\n"), Default())
	if err == nil || !strings.Contains(err.Error(), "model.nxx") {
		t.Errorf("unknown key: got %v, want it named", err)
	}
	_, err = Decode(strings.NewReader("[model\n"), Default())
	if err == nil {
		t.Error("malformed TOML accepted")
	}
	c, err := Decode(strings.NewReader("[run]\ndays = 10.0\nspin_up_days = 2.0\n"), Default())
	if err != nil {
		t.Fatal(err)
	}
	if c.Run.Days != 10 || c.Model != Default().Model {
		t.Errorf("partial file: run.days = %g, model changed: %v", c.Run.Days, c.Model != Default().Model)
	}
}

// TestDecodeLeavesBaseAlone checks that decoding a file with an array of
// patches neither changes the base configuration nor lets a patch inherit
// a key it leaves out from the base's patch in the same place (common
// practice: a decoded document replaces an array of tables as a whole).
func TestDecodeLeavesBaseAlone(t *testing.T) {
	base := StormTrack()
	before := base.Wavemaker.Mask.Patches[0]
	doc := "[[wavemaker.mask.patches]]\nx = 5.0e6\ny = 5.0e6\nwidth_x = 1.0e6\n"
	_, err := Decode(strings.NewReader(doc), base)
	if err == nil {
		t.Error("a patch without width_y was accepted (it would have inherited the base's)")
	}
	if base.Wavemaker.Mask.Patches[0] != before {
		t.Errorf("Decode changed the base's first patch: %+v, was %+v", base.Wavemaker.Mask.Patches[0], before)
	}
	c, err := Decode(strings.NewReader(doc+"width_y = 7.0e5\n"), base)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Wavemaker.Mask.Patches) != 1 || c.Wavemaker.Mask.Patches[0].X != 5e6 {
		t.Errorf("decoded patches %+v, want the file's one patch", c.Wavemaker.Mask.Patches)
	}
	if base.Wavemaker.Mask.Patches[0] != before || len(base.Wavemaker.Mask.Patches) != 2 {
		t.Error("Decode changed the base's patches")
	}
	if _, err := Decode(strings.NewReader("[wavemaker]\nkind = \"white\"\nseed = -1\n"), base); err == nil || !strings.Contains(err.Error(), "wavemaker.seed") {
		t.Errorf("a negative seed: %v, want an error naming wavemaker.seed", err)
	}
}

// TestDecodeWith checks a file that adds a driver's own table to an
// experiment's: the experiment's keys land in the Config, the driver's in
// its struct with its defaults kept, and a key neither knows is refused by
// name (common practice: an unknown key is an error, not ignored).
func TestDecodeWith(t *testing.T) {
	type mine struct {
		Probe struct {
			X     float64 `toml:"x"`
			Label string  `toml:"label"`
		} `toml:"probe"`
	}
	var m mine
	m.Probe.Label = "default"
	c, err := DecodeWith(strings.NewReader("[model]\nu1 = 30.0\n[probe]\nx = 4.0e6\n"), Default(), &m)
	if err != nil {
		t.Fatal(err)
	}
	if c.Model.U1 != 30 || m.Probe.X != 4e6 || m.Probe.Label != "default" {
		t.Errorf("u1 %g, probe %+v; want 30 and {4e6 default}", c.Model.U1, m.Probe)
	}
	for _, tc := range []struct{ doc, want string }{
		{"[probe]\ny = 1.0\n", "probe.y"},
		{"[model]\nnxx = 64\n", "model.nxx"},
		{"[probes]\nx = 1.0\n", "probes"},
	} {
		var m mine
		if _, err := DecodeWith(strings.NewReader(tc.doc), Default(), &m); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want one naming %s", tc.doc, err, tc.want)
		}
	}
	if _, err := DecodeWith(strings.NewReader("[probe]\nx = 1.0\n"), Default(), nil); err == nil || !strings.Contains(err.Error(), "probe") {
		t.Errorf("a driver's table with no struct for it: %v, want an error naming probe", err)
	}
}
