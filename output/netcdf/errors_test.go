package netcdf

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strings"
	"testing"
)

// TestCreateErrors checks that invalid headers are refused with an
// error naming the culprit, before anything is written.
func TestCreateErrors(t *testing.T) {
	dims := []Dim{{"t", 0}, {"n", 4}}
	v := func(name string, typ Type, dims ...string) Var { return Var{Name: name, Type: typ, Dims: dims} }
	for _, c := range []struct {
		name string
		h    Header
		want string
	}{
		{"no format", Header{}, "format 0 is not Classic or Offset64"},
		{"CDF-5", Header{Format: 5}, "format 5 is not Classic or Offset64"},
		// Names: format specification, "Note on names" and the name grammar.
		{"empty name", Header{Format: Classic, Dims: []Dim{{"", 1}}}, "dimension 0: empty name"},
		{"leading dash", Header{Format: Classic, Dims: []Dim{{"-x", 1}}}, `name "-x": must start with a letter, a digit or '_'`},
		{"slash", Header{Format: Classic, Vars: []Var{v("a/b", Double)}}, `variable 0: name "a/b": '/' is not allowed`},
		{"trailing space", Header{Format: Classic, Attrs: []Attr{{"a ", "x"}}}, `global attribute 0: name "a ": trailing spaces`},
		{"control", Header{Format: Classic, Dims: []Dim{{"a\tb", 1}}}, `name "a\tb": control character at byte 1`},
		{"non-ASCII", Header{Format: Classic, Dims: []Dim{{"ψ", 1}}}, `name "ψ": non-ASCII names are not supported`},
		// netCDF-C's NC_MAX_NAME is 256 (from memory).
		{"long name", Header{Format: Classic, Dims: []Dim{{strings.Repeat("n", 257), 1}}}, "is 257 bytes long, more than 256"},
		// "There can be at most one record dimension."
		{"two record dims", Header{Format: Classic, Dims: []Dim{{"t", 0}, {"u", 0}}}, `dimension "u": a second record (unlimited, Len 0) dimension; "t" is already one`},
		{"negative length", Header{Format: Classic, Dims: []Dim{{"n", -1}}}, `dimension "n": length -1 outside [0, 2147483647]`},
		{"long dim", Header{Format: Offset64, Dims: []Dim{{"n", 1 << 31}}}, `dimension "n": length 2147483648 outside`},
		// Names are unique among dimensions, among variables and within an
		// attribute list (common practice: ncdump and the data model look
		// them up by name).
		{"duplicate dim", Header{Format: Classic, Dims: []Dim{{"n", 1}, {"n", 2}}}, `dimension "n" defined twice`},
		{"duplicate var", Header{Format: Classic, Vars: []Var{v("a", Int), v("a", Int)}}, `variable "a" defined twice`},
		{"bad type", Header{Format: Classic, Vars: []Var{v("a", 7)}}, `variable "a": invalid type 7`},
		{"unknown dim", Header{Format: Classic, Dims: dims, Vars: []Var{v("a", Int, "n", "m")}}, `variable "a": dimension "m" is not defined`},
		// A record variable's first dimension is the record dimension.
		{"record dim second", Header{Format: Classic, Dims: dims, Vars: []Var{v("a", Int, "n", "t")}}, `variable "a": the record dimension "t" must be its first dimension, not dimension 1`},
		// Attribute values are arrays of one of the six types (specification:
		// attr = name nc_type nelems [values ...]); dims lengths are NON_NEG.
		{"attr type", Header{Format: Classic, Vars: []Var{{Name: "a", Type: Int, Attrs: []Attr{{"x", uint16(1)}}}}}, `variable "a": attribute "x": unsupported value type uint16`},
		{"attr []byte", Header{Format: Classic, Attrs: []Attr{{"x", []byte("a")}}}, `global attribute "x": value of type []byte: use string for char or []int8 for byte`},
		{"attr nil", Header{Format: Classic, Attrs: []Attr{{"x", nil}}}, `global attribute "x": unsupported value type <nil>`},
		{"attr int range", Header{Format: Classic, Attrs: []Attr{{"x", []int{1, 1 << 40}}}}, `global attribute "x": int value 1099511627776 at index 1 does not fit in 32 bits`},
		{"duplicate attr", Header{Format: Classic, Attrs: []Attr{{"x", "a"}, {"x", "b"}}}, `global attribute "x" defined twice`},
		// "If _FillValue is defined then it should be scalar and of the
		// same type as the variable."
		{"fill type", Header{Format: Classic, Vars: []Var{{Name: "a", Type: Float, Attrs: []Attr{{"_FillValue", -999.0}}}}}, `variable "a": attribute "_FillValue": must be one value of the variable's type float, not 1 of type double`},
		{"fill count", Header{Format: Classic, Vars: []Var{{Name: "a", Type: Int, Attrs: []Attr{{"_FillValue", []int32{1, 2}}}}}}, `must be one value of the variable's type int, not 2 of type int`},
		// Classic limit 2^31-4 bytes per variable (common practice: netCDF-C's
		// limit for the classic format); 2^16*2^14*8 = 2^33.
		{"classic var size", Header{Format: Classic, Dims: []Dim{{"a", 1 << 16}, {"b", 1 << 14}}, Vars: []Var{v("big", Double, "a", "b")}},
			`variable "big": its data exceeds the classic format's limit of 2147483644 bytes per variable`},
		// 64-bit offset format: "Each fixed-size variable and the data for one
		// record's worth of each record variable are still limited in size to a
		// little less that 4 GiB" (2^32-4, the largest vsize).
		{"offset64 record size", Header{Format: Offset64, Dims: []Dim{{"t", 0}, {"a", 1 << 16}, {"b", 1 << 14}}, Vars: []Var{v("big", Int, "t", "a", "b")}},
			`variable "big": one record of it exceeds the 64-bit offset format's limit of 4294967292 bytes per variable`},
		{"offset64 product overflow", Header{Format: Offset64, Dims: []Dim{{"a", maxInt32}, {"b", maxInt32}, {"c", maxInt32}}, Vars: []Var{v("big", Byte, "a", "b", "c")}},
			`variable "big": its data exceeds the 64-bit offset format's limit`},
		// Classic offsets are 32-bit signed integers: after a 152-byte header
		// (8 + 20 for the dimension list + 8 + 8 + 3×36 for the variables), the
		// third 1.5 GiB variable begins past 2^31-1.
		{"classic offset", Header{Format: Classic, Dims: []Dim{{"n", 3 << 29}}, Vars: []Var{v("a", Byte, "n"), v("b", Byte, "n"), v("c", Byte, "n")}},
			`variable "c" would begin at byte 3221225624, beyond the classic format's 32-bit offsets`},
	} {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "bad.nc")
			w, err := Create(path, c.h)
			if err == nil {
				w.Close()
				t.Fatalf("Create succeeded, want error %q", c.want)
			}
			if !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "netcdf: ") {
				t.Errorf("error %q, want it to contain %q", err, c.want)
			}
			if _, err := os.Stat(path); !os.IsNotExist(err) {
				t.Errorf("Create wrote a file for an invalid header")
			}
		})
	}
	// The same sizes are fine in the 64-bit offset format.
	h := Header{Format: Offset64, Dims: []Dim{{"n", 3 << 29}}, Vars: []Var{v("a", Byte, "n"), v("b", Byte, "n"), v("c", Byte, "n")}}
	if _, _, err := newLayout(&h); err != nil {
		t.Errorf("64-bit offset layout of three 1.5 GiB variables: %v", err)
	}
}

