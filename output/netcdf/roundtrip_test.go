package netcdf

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// normAttr returns the value an attribute reads back as: the format
// stores every attribute as a typed array (format specification, attr =
// name nc_type nelems [values ...]), so scalars come back as slices of
// length 1, and Go ints as 32-bit ints.
func normAttr(v any) any {
	switch v := v.(type) {
	case int8:
		return []int8{v}
	case int16:
		return []int16{v}
	case int32:
		return []int32{v}
	case int:
		return []int32{int32(v)}
	case []int:
		out := make([]int32, len(v))
		for i, x := range v {
			out[i] = int32(x)
		}
		return out
	case float32:
		return []float32{v}
	case float64:
		return []float64{v}
	}
	return v
}

func compareAttrs(t *testing.T, where string, got, want []Attr) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d attributes, want %d", where, len(got), len(want))
		return
	}
	for i := range want {
		w := normAttr(want[i].Value)
		if got[i].Name != want[i].Name || !reflect.DeepEqual(got[i].Value, w) {
			t.Errorf("%s: attribute %d = %q %#v, want %q %#v", where, i, got[i].Name, got[i].Value, want[i].Name, w)
		}
	}
}

// specSize computes the size of a file from the format specification's
// grammar: the header (magic, numrecs, three lists, names padded to 4
// bytes, attribute values padded to 4 bytes, OFFSET of 4 or 8 bytes), the
// fixed-size data (each vsize rounded up to 4 bytes) and numrecs records
// (the sum of the record variables' vsizes, without padding when there
// is exactly one record variable: "Note on padding").
func specSize(h *Header, numrecs int) int64 {
	p4 := func(n int) int64 { return int64((n + 3) / 4 * 4) }
	name := func(s string) int64 { return 4 + p4(len(s)) }
	attrs := func(as []Attr) int64 {
		n := int64(8)
		for _, a := range as {
			t, cnt, _ := attrValue(a.Value)
			n += name(a.Name) + 8 + p4(cnt*t.Size())
		}
		return n
	}
	size := int64(8 + 8)
	for _, d := range h.Dims {
		size += name(d.Name) + 4
	}
	size += attrs(h.Attrs) + 8
	var fixed, recsize, last int64
	nrec := 0
	for _, v := range h.Vars {
		size += name(v.Name) + 4 + 4*int64(len(v.Dims)) + attrs(v.Attrs) + 8
		if h.Format == Classic {
			size += 4
		} else {
			size += 8
		}
		n, rec := v.Type.Size(), false
		for j, d := range v.Dims {
			dd, _ := h.Dim(d)
			if dd.Len == 0 && j == 0 {
				rec = true
				continue
			}
			n *= dd.Len
		}
		if rec {
			nrec++
			recsize += p4(n)
			last = int64(n)
		} else {
			fixed += p4(n)
		}
	}
	if nrec == 1 {
		recsize = last
	}
	return size + fixed + int64(numrecs)*recsize
}

// TestRoundTrip writes the fixture in both formats and reads everything
// back: header, attributes, every variable whole and record by record,
// and checks the file size against the format specification's layout.
func TestRoundTrip(t *testing.T) {
	for _, format := range []Format{Classic, Offset64} {
		t.Run(format.String(), func(t *testing.T) {
			fx := newFixture(format)
			path := fx.write(t, t.TempDir(), "fixture.nc")
			f, err := Open(path)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			if f.Format != format || f.NumRecs() != fxRecs {
				t.Errorf("format %v, %d records; want %v, %d", f.Format, f.NumRecs(), format, fxRecs)
			}
			if !reflect.DeepEqual(f.Dims, fx.h.Dims) {
				t.Errorf("dims %v, want %v", f.Dims, fx.h.Dims)
			}
			compareAttrs(t, "global", f.Attrs, fx.h.Attrs)
			if len(f.Vars) != len(fx.h.Vars) {
				t.Fatalf("%d variables, want %d", len(f.Vars), len(fx.h.Vars))
			}
			for i, want := range fx.h.Vars {
				got := f.Vars[i]
				if got.Name != want.Name || got.Type != want.Type || !reflect.DeepEqual(got.Dims, append([]string{}, want.Dims...)) {
					t.Errorf("variable %d: %s %v %v, want %s %v %v", i, got.Name, got.Type, got.Dims, want.Name, want.Type, want.Dims)
				}
				compareAttrs(t, want.Name, got.Attrs, want.Attrs)
				checkValues(t, f, fx, want)
			}
			st, _ := os.Stat(path)
			if want := specSize(&fx.h, fxRecs); st.Size() != want {
				t.Errorf("file size %d, want %d from the specification's layout", st.Size(), want)
			}
		})
	}
}

