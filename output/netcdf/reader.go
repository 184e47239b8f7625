package netcdf

import (
	"bufio"
	"cmp"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
)

// FormatError reports a file that is not a valid classic or 64-bit
// offset NetCDF file.
type FormatError struct {
	File   string // the file's name, when it was opened by name
	Offset int64  // byte offset in the file where the problem lies
	Msg    string
}

func (e *FormatError) Error() string {
	if e.File != "" {
		return fmt.Sprintf("netcdf: %s: offset %d: %s", e.File, e.Offset, e.Msg)
	}
	return fmt.Sprintf("netcdf: offset %d: %s", e.Offset, e.Msg)
}

// nameError adds the file name to an error from Decode.
func nameError(err error, name string) error {
	var fe *FormatError
	if errors.As(err, &fe) {
		fe.File = name
		return fe
	}
	return fmt.Errorf("netcdf: %s: %w", name, err)
}

// File is a NetCDF file opened for reading. Its Header describes the
// file as stored: the record dimension has Len 0, and NumRecs gives the
// number of records. Changing the Header does not change what the read
// methods read. Its methods may be called concurrently.
type File struct {
	Header

	name    string
	r       io.ReaderAt
	c       io.Closer
	size    int64
	numrecs int64
	lay     *layout
}

// Open opens and decodes the header of the NetCDF file at path. Errors
// name the file.
func Open(path string) (*File, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("netcdf: %w", err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("netcdf: %w", err)
	}
	nf, err := Decode(f, st.Size())
	if err != nil {
		f.Close()
		return nil, nameError(err, path)
	}
	nf.name, nf.c = path, f
	return nf, nil
}

// Decode decodes the header of the NetCDF data of the given size in r
// and checks that the data of every variable lies within it and
// overlaps no other variable's. A record
// count marked as streaming (0xFFFFFFFF) is computed from the size.
// Errors in the data are *FormatError values giving the byte offset.
func Decode(r io.ReaderAt, size int64) (*File, error) {
	if size < 0 {
		return nil, fmt.Errorf("netcdf: negative size %d", size)
	}
	d := &decoder{br: bufio.NewReader(io.NewSectionReader(r, 0, size)), size: size}
	f, err := d.header()
	if err != nil {
		return nil, err
	}
	f.r, f.size = r, size
	return f, nil
}

// Close closes the file if it was opened by Open.
func (f *File) Close() error {
	if f.c == nil {
		return nil
	}
	return f.c.Close()
}

// NumRecs returns the number of records in the file.
func (f *File) NumRecs() int { return int(f.numrecs) }

// Shape returns the dimension lengths of variable name, with the number
// of records as the length of the record dimension.
func (f *File) Shape(name string) ([]int, error) {
	v, err := f.lookup(name)
	if err != nil {
		return nil, err
	}
	s := append([]int(nil), v.shape...)
	if v.rec {
		s[0] = int(f.numrecs)
	}
	return s, nil
}

func (f *File) lookup(name string) (*varLayout, error) {
	v, err := f.lay.lookup(name)
	if err != nil {
		return nil, f.errorf("%v", err)
	}
	return v, nil
}

func (f *File) errorf(format string, args ...any) error {
	if f.name != "" {
		return fmt.Errorf("netcdf: %s: %s", f.name, fmt.Sprintf(format, args...))
	}
	return fmt.Errorf("netcdf: %s", fmt.Sprintf(format, args...))
}

// ReadVar reads all values of variable name (all records of a record
// variable) in row-major order, as stored: a []int8 (byte), []byte
// (char), []int16 (short), []int32 (int), []float32 (float) or []float64
// (double).
func (f *File) ReadVar(name string) (any, error) {
	v, err := f.lookup(name)
	if err != nil {
		return nil, err
	}
	nrec := int64(1)
	if v.rec {
		nrec = f.numrecs
	}
	b := make([]byte, nrec*v.size)
	for r := range nrec {
		if err := f.readSlab(v, r, b[r*v.size:(r+1)*v.size]); err != nil {
			return nil, err
		}
	}
	return decodeValues(v.typ, b, int(nrec*v.count)), nil
}

