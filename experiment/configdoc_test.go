package experiment

import (
	"errors"
	"fmt"
	"maps"
	"math"
	"os/exec"
	"reflect"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"

	"github.com/eddyblock/eddyblock/internal/settings"
	"github.com/eddyblock/eddyblock/internal/testenv"
	"github.com/eddyblock/eddyblock/internal/tomltext"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// configVariants returns the built-in experiments and variants of the
// default that exercise every choice that leaves keys out: no block (also
// as an empty shape), modons of both polarities, red noise on patches, a
// hyperviscosity, no scale-selective dissipation, relaxed and fixed
// (linear) blocks, no sponge, a wave train without a mask, white noise
// without a mask on a zonal band, and no wave source.
func configVariants() []Config {
	vs := Builtins()
	add := func(name string, change func(c *Config)) {
		c := Default()
		c.Name = name
		change(&c)
		vs = append(vs, c)
	}
	add("no-block", func(c *Config) { c.Block.Shape = block.None })
	add("empty-shape-energy-norm", func(c *Config) { c.Block.Shape = ""; c.Diag.Norm = diag.EnergyNorm })
	add("modon", func(c *Config) {
		c.Block.Shape = block.ModonShape
		c.Block.Modon = block.Modon{X: 11e6, Y: 5e6, Radius: 1.2e6, Speed: 2, Polarity: block.HighPoleward, Height: 150}
	})
	add("free-exact-modon", func(c *Config) {
		c.Block = block.Config{Shape: block.ModonShape, Mode: qg.Free,
			Modon: block.Modon{X: 1e7, Y: 5e6, Radius: 1e6, Speed: 1.5, Polarity: block.LowPoleward, Psi: 2e7}}
	})
	add("red-noise-patches", func(c *Config) {
		c.Wavemaker = StormTrack().Wavemaker
		c.Wavemaker.Kind = wavemaker.Red
		c.Wavemaker.CorrelationTime = 2 * 86400
		c.Wavemaker.Seed = 9223372036854775807
	})
	add("hyperviscosity", func(c *Config) {
		c.Model.ScaleSelective = qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 1e14, Order: 2}
	})
	add("inviscid", func(c *Config) { c.Model.ScaleSelective = qg.ScaleSelective{Kind: qg.NoScaleSelective} })
	add("relaxed", func(c *Config) { c.Block.Mode = qg.Relaxed; c.Block.RelaxTime = 10 * 86400 })
	add("fixed-linear-transient", func(c *Config) {
		c.Block.Mode, c.Block.Linear = qg.Fixed, true
		c.Diag.Transient = true
	})
	add("no-sponge", func(c *Config) { c.Model.Sponge = qg.Sponge{} })
	add("wave-train-no-mask", func(c *Config) {
		c.Wavemaker.Mask = wavemaker.MaskConfig{Kind: wavemaker.NoMask}
		c.Wavemaker.Train.WavelengthX = 2e6 // ten wavelengths in lx, as an unmasked train needs
	})
	add("white-zonal-no-mask", func(c *Config) {
		c.Wavemaker = wavemaker.Config{Kind: wavemaker.White, Mask: wavemaker.MaskConfig{Kind: wavemaker.NoMask},
			Band:     wavemaker.BandConfig{Kind: wavemaker.ZonalBand, MinWavelength: 1e6, MaxWavelength: 5e6},
			Vertical: wavemaker.Baroclinic, InjectionRate: 2e-6, Seed: 42}
	})
	add("no-source", func(c *Config) { c.Wavemaker.Kind = wavemaker.Off })
	add("odd-name", func(c *Config) { c.Name = "tab\there, \"quoted\" \\ and ψ" })
	return vs
}

// small returns c on a 64 × 32 grid, sampling every step from the start,
// for runs of a few steps.
func small(c Config) Config {
	c.Model.Nx, c.Model.Ny = 64, 32
	c.Run.SampleSteps, c.Run.SpinUpDays = 1, 0
	return c
}

// typeKeys walks the type of a configuration table as a TOML file writes
// it: every table, array of tables and key, with the keys of an array's
// elements after "name[]". kind is "table", "array" or the Go kind of a
// key's value.
func typeKeys(t reflect.Type, prefix string, visit func(key, kind string)) {
	for i := range t.NumField() {
		f := t.Field(i)
		tag, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if tag == "" || tag == "-" {
			continue
		}
		key := prefix + tag
		switch {
		case f.Type.Kind() == reflect.Struct:
			visit(key, "table")
			typeKeys(f.Type, key+".", visit)
		case f.Type.Kind() == reflect.Slice && f.Type.Elem().Kind() == reflect.Struct:
			visit(key, "array")
			typeKeys(f.Type.Elem(), key+"[].", visit)
		default:
			visit(key, f.Type.Kind().String())
		}
	}
}

