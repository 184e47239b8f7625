package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/experiment"
)

// outDir is a run's output directory, written as a whole: the files go
// into a staging directory beside it (DIR.partial), which replaces DIR
// only when every file is complete, so a reader never finds the files of
// two runs side by side, and a failed run leaves the old outputs as they
// were.
type outDir struct {
	final, stage string
	committed    bool
}

// stageOutDir checks, before any work, that dir can be written: it is not
// a file, and its parent takes new directories (shown by making the
// staging directory there). An existing dir must be writable too, since
// it will be replaced.
func stageOutDir(dir string) (*outDir, error) {
	dir = filepath.Clean(dir)
	if st, err := os.Stat(dir); err == nil {
		if !st.IsDir() {
			return nil, fmt.Errorf("%s exists and is not a directory", dir)
		}
		if err := probe(dir); err != nil {
			return nil, fmt.Errorf("%s is not writable: %w", dir, err)
		}
	} else if !errors.Is(err, os.ErrNotExist) {
		return nil, err
	}
	parent := filepath.Dir(dir)
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, fmt.Errorf("cannot create %s: %w", parent, err)
	}
	stage := dir + ".partial"
	if err := os.RemoveAll(stage); err != nil {
		return nil, fmt.Errorf("cannot clear the staging directory %s: %w", stage, err)
	}
	if err := os.Mkdir(stage, 0o755); err != nil {
		return nil, fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	if err := probe(stage); err != nil {
		os.RemoveAll(stage)
		return nil, fmt.Errorf("cannot write in %s: %w", parent, err)
	}
	return &outDir{final: dir, stage: stage}, nil
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

// commit replaces the final directory by the staging one: the old
// directory is moved aside, the new one renamed into place, and the old
// one removed; if the second rename fails the old one is put back.
func (o *outDir) commit() error {
	if err := syncDir(o.stage); err != nil {
		return err
	}
	old := ""
	if _, err := os.Stat(o.final); err == nil {
		old = o.final + ".old"
		if err := os.RemoveAll(old); err != nil {
			return err
		}
		if err := os.Rename(o.final, old); err != nil {
			return fmt.Errorf("moving the previous outputs aside: %w", err)
		}
	}
	if err := os.Rename(o.stage, o.final); err != nil {
		if old != "" {
			os.Rename(old, o.final)
		}
		return fmt.Errorf("moving the outputs into place: %w", err)
	}
	o.committed = true
	syncDir(filepath.Dir(o.final))
	if old != "" {
		return os.RemoveAll(old)
	}
	return nil
}

// discard removes the staging directory of a run that did not commit.
func (o *outDir) discard() {
	if !o.committed {
		os.RemoveAll(o.stage)
	}
}

func syncDir(dir string) error {
	d, err := os.Open(dir)
	if err != nil {
		return err
	}
	defer d.Close()
	return d.Sync()
}

// writeOutputs writes the run's summary, time series and configuration as
// JSON files in dir (a staging directory: see outDir).
func writeOutputs(dir string, e *experiment.Experiment) error {
	for _, f := range []struct {
		name string
		v    any
	}{
		{"summary.json", e.Summary()},
		{"series.json", e.Diag.Series()},
		{"config.json", e.Config},
	} {
		b, err := json.MarshalIndent(f.v, "", "  ")
		if err != nil {
			return fmt.Errorf("%s: %w", f.name, err)
		}
		if err := writeSynced(filepath.Join(dir, f.name), append(b, '\n')); err != nil {
			return err
		}
	}
	return nil
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