// ReadRecord reads record rec of the record variable name, like ReadVar.
func (f *File) ReadRecord(name string, rec int) (any, error) {
	v, err := f.recordVar(name, rec)
	if err != nil {
		return nil, err
	}
	b := make([]byte, v.size)
	if err := f.readSlab(v, int64(rec), b); err != nil {
		return nil, err
	}
	return decodeValues(v.typ, b, int(v.count)), nil
}

// ReadFloat64 reads all values of the numeric variable name (all records
// of a record variable) in row-major order, converted to float64. Fill
// values are returned as stored (see Var.FillValue).
func (f *File) ReadFloat64(name string) ([]float64, error) {
	v, err := f.lookup(name)
	if err != nil {
		return nil, err
	}
	if v.typ == Char {
		return nil, f.errorf("variable %q is char: read it with ReadVar", name)
	}
	nrec := int64(1)
	if v.rec {
		nrec = f.numrecs
	}
	out := make([]float64, nrec*v.count)
	b := make([]byte, v.size)
	for r := range nrec {
		if err := f.readSlab(v, r, b); err != nil {
			return nil, err
		}
		getFloat64s(out[r*v.count:(r+1)*v.count], v.typ, b)
	}
	return out, nil
}

// ReadRecordFloat64 reads record rec of the numeric record variable name,
// like ReadFloat64.
func (f *File) ReadRecordFloat64(name string, rec int) ([]float64, error) {
	v, err := f.recordVar(name, rec)
	if err != nil {
		return nil, err
	}
	if v.typ == Char {
		return nil, f.errorf("variable %q is char: read it with ReadRecord", name)
	}
	b := make([]byte, v.size)
	if err := f.readSlab(v, int64(rec), b); err != nil {
		return nil, err
	}
	out := make([]float64, v.count)
	getFloat64s(out, v.typ, b)
	return out, nil
}

func (f *File) recordVar(name string, rec int) (*varLayout, error) {
	v, err := f.lookup(name)
	if err != nil {
		return nil, err
	}
	if !v.rec {
		return nil, f.errorf("variable %q is not a record variable", name)
	}
	if rec < 0 || int64(rec) >= f.numrecs {
		return nil, f.errorf("variable %q: record %d out of range [0, %d)", name, rec, f.numrecs)
	}
	return v, nil
}

// readSlab reads the data of a fixed-size variable, or record rec of a
// record variable, into b (len(b) == v.size). Decode checked that it
// lies within the file.
func (f *File) readSlab(v *varLayout, rec int64, b []byte) error {
	off := v.begin
	if v.rec {
		off += rec * f.lay.recsize
	}
	if _, err := f.r.ReadAt(b, off); err != nil {
		if errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return f.errorf("variable %q: reading %d bytes at offset %d: %v", v.name, len(b), off, err)
	}
	return nil
}

// decoder reads a header sequentially, checking every count against the
// bytes left before allocating anything.
type decoder struct {
	br      *bufio.Reader
	pos     int64
	size    int64
	scratch [8]byte
}

func (d *decoder) fail(off int64, format string, args ...any) error {
	return &FormatError{Offset: off, Msg: fmt.Sprintf(format, args...)}
}

// read returns the next n bytes, which must exist; what names them in
// errors.
func (d *decoder) read(n int64, what string) ([]byte, error) {
	if n > d.size-d.pos {
		return nil, d.fail(d.pos, "%s: needs %d bytes but the file ends %d bytes later", what, n, d.size-d.pos)
	}
	var b []byte
	if n <= int64(len(d.scratch)) {
		b = d.scratch[:n]
	} else {
		b = make([]byte, n)
	}
	if _, err := io.ReadFull(d.br, b); err != nil {
		if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
			return nil, d.fail(d.pos, "%s: the data ends before the stated size %d", what, d.size)
		}
		return nil, fmt.Errorf("netcdf: reading %s at offset %d: %w", what, d.pos, err)
	}
	d.pos += n
	return b, nil
}