// valueKeys walks the values of a configuration: every key (arrays of
// tables as a whole and each element's keys, indexed name[i]) with a
// settable value. Tables are walked, not visited.
func valueKeys(v reflect.Value, prefix string, visit func(key string, f reflect.Value)) {
	t := v.Type()
	for i := range t.NumField() {
		tag, _, _ := strings.Cut(t.Field(i).Tag.Get("toml"), ",")
		if tag == "" || tag == "-" {
			continue
		}
		key, f := prefix+tag, v.Field(i)
		switch {
		case f.Kind() == reflect.Struct:
			valueKeys(f, key+".", visit)
		case f.Kind() == reflect.Slice:
			visit(key, f)
			for j := range f.Len() {
				valueKeys(f.Index(j), fmt.Sprintf("%s[%d].", key, j), visit)
			}
		default:
			visit(key, f)
		}
	}
}

// TestKeyDocsCoverConfig walks the Config type through its toml tags and
// checks that every table, array of tables and key has documentation, that
// no documentation names a key that does not exist, and that each entry is
// complete: a meaning, and for a key the allowed values and (for a number)
// a unit. A key added to the configuration without documentation fails here.
func TestKeyDocsCoverConfig(t *testing.T) {
	kinds := map[string]string{}
	typeKeys(reflect.TypeOf(Config{}), "", func(key, kind string) { kinds[key] = kind })
	if len(kinds) < 80 {
		t.Fatalf("the walk found %d keys; the configuration has more than 80", len(kinds))
	}
	if kinds["wavemaker.mask.patches"] != "array" || kinds["wavemaker.mask.patches[].width_y"] != "float64" {
		t.Fatalf("the walk missed the array of patches: %q, %q", kinds["wavemaker.mask.patches"], kinds["wavemaker.mask.patches[].width_y"])
	}
	seen := map[string]bool{}
	for _, d := range KeyDocs() {
		if seen[d.Key] {
			t.Errorf("%s: documented twice", d.Key)
		}
		seen[d.Key] = true
		kind, ok := kinds[d.Key]
		if !ok {
			t.Errorf("%s: documented, but the configuration has no such key", d.Key)
			continue
		}
		if d.Meaning == "" || strings.HasSuffix(d.Meaning, ".") {
			t.Errorf("%s: meaning %q: want a phrase without a final full stop", d.Key, d.Meaning)
		}
		switch kind {
		case "table":
			if d.Unit != "" || d.Allowed != "" {
				t.Errorf("%s: a table has a unit %q or a range %q", d.Key, d.Unit, d.Allowed)
			}
		case "array":
			if d.Unit != "" || d.Allowed == "" {
				t.Errorf("%s: an array of tables wants no unit (%q) and how many elements (%q)", d.Key, d.Unit, d.Allowed)
			}
		case "string", "bool":
			if d.Unit != "" || d.Allowed == "" {
				t.Errorf("%s (%s): unit %q, allowed %q: want no unit and the allowed values", d.Key, kind, d.Unit, d.Allowed)
			}
		default:
			if d.Unit == "" || d.Allowed == "" {
				t.Errorf("%s (%s): unit %q, allowed %q: a number wants both", d.Key, kind, d.Unit, d.Allowed)
			}
		}
	}
	for key := range kinds {
		if !seen[key] {
			t.Errorf("%s: in the configuration, not documented", key)
		}
	}
	for _, tc := range []struct{ in, want string }{
		{"wavemaker.mask.patches[12].x", "wavemaker.mask.patches[].x"},
		{"wavemaker.mask.patches.len", "wavemaker.mask.patches"},
		{"model.dt", "model.dt"},
	} {
		if d, ok := KeyDocFor(tc.in); !ok || d.Key != tc.want {
			t.Errorf("KeyDocFor(%q) = %q, %t; want %q", tc.in, d.Key, ok, tc.want)
		}
	}
	if _, ok := KeyDocFor("model.nxx"); ok {
		t.Error("KeyDocFor found an unknown key")
	}
}

