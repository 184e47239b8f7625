package qg

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/eddyblock/eddyblock/internal/settings"
)

// checkpointMagic starts every checkpoint; the digit is the format version.
const (
	checkpointMagic  = "eddyblock-checkpoint-2\n"
	checkpointPrefix = "eddyblock-checkpoint-"
)

// Checkpoint is the restartable part of a model's state: everything a
// restarted model needs to continue bit for bit, and the settings of the
// run that wrote it, so that a restart with other settings is refused.
type Checkpoint struct {
	Nx, Ny int
	Lx, Ly float64
	Time   float64 // model time, s
	Steps  int     // steps taken
	Q      [2][]complex128
	// History holds the AB3 scheme's last tendencies (newest first) and
	// HistoryRates their energy rates, so that an AB3 run continues with
	// the same steps it would have taken; empty when the history restarts.
	History      [][2][]complex128
	HistoryRates [][NumTerms]float64
	// Ledger is the energy booked by each term since the start of the
	// run, so that the books of a restarted run continue too.
	Ledger Ledger
	// Config is the model's configuration, flattened to its keys ("dt",
	// "sponge.rate", …); Restore refuses a checkpoint whose configuration
	// differs from the model's in any key but "workers".
	Config map[string]string
	// Settings is for whoever drives the model (an experiment, say): the
	// rest of what determines the trajectory (forcing, block, seeds),
	// flattened the same way. The model does not read it.
	Settings map[string]string
	// Extra carries the state of anything else a run needs to continue
	// bit for bit (a stochastic source's random generator, diagnostics'
	// running means), keyed by the owner's name.
	Extra map[string][]byte
}

// ConfigMismatch reports settings of a checkpoint that differ from those of
// the model or the run that should continue from it.
type ConfigMismatch struct {
	Changes []settings.Change
}

func (e *ConfigMismatch) Error() string {
	keys := make([]string, len(e.Changes))
	for i, c := range e.Changes {
		keys[i] = c.Key
	}
	return fmt.Sprintf("the checkpoint was written with other settings (%s; only the run's length may change):\n%s",
		strings.Join(keys, ", "), settings.Describe(e.Changes))
}

// configSettings flattens a model configuration for a checkpoint.
func configSettings(c Config) map[string]string {
	m, err := settings.Flatten(c, "")
	if err != nil {
		panic(err) // a Config has no types TOML cannot encode
	}
	delete(m, "workers") // results are bit-identical for any number
	return m
}

// Checkpoint returns a copy of the model's restartable state.
func (m *Model) Checkpoint() *Checkpoint {
	c := &Checkpoint{
		Nx: m.g.Nx, Ny: m.g.Ny, Lx: m.g.Lx, Ly: m.g.Ly,
		Time: m.t, Steps: m.steps, Ledger: m.ledger,
		Q:      [2][]complex128{clone(m.q[0]), clone(m.q[1])},
		Config: configSettings(m.cfg),
		Extra:  map[string][]byte{},
	}
	if m.cfg.Scheme == AB3 {
		for i := range m.nhist {
			c.History = append(c.History, [2][]complex128{clone(m.hist[i][0]), clone(m.hist[i][1])})
			c.HistoryRates = append(c.HistoryRates, m.histRates[i])
		}
	}
	return c
}

func clone(s []complex128) []complex128 { return append([]complex128(nil), s...) }

// Restore sets the model's state, the AB3 scheme's history and the energy
// books from a checkpoint written by a model of the same configuration
// (the number of workers may differ). A checkpoint of another
// configuration is refused with a *ConfigMismatch naming the keys.
func (m *Model) Restore(c *Checkpoint) error {
	if c.Nx != m.g.Nx || c.Ny != m.g.Ny {
		return fmt.Errorf("qg: checkpoint grid %d×%d does not match the model's %d×%d", c.Nx, c.Ny, m.g.Nx, m.g.Ny)
	}
	if c.Lx != m.g.Lx || c.Ly != m.g.Ly {
		return fmt.Errorf("qg: checkpoint domain %g×%g m does not match the model's %g×%g m", c.Lx, c.Ly, m.g.Lx, m.g.Ly)
	}
	if d := settings.Diff(c.Config, configSettings(m.cfg)); len(d) > 0 {
		return &ConfigMismatch{d}
	}
	if len(c.History) != len(c.HistoryRates) || len(c.History) > len(m.hist) {
		return fmt.Errorf("qg: checkpoint: %d history tendencies with %d rates, want equal numbers, at most %d", len(c.History), len(c.HistoryRates), len(m.hist))
	}
	ns := len(m.g.k2)
	for i, h := range c.History {
		if len(h[0]) != ns || len(h[1]) != ns {
			return fmt.Errorf("qg: checkpoint: history tendency %d has %d and %d coefficients, the grid needs %d", i, len(h[0]), len(h[1]), ns)
		}
	}
	if err := m.SetSpectralPV(c.Q); err != nil {
		return fmt.Errorf("qg: checkpoint: %w", err)
	}
	for i, h := range c.History {
		copy(m.hist[i][0], h[0])
		copy(m.hist[i][1], h[1])
		m.histRates[i] = c.HistoryRates[i]
	}
	m.nhist = len(c.History)
	m.t, m.steps, m.ledger = c.Time, c.Steps, c.Ledger
	return nil
}