func (d *decoder) u32(what string) (uint32, error) {
	b, err := d.read(4, what)
	if err != nil {
		return 0, err
	}
	return be.Uint32(b), nil
}

func (d *decoder) u64(what string) (uint64, error) {
	b, err := d.read(8, what)
	if err != nil {
		return 0, err
	}
	return be.Uint64(b), nil
}

// name reads a name: a count, the bytes and their padding.
func (d *decoder) name(what string) (string, error) {
	off := d.pos
	n, err := d.u32(what + " name length")
	if err != nil {
		return "", err
	}
	if n == 0 {
		return "", d.fail(off, "%s: empty name", what)
	}
	b, err := d.read(pad4(int64(n)), what+" name")
	if err != nil {
		return "", err
	}
	return string(b[:n]), nil
}

// list reads the tag and element count of a list; minElem is the least
// number of bytes one element takes, which bounds the count.
func (d *decoder) list(tag uint32, what string, minElem int64) (int, error) {
	off := d.pos
	t, err := d.u32(what + " tag")
	if err != nil {
		return 0, err
	}
	n, err := d.u32(what + " count")
	if err != nil {
		return 0, err
	}
	switch {
	case t == tagAbsent && n != 0:
		return 0, d.fail(off, "%s: ABSENT (zero) tag followed by a nonzero count %d", what, n)
	case t != tagAbsent && t != tag:
		return 0, d.fail(off, "%s: tag 0x%08X, want 0x%08X or ABSENT", what, t, tag)
	case int64(n) > (d.size-d.pos)/minElem:
		return 0, d.fail(off+4, "%s: count %d is more than the %d bytes left can hold", what, n, d.size-d.pos)
	}
	return int(n), nil
}

func (d *decoder) header() (*File, error) {
	if d.size < 4 {
		return nil, d.fail(0, "%d bytes: too short to be a NetCDF file", d.size)
	}
	magic, err := d.read(4, "magic")
	if err != nil {
		return nil, err
	}
	f := &File{lay: &layout{recDim: -1}}
	switch m := string(magic); {
	case m == "CDF\x01":
		f.Format = Classic
	case m == "CDF\x02":
		f.Format = Offset64
	case m == "CDF\x05":
		return nil, d.fail(0, "CDF-5 (64-bit data) file: only the classic and 64-bit offset formats are supported")
	case m == "\x89HDF":
		return nil, d.fail(0, "HDF5 (NetCDF-4) file: only the classic and 64-bit offset formats are supported")
	default:
		return nil, d.fail(0, "magic bytes %q: not a NetCDF classic or 64-bit offset file", m)
	}
	f.lay.format = f.Format
	numrecs, err := d.u32("numrecs")
	if err != nil {
		return nil, err
	}

	nd, err := d.list(tagDimension, "dimension list", 8)
	if err != nil {
		return nil, err
	}
	f.Dims = make([]Dim, nd)
	seen := make(map[string]bool, nd)
	for i := range f.Dims {
		off := d.pos
		what := fmt.Sprintf("dimension %d", i)
		name, err := d.name(what)
		if err != nil {
			return nil, err
		}
		n, err := d.u32(what + " length")
		if err != nil {
			return nil, err
		}
		if seen[name] {
			return nil, d.fail(off, "dimension %q defined twice", name)
		}
		seen[name] = true
		if n == 0 {
			if f.lay.recDim >= 0 {
				return nil, d.fail(off, "dimension %q: a second record dimension (length 0); %q is already one", name, f.Dims[f.lay.recDim].Name)
			}
			f.lay.recDim = i
		}
		f.Dims[i] = Dim{Name: name, Len: int(n)}
	}

	if f.Attrs, err = d.attrs("global attribute"); err != nil {
		return nil, err
	}

	minVar := int64(28)
	if f.Format == Offset64 {
		minVar = 32
	}
	nv, err := d.list(tagVariable, "variable list", minVar)
	if err != nil {
		return nil, err
	}
	f.Vars = make([]Var, nv)
	f.lay.vars = make([]varLayout, nv)
	f.lay.index = make(map[string]int, nv)
	varOff := make([]int64, nv)
	for i := range f.Vars {
		varOff[i] = d.pos
		if err := d.variable(f, i); err != nil {
			return nil, err
		}
	}
	hdrEnd := d.pos
	l := f.lay
	l.setRecsize()

	for i := range l.vars {
		v := &l.vars[i]
		switch {
		case v.begin < hdrEnd:
			return nil, d.fail(varOff[i], "variable %q: data begins at offset %d, inside the header (which ends at %d)", v.name, v.begin, hdrEnd)
		case !v.rec && (v.begin > d.size || v.size > d.size-v.begin):
			return nil, d.fail(varOff[i], "variable %q: data [%d, %d) extends past the end of the file (%d bytes)", v.name, v.begin, v.begin+v.size, d.size)
		}
	}
	if err := d.checkOverlap(l, varOff); err != nil {
		return nil, err
	}
	// The records each record variable has room for in the file.
	complete := func(v *varLayout) int64 {
		if v.begin > d.size || v.size > d.size-v.begin {
			return 0
		}
		return (d.size-v.begin-v.size)/l.recsize + 1
	}
	if numrecs == streaming {
		f.numrecs = 0
		if l.recVars > 0 {
			f.numrecs = sizeCap
			for i := range l.vars {
				if v := &l.vars[i]; v.rec {
					f.numrecs = min(f.numrecs, complete(v))
				}
			}
		}
	} else {
		f.numrecs = int64(numrecs)
		for i := range l.vars {
			if v := &l.vars[i]; v.rec && complete(v) < f.numrecs {
				return nil, d.fail(4, "numrecs is %d but the file (%d bytes) holds only %d complete records of variable %q", numrecs, d.size, complete(v), v.name)
			}
		}
	}
	return f, nil
}

