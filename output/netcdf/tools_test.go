package netcdf

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// toolFiles writes the files the external readers check: the fixture in
// both formats, the hand-worked layouts and a file with record variables
// but no records. It returns their paths.
func toolFiles(t *testing.T) (fixtures map[Format]string, others []string) {
	t.Helper()
	dir := t.TempDir()
	fixtures = map[Format]string{}
	for _, format := range []Format{Classic, Offset64} {
		fixtures[format] = newFixture(format).write(t, dir, fmt.Sprintf("fixture%d.nc", format))
	}
	for i, c := range layoutCases {
		path := filepath.Join(dir, fmt.Sprintf("layout%d.nc", i))
		if err := os.WriteFile(path, c.want, 0o644); err != nil {
			t.Fatal(err)
		}
		others = append(others, path)
	}
	h := crashSchema(Offset64)
	path := filepath.Join(dir, "norecords.nc")
	w, err := Create(path, h)
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return fixtures, append(others, path)
}

// fixtureCDL is what ncdump -h prints for the fixture: the CDL notation
// of Unidata's NetCDF User Guide (types, dimensions in parentheses, the
// record dimension as UNLIMITED with its current length, attribute
// values with the type suffixes b, s, f and none for int and double).
// ncdump shows floats to 7 significant digits unless told otherwise
// (-p), and a 0-length attribute of any type as "".
const fixtureCDL = `dimensions:
	time = UNLIMITED ; // (3 currently)
	layer = 2 ;
	y = 3 ;
	x = 4 ;
	nchar = 6 ;
variables:
	double x(x) ;
		x:units = "m" ;
		x:long_name = "distance east" ;
	float y(y) ;
		y:units = "m" ;
	int layer(layer) ;
	byte flag(layer) ;
	short count(y) ;
	char label(nchar) ;
	double depth ;
		depth:units = "m" ;
		depth:valid_range = 0., 10000. ;
	double mean_psi(layer, y, x) ;
		mean_psi:_FillValue = -999. ;
		mean_psi:units = "m2 s-1" ;
	float unwritten(x) ;
		unwritten:_FillValue = -1.f ;
	double time(time) ;
		time:units = "days since 2000-01-01" ;
	double psi(time, layer, y, x) ;
		psi:units = "m2 s-1" ;
	float q(time, layer, y, x) ;
		q:units = "s-1" ;
		q:scale = 2.5f ;
	short code(time, layer) ;
	char stamp(time, nchar) ;
	byte level(time) ;
	int steps(time) ;

// global attributes:
		:Conventions = "CF-1.8" ;
		:title = "fixture: a drifting two-layer vortex" ;
		:empty_text = "" ;
		:version = 3 ;
		:weights = 0.25, 0.75 ;
		:flags = -128b, 0b, 127b ;
		:shorts = -32768s, 32767s ;
		:floats = 1.5f, -0.25f, 3.402823e+38f ;
		:no_doubles = "" ;
}
`

// cdlData parses the data section of ncdump's output into each
// variable's tokens: numbers, "_" for fill values, and strings (unquoted).
func cdlData(out string) (map[string][]string, error) {
	_, s, ok := strings.Cut(out, "\ndata:\n")
	if !ok {
		return map[string][]string{}, nil
	}
	vars := map[string][]string{}
	for {
		s = strings.TrimLeft(s, " \t\n")
		if s == "" || s[0] == '}' {
			return vars, nil
		}
		name, rest, ok := strings.Cut(s, " =")
		if !ok {
			return nil, fmt.Errorf("no '=' in %.40q", s)
		}
		s = rest
		var toks []string
		for {
			s = strings.TrimLeft(s, " \t\n,")
			if s == "" {
				return nil, fmt.Errorf("%s: unterminated", name)
			}
			if s[0] == ';' {
				s = s[1:]
				break
			}
			if s[0] == '"' {
				i := 1
				for ; i < len(s) && s[i] != '"'; i++ {
					if s[i] == '\\' {
						i++
					}
				}
				str, err := strconv.Unquote(s[:i+1])
				if err != nil {
					return nil, fmt.Errorf("%s: string %q: %v", name, s[:i+1], err)
				}
				toks = append(toks, str)
				s = s[i+1:]
				continue
			}
			i := strings.IndexAny(s, " \t\n,;")
			if i < 0 {
				return nil, fmt.Errorf("%s: unterminated", name)
			}
			toks = append(toks, s[:i])
			s = s[i:]
		}
		vars[name] = toks
	}
}

