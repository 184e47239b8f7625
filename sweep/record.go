package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/eddyblock/eddyblock/internal/settings"
)

// The files a sweep keeps at the top of its directory, beside one directory
// per member.
const (
	// RecordFile describes the sweep: its members (index, name, seed,
	// values), the hash of the sweep file and the hash of what the
	// members are made of, key by key.
	RecordFile = "sweep.json"
	// CopyFile is a copy of the sweep file the directory was made from
	// (for a sweep built in Go, or by the one-key form, its TOML form).
	CopyFile = "sweep.toml"
	// locksDir holds one lock file per member, held while it runs.
	locksDir = ".locks"
	// failedExt marks a member whose last run failed: <name>.failed
	// holds the error.
	failedExt = ".failed"

	recordFormat = "eddyblock sweep 1"
	tmpPrefix    = ".sweep-tmp-"
)

// record is the content of RecordFile.
type record struct {
	Format       string            `json:"format"`
	Name         string            `json:"name"`
	FileSHA256   string            `json:"sweep_file_sha256"`
	PlanSHA256   string            `json:"plan_sha256"`
	Seed         uint64            `json:"seed"`
	DerivedSeeds bool              `json:"derived_seeds"`
	Keys         []string          `json:"keys"`
	Members      []recordMember    `json:"members"`
	Identity     map[string]string `json:"identity"`
}

// recordMember is one member in RecordFile; its values are written as in
// a configuration file, so that their types read back exactly.
type recordMember struct {
	Index  int      `json:"index"`
	Name   string   `json:"name"`
	Seed   uint64   `json:"seed"`
	Values []string `json:"values"`
}

// identity lists, key by key, what the plan's members are made of: the
// base configuration with the sweep's fixed keys (but for what may change
// between runs of the same sweep: the name and model.workers), each list
// of values and the sweep's seed. Two plans with the same identity have
// the same members.
func (p *Plan) identity() (map[string]string, error) {
	base, err := settings.Flatten(p.Base, "base.")
	if err != nil {
		return nil, err
	}
	id := map[string]string{}
	varied := map[string]bool{}
	for _, k := range p.Keys {
		varied[k] = true
	}
	for k, v := range base {
		key := strings.TrimPrefix(k, "base.")
		if key == "name" || key == "model.workers" || varied[key] || (p.DerivedSeeds && key == SeedKey) {
			continue
		}
		id[k] = v
	}
	if p.DerivedSeeds {
		id["seed"] = fmt.Sprint(p.Spec.Seed)
	} else {
		id["seed"] = "(wavemaker.seed set by the sweep)"
	}
	// the lists as given, conformed to their keys' types
	col := 0
	for _, l := range p.Spec.Vary {
		id["vary."+l.Key] = literal(p.lists[col])
		col++
	}
	for g, group := range p.Spec.Together {
		for _, l := range group {
			id[fmt.Sprintf("vary_together[%d].%s", g, l.Key)] = literal(p.lists[col])
			col++
		}
	}
	return id, nil
}

