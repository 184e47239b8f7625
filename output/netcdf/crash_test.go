package netcdf

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// memFile is an in-memory file that logs every write.
type memFile struct {
	log []writeOp
}

type writeOp struct {
	off int64
	b   []byte
}

func (m *memFile) WriteAt(b []byte, off int64) (int, error) {
	m.log = append(m.log, writeOp{off, bytes.Clone(b)})
	return len(b), nil
}

// Sync logs a write of no bytes at offset -1.
func (m *memFile) Sync() error {
	m.log = append(m.log, writeOp{off: -1})
	return nil
}
func (m *memFile) Close() error { return nil }

// Truncate is not used by the writes these tests log.
func (m *memFile) Truncate(int64) error { return errors.New("memFile: Truncate not supported") }

// replay returns the file after the first k writes of log and the first
// part bytes of write k.
func replay(log []writeOp, k, part int) []byte {
	var data []byte
	apply := func(op writeOp, n int) {
		if end := int(op.off) + n; end > len(data) {
			data = append(data, make([]byte, end-len(data))...)
		}
		copy(data[op.off:], op.b[:n])
	}
	for _, op := range log[:k] {
		if op.off >= 0 {
			apply(op, len(op.b))
		}
	}
	if k < len(log) && log[k].off >= 0 {
		apply(log[k], part)
	}
	return data
}

// crashSchema has a fixed variable and three record variables, one with
// padding, like a snapshot file.
func crashSchema(format Format) Header {
	return Header{
		Format: format,
		Dims:   []Dim{{"time", 0}, {"layer", 2}, {"y", 4}, {"x", 8}, {"k", 3}},
		Vars: []Var{
			{Name: "x", Type: Double, Dims: []string{"x"}},
			{Name: "time", Type: Double, Dims: []string{"time"}},
			{Name: "psi", Type: Double, Dims: []string{"time", "layer", "y", "x"}},
			{Name: "code", Type: Short, Dims: []string{"time", "k"}},
		},
	}
}

func crashRecord(r int) (time float64, psi []float64, code []int16) {
	psi = make([]float64, 2*4*8)
	for i := range psi {
		psi[i] = math.Sin(float64(r*len(psi)+i)) + float64(r)
	}
	return 0.25 * float64(r), psi, []int16{int16(r), int16(2 * r), int16(-r)}
}

// checkCrashFile decodes data and checks that its header counts at least
// minRecs records and only records whose data is complete and right.
func checkCrashFile(data []byte, minRecs, maxRecs int) error {
	f, err := Decode(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		return err
	}
	n := f.NumRecs()
	if n < minRecs || n > maxRecs {
		return fmt.Errorf("%d records, want %d to %d", n, minRecs, maxRecs)
	}
	for r := range n {
		tm, psi, code := crashRecord(r)
		gt, err1 := f.ReadRecordFloat64("time", r)
		gp, err2 := f.ReadRecordFloat64("psi", r)
		gc, err3 := f.ReadRecordFloat64("code", r)
		if err := cmpErr(err1, err2, err3); err != nil {
			return err
		}
		if gt[0] != tm || !slicesEqual(gp, psi) || !slicesEqual(gc, toF64(code)) {
			return fmt.Errorf("record %d of %d holds wrong data", r, n)
		}
	}
	return nil
}

func cmpErr(errs ...error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

func slicesEqual(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if !sameFloat(a[i], b[i]) {
			return false
		}
	}
	return true
}

// TestCrashAtEveryWrite replays a Writer's writes and stops them at
// every write, and inside every data write (a write interrupted by
// SIGKILL may be partial; the 4-byte numrecs update within one page is
// not). Each state must decode, count only complete records (data
// written before numrecs, common practice for append-only files) and
// keep every committed one.
func TestCrashAtEveryWrite(t *testing.T) {
	for _, format := range []Format{Classic, Offset64} {
		h := crashSchema(format)
		l, hdr, err := newLayout(&h)
		if err != nil {
			t.Fatal(err)
		}
		m := &memFile{}
		w := newWriter(m, "crash.nc", l)
		if err := w.init(hdr); err != nil {
			t.Fatal(err)
		}
		created := len(m.log)
		var committed []int // log length when each CommitRecord returned
		for r := range 5 {
			tm, psi, code := crashRecord(r)
			writes := []func() error{
				func() error { return w.WriteRecordFloat64("time", r, []float64{tm}) },
				func() error { return w.WriteRecordFloat64("psi", r, psi) },
				func() error { return w.WriteRecord("code", r, code) },
			}
			if r == 2 { // any order of the variables within a record
				writes[0], writes[2] = writes[2], writes[0]
			}
			for _, write := range writes {
				if err := write(); err != nil {
					t.Fatal(err)
				}
			}
			if r == 1 {
				if err := w.WriteFloat64("x", []float64{1, 2, 3, 4, 5, 6, 7, 8}); err != nil {
					t.Fatal(err)
				}
			}
			if err := w.CommitRecord(); err != nil {
				t.Fatal(err)
			}
			committed = append(committed, len(m.log))
		}
		if err := w.Close(); err != nil {
			t.Fatal(err)
		}

		var states [][]byte
		for k := created; k <= len(m.log); k++ {
			parts := []int{0}
			if k < len(m.log) && m.log[k].off > 4 {
				n := len(m.log[k].b)
				parts = append(parts, 1, n/2, n-1)
			}
			done := 0
			for _, c := range committed {
				if c <= k {
					done++
				}
			}
			for _, part := range parts {
				data := replay(m.log, k, part)
				if err := checkCrashFile(data, done, done+1); err != nil {
					t.Fatalf("%v: stopped at write %d of %d (+%d bytes): %v", format, k, len(m.log), part, err)
				}
				if part <= 1 {
					states = append(states, data)
				}
			}
		}

		t.Run(format.String()+"/ncdump", func(t *testing.T) {
			ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
			dir := t.TempDir()
			for i, data := range states {
				path := filepath.Join(dir, fmt.Sprintf("state%d.nc", i))
				if err := os.WriteFile(path, data, 0o644); err != nil {
					t.Fatal(err)
				}
				f, err := Decode(bytes.NewReader(data), int64(len(data)))
				if err != nil {
					t.Fatal(err)
				}
				out, err := exec.Command(ncdump, "-v", "time", path).CombinedOutput()
				if err != nil {
					t.Fatalf("ncdump of state %d: %v\n%s", i, err, out)
				}
				// ncdump prints "time = UNLIMITED ; // (N currently)".
				want := fmt.Sprintf("time = UNLIMITED ; // (%d currently)", f.NumRecs())
				if !strings.Contains(string(out), want) {
					t.Errorf("state %d: ncdump output lacks %q:\n%s", i, want, out)
				}
			}
		})
	}
}

