package netcdf

import (
	"fmt"
	"math"
)

// Limits of the formats. Counts, lengths and classic offsets are
// non-negative 32-bit integers in the file. The size of a fixed variable
// and of one record of a record variable must fit the 32-bit vsize field
// (2^32-4 bytes) in the 64-bit offset format and 2^31-4 bytes in the
// classic format.
const (
	maxInt32         = math.MaxInt32
	maxVarClassic    = 1<<31 - 4
	maxVarOffset64   = 1<<32 - 4
	maxOffsetClassic = math.MaxInt32
	maxNameLen       = 256
	// sizeCap bounds sizes computed from a file's header, so that sums and
	// products of them cannot overflow an int64.
	sizeCap = 1 << 62
)

// varLayout is where a variable's data lives and how it is encoded.
type varLayout struct {
	name  string
	typ   Type
	rec   bool  // record variable
	shape []int // dimension lengths; 0 for the record dimension
	count int64 // values of a fixed variable, or of one record
	size  int64 // count*typ.Size(): data bytes (per record if rec)
	vsize int64 // size rounded up to a multiple of 4
	begin int64 // file offset of the data (of record 0 if rec)
	fill  []byte
}

// layout is the placement of all variables of a file.
type layout struct {
	format  Format
	vars    []varLayout
	index   map[string]int
	recDim  int   // index of the record dimension, -1 if none
	recsize int64 // bytes from one record to the next
	recVars int   // number of record variables
}

func (l *layout) lookup(name string) (*varLayout, error) {
	i, ok := l.index[name]
	if !ok {
		return nil, fmt.Errorf("no variable %q", name)
	}
	return &l.vars[i], nil
}

// setRecsize computes the record stride: the sum of the padded record
// sizes, except that a file with exactly one record variable has no
// padding between records (format specification, note on padding).
func (l *layout) setRecsize() {
	l.recsize, l.recVars = 0, 0
	var last int64
	for i := range l.vars {
		if v := &l.vars[i]; v.rec {
			l.recVars++
			l.recsize = min(l.recsize+v.vsize, sizeCap)
			last = v.size
		}
	}
	if l.recVars == 1 {
		l.recsize = last
	}
}

func pad4(n int64) int64 { return (n + 3) &^ 3 }

// validName checks a name against the format specification's grammar
// for names, restricted to ASCII: the specification asks for multibyte
// UTF-8 names to be NFC-normalised, which this package does not do.
func validName(name string) error {
	if name == "" {
		return fmt.Errorf("empty name")
	}
	if len(name) > maxNameLen {
		return fmt.Errorf("name %.20q... is %d bytes long, more than %d", name, len(name), maxNameLen)
	}
	for i := 0; i < len(name); i++ {
		c := name[i]
		switch {
		case c >= 0x80:
			return fmt.Errorf("name %q: non-ASCII names are not supported (the format requires NFC-normalised UTF-8)", name)
		case c < 0x20 || c == 0x7f:
			return fmt.Errorf("name %q: control character at byte %d", name, i)
		case c == '/':
			return fmt.Errorf("name %q: '/' is not allowed in names", name)
		case i == 0 && !isAlnum(c) && c != '_':
			return fmt.Errorf("name %q: must start with a letter, a digit or '_'", name)
		}
	}
	if name[len(name)-1] == ' ' {
		return fmt.Errorf("name %q: trailing spaces are not allowed", name)
	}
	return nil
}

func isAlnum(c byte) bool {
	return 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || '0' <= c && c <= '9'
}

