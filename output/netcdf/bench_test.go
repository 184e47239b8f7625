package netcdf

import (
	"path/filepath"
	"testing"
)

// BenchmarkWriteField writes a 2-layer 128×256 float64 field (512 KiB)
// to a file: one big-endian encoding pass into the Writer's reused
// buffer and one write call, with no allocation per call.
func BenchmarkWriteField(b *testing.B) {
	const layers, ny, nx = 2, 128, 256
	h := Header{Format: Classic, Dims: []Dim{{"layer", layers}, {"y", ny}, {"x", nx}},
		Vars: []Var{{Name: "psi", Type: Double, Dims: []string{"layer", "y", "x"}}}}
	w, err := Create(filepath.Join(b.TempDir(), "bench.nc"), h)
	if err != nil {
		b.Fatal(err)
	}
	defer w.Close()
	psi := make([]float64, layers*ny*nx)
	for i := range psi {
		psi[i] = float64(i) * 1e-3
	}
	b.SetBytes(int64(len(psi) * 8))
	b.ReportAllocs()
	for b.Loop() {
		if err := w.WriteFloat64("psi", psi); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkEncode is the encoding alone.
func BenchmarkEncode(b *testing.B) {
	psi := make([]float64, 2*128*256)
	buf := make([]byte, 8*len(psi))
	b.SetBytes(int64(len(buf)))
	b.ReportAllocs()
	for b.Loop() {
		putValues(buf, Double, psi)
	}
}
