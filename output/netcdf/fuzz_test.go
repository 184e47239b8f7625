package netcdf

import (
	"bytes"
	"errors"
	"os"
	"testing"
)

// FuzzDecode decodes arbitrary bytes (common practice for parsers of
// untrusted files). Seeds are valid files. The decoder
// must not panic, must report malformed input as a *FormatError at an
// offset within the input, and, when it accepts the input, every
// variable must read without error and hold no more values than the
// input has bytes (no allocation beyond the input's size).
func FuzzDecode(f *testing.F) {
	for _, c := range layoutCases {
		f.Add(c.want)
	}
	f.Add(put32(recordFile64, 4, streaming))
	for _, format := range []Format{Classic, Offset64} {
		data, err := os.ReadFile(newFixture(format).write(f, f.TempDir(), "seed.nc"))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		nf, err := Decode(bytes.NewReader(data), int64(len(data)))
		if err != nil {
			var fe *FormatError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v is not a *FormatError", err)
			}
			if fe.Offset < 0 || fe.Offset > int64(len(data)) {
				t.Fatalf("error offset %d outside the %d-byte input: %v", fe.Offset, len(data), err)
			}
			return
		}
		if nf.NumRecs() < 0 || int64(nf.NumRecs()) > int64(len(data)) && nf.lay.recVars > 0 {
			t.Fatalf("%d records in %d bytes", nf.NumRecs(), len(data))
		}
		for _, v := range nf.Vars {
			shape, err := nf.Shape(v.Name)
			if err != nil {
				t.Fatal(err)
			}
			n := 1
			for _, s := range shape {
				n *= s
			}
			if n*v.Type.Size() > len(data) {
				t.Fatalf("variable %q: %d values of %d bytes in a %d-byte file", v.Name, n, v.Type.Size(), len(data))
			}
			all, err := nf.ReadVar(v.Name)
			if err != nil {
				t.Fatalf("ReadVar(%q): %v", v.Name, err)
			}
			if got := lenValues(all); got != n {
				t.Fatalf("ReadVar(%q): %d values, shape %v", v.Name, got, shape)
			}
			if v.Type != Char {
				x, err := nf.ReadFloat64(v.Name)
				if err != nil || len(x) != n {
					t.Fatalf("ReadFloat64(%q): %d values, %v; shape %v", v.Name, len(x), err, shape)
				}
			}
			if nf.lay.recDim >= 0 && len(shape) > 0 && v.Dims[0] == nf.Dims[nf.lay.recDim].Name && nf.NumRecs() > 0 {
				if _, err := nf.ReadRecord(v.Name, nf.NumRecs()-1); err != nil {
					t.Fatalf("ReadRecord(%q, last): %v", v.Name, err)
				}
			}
		}
	})
}

func lenValues(x any) int {
	switch x := x.(type) {
	case []int8:
		return len(x)
	case []byte:
		return len(x)
	case []int16:
		return len(x)
	case []int32:
		return len(x)
	case []float32:
		return len(x)
	case []float64:
		return len(x)
	}
	return -1
}
