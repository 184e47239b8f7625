package output

import (
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/experiment"
)

// The files a run writes into its output directory.
const (
	SummaryFile   = "summary.json" // the one-number answers
	SeriesFile    = "series.json"  // energies, budget rates and block index per sample
	ConfigFile    = "config.toml"  // the resolved configuration, readable by -config
	MeansFile     = "means.nc"     // time means and eddy statistics on (layer, y, x)
	SnapshotsFile = "snapshots.nc" // ψ and q every run.snapshot_days
	SeriesNCFile  = "series.nc"    // the series of series.json
	FiguresDir    = "figures"      // the figures, with Options.Plot
	checkpointExt = ".ckpt"        // restart files in the staging directory
)

// stage prepares the staging directory of dir before any work: dir must not
// be a file, an existing dir must be writable (it will be replaced), and
// the parent must take a new directory. A restarting run keeps the staging
// directory an interrupted run left (its snapshots continue); otherwise it
// starts empty.
func stage(dir string, keep bool) (string, error) {
	dir = filepath.Clean(dir)
	if st, err := os.Stat(dir); err == nil {
		if !st.IsDir() {
			return "", fmt.Errorf("%s exists and is not a directory", dir)
		}
		if err := probe(dir); err != nil {
			return "", fmt.Errorf("%s is not writable: %w", dir, err)
		}
	} else if !errors.Is(err, os.ErrNotExist) {
		return "", err
	}
	parent := filepath.Dir(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return "", fmt.Errorf("cannot create %s: %w", parent, err)
	}
	s := StagingDir(dir)
	if st, err := os.Stat(s); keep && err == nil && st.IsDir() {
		if err := probe(s); err != nil {
			return "", fmt.Errorf("cannot write in %s: %w", s, err)
		}
		return s, nil
	}
	if err := os.RemoveAll(s); err != nil {
		return "", fmt.Errorf("cannot clear the staging directory %s: %w", s, err)
	}
	if err := os.Mkdir(s, 0o755); err != nil {
		return "", fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	if err := probe(s); err != nil {
		os.RemoveAll(s)
		return "", fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	return s, nil
}

// probe creates and removes a file in dir.
func probe(dir string) error {
	f, err := os.CreateTemp(dir, ".probe*")
	if err != nil {
		return err
	}
	name := f.Name()
	f.Close()
	return os.Remove(name)
}

// commit replaces dir by the staging directory s as a whole: restart files
// are removed from s, the old dir is moved aside, s renamed into place and
// the old one removed; if the rename fails the old one is put back.
func commit(s, dir string) error {
	ents, err := os.ReadDir(s)
	if err != nil {
		return err
	}
	for _, e := range ents {
		if filepath.Ext(e.Name()) == checkpointExt {
			if err := os.Remove(filepath.Join(s, e.Name())); err != nil {
				return err
			}
		}
	}
	if err := syncDir(s); err != nil {
		return err
	}
	old := ""
	if _, err := os.Stat(dir); err == nil {
		old = filepath.Clean(dir) + ".old"
		if err := os.RemoveAll(old); err != nil {
			return err
		}
		if err := os.Rename(dir, old); err != nil {
			return fmt.Errorf("moving the previous outputs aside: %w", err)
		}
	}
	if err := os.Rename(s, dir); err != nil {
		if old != "" {
			os.Rename(old, dir)
		}
		return fmt.Errorf("moving the outputs into place: %w", err)
	}
	syncDir(filepath.Dir(filepath.Clean(dir)))
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

func syncDir(dir string) error {
	d, err := os.Open(dir)
	if err != nil {
		return err
	}
	defer d.Close()
	return d.Sync()
}

// writeAll writes every output file of a finished run into dir.
func writeAll(dir string, e *experiment.Experiment, plot bool) error {
	if err := writeJSON(filepath.Join(dir, SummaryFile), e.Summary()); err != nil {
		return err
	}
	if err := writeJSON(filepath.Join(dir, SeriesFile), e.Diag.Series()); err != nil {
		return err
	}
	if err := writeSynced(filepath.Join(dir, ConfigFile), []byte(e.Config.Documented())); err != nil {
		return err
	}
	if err := WriteMeans(filepath.Join(dir, MeansFile), e); err != nil {
		return err
	}
	if err := WriteSeries(filepath.Join(dir, SeriesNCFile), e); err != nil {
		return err
	}
	if plot {
		figs := filepath.Join(dir, FiguresDir)
		if err := Plot(dir, figs); err != nil {
			// the data files stand without the figures, which can be
			// drawn again from them
			os.RemoveAll(figs)
			return &FiguresError{err}
		}
	}
	return nil
}

// FiguresError reports figures that could not be drawn; the run's other
// files were written.
type FiguresError struct{ Err error }

func (e *FiguresError) Error() string {
	return fmt.Sprintf("the figures could not be drawn (the other files were written; eddyblock plot DIR draws them again): %v", e.Err)
}

func (e *FiguresError) Unwrap() error { return e.Err }

func writeJSON(path string, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return fmt.Errorf("%s: %w", filepath.Base(path), err)
	}
	return writeSynced(path, append(b, '\n'))
}

// writeSynced writes a file and flushes it to disk.
func writeSynced(path string, b []byte) error {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_TRUNC, 0o644)
	if err != nil {
		return err
	}
	_, err = f.Write(b)
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	return err
}