// TestUsedRules checks each rule of Used against the way the code consumes
// the option (named beside each case).
func TestUsedRules(t *testing.T) {
	with := func(change func(c *Config)) Config { c := Default(); change(&c); return c }
	noBlock := with(func(c *Config) { c.Block.Shape = block.None })
	emptyShape := with(func(c *Config) { c.Block.Shape = "" })
	modon := with(func(c *Config) { c.Block.Shape = block.ModonShape })
	relaxed := with(func(c *Config) { c.Block.Mode = qg.Relaxed })
	fixed := with(func(c *Config) { c.Block.Mode = qg.Fixed })
	free := with(func(c *Config) { c.Block.Mode = qg.Free })
	white := WhiteNoiseControl()
	red := with(func(c *Config) { c.Wavemaker.Kind = wavemaker.Red })
	off := with(func(c *Config) { c.Wavemaker.Kind = wavemaker.Off })
	patches := StormTrack()
	noMask := with(func(c *Config) { c.Wavemaker.Mask.Kind = wavemaker.NoMask })
	hyper := with(func(c *Config) { c.Model.ScaleSelective.Kind = qg.Hyperviscosity })
	inviscid := with(func(c *Config) { c.Model.ScaleSelective.Kind = qg.NoScaleSelective })
	noSponge := with(func(c *Config) { c.Model.Sponge.Rate = 0 })
	train := Default()
	for _, tc := range []struct {
		name string
		c    Config
		key  string
		want bool
	}{
		// block.Config.Validate and New: without a block (Enabled) nothing
		// else of the table is read; Block builds the dipole or the modon
		// by shape.
		{"no block: shape", noBlock, "block.shape", true},
		{"no block: mode", noBlock, "block.mode", false},
		{"no block: dipole", noBlock, "block.dipole", false},
		{"no block: dipole key", noBlock, "block.dipole.height", false},
		{"no block: linear", noBlock, "block.linear", false},
		{"empty shape: mode", emptyShape, "block.mode", false},
		{"dipole: dipole", train, "block.dipole.radius", true},
		{"dipole: modon", train, "block.modon", false},
		{"dipole: modon key", train, "block.modon.speed", false},
		{"modon: modon key", modon, "block.modon.speed", true},
		{"modon: dipole key", modon, "block.dipole.separation", false},
		// qg.Model.SetBlock reads RelaxTime in the relaxed mode only;
		// fluxRow drops J(ψ′, q′) only with a fixed block (and Validate
		// refuses linear in the other modes).
		{"forced: relax_time", train, "block.relax_time", false},
		{"relaxed: relax_time", relaxed, "block.relax_time", true},
		{"relaxed: linear", relaxed, "block.linear", false},
		{"fixed: linear", fixed, "block.linear", true},
		{"fixed: relax_time", fixed, "block.relax_time", false},
		{"free: mode", free, "block.mode", true},
		{"free: linear", free, "block.linear", false},
		// wavemaker.New: "none" reads nothing else; NewTrain reads the
		// train, the mask and the vertical structure; NewNoise the band,
		// the injection rate, the seed, the mask, the vertical structure,
		// and the correlation time for red noise.
		{"train: kind", train, "wavemaker.kind", true},
		{"train: train", train, "wavemaker.train.frequency", true},
		{"train: vertical", train, "wavemaker.vertical", true},
		{"train: mask", train, "wavemaker.mask.kind", true},
		{"train: band", train, "wavemaker.band", false},
		{"train: band key", train, "wavemaker.band.min_wavelength", false},
		{"train: injection_rate", train, "wavemaker.injection_rate", false},
		{"train: seed", train, "wavemaker.seed", false},
		{"train: correlation_time", train, "wavemaker.correlation_time", false},
		{"white: band", white, "wavemaker.band.kind", true},
		{"white: injection_rate", white, "wavemaker.injection_rate", true},
		{"white: seed", white, "wavemaker.seed", true},
		{"white: correlation_time", white, "wavemaker.correlation_time", false},
		{"white: train", white, "wavemaker.train.amplitude", false},
		{"red: correlation_time", red, "wavemaker.correlation_time", true},
		{"red: seed", red, "wavemaker.seed", true},
		{"none: kind", off, "wavemaker.kind", true},
		{"none: vertical", off, "wavemaker.vertical", false},
		{"none: mask", off, "wavemaker.mask", false},
		{"none: mask kind", off, "wavemaker.mask.kind", false},
		{"none: train", off, "wavemaker.train.wavelength_x", false},
		{"none: band", off, "wavemaker.band.max_wavelength", false},
		// MaskConfig.patches: kind "patch" reads x, y, width_x, width_y;
		// "patches" reads the list; "none" neither.
		{"patch: x", train, "wavemaker.mask.x", true},
		{"patch: width_y", train, "wavemaker.mask.width_y", true},
		{"patch: patches", train, "wavemaker.mask.patches", false},
		{"patch: patch key", train, "wavemaker.mask.patches[0].x", false},
		{"patches: patches", patches, "wavemaker.mask.patches", true},
		{"patches: length", patches, "wavemaker.mask.patches.len", true},
		{"patches: patch key", patches, "wavemaker.mask.patches[1].width_x", true},
		{"patches: x", patches, "wavemaker.mask.x", false},
		{"no mask: kind", noMask, "wavemaker.mask.kind", true},
		{"no mask: x", noMask, "wavemaker.mask.x", false},
		{"no mask: patches", noMask, "wavemaker.mask.patches", false},
		// qg setDissipation: the filter's keys for "filter", viscosity
		// and order for "hyperviscosity", nothing for "none".
		{"filter: kind", train, "model.scale_selective.kind", true},
		{"filter: filter_time", train, "model.scale_selective.filter_time", true},
		{"filter: viscosity", train, "model.scale_selective.viscosity", false},
		{"filter: order", train, "model.scale_selective.order", false},
		{"hyper: viscosity", hyper, "model.scale_selective.viscosity", true},
		{"hyper: order", hyper, "model.scale_selective.order", true},
		{"hyper: filter_cutoff", hyper, "model.scale_selective.filter_cutoff", false},
		{"hyper: filter_order", hyper, "model.scale_selective.filter_order", false},
		{"none: filter_time", inviscid, "model.scale_selective.filter_time", false},
		{"none: viscosity", inviscid, "model.scale_selective.viscosity", false},
		{"none: table", inviscid, "model.scale_selective", true},
		// qg setSponge: a zero rate builds no sponge.
		{"sponge: width", train, "model.sponge.width", true},
		{"sponge: x", train, "model.sponge.x", true},
		{"no sponge: rate", noSponge, "model.sponge.rate", true},
		{"no sponge: width", noSponge, "model.sponge.width", false},
		{"no sponge: x", noSponge, "model.sponge.x", false},
		// always read
		{"name", off, "name", true},
		{"model.dt", noBlock, "model.dt", true},
		{"run.snapshot_days", noBlock, "run.snapshot_days", true},
		{"diagnostics.norm without a block", noBlock, "diagnostics.norm", true},
		{"diagnostics.transient, forced", train, "diagnostics.transient", true},
		// not keys
		{"unknown key", train, "model.nxx", false},
		{"a table's element", patches, "wavemaker.mask.patches[0]", false},
		{"empty", train, "", false},
	} {
		if got := tc.c.Used(tc.key); got != tc.want {
			t.Errorf("%s: Used(%q) = %t, want %t", tc.name, tc.key, got, tc.want)
		}
	}
}