// TestWriteErrors checks the errors of wrong writes, and that they leave
// the Writer usable and the file unchanged (common practice: a refused
// write must not corrupt what is already written). Values must fit the
// variable's type: the ranges of the specification's SHORT (16-bit) and
// FLOAT (IEEE single precision, largest finite 3.4028235e38).
func TestWriteErrors(t *testing.T) {
	h := Header{Format: Classic, Dims: []Dim{{"t", 0}, {"n", 3}}, Vars: []Var{
		{Name: "f", Type: Double, Dims: []string{"n"}},
		{Name: "s", Type: Short, Dims: []string{"n"}},
		{Name: "r", Type: Float, Dims: []string{"t", "n"}},
		{Name: "c", Type: Char, Dims: []string{"n"}},
	}}
	path := filepath.Join(t.TempDir(), "w.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		err  error
		want string
	}{
		{w.WriteFloat64("nope", []float64{1}), `no variable "nope"`},
		{w.WriteFloat64("f", []float64{1, 2}), `variable "f": 2 values, want 3`},
		{w.WriteFloat64("r", []float64{1, 2, 3}), `variable "r" is a record variable: write it with WriteRecord`},
		{w.WriteRecordFloat64("f", 0, []float64{1, 2, 3}), `variable "f" is not a record variable: write it with WriteVar`},
		{w.WriteRecordFloat64("r", 1, []float64{1, 2, 3}), `variable "r": record 1 is past the pending record 0`},
		{w.WriteRecordFloat64("r", -1, []float64{1, 2, 3}), `variable "r": negative record index -1`},
		{w.WriteRecordFloat64("r", 0, []float64{1, 2, 1e39}), `variable "r": value 1e+39 at index 2 does not fit in float`},
		{w.WriteFloat64("s", []float64{1, 2.5, 3}), `variable "s": value 2.5 at index 1 does not fit in short`},
		{w.WriteVar("s", []int32{1, 40000, 3}), `variable "s": value 40000 at index 1 does not fit in short`},
		{w.WriteVar("s", []uint16{1, 2, 3}), `variable "s": unsupported data type []uint16`},
		{w.WriteVar("f", "abc"), `variable "f" is double: text data only fits char variables`},
		{w.WriteVar("c", []float64{1, 2, 3}), `variable "c" is char: write a string or []byte`},
		{w.WriteVar("c", "abcd"), `variable "c": 4 characters, more than its 3`},
	} {
		if c.err == nil || !strings.Contains(c.err.Error(), c.want) {
			t.Errorf("error %v, want %q", c.err, c.want)
		}
	}
	if err := w.WriteFloat64("f", []float64{1, 2, 3}); err != nil {
		t.Errorf("write after refused writes: %v", err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if err := w.WriteFloat64("f", []float64{1, 2, 3}); err == nil || !strings.Contains(err.Error(), "writer is closed") {
		t.Errorf("write after Close: %v", err)
	}
	if err := w.Close(); err == nil {
		t.Errorf("second Close succeeded")
	}
	f, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	// The refused record write to "r" was not committed.
	if s, _ := f.ReadFloat64("s"); f.NumRecs() != 0 || s[0] != float64(FillShort) {
		t.Errorf("%d records, s = %v; want 0 and fill values", f.NumRecs(), s)
	}

	// A file without a record dimension has no records to commit.
	w2, err := Create(filepath.Join(t.TempDir(), "fixed.nc"), Header{Format: Classic})
	if err != nil {
		t.Fatal(err)
	}
	if err := w2.CommitRecord(); err == nil || !strings.Contains(err.Error(), "no record dimension") {
		t.Errorf("CommitRecord without a record dimension: %v", err)
	}
	w2.Close()
}

// put32 and put64 return a copy of b with a big-endian value at off.
func put32(b []byte, off int, v uint32) []byte {
	c := bytes.Clone(b)
	binary.BigEndian.PutUint32(c[off:], v)
	return c
}

func put64(b []byte, off int, v uint64) []byte {
	c := bytes.Clone(b)
	binary.BigEndian.PutUint64(c[off:], v)
	return c
}

// TestDecodeErrors corrupts hand-worked files at known offsets (see
// recordFile64 and the specification's "tiny" example in layoutCases)
// and checks the errors name the problem and its byte offset.
func TestDecodeErrors(t *testing.T) {
	rf := recordFile64
	tiny := layoutCases[1].want
	for _, c := range []struct {
		name string
		data []byte
		want string
	}{
		{"empty", nil, "offset 0: 0 bytes: too short to be a NetCDF file"},
		{"short", []byte("CDF"), "offset 0: 3 bytes: too short"},
		{"text", []byte("hello, world"), `offset 0: magic bytes "hell": not a NetCDF classic or 64-bit offset file`},
		{"HDF5", []byte("\x89HDF\r\n\x1a\n...."), "offset 0: HDF5 (NetCDF-4) file: only the classic and 64-bit offset formats are supported"},
		{"CDF-5", append([]byte("CDF\x05"), rf[4:]...), "offset 0: CDF-5 (64-bit data) file"},
		{"no numrecs", []byte("CDF\x01\x00\x00"), "offset 4: numrecs: needs 4 bytes but the file ends 2 bytes later"},
		{"truncated dimension list", rf[:30], "offset 12: dimension list: count 2 is more than the 14 bytes left can hold"},
		{"truncated name", rf[:34], `offset 32: dimension 1 name: needs 4 bytes but the file ends 2 bytes later`},
		{"truncated header", tiny[:74], `offset 72: variable "vx" vsize: needs 4 bytes but the file ends 2 bytes later`},
		{"truncated before data", rf[:180], `offset 4: numrecs is 2 but the file (180 bytes) holds only 0 complete records of variable "a"`},
		{"wrong tag", put32(rf, 8, tagVariable), "offset 8: dimension list: tag 0x0000000B, want 0x0000000A or ABSENT"},
		{"ABSENT with count", put32(rf, 8, 0), "offset 8: dimension list: ABSENT (zero) tag followed by a nonzero count 2"},
		{"huge dimension count", put32(rf, 12, 0x7fffffff), "offset 12: dimension list: count 2147483647 is more than the 188 bytes left can hold"},
		{"huge variable count", put32(rf, 72, 0xffffffff), "offset 72: variable list: count 4294967295 is more than the 128 bytes left can hold"},
		{"huge name", put32(rf, 76, 0x7ffffff0), `offset 80: variable 0 name: needs 2147483632 bytes but the file ends 124 bytes later`},
		{"empty name", put32(rf, 16, 0), `offset 16: dimension 0: empty name`},
		{"huge attribute", put32(rf, 60, 0x40000000), `offset 64: global attribute "g" values: needs 2147483648 bytes but the file ends 140 bytes later`},
		{"huge rank", put32(rf, 84, 0x10000000), `offset 84: variable "a": rank 268435456 is more than the 116 bytes left can hold`},
		{"second record dimension", put32(rf, 36, 0), `offset 28: dimension "n": a second record dimension (length 0); "t" is already one`},
		{"duplicate dimension", put32(rf, 32, 0x74000000), `offset 28: dimension "t" defined twice`},
		{"attribute type", put32(rf, 56, 7), `offset 56: global attribute "g": type code 7 is not one of the classic types 1 to 6`},
		{"variable type", put32(rf, 104, 0), `offset 104: variable "a": type code 0 is not one of the classic types 1 to 6`},
		{"dimension id", put32(rf, 92, 5), `offset 92: variable "a": dimension id 5 out of range (the file has 2 dimensions)`},
		{"record dimension second", put32(put32(rf, 88, 1), 92, 0), `offset 92: variable "a": the record dimension "t" is dimension 1, not the first`},
		{"duplicate variable", put32(rf, 124, 0x61000000), `offset 120: variable "a" defined twice`},
		// The specification's "tiny" file with two global attributes named
		// "a" in place of its ABSENT list at offset 28; the second is at 52.
		{"duplicate attribute", slices.Concat(tiny[:28], hexBytes("00 00 00 0c  00 00 00 02"),
			hexBytes("00 00 00 01  61 00 00 00  00 00 00 02  00 00 00 00"),
			hexBytes("00 00 00 01  61 00 00 00  00 00 00 02  00 00 00 00"), tiny[36:]),
			`offset 52: global attribute "a" defined twice`},
		{"begin in header", put64(rf, 112, 100), `offset 76: variable "a": data begins at offset 100, inside the header (which ends at 180)`},
		{"begin past end", put32(tiny, 76, 1<<20), `offset 44: variable "vx": data [1048576, 1048586) extends past the end of the file (92 bytes)`},
		{"begin negative", put64(rf, 112, 1<<63), `offset 112: variable "a": data begins at offset 9223372036854775808, beyond the largest supported file`},
		// Variables' data may not overlap (the specification's layout: fixed
		// variables one after the other, then records of one slab each).
		{"fixed overlap", put32(layoutCases[4].want, 188, 226), `offset 128: variable "f": data at offset 226 overlaps variable "s" [224, 229)`},
		{"record overlap", put64(rf, 172, 184), `offset 120: variable "b": data at offset 184 overlaps variable "a" [180, 186)`},
		{"record too long", put64(rf, 172, 194), `offset 120: variable "b": record data [194, 198) does not fit in the first record [180, 192)`},
		{"numrecs too large", put32(rf, 4, 3), `offset 4: numrecs is 3 but the file (204 bytes) holds only 2 complete records of variable "a"`},
		{"truncated record", rf[:200], `offset 4: numrecs is 2 but the file (200 bytes) holds only 1 complete records of variable "b"`},
		{"truncated fixed data", tiny[:88], `offset 44: variable "vx": data [80, 90) extends past the end of the file (88 bytes)`},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Decode(bytes.NewReader(c.data), int64(len(c.data)))
			var fe *FormatError
			if !errors.As(err, &fe) {
				t.Fatalf("error %v, want a *FormatError", err)
			}
			if !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %q\nwant it to contain %q", err, c.want)
			}
		})
	}

	// Open names the file.
	path := filepath.Join(t.TempDir(), "bad.nc")
	if err := os.WriteFile(path, put32(rf, 104, 0), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Open(path); err == nil || !strings.HasPrefix(err.Error(), "netcdf: "+path+": offset 104: ") {
		t.Errorf("Open: error %q, want it to start with the file name and offset", err)
	}
	if _, err := Open(filepath.Join(t.TempDir(), "missing.nc")); err == nil || !strings.Contains(err.Error(), "missing.nc") {
		t.Errorf("Open of a missing file: %v", err)
	}
}

