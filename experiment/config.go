package experiment

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/eddyblock/eddyblock/internal/check"
	"github.com/eddyblock/eddyblock/qg"
	"github.com/eddyblock/eddyblock/qg/block"
	"github.com/eddyblock/eddyblock/qg/diag"
	"github.com/eddyblock/eddyblock/wavemaker"
)

// Config is a whole experiment.
type Config struct {
	// Name labels the experiment in reports and output files.
	Name      string           `toml:"name" json:"name"`
	Model     qg.Config        `toml:"model" json:"model"`
	Block     BlockConfig      `toml:"block" json:"block"`
	Wavemaker wavemaker.Config `toml:"wavemaker" json:"wavemaker"`
	Run       RunConfig        `toml:"run" json:"run"`
	Diag      DiagConfig       `toml:"diagnostics" json:"diagnostics"`
}

// DiagConfig chooses how the diagnostics define eddies and project on the
// block (see package qg/diag).
type DiagConfig struct {
	// Norm is the inner product of the projections: "layer", the plain
	// mass-weighted ψ inner product (the built-in experiments' choice), or
	// "energy", the two-layer energy inner product (what an empty value
	// selects).
	Norm diag.Norm `toml:"norm" json:"norm"`
	// Transient, in the fixed mode, takes the eddies as departures from
	// their own time mean instead of the whole eddy state.
	Transient bool `toml:"transient" json:"transient"`
}

// BlockConfig is the prescribed block; Shape "none" runs without one.
type BlockConfig = block.Config

// RunConfig sets the length of a run and what it records.
type RunConfig struct {
	// Days is the length of the run, days of model time.
	Days float64 `toml:"days" json:"days"`
	// SpinUpDays is the time before the diagnostics start averaging, days.
	SpinUpDays float64 `toml:"spin_up_days" json:"spin_up_days"`
	// ReportDays is the interval between progress reports, days.
	ReportDays float64 `toml:"report_days" json:"report_days"`
	// SampleSteps is the number of time steps between diagnostic samples.
	SampleSteps int `toml:"sample_steps" json:"sample_steps"`
	// SnapshotDays is the interval between the snapshots of ψ and q a run
	// writes to its output directory, days (rounded to whole steps); 0
	// writes none.
	SnapshotDays float64 `toml:"snapshot_days" json:"snapshot_days"`
}

// SnapshotSteps returns the number of steps between snapshots, 0 for none.
func (r RunConfig) SnapshotSteps(dt float64) int {
	if r.SnapshotDays <= 0 {
		return 0
	}
	return max(1, int(math.Round(r.SnapshotDays*86400/dt)))
}

// Validate checks every part of the configuration and returns the first
// problem, as a *qg.FieldError naming the key where there is one.
func (c *Config) Validate() error {
	if err := prefix("model.", c.Model.CheckTimeStep()); err != nil {
		return err
	}
	if err := c.Block.Validate(c.Model); err != nil {
		return err
	}
	if err := c.Wavemaker.ValidateFor(c.Model); err != nil {
		return err
	}
	r := c.Run
	for _, err := range []error{
		check.Positive("run.days", r.Days),
		check.NonNegative("run.spin_up_days", r.SpinUpDays),
		check.Positive("run.report_days", r.ReportDays),
		check.NonNegative("run.snapshot_days", r.SnapshotDays),
	} {
		if err != nil {
			return err
		}
	}
	if r.SpinUpDays >= r.Days {
		return &qg.FieldError{Field: "run.spin_up_days", Value: r.SpinUpDays, Why: fmt.Sprintf("must be shorter than run.days = %g", r.Days)}
	}
	switch c.Diag.Norm {
	case "", diag.EnergyNorm, diag.LayerNorm:
	default:
		return &qg.FieldError{Field: "diagnostics.norm", Value: string(c.Diag.Norm), Why: `must be "energy" or "layer"`}
	}
	if r.SampleSteps < 1 {
		return &qg.FieldError{Field: "run.sample_steps", Value: r.SampleSteps, Why: "must be at least 1"}
	}
	return nil
}