// WriteTo writes the checkpoint in the project's own format: a text line
// naming the format and its version, a gob encoding of the checkpoint, and
// the SHA-256 checksum of everything before it.
func (c *Checkpoint) WriteTo(w io.Writer) (int64, error) {
	var b bytes.Buffer
	b.WriteString(checkpointMagic)
	if err := gob.NewEncoder(&b).Encode(c); err != nil {
		return 0, fmt.Errorf("qg: checkpoint: %w", err)
	}
	sum := sha256.Sum256(b.Bytes())
	b.Write(sum[:])
	return b.WriteTo(w)
}

// ReadCheckpoint reads a checkpoint written by WriteTo, verifying its
// checksum before decoding it.
func ReadCheckpoint(r io.Reader) (*Checkpoint, error) {
	c, err := readCheckpoint(r)
	if err != nil {
		return nil, fmt.Errorf("qg: checkpoint: %w", err)
	}
	return c, nil
}

func readCheckpoint(r io.Reader) (*Checkpoint, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	if !bytes.HasPrefix(data, []byte(checkpointMagic)) {
		if bytes.HasPrefix(data, []byte(checkpointPrefix)) {
			line, _, _ := bytes.Cut(data, []byte("\n"))
			return nil, fmt.Errorf("checkpoint format %q, this program reads %q", line, strings.TrimSpace(checkpointMagic))
		}
		return nil, errors.New("not an eddyblock checkpoint (it does not start with " + strings.TrimSpace(checkpointMagic) + ")")
	}
	if len(data) < len(checkpointMagic)+sha256.Size {
		return nil, fmt.Errorf("truncated checkpoint (%d bytes)", len(data))
	}
	body, tail := data[:len(data)-sha256.Size], data[len(data)-sha256.Size:]
	if sum := sha256.Sum256(body); !bytes.Equal(sum[:], tail) {
		return nil, errors.New("checksum mismatch: the checkpoint is damaged or truncated")
	}
	c := new(Checkpoint)
	if err := gob.NewDecoder(bytes.NewReader(body[len(checkpointMagic):])).Decode(c); err != nil {
		return nil, fmt.Errorf("decoding: %w", err)
	}
	ns := c.Ny * (c.Nx/2 + 1)
	if c.Nx < 1 || c.Ny < 1 || len(c.Q[0]) != ns || len(c.Q[1]) != ns {
		return nil, fmt.Errorf("PV has %d and %d coefficients, a %d×%d grid needs %d", len(c.Q[0]), len(c.Q[1]), c.Nx, c.Ny, ns)
	}
	return c, nil
}

// SaveCheckpoint writes c to path atomically: it writes a temporary file in
// the same directory, syncs it and renames it over path, so an existing
// checkpoint is replaced only by a complete new one. The file is readable
// by all (mode 0644), like the run's other outputs.
func SaveCheckpoint(path string, c *Checkpoint) error {
	err := func() error {
		dir := filepath.Dir(path)
		f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
		if err != nil {
			return err
		}
		tmp := f.Name()
		bw := bufio.NewWriter(f)
		_, err = c.WriteTo(bw)
		if err == nil {
			err = bw.Flush()
		}
		if err == nil {
			err = f.Chmod(0o644)
		}
		if err == nil {
			err = f.Sync()
		}
		if cerr := f.Close(); err == nil {
			err = cerr
		}
		if err == nil {
			err = os.Rename(tmp, path)
		}
		if err != nil {
			os.Remove(tmp)
		}
		return err
	}()
	if err != nil {
		return fmt.Errorf("qg: checkpoint %s: %w", path, err)
	}
	return nil
}

// CheckWritable reports whether a checkpoint can be saved at path: its
// directory exists and takes new files, and path is not a directory. It
// creates and removes a temporary file, and leaves any existing checkpoint
// as it is; a run calls it before its first step.
func CheckWritable(path string) error {
	if st, err := os.Stat(path); err == nil && st.IsDir() {
		return fmt.Errorf("qg: checkpoint %s: is a directory", path)
	}
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".probe*")
	if err != nil {
		return fmt.Errorf("qg: checkpoint %s: cannot write there: %w", path, err)
	}
	name := f.Name()
	f.Close()
	os.Remove(name)
	return nil
}

// LoadCheckpoint reads a checkpoint file. Every error names the file.
func LoadCheckpoint(path string) (*Checkpoint, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, fmt.Errorf("qg: checkpoint: %w", err)
	}
	if st.IsDir() {
		return nil, fmt.Errorf("qg: checkpoint %s: is a directory", path)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("qg: checkpoint: %w", err)
	}
	defer f.Close()
	c, err := readCheckpoint(f)
	if err != nil {
		return nil, fmt.Errorf("qg: checkpoint %s: %w", path, err)
	}
	return c, nil
}