// cdlMatches compares ncdump's tokens for a variable with values read
// as float64 (want), as stored with type typ and fill value fill.
func cdlMatches(toks []string, want []float64, typ Type, fill float64) error {
	if len(toks) != len(want) {
		return fmt.Errorf("%d values, want %d", len(toks), len(want))
	}
	for i, tok := range toks {
		if tok == "_" {
			// ncdump prints _ for values equal to the fill value.
			if want[i] != fill {
				return fmt.Errorf("[%d] = _ (fill), want %v", i, want[i])
			}
			continue
		}
		bits := 64
		if typ == Float {
			bits = 32
		}
		got, err := strconv.ParseFloat(tok, bits)
		if err != nil {
			return fmt.Errorf("[%d] = %q: %v", i, tok, err)
		}
		// ncdump -p 9,17 prints enough digits to round-trip float and double.
		if !sameFloat(got, want[i]) {
			return fmt.Errorf("[%d] = %s, want %v", i, tok, want[i])
		}
	}
	return nil
}

// textRows returns the rows (last dimension) of char data with trailing
// NULs removed, as ncdump and xarray show them.
func textRows(b []byte, row int) []string {
	if row == 0 {
		return nil
	}
	var rows []string
	for i := 0; i < len(b); i += row {
		rows = append(rows, strings.TrimRight(string(b[i:i+row]), "\x00"))
	}
	return rows
}

// TestNcdump checks that Unidata's ncdump reads every kind of file the
// Writer makes: its format (ncdump -k), its header against the CDL
// written out above, and every value it prints against the values
// written (the fixture) or read by this package (the other files).
func TestNcdump(t *testing.T) {
	ncdump := testenv.Tool(t, "ncdump", "Debian package netcdf-bin")
	fixtures, others := toolFiles(t)
	run := func(args ...string) string {
		t.Helper()
		out, err := exec.Command(ncdump, args...).CombinedOutput()
		if err != nil {
			t.Fatalf("ncdump %v: %v\n%s", args, err, out)
		}
		return string(out)
	}
	for format, path := range fixtures {
		if got := strings.TrimSpace(run("-k", path)); got != format.String() {
			t.Errorf("ncdump -k: %q, want %q", got, format)
		}
		head := run("-h", path)
		if _, cdl, _ := strings.Cut(head, "{\n"); cdl != fixtureCDL {
			t.Errorf("%v: ncdump -h:\n%s\nwant:\n%s", format, cdl, fixtureCDL)
		}
		data, err := cdlData(run("-p", "9,17", path))
		if err != nil {
			t.Fatal(err)
		}
		fx := newFixture(format)
		for _, v := range fx.h.Vars {
			toks, ok := data[v.Name]
			if !ok {
				t.Errorf("%v: ncdump prints no data for %s", format, v.Name)
				continue
			}
			if v.Type == Char {
				if want := textRows(fx.wantText(v.Name), fxChars); strings.Join(toks, "|") != strings.Join(want, "|") {
					t.Errorf("%v: %s = %q, want %q", format, v.Name, toks, want)
				}
				continue
			}
			if err := cdlMatches(toks, fx.want(v.Name), v.Type, v.FillValue()); err != nil {
				t.Errorf("%v: %s: %v", format, v.Name, err)
			}
		}
	}
	for _, path := range others {
		f, err := Open(path)
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.TrimSpace(run("-k", path)); got != f.Format.String() {
			t.Errorf("%s: ncdump -k: %q, want %q", path, got, f.Format)
		}
		out := run("-p", "9,17", path)
		if f.lay.recDim >= 0 {
			want := fmt.Sprintf("%s = UNLIMITED ; // (%d currently)", f.Dims[f.lay.recDim].Name, f.NumRecs())
			if !strings.Contains(out, want) {
				t.Errorf("%s: ncdump lacks %q", path, want)
			}
		}
		data, err := cdlData(out)
		if err != nil {
			t.Fatal(err)
		}
		for _, v := range f.Vars {
			toks, ok := data[v.Name]
			shape, _ := f.Shape(v.Name)
			if len(shape) > 0 && shape[0] == 0 {
				continue // no records: nothing to print
			}
			if !ok {
				t.Errorf("%s: ncdump prints no data for %s", path, v.Name)
				continue
			}
			if v.Type == Char {
				b, _ := f.ReadVar(v.Name)
				if want := textRows(b.([]byte), shape[len(shape)-1]); strings.Join(toks, "|") != strings.Join(want, "|") {
					t.Errorf("%s: %s = %q, want %q", path, v.Name, toks, want)
				}
				continue
			}
			want, _ := f.ReadFloat64(v.Name)
			if err := cdlMatches(toks, want, v.Type, v.FillValue()); err != nil {
				t.Errorf("%s: %s: %v", path, v.Name, err)
			}
		}
		f.Close()
	}
}

