package output

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/qg"
)

// Options says where a run writes and how it reports.
type Options struct {
	// Dir is the output directory ("" for none). It is replaced as a whole
	// when the run ends; until then the files grow in StagingDir(Dir).
	Dir string
	// Checkpoint is the restart file kept up to date at every progress
	// report and when the run is stopped ("" for none, unless Resume).
	Checkpoint string
	// Restart continues the run from this restart file ("" to start at
	// day 0). The snapshots already in the staging directory up to the
	// restart's time are kept.
	Restart string
	// Resume, with Dir set, keeps the checkpoint in the staging directory
	// (CheckpointIn(Dir), unless Checkpoint is set) and continues from it
	// if an interrupted run left one there; otherwise the run starts at
	// day 0. Sweeps run their members this way.
	Resume bool
	// Plot writes the figures beside the other files.
	Plot bool
	// Report, if not nil, is called at every progress report, after the
	// checkpoint is written.
	Report func(experiment.Progress)
	// OnStep, if not nil, is called after every step (for a progress bar).
	OnStep func(*experiment.Experiment)
}

// StagingDir is where the files of a run writing to dir grow until the run
// ends: dir + ".partial".
func StagingDir(dir string) string { return filepath.Clean(dir) + ".partial" }

// CheckpointIn is the checkpoint a resumable run writing to dir keeps in its
// staging directory.
func CheckpointIn(dir string) string { return filepath.Join(StagingDir(dir), "restart.ckpt") }

// Finished reports whether dir holds the complete outputs of a run (the
// files are moved there only when all are written).
func Finished(dir string) bool {
	st, err := os.Stat(filepath.Join(dir, "summary.json"))
	return err == nil && st.Mode().IsRegular()
}

// A Run is an experiment with its outputs, ready to execute.
type Run struct {
	e       *experiment.Experiment
	opt     Options
	ckpt    string         // checkpoint path, "" for none
	stage   string         // staging directory, "" without Dir
	resumed *qg.Checkpoint // the restart, nil for a fresh run
	snaps   *snapshots     // nil without Dir or snapshots
	done    bool           // outputs committed
}

