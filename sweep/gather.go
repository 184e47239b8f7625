package sweep

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/eddyblock/eddyblock/output"
	"github.com/eddyblock/eddyblock/qg/diag"
)

// Column describes a column of a gathered table.
type Column struct {
	Name     string // the CSV header and the NetCDF variable's name; units in the name
	Units    string // UDUNITS string; "1" for a number without units
	LongName string
}

// answer is a one-number answer read from a member's summary.
type answer struct {
	Column
	get func(*diag.Summary) float64
}

// answers are the one-number answers a gathered table holds, from each
// member's summary.json (see package qg/diag's Summary).
var answers = []answer{
	{Column{"eddy_per_day", "day-1", "projection on the block of the streamfunction tendency of the eddy PV flux convergence (> 0 reinforces)"},
		func(s *diag.Summary) float64 { return s.Eddy.Rate }},
	{Column{"eddy_vorticity_per_day", "day-1", "projection on the block of the eddy relative-vorticity flux part"},
		func(s *diag.Summary) float64 { return s.EddyVorticity.Rate }},
	{Column{"eddy_interface_per_day", "day-1", "projection on the block of the eddy interface (heat) flux part"},
		func(s *diag.Summary) float64 { return s.EddyInterface.Rate }},
	{Column{"eddy_interface_baroclinic_per_day", "day-1", "projection of the eddy interface flux part on the block's baroclinic (thermal) part"},
		func(s *diag.Summary) float64 { return s.EddyInterface.Baroclinic }},
	{Column{"eddy_correlation", "1", "pattern correlation of the eddy streamfunction tendency with the block"},
		func(s *diag.Summary) float64 { return s.Eddy.Correlation }},
	{Column{"eddy_vorticity_correlation", "1", "pattern correlation of the eddy vorticity-flux part with the block"},
		func(s *diag.Summary) float64 { return s.EddyVorticity.Correlation }},
	{Column{"eddy_drift_east_km_per_day", "km day-1", "eastward drift of the block implied by the eddy forcing"},
		func(s *diag.Summary) float64 { return s.Eddy.DriftEast }},
	{Column{"eddy_drift_north_km_per_day", "km day-1", "northward drift of the block implied by the eddy forcing"},
		func(s *diag.Summary) float64 { return s.Eddy.DriftNorth }},
	{Column{"mean_flow_per_day", "day-1", "projection on the block of the mean-flow terms"},
		func(s *diag.Summary) float64 { return s.MeanFlow.Rate }},
	{Column{"dissipation_per_day", "day-1", "projection on the block of drag, scale-selective dissipation and sponge"},
		func(s *diag.Summary) float64 { return s.Dissipation.Rate }},
	{Column{"eddy_to_dissipation", "1", "eddy projection over the magnitude of the dissipation's"},
		func(s *diag.Summary) float64 { return s.EddyToDissipation }},
	{Column{"block_index_mean", "1", "mean of the block index (projection of the flow on the block)"},
		func(s *diag.Summary) float64 { return s.Index.Mean }},
	{Column{"block_index_std", "1", "standard deviation of the block index"},
		func(s *diag.Summary) float64 { return s.Index.Std }},
	{Column{"block_index_decorrelation_days", "day", "e-folding time of the block index's autocorrelation"},
		func(s *diag.Summary) float64 { return s.Index.Decorrelation }},
	{Column{"eke_upper_m2_per_s2", "m2 s-2", "domain-mean eddy kinetic energy, upper layer"},
		func(s *diag.Summary) float64 { return s.EKE[0] }},
	{Column{"eke_lower_m2_per_s2", "m2 s-2", "domain-mean eddy kinetic energy, lower layer"},
		func(s *diag.Summary) float64 { return s.EKE[1] }},
	{Column{"heat_flux_K_m_per_s", "K m s-1", "domain-mean eddy heat flux"},
		func(s *diag.Summary) float64 { return s.HeatFluxK }},
	{Column{"ke_m2_per_s2", "m2 s-2", "mean kinetic energy"},
		func(s *diag.Summary) float64 { return s.Energy.KE }},
	{Column{"ape_m2_per_s2", "m2 s-2", "mean available potential energy"},
		func(s *diag.Summary) float64 { return s.Energy.APE }},
	{Column{"injection_m2_per_s3", "m2 s-3", "mean energy injection rate of the wave source"},
		func(s *diag.Summary) float64 { return s.Energy.Rates["injection"] }},
	{Column{"energy_closure_error", "1", "relative closure error of the energy budget"},
		func(s *diag.Summary) float64 { return s.Energy.ClosureError }},
}

// Answers returns the columns of one-number answers a gathered table holds.
func Answers() []Column {
	c := make([]Column, len(answers))
	for i, a := range answers {
		c[i] = a.Column
	}
	return c
}

// The states of a member in a gathered table.
const (
	StateDone        = "done"        // its outputs are complete
	StateFailed      = "failed"      // its last run failed (Row.Note says why)
	StateRunning     = "running"     // a process is running it now
	StateInterrupted = "interrupted" // stopped with a checkpoint; running the sweep again resumes it
	StateNotRun      = "not run"     // never started
)