// variable reads variable i of the variable list into f.
func (d *decoder) variable(f *File, i int) error {
	off := d.pos
	name, err := d.name(fmt.Sprintf("variable %d", i))
	if err != nil {
		return err
	}
	if _, dup := f.lay.index[name]; dup {
		return d.fail(off, "variable %q defined twice", name)
	}
	what := fmt.Sprintf("variable %q", name)
	nd, err := d.u32(what + " rank")
	if err != nil {
		return err
	}
	if int64(nd) > (d.size-d.pos)/4 {
		return d.fail(d.pos-4, "%s: rank %d is more than the %d bytes left can hold", what, nd, d.size-d.pos)
	}
	v := Var{Name: name, Dims: make([]string, nd)}
	vl := varLayout{name: name, shape: make([]int, nd)}
	size := int64(1)
	for j := range v.Dims {
		id, err := d.u32(what + " dimension id")
		if err != nil {
			return err
		}
		if int64(id) >= int64(len(f.Dims)) {
			return d.fail(d.pos-4, "%s: dimension id %d out of range (the file has %d dimensions)", what, id, len(f.Dims))
		}
		dim := f.Dims[id]
		v.Dims[j] = dim.Name
		if int(id) == f.lay.recDim {
			if j != 0 {
				return d.fail(d.pos-4, "%s: the record dimension %q is dimension %d, not the first", what, dim.Name, j)
			}
			vl.rec = true
			continue
		}
		vl.shape[j] = dim.Len
		if size > sizeCap/8/int64(dim.Len) {
			return d.fail(off, "%s: its size overflows", what)
		}
		size *= int64(dim.Len)
	}
	if v.Attrs, err = d.attrs(what + " attribute"); err != nil {
		return err
	}
	t, err := d.u32(what + " type")
	if err != nil {
		return err
	}
	v.Type = Type(t)
	if !v.Type.valid() {
		return d.fail(d.pos-4, "%s: type code %d is not one of the classic types 1 to 6", what, t)
	}
	if _, err := d.u32(what + " vsize"); err != nil {
		return err
	}
	var begin uint64
	beginOff := d.pos
	if f.Format == Classic {
		b, err := d.u32(what + " begin")
		begin = uint64(b)
		if err != nil {
			return err
		}
	} else if begin, err = d.u64(what + " begin"); err != nil {
		return err
	}
	if begin > sizeCap {
		return d.fail(beginOff, "%s: data begins at offset %d, beyond the largest supported file", what, begin)
	}
	vl.typ = v.Type
	vl.count = size
	vl.size = size * int64(v.Type.Size())
	vl.vsize = pad4(vl.size)
	vl.begin = int64(begin)
	vl.fill = fillBytes(&v)
	f.Vars[i] = v
	f.lay.vars[i] = vl
	f.lay.index[name] = i
	return nil
}