func checkValues(t *testing.T, f *File, fx *fixture, v Var) {
	t.Helper()
	shape, err := f.Shape(v.Name)
	if err != nil {
		t.Fatal(err)
	}
	n := 1
	for _, s := range shape {
		n *= s
	}
	all, err := f.ReadVar(v.Name)
	if err != nil {
		t.Fatal(err)
	}
	if v.Type == Char {
		if got, want := all.([]byte), fx.wantText(v.Name); !bytes.Equal(got, want) {
			t.Errorf("%s = %q, want %q", v.Name, got, want)
		}
		return
	}
	want := fx.want(v.Name)
	if len(want) != n {
		t.Fatalf("%s: shape %v, want %d values", v.Name, shape, len(want))
	}
	got, err := f.ReadFloat64(v.Name)
	if err != nil {
		t.Fatal(err)
	}
	if typed := toF64(all); len(got) != n || len(typed) != n {
		t.Fatalf("%s: %d and %d values, want %d", v.Name, len(got), len(typed), n)
	} else {
		for i := range want {
			// Exact: every stored value is representable in its type.
			if !sameFloat(got[i], want[i]) || !sameFloat(typed[i], want[i]) {
				t.Errorf("%s[%d] = %v (typed %v), want %v", v.Name, i, got[i], typed[i], want[i])
				break
			}
		}
	}
	wantType := map[Type]string{Byte: "[]int8", Short: "[]int16", Int: "[]int32", Float: "[]float32", Double: "[]float64"}[v.Type]
	if gotType := reflect.TypeOf(all).String(); gotType != wantType {
		t.Errorf("%s: ReadVar gives %s, want %s", v.Name, gotType, wantType)
	}
	if len(v.Dims) == 0 || v.Dims[0] != "time" {
		if _, err := f.ReadRecordFloat64(v.Name, 0); err == nil {
			t.Errorf("%s: ReadRecordFloat64 of a fixed-size variable succeeded", v.Name)
		}
		return
	}
	per := n / fxRecs
	for r := range fxRecs {
		got, err := f.ReadRecordFloat64(v.Name, r)
		if err != nil {
			t.Fatal(err)
		}
		typed, err := f.ReadRecord(v.Name, r)
		if err != nil {
			t.Fatal(err)
		}
		for i := range per {
			if !sameFloat(got[i], want[r*per+i]) || !sameFloat(toF64(typed)[i], want[r*per+i]) {
				t.Errorf("%s record %d [%d] = %v, want %v", v.Name, r, i, got[i], want[r*per+i])
				break
			}
		}
	}
	if _, err := f.ReadRecordFloat64(v.Name, fxRecs); err == nil {
		t.Errorf("%s: reading record %d of %d succeeded", v.Name, fxRecs, fxRecs)
	}
}