// TestDecodeTruncated decodes every truncation of a complete file: each
// is refused with a *FormatError, because the header counts records (or
// fixed data) the shorter file does not hold.
func TestDecodeTruncated(t *testing.T) {
	for _, format := range []Format{Classic, Offset64} {
		fx := newFixture(format)
		data, err := os.ReadFile(fx.write(t, t.TempDir(), "fx.nc"))
		if err != nil {
			t.Fatal(err)
		}
		for n := range len(data) {
			_, err := Decode(bytes.NewReader(data[:n]), int64(n))
			var fe *FormatError
			if !errors.As(err, &fe) || fe.Offset < 0 || fe.Offset > int64(n) {
				t.Fatalf("%v: %d of %d bytes: error %v, want a *FormatError within the file", format, n, len(data), err)
			}
		}
	}
}

// TestStreaming marks the record count of the hand-worked file as
// streaming (0xFFFFFFFF, format specification "Note on streaming data")
// and checks that the count is computed from the file size: record r is
// complete when b's slab [188+12r, 192+12r) is in the file (a's slab
// ends before it).
func TestStreaming(t *testing.T) {
	stream := put32(recordFile64, 4, streaming)
	for n := 180; n <= len(stream)+12; n++ {
		data := stream[:min(n, len(stream))]
		if n > len(stream) { // data past the last record: a partial third record
			data = append(bytes.Clone(stream), make([]byte, n-len(stream))...)
		}
		f, err := Decode(bytes.NewReader(data), int64(len(data)))
		if err != nil {
			t.Fatalf("%d bytes: %v", n, err)
		}
		want := 0
		for r := 0; 192+12*r <= len(data); r++ {
			want = r + 1
		}
		if f.NumRecs() != want {
			t.Errorf("%d bytes: %d records, want %d", len(data), f.NumRecs(), want)
		}
		if want >= 2 {
			if b, err := f.ReadFloat64("b"); err != nil || b[0] != 7 || b[1] != -8 {
				t.Errorf("%d bytes: b = %v, %v", len(data), b, err)
			}
		}
	}
}