// perturb sets the value of one key to something no run could use
// unnoticed: NaN for a float, another integer, a string that is no choice,
// the other boolean, an extra patch of NaNs for an array.
func perturb(f reflect.Value) {
	switch f.Kind() {
	case reflect.Float64:
		f.SetFloat(math.NaN())
	case reflect.Int:
		f.SetInt(f.Int() + 7)
	case reflect.Uint64:
		f.SetUint(f.Uint() + 7)
	case reflect.String:
		f.SetString("not-a-choice")
	case reflect.Bool:
		f.SetBool(!f.Bool())
	case reflect.Slice:
		nan := math.NaN()
		f.Set(reflect.Append(f, reflect.ValueOf(wavemaker.PatchConfig{X: nan, Y: nan, WidthX: nan, WidthY: nan})))
	default:
		panic("perturb: no rule for kind " + f.Kind().String())
	}
}

// clonePatches gives c its own copy of the patches, so that perturbing a
// copy leaves the original alone.
func clonePatches(c Config) Config {
	c.Wavemaker.Mask.Patches = slices.Clone(c.Wavemaker.Mask.Patches)
	return c
}

// unusedKeys lists the keys (not under an unused array) that c does not use.
func unusedKeys(c Config) []string {
	var keys []string
	valueKeys(reflect.ValueOf(c), "", func(key string, _ reflect.Value) {
		if !c.Used(key) && !strings.Contains(key, "[") {
			keys = append(keys, key)
		}
	})
	return keys
}

// withKey returns a copy of c with the key's value perturbed.
func withKey(c Config, key string) Config {
	p := clonePatches(c)
	found := false
	valueKeys(reflect.ValueOf(&p).Elem(), "", func(k string, f reflect.Value) {
		if k == key {
			perturb(f)
			found = true
		}
	})
	if !found {
		panic("withKey: no key " + key)
	}
	return p
}