const killChildEnv = "EDDYBLOCK_NETCDF_KILL_CHILD"

// TestKilledWriter runs a writer in a child process, kills it with
// SIGKILL while it appends records, and checks that the file holds at
// least every record the child reported committed, each complete, that
// ncdump reads it, and that Append continues it.
func TestKilledWriter(t *testing.T) {
	if path := os.Getenv(killChildEnv); path != "" {
		killChild(path)
		return
	}
	path := filepath.Join(t.TempDir(), "killed.nc")
	cmd := exec.Command(os.Args[0], "-test.run=^TestKilledWriter$")
	cmd.Env = append(os.Environ(), killChildEnv+"="+path)
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stderr = os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	sc := bufio.NewScanner(out)
	last := -1
	for sc.Scan() {
		if n, ok := strings.CutPrefix(sc.Text(), "committed "); ok {
			last, _ = strconv.Atoi(n)
			if last >= 40 {
				break
			}
		}
	}
	if err := cmd.Process.Kill(); err != nil { // SIGKILL on Unix
		t.Fatal(err)
	}
	cmd.Wait()
	if last < 40 {
		t.Fatalf("the child reported %d records before it ended", last)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := checkCrashFile(data, last, math.MaxInt32); err != nil {
		t.Fatalf("file of the killed writer (%d bytes, %d records reported): %v", len(data), last, err)
	}
	f, _ := Decode(bytes.NewReader(data), int64(len(data)))
	n := f.NumRecs()
	t.Logf("killed after %d records reported; the file holds %d (%d bytes)", last, n, len(data))

	if ncdump, err := exec.LookPath("ncdump"); err == nil {
		out, err := exec.Command(ncdump, "-h", path).CombinedOutput()
		if want := fmt.Sprintf("// (%d currently)", n); err != nil || !strings.Contains(string(out), want) {
			t.Errorf("ncdump -h: %v, want %q in\n%s", err, want, out)
		}
	}

	w, err := Append(path)
	if err != nil {
		t.Fatal(err)
	}
	tm, psi, code := crashRecord(n)
	if err := cmpErr(w.WriteRecordFloat64("time", n, []float64{tm}), w.WriteRecordFloat64("psi", n, psi), w.WriteRecord("code", n, code), w.Close()); err != nil {
		t.Fatal(err)
	}
	data, _ = os.ReadFile(path)
	if err := checkCrashFile(data, n+1, n+1); err != nil {
		t.Errorf("after Append: %v", err)
	}
}

// killChild writes records until it is killed, reporting each commit.
func killChild(path string) {
	h := crashSchema(Offset64)
	h.Dims[2].Len, h.Dims[3].Len = 4, 8
	w, err := Create(path, h)
	if err != nil {
		fmt.Println("error", err)
		os.Exit(1)
	}
	w.WriteFloat64("x", []float64{1, 2, 3, 4, 5, 6, 7, 8})
	for r := 0; r < 20000; r++ {
		tm, psi, code := crashRecord(r)
		if err := cmpErr(w.WriteRecordFloat64("time", r, []float64{tm}), w.WriteRecordFloat64("psi", r, psi), w.WriteRecord("code", r, code), w.CommitRecord()); err != nil {
			fmt.Println("error", err)
			os.Exit(1)
		}
		fmt.Println("committed", r+1)
	}
	time.Sleep(time.Hour) // wait to be killed
}

// TestDurable checks the order of writes and syncs of a durable Writer:
// every data write of a record, a sync, the numrecs update, a sync; so
// the file system cannot store the count before the data it counts.
func TestDurable(t *testing.T) {
	h := crashSchema(Classic)
	l, hdr, err := newLayout(&h)
	if err != nil {
		t.Fatal(err)
	}
	m := &memFile{}
	w := newWriter(m, "durable.nc", l)
	if err := w.init(hdr); err != nil {
		t.Fatal(err)
	}
	w.SetDurable(true)
	for r := range 2 {
		start := len(m.log)
		tm, psi, _ := crashRecord(r)
		// "code" is left to CommitRecord's fill values.
		if err := cmpErr(w.WriteRecordFloat64("time", r, []float64{tm}), w.WriteRecordFloat64("psi", r, psi), w.CommitRecord()); err != nil {
			t.Fatal(err)
		}
		var kinds []string
		for _, op := range m.log[start:] {
			switch {
			case op.off < 0:
				kinds = append(kinds, "sync")
			case op.off == 4:
				kinds = append(kinds, "numrecs")
			default:
				kinds = append(kinds, "data")
			}
		}
		if got := strings.Join(kinds, " "); got != "data data data sync numrecs sync" {
			t.Errorf("record %d: %s, want data data data sync numrecs sync", r, got)
		}
	}
}