// TestDecodeAllocations checks that corrupt counts do not make the
// decoder allocate in proportion to the counts (common practice for
// readers of untrusted files): a file of a few hundred
// bytes claiming 2^31 dimensions, variables, attribute values or ranks
// costs little memory.
func TestDecodeAllocations(t *testing.T) {
	rf := recordFile64
	for _, data := range [][]byte{
		put32(rf, 12, 0x7fffffff), put32(rf, 72, 0xffffffff), put32(rf, 76, 0x7ffffff0),
		put32(rf, 60, 0x40000000), put32(rf, 84, 0x10000000), put32(rf, 4, 0x7fffffff),
		put32(rf, 4, streaming),
	} {
		var before, after runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&before)
		for range 10 {
			f, err := Decode(bytes.NewReader(data), int64(len(data)))
			if err == nil {
				for _, v := range f.Vars {
					f.ReadVar(v.Name)
				}
			}
		}
		runtime.ReadMemStats(&after)
		if got := after.TotalAlloc - before.TotalAlloc; got > 1<<20 {
			t.Errorf("decoding a corrupt %d-byte file 10 times allocated %d bytes", len(data), got)
		}
	}
}

// TestDecodeAliasing builds a header whose variables all claim the same
// bytes. Fuzzing found that such a file, accepted, made reading every
// variable cost the number of variables times the file's size; the
// decoder refuses overlapping data instead.
func TestDecodeAliasing(t *testing.T) {
	const nvars, n = 1000, 1 << 16
	h := Header{Format: Classic, Dims: []Dim{{"n", n}}}
	for i := range nvars {
		h.Vars = append(h.Vars, Var{Name: fmt.Sprintf("v%d", i), Type: Byte, Dims: []string{"n"}})
	}
	l, _, err := newLayout(&h)
	if err != nil {
		t.Fatal(err)
	}
	hdr := encodeHeader(&h, l, 0)
	for i := range l.vars {
		l.vars[i].begin = int64(len(hdr)) // all at the start of the data
	}
	data := append(encodeHeader(&h, l, 0), make([]byte, n)...)
	_, err = Decode(bytes.NewReader(data), int64(len(data)))
	// The header: 8 + 20 (dimension list) + 8 + 8 + 1000 variables of 36
	// bytes (names of up to 4 characters) = 36044 bytes.
	if want := `offset 80: variable "v1": data at offset 36044 overlaps variable "v0" [36044, 101580)`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("error %v, want %q", err, want)
	}
}