// xarrayScript prints, as JSON, what xarray (netCDF4 engine) reads from
// each file: sizes, unlimited dimensions, attributes with their numpy
// types, every variable's values without CF decoding, and the floating
// variables with CF decoding (where _FillValue marks missing data).
const xarrayScript = `
import json, sys
try:
    import numpy as np
    import xarray as xr
    import netCDF4
except ImportError as e:
    print("IMPORT-ERROR", e)
    sys.exit(3)

def attr(v):
    if isinstance(v, (bytes, np.bytes_)):
        return v.decode("latin-1")
    if isinstance(v, str):
        return v
    a = np.asarray(v)
    return {"dtype": a.dtype.name, "values": [None if x != x else x for x in a.ravel().tolist()]}

def floats(a):
    return [None if x != x else x for x in a.astype(np.float64).ravel().tolist()]

out = {}
for path in sys.argv[1:]:
    ds = xr.open_dataset(path, engine="netcdf4", decode_cf=False)
    d = {"dims": {k: int(v) for k, v in ds.sizes.items()},
         "unlimited": sorted(ds.encoding.get("unlimited_dims", [])),
         "attrs": {k: attr(v) for k, v in ds.attrs.items()}, "vars": {}, "cf": {}}
    for name, var in ds.variables.items():
        a = var.values
        if a.dtype.kind == "S":
            vals = "|".join(x.decode("latin-1") for x in a.ravel().tolist())
        else:
            vals = floats(a)
        d["vars"][name] = {"dims": list(var.dims), "dtype": a.dtype.name, "values": vals,
                           "attrs": {k: attr(v) for k, v in var.attrs.items()}}
    ds.close()
    cf = xr.open_dataset(path, engine="netcdf4")
    d["cf"] = {name: floats(cf[name].values) for name in cf.variables if cf[name].dtype.kind == "f"}
    cf.close()
    out[path] = d
print(json.dumps(out))
`

type pyFile struct {
	Dims      map[string]int
	Unlimited []string
	Attrs     map[string]json.RawMessage
	Vars      map[string]struct {
		Dims   []string
		Dtype  string
		Values json.RawMessage
		Attrs  map[string]json.RawMessage
	}
	CF map[string][]*float64
}

