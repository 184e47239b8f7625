package netcdf

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// hexBytes parses hexadecimal bytes separated by white space; text
// after "//" on a line is a comment.
func hexBytes(s string) []byte {
	var out []byte
	for _, line := range bytes.Split([]byte(s), []byte("\n")) {
		if i := bytes.Index(line, []byte("//")); i >= 0 {
			line = line[:i]
		}
		for _, f := range bytes.Fields(line) {
			var b byte
			if _, err := fmt.Sscanf(string(f), "%02x", &b); err != nil || len(f) != 2 {
				panic("hexBytes: bad byte " + string(f))
			}
			out = append(out, b)
		}
	}
	return out
}

// layoutCases are files whose every byte was worked out by hand from the
// NetCDF format specification.
var layoutCases = []struct {
	name  string
	h     Header
	write func(w *Writer) error
	want  []byte
}{{
	// The specification's smallest file, "netcdf empty { }": 32 bytes,
	// the magic number and seven 32-bit zeros (numrecs and three ABSENT
	// lists).
	name: "empty",
	h:    Header{Format: Classic},
	want: hexBytes(`
		43 44 46 01  00 00 00 00  // 'C' 'D' 'F' 1, numrecs 0
		00 00 00 00  00 00 00 00  // dim_list ABSENT
		00 00 00 00  00 00 00 00  // gatt_list ABSENT
		00 00 00 00  00 00 00 00  // var_list ABSENT`),
}, {
	// The specification's worked example "tiny": dim = 5; short vx(dim);
	// vx = 3, 1, 4, 1, 5: 92 bytes, as in its dump.
	name: "spec tiny",
	h:    Header{Format: Classic, Dims: []Dim{{"dim", 5}}, Vars: []Var{{Name: "vx", Type: Short, Dims: []string{"dim"}}}},
	write: func(w *Writer) error {
		return w.WriteVar("vx", []int16{3, 1, 4, 1, 5})
	},
	want: hexBytes(`
		43 44 46 01  00 00 00 00  // magic, 0 records
		00 00 00 0a  00 00 00 01  // NC_DIMENSION, 1 dimension
		00 00 00 03  64 69 6d 00  // 3 char name "dim" + 1 byte of padding
		00 00 00 05               // size 5
		00 00 00 00  00 00 00 00  // 0 global attributes (ABSENT)
		00 00 00 0b  00 00 00 01  // NC_VARIABLE, 1 variable
		00 00 00 02  76 78 00 00  // 2 char name "vx" + 2 bytes of padding
		00 00 00 01  00 00 00 00  // 1 dimension, with ID 0
		00 00 00 00  00 00 00 00  // 0 attributes (ABSENT)
		00 00 00 03  00 00 00 0c  // type NC_SHORT, vsize 12 = 10 rounded up to 4
		00 00 00 50               // begin: offset 80
		00 03 00 01  00 04 00 01  // 3 1 4 1
		00 05 80 01               // 5, then padding with the short fill value -32767`),
}, {
	// 64-bit offset format, two record variables (interleaved per record,
	// each padded to 4 bytes), a global and a variable attribute.
	// CDL: dimensions: t = UNLIMITED; n = 3; variables: short a(t, n);
	// int b(t); b:u = "s"; :g = 2s; data: a = 1, 2, 3, 4, 5, 6; b = 7, -8.
	name: "64-bit offset records",
	h: Header{
		Format: Offset64,
		Dims:   []Dim{{"t", 0}, {"n", 3}},
		Attrs:  []Attr{{"g", int16(2)}},
		Vars: []Var{
			{Name: "a", Type: Short, Dims: []string{"t", "n"}},
			{Name: "b", Type: Int, Dims: []string{"t"}, Attrs: []Attr{{"u", "s"}}},
		},
	},
	write: func(w *Writer) error {
		for r, a := range [][]int16{{1, 2, 3}, {4, 5, 6}} {
			if err := w.WriteRecord("a", r, a); err != nil {
				return err
			}
			if err := w.WriteRecord("b", r, []int32{[]int32{7, -8}[r]}); err != nil {
				return err
			}
			if err := w.CommitRecord(); err != nil {
				return err
			}
		}
		return nil
	},
	want: recordFile64,
}, {
	// Exactly one record variable, of type byte: no padding between
	// records, although vsize says 4 (format specification, "Note on
	// padding" and "Note on vsize").
	// CDL: dimensions: t = UNLIMITED; n = 3; variables: byte v(t, n);
	// data: v = 1, 2, 3, -1, -2, -3.
	name: "one record variable",
	h: Header{Format: Classic, Dims: []Dim{{"t", 0}, {"n", 3}},
		Vars: []Var{{Name: "v", Type: Byte, Dims: []string{"t", "n"}}}},
	write: func(w *Writer) error {
		for r, v := range [][]int8{{1, 2, 3}, {-1, -2, -3}} {
			if err := w.WriteRecord("v", r, v); err != nil {
				return err
			}
			if err := w.CommitRecord(); err != nil {
				return err
			}
		}
		return nil
	},
	want: hexBytes(`
		43 44 46 01  00 00 00 02  // magic, 2 records
		00 00 00 0a  00 00 00 02  // NC_DIMENSION, 2 dimensions
		00 00 00 01  74 00 00 00  // "t"
		00 00 00 00               // length 0: the record dimension
		00 00 00 01  6e 00 00 00  // "n"
		00 00 00 03               // length 3
		00 00 00 00  00 00 00 00  // no global attributes
		00 00 00 0b  00 00 00 01  // NC_VARIABLE, 1 variable
		00 00 00 01  76 00 00 00  // "v"
		00 00 00 02  00 00 00 00  // 2 dimensions: 0 (t)
		00 00 00 01               // and 1 (n)
		00 00 00 00  00 00 00 00  // no attributes
		00 00 00 01  00 00 00 04  // NC_BYTE, vsize 4 (3 rounded up)
		00 00 00 60               // begin 96
		01 02 03                  // record 0
		ff fe fd                  // record 1, right after: no padding`),
}, {
	// A fixed char variable shorter than its dimension, a byte attribute
	// and a 0-length double attribute (nelems may be 0: the grammar's
	// [values ...] is "zero or more"), an unwritten fixed float variable
	// at its _FillValue, and a scalar.
	name: "fill values and 0-length attribute",
	h: Header{Format: Classic, Dims: []Dim{{"c", 5}, {"m", 2}}, Vars: []Var{
		{Name: "s", Type: Char, Dims: []string{"c"}, Attrs: []Attr{{"e", []float64{}}, {"k", []int8{-1, 2}}}},
		{Name: "f", Type: Float, Dims: []string{"m"}, Attrs: []Attr{{"_FillValue", float32(0.5)}}},
		{Name: "z", Type: Double},
	}},
	write: func(w *Writer) error { return w.WriteVar("s", "ab") },
	want: hexBytes(`
		43 44 46 01  00 00 00 00  // magic, 0 records
		00 00 00 0a  00 00 00 02  // NC_DIMENSION, 2 dimensions
		00 00 00 01  63 00 00 00  // "c"
		00 00 00 05               // length 5
		00 00 00 01  6d 00 00 00  // "m"
		00 00 00 02               // length 2
		00 00 00 00  00 00 00 00  // no global attributes
		00 00 00 0b  00 00 00 03  // NC_VARIABLE, 3 variables
		00 00 00 01  73 00 00 00  // offset 56: "s"
		00 00 00 01  00 00 00 00  // 1 dimension: 0 (c)
		00 00 00 0c  00 00 00 02  // NC_ATTRIBUTE, 2 attributes
		00 00 00 01  65 00 00 00  // "e"
		00 00 00 06  00 00 00 00  // NC_DOUBLE, 0 values (and no value bytes)
		00 00 00 01  6b 00 00 00  // "k"
		00 00 00 01  00 00 00 02  // NC_BYTE, 2 values
		ff 02 00 00               // -1, 2 and 2 bytes of null padding
		00 00 00 02  00 00 00 08  // NC_CHAR, vsize 8 (5 rounded up)
		00 00 00 e0               // begin 224
		00 00 00 01  66 00 00 00  // offset 128: "f"
		00 00 00 01  00 00 00 01  // 1 dimension: 1 (m)
		00 00 00 0c  00 00 00 01  // NC_ATTRIBUTE, 1 attribute
		00 00 00 0a  5f 46 69 6c  // "_FillValue"
		6c 56 61 6c  75 65 00 00  //   + 2 bytes of padding
		00 00 00 05  00 00 00 01  // NC_FLOAT, 1 value
		3f 00 00 00               // 0.5
		00 00 00 05  00 00 00 08  // NC_FLOAT, vsize 8
		00 00 00 e8               // begin 232
		00 00 00 01  7a 00 00 00  // offset 192: "z"
		00 00 00 00               // no dimensions: a scalar
		00 00 00 00  00 00 00 00  // no attributes
		00 00 00 06  00 00 00 08  // NC_DOUBLE, vsize 8
		00 00 00 f0               // begin 240
		61 62 00 00  00 00 00 00  // offset 224: s = "ab", NUL fill (FILL_CHAR) and padding
		3f 00 00 00  3f 00 00 00  // offset 232: f at its _FillValue 0.5
		47 9e 00 00  00 00 00 00  // offset 240: z at FILL_DOUBLE`),
}}