// outcome runs c for a few steps and returns what the run produced, to
// compare bit for bit: the PV, the energy books, the wave source's state
// and the summary.
func outcome(t *testing.T, c Config) string {
	t.Helper()
	e, err := New(c)
	if err != nil {
		t.Fatalf("%s: %v", c.Name, err)
	}
	defer e.Close()
	for range 4 {
		if _, _, err := e.Advance(); err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
	}
	ck, err := e.Checkpoint()
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	for n := range 2 {
		for _, z := range ck.Q[n] {
			fmt.Fprintf(&b, "%x %x ", math.Float64bits(real(z)), math.Float64bits(imag(z)))
		}
	}
	for _, l := range ck.Ledger {
		fmt.Fprintf(&b, "%x ", math.Float64bits(l))
	}
	fmt.Fprintf(&b, "%x\n%+v", ck.Extra["wavemaker"], e.Summary())
	return b.String()
}

// TestUnusedKeysChangeNothing checks Used against the code itself: in
// every variant, each key Used calls unused is set to NaN (or another value
// no option accepts) and a short run must still be built and give the same
// PV, energy books, wave-source state and summary to the last bit. The one
// exception is block.linear, which Validate refuses (naming it) in a block
// of any mode but fixed. The reverse, that every used key matters, is
// TestUsedRules's table.
func TestUnusedKeysChangeNothing(t *testing.T) {
	for _, v := range configVariants() {
		c := small(v)
		want := outcome(t, c)
		keys := unusedKeys(c)
		if c.Wavemaker.Kind == wavemaker.WaveTrain && !slices.Contains(keys, "wavemaker.seed") {
			t.Errorf("%s: the wave train's seed counted as used", c.Name)
		}
		for _, key := range keys {
			p := withKey(c, key)
			if key == "block.linear" && c.Block.Enabled() {
				var fe *qg.FieldError
				if _, err := New(p); !errors.As(err, &fe) || fe.Field != key {
					t.Errorf("%s: linear = true in mode %q: got %v, want an error naming %s", c.Name, c.Block.Mode, err, key)
				}
				continue
			}
			if got := outcome(t, p); got != want {
				t.Errorf("%s: changing %s, which Used calls unused, changed the run", c.Name, key)
			}
		}
	}
}

// TestDocumentedRoundTrip checks Documented for every built-in and variant:
// the document has a header, a comment of one or two lines above every key
// and table, and exactly the keys that the configuration uses (read back by
// the TOML decoder, a reference implementation of the TOML 1.0
// specification); and it decodes over Default, as a file is loaded, to
// c.Canonical(), which has c's value in every used key and the default's
// elsewhere.
func TestDocumentedRoundTrip(t *testing.T) {
	for _, c := range configVariants() {
		doc := c.Documented()
		if !strings.HasPrefix(doc, "# eddyblock configuration of the experiment "+tomltext.String(c.Name)+".\n") ||
			!strings.Contains(doc, "# Every key is optional in a file: a missing key keeps the built-in default.\n") ||
			!strings.Contains(doc, "# "+caution+"\n") {
			t.Errorf("%s: header missing:\n%s", c.Name, doc[:min(len(doc), 400)])
		}
		checkComments(t, c.Name, doc)

		// exactly the used keys
		var tree map[string]any
		if _, err := toml.Decode(doc, &tree); err != nil {
			t.Fatalf("%s: the document is not TOML: %v\n%s", c.Name, err, doc)
		}
		flat, err := settings.Flatten(tree, "")
		if err != nil {
			t.Fatal(err)
		}
		var want []string
		valueKeys(reflect.ValueOf(c), "", func(key string, f reflect.Value) {
			switch {
			case !c.Used(key):
			case f.Kind() == reflect.Slice:
				if f.Len() > 0 {
					want = append(want, key+".len")
				}
			default:
				want = append(want, key)
			}
		})
		var got []string
		for k := range flat {
			got = append(got, k)
		}
		sort.Strings(got)
		sort.Strings(want)
		if !slices.Equal(got, want) {
			t.Errorf("%s: the document holds the keys\n%v\nwant the used keys\n%v", c.Name, got, want)
		}

		back, err := Decode(strings.NewReader(doc), Default())
		if err != nil {
			t.Fatalf("%s: the document does not load: %v\n%s", c.Name, err, doc)
		}
		if can := c.Canonical(); !reflect.DeepEqual(back, can) {
			t.Errorf("%s: the document loads to\n%+v\nwant c.Canonical()\n%+v", c.Name, back, can)
		}
		// the used settings, every float to the bit
		valueKeys(reflect.ValueOf(c), "", func(key string, f reflect.Value) {
			if !c.Used(key) {
				return
			}
			var g reflect.Value
			valueKeys(reflect.ValueOf(back), "", func(k string, v reflect.Value) {
				if k == key {
					g = v
				}
			})
			switch {
			case !g.IsValid():
				t.Errorf("%s: %s lost", c.Name, key)
			case f.Kind() == reflect.Float64 && math.Float64bits(f.Float()) != math.Float64bits(g.Float()):
				t.Errorf("%s: %s = %v read back as %v", c.Name, key, f.Float(), g.Float())
			case !reflect.DeepEqual(f.Interface(), g.Interface()):
				t.Errorf("%s: %s = %v read back as %v", c.Name, key, f.Interface(), g.Interface())
			}
		})
		if !reflect.DeepEqual(back.Canonical(), back) {
			t.Errorf("%s: Canonical is not idempotent", c.Name)
		}
	}
}