// newLayout validates h for writing and places its variables: fixed
// variables in header order right after the header, then the record
// variables. It returns the layout and the encoded header.
func newLayout(h *Header) (*layout, []byte, error) {
	if h.Format != Classic && h.Format != Offset64 {
		return nil, nil, fmt.Errorf("netcdf: header: format %d is not Classic or Offset64", int(h.Format))
	}
	l := &layout{format: h.Format, index: make(map[string]int, len(h.Vars)), recDim: -1}
	dimIndex := make(map[string]int, len(h.Dims))
	for i, d := range h.Dims {
		if err := validName(d.Name); err != nil {
			return nil, nil, fmt.Errorf("netcdf: dimension %d: %v", i, err)
		}
		if _, dup := dimIndex[d.Name]; dup {
			return nil, nil, fmt.Errorf("netcdf: dimension %q defined twice", d.Name)
		}
		dimIndex[d.Name] = i
		switch {
		case d.Len < 0 || d.Len > maxInt32:
			return nil, nil, fmt.Errorf("netcdf: dimension %q: length %d outside [0, %d]", d.Name, d.Len, maxInt32)
		case d.Len == 0 && l.recDim >= 0:
			return nil, nil, fmt.Errorf("netcdf: dimension %q: a second record (unlimited, Len 0) dimension; %q is already one", d.Name, h.Dims[l.recDim].Name)
		case d.Len == 0:
			l.recDim = i
		}
	}
	if err := checkAttrs(h.Attrs, "global attribute", 0); err != nil {
		return nil, nil, err
	}
	maxVar := int64(maxVarClassic)
	if h.Format == Offset64 {
		maxVar = maxVarOffset64
	}
	for i := range h.Vars {
		v := &h.Vars[i]
		if err := validName(v.Name); err != nil {
			return nil, nil, fmt.Errorf("netcdf: variable %d: %v", i, err)
		}
		if _, dup := l.index[v.Name]; dup {
			return nil, nil, fmt.Errorf("netcdf: variable %q defined twice", v.Name)
		}
		if !v.Type.valid() {
			return nil, nil, fmt.Errorf("netcdf: variable %q: invalid type %d", v.Name, int32(v.Type))
		}
		vl := varLayout{name: v.Name, typ: v.Type, shape: make([]int, len(v.Dims)), count: 1}
		for j, dn := range v.Dims {
			di, ok := dimIndex[dn]
			if !ok {
				return nil, nil, fmt.Errorf("netcdf: variable %q: dimension %q is not defined", v.Name, dn)
			}
			if di == l.recDim {
				if j != 0 {
					return nil, nil, fmt.Errorf("netcdf: variable %q: the record dimension %q must be its first dimension, not dimension %d", v.Name, dn, j)
				}
				vl.rec = true
				continue
			}
			n := int64(h.Dims[di].Len)
			vl.shape[j] = int(n)
			if vl.count > (maxVar+1)/n {
				vl.count = maxVar + 1 // too large; reported below
			} else {
				vl.count *= n
			}
		}
		vl.size = vl.count * int64(v.Type.Size())
		if vl.size > maxVar {
			what := "its data"
			if vl.rec {
				what = "one record of it"
			}
			return nil, nil, fmt.Errorf("netcdf: variable %q: %s exceeds the %v format's limit of %d bytes per variable", v.Name, what, h.Format, maxVar)
		}
		vl.vsize = pad4(vl.size)
		if err := checkAttrs(v.Attrs, fmt.Sprintf("variable %q: attribute", v.Name), v.Type); err != nil {
			return nil, nil, err
		}
		vl.fill = fillBytes(v)
		l.index[v.Name] = len(l.vars)
		l.vars = append(l.vars, vl)
	}
	l.setRecsize()

	hdr := encodeHeader(h, l, 0)
	off := int64(len(hdr))
	for _, rec := range []bool{false, true} {
		for i := range l.vars {
			v := &l.vars[i]
			if v.rec != rec {
				continue
			}
			if h.Format == Classic && off > maxOffsetClassic {
				return nil, nil, fmt.Errorf("netcdf: variable %q would begin at byte %d, beyond the classic format's 32-bit offsets (use Offset64)", v.name, off)
			}
			v.begin = off
			off += v.vsize
		}
	}
	return l, encodeHeader(h, l, 0), nil
}

// checkAttrs validates an attribute list. For variable attributes, typ
// is the variable's type, which a _FillValue attribute must have.
func checkAttrs(attrs []Attr, where string, typ Type) error {
	seen := make(map[string]bool, len(attrs))
	for i, a := range attrs {
		if err := validName(a.Name); err != nil {
			return fmt.Errorf("netcdf: %s %d: %v", where, i, err)
		}
		if seen[a.Name] {
			return fmt.Errorf("netcdf: %s %q defined twice", where, a.Name)
		}
		seen[a.Name] = true
		t, n, err := attrValue(a.Value)
		if err != nil {
			return fmt.Errorf("netcdf: %s %q: %v", where, a.Name, err)
		}
		if typ != 0 && a.Name == "_FillValue" && (t != typ || n != 1) {
			return fmt.Errorf("netcdf: %s %q: must be one value of the variable's type %v, not %d of type %v", where, a.Name, typ, n, t)
		}
	}
	return nil
}

// attrValue returns the type and number of values of an attribute value.
func attrValue(v any) (Type, int, error) {
	var n int
	switch v := v.(type) {
	case string:
		n = len(v)
	case int8, int16, int32, float32, float64:
		n = 1
	case int:
		if v < math.MinInt32 || v > math.MaxInt32 {
			return 0, 0, fmt.Errorf("int value %d does not fit in 32 bits", v)
		}
		n = 1
	case []int:
		for i, x := range v {
			if x < math.MinInt32 || x > math.MaxInt32 {
				return 0, 0, fmt.Errorf("int value %d at index %d does not fit in 32 bits", x, i)
			}
		}
		n = len(v)
	case []int8:
		n = len(v)
	case []int16:
		n = len(v)
	case []int32:
		n = len(v)
	case []float32:
		n = len(v)
	case []float64:
		n = len(v)
	case []byte:
		return 0, 0, fmt.Errorf("value of type []byte: use string for char or []int8 for byte")
	default:
		return 0, 0, fmt.Errorf("unsupported value type %T", v)
	}
	if n > maxInt32 {
		return 0, 0, fmt.Errorf("%d values, more than %d", n, maxInt32)
	}
	return Attr{Value: v}.Type(), n, nil
}

// fillBytes returns the encoded fill value of v: its _FillValue
// attribute (validated by checkAttrs) or the type's default.
func fillBytes(v *Var) []byte {
	if a, ok := v.Attr("_FillValue"); ok {
		if t, n, err := attrValue(a.Value); err == nil && t == v.Type && n == 1 {
			return appendAttrValues(nil, a.Value)[:t.Size()]
		}
	}
	return defaultFillBytes(v.Type)
}

func defaultFillBytes(t Type) []byte {
	switch t {
	case Byte:
		return []byte{0x81}
	case Char:
		return []byte{0}
	case Short:
		return []byte{0x80, 0x01}
	case Int:
		return []byte{0x80, 0, 0, 1}
	case Float:
		return []byte{0x7c, 0xf0, 0, 0}
	case Double:
		return []byte{0x47, 0x9e, 0, 0, 0, 0, 0, 0}
	}
	return nil
}