// recordFile64 is the "64-bit offset records" case of layoutCases; the
// decoder tests corrupt it at the offsets noted here.
var recordFile64 = hexBytes(`
	43 44 46 02  00 00 00 02  // 0: 'C' 'D' 'F' 2, 4: numrecs 2
	00 00 00 0a  00 00 00 02  // 8: NC_DIMENSION, 12: 2 dimensions
	00 00 00 01  74 00 00 00  // 16: "t"
	00 00 00 00               // 24: length 0: the record dimension
	00 00 00 01  6e 00 00 00  // 28: "n"
	00 00 00 03               // 36: length 3
	00 00 00 0c  00 00 00 01  // 40: NC_ATTRIBUTE, 1 global attribute
	00 00 00 01  67 00 00 00  // 48: "g"
	00 00 00 03  00 00 00 01  // 56: NC_SHORT, 60: 1 value
	00 02 00 00               // 64: 2 and 2 bytes of null padding
	00 00 00 0b  00 00 00 02  // 68: NC_VARIABLE, 2 variables
	00 00 00 01  61 00 00 00  // 76: "a"
	00 00 00 02  00 00 00 00  // 84: 2 dimensions, 88: ID 0 (t)
	00 00 00 01               // 92: ID 1 (n)
	00 00 00 00  00 00 00 00  // 96: no attributes
	00 00 00 03  00 00 00 08  // 104: NC_SHORT, 108: vsize 8 (6 rounded up)
	00 00 00 00  00 00 00 b4  // 112: begin 180, a 64-bit OFFSET
	00 00 00 01  62 00 00 00  // 120: "b"
	00 00 00 01  00 00 00 00  // 128: 1 dimension, 132: ID 0 (t)
	00 00 00 0c  00 00 00 01  // 136: NC_ATTRIBUTE, 1 attribute
	00 00 00 01  75 00 00 00  // 144: "u"
	00 00 00 02  00 00 00 01  // 152: NC_CHAR, 1 character
	73 00 00 00               // 160: "s" and 3 bytes of null padding
	00 00 00 04  00 00 00 04  // 164: NC_INT, 168: vsize 4
	00 00 00 00  00 00 00 bc  // 172: begin 188 (180 + a's vsize)
	00 01 00 02  00 03 80 01  // 180: record 0: a = 1, 2, 3 and the short fill as padding
	00 00 00 07               // 188: b = 7
	00 04 00 05  00 06 80 01  // 192: record 1 (recsize 12): a = 4, 5, 6, padding
	ff ff ff f8               // 200: b = -8; the file ends at 204`)