// attrs reads an attribute list.
func (d *decoder) attrs(what string) ([]Attr, error) {
	n, err := d.list(tagAttribute, what+" list", 12)
	if err != nil {
		return nil, err
	}
	if n == 0 {
		return nil, nil
	}
	attrs := make([]Attr, n)
	seen := make(map[string]bool, n)
	for i := range attrs {
		off := d.pos
		name, err := d.name(fmt.Sprintf("%s %d", what, i))
		if err != nil {
			return nil, err
		}
		if seen[name] {
			return nil, d.fail(off, "%s %q defined twice", what, name)
		}
		seen[name] = true
		aw := fmt.Sprintf("%s %q", what, name)
		t, err := d.u32(aw + " type")
		if err != nil {
			return nil, err
		}
		typ := Type(t)
		if !typ.valid() {
			return nil, d.fail(d.pos-4, "%s: type code %d is not one of the classic types 1 to 6", aw, t)
		}
		cnt, err := d.u32(aw + " count")
		if err != nil {
			return nil, err
		}
		nb := int64(cnt) * int64(typ.Size())
		b, err := d.read(pad4(nb), aw+" values")
		if err != nil {
			return nil, err
		}
		if typ == Char {
			attrs[i] = Attr{Name: name, Value: string(b[:nb])}
		} else {
			attrs[i] = Attr{Name: name, Value: decodeValues(typ, b, int(cnt))}
		}
	}
	return attrs, nil
}

// checkOverlap checks that the variables' data do not overlap, as in the
// format specification's layout: fixed-size variables one after the
// other, then the records, each holding one slab of every record
// variable. Without this check a small header could make many variables
// alias the same bytes, and reading them all cost far more than the
// file's size.
func (d *decoder) checkOverlap(l *layout, varOff []int64) error {
	var fixed, rec []int
	for i := range l.vars {
		if l.vars[i].rec {
			rec = append(rec, i)
		} else {
			fixed = append(fixed, i)
		}
	}
	byBegin := func(a, b int) int { return cmp.Compare(l.vars[a].begin, l.vars[b].begin) }
	slices.SortStableFunc(fixed, byBegin)
	slices.SortStableFunc(rec, byBegin)
	all := append(fixed, rec...)
	for k := 1; k < len(all); k++ {
		p, v := &l.vars[all[k-1]], &l.vars[all[k]]
		if p.begin+p.size > v.begin {
			return d.fail(varOff[all[k]], "variable %q: data at offset %d overlaps variable %q [%d, %d)", v.name, v.begin, p.name, p.begin, p.begin+p.size)
		}
	}
	if len(rec) > 1 {
		first, last := &l.vars[rec[0]], &l.vars[rec[len(rec)-1]]
		if last.begin+last.size > first.begin+l.recsize {
			return d.fail(varOff[rec[len(rec)-1]], "variable %q: record data [%d, %d) does not fit in the first record [%d, %d)", last.name, last.begin, last.begin+last.size, first.begin, first.begin+l.recsize)
		}
	}
	return nil
}