// checkComments checks that every key and table header of a Documented
// document has a comment of one or two lines of at most commentWidth
// characters right above it.
func checkComments(t *testing.T, name, doc string) {
	t.Helper()
	lines := strings.Split(doc, "\n")
	arrays := map[string]bool{}
	for i, l := range lines {
		if len([]rune(l)) > commentWidth && strings.HasPrefix(l, "#") {
			t.Errorf("%s: comment line %d is %d characters long: %s", name, i+1, len([]rune(l)), l)
		}
		if l == "" || strings.HasPrefix(l, "#") {
			continue
		}
		n := 0
		for j := i - 1; j >= 0 && strings.HasPrefix(lines[j], "# "); j-- {
			n++
		}
		if strings.HasPrefix(l, "[[") {
			// the first element of an array of tables carries the comment
			if arrays[l] && n == 0 {
				continue
			}
			arrays[l] = true
		}
		if n < 1 || n > 2 {
			t.Errorf("%s: line %d %q has %d comment lines above it, want 1 or 2", name, i+1, l, n)
		}
	}
}

// TestTrajectorySettingsIgnoreUnused checks that the restart fingerprint
// holds the used keys only: every variant, with each key it does not use
// set to NaN or a value no option accepts, has the same fingerprint as
// itself and as what its Documented TOML loads to (so that a run restarted
// with the config.toml it wrote is not refused), while a change in a used
// key still changes the fingerprint.
func TestTrajectorySettingsIgnoreUnused(t *testing.T) {
	for _, c := range configVariants() {
		want, err := c.trajectorySettings()
		if err != nil {
			t.Fatal(err)
		}
		for k := range want {
			if !c.Used(k) {
				t.Errorf("%s: the fingerprint holds %s, which the configuration does not use", c.Name, k)
			}
		}
		for _, k := range []string{"model.dt", "wavemaker.kind", "block.shape", "run.sample_steps", "diagnostics.norm"} {
			if _, ok := want[k]; !ok {
				t.Errorf("%s: the fingerprint lacks %s", c.Name, k)
			}
		}
		for _, k := range freeKeys {
			if _, ok := want[k]; ok {
				t.Errorf("%s: the fingerprint holds the free key %s", c.Name, k)
			}
		}
		odd := clonePatches(c)
		for _, key := range unusedKeys(c) {
			odd = withKey(odd, key)
		}
		for _, o := range []Config{c, odd} {
			back, err := Decode(strings.NewReader(o.Documented()), Default())
			if err != nil {
				t.Fatalf("%s: %v", c.Name, err)
			}
			for _, x := range []Config{o, back} {
				got, err := x.trajectorySettings()
				if err != nil {
					t.Fatal(err)
				}
				if d := settings.Diff(want, got); len(d) > 0 {
					t.Errorf("%s: fingerprints differ:\n%s", c.Name, settings.Describe(d))
				}
			}
		}
		// a used key still counts
		changed := c
		changed.Model.Dt = c.Model.Dt / 2
		if c.Model.Sponge.Rate != 0 {
			changed.Model.Sponge.Width = c.Model.Sponge.Width / 2
		}
		got, err := changed.trajectorySettings()
		if err != nil {
			t.Fatal(err)
		}
		if d := settings.Diff(want, got); len(d) == 0 {
			t.Errorf("%s: a change of model.dt left the fingerprint alone", c.Name)
		}
	}
}

