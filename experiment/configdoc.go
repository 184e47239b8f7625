package experiment

import (
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/eddyblock/eddyblock/internal/tomltext"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// KeyDoc documents one key, or one table, of a configuration file.
type KeyDoc struct {
	// Key is the dotted key as a file writes it ("model.dt",
	// "model.sponge"). The keys of each element of an array of tables
	// carry "[]" after the array's name ("wavemaker.mask.patches[].x").
	Key string
	// Meaning says what the key sets.
	Meaning string
	// Unit is the unit in UDUNITS-2 syntax ("m s-1", "days", and "1" for a
	// number without dimension); empty for tables, strings and booleans.
	// The hyperviscosity's unit depends on its order; Documented prints
	// the unit of the configuration's order.
	Unit string
	// Allowed is the range or the choices that the validators accept
	// (Config.Validate and what it calls); empty for tables.
	Allowed string
}

// caution is the one sentence on what the model is not for.
const caution = "An idealised research model, not a weather forecast: do not use it for any decision about safety."

// KeyDocs returns the documentation of every table and key of a
// configuration file, in the order Documented prints them.
func KeyDocs() []KeyDoc {
	return []KeyDoc{
		{Key: "name", Meaning: "Name of the experiment, printed in reports and written in the output files", Allowed: "any text"},

		{Key: "model", Meaning: "The two-layer quasi-geostrophic model: grid, domain, physics, dissipation and time stepping"},
		{"model.nx", "Grid points in x (west to east)", "1", "a power of two from 8 to 8192"},
		{"model.ny", "Grid points in y (south to north)", "1", "a power of two from 8 to 8192"},
		{"model.lx", "Length of the doubly periodic domain in x", "m", "greater than 0"},
		{"model.ly", "Length of the doubly periodic domain in y", "m", "greater than 0"},
		{"model.f0", "Coriolis parameter f0", "s-1", "greater than 0"},
		{"model.beta", "Meridional gradient of the Coriolis parameter, beta", "m-1 s-1", "0 or greater"},
		{"model.ld", "Deformation radius Ld of the two-layer model", "m", "greater than 0"},
		{"model.delta", "Ratio of the layer depths, upper over lower, H1/H2", "1", "greater than 0"},
		{"model.u1", "Imposed uniform zonal flow of the upper layer (positive eastward)", "m s-1", "any finite number"},
		{"model.u2", "Imposed uniform zonal flow of the lower layer (positive eastward)", "m s-1", "any finite number"},
		{"model.drag", "Linear Ekman drag rate on the lower layer", "s-1", "0 or greater (0: no drag)"},
		{"model.dt", "Time step", "s",
			"greater than 0, and stable with the scheme for the imposed flow, the fastest linear wave and a hyperviscosity"},
		{"model.scheme", "Time-stepping scheme", "",
			`"rk4" (classical fourth-order Runge-Kutta) or "ab3" (third-order Adams-Bashforth)`},
		{"model.max_cfl", "Largest CFL number allowed: a run that exceeds it stops with an error", "1", "greater than 0"},
		{"model.workers", "Goroutines used inside a time step (the results are the same for any number)", "1", "an integer, 1 or more"},

		{Key: "model.scale_selective", Meaning: "Scale-selective dissipation of the smallest resolved scales"},
		{"model.scale_selective.kind", "Kind of scale-selective dissipation", "",
			`"none", "filter" (an exponential cutoff filter, exact per step) or "hyperviscosity" (-viscosity (-Laplacian)^order q)`},
		{"model.scale_selective.filter_time", "E-folding time of the filter at the largest retained wavenumber", "s", "greater than 0"},
		{"model.scale_selective.filter_cutoff", "Wavenumber where the filter starts, as a fraction of the largest retained wavenumber",
			"1", "strictly between 0 and 1"},
		{"model.scale_selective.filter_order", "Power of the filter's damping-rate profile above the cutoff", "1", "greater than 0"},
		{"model.scale_selective.viscosity", "Hyperviscosity coefficient", "m(2 order) s-1",
			"greater than 0, and within the scheme's stability limit at dt (checked before the first step)"},
		{"model.scale_selective.order", "Power of the Laplacian in the hyperviscosity (1: an ordinary viscosity)", "1", "an integer from 1 to 8"},

		{Key: "model.sponge", Meaning: "Sponge: a band of Newtonian damping in x that absorbs eddies before they re-enter the periodic domain"},
		{"model.sponge.rate", "Peak damping rate, at the band's centre (a raised cosine falling to 0 at its edges)", "s-1",
			"0 or greater (0: no sponge)"},
		{"model.sponge.width", "Full width of the sponge band", "m", "greater than 0, at most lx"},
		{"model.sponge.x", "Centre of the sponge band, from the western edge", "m", "0 to lx"},

		{Key: "block", Meaning: "The prescribed block and how the model maintains it"},
		{"block.shape", "Shape of the block", "", `"none" (no block), "dipole" or "modon" (an empty value means "none")`},
		{"block.mode", "How the block is maintained", "",
			`"fixed" (a steady background under evolving eddies), "forced" (by a steady forcing), ` +
				`"relaxed" (by relaxation towards it) or "free" (not at all)`},
		{"block.relax_time", "Relaxation time of the relaxed mode", "s", "greater than 0"},
		{"block.linear", "Drop the eddy-eddy interaction: linear eddies on the fixed block", "", `true only with mode = "fixed", false otherwise`},

		{Key: "block.dipole", Meaning: "Dipole block: a Gaussian high poleward and a Gaussian low equatorward of the centre"},
		{"block.dipole.x", "Centre of the dipole, from the western edge", "m", "0 to lx"},
		{"block.dipole.y", "Centre of the dipole, from the southern edge", "m", "0 to ly"},
		{"block.dipole.radius", "Gaussian e-folding radius of each lobe", "m", "greater than 0, with 4 radius at most lx and at most ly"},
		{"block.dipole.separation", "Distance between the centres of the high and the low", "m",
			"greater than 0, with separation + 4 radius at most ly"},
		{"block.dipole.height", "Amplitude as the geopotential height of each lobe in the upper layer, Z = f0 psi / g", "m",
			"0 or greater; give height or psi, not both, and one of them greater than 0"},
		{"block.dipole.psi", "Amplitude as the streamfunction of each lobe in the upper layer", "m2 s-1",
			"0 or greater; give height or psi, not both, and one of them greater than 0"},
		{"block.dipole.baroclinic", "Vertical structure: the lower layer's psi is (1 - baroclinic) times the upper layer's", "1",
			"0 to 2 (0: barotropic, 1: upper layer only, 2: purely baroclinic)"},

		{Key: "block.modon", Meaning: "Modon block: the barotropic beta-plane modon (Stern 1975; Larichev and Reznik 1976), outer decay rate sqrt(beta/speed)"},
		{"block.modon.x", "Centre of the modon, from the western edge", "m", "0 to lx"},
		{"block.modon.y", "Centre of the modon, from the southern edge", "m", "0 to ly"},
		{"block.modon.radius", "Radius of the circle that separates the inner and the outer solutions", "m",
			"greater than 0, with the diameter at most half the shorter domain length"},
		{"block.modon.speed", "Eastward speed c of the exact solution relative to the fluid", "m s-1",
			"greater than 0, with the outer field down to 5 % of its value at the radius at half the shorter domain length"},
		{"block.modon.polarity", "Which way round the modon is", "",
			`"high_poleward" (a block; hold it with the forced mode) or "low_poleward" (the exact travelling solution); an empty value means "high_poleward"`},
		{"block.modon.height", "Peak geopotential height of the high in the upper layer (0: the exact solution's amplitude)", "m",
			"0 or greater, not together with psi"},
		{"block.modon.psi", "Peak streamfunction of the high (0: see height)", "m2 s-1", "0 or greater, not together with height"},
		{"block.modon.baroclinic", "Vertical structure: the lower layer's psi is (1 - baroclinic) times the upper layer's", "1",
			"0 to 2 (only 0 gives an exact solution of the two-layer model)"},

		{Key: "wavemaker", Meaning: "The wave source: a PV forcing upstream of the block that feeds it eddies"},
		{"wavemaker.kind", "What the wave source does", "",
			`"white" (white noise), "red" (red noise, an Ornstein-Uhlenbeck process), "wavetrain" (a deterministic wave train) or "none"`},
		{"wavemaker.correlation_time", "Correlation time of the red noise", "s", "greater than 0"},
		{"wavemaker.vertical", "Vertical structure of the forcing", "",
			`"upper", "lower", "barotropic" (equal PV in both layers) or "baroclinic" (no depth-integrated flow)`},
		{"wavemaker.injection_rate", "Target energy injection rate of the noise, per unit mass, domain mean", "m2 s-3", "greater than 0"},
		{"wavemaker.seed", "Seed of the noise's random numbers (the same seed draws the same forcing)", "1",
			"an integer from 0 to 9223372036854775807 (the largest a TOML file can hold)"},

		{Key: "wavemaker.mask", Meaning: "Where the wave source acts"},
		{"wavemaker.mask.kind", "Shape of the region", "",
			`"none" (the whole domain), "patch" (one Gaussian patch) or "patches" (a sum of Gaussian patches, listed below)`},
		{"wavemaker.mask.x", "Centre of the patch, from the western edge", "m", "0 to lx"},
		{"wavemaker.mask.y", "Centre of the patch, from the southern edge", "m", "0 to ly"},
		{"wavemaker.mask.width_x", "E-folding half-width of the patch in x", "m", "greater than 0, at most lx/4"},
		{"wavemaker.mask.width_y", "E-folding half-width of the patch in y", "m", "greater than 0, at most ly/4"},
		{Key: "wavemaker.mask.patches", Meaning: "One Gaussian patch of the mask; one such table per patch", Allowed: "at least one patch"},
		{"wavemaker.mask.patches[].x", "Centre of this patch, from the western edge", "m", "0 to lx"},
		{"wavemaker.mask.patches[].y", "Centre of this patch, from the southern edge", "m", "0 to ly"},
		{"wavemaker.mask.patches[].width_x", "E-folding half-width of this patch in x", "m", "greater than 0, at most lx/4"},
		{"wavemaker.mask.patches[].width_y", "E-folding half-width of this patch in y", "m", "greater than 0, at most ly/4"},

		{Key: "wavemaker.band", Meaning: "Wavenumber band of the noise, as a range of wavelengths (the mean is never forced)"},
		{"wavemaker.band.kind", "How a mode's wavelength is measured", "",
			`"total" (2 pi / total wavenumber) or "zonal" (2 pi / zonal wavenumber, any meridional one)`},
		{"wavemaker.band.min_wavelength", "Shortest wavelength forced", "m", "greater than 0; the band must hold a mode the grid retains"},
		{"wavemaker.band.max_wavelength", "Longest wavelength forced", "m", "greater than 0, at least min_wavelength"},

		{Key: "wavemaker.train", Meaning: "Deterministic wave train: a PV tendency A m(x, y) cos(k x + l y - omega t), k = 2 pi / wavelength_x, l = 2 pi / wavelength_y"},
		{"wavemaker.train.wavelength_x", "Zonal wavelength, signed (0: zero zonal wavenumber)", "m",
			"any finite number, resolved by the grid, not 0 with wavelength_y; without a mask, lx/wavelength_x whole"},
		{"wavemaker.train.wavelength_y", "Meridional wavelength, signed (0: zero meridional wavenumber)", "m",
			"any finite number, resolved by the grid, not 0 with wavelength_x; without a mask, ly/wavelength_y whole"},
		{"wavemaker.train.frequency", "Angular frequency omega (with a positive wavelength_x, omega > 0 moves the phase lines east)", "rad s-1",
			"any finite number"},
		{"wavemaker.train.amplitude", "Peak PV tendency A, at the mask's peak", "s-2", "greater than 0"},

		{Key: "run", Meaning: "Length of the run and what it records"},
		{"run.days", "Length of the run, model time", "days", "greater than 0"},
		{"run.spin_up_days", "Time before the diagnostics start averaging", "days", "0 or greater, shorter than days"},
		{"run.report_days", "Interval between progress reports (and checkpoints)", "days", "greater than 0"},
		{"run.sample_steps", "Time steps between diagnostic samples", "1", "an integer, 1 or more"},
		{"run.snapshot_days", "Interval between the snapshots of psi and q in the output directory (rounded to whole steps)", "days",
			"0 or greater (0: no snapshots)"},

		{Key: "diagnostics", Meaning: "How the diagnostics define eddies and project them on the block"},
		{"diagnostics.norm", "Inner product of the projections on the block", "",
			`"layer" (the plain mass-weighted psi inner product) or "energy" (the two-layer energy inner product); an empty value means "energy"`},
		{"diagnostics.transient", "In the fixed mode, take the eddies as departures from their own time mean instead of the whole eddy state", "",
			"true or false"},
	}
}

// KeyDocFor returns the documentation of one key or table. Indexed keys
// ("wavemaker.mask.patches[1].x") find their array's entry
// ("wavemaker.mask.patches[].x").
func KeyDocFor(key string) (KeyDoc, bool) {
	key = normKey(key)
	for _, d := range KeyDocs() {
		if d.Key == key {
			return d, true
		}
	}
	return KeyDoc{}, false
}

// normKey writes an array index as "[]" and a flattened array's length
// ("wavemaker.mask.patches.len", see internal/settings) as the array.
func normKey(key string) string {
	var b strings.Builder
	for i := 0; i < len(key); i++ {
		b.WriteByte(key[i])
		if key[i] != '[' {
			continue
		}
		j := i + 1
		for j < len(key) && key[j] >= '0' && key[j] <= '9' {
			j++
		}
		if j < len(key) && key[j] == ']' {
			i = j - 1
		}
	}
	s := b.String()
	if t, ok := strings.CutSuffix(s, ".len"); ok && t == "wavemaker.mask.patches" {
		return t
	}
	return s
}

// Used reports whether the configuration's choices read the key (a table
// or a key, as KeyDocFor takes it; an unknown key is not used). A key is
// used when its table is and its own rule allows:
//
//   - block: everything but shape only with a block (shape not "none" or
//     empty); dipole only for shape "dipole", modon only for "modon";
//     relax_time only in mode "relaxed", linear only in mode "fixed" (in
//     the other modes it must be false);
//   - wavemaker: everything but kind only when kind is not "none"; band,
//     injection_rate and seed only for the noises ("white", "red"),
//     correlation_time only for "red", train only for "wavetrain"; the
//     mask's x, y, width_x and width_y only for mask kind "patch", its
//     patches only for "patches";
//   - model.scale_selective: filter_time, filter_cutoff and filter_order
//     only for kind "filter", viscosity and order only for
//     "hyperviscosity";
//   - model.sponge: width and x only when rate is not 0.
//
// Every other key is used whatever the choices; diagnostics.transient, which
// changes the numbers only in the fixed mode, is kept because the summary
// and the checkpoint record it.
func (c Config) Used(key string) bool {
	key = normKey(key)
	if _, ok := KeyDocFor(key); !ok {
		return false
	}
	// the key and each table above it must be used
	for i := 0; i <= len(key); i++ {
		if i < len(key) && key[i] != '.' {
			continue
		}
		if !c.usedHere(strings.TrimSuffix(key[:i], "[]")) {
			return false
		}
	}
	return true
}

// usedHere is the rule of one key, its tables aside.
func (c Config) usedHere(key string) bool {
	b, w, m := c.Block, c.Wavemaker, c.Model
	noise := w.Kind == wavemaker.White || w.Kind == wavemaker.Red
	switch key {
	case "block.mode":
		return b.Enabled()
	case "block.relax_time":
		return b.Enabled() && b.Mode == qg.Relaxed
	case "block.linear":
		return b.Enabled() && b.Mode == qg.Fixed
	case "block.dipole":
		return b.Shape == block.DipoleShape
	case "block.modon":
		return b.Shape == block.ModonShape
	case "wavemaker.mask", "wavemaker.vertical":
		return w.Kind != wavemaker.Off
	case "wavemaker.band", "wavemaker.injection_rate", "wavemaker.seed":
		return noise
	case "wavemaker.correlation_time":
		return w.Kind == wavemaker.Red
	case "wavemaker.train":
		return w.Kind == wavemaker.WaveTrain
	case "wavemaker.mask.x", "wavemaker.mask.y", "wavemaker.mask.width_x", "wavemaker.mask.width_y":
		return w.Mask.Kind == wavemaker.Patch
	case "wavemaker.mask.patches":
		return w.Mask.Kind == wavemaker.Patches
	case "model.scale_selective.filter_time", "model.scale_selective.filter_cutoff", "model.scale_selective.filter_order":
		return m.ScaleSelective.Kind == qg.CutoffFilter
	case "model.scale_selective.viscosity", "model.scale_selective.order":
		return m.ScaleSelective.Kind == qg.Hyperviscosity
	case "model.sponge.width", "model.sponge.x":
		return m.Sponge.Rate != 0
	}
	return true
}

// Canonical returns c with every key its choices do not use (see Used) set
// to the built-in default's value: the configuration that c's Documented
// TOML reads back to over Default, as Load reads a file.
func (c Config) Canonical() Config {
	d := Default()
	canonical(c, reflect.ValueOf(&d).Elem(), reflect.ValueOf(c), "")
	return d
}

// canonical copies the used keys of src (the configuration c, or a table
// of it under prefix) into dst.
func canonical(c Config, dst, src reflect.Value, prefix string) {
	t := src.Type()
	for i := range t.NumField() {
		tag := tomlTag(t.Field(i))
		if tag == "" {
			continue
		}
		key := prefix + tag
		d, s := dst.Field(i), src.Field(i)
		switch {
		case s.Kind() == reflect.Struct:
			canonical(c, d, s, key+".")
		case !c.Used(key):
		case s.Kind() == reflect.Slice:
			if s.Len() > 0 {
				d.Set(reflect.AppendSlice(reflect.MakeSlice(s.Type(), 0, s.Len()), s))
			}
		default:
			d.Set(s)
		}
	}
}

// tomlTag returns the key a struct field has in a TOML file, "" for none.
func tomlTag(f reflect.StructField) string {
	tag, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
	if tag == "-" || !f.IsExported() {
		return ""
	}
	return tag
}

// commentWidth is the width, in characters, that a comment line of
// Documented keeps within where it can.
const commentWidth = 100

// Documented returns the configuration as a TOML document in which every
// key has a comment giving its meaning, its unit and its allowed range,
// with a short header. It holds only the tables and keys that c's choices
// use (see Used); a file that leaves a key out keeps the built-in default,
// so the document reads back (Decode over Default, as Load reads a file)
// to c.Canonical(). Floats are written exactly, in the fewest digits that
// read back to the same value.
func (c Config) Documented() string {
	var b strings.Builder
	fmt.Fprintf(&b, "# eddyblock configuration of the experiment %s.\n", tomltext.String(c.Name))
	b.WriteString("# Every key is optional in a file: a missing key keeps the built-in default.\n")
	b.WriteString("# Tables and keys that the choices below do not use are left out.\n")
	b.WriteString("# " + caution + "\n\n")
	docs := map[string]KeyDoc{}
	for _, d := range KeyDocs() {
		docs[d.Key] = d
	}
	w := docWriter{c: c, b: &b, docs: docs}
	w.table(reflect.ValueOf(c), "", "")
	return b.String()
}

// docWriter writes the tables of a Documented configuration.
type docWriter struct {
	c    Config
	b    *strings.Builder
	docs map[string]KeyDoc
}

// table writes the used keys of the table v (whose keys are prefix + tag),
// then its used tables and arrays of tables. docPrefix is prefix as the
// documentation writes it ("[]" after an array's name).
func (w docWriter) table(v reflect.Value, prefix, docPrefix string) {
	t := v.Type()
	type sub struct {
		key, docKey string
		v           reflect.Value
	}
	var subs []sub
	for i := range t.NumField() {
		tag := tomlTag(t.Field(i))
		if tag == "" {
			continue
		}
		key, dk, f := prefix+tag, docPrefix+tag, v.Field(i)
		if !w.c.Used(dk) {
			continue
		}
		if f.Kind() == reflect.Struct || f.Kind() == reflect.Slice {
			subs = append(subs, sub{key, dk, f})
			continue
		}
		w.comment(dk, w.docs[dk], true)
		fmt.Fprintf(w.b, "%s = %s\n", tag, tomlValue(f))
	}
	for _, s := range subs {
		if s.v.Kind() == reflect.Struct {
			w.b.WriteString("\n")
			w.comment(s.docKey, w.docs[s.docKey], false)
			fmt.Fprintf(w.b, "[%s]\n", s.key)
			w.table(s.v, s.key+".", s.docKey+".")
			continue
		}
		for j := range s.v.Len() {
			w.b.WriteString("\n")
			if j == 0 {
				w.comment(s.docKey, w.docs[s.docKey], true)
			}
			fmt.Fprintf(w.b, "[[%s]]\n", s.key)
			w.table(s.v.Index(j), s.key+".", s.docKey+"[].")
		}
	}
}

// comment writes the comment above a key (with its unit and range when
// full) or a table.
func (w docWriter) comment(key string, d KeyDoc, full bool) {
	if d.Meaning == "" {
		return // a key without documentation (a test fails for it)
	}
	meaning := d.Meaning + "."
	var extra []string
	if full {
		unit := d.Unit
		if key == "model.scale_selective.viscosity" {
			if p := w.c.Model.ScaleSelective.Order; p >= 1 && p <= 8 {
				unit = fmt.Sprintf("m%d s-1", 2*p)
			}
		}
		if unit != "" {
			// a unit is not broken across lines
			extra = append(extra, "Unit:"+nbsp+strings.ReplaceAll(unit, " ", nbsp)+".")
		}
		if d.Allowed != "" {
			extra = append(extra, "Allowed: "+d.Allowed+".")
		}
	}
	for _, l := range wrap(strings.Join(append([]string{meaning}, extra...), " "), commentWidth-2) {
		w.b.WriteString("# " + strings.ReplaceAll(l, nbsp, " ") + "\n")
	}
}

// nbsp stands for a space at which wrap does not break a line (a control
// character that no documentation text holds).
const nbsp = "\x1f"

// wrap breaks s into lines of at most width characters at spaces (a
// longer word stands on a line of its own).
func wrap(s string, width int) []string {
	var lines []string
	var cur string
	for _, word := range strings.Fields(s) {
		switch {
		case cur == "":
			cur = word
		case utf8.RuneCountInString(cur)+1+utf8.RuneCountInString(word) <= width:
			cur += " " + word
		default:
			lines = append(lines, cur)
			cur = word
		}
	}
	if cur != "" {
		lines = append(lines, cur)
	}
	return lines
}

// tomlValue writes a scalar of a Config as TOML.
func tomlValue(v reflect.Value) string {
	switch v.Kind() {
	case reflect.String:
		return tomltext.String(v.String())
	case reflect.Bool:
		return strconv.FormatBool(v.Bool())
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return strconv.FormatInt(v.Int(), 10)
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return strconv.FormatUint(v.Uint(), 10)
	case reflect.Float32, reflect.Float64:
		return tomltext.Float(v.Float())
	}
	panic(fmt.Sprintf("experiment: no TOML form for a configuration value of kind %s", v.Kind()))
}