// Prepare builds the experiment and checks, before any step, everything the
// run will need: the configuration and the initial state (experiment.New),
// the restart file and its match with the configuration, that the
// checkpoint path and the output directory can be written. It stages the
// output directory (keeping the files of an interrupted run when it
// restarts) and opens the snapshot file.
func Prepare(c experiment.Config, o Options) (_ *Run, err error) {
	e, err := experiment.New(c)
	if err != nil {
		return nil, err
	}
	r := &Run{e: e, opt: o, ckpt: o.Checkpoint}
	defer func() {
		if err != nil {
			r.Close()
		}
	}()
	if o.Resume {
		if o.Dir == "" {
			return nil, errors.New("output: Resume needs an output directory")
		}
		if r.ckpt == "" {
			r.ckpt = CheckpointIn(o.Dir)
		}
	}
	restart := o.Restart
	if restart == "" && o.Resume {
		if _, err := os.Stat(r.ckpt); err == nil {
			restart = r.ckpt
		}
	}
	if restart != "" {
		ck, err := qg.LoadCheckpoint(restart)
		if err != nil {
			return nil, err
		}
		if err := e.Restore(ck); err != nil {
			return nil, fmt.Errorf("restart from %s: %w", restart, err)
		}
		// A resumed run killed after its last checkpoint, while writing its
		// files, only has them to write; an explicit restart at the end is
		// a mistake in the run's length.
		atEnd := e.Done()
		if ck.Time > c.Run.Days*86400 || atEnd && !(o.Resume && o.Restart == "") {
			return nil, fmt.Errorf("restart from %s: the checkpoint is at day %g, at or after the run's end (day %g); give a longer run", restart, ck.Time/86400, c.Run.Days)
		}
		r.resumed = ck
	}
	if o.Dir != "" {
		if r.stage, err = stage(o.Dir, r.resumed != nil); err != nil {
			return nil, fmt.Errorf("output directory: %w", err)
		}
	}
	if r.ckpt != "" {
		if err := qg.CheckWritable(r.ckpt); err != nil {
			return nil, fmt.Errorf("checkpoint: %w", err)
		}
	}
	if r.stage != "" && c.Run.SnapshotDays > 0 {
		if r.snaps, err = openSnapshots(filepath.Join(r.stage, SnapshotsFile), e); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// Experiment returns the run's experiment.
func (r *Run) Experiment() *experiment.Experiment { return r.e }

// Restarted returns the checkpoint the run continues from, or nil.
func (r *Run) Restarted() *qg.Checkpoint { return r.resumed }

// CheckpointPath returns the restart file the run keeps, or "".
func (r *Run) CheckpointPath() string { return r.ckpt }

// Execute integrates the experiment to its end: at every progress report it
// writes the checkpoint and calls Options.Report; it appends a snapshot
// every run.snapshot_days; at the end it writes every output file and
// moves the staging directory over the output directory. When ctx is
// cancelled it finishes the current step, writes the checkpoint and returns
// ctx's error, leaving the staging directory for a restart. A failed step
// returns the model's *qg.StepError; the last checkpoint stays as it was.
func (r *Run) Execute(ctx context.Context) error {
	e := r.e
	for !e.Done() {
		if err := ctx.Err(); err != nil {
			if r.ckpt != "" {
				if serr := r.SaveCheckpoint(); serr != nil {
					return errors.Join(err, serr)
				}
			}
			return err
		}
		p, due, err := e.Advance()
		if err != nil {
			return err
		}
		if r.opt.OnStep != nil {
			r.opt.OnStep(e)
		}
		if r.snaps != nil && r.snaps.due(e) {
			if err := r.snaps.append(e); err != nil {
				return err
			}
		}
		if due {
			if r.ckpt != "" {
				if err := r.SaveCheckpoint(); err != nil {
					return err
				}
			}
			if r.opt.Report != nil {
				r.opt.Report(p)
			}
		}
	}
	if r.stage == "" {
		return nil
	}
	if r.snaps != nil {
		if err := r.snaps.close(); err != nil {
			return err
		}
		r.snaps = nil
	}
	werr := writeAll(r.stage, e, r.opt.Plot)
	var ferr *FiguresError
	if werr != nil && !errors.As(werr, &ferr) {
		return fmt.Errorf("output directory %s: %w", r.opt.Dir, werr)
	}
	if err := commit(r.stage, r.opt.Dir); err != nil {
		return fmt.Errorf("output directory %s: %w", r.opt.Dir, err)
	}
	r.done = true
	if werr != nil {
		return fmt.Errorf("output directory %s: %w", r.opt.Dir, werr)
	}
	return nil
}

// SaveCheckpoint writes the run's restart file now.
func (r *Run) SaveCheckpoint() error {
	if r.ckpt == "" {
		return errors.New("output: the run keeps no checkpoint")
	}
	if r.snaps != nil {
		if err := r.snaps.sync(); err != nil {
			return err
		}
	}
	ck, err := r.e.Checkpoint()
	if err != nil {
		return err
	}
	return qg.SaveCheckpoint(r.ckpt, ck)
}

// Close releases the experiment and the snapshot file. A run that did not
// finish keeps its staging directory only if it keeps a checkpoint there
// or was restarted (so that it can be resumed); otherwise the staging
// directory is removed.
func (r *Run) Close() {
	if r.snaps != nil {
		r.snaps.close()
		r.snaps = nil
	}
	if r.stage != "" && !r.done && !r.resumable() {
		os.RemoveAll(r.stage)
	}
	r.e.Close()
}

// resumable reports whether an unfinished run can be continued from its
// staging directory: a checkpoint exists that a restart would read.
func (r *Run) resumable() bool {
	if r.ckpt == "" {
		return false
	}
	_, err := os.Stat(r.ckpt)
	return err == nil
}