// TestRestartFromWrittenConfig runs a small version of every variant a few
// steps, and restarts it from its checkpoint in an experiment built from
// its own Documented TOML (where the unused keys, the model's among them,
// have the default's values): the restart is accepted and continues bit
// for bit like the original. A checkpoint whose fingerprint holds every
// key, as those written before unused keys were left out, restarts too;
// one written with another value of a used key is refused.
func TestRestartFromWrittenConfig(t *testing.T) {
	for _, v := range configVariants() {
		c := small(v)
		e, err := New(c)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		for range 3 {
			if _, _, err := e.Advance(); err != nil {
				t.Fatal(err)
			}
		}
		ck, err := e.Checkpoint()
		if err != nil {
			t.Fatal(err)
		}
		back, err := Decode(strings.NewReader(c.Documented()), Default())
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		r, err := New(back)
		if err != nil {
			t.Fatalf("%s: %v", c.Name, err)
		}
		full := *ck
		if full.Settings, err = settings.Flatten(c, ""); err != nil {
			t.Fatal(err)
		}
		for _, k := range freeKeys {
			delete(full.Settings, k)
		}
		if err := r.Restore(&full); err != nil {
			t.Errorf("%s: a checkpoint with every key in its fingerprint is refused: %v", c.Name, err)
		}
		other := *ck
		other.Settings = maps.Clone(ck.Settings)
		other.Settings["model.u2"] = "3.5"
		var mismatch *qg.ConfigMismatch
		if err := r.Restore(&other); !errors.As(err, &mismatch) || !strings.Contains(err.Error(), "model.u2") {
			t.Errorf("%s: a checkpoint with another model.u2: got %v, want a refusal naming it", c.Name, err)
		}
		if err := r.Restore(ck); err != nil {
			t.Errorf("%s: a restart with the written configuration is refused: %v", c.Name, err)
		} else {
			for _, x := range []*Experiment{e, r} {
				if _, _, err := x.Advance(); err != nil {
					t.Fatal(err)
				}
			}
			a, b := e.Model.Checkpoint(), r.Model.Checkpoint()
			if !reflect.DeepEqual(a.Q, b.Q) {
				t.Errorf("%s: the restarted run departs from the original", c.Name)
			}
		}
		e.Close()
		r.Close()
	}
}

// rangeProbes are values outside each documented range, by the phrase the
// range starts with; each must be refused with an error naming the key.
// lx and ly stand for the domain lengths of the configuration probed.
var rangeProbes = map[string][]string{
	"greater than 0":                {"0.0", "-1.0", "nan", "inf"},
	"0 or greater":                  {"-1.0", "nan", "inf"},
	"any finite number":             {"nan", "inf", "-inf"},
	"0 to lx":                       {"-1.0", "1.01lx", "nan"},
	"0 to ly":                       {"-1.0", "1.01ly", "nan"},
	"0 to 2":                        {"-0.5", "2.5", "nan"},
	"strictly between 0 and 1":      {"0.0", "1.0"},
	"a power of two from 8 to 8192": {"4", "12", "16384"},
	"an integer, 1 or more":         {"0", "-3"},
	"an integer from 1 to 8":        {"0", "9"},
}