// TestConversions writes each numeric type from float64 and from the
// other Go types and reads the values back. Integers are stored exactly
// (format specification: 8-, 16- and 32-bit two's complement).
func TestConversions(t *testing.T) {
	h := Header{Format: Classic, Dims: []Dim{{"n", 4}}, Vars: []Var{
		{Name: "b", Type: Byte, Dims: []string{"n"}},
		{Name: "s", Type: Short, Dims: []string{"n"}},
		{Name: "i", Type: Int, Dims: []string{"n"}},
		{Name: "f", Type: Float, Dims: []string{"n"}},
		{Name: "d", Type: Double, Dims: []string{"n"}},
		{Name: "fi", Type: Float, Dims: []string{"n"}},
		{Name: "di", Type: Double, Dims: []string{"n"}},
	}}
	path := filepath.Join(t.TempDir(), "conv.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	third := 1.0 / 3
	for _, c := range []struct {
		name string
		data any
	}{
		{"b", []float64{-128, 127, 0, -1}},
		{"s", []int8{-128, 127, 0, -1}},
		{"i", []int16{-32768, 32767, 0, -1}},
		{"f", []float64{third, -third, 1e-40, 3e38}},
		{"d", []float32{float32(third), -0.5, 1e-40, 3e38}},
		{"fi", []int32{16777217, -3, 0, 1}},
		{"di", []int32{math.MaxInt32, math.MinInt32, 0, 1}},
	} {
		if err := w.WriteVar(c.name, c.data); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	f, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, c := range []struct {
		name string
		want []float64
	}{
		{"b", []float64{-128, 127, 0, -1}},
		{"s", []float64{-128, 127, 0, -1}},
		{"i", []float64{-32768, 32767, 0, -1}},
		// IEEE 754: conversion to single precision rounds to nearest
		// (1e-40 is a subnormal float).
		{"f", []float64{float64(float32(third)), -float64(float32(third)), float64(float32(1e-40)), float64(float32(3e38))}},
		// Single to double precision is exact.
		{"d", []float64{float64(float32(third)), -0.5, float64(float32(1e-40)), float64(float32(3e38))}},
		// 16777217 = 2^24+1 rounds to 2^24 in single precision (ties to even).
		{"fi", []float64{16777216, -3, 0, 1}},
		{"di", []float64{math.MaxInt32, math.MinInt32, 0, 1}},
	} {
		got, err := f.ReadFloat64(c.name)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, c.want) {
			t.Errorf("%s = %v, want %v", c.name, got, c.want)
		}
	}
}

// TestSpecialValues checks that NaN, infinities and negative zero pass
// through unchanged (IEEE 754 bit patterns stored big-endian).
func TestSpecialValues(t *testing.T) {
	h := Header{Format: Offset64, Dims: []Dim{{"n", 4}}, Vars: []Var{
		{Name: "d", Type: Double, Dims: []string{"n"}},
		{Name: "f", Type: Float, Dims: []string{"n"}},
	}}
	path := filepath.Join(t.TempDir(), "special.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	in := []float64{math.NaN(), math.Inf(1), math.Inf(-1), math.Copysign(0, -1)}
	for _, name := range []string{"d", "f"} {
		if err := w.WriteFloat64(name, in); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	f, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	for _, name := range []string{"d", "f"} {
		got, err := f.ReadFloat64(name)
		if err != nil {
			t.Fatal(err)
		}
		if !math.IsNaN(got[0]) || !math.IsInf(got[1], 1) || !math.IsInf(got[2], -1) || got[3] != 0 || !math.Signbit(got[3]) {
			t.Errorf("%s = %v, want [NaN +Inf -Inf -0]", name, got)
		}
	}
}

// TestOverwriteRecord rewrites a committed record and leaves the others
// (common practice: the format places every record at a fixed offset, so
// NetCDF libraries allow writing any existing record again).
func TestOverwriteRecord(t *testing.T) {
	h := Header{Format: Classic, Dims: []Dim{{"t", 0}, {"n", 2}}, Vars: []Var{
		{Name: "a", Type: Double, Dims: []string{"t", "n"}},
		{Name: "b", Type: Short, Dims: []string{"t"}},
	}}
	path := filepath.Join(t.TempDir(), "over.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	for r := range 3 {
		if err := w.WriteRecordFloat64("a", r, []float64{float64(r), float64(-r)}); err != nil {
			t.Fatal(err)
		}
		if err := w.WriteRecord("b", r, []int16{int16(r)}); err != nil {
			t.Fatal(err)
		}
		if err := w.CommitRecord(); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.WriteRecordFloat64("a", 1, []float64{10, 20}); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	f, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	a, _ := f.ReadFloat64("a")
	b, _ := f.ReadFloat64("b")
	if want := []float64{0, 0, 10, 20, 2, -2}; f.NumRecs() != 3 || !reflect.DeepEqual(a, want) || !reflect.DeepEqual(b, []float64{0, 1, 2}) {
		t.Errorf("%d records, a = %v, b = %v; want 3, %v, [0 1 2]", f.NumRecs(), a, b, want)
	}
}

// TestAppend closes a file, reopens it with Append and adds records; a
// pending record is committed by Close. Record variables left unwritten
// hold the default fill value (format specification, "Note on fill
// values"), and the file keeps the specification's layout.
func TestAppend(t *testing.T) {
	for _, format := range []Format{Classic, Offset64} {
		fx := newFixture(format)
		path := fx.write(t, t.TempDir(), "append.nc")
		w, err := Append(path)
		if err != nil {
			t.Fatal(err)
		}
		if w.NumRecs() != fxRecs {
			t.Fatalf("Append: %d records, want %d", w.NumRecs(), fxRecs)
		}
		psi := make([]float64, fxLayers*fxY*fxX)
		for i := range psi {
			psi[i] = float64(i) / 7
		}
		if err := w.WriteRecordFloat64("psi", fxRecs, psi); err != nil {
			t.Fatal(err)
		}
		if err := w.WriteRecord("stamp", fxRecs, "day9"); err != nil {
			t.Fatal(err)
		}
		if err := w.Close(); err != nil {
			t.Fatal(err)
		}
		f, err := Open(path)
		if err != nil {
			t.Fatal(err)
		}
		if f.NumRecs() != fxRecs+1 {
			t.Fatalf("%d records after Append, want %d", f.NumRecs(), fxRecs+1)
		}
		got, _ := f.ReadRecordFloat64("psi", fxRecs)
		q, _ := f.ReadRecordFloat64("q", fxRecs)
		stamp, _ := f.ReadRecord("stamp", fxRecs)
		old, _ := f.ReadFloat64("mean_psi")
		if !reflect.DeepEqual(got, psi) || q[0] != float64(FillFloat) || string(stamp.([]byte)) != "day9\x00\x00" || !reflect.DeepEqual(old, fx.want("mean_psi")) {
			t.Errorf("%v: appended record psi %v, q[0] %v, stamp %q; or old data changed", format, got[:3], q[0], stamp)
		}
		f.Close()
		st, _ := os.Stat(path)
		if want := specSize(&fx.h, fxRecs+1); st.Size() != want {
			t.Errorf("%v: size %d after Append, want %d", format, st.Size(), want)
		}
	}
}

// TestLargeVariables writes and fills variables larger than the
// Writer's 1 MiB encoding buffer, so that they go out in several pieces.
func TestLargeVariables(t *testing.T) {
	const n = 300001
	h := Header{Format: Offset64, Dims: []Dim{{"t", 0}, {"n", n}}, Vars: []Var{
		{Name: "d", Type: Double, Dims: []string{"n"}},
		{Name: "u", Type: Float, Dims: []string{"n"}},
		{Name: "r", Type: Short, Dims: []string{"t", "n"}},
		{Name: "c", Type: Char, Dims: []string{"t", "n"}},
	}}
	path := filepath.Join(t.TempDir(), "large.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	d := make([]float64, n)
	r := make([]int16, n)
	for i := range d {
		d[i] = float64(i)*0.5 - 7
		r[i] = int16(i % 30011)
	}
	text := strings.Repeat("abc", n/3)
	if err := cmpErr(w.WriteFloat64("d", d), w.WriteRecord("r", 0, r), w.WriteRecord("c", 0, text), w.CommitRecord(), w.CommitRecord(), w.Close()); err != nil {
		t.Fatal(err)
	}
	f, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	gd, _ := f.ReadFloat64("d")
	gu, _ := f.ReadFloat64("u")
	gr, _ := f.ReadVar("r")
	gc, _ := f.ReadRecord("c", 0)
	if !reflect.DeepEqual(gd, d) {
		t.Errorf("d differs")
	}
	// Never written: the default fill value (format specification).
	if !reflect.DeepEqual(gu, repeat(float64(FillFloat), n)) {
		t.Errorf("u is not all FILL_FLOAT")
	}
	want := append(append([]int16{}, r...), toInt16(repeat(float64(FillShort), n))...)
	if !reflect.DeepEqual(gr, want) {
		t.Errorf("r differs")
	}
	if got := string(gc.([]byte)); got != text+"\x00" { // 300000 characters and one NUL fill
		t.Errorf("c differs: %d characters", len(got))
	}
	st, _ := os.Stat(path)
	if want := specSize(&h, 2); st.Size() != want {
		t.Errorf("size %d, want %d", st.Size(), want)
	}
}

func toInt16(x []float64) []int16 {
	out := make([]int16, len(x))
	for i, v := range x {
		out[i] = int16(v)
	}
	return out
}