var numpyType = map[Type]string{Byte: "int8", Short: "int16", Int: "int32", Float: "float32", Double: "float64"}

// pyAttrMatches compares an attribute as xarray reports it with the
// value written.
func pyAttrMatches(raw json.RawMessage, value any) error {
	want := normAttr(value)
	if s, ok := want.(string); ok {
		var got string
		if err := json.Unmarshal(raw, &got); err != nil || got != s {
			return fmt.Errorf("%s, want %q", raw, s)
		}
		return nil
	}
	var got struct {
		Dtype  string
		Values []float64
	}
	if err := json.Unmarshal(raw, &got); err != nil {
		return fmt.Errorf("%s: %v", raw, err)
	}
	wantT := numpyType[Attr{Value: want}.Type()]
	wantV, _ := Attr{Value: want}.Float64s()
	if got.Dtype != wantT || len(got.Values) != len(wantV) {
		return fmt.Errorf("%s %v, want %s %v", got.Dtype, got.Values, wantT, wantV)
	}
	for i := range wantV {
		if !closeTo(got.Values[i], wantV[i], wantT) {
			return fmt.Errorf("%s %v, want %s %v", got.Dtype, got.Values, wantT, wantV)
		}
	}
	return nil
}

// closeTo compares a value printed by Python with one written from Go:
// within 1e-12 relative for double, equal after rounding to single
// precision for float, exactly for the integer types.
func closeTo(got, want float64, dtype string) bool {
	switch dtype {
	case "float64":
		return got == want || math.Abs(got-want) <= 1e-12*math.Abs(want)
	case "float32":
		return float32(got) == float32(want)
	}
	return got == want
}