// prefix puts p before the key of a *qg.FieldError that lacks it.
func prefix(p string, err error) error {
	var fe *qg.FieldError
	if errors.As(err, &fe) && !strings.HasPrefix(fe.Field, p) {
		return &qg.FieldError{Field: p + fe.Field, Value: fe.Value, Why: fe.Why}
	}
	return err
}

// Decode reads a TOML configuration on top of base (keys it does not set
// keep base's values) and validates the result. A key the configuration
// does not know is an error naming it.
func Decode(r io.Reader, base Config) (Config, error) {
	return DecodeWith(r, base, nil)
}

// DecodeWith is Decode for a configuration file that a driver extends with
// tables of its own beside the experiment's: the keys a Config has are
// decoded on top of base, and the document is decoded a second time into
// extra (a pointer to a struct of the driver's tables, holding their
// defaults), so that a key neither knows is an error naming it. extra may
// be nil. Only the experiment's part is validated here; extra's is the
// driver's to check.
func DecodeWith(r io.Reader, base Config, extra any) (Config, error) {
	doc, err := io.ReadAll(r)
	if err != nil {
		return Config{}, fmt.Errorf("config: %w", err)
	}
	c := base
	// An array of tables replaces the base's array as a whole: decoding
	// into the base's own slice would change the caller's base and let a
	// patch inherit the keys it leaves out.
	c.Wavemaker.Mask.Patches = append([]wavemaker.PatchConfig(nil), base.Wavemaker.Mask.Patches...)
	var tree map[string]any
	if _, err := toml.Decode(string(doc), &tree); err == nil {
		if w, ok := tree["wavemaker"].(map[string]any); ok {
			if m, ok := w["mask"].(map[string]any); ok {
				if _, ok := m["patches"]; ok {
					c.Wavemaker.Mask.Patches = nil
				}
			}
		}
	}
	md, err := toml.NewDecoder(bytes.NewReader(doc)).Decode(&c)
	if err != nil {
		return Config{}, fmt.Errorf("config: %w", err)
	}
	unknown := md.Undecoded()
	if extra != nil && len(unknown) > 0 {
		emd, err := toml.NewDecoder(bytes.NewReader(doc)).Decode(extra)
		if err != nil {
			return Config{}, fmt.Errorf("config: %w", err)
		}
		known := make(map[string]bool)
		for _, k := range emd.Keys() {
			if emd.IsDefined(k...) {
				known[k.String()] = true
			}
		}
		for _, k := range emd.Undecoded() {
			delete(known, k.String())
		}
		kept := unknown[:0]
		for _, k := range unknown {
			if !known[k.String()] {
				kept = append(kept, k)
			}
		}
		unknown = kept
	}
	if len(unknown) > 0 {
		keys := make([]string, len(unknown))
		for i, k := range unknown {
			keys[i] = k.String()
		}
		return Config{}, fmt.Errorf("config: unknown key %s", strings.Join(keys, ", "))
	}
	if err := c.Validate(); err != nil {
		return Config{}, err
	}
	return c, nil
}

// Load reads a TOML configuration file on top of the default experiment.
func Load(path string) (Config, error) {
	f, err := os.Open(path)
	if err != nil {
		return Config{}, fmt.Errorf("config: %w", err)
	}
	defer f.Close()
	c, err := Decode(f, Default())
	if err != nil {
		return Config{}, fmt.Errorf("%s: %w", path, err)
	}
	return c, nil
}

// TOML returns the configuration as a TOML document.
func (c Config) TOML() string {
	var b bytes.Buffer
	if err := toml.NewEncoder(&b).Encode(c); err != nil {
		panic(err) // a Config has no types TOML cannot encode
	}
	return b.String()
}