func hashIdentity(id map[string]string) string {
	keys := make([]string, 0, len(id))
	for k := range id {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	h := sha256.New()
	for _, k := range keys {
		fmt.Fprintf(h, "%s=%s\n", k, id[k])
	}
	return hex.EncodeToString(h.Sum(nil))
}

// newRecord describes the plan for its directory.
func (p *Plan) newRecord() (*record, error) {
	id, err := p.identity()
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256(p.Spec.Source())
	r := &record{
		Format: recordFormat, Name: p.Name,
		FileSHA256: hex.EncodeToString(sum[:]), PlanSHA256: hashIdentity(id),
		Seed: p.Spec.Seed, DerivedSeeds: p.DerivedSeeds,
		Keys: p.Keys, Identity: id,
	}
	for _, m := range p.Members {
		rm := recordMember{Index: m.Index, Name: m.Name, Seed: m.Seed}
		for _, v := range m.Values {
			rm.Values = append(rm.Values, literal(v))
		}
		r.Members = append(r.Members, rm)
	}
	return r, nil
}

// readRecord reads the record of a sweep directory.
func readRecord(dir string) (*record, error) {
	b, err := os.ReadFile(filepath.Join(dir, RecordFile))
	if err != nil {
		return nil, err
	}
	var r record
	if err := json.Unmarshal(b, &r); err != nil {
		return nil, fmt.Errorf("%s is damaged: %w", filepath.Join(dir, RecordFile), err)
	}
	if r.Format != recordFormat {
		return nil, fmt.Errorf("%s: format %q, want %q", filepath.Join(dir, RecordFile), r.Format, recordFormat)
	}
	for _, m := range r.Members {
		if len(m.Values) != len(r.Keys) || m.Name == "" || strings.ContainsAny(m.Name, `/\`) || m.Name == "." || m.Name == ".." {
			return nil, fmt.Errorf("%s is damaged: member %d", filepath.Join(dir, RecordFile), m.Index)
		}
	}
	return &r, nil
}

// DirError is a sweep directory that cannot take the sweep.
type DirError struct {
	Dir string
	Err error
}

func (e *DirError) Error() string { return fmt.Sprintf("sweep directory %s: %v", e.Dir, e.Err) }
func (e *DirError) Unwrap() error { return e.Err }

// ChangedError is a sweep directory made from a different sweep.
type ChangedError struct {
	Dir     string
	Changes []settings.Change
}

func (e *ChangedError) Error() string {
	return fmt.Sprintf("sweep directory %s was made by a different sweep; it is not reused (give a new directory, or run the recorded sweep, %s). What differs (recorded → now):\n%s",
		e.Dir, filepath.Join(e.Dir, CopyFile), settings.Describe(e.Changes))
}

// claimDir checks that dir can hold the sweep and records it there: dir
// must be a directory (it is created if missing) that can be written, and
// either holds the record of the same sweep or is empty (then the record
// is written). Concurrent processes (the tasks of a job array) may claim
// the same directory at once: the record is created atomically, and every
// process compares its own with the one that is there.
func claimDir(dir string, rec *record, source []byte) error {
	fail := func(err error) error { return &DirError{dir, err} }
	if st, err := os.Stat(dir); err == nil && !st.IsDir() {
		return fail(errors.New("exists and is not a directory"))
	} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return fail(err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fail(err)
	}
	b, err := json.MarshalIndent(rec, "", "  ")
	if err != nil {
		return fail(err)
	}
	for range 3 {
		old, err := readRecord(dir)
		if err == nil {
			if old.PlanSHA256 != rec.PlanSHA256 {
				return &ChangedError{dir, settings.Diff(old.Identity, rec.Identity)}
			}
			return ensureCopy(dir, source)
		}
		if !errors.Is(err, fs.ErrNotExist) {
			return fail(err)
		}
		ents, err := os.ReadDir(dir)
		if err != nil {
			return fail(err)
		}
		// Another process may have linked its record (and written the
		// copy) between the read above and this listing: then read again.
		raced, foreign := false, false
		for _, e := range ents {
			switch name := e.Name(); {
			case name == RecordFile:
				raced = true
			case !strings.HasPrefix(name, tmpPrefix):
				foreign = true
			}
		}
		if raced {
			continue
		}
		if foreign {
			return fail(fmt.Errorf("is not empty and holds no sweep (no %s): give a new or an empty directory", RecordFile))
		}
		// write the record whole under a temporary name, then link it
		// into place: the link fails if another process was first
		tmp, err := writeTemp(dir, b)
		if err != nil {
			return fail(fmt.Errorf("cannot write in it: %w", err))
		}
		err = os.Link(tmp, filepath.Join(dir, RecordFile))
		os.Remove(tmp)
		if err == nil {
			syncDir(dir)
			return ensureCopy(dir, source)
		}
		if !errors.Is(err, fs.ErrExist) {
			return fail(err)
		}
	}
	return fail(errors.New("its record keeps changing"))
}

// ensureCopy writes the copy of the sweep file if the directory lacks it
// (the first one written stays: a file that differs only in its text, its
// comments or layout, describes the same members).
func ensureCopy(dir string, source []byte) error {
	p := filepath.Join(dir, CopyFile)
	if _, err := os.Stat(p); err == nil {
		return nil
	}
	tmp, err := writeTemp(dir, source)
	if err != nil {
		return &DirError{dir, err}
	}
	if err := os.Rename(tmp, p); err != nil {
		os.Remove(tmp)
		return &DirError{dir, err}
	}
	return nil
}

// writeTemp writes b to a new file in dir and flushes it.
func writeTemp(dir string, b []byte) (string, error) {
	f, err := os.CreateTemp(dir, tmpPrefix+"*")
	if err != nil {
		return "", err
	}
	_, err = f.Write(b)
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(f.Name())
		return "", err
	}
	return f.Name(), nil
}

func syncDir(dir string) {
	if d, err := os.Open(dir); err == nil {
		d.Sync()
		d.Close()
	}
}