// TestXarray checks that xarray, through the netCDF4 engine, reads the
// files as written: dimensions (and which is unlimited), attribute
// types and values, variable types and values, and, with CF decoding,
// the variable that was never written as missing (CF conventions: the
// _FillValue attribute marks missing data).
func TestXarray(t *testing.T) {
	python := testenv.File(t, "/usr/bin/python3", "Debian python3 with python3-xarray and python3-netcdf4")
	fixtures, others := toolFiles(t)
	paths := append([]string{fixtures[Classic], fixtures[Offset64]}, others...)
	cmd := exec.Command(python, append([]string{"-c", xarrayScript}, paths...)...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if strings.HasPrefix(string(out), "IMPORT-ERROR") {
		msg := fmt.Sprintf("MISSING TOOL: %s cannot import xarray and netCDF4 (%s; Debian packages python3-xarray python3-netcdf4)", python, strings.TrimSpace(string(out)))
		if testenv.Full() {
			t.Fatal(msg + "; the complete suite requires them")
		}
		t.Skip(msg + "; skipped (with " + testenv.FullVar + "=1 this fails)")
	}
	if err != nil {
		t.Fatalf("python: %v\n%s", err, stderr.Bytes())
	}
	var got map[string]pyFile
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("python output: %v\n%s", err, out)
	}
	for _, path := range paths {
		py, ok := got[path]
		if !ok {
			t.Fatalf("no output for %s", path)
		}
		f, err := Open(path)
		if err != nil {
			t.Fatal(err)
		}
		var fx *fixture
		if path == fixtures[Classic] || path == fixtures[Offset64] {
			fx = newFixture(f.Format)
		}
		for _, d := range f.Dims {
			want := d.Len
			if d.Len == 0 {
				want = f.NumRecs()
				if len(py.Unlimited) != 1 || py.Unlimited[0] != d.Name {
					t.Errorf("%s: unlimited dimensions %v, want [%s]", path, py.Unlimited, d.Name)
				}
			}
			if py.Dims[d.Name] != want {
				t.Errorf("%s: dimension %s = %d, want %d", path, d.Name, py.Dims[d.Name], want)
			}
		}
		attrs := f.Attrs
		if fx != nil {
			attrs = fx.h.Attrs
		}
		if len(py.Attrs) != len(attrs) {
			t.Errorf("%s: %d global attributes, want %d", path, len(py.Attrs), len(attrs))
		}
		for _, a := range attrs {
			if err := pyAttrMatches(py.Attrs[a.Name], a.Value); err != nil {
				t.Errorf("%s: global attribute %s: %v", path, a.Name, err)
			}
		}
		for _, v := range f.Vars {
			pv, ok := py.Vars[v.Name]
			if !ok {
				t.Errorf("%s: xarray has no variable %s", path, v.Name)
				continue
			}
			if strings.Join(pv.Dims, ",") != strings.Join(v.Dims, ",") {
				t.Errorf("%s: %s dims %v, want %v", path, v.Name, pv.Dims, v.Dims)
			}
			wantAttrs := v.Attrs
			if fx != nil {
				fv, _ := fx.h.Var(v.Name)
				wantAttrs = fv.Attrs
			}
			for _, a := range wantAttrs {
				if err := pyAttrMatches(pv.Attrs[a.Name], a.Value); err != nil {
					t.Errorf("%s: %s:%s: %v", path, v.Name, a.Name, err)
				}
			}
			shape, _ := f.Shape(v.Name)
			if v.Type == Char {
				var s string
				json.Unmarshal(pv.Values, &s)
				var b []byte
				if fx != nil {
					b = fx.wantText(v.Name)
				} else {
					x, _ := f.ReadVar(v.Name)
					b = x.([]byte)
				}
				row := 1
				if len(shape) > 0 {
					row = shape[len(shape)-1]
				}
				// xarray joins the characters along the last dimension.
				if want := strings.Join(textRows(b, row), ""); strings.ReplaceAll(s, "|", "") != want {
					t.Errorf("%s: %s = %q, want %q", path, v.Name, s, want)
				}
				continue
			}
			if pv.Dtype != numpyType[v.Type] {
				t.Errorf("%s: %s has dtype %s, want %s", path, v.Name, pv.Dtype, numpyType[v.Type])
			}
			var vals []*float64
			if err := json.Unmarshal(pv.Values, &vals); err != nil {
				t.Fatal(err)
			}
			var want []float64
			if fx != nil {
				want = fx.want(v.Name)
			} else {
				want, _ = f.ReadFloat64(v.Name)
			}
			if len(vals) != len(want) {
				t.Errorf("%s: %s has %d values, want %d", path, v.Name, len(vals), len(want))
				continue
			}
			for i := range want {
				if vals[i] == nil || !closeTo(*vals[i], want[i], pv.Dtype) {
					t.Errorf("%s: %s[%d] = %v, want %v", path, v.Name, i, deref(vals[i]), want[i])
					break
				}
			}
		}
		if fx != nil {
			// CF decoding: "unwritten" holds only its _FillValue, so all of it
			// is missing (NaN, null in JSON); mean_psi has a _FillValue but no
			// value equal to it, so none of it is.
			for _, x := range py.CF["unwritten"] {
				if x != nil {
					t.Errorf("%s: CF-decoded unwritten has value %v, want all missing", path, *x)
					break
				}
			}
			for i, x := range py.CF["mean_psi"] {
				if want := fx.want("mean_psi")[i]; x == nil || !closeTo(*x, want, "float64") {
					t.Errorf("%s: CF-decoded mean_psi[%d] = %v, want %v", path, i, deref(x), want)
					break
				}
			}
			if len(py.CF["unwritten"]) != fxX || len(py.CF["mean_psi"]) != fxLayers*fxY*fxX {
				t.Errorf("%s: CF-decoded sizes %d, %d", path, len(py.CF["unwritten"]), len(py.CF["mean_psi"]))
			}
		}
		f.Close()
	}
}

// deref returns *x, or "null" (missing) for nil.
func deref(x *float64) any {
	if x == nil {
		return "null"
	}
	return *x
}