// TestLayoutBytes compares files written by the Writer with the bytes
// worked out by hand, and decodes them.
func TestLayoutBytes(t *testing.T) {
	dir := t.TempDir()
	for i, c := range layoutCases {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(dir, fmt.Sprintf("layout%d.nc", i))
			w, err := Create(path, c.h)
			if err != nil {
				t.Fatal(err)
			}
			if c.write != nil {
				if err := c.write(w); err != nil {
					t.Fatal(err)
				}
			}
			if err := w.Close(); err != nil {
				t.Fatal(err)
			}
			got, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(got, c.want) {
				t.Errorf("file differs from the hand-worked layout:\n got %d bytes % x\nwant %d bytes % x", len(got), got, len(c.want), c.want)
			}
			if _, err := Decode(bytes.NewReader(c.want), int64(len(c.want))); err != nil {
				t.Errorf("decoding the hand-worked bytes: %v", err)
			}
		})
	}
}

// TestDecodeLayout reads the hand-worked 64-bit offset file.
func TestDecodeLayout(t *testing.T) {
	f, err := Decode(bytes.NewReader(recordFile64), int64(len(recordFile64)))
	if err != nil {
		t.Fatal(err)
	}
	a, err := f.ReadVar("a")
	if err != nil {
		t.Fatal(err)
	}
	b, err := f.ReadRecord("b", 1)
	if err != nil {
		t.Fatal(err)
	}
	g, _ := f.Attr("g")
	v, _ := f.Var("b")
	u, _ := v.Attr("u")
	if fmt.Sprintf("%v %v %v %v %d %v", a, b, g.Value, u.Value, f.NumRecs(), f.Format) != "[1 2 3 4 5 6] [-8] [2] s 2 64-bit offset" {
		t.Errorf("a = %v, b[1] = %v, g = %v, b:u = %v, %d records, %v", a, b, g.Value, u.Value, f.NumRecs(), f.Format)
	}
	if s, err := f.Shape("a"); err != nil || fmt.Sprint(s) != "[2 3]" {
		t.Errorf("Shape(a) = %v, %v; want [2 3]", s, err)
	}
}
