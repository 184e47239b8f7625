package netcdf

import (
	"errors"
	"fmt"
	"io"
	"os"
)

// chunkBytes bounds the Writer's encoding buffer: larger writes are
// encoded and written in pieces of this size.
const chunkBytes = 1 << 20

// file is what a Writer writes to; *os.File implements it.
type file interface {
	io.WriterAt
	Sync() error
	Close() error
	Truncate(size int64) error
}

// A Writer writes one NetCDF file. Fixed-size variables are written
// whole with WriteVar or WriteFloat64, in any order, and keep their fill
// values until written. Record variables grow one record at a time:
// WriteRecord writes one variable's slab of a record and CommitRecord
// makes the pending record part of the file.
//
// Every call writes straight to the file (there is no buffer to flush),
// and CommitRecord updates the record count in the header only after the
// record's data, so a process killed at any instant leaves a file whose
// header counts complete records only. SetDurable extends this to machine
// crashes.
//
// A refused call (an unknown variable, a wrong length, a value the
// variable's type cannot hold) writes nothing and leaves the Writer
// usable. After writing to the file fails, every later call returns that
// error. A Writer is not safe for concurrent use.
type Writer struct {
	f       file
	path    string
	lay     *layout
	numrecs int64
	staged  []bool // variables written in the pending record
	pending bool   // whether any data was written in the pending record
	durable bool
	buf     []byte
	err     error
	closed  bool
}

// Create validates h, then creates (or truncates) the file at path and
// writes the header and the fill values of the fixed-size variables.
// Nothing is written when h is invalid; the error names the offending
// dimension, variable or attribute. If writing fails, the file is
// removed. The header is written last, so a file whose creation was
// interrupted does not start with the NetCDF magic bytes.
func Create(path string, h Header) (*Writer, error) {
	l, hdr, err := newLayout(&h)
	if err != nil {
		return nil, err
	}
	f, err := os.Create(path)
	if err != nil {
		return nil, fmt.Errorf("netcdf: %w", err)
	}
	w := newWriter(f, path, l)
	if err := w.init(hdr); err != nil {
		f.Close()
		os.Remove(path)
		return nil, err
	}
	return w, nil
}

func newWriter(f file, path string, l *layout) *Writer {
	return &Writer{f: f, path: path, lay: l, staged: make([]bool, len(l.vars))}
}

// init fills the fixed-size variables, then writes the header.
func (w *Writer) init(hdr []byte) error {
	for i := range w.lay.vars {
		if v := &w.lay.vars[i]; !v.rec {
			if err := w.fillAt(v.begin, v.vsize, v.fill); err != nil {
				return err
			}
		}
	}
	return w.writeAt(hdr, 0)
}

