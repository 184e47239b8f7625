package output

import (
	"fmt"
	"math"
	"os"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/netcdf"
	"github.com/eddyblock/eddyblock/qg"
)

// snapshots appends ψ and q of both layers to snapshots.nc every
// run.snapshot_days, committing each record as it is written, so that a
// run killed at any instant leaves a file readable up to its last record.
type snapshots struct {
	w     *netcdf.Writer
	every int // steps between snapshots
	buf   []float64
}

// openSnapshots creates the snapshot file, or, when the run restarts from a
// checkpoint and the file of the interrupted run is there, reopens it and
// drops the records after the restart's time (the run writes them again,
// to the same bytes). A run starting at day 0 writes the initial state as
// its first record.
func openSnapshots(path string, e *experiment.Experiment) (*snapshots, error) {
	m := e.Model
	g := m.Grid()
	s := &snapshots{every: e.Config.Run.SnapshotSteps(e.Config.Model.Dt), buf: make([]float64, 2*g.Points())}
	if m.Steps() > 0 {
		if _, err := os.Stat(path); err == nil {
			w, err := netcdf.Append(path)
			if err != nil {
				return nil, fmt.Errorf("snapshots of the interrupted run: %w", err)
			}
			keep := m.Steps()/s.every + 1 // records at steps 0, every, 2·every, … ≤ the restart's step
			if keep > w.NumRecs() {
				w.Close()
				return nil, fmt.Errorf("snapshots of the interrupted run: %s holds %d records, the restart at step %d needs %d", path, w.NumRecs(), m.Steps(), keep)
			}
			if err := w.TruncateRecords(keep); err != nil {
				w.Close()
				return nil, err
			}
			s.w = w
			return s, nil
		}
	}
	h := netcdf.Header{
		Format: netcdf.Offset64,
		Dims:   gridDims(g, true),
		Attrs:  globalAttrs(e.Config, "snapshots of an eddyblock experiment"),
		Vars: append(append([]netcdf.Var{timeVar()}, coordVars()...),
			fieldVar("psi", netcdf.Float, true, true, "streamfunction (of the eddies in the fixed block mode)", "m2 s-1", standardNames["psi"]),
			fieldVar("q", netcdf.Float, true, true, "PV anomaly (of the eddies in the fixed block mode)", "s-1", ""),
		),
	}
	w, err := netcdf.Create(path, h)
	if err != nil {
		return nil, err
	}
	s.w = w
	if err := writeCoords(w, g); err != nil {
		w.Close()
		return nil, err
	}
	if m.Steps() == 0 {
		if err := s.append(e); err != nil {
			w.Close()
			return nil, err
		}
	} else if m.Steps()%s.every == 0 {
		// a restart without the interrupted run's file: start with the
		// restart's state
		if err := s.append(e); err != nil {
			w.Close()
			return nil, err
		}
	}
	return s, nil
}

// due reports whether the model's last step is a snapshot step.
func (s *snapshots) due(e *experiment.Experiment) bool { return e.Model.Steps()%s.every == 0 }

// append writes the current state as a new record and commits it.
func (s *snapshots) append(e *experiment.Experiment) error {
	m := e.Model
	rec := s.w.NumRecs()
	if err := s.w.WriteRecordFloat64("time", rec, []float64{m.Time() / 86400}); err != nil {
		return err
	}
	np := m.Grid().Points()
	for _, f := range []struct {
		name string
		q    qg.Quantity
	}{{"psi", qg.Psi}, {"q", qg.PV}} {
		for n := range 2 {
			if _, err := m.Field(s.buf[n*np:(n+1)*np], f.q, n); err != nil {
				return err
			}
		}
		for _, v := range s.buf {
			if math.Abs(v) > math.MaxFloat32 {
				return fmt.Errorf("snapshot at day %g: %s = %g does not fit a float", m.Time()/86400, f.name, v)
			}
		}
		if err := s.w.WriteRecordFloat64(f.name, rec, s.buf); err != nil {
			return err
		}
	}
	return s.w.CommitRecord()
}

// sync flushes the file to disk (before a checkpoint refers to it).
func (s *snapshots) sync() error { return s.w.Sync() }

func (s *snapshots) close() error { return s.w.Close() }
