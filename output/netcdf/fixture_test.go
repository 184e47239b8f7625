package netcdf

import (
	"math"
	"path/filepath"
	"testing"
)

// fixture is a file with every type as fixed and as record variables,
// attributes of every type (some of length 0), a scalar, a variable left
// at its _FillValue, and the values written to it.
type fixture struct {
	h     Header
	fixed map[string]any   // values of the fixed-size variables (nil: never written)
	recs  []map[string]any // values of each record's record variables (missing: never written)
}

const (
	fxLayers = 2
	fxY      = 3
	fxX      = 4
	fxChars  = 6
	fxRecs   = 3
)

func newFixture(format Format) *fixture {
	fx := &fixture{h: Header{
		Format: format,
		Dims: []Dim{
			{"time", 0}, {"layer", fxLayers}, {"y", fxY}, {"x", fxX}, {"nchar", fxChars},
		},
		Attrs: []Attr{
			{"Conventions", "CF-1.8"},
			{"title", "fixture: a drifting two-layer vortex"},
			{"empty_text", ""},
			{"version", int32(3)},
			{"weights", []float64{0.25, 0.75}},
			{"flags", []int8{-128, 0, 127}},
			{"shorts", []int16{-32768, 32767}},
			{"floats", []float32{1.5, -0.25, math.MaxFloat32}},
			{"no_doubles", []float64{}},
		},
		Vars: []Var{
			{Name: "x", Type: Double, Dims: []string{"x"}, Attrs: []Attr{{"units", "m"}, {"long_name", "distance east"}}},
			{Name: "y", Type: Float, Dims: []string{"y"}, Attrs: []Attr{{"units", "m"}}},
			{Name: "layer", Type: Int, Dims: []string{"layer"}},
			{Name: "flag", Type: Byte, Dims: []string{"layer"}},
			{Name: "count", Type: Short, Dims: []string{"y"}},
			{Name: "label", Type: Char, Dims: []string{"nchar"}},
			{Name: "depth", Type: Double, Attrs: []Attr{{"units", "m"}, {"valid_range", []float64{0, 1e4}}}},
			{Name: "mean_psi", Type: Double, Dims: []string{"layer", "y", "x"}, Attrs: []Attr{{"_FillValue", -999.0}, {"units", "m2 s-1"}}},
			{Name: "unwritten", Type: Float, Dims: []string{"x"}, Attrs: []Attr{{"_FillValue", float32(-1)}}},
			{Name: "time", Type: Double, Dims: []string{"time"}, Attrs: []Attr{{"units", "days since 2000-01-01"}}},
			{Name: "psi", Type: Double, Dims: []string{"time", "layer", "y", "x"}, Attrs: []Attr{{"units", "m2 s-1"}}},
			{Name: "q", Type: Float, Dims: []string{"time", "layer", "y", "x"}, Attrs: []Attr{{"units", "s-1"}, {"scale", float32(2.5)}}},
			{Name: "code", Type: Short, Dims: []string{"time", "layer"}},
			{Name: "stamp", Type: Char, Dims: []string{"time", "nchar"}},
			{Name: "level", Type: Byte, Dims: []string{"time"}},
			{Name: "steps", Type: Int, Dims: []string{"time"}},
		},
	}}
	n := fxLayers * fxY * fxX
	x := make([]float64, fxX)
	for i := range x {
		x[i] = 1e3 * math.Sqrt(float64(i)+0.5)
	}
	y := []float32{-1.25e3, 0, 3.1415927e3}
	mean := make([]float64, n)
	for i := range mean {
		mean[i] = math.Sin(float64(i)+0.1) * 1e7
	}
	fx.fixed = map[string]any{
		"x":         x,
		"y":         y,
		"layer":     []int32{math.MinInt32, math.MaxInt32},
		"flag":      []int8{-128, 127},
		"count":     []int16{-32768, 0, 32767},
		"label":     "eddy",
		"depth":     []float64{4000},
		"mean_psi":  mean,
		"unwritten": nil,
	}
	for r := range fxRecs {
		psi := make([]float64, n)
		q := make([]float32, n)
		for i := range psi {
			psi[i] = math.Cos(float64(r*n+i)) * math.Pow(10, float64(i%7)-3)
			q[i] = float32(math.Exp(-float64(i)/3)) * float32(r+1) * 1e-5
		}
		rec := map[string]any{
			"time":  []float64{0.5 * float64(r)},
			"psi":   psi,
			"q":     q,
			"code":  []int16{int16(100 * r), int16(-r - 1)},
			"stamp": []byte{'d', 'a', 'y', byte('0' + r), 0, 0},
			"level": []int8{int8(r - 1)},
		}
		if r == 1 {
			delete(rec, "q") // record 1 of q stays at the fill value
		}
		// "steps" is never written: every record holds the fill value.
		fx.recs = append(fx.recs, rec)
	}
	return fx
}

// write writes the fixture to a new file in dir.
func (fx *fixture) write(t testing.TB, dir, name string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	w, err := Create(path, fx.h)
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range fx.h.Vars {
		if d := fx.fixed[v.Name]; d != nil {
			if err := w.WriteVar(v.Name, d); err != nil {
				t.Fatal(err)
			}
		}
	}
	for r, rec := range fx.recs {
		for _, v := range fx.h.Vars {
			if d, ok := rec[v.Name]; ok {
				if err := w.WriteRecord(v.Name, r, d); err != nil {
					t.Fatal(err)
				}
			}
		}
		if err := w.CommitRecord(); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// want returns the values the fixture's variable name should read back
// as float64 (fill values included), or nil for char variables.
func (fx *fixture) want(name string) []float64 {
	v, _ := fx.h.Var(name)
	if v.Type == Char {
		return nil
	}
	if len(v.Dims) == 0 || v.Dims[0] != "time" {
		n := 1
		for _, d := range v.Dims {
			dd, _ := fx.h.Dim(d)
			n *= dd.Len
		}
		if d := fx.fixed[name]; d != nil {
			return toF64(d)
		}
		return repeat(v.FillValue(), n)
	}
	n := 1
	for _, d := range v.Dims[1:] {
		dd, _ := fx.h.Dim(d)
		n *= dd.Len
	}
	var out []float64
	for _, rec := range fx.recs {
		if d, ok := rec[name]; ok {
			out = append(out, toF64(d)...)
		} else {
			out = append(out, repeat(v.FillValue(), n)...)
		}
	}
	return out
}

// wantText returns the characters of the fixture's char variable name,
// NUL-padded as stored.
func (fx *fixture) wantText(name string) []byte {
	if name == "label" {
		b := make([]byte, fxChars)
		copy(b, fx.fixed["label"].(string))
		return b
	}
	var out []byte
	for _, rec := range fx.recs {
		out = append(out, rec[name].([]byte)...)
	}
	return out
}

func toF64(d any) []float64 {
	switch d := d.(type) {
	case []float64:
		return d
	case []float32:
		return toFloat64s(d)
	case []int32:
		return toFloat64s(d)
	case []int16:
		return toFloat64s(d)
	case []int8:
		return toFloat64s(d)
	}
	panic("toF64: unexpected type")
}

func repeat(x float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = x
	}
	return out
}

// sameFloat reports whether a and b are equal, or both NaN.
func sameFloat(a, b float64) bool { return a == b || a != a && b != b }