// Append opens an existing file to add records (and overwrite data) with
// the same rules as a Writer from Create. The file must be a valid
// classic or 64-bit offset file; its layout, including the offsets
// another program chose, is kept. Data past the last complete record,
// left by an interrupted writer, is overwritten by new records.
func Append(path string) (*Writer, error) {
	f, err := os.OpenFile(path, os.O_RDWR, 0)
	if err != nil {
		return nil, fmt.Errorf("netcdf: %w", err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("netcdf: %w", err)
	}
	r, err := Decode(f, st.Size())
	if err != nil {
		f.Close()
		return nil, nameError(err, path)
	}
	w := newWriter(f, path, r.lay)
	w.numrecs = r.numrecs
	return w, nil
}

// NumRecs returns the number of committed records.
func (w *Writer) NumRecs() int { return int(w.numrecs) }

// SetDurable sets whether CommitRecord and Close wait for the data to
// reach stable storage. When on, CommitRecord syncs the file after the
// record's data and again after the record count, so that even after a
// machine crash the header never counts a record whose data was lost.
func (w *Writer) SetDurable(on bool) { w.durable = on }

// WriteFloat64 writes all values of the fixed-size variable name in
// row-major order (last dimension fastest), converting them to the
// variable's type: rounded to nearest for float, and exactly for the
// integer types, which accept only integral values in their range.
func (w *Writer) WriteFloat64(name string, data []float64) error {
	return writeNumbers(w, name, -1, data)
}

// WriteRecordFloat64 writes one record of the record variable name, like
// WriteFloat64. rec is the index of an existing record, to overwrite it,
// or NumRecs(), to write into the pending record.
func (w *Writer) WriteRecordFloat64(name string, rec int, data []float64) error {
	if rec < 0 {
		return w.fail(fmt.Errorf("variable %q: negative record index %d", name, rec))
	}
	return writeNumbers(w, name, rec, data)
}

// WriteVar writes all values of the fixed-size variable name. data is a
// []int8, []int16, []int32, []float32 or []float64 for numeric variables,
// converted as by WriteFloat64, or a string or []byte for char variables,
// which may be shorter than the variable and is then padded with the fill
// value (NUL by default).
func (w *Writer) WriteVar(name string, data any) error { return w.writeAny(name, -1, data) }

// WriteRecord writes one record of the record variable name, like
// WriteVar; rec is as for WriteRecordFloat64.
func (w *Writer) WriteRecord(name string, rec int, data any) error {
	if rec < 0 {
		return w.fail(fmt.Errorf("variable %q: negative record index %d", name, rec))
	}
	return w.writeAny(name, rec, data)
}

func (w *Writer) writeAny(name string, rec int, data any) error {
	switch d := data.(type) {
	case []float64:
		return writeNumbers(w, name, rec, d)
	case []float32:
		return writeNumbers(w, name, rec, d)
	case []int32:
		return writeNumbers(w, name, rec, d)
	case []int16:
		return writeNumbers(w, name, rec, d)
	case []int8:
		return writeNumbers(w, name, rec, d)
	case string:
		return writeText(w, name, rec, d)
	case []byte:
		return writeText(w, name, rec, d)
	}
	if err := w.usable(); err != nil {
		return err
	}
	return w.fail(fmt.Errorf("variable %q: unsupported data type %T", name, data))
}

// writeNumbers encodes data for variable name (record rec, or -1 for a
// fixed-size variable) in chunks and writes it.
func writeNumbers[T number](w *Writer, name string, rec int, data []T) error {
	v, off, err := w.target(name, rec, len(data), false)
	if err != nil {
		return err
	}
	ts := v.typ.Size()
	per := chunkBytes / ts
	for i := 0; i < len(data); i += per {
		j := min(len(data), i+per)
		buf := w.buffer((j - i) * ts)
		if k := putValues(buf, v.typ, data[i:j]); k >= 0 {
			return w.fail(fmt.Errorf("variable %q: value %v at index %d does not fit in %v", name, data[i+k], i+k, v.typ))
		}
		if err := w.writeAt(buf, off+int64(i*ts)); err != nil {
			return err
		}
	}
	return w.finish(v, rec, off, int64(len(data)*ts))
}

// writeText writes the characters of data to the char variable name.
func writeText[T string | []byte](w *Writer, name string, rec int, data T) error {
	v, off, err := w.target(name, rec, len(data), true)
	if err != nil {
		return err
	}
	for i := 0; i < len(data); i += chunkBytes {
		j := min(len(data), i+chunkBytes)
		buf := w.buffer(j - i)
		copy(buf, data[i:j])
		if err := w.writeAt(buf, off+int64(i)); err != nil {
			return err
		}
	}
	return w.finish(v, rec, off, int64(len(data)))
}

// target checks a write of n values (characters if text) to variable
// name at record rec (-1 for a fixed-size variable) and returns the
// variable and the file offset of the data.
func (w *Writer) target(name string, rec, n int, text bool) (*varLayout, int64, error) {
	if err := w.usable(); err != nil {
		return nil, 0, err
	}
	v, err := w.lay.lookup(name)
	if err != nil {
		return nil, 0, w.fail(err)
	}
	switch {
	case rec < 0 && v.rec:
		return nil, 0, w.fail(fmt.Errorf("variable %q is a record variable: write it with WriteRecord or WriteRecordFloat64", name))
	case rec >= 0 && !v.rec:
		return nil, 0, w.fail(fmt.Errorf("variable %q is not a record variable: write it with WriteVar or WriteFloat64", name))
	case rec >= 0 && int64(rec) > w.numrecs:
		return nil, 0, w.fail(fmt.Errorf("variable %q: record %d is past the pending record %d", name, rec, w.numrecs))
	case text && v.typ != Char:
		return nil, 0, w.fail(fmt.Errorf("variable %q is %v: text data only fits char variables", name, v.typ))
	case !text && v.typ == Char:
		return nil, 0, w.fail(fmt.Errorf("variable %q is char: write a string or []byte", name))
	case text && int64(n) > v.count:
		return nil, 0, w.fail(fmt.Errorf("variable %q: %d characters, more than its %d", name, n, v.count))
	case !text && int64(n) != v.count:
		return nil, 0, w.fail(fmt.Errorf("variable %q: %d values, want %d", name, n, v.count))
	}
	off := v.begin
	if rec >= 0 {
		off += int64(rec) * w.lay.recsize
	}
	return v, off, nil
}

// finish fills the rest of a write of n bytes at off: the tail of short
// text, and the padding of a new record. A write to the pending record
// is noted for CommitRecord.
func (w *Writer) finish(v *varLayout, rec int, off, n int64) error {
	end := v.size
	pendingRec := rec >= 0 && int64(rec) == w.numrecs
	if pendingRec && w.lay.recVars > 1 {
		end = v.vsize
	}
	if end > n {
		if err := w.fillAt(off+n, end-n, v.fill); err != nil {
			return err
		}
	}
	if pendingRec {
		w.staged[w.lay.index[v.name]] = true
		w.pending = true
	}
	return nil
}

// CommitRecord completes the pending record: record variables not
// written in it get fill values, then the header's record count is
// updated. Committing with nothing written appends a record of fill
// values.
func (w *Writer) CommitRecord() error {
	if err := w.usable(); err != nil {
		return err
	}
	if w.lay.recDim < 0 {
		return w.fail(errors.New("CommitRecord: the file has no record dimension"))
	}
	if w.numrecs >= maxInt32 {
		return w.fail(fmt.Errorf("CommitRecord: the file already holds %d records, the format's maximum", w.numrecs))
	}
	for i := range w.lay.vars {
		v := &w.lay.vars[i]
		if !v.rec || w.staged[i] {
			continue
		}
		n := v.vsize
		if w.lay.recVars == 1 {
			n = v.size
		}
		if err := w.fillAt(v.begin+w.numrecs*w.lay.recsize, n, v.fill); err != nil {
			return err
		}
	}
	if w.durable {
		if err := w.sync(); err != nil {
			return err
		}
	}
	var b [4]byte
	be.PutUint32(b[:], uint32(w.numrecs+1))
	if err := w.writeAt(b[:], 4); err != nil {
		return err
	}
	if w.durable {
		if err := w.sync(); err != nil {
			return err
		}
	}
	w.numrecs++
	clear(w.staged)
	w.pending = false
	return nil
}

// TruncateRecords keeps the first n committed records and drops the
// others: the header's record count becomes n and the file ends after
// record n−1, as if the later records had never been written. It is for a
// run that restarts from a state older than the last record. There must be
// no pending record.
func (w *Writer) TruncateRecords(n int) error {
	if err := w.usable(); err != nil {
		return err
	}
	if w.lay.recDim < 0 {
		return w.fail(errors.New("TruncateRecords: the file has no record dimension"))
	}
	if w.pending {
		return w.fail(errors.New("TruncateRecords: a record is pending"))
	}
	if n < 0 || int64(n) > w.numrecs {
		return w.fail(fmt.Errorf("TruncateRecords(%d): the file holds %d records", n, w.numrecs))
	}
	var b [4]byte
	be.PutUint32(b[:], uint32(n))
	if err := w.writeAt(b[:], 4); err != nil {
		return err
	}
	begin := int64(-1)
	for i := range w.lay.vars {
		if v := &w.lay.vars[i]; v.rec && (begin < 0 || v.begin < begin) {
			begin = v.begin
		}
	}
	if begin >= 0 {
		if err := w.f.Truncate(begin + int64(n)*w.lay.recsize); err != nil {
			return w.fail(err)
		}
	}
	w.numrecs = int64(n)
	if w.durable {
		return w.sync()
	}
	return nil
}

// Sync commits the file's current contents to stable storage.
func (w *Writer) Sync() error {
	if err := w.usable(); err != nil {
		return err
	}
	return w.sync()
}

// Close commits a pending record that holds written data, syncs the file
// if SetDurable is on, and closes it. It returns the first error of any
// earlier write.
func (w *Writer) Close() error {
	if w.closed {
		return fmt.Errorf("netcdf: %s: already closed", w.path)
	}
	var err error
	if w.err == nil && w.pending {
		err = w.CommitRecord()
	}
	if err == nil && w.err == nil && w.durable {
		err = w.sync()
	}
	w.closed = true
	if cerr := w.f.Close(); err == nil && w.err == nil && cerr != nil {
		w.err = fmt.Errorf("netcdf: %s: %w", w.path, cerr)
	}
	if w.err != nil {
		return w.err
	}
	return err
}

func (w *Writer) usable() error {
	if w.closed {
		return fmt.Errorf("netcdf: %s: writer is closed", w.path)
	}
	return w.err
}

// fail reports a usage error without stopping the Writer.
func (w *Writer) fail(err error) error { return fmt.Errorf("netcdf: %s: %w", w.path, err) }

func (w *Writer) writeAt(b []byte, off int64) error {
	if _, err := w.f.WriteAt(b, off); err != nil {
		w.err = fmt.Errorf("netcdf: %s: %w", w.path, err)
		return w.err
	}
	return nil
}

func (w *Writer) sync() error {
	if err := w.f.Sync(); err != nil {
		w.err = fmt.Errorf("netcdf: %s: sync: %w", w.path, err)
		return w.err
	}
	return nil
}

// fillAt writes n bytes of the repeated fill pattern at off.
func (w *Writer) fillAt(off, n int64, pattern []byte) error {
	for n > 0 {
		m := min(n, chunkBytes)
		buf := w.buffer(int(m))
		for i := 0; i < len(buf); i += len(pattern) {
			copy(buf[i:], pattern)
		}
		if err := w.writeAt(buf, off); err != nil {
			return err
		}
		off += m
		n -= m
	}
	return nil
}

// buffer returns the Writer's scratch buffer resized to n bytes.
func (w *Writer) buffer(n int) []byte {
	if cap(w.buf) < n {
		w.buf = make([]byte, n, max(n, 4096))
	}
	return w.buf[:n]
}
