package netcdf

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// TestTruncateRecords checks that dropping the last records leaves the
// same bytes as a file that never had them (the record layout of the
// format specification: numrecs at byte 4, records after the fixed data),
// and that records written after the truncation land where they belong.
func TestTruncateRecords(t *testing.T) {
	dir := t.TempDir()
	h := Header{
		Format: Offset64,
		Dims:   []Dim{{"time", 0}, {"x", 3}},
		Vars: []Var{
			{Name: "time", Type: Double, Dims: []string{"time"}},
			{Name: "a", Type: Float, Dims: []string{"time", "x"}},
			{Name: "c", Type: Double, Dims: []string{"x"}},
		},
	}
	write := func(path string, recs int) *Writer {
		w, err := Create(path, h)
		if err != nil {
			t.Fatal(err)
		}
		if err := w.WriteFloat64("c", []float64{1, 2, 3}); err != nil {
			t.Fatal(err)
		}
		for r := range recs {
			w.WriteRecordFloat64("time", r, []float64{float64(r)})
			w.WriteRecordFloat64("a", r, []float64{float64(r), 10, 20})
			if err := w.CommitRecord(); err != nil {
				t.Fatal(err)
			}
		}
		return w
	}
	a, b := filepath.Join(dir, "a.nc"), filepath.Join(dir, "b.nc")
	write(b, 2).Close()
	w := write(a, 5)
	if err := w.TruncateRecords(2); err != nil {
		t.Fatal(err)
	}
	w.Close()
	ba, _ := os.ReadFile(a)
	bb, _ := os.ReadFile(b)
	if !bytes.Equal(ba, bb) {
		t.Fatalf("a file truncated to 2 records (%d bytes) differs from one written with 2 (%d bytes)", len(ba), len(bb))
	}
	// continue both to 4 records: still identical
	for _, p := range []string{a, b} {
		w, err := Append(p)
		if err != nil {
			t.Fatal(err)
		}
		for r := 2; r < 4; r++ {
			w.WriteRecordFloat64("time", r, []float64{float64(r)})
			w.WriteRecordFloat64("a", r, []float64{float64(r), 10, 20})
			w.CommitRecord()
		}
		w.Close()
	}
	ba, _ = os.ReadFile(a)
	bb, _ = os.ReadFile(b)
	if !bytes.Equal(ba, bb) {
		t.Fatal("the continued files differ")
	}
	w, _ = Append(a)
	if err := w.TruncateRecords(5); err == nil {
		t.Error("TruncateRecords beyond the record count: no error")
	}
	w.Close()
}