// Table is a sweep's members with their parameters and one-number answers.
type Table struct {
	Name    string   // the sweep's name
	Keys    []string // the varied configuration keys: the parameter columns
	Answers []Column
	Rows    []Row
	// Source is the text of the sweep file (the directory's copy).
	Source string
}

// Row is one member of a gathered table.
type Row struct {
	Index  int
	Name   string
	Seed   uint64
	State  string // StateDone, StateFailed, …
	Note   string // for a member not done: why, or how far it got
	Params []any  // the values of Table.Keys: int64, float64, string, bool or []any
	Values []float64
}

// Done reports whether the member's answers are in the row.
func (r Row) Done() bool { return r.State == StateDone }

// Gather reads a sweep directory: the members from its record and the
// answers of every finished member from its summary.json. Members not
// finished are rows without answers (NaN), with their state; none is left
// out.
func Gather(dir string) (*Table, error) {
	rec, err := readRecord(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("gather: %s holds no sweep (no %s)", dir, RecordFile)
	}
	if err != nil {
		return nil, fmt.Errorf("gather: %w", err)
	}
	src, _ := os.ReadFile(filepath.Join(dir, CopyFile))
	t := &Table{Name: rec.Name, Keys: rec.Keys, Answers: Answers(), Source: string(src)}
	for _, m := range rec.Members {
		row := Row{Index: m.Index, Name: m.Name, Seed: m.Seed, Values: make([]float64, len(answers))}
		for _, v := range m.Values {
			row.Params = append(row.Params, ParseValue(v))
		}
		for i := range row.Values {
			row.Values[i] = math.NaN()
		}
		mdir := filepath.Join(dir, m.Name)
		if output.Finished(mdir) {
			s, err := readSummary(filepath.Join(mdir, output.SummaryFile))
			if err != nil {
				return nil, fmt.Errorf("gather: member %d (%s): %w", m.Index, m.Name, err)
			}
			for i, a := range answers {
				row.Values[i] = a.get(s)
			}
			row.State = StateDone
		} else {
			row.State, row.Note = unfinished(dir, m.Name)
		}
		t.Rows = append(t.Rows, row)
	}
	return t, nil
}

func readSummary(path string) (*diag.Summary, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var s diag.Summary
	if err := json.Unmarshal(b, &s); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return &s, nil
}

// unfinished tells what became of a member without outputs.
func unfinished(dir, name string) (state, note string) {
	if b, err := os.ReadFile(filepath.Join(dir, name+failedExt)); err == nil {
		return StateFailed, strings.TrimSpace(string(b))
	}
	if unlock, ok, err := lockMember(dir, name); err == nil {
		if !ok {
			return StateRunning, ""
		}
		unlock()
	}
	if _, err := os.Stat(output.CheckpointIn(filepath.Join(dir, name))); err == nil {
		return StateInterrupted, "resumes from its checkpoint when the sweep runs again"
	}
	return StateNotRun, ""
}

// Missing returns the rows of members that are not done.
func (t *Table) Missing() []Row {
	var m []Row
	for _, r := range t.Rows {
		if !r.Done() {
			m = append(m, r)
		}
	}
	return m
}

// Column returns the index of an answer column by name, or −1.
func (t *Table) answer(name string) int {
	for i, a := range t.Answers {
		if a.Name == name {
			return i
		}
	}
	return -1
}

// param returns the index of a parameter column by key, or −1.
func (t *Table) param(key string) int {
	for i, k := range t.Keys {
		if k == key {
			return i
		}
	}
	return -1
}

// WriteCSV writes the table as CSV (RFC 4180): a header, then one line per
// member: member (index), name, state, seed, the parameters under their
// keys, the answers under their names (units in the names). Numbers are
// written in their shortest exact form; a member not done has empty
// answer cells.
func (t *Table) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	head := []string{"member", "name", "state", "seed"}
	head = append(head, t.Keys...)
	for _, a := range t.Answers {
		head = append(head, a.Name)
	}
	if err := cw.Write(head); err != nil {
		return err
	}
	for _, r := range t.Rows {
		rec := []string{strconv.Itoa(r.Index), r.Name, r.State, strconv.FormatUint(r.Seed, 10)}
		for _, p := range r.Params {
			rec = append(rec, plain(p))
		}
		for _, v := range r.Values {
			if math.IsNaN(v) && !r.Done() {
				rec = append(rec, "")
				continue
			}
			rec = append(rec, strconv.FormatFloat(v, 'g', -1, 64))
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// plain writes a parameter value for a table cell.
func plain(v any) string {
	switch x := v.(type) {
	case string:
		return x
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	return literal(v)
}

// Number returns a parameter value as a number, if it is one.
func Number(v any) (float64, bool) {
	switch x := v.(type) {
	case float64:
		return x, true
	case int64:
		return float64(x), true
	}
	return 0, false
}
