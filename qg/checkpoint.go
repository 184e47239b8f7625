package qg

import (
	"bufio"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// checkpointMagic starts every checkpoint; the digit is the format version.
const checkpointMagic = "eddyblock-checkpoint-1\n"

// Checkpoint is the restartable part of a model's state. Extra carries the
// state of anything else a run needs to continue bit for bit (for example
// the random generator of a stochastic source), keyed by the owner's name.
type Checkpoint struct {
	Nx, Ny int
	Lx, Ly float64
	Time   float64
	Steps  int
	Q      [2][]complex128
	// Ledger is the energy booked by each term since the start of the
	// run, so that the books of a restarted run continue too.
	Ledger Ledger
	Extra  map[string][]byte
}

// Checkpoint returns a copy of the model's restartable state.
func (m *Model) Checkpoint() *Checkpoint {
	return &Checkpoint{
		Nx: m.g.Nx, Ny: m.g.Ny, Lx: m.g.Lx, Ly: m.g.Ly,
		Time: m.t, Steps: m.steps, Ledger: m.ledger,
		Q:     [2][]complex128{append([]complex128(nil), m.q[0]...), append([]complex128(nil), m.q[1]...)},
		Extra: map[string][]byte{},
	}
}

// Restore sets the model's state and energy books from a checkpoint made on
// the same grid. The AB3 history restarts with RK4 steps.
func (m *Model) Restore(c *Checkpoint) error {
	if c.Nx != m.g.Nx || c.Ny != m.g.Ny {
		return fmt.Errorf("qg: checkpoint grid %d×%d does not match the model's %d×%d", c.Nx, c.Ny, m.g.Nx, m.g.Ny)
	}
	if c.Lx != m.g.Lx || c.Ly != m.g.Ly {
		return fmt.Errorf("qg: checkpoint domain %g×%g m does not match the model's %g×%g m", c.Lx, c.Ly, m.g.Lx, m.g.Ly)
	}
	if err := m.SetSpectralPV(c.Q); err != nil {
		return fmt.Errorf("qg: checkpoint: %w", err)
	}
	m.t, m.steps, m.ledger = c.Time, c.Steps, c.Ledger
	return nil
}

// WriteTo writes the checkpoint in the project's own format: a text magic
// line followed by a gob encoding.
func (c *Checkpoint) WriteTo(w io.Writer) (int64, error) {
	cw := &countWriter{w: w}
	if _, err := io.WriteString(cw, checkpointMagic); err != nil {
		return cw.n, err
	}
	err := gob.NewEncoder(cw).Encode(c)
	return cw.n, err
}

// ReadCheckpoint reads a checkpoint written by WriteTo.
func ReadCheckpoint(r io.Reader) (*Checkpoint, error) {
	br := bufio.NewReader(r)
	line, err := br.ReadString('\n')
	if err != nil || line != checkpointMagic {
		return nil, errors.New("qg: not an eddyblock checkpoint (bad header)")
	}
	c := new(Checkpoint)
	if err := gob.NewDecoder(br).Decode(c); err != nil {
		return nil, fmt.Errorf("qg: checkpoint: %w", err)
	}
	ns := c.Ny * (c.Nx/2 + 1)
	if len(c.Q[0]) != ns || len(c.Q[1]) != ns {
		return nil, fmt.Errorf("qg: checkpoint: PV has %d and %d coefficients, a %d×%d grid needs %d", len(c.Q[0]), len(c.Q[1]), c.Nx, c.Ny, ns)
	}
	return c, nil
}

// SaveCheckpoint writes c to path atomically: it writes a temporary file in
// the same directory, syncs it and renames it over path, so an existing
// checkpoint is replaced only by a complete new one.
func SaveCheckpoint(path string, c *Checkpoint) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return fmt.Errorf("qg: checkpoint: %w", err)
	}
	tmp := f.Name()
	bw := bufio.NewWriter(f)
	_, err = c.WriteTo(bw)
	if err == nil {
		err = bw.Flush()
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
		return fmt.Errorf("qg: checkpoint %s: %w", path, err)
	}
	return nil
}

// LoadCheckpoint reads a checkpoint file.
func LoadCheckpoint(path string) (*Checkpoint, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("qg: checkpoint: %w", err)
	}
	defer f.Close()
	return ReadCheckpoint(bufio.NewReader(f))
}

type countWriter struct {
	w io.Writer
	n int64
}

func (c *countWriter) Write(p []byte) (int, error) {
	n, err := c.w.Write(p)
	c.n += int64(n)
	return n, err
}