// TestDocumentedRangesMatchValidators checks each key's documented range
// against the validators: for a number, values just outside the range
// (picked by the phrase the range starts with) are refused by Decode with
// a *qg.FieldError naming the key; for a string, the quoted choices of the
// documentation are exactly those the validator's message lists for a
// value that is no choice.
func TestDocumentedRangesMatchValidators(t *testing.T) {
	kinds := map[string]string{}
	typeKeys(reflect.TypeOf(Config{}), "", func(key, kind string) { kinds[key] = kind })
	bases := configVariants()
	quoted := regexp.MustCompile(`"([^"]*)"`)
	for _, d := range KeyDocs() {
		kind := kinds[d.Key]
		if kind == "table" || kind == "array" || kind == "bool" || d.Key == "name" {
			continue
		}
		var base Config
		for _, b := range bases {
			if b.Used(d.Key) {
				base = b
				break
			}
		}
		if base.Name == "" {
			t.Errorf("%s: no configuration uses it", d.Key)
			continue
		}
		refused := func(value string) *qg.FieldError {
			t.Helper()
			_, err := Decode(strings.NewReader(setKey(d.Key, value)), clonePatches(base))
			var fe *qg.FieldError
			if !errors.As(err, &fe) || normKey(fe.Field) != d.Key {
				t.Errorf("%s = %s over %s: got %v, want an error naming %s (documented range: %s)", d.Key, value, base.Name, err, d.Key, d.Allowed)
				return nil
			}
			return fe
		}
		if kind == "string" {
			fe := refused(`"not-a-choice"`)
			if fe == nil {
				continue
			}
			want := map[string]bool{}
			for _, m := range quoted.FindAllStringSubmatch(d.Allowed, -1) {
				want[m[1]] = true
			}
			got := map[string]bool{}
			for _, m := range quoted.FindAllStringSubmatch(fe.Why, -1) {
				got[m[1]] = true
			}
			if len(want) == 0 || !reflect.DeepEqual(got, want) {
				t.Errorf("%s: documented choices %v, the validator lists %v", d.Key, want, got)
			}
			continue
		}
		if d.Key == "wavemaker.seed" {
			// no validator bounds it; the TOML decoder refuses a larger
			// integer than the documented bound, and reads the bound
			if _, err := Decode(strings.NewReader(setKey(d.Key, "9223372036854775808")), base); err == nil {
				t.Errorf("%s: 2^63 accepted", d.Key)
			}
			if c, err := Decode(strings.NewReader(setKey(d.Key, "9223372036854775807")), base); err != nil || c.Wavemaker.Seed != math.MaxInt64 {
				t.Errorf("%s: 2^63 - 1 read as %d, %v", d.Key, c.Wavemaker.Seed, err)
			}
			continue
		}
		var phrase string
		for p := range rangeProbes {
			if strings.HasPrefix(d.Allowed, p) {
				phrase = p
			}
		}
		if phrase == "" {
			t.Errorf("%s: allowed %q starts with no phrase the test knows", d.Key, d.Allowed)
			continue
		}
		for _, v := range rangeProbes[phrase] {
			switch {
			case strings.HasSuffix(v, "lx"):
				v = tomltext.Float(1.01 * base.Model.Lx)
			case strings.HasSuffix(v, "ly"):
				v = tomltext.Float(1.01 * base.Model.Ly)
			}
			refused(v)
		}
	}
}

// setKey returns a TOML document that sets one key (an element key of the
// patches sets the first of a list of one patch).
func setKey(key, value string) string {
	if rest, ok := strings.CutPrefix(key, "wavemaker.mask.patches[]."); ok {
		p := map[string]string{"x": "7.5e6", "y": "8e6", "width_x": "1e6", "width_y": "7e5"}
		p[rest] = value
		return fmt.Sprintf("[[wavemaker.mask.patches]]\nx = %s\ny = %s\nwidth_x = %s\nwidth_y = %s\n", p["x"], p["y"], p["width_x"], p["width_y"])
	}
	i := strings.LastIndex(key, ".")
	if i < 0 {
		return key + " = " + value + "\n"
	}
	return fmt.Sprintf("[%s]\n%s = %s\n", key[:i], key[i+1:], value)
}

// TestUnitsUDUNITS checks that UDUNITS-2, Unidata's units library (Debian
// udunits-bin), reads every documented unit, and that the run keys' "days"
// are the 86400 s the code converts them with.
func TestUnitsUDUNITS(t *testing.T) {
	bin := testenv.Tool(t, "udunits2", "Debian package udunits-bin")
	units := map[string]bool{}
	for _, d := range KeyDocs() {
		if d.Key == "model.scale_selective.viscosity" {
			for p := 1; p <= 8; p++ {
				c := Default()
				c.Model.ScaleSelective = qg.ScaleSelective{Kind: qg.Hyperviscosity, Viscosity: 1, Order: p}
				u := fmt.Sprintf("m%d s-1", 2*p)
				if !strings.Contains(c.Documented(), "Unit: "+u+".") {
					t.Errorf("order %d: the hyperviscosity's unit is not printed as %s", p, u)
				}
				units[u] = true
			}
			continue
		}
		if d.Unit != "" {
			units[d.Unit] = true
		}
	}
	for u := range units {
		out, err := exec.Command(bin, "-H", u, "-W", "").CombinedOutput()
		if err != nil || strings.Contains(string(out), "recognize") {
			t.Errorf("UDUNITS-2 does not read the unit %q: %v %s", u, err, out)
		}
	}
	out, err := exec.Command(bin, "-H", "days", "-W", "s").CombinedOutput()
	if err != nil || !strings.Contains(string(out), "1 days = 86400 s") {
		t.Errorf("UDUNITS-2 converts days to s as %q (%v), want 86400 s", out, err)
	}
}
